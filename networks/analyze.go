package networks

import (
	"fmt"
	"math"
	"math/cmplx"
)

// ImpedanceBlend is the blend knob position at which Analyze reports the
// input and output impedances: the centre.
const ImpedanceBlend = 0.5

// DefaultPositions are the knob positions Analyze reports by default.
var DefaultPositions = []float64{0, 0.25, 0.5, 0.75, 1}

// PositionMetrics are the metrics of a design at one blend knob position.
type PositionMetrics struct {
	Blend    float64 `json:"blend"`
	Gain1kDB float64 `json:"gain_1k_db"`
	Scoop    *Scoop  `json:"scoop"` // nil when the curve has no interior minimum
}

// Analysis is what the analyze command reports; its JSON keys are read by
// other tools.
type Analysis struct {
	Name               string            `json:"name"`
	Band               Band              `json:"band"`
	Positions          []PositionMetrics `json:"positions"`
	CornerHz           *float64          `json:"corner_hz"` // at knob 1; nil when none
	InputImpedanceOhm  float64           `json:"input_impedance_ohm"`
	OutputImpedanceOhm float64           `json:"output_impedance_ohm"`
	ImpedanceBlend     float64           `json:"impedance_blend"`
}

// MarshalJSON keys for Band.
func (b Band) MarshalJSON() ([]byte, error) {
	return []byte(fmt.Sprintf(`{"from":%g,"to":%g}`, b.From, b.To)), nil
}

// CheckPositions reports a knob position outside 0..1.
func CheckPositions(ps []float64) error {
	if len(ps) == 0 {
		return fmt.Errorf("no knob positions given")
	}
	for _, p := range ps {
		if !(p >= 0 && p <= 1) {
			return fmt.Errorf("knob position %v is outside 0..1", p)
		}
	}
	return nil
}

// Analyze measures a valid design at the given blend positions: the gain at
// 1 kHz and the scoop at each, the output corner at knob 1, and the
// magnitudes of the input and output impedances at 1 kHz with the blend at
// ImpedanceBlend.
func Analyze(d *Design, positions []float64) (*Analysis, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if err := CheckPositions(positions); err != nil {
		return nil, err
	}
	m := NewMeter(d.Band)
	a := &Analysis{Name: d.Name, Band: d.Band, ImpedanceBlend: ImpedanceBlend}
	var k Compiled
	for _, p := range positions {
		c := d.Chain(p)
		c.CompileInto(&k)
		pm := PositionMetrics{Blend: p, Gain1kDB: Gain1k(&k)}
		if s, ok := m.Scoop(&k); ok {
			pm.Scoop = &s
		}
		a.Positions = append(a.Positions, pm)
	}
	a.CornerHz = CornerOf(d, m)
	c := d.Chain(ImpedanceBlend)
	c.CompileInto(&k)
	a.InputImpedanceOhm = cmplx.Abs(k.InputImpedance(1000))
	a.OutputImpedanceOhm = cmplx.Abs(k.OutputImpedance(1000))
	if math.IsInf(a.InputImpedanceOhm, 0) || math.IsNaN(a.InputImpedanceOhm) {
		return nil, fmt.Errorf("input impedance is not finite")
	}
	return a, nil
}

// CornerOf returns the design's output corner (knob 1), nil when none.
func CornerOf(d *Design, m *Meter) *float64 {
	c := d.Chain(1)
	k := c.Compile()
	if hz, ok := m.Corner(k); ok {
		return &hz
	}
	return nil
}
