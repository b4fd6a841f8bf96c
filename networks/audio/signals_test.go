package audio

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// TestSignalsAreMadeAlike: every built-in signal is deterministic, has the
// length asked for and peaks at −6 dBFS; an unknown name is refused.
func TestSignalsAreMadeAlike(t *testing.T) {
	for _, name := range SignalNames {
		for _, rate := range []float64{22050, 48000, 192000} {
			a, err := Signal(name, rate, 1.5)
			if err != nil {
				t.Fatal(err)
			}
			b, _ := Signal(name, rate, 1.5)
			if !slices.Equal(a, b) {
				t.Errorf("%s at %g Hz differs between two calls", name, rate)
			}
			if len(a) != int(1.5*rate) {
				t.Errorf("%s at %g Hz: %d samples", name, rate, len(a))
			}
			peak := 0.0
			for _, v := range a {
				peak = math.Max(peak, math.Abs(v))
			}
			if math.Abs(peak-0.5) > 1e-12 {
				t.Errorf("%s at %g Hz peaks at %v", name, rate, peak)
			}
			if a[0] != 0 || a[len(a)-1] != 0 {
				t.Errorf("%s at %g Hz does not fade in and out", name, rate)
			}
		}
	}
	if _, err := Signal("hum", 48000, 1); err == nil {
		t.Error("an unknown signal was accepted")
	}
}

// octaveLevels returns the energy in dB of x in octave bands centred on
// 125 Hz to 8 kHz, from its FFT.
func octaveLevels(x []float64, rate float64) []float64 {
	c := fourier.NewFFT(len(x)).Coefficients(nil, x)
	var out []float64
	for fc := 125.0; fc <= 8000; fc *= 2 {
		lo, hi := fc/math.Sqrt2, fc*math.Sqrt2
		e := 0.0
		for k, v := range c {
			if f := float64(k) * rate / float64(len(x)); f >= lo && f < hi {
				e += real(v)*real(v) + imag(v)*imag(v)
			}
		}
		out = append(out, 10*math.Log10(e))
	}
	return out
}

// TestPinkNoiseIsPink: pink noise has equal energy per octave (its power
// density falls 3 dB per octave); the Voss–McCartney method holds that
// within about a decibel (the bands here: 125 Hz to 8 kHz, ±1.5 dB).
func TestPinkNoiseIsPink(t *testing.T) {
	const rate = 48000.0
	x := PinkNoise(1<<20, 1)
	lv := octaveLevels(x, rate)
	mean := 0.0
	for _, v := range lv {
		mean += v / float64(len(lv))
	}
	for i, v := range lv {
		if math.Abs(v-mean) > 1.5 {
			t.Errorf("octave %d (%g Hz): %.2f dB from the mean", i, 125*math.Pow(2, float64(i)), v-mean)
		}
	}
}

// TestPluckPitch: a Karplus–Strong note sounds at rate/P for a delay line
// of P samples (the loop's two-point average adds half a sample, which the
// strongest autocorrelation lag, P, does not see); the note is checked by
// that lag.
func TestPluckPitch(t *testing.T) {
	const rate = 48000.0
	for _, hz := range []float64{82.41, 220, 440} {
		x := make([]float64, int(rate))
		karplusStrong(x, 0, hz, rate, 2, newTestRand())
		p := int(math.Round(rate / hz))
		best, lag := 0.0, 0
		for l := p / 2; l < 2*p-p/2; l++ {
			s := 0.0
			for i := 0; i+l < len(x); i++ {
				s += x[i] * x[i+l]
			}
			if s > best {
				best, lag = s, l
			}
		}
		if lag != p && lag != p+1 {
			t.Errorf("%g Hz note: strongest lag %d samples, want %d", hz, lag, p)
		}
	}
}

func newTestRand() *rand.Rand { return rand.New(rand.NewPCG(11, 12)) }
