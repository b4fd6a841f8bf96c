package networks

import (
	"encoding/json"
	"fmt"
)

// ImpedanceBlend is the blend knob position at which Analyze reports the
// input and output impedances of a blend design: the centre.
const ImpedanceBlend = 0.5

// ImpedanceHz is the frequency at which Analyze reports the impedances.
const ImpedanceHz = 1000

// DefaultPositions are the knob positions Analyze reports by default.
var DefaultPositions = []float64{0, 0.25, 0.5, 0.75, 1}

// PositionMetrics are the figures of a design at one knob setting.
type PositionMetrics struct {
	Blend       float64  `json:"blend"` // the blend knob; written for designs that have one
	Knobs       Setting  `json:"knobs"`
	Gain1kDB    float64  `json:"gain_1k_db"`
	Scoop       *Scoop   `json:"scoop"` // nil when the curve has no scoop
	Peak        *Peak    `json:"peak"`  // nil when it has no peak
	CornerHz    *float64 `json:"corner_hz"`
	LowCornerHz *float64 `json:"low_corner_hz"`
	Noise       *Noise   `json:"noise,omitempty"` // the section's thermal noise at this setting (AnalyzeSettings)
}

// MarshalJSON leaves "blend" out for a setting without a blend knob.
func (p PositionMetrics) MarshalJSON() ([]byte, error) {
	type plain PositionMetrics
	if _, ok := p.Knobs[BlendKnob]; ok {
		return json.Marshal(plain(p))
	}
	return json.Marshal(struct {
		Blend *struct{} `json:"blend,omitempty"`
		plain
	}{plain: plain(p)})
}

// Analysis is what the analyze command reports; its JSON keys are read by
// other tools.
type Analysis struct {
	Name               string            `json:"name"`
	Band               Band              `json:"band"`
	Positions          []PositionMetrics `json:"positions"`
	CornerHz           *float64          `json:"corner_hz"` // blend designs: at blend knob 1; nil when none
	InputImpedanceOhm  float64           `json:"input_impedance_ohm"`
	OutputImpedanceOhm float64           `json:"output_impedance_ohm"`
	ImpedanceBlend     float64           `json:"impedance_blend"` // blend designs
	ImpedanceKnobs     Setting           `json:"impedance_knobs"`
	Impedance          []ImpedanceCurve  `json:"impedance,omitempty"` // over frequency, per setting, when asked for
	Blend              bool              `json:"-"`                   // a blend design: CornerHz and ImpedanceBlend apply
}

// MarshalJSON leaves corner_hz and impedance_blend out for designs without
// a blend knob.
func (a Analysis) MarshalJSON() ([]byte, error) {
	type plain Analysis
	if a.Blend {
		return json.Marshal(plain(a))
	}
	return json.Marshal(struct {
		CornerHz       *struct{} `json:"corner_hz,omitempty"`
		ImpedanceBlend *struct{} `json:"impedance_blend,omitempty"`
		plain
	}{plain: plain(a)})
}

// Band MarshalJSON keys.
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

// Analyze measures a valid design with its swept knob (SweptKnob, or its
// first knob when every knob has a position) at each of positions, the
// other knobs at theirs. See AnalyzeSettings.
func Analyze(d *Design, positions []float64) (*Analysis, error) {
	if err := CheckPositions(positions); err != nil {
		return nil, err
	}
	var lists []KnobList
	if k := d.SweptKnob(); k != "" {
		lists = []KnobList{{k, positions}}
	} else if ks := d.Knobs(); len(ks) > 0 {
		lists = []KnobList{{ks[0].Name, positions}}
	}
	ss, err := d.Settings(lists)
	if err != nil {
		return nil, err
	}
	return AnalyzeSettings(d, ss)
}

// AnalyzeSettings measures a valid design at each knob setting: the gain at
// 1 kHz, the scoop, the peak, the corner, the low corner and the thermal
// noise (NoiseAt); then the
// magnitudes of the input and output impedances at ImpedanceHz with the
// knobs at the design's own setting (a knob without a position at the
// centre), and for a blend design the output corner at blend knob 1.
func AnalyzeSettings(d *Design, settings []Setting) (*Analysis, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if len(settings) == 0 {
		return nil, fmt.Errorf("no knob settings given")
	}
	m := NewMeter(d.Band)
	a := &Analysis{Name: d.Name, Band: d.Band, Blend: d.Tone.Network == BlendNetwork}
	for _, s := range settings {
		s = d.complete(s)
		e, err := d.Compile(s)
		if err != nil {
			return nil, err
		}
		pm := MeasureAt(m, e)
		pm.Knobs, pm.Blend = s, s[BlendKnob]
		if n, err := d.NoiseAt(s); err == nil {
			pm.Noise = &n // left out when the noise cannot be computed (a zero gain at 1 kHz)
		}
		a.Positions = append(a.Positions, pm)
	}
	own, err := d.Setting(nil)
	if err != nil {
		return nil, err
	}
	a.ImpedanceKnobs = own
	if a.Blend {
		a.ImpedanceBlend = own[BlendKnob]
		a.CornerHz = CornerOf(d, m)
	}
	a.InputImpedanceOhm, a.OutputImpedanceOhm, err = d.Impedances(own, ImpedanceHz)
	if err != nil {
		return nil, err
	}
	return a, nil
}

// MeasureAt returns every figure of one response: the gain at 1 kHz, the
// scoop, the peak, the corner and the low corner (Knobs left empty).
func MeasureAt(m *Meter, r Response) PositionMetrics {
	pm := PositionMetrics{Gain1kDB: Gain1k(r)}
	if s, ok := m.Scoop(r); ok {
		pm.Scoop = &s
	}
	if p, ok := m.Peak(r); ok {
		pm.Peak = &p
	}
	if hz, ok := m.Corner(r); ok {
		pm.CornerHz = &hz
	}
	if hz, ok := m.LowCorner(r); ok {
		pm.LowCornerHz = &hz
	}
	return pm
}

// CornerOf returns a blend design's output corner (blend knob 1, the level
// at its position), nil when none.
func CornerOf(d *Design, m *Meter) *float64 {
	c := d.Chain(1)
	k := c.Compile()
	if hz, ok := m.Corner(k); ok {
		return &hz
	}
	return nil
}
