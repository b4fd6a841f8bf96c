package networks_test

import (
	"fmt"
	"math"

	"tonewright/networks"
)

// A network is built from elements between named nodes and solved by
// modified nodal analysis. One RC low-pass section is 3.01 dB down at
// 1/(2πRC).
func ExampleNetwork() {
	var n networks.Network
	n.SetSource("in", 0)
	n.Resistor("R1", "in", "out", 10e3)
	n.Capacitor("C1", "out", networks.Ground, 10e-9)
	n.SetOutput("out")
	s, err := n.Compile()
	if err != nil {
		fmt.Println(err)
		return
	}
	fc := 1 / (2 * math.Pi * 10e3 * 10e-9)
	fmt.Printf("%.0f Hz: %.2f dB\n", fc, s.GainDB(fc))
	// Output: 1592 Hz: -3.01 dB
}

// A chain composes the building blocks in signal order; its compiled fast
// path gives the same answer as the nodal solver.
func ExampleChain() {
	c := networks.Chain{
		Source: networks.Source{Impedance: 4.7e3},
		Blend: networks.Blend{
			Lowpass:  networks.RC{R: 22e3, C: 22e-9},
			Highpass: networks.RC{R: 22e3, C: 2.2e-9},
			Pot:      networks.Pot{Value: 100e3, Position: 0.5},
		},
		Filters: []networks.RC{{R: 10e3, C: 1e-9}},
		Load:    networks.Load{R: 1e6},
	}
	fast := c.Compile()
	s, _ := c.Network().Compile()
	fmt.Printf("fast %.4f dB, nodal %.4f dB\n", fast.GainDB(1000), s.GainDB(1000))
	// Output: fast -21.5460 dB, nodal -21.5460 dB
}

// Analyze measures a design file's design at several blend knob positions.
func ExampleAnalyze() {
	d, err := networks.ParseDesign([]byte(`
source: {impedance: 1k}
tone:
  lowpass:  {r: 22k, c: 22n}
  highpass: {c: 2n2, r: 22k}
  pot: 250k
`), "example.yaml")
	if err != nil {
		fmt.Println(err)
		return
	}
	a, _ := networks.Analyze(d, []float64{0, 0.5, 1})
	for _, p := range a.Positions {
		if p.Scoop == nil {
			fmt.Printf("blend %g: %.1f dB at 1 kHz, no scoop\n", p.Knobs["blend"], p.Gain1kDB)
			continue
		}
		fmt.Printf("blend %g: %.1f dB at 1 kHz, scoop %.0f Hz, %.1f dB deep\n", p.Knobs["blend"], p.Gain1kDB, p.Scoop.Hz, p.Scoop.DepthDB)
	}
	// Output:
	// blend 0: -10.5 dB at 1 kHz, no scoop
	// blend 0.5: -21.2 dB at 1 kHz, scoop 1129 Hz, -14.7 dB deep
	// blend 1: -12.7 dB at 1 kHz, scoop 238 Hz, -12.8 dB deep
}
