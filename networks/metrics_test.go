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
	if len(a.Positions) != 5 || a.CornerHz == nil || a.Positions[4].Scoop == nil {
		t.Errorf("analysis %+v", a)
	}
}
