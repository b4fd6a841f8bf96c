package audio

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// The built-in test signals, made here (nothing recorded). Each is mono,
// deterministic (a fixed seed), faded in and out over FadeSeconds and peaks
// at −6 dBFS.

// SignalNames lists the built-in signals in the order the command shows.
var SignalNames = []string{"pluck", "chord", "noise", "sweep"}

// Signal makes the built-in signal name at rate, seconds long.
func Signal(name string, rate, seconds float64) ([]float64, error) {
	n := int(math.Round(rate * seconds))
	if n < 1 {
		return nil, fmt.Errorf("a signal of %v s at %v Hz has no samples", seconds, rate)
	}
	var x []float64
	switch name {
	case "pluck":
		x = Pluck(rate, n)
	case "chord":
		x = Chord(rate, n)
	case "noise":
		x = PinkNoise(n, 1)
	case "sweep":
		x = Sweep(rate, n, 20, math.Min(20000, FitTop*rate))
	default:
		return nil, fmt.Errorf("unknown signal %q: use pluck, chord, noise or sweep", name)
	}
	fade(x, rate)
	normalize(x, 0.5)
	return x, nil
}

// FadeSeconds is the length of the raised-cosine fade at each end of a
// built-in signal, so that a signal cut short (a note still ringing, noise)
// does not click.
const FadeSeconds = 0.02

func fade(x []float64, rate float64) {
	m := min(int(FadeSeconds*rate), len(x)/2)
	for i := 0; i < m; i++ {
		g := 0.5 - 0.5*math.Cos(math.Pi*float64(i)/float64(m))
		x[i] *= g
		x[len(x)-1-i] *= g
	}
}

// phrase is an invented phrase: string frequencies in Hz and start times
// in beats (a beat is a quarter of a second).
var phrase = []struct{ hz, beat float64 }{
	{82.41, 0}, {123.47, 1}, {164.81, 2}, {196.00, 3}, {246.94, 4}, {196.00, 5},
	{220.00, 6}, {329.63, 7}, {293.66, 8}, {246.94, 9}, {110.00, 10}, {164.81, 10.5},
	{220.00, 11}, {277.18, 11.5}, {329.63, 12}, {440.00, 13}, {392.00, 14}, {98.00, 16},
}

// Pluck is n samples of an invented phrase of plucked-string notes, each
// made by the Karplus–Strong method (a noise burst circulating in a delay
// line of one period with a two-point averaging low-pass in the loop). The
// phrase repeats to fill n samples.
func Pluck(rate float64, n int) []float64 {
	x := make([]float64, n)
	rng := rand.New(rand.NewPCG(1, 2))
	span := 18 * 0.25 * rate
	for rep := 0.0; rep*span < float64(n); rep++ {
		for _, note := range phrase {
			start := int(rep*span + note.beat*0.25*rate)
			karplusStrong(x, start, note.hz, rate, 2.5, rng)
		}
	}
	return x
}

// Chord is n samples of an invented six-string chord, strummed (8 ms
// between strings) every two seconds.
func Chord(rate float64, n int) []float64 {
	x := make([]float64, n)
	rng := rand.New(rand.NewPCG(3, 4))
	notes := []float64{82.41, 123.47, 164.81, 207.65, 246.94, 329.63}
	for t := 0; t < n; t += int(2 * rate) {
		for k, hz := range notes {
			karplusStrong(x, t+int(float64(k)*0.008*rate), hz, rate, 4, rng)
		}
	}
	return x
}

// karplusStrong adds one plucked note at sample start, decaying over about
// decay seconds.
func karplusStrong(x []float64, start int, hz, rate, decay float64, rng *rand.Rand) {
	if start >= len(x) {
		return
	}
	p := int(math.Round(rate / hz))
	line := make([]float64, p)
	for i := range line {
		line[i] = 2*rng.Float64() - 1
	}
	// Loop gain per period so the note falls 60 dB in decay seconds.
	g := math.Pow(10, -3/(decay*hz))
	k := 0
	prev := 0.0
	for i := start; i < len(x) && i < start+int(decay*rate*1.5); i++ {
		v := line[k]
		x[i] += v
		line[k] = g * 0.5 * (v + prev)
		prev = v
		k++
		if k == p {
			k = 0
		}
	}
}

// PinkNoise is n samples of pink noise (power falling 3 dB per octave) by
// the Voss–McCartney method: sixteen white sources, source k renewed every
// 2^k samples, summed.
func PinkNoise(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 5))
	const rows = 16
	var r [rows]float64
	sum := 0.0
	for k := range r {
		r[k] = 2*rng.Float64() - 1
		sum += r[k]
	}
	x := make([]float64, n)
	for i := range x {
		// The row renewed is the number of trailing zeros of i.
		if i > 0 {
			k := 0
			for v := i; v&1 == 0 && k < rows-1; v >>= 1 {
				k++
			}
			sum -= r[k]
			r[k] = 2*rng.Float64() - 1
			sum += r[k]
		}
		x[i] = sum + 2*rng.Float64() - 1
	}
	return x
}

// Sweep is n samples of a logarithmic (exponential) sine sweep from f0 to
// f1 Hz: phase 2π·f0·L·(e^{t/L} − 1) with L = duration / ln(f1/f0), faded in
// and out over 10 ms.
func Sweep(rate float64, n int, f0, f1 float64) []float64 {
	x := make([]float64, n)
	dur := float64(n) / rate
	L := dur / math.Log(f1/f0)
	fade := int(0.01 * rate)
	for i := range x {
		t := float64(i) / rate
		v := math.Sin(2 * math.Pi * f0 * L * (math.Exp(t/L) - 1))
		if i < fade {
			v *= float64(i) / float64(fade)
		}
		if j := n - 1 - i; j < fade {
			v *= float64(j) / float64(fade)
		}
		x[i] = v
	}
	return x
}

// normalize scales x so that its peak is peak.
func normalize(x []float64, peak float64) {
	m := 0.0
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	if m > 0 {
		for i := range x {
			x[i] *= peak / m
		}
	}
}
