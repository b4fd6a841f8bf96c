package audio

import (
	"math"
	"testing"

	"tonewright/networks"
)

// demoTurn fits the filters of a turn of the demo design's blend knob (an
// invented board) at rate.
func demoTurn(t testing.TB, rate float64) []*Filter {
	d, err := networks.LoadDesign("../../testdata/demo-design.yaml")
	if err != nil {
		t.Fatal(err)
	}
	fs, _, err := TurnFilters(func(pos float64) (Response, []complex128, error) {
		c := d.Chain(pos)
		p, err := c.Network().Poles()
		return c.Compile(), p, err
	}, rate)
	if err != nil {
		t.Fatal(err)
	}
	return fs
}

// clickiness is the largest fourth difference of y after skip samples, as
// a fraction of y's peak. A step of size δ in y gives a fourth difference
// of up to 6δ; a sine of angular step θ gives θ⁴ of its amplitude.
func clickiness(y []float64, skip int) float64 {
	peak, d4 := 0.0, 0.0
	for i := skip; i < len(y); i++ {
		peak = math.Max(peak, math.Abs(y[i]))
		if i >= 4 {
			v := y[i] - 4*y[i-1] + 6*y[i-2] - 4*y[i-3] + y[i-4]
			d4 = math.Max(d4, math.Abs(v))
		}
	}
	return d4 / peak
}

// TestTurnHasNoClicks turns the blend knob over two and over eight seconds
// while a steady 200 Hz sine plays, and looks for clicks and zipper noise
// with a fourth difference (a steep high-pass): the turn must stay within
// 10⁻⁴ of its peak (the sine alone gives 4·10⁻⁷), while the same turn made
// by switching filters without a crossfade, the check's own control, must
// not. In the two-second turn a filter runs ahead for a whole step of the
// knob; in the eight-second one, for its pre-roll only.
func TestTurnHasNoClicks(t *testing.T) {
	const rate = 48000.0
	fs := demoTurn(t, rate)
	for _, secs := range []float64{2, 8} {
		n := int((secs + 0.5) * rate)
		x := make([]float64, n)
		for i := range x {
			x[i] = math.Sin(2 * math.Pi * 200 * float64(i) / rate)
		}
		y := make([]float64, n)
		tr := NewTurn(fs, int64(secs*rate))
		for i := 0; i < n; i += 1000 { // odd block sizes on purpose
			j := min(i+1000, n)
			tr.Process(x[i:j], y[i:j])
		}
		got := clickiness(y, int(0.2*rate))
		t.Logf("%g s turn, %d filters, pre-roll %d samples: fourth difference %.2g of the peak", secs, len(fs), tr.preroll, got)
		if got > 1e-4 {
			t.Errorf("the %g s turn clicks: fourth difference %.2g of the peak", secs, got)
		}

		// The control: switch filters at each grid step with fresh states.
		z := make([]float64, n)
		step := int(secs * rate / float64(len(fs)-1))
		for k, i := 0, 0; i < n; k, i = k+1, i+step {
			f := fs[min(k, len(fs)-1)]
			j := min(i+step, n)
			f.Process(f.NewState(), x[i:j], z[i:j])
		}
		if c := clickiness(z, int(0.2*rate)); c < 1e-2 {
			t.Errorf("the control (switched filters) shows only %.2g: the check cannot see clicks", c)
		}
	}
}

// TestTurnEndsAtTheLastFilter checks that after the turn the output is the
// last filter's, sample for sample, apart from rounding: the crossfade and
// the handed-over states leave nothing behind.
func TestTurnEndsAtTheLastFilter(t *testing.T) {
	const rate = 44100.0
	fs := demoTurn(t, rate)
	n := int(3 * rate)
	x := PinkNoise(n, 7)
	y := make([]float64, n)
	NewTurn(fs, int64(rate)).Process(x, y)
	last := fs[len(fs)-1]
	ref := make([]float64, n)
	last.Process(last.NewState(), x, ref)
	worst, peak := 0.0, 0.0
	for i := int(2 * rate); i < n; i++ {
		worst = math.Max(worst, math.Abs(y[i]-ref[i]))
		peak = math.Max(peak, math.Abs(ref[i]))
	}
	if worst > 1e-6*peak {
		t.Errorf("a second after the turn the output differs from the last filter's by %.2g of the peak", worst/peak)
	}
}
