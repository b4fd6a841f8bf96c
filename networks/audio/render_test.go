package audio

import (
	"fmt"
	"math"
	"testing"

	"tonewright/networks"
)

// sineGainDB renders a unit sine at hz through f and returns the level of
// the output against the input, in dB: the RMS ratio over whole periods of
// the second half of two seconds (the first second, where the filter's
// transient lives, is discarded).
func sineGainDB(f *Filter, hz float64) float64 {
	rate := f.Rate
	n := int(2 * rate)
	in := make([]float64, n)
	for i := range in {
		in[i] = math.Sin(2 * math.Pi * hz * float64(i) / rate)
	}
	out := make([]float64, n)
	f.Process(f.NewState(), in, out)
	return rmsDB(out[n/2:], hz, rate) - rmsDB(in[n/2:], hz, rate)
}

// rmsDB is the RMS level in dB of the longest stretch of x holding a whole
// number of periods of hz (so a sine's RMS is exact up to rounding).
func rmsDB(x []float64, hz, rate float64) float64 {
	periods := math.Floor(float64(len(x)) * hz / rate)
	n := int(math.Round(periods * rate / hz))
	if n < 1 || n > len(x) {
		n = len(x)
	}
	s := 0.0
	for _, v := range x[:n] {
		s += v * v
	}
	return 10 * math.Log10(s/float64(n))
}

// testFrequencies span the band, 20 Hz to 16 kHz.
var testFrequencies = []float64{20, 31.5, 50, 80, 125, 200, 315, 500, 800, 1250, 2000, 3150, 5000, 6300, 8000, 10000, 12500, 16000}

type network struct {
	name  string
	h     Response
	poles []complex128
}

// testNetworks are the networks the accuracy is checked on: the demo
// design's blend chain (an invented board) at three knob positions, an
// invented three-section network built as a general network, and an
// invented resonant notch with complex poles.
func testNetworks(t testing.TB) []network {
	var out []network
	d, err := networks.LoadDesign("../../testdata/demo-design.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for _, b := range []float64{0, 0.5, 1} {
		c := d.Chain(b)
		p, err := c.Network().Poles()
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, network{fmt.Sprintf("blend chain at %g", b), c.Compile(), p})
	}
	// A built-in topology: the bass/treble shelving network that
	// tonewright new writes (invented starting values), both knobs at 0.3,
	// through the design's own evaluator.
	bt, err := networks.LoadDesign("../../testdata/examples/bass-treble.yaml")
	if err != nil {
		t.Fatal(err)
	}
	at := networks.Setting{"bass": 0.3, "treble": 0.3}
	be, err := bt.Compile(at)
	if err != nil {
		t.Fatal(err)
	}
	bp, err := bt.Network(at).Poles()
	if err != nil {
		t.Fatal(err)
	}
	out = append(out, network{"bass-treble built-in at 0.3", be, bp})
	n := bassMidTreble()
	s, err := n.Compile()
	if err != nil {
		t.Fatal(err)
	}
	p, err := n.Poles()
	if err != nil {
		t.Fatal(err)
	}
	out = append(out, network{"three-section network", s, p})
	r := resonantNotch()
	rs, err := r.Compile()
	if err != nil {
		t.Fatal(err)
	}
	rp, err := r.Poles()
	if err != nil {
		t.Fatal(err)
	}
	return append(out, network{"resonant notch", rs, rp})
}

// resonantNotch is an invented network with complex poles (so the fit
// uses second-order sections): a 10 kΩ source, a 100 mH inductor, 22 nF
// and 470 Ω in series to ground (resonance near 3.4 kHz), and a 100 kΩ
// load.
func resonantNotch() *networks.Network {
	var n networks.Network
	n.Resistor("Rs", "in", "out", 10e3)
	n.Inductor("L1", "out", "a", 0.1)
	n.Capacitor("C1", "a", "b", 22e-9)
	n.Resistor("R1", "b", networks.Ground, 470)
	n.Resistor("Rload", "out", networks.Ground, 100e3)
	n.SetSource("in", 0)
	n.SetOutput("out")
	return &n
}

// bassMidTreble is an invented passive network with three sections: a
// treble leg (series C to a pot), a bass leg (series R, a pot, a C to
// ground) and a mid leg (R and C to ground), driven through 10 kΩ and
// loaded by 1 MΩ.
func bassMidTreble() *networks.Network {
	var n networks.Network
	n.Capacitor("Ct", "in", "t", 250e-12)
	n.Potentiometer("Pt", "t", "out", "b", networks.Pot{Value: 250e3, Position: 0.5})
	n.Resistor("Rs", "in", "b", 56e3)
	n.Capacitor("Cb", "b", "m", 22e-9)
	n.Potentiometer("Pb", "m", "m2", "m2", networks.Pot{Value: 1e6, Position: 0.5})
	n.Capacitor("Cm", "m2", networks.Ground, 22e-9)
	n.Resistor("Rm", "m2", networks.Ground, 25e3)
	n.Resistor("Rload", "out", networks.Ground, 1e6)
	n.SetSource("in", 10e3)
	n.SetOutput("out")
	return &n
}

// TestSineMatchesAnalysis renders sines through the fitted filter and
// compares their level with the network's exact gain (the figure analyze
// prints): within 0.1 dB to 10 kHz and 0.5 dB to 16 kHz, at 44.1 and 48 kHz.
func TestSineMatchesAnalysis(t *testing.T) {
	for _, rate := range []float64{44100, 48000} {
		for _, nw := range testNetworks(t) {
			f, err := Fit(nw.h, nw.poles, rate)
			if err != nil {
				t.Fatal(err)
			}
			worst10, worst16 := 0.0, 0.0
			for _, hz := range testFrequencies {
				want := 20 * math.Log10(cmplxAbs(nw.h.Transfer(hz)))
				e := math.Abs(sineGainDB(f, hz) - want)
				if hz <= 10000 {
					worst10 = math.Max(worst10, e)
				}
				worst16 = math.Max(worst16, e)
			}
			t.Logf("%g Hz, %s: worst %.4f dB to 10 kHz, %.4f dB to 16 kHz", rate, nw.name, worst10, worst16)
			if worst10 > 0.1 || worst16 > 0.5 {
				t.Errorf("%g Hz, %s: %.3f dB to 10 kHz, %.3f dB to 16 kHz", rate, nw.name, worst10, worst16)
			}
		}
	}
}
