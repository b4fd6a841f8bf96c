package networks

import (
	"math"
	"testing"
)

// The corner metric is where the gain is exactly 3 dB below its maximum.
// For one RC section the maximum is at band low (≈ 0 dB) and
// |H|² = 1/(1 + (ωRC)²) = 10^(−0.3)·|H(f_low)|² gives
// ωRC = √((1 + (ω_low RC)²)·10^0.3 − 1) (circuit theory).
func TestCornerOfOneRC(t *testing.T) {
	m := NewMeter(DefaultBand)
	for _, tc := range []struct{ r, c float64 }{{10e3, 1e-9}, {10e3, 10e-9}, {1e3, 47e-9}} {
		s := mustCompile(t, rcNetwork(0, tc.r, tc.c))
		hz, ok := m.Corner(s)
		if !ok {
			t.Fatalf("R=%g C=%g: no corner", tc.r, tc.c)
		}
		wl := 2 * math.Pi * DefaultBand.From * tc.r * tc.c
		want := math.Sqrt((1+wl*wl)*math.Pow(10, 0.3)-1) / (2 * math.Pi * tc.r * tc.c)
		if math.Abs(hz/want-1) > 1e-9 {
			t.Errorf("R=%g C=%g: corner %.6f Hz, want %.6f", tc.r, tc.c, hz, want)
		}
		if _, ok := m.Scoop(s); ok {
			t.Errorf("R=%g C=%g: a monotonic low-pass has no scoop", tc.r, tc.c)
		}
	}
	// A corner beyond 10 × band high is none.
	s := mustCompile(t, rcNetwork(0, 10, 1e-9))
	if hz, ok := m.Corner(s); ok {
		t.Errorf("corner at %g Hz reported for a 16 MHz low-pass", hz)
	}
}

// LevelsAt at the scoop frequency agrees with Scoop, and it gives a finite
// slope where there is no scoop.
func TestLevelsAt(t *testing.T) {
	c := benchChain()
	k := c.Compile()
	m := NewMeter(DefaultBand)
	s, ok := m.Scoop(k)
	if !ok {
		t.Fatal("bench chain has no scoop at the centre")
	}
	l := m.LevelsAt(k, s.Hz)
	if math.Abs(l.DepthDB-s.DepthDB) > 1e-6 || math.Abs(l.BalanceDB-s.BalanceDB) > 1e-6 {
		t.Errorf("LevelsAt(scoop) = %+v, Scoop = %+v", l, s)
	}
	c.Blend.Pot.Position = 0
	k = c.Compile()
	if _, ok := m.Scoop(k); ok {
		t.Fatal("knob 0 has a scoop")
	}
	l2, found := m.ScoopOrLevelsAt(k, 800)
	if found || math.IsNaN(l2.DepthDB) || l2.Hz != 800 {
		t.Errorf("fallback %+v %v", l2, found)
	}
}

func TestAnalyzeRejectsPositions(t *testing.T) {
	d, err := ParseDesign([]byte(exampleDesign), "x.yaml")
	if err != nil {
		t.Fatal(err)
	}
	for _, ps := range [][]float64{nil, {1.5}, {-0.1}, {math.NaN()}} {
		if _, err := Analyze(d, ps); err == nil {
			t.Errorf("positions %v accepted", ps)
		}
	}
	a, err := Analyze(d, DefaultPositions)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Positions) != 5 || a.CornerHz == nil || a.Positions[2].Scoop == nil {
		t.Errorf("analysis %+v", a)
	}
}

// parabola is a response with G(f) = top − (log10 f − log10 at)², in dB.
type parabola struct{ at, top float64 }

func (p parabola) GainDB(f float64) float64 {
	d := math.Log10(f) - math.Log10(p.at)
	return p.top - d*d
}

// The peak of a parabola in log f is its vertex (elementary algebra); a
// peak beyond the band is reported at the band's end, with that end's
// gain.
func TestPeak(t *testing.T) {
	m := NewMeter(DefaultBand)
	for _, at := range []float64{33.3, 1000, 4321, 19000} {
		hz, g := m.Peak(parabola{at, 2.5})
		if math.Abs(hz/at-1) > 1e-6 || math.Abs(g-2.5) > 1e-12 {
			t.Errorf("vertex at %v Hz: peak %v Hz, %v dB", at, hz, g)
		}
	}
	hz, g := m.Peak(parabola{5, 0})
	if hz != DefaultBand.From || g != (parabola{5, 0}).GainDB(DefaultBand.From) {
		t.Errorf("vertex below the band: peak %v Hz, %v dB; want the band's low end", hz, g)
	}
}
