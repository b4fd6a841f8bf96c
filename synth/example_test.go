package synth_test

import (
	"fmt"

	"tonewright/networks"
	"tonewright/synth"
)

// A fresh synthesis from flags' worth of targets: a 700 Hz scoop 8 dB deep
// with level shoulders, a 9 kHz corner, behind a 4.7k stage (an invented
// scenario).
func ExampleSolve() {
	hz, depth, corner := 700.0, -8.0, 9000.0
	p := &synth.Problem{
		Targets: synth.Targets{ScoopHz: &hz, DepthDB: &depth, CornerHz: &corner},
		Source:  &networks.Source{Impedance: 4.7e3},
	}
	r, err := synth.Solve(p, synth.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("ideal meets the targets:", r.Feasible)
	fmt.Println("chosen parts meet them:", r.Met)
	for _, c := range r.Checks {
		fmt.Printf("%s within %v\n", c.Name, c.Met)
	}
	// Output:
	// ideal meets the targets: true
	// chosen parts meet them: true
	// scoop frequency within true
	// scoop depth within true
	// scoop balance within true
	// corner within true
}

// The closed form the search starts from: the time constants of an ideal
// blend network with a 10 dB scoop at 800 Hz.
func ExampleIdealNotch() {
	tau1, tau2, _ := synth.IdealNotch(800, -10)
	fmt.Printf("τ₁ = %.1f µs, τ₂ = %.2f µs, ratio %.2f\n", tau1*1e6, tau2*1e6, tau1/tau2)
	// Output: τ₁ = 459.1 µs, τ₂ = 86.22 µs, ratio 5.32
}
