package networks

import (
	"fmt"
	"math"
	"math/cmplx"
)

// ImpedancePoint is the magnitude of the input and output impedances at
// one frequency, as Design.Impedances defines them.
type ImpedancePoint struct {
	Hz        float64 `json:"hz"`
	InputOhm  float64 `json:"input_ohm"`
	OutputOhm float64 `json:"output_ohm"`
}

// ImpedanceCurve is a design's impedances over frequency at one setting.
type ImpedanceCurve struct {
	Knobs  Setting          `json:"knobs"`
	Points []ImpedancePoint `json:"points"`
}

// ImpedanceCurveAt returns |Z_in| and |Z_out| (see Impedances) at each
// frequency, the knobs at s, compiling the two circuits once.
func (d *Design) ImpedanceCurveAt(s Setting, freqs []float64) (ImpedanceCurve, error) {
	s = d.complete(s)
	c := ImpedanceCurve{Knobs: s}
	si, err := d.circuit(s, circuitOptions{noSource: true}).Compile()
	if err != nil {
		return c, err
	}
	so, err := d.circuit(s, circuitOptions{noLoad: true}).Compile()
	if err != nil {
		return c, err
	}
	for _, f := range freqs {
		if err := si.Solve(f); err != nil {
			return c, err
		}
		in := cmplx.Abs(1 / si.SourceCurrent())
		z, err := so.OutputImpedance(f)
		if err != nil {
			return c, err
		}
		out := cmplx.Abs(z)
		if math.IsNaN(in) || math.IsInf(in, 0) || math.IsNaN(out) || math.IsInf(out, 0) {
			return c, fmt.Errorf("the impedances at %g Hz are not finite: a part value is at the edge of its range", f)
		}
		c.Points = append(c.Points, ImpedancePoint{Hz: f, InputOhm: in, OutputOhm: out})
	}
	return c, nil
}
