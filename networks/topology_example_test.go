package networks_test

import (
	"fmt"
	"math"

	"tonewright/networks"
)

// A built-in's keys and knobs, and its starting design measured.
func ExampleTopologyByName() {
	tp, err := networks.TopologyByName("treble-cut")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(tp.KeyNames(), tp.Knobs())
	d := tp.DefaultDesign()
	for _, p := range []float64{0, 1} {
		e, _ := d.Compile(networks.Setting{"cut": p})
		c, _ := networks.NewMeter(d.Band).Corner(e)
		fmt.Printf("cut %g: corner %.0f Hz\n", p, c)
	}
	_, err = networks.TopologyByName("treble")
	fmt.Println(err)
	// Output:
	// [cut c series_r] [cut]
	// cut 0: corner 14592 Hz
	// cut 1: corner 768 Hz
	// unknown topology "treble": the built-ins are blend, bass-treble, blend-fill, three-band-stack, tilt, treble-cut
}

// The A-weighting of IEC 61672-1 at a few frequencies, in dB.
func ExampleAWeighting() {
	for _, f := range []float64{100, 1000, 10000} {
		fmt.Printf("%g Hz: %.1f dB\n", f, 20*math.Log10(networks.AWeighting(f)))
	}
	// Output:
	// 100 Hz: -19.1 dB
	// 1000 Hz: 0.0 dB
	// 10000 Hz: -2.5 dB
}
