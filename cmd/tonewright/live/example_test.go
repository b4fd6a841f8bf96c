package live_test

import (
	"fmt"

	"tonewright/cmd/tonewright/live"
	"tonewright/networks"
)

// A Model over a design: its knobs, and the gain at 1 kHz at two settings
// of the blend knob, as analyze reports them. The design is the
// repository's invented demo board.
func ExampleNewDesignModel() {
	d, err := networks.LoadDesign("../../../testdata/fixed-board.yaml")
	if err != nil {
		fmt.Println(err)
		return
	}
	m, err := live.NewDesignModel(d, "demo")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, k := range m.Knobs() {
		fmt.Printf("knob %s, saved at %.2f\n", k.Name, k.Saved)
	}
	for _, blend := range []float64{0, 1} {
		f, _ := m.Figures(live.Setting{live.KnobBlend: blend})
		fmt.Printf("blend %.0f: %.2f dB at 1 kHz\n", blend, *f.Gain1kDB)
	}
	// Output:
	// knob blend, saved at 0.50
	// knob level, saved at 1.00
	// blend 0: -22.81 dB at 1 kHz
	// blend 1: -18.11 dB at 1 kHz
}
