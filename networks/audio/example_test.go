package audio_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"tonewright/networks"
	"tonewright/networks/audio"
)

// A one-section RC low-pass (invented values: 10 kΩ, 10 nF, corner
// 1/(2π·RC) ≈ 1.59 kHz) has one pole at −1/RC rad/s. Its digital filter at
// 48 kHz has one one-pole section, and its gain follows the network's.
func ExampleFit() {
	var n networks.Network
	n.Resistor("R1", "in", "out", 10e3)
	n.Capacitor("C1", "out", networks.Ground, 10e-9)
	n.SetSource("in", 0)
	n.SetOutput("out")
	s, err := n.Compile()
	if err != nil {
		panic(err)
	}
	f, err := audio.Fit(s, []complex128{complex(-1/(10e3*10e-9), 0)}, 48000)
	if err != nil {
		panic(err)
	}
	one, two := f.Sections()
	fmt.Println("sections:", one, "one-pole,", two, "two-pole")
	for _, hz := range []float64{100, 1591.5, 10000} {
		fmt.Printf("%6g Hz: network %.3f dB, filter %.3f dB\n", hz,
			20*math.Log10(cmplx.Abs(s.Transfer(hz))), 20*math.Log10(cmplx.Abs(f.Response(hz))))
	}
	// Output:
	// sections: 1 one-pole, 0 two-pole
	//    100 Hz: network -0.017 dB, filter -0.019 dB
	// 1591.5 Hz: network -3.010 dB, filter -3.008 dB
	//  10000 Hz: network -16.072 dB, filter -16.071 dB
}

// ITU-R BS.1770: a full-scale 997 Hz sine in one channel reads −3.01 LKFS.
func ExampleLoudnessMeter() {
	const rate = 48000.0
	x := make([]float64, 3*rate)
	for i := range x {
		x[i] = math.Sin(2 * math.Pi * 997 * float64(i) / rate)
	}
	m := audio.NewLoudnessMeter(rate, 1)
	m.Add([][]float64{x})
	fmt.Printf("%.2f LKFS\n", m.Loudness())
	// Output: -3.01 LKFS
}

// Two settings measured at unit gain: one peaks at −20 dBFS and reads
// −30 LUFS, the other peaks at −14 dBFS and reads −26 LUFS. Matched, the
// first is raised 4 dB (to −16 dBFS) before the makeup brings the louder
// peak, still −14 dBFS, to −1 dBFS.
func ExampleGains() {
	stats := []audio.PartStats{
		{Peak: math.Pow(10, -20.0/20), LoudnessLUFS: -30},
		{Peak: math.Pow(10, -14.0/20), LoudnessLUFS: -26},
	}
	dB := func(g []float64) string {
		return fmt.Sprintf("%+.1f dB, %+.1f dB", 20*math.Log10(g[0]), 20*math.Log10(g[1]))
	}
	fmt.Println("auto makeup:   ", dB(audio.Gains(stats, false, audio.Makeup{Auto: true})))
	fmt.Println("matched, auto: ", dB(audio.Gains(stats, true, audio.Makeup{Auto: true})))
	fmt.Println("fixed +10 dB:  ", dB(audio.Gains(stats, false, audio.Makeup{DB: 10})))
	// Output:
	// auto makeup:    +13.0 dB, +13.0 dB
	// matched, auto:  +17.0 dB, +13.0 dB
	// fixed +10 dB:   +10.0 dB, +10.0 dB
}
