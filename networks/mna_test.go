package networks

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"
)

func mustCompile(t testing.TB, n *Network) *Solver {
	t.Helper()
	s, err := n.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// rcNetwork is one RC low-pass section behind a source resistance rs.
func rcNetwork(rs, r, c float64) *Network {
	n := &Network{}
	n.SetSource("in", rs)
	n.Resistor("R1", "in", "out", r)
	n.Capacitor("C1", "out", Ground, c)
	n.SetOutput("out")
	return n
}

// A first-order RC low-pass is 1/√2 (−3.01 dB) at f = 1/(2πRC), with phase
// −45° (circuit theory; any text, e.g. Horowitz & Hill, The Art of
// Electronics, ch. 1).
func TestRCLowpassCorner(t *testing.T) {
	for _, tc := range []struct{ r, c float64 }{{10e3, 1e-9}, {1e3, 100e-9}, {4.7e3, 22e-9}} {
		s := mustCompile(t, rcNetwork(0, tc.r, tc.c))
		fc := 1 / (2 * math.Pi * tc.r * tc.c)
		h := s.Transfer(fc)
		if g := 20 * math.Log10(cmplx.Abs(h)); math.Abs(g-(-3.0103)) > 1e-4 {
			t.Errorf("R=%g C=%g: gain at 1/(2πRC) = %.5f dB, want -3.0103", tc.r, tc.c, g)
		}
		if ph := cmplx.Phase(h) * 180 / math.Pi; math.Abs(ph+45) > 1e-9 {
			t.Errorf("R=%g C=%g: phase %.6f°, want -45°", tc.r, tc.c, ph)
		}
	}
}

// Two identical unbuffered RC sections (R, C, R, C):
// H(s) = 1/(1 + 3sRC + (sRC)²). With x = ωRC, |H|² = 1/((1 − x²)² + 9x²),
// which is ½ when x⁴ + 7x² − 1 = 0, i.e. x² = (√53 − 7)/2, x ≈ 0.37424
// (derived here from the nodal equations; circuit theory).
func TestTwoRCSections(t *testing.T) {
	const r, c = 10e3, 10e-9
	n := &Network{}
	n.SetSource("in", 0)
	n.Resistor("R1", "in", "m", r)
	n.Capacitor("C1", "m", Ground, c)
	n.Resistor("R2", "m", "out", r)
	n.Capacitor("C2", "out", Ground, c)
	n.SetOutput("out")
	s := mustCompile(t, n)
	for _, f := range []float64{20, 300, 1591.5, 7000, 20000} {
		sx := complex(0, 2*math.Pi*f*r*c)
		want := 1 / (1 + 3*sx + sx*sx)
		if d := relDiff(s.Transfer(f), want); d > 1e-12 {
			t.Errorf("f=%g: relative difference %g from 1/(1+3sRC+(sRC)²)", f, d)
		}
	}
	x := math.Sqrt((math.Sqrt(53) - 7) / 2)
	if math.Abs(x-0.37424) > 1e-5 {
		t.Fatalf("derived x = %.6f", x)
	}
	f3 := x / (2 * math.Pi * r * c)
	if g := s.GainDB(f3); math.Abs(g+10*math.Log10(2)) > 1e-9 {
		t.Errorf("gain at ωRC=%.5f is %.6f dB, want -3.0103", x, g)
	}
}

// A source resistance Rs in series with one RC section adds to R: the corner
// moves to 1/(2π(R+Rs)C) (circuit theory: Thevenin's theorem).
func TestSourceImpedanceMovesCorner(t *testing.T) {
	const r, c = 10e3, 1e-9
	for _, rs := range []float64{0, 100, 1e3, 4.7e3, 22e3} {
		s := mustCompile(t, rcNetwork(rs, r, c))
		fc := 1 / (2 * math.Pi * (r + rs) * c)
		if g := s.GainDB(fc); math.Abs(g+10*math.Log10(2)) > 1e-9 {
			t.Errorf("Rs=%g: gain at 1/(2π(R+Rs)C) = %.6f dB, want -3.0103", rs, g)
		}
	}
}

func TestFloatingNodeIsNamed(t *testing.T) {
	n := rcNetwork(0, 1e3, 1e-9)
	n.Resistor("R9", "island", "island2", 1e3)
	_, err := n.Compile()
	if err == nil || !strings.Contains(err.Error(), `"island"`) {
		t.Fatalf("err = %v, want it to name node island", err)
	}
}

func TestBadValuesAreErrors(t *testing.T) {
	for _, v := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		n := rcNetwork(0, v, 1e-9)
		if _, err := n.Compile(); err == nil || !strings.Contains(err.Error(), "R1") {
			t.Errorf("R=%v: err = %v, want one naming R1", v, err)
		}
	}
	n := rcNetwork(0, 1e3, 1e-9)
	n.SetOutput("nowhere")
	if _, err := n.Compile(); err == nil || !strings.Contains(err.Error(), "nowhere") {
		t.Errorf("missing output: err = %v", err)
	}
}

// Two nodes joined only to each other float together: the error names one.
func TestFloatingPairIsError(t *testing.T) {
	n := &Network{}
	n.SetSource("in", 0)
	n.Resistor("R1", "in", Ground, 1e3)
	n.Capacitor("C1", "a", "b", 1e-9) // a and b float together
	n.SetOutput("a")
	if _, err := n.Compile(); err == nil || !strings.Contains(err.Error(), "floating") {
		t.Fatalf("err = %v, want floating", err)
	}
}

// Results do not depend on what the nodes are called or the order the
// elements are added in.
func TestNodeNamingInvariance(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 20; trial++ {
		c := randomChain(rng)
		n := c.Network()
		rename := map[string]string{}
		m := &Network{}
		name := func(s string) string {
			if isGround(s) {
				return s
			}
			if r, ok := rename[s]; ok {
				return r
			}
			rename[s] = "node_" + string(rune('a'+len(rename))) + "_" + s
			return rename[s]
		}
		els := append([]Element(nil), n.Elements...)
		rng.Shuffle(len(els), func(i, j int) { els[i], els[j] = els[j], els[i] })
		for _, e := range els {
			m.Add(Element{Name: e.Name, Kind: e.Kind, A: name(e.B), B: name(e.A), Value: e.Value})
		}
		for _, p := range n.Pots {
			m.Potentiometer(p.Name, name(p.Start), name(p.Wiper), name(p.Finish), p.Pot)
		}
		src, z := n.Source()
		m.SetSource(name(src), z)
		m.SetOutput(name(n.Output()))
		a, b := mustCompile(t, n), mustCompile(t, m)
		for _, f := range []float64{20, 440, 1000, 5000, 20000} {
			if d := relDiff(a.Transfer(f), b.Transfer(f)); d > 1e-12 {
				t.Fatalf("trial %d f=%g: renamed network differs by %g", trial, f, d)
			}
		}
	}
}

func TestSourceCurrentAndImpedance(t *testing.T) {
	// A 1 kΩ resistor to ground behind 1 kΩ of source: I = 1/2k, V(out) = ½,
	// and the output sees 1k ∥ 1k = 500 Ω (Ohm's law).
	n := &Network{}
	n.SetSource("out", 1e3)
	n.Resistor("R1", "out", Ground, 1e3)
	n.SetOutput("out")
	s := mustCompile(t, n)
	if err := s.Solve(1000); err != nil {
		t.Fatal(err)
	}
	if d := relDiff(s.SourceCurrent(), 0.5e-3); d > 1e-12 {
		t.Errorf("source current %v", s.SourceCurrent())
	}
	z, err := s.OutputImpedance(1000)
	if err != nil || relDiff(z, 500) > 1e-12 {
		t.Errorf("output impedance %v, %v; want 500", z, err)
	}
	if _, err := s.OutputImpedance(-1); err == nil {
		t.Error("negative frequency accepted")
	}
}
