package networks

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// The two-port cascade and the nodal solver are two independent
// computations of the same circuit; they agree to rounding on random chains.
func TestCompiledEqualsNodal(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	freqs := LogGrid(20, 20000, 10)
	for trial := 0; trial < 300; trial++ {
		c := randomChain(rng)
		s := mustCompile(t, c.Network())
		k := c.Compile()
		for _, f := range freqs {
			if d := relDiff(k.Transfer(f), s.Transfer(f)); d > 1e-9 {
				t.Fatalf("trial %d f=%g: fast path differs from nodal solver by %g (%+v)", trial, f, d, c)
			}
		}
		if g, h := k.GainDB(1000), s.GainDB(1000); math.Abs(g-h) > 1e-9 {
			t.Fatalf("trial %d: GainDB %g vs %g", trial, g, h)
		}
		// Output impedance: the nodal solver without the load.
		noLoad := c
		noLoad.Load = Load{R: math.Inf(1)}
		zs, err := mustCompile(t, noLoad.Network()).OutputImpedance(1000)
		if err != nil {
			t.Fatal(err)
		}
		if d := relDiff(k.OutputImpedance(1000), zs); d > 1e-9 {
			t.Fatalf("trial %d: output impedance %v vs nodal %v", trial, k.OutputImpedance(1000), zs)
		}
		// Input impedance at "in": V(in) over the source current.
		if err := s.Solve(1000); err != nil {
			t.Fatal(err)
		}
		zin := s.Voltage(NodeIn) / s.SourceCurrent()
		if d := relDiff(k.InputImpedance(1000), zin); d > 1e-9 {
			t.Fatalf("trial %d: input impedance %v vs nodal %v", trial, k.InputImpedance(1000), zin)
		}
	}
}

// The ideal blend network at the centre of its knob. With no source
// impedance, no load and a pot so large that it draws no current, the legs
// give V_lp = 1/(1 + sτ₁) and V_hp = sτ₂/(1 + sτ₂) (τ₁ = R₁C₁, τ₂ = R₂C₂)
// and the wiper halfway along the track averages them:
//
//	H = ½·[1/(1 + sτ₁) + sτ₂/(1 + sτ₂)] = ½·(1 + 2sτ₂ + s²τ₁τ₂)/((1 + sτ₁)(1 + sτ₂)).
//
// At ω₀ = 1/√(τ₁τ₂), s²τ₁τ₂ = −1, so the numerator is 2jω₀τ₂ and the
// denominator jω₀(τ₁ + τ₂): H(ω₀) = τ₂/(τ₁ + τ₂) = 1/(r + 1) with r = τ₁/τ₂.
// The shoulders (DC and high frequency) are ½, so the notch lies
// 20·log10(2/(r + 1)) dB below them; |H| is symmetric in log ω about ω₀,
// which is therefore the minimum (derived here; circuit theory).
func TestIdealBlendClosedForm(t *testing.T) {
	for _, tc := range []struct{ r1, c1, r2, c2 float64 }{
		{33e3, 10e-9, 33e3, 1e-9},
		{10e3, 47e-9, 100e3, 470e-12},
		{22e3, 22e-9, 47e3, 2.2e-9},
	} {
		c := Chain{
			Blend: Blend{Lowpass: RC{R: tc.r1, C: tc.c1}, Highpass: RC{R: tc.r2, C: tc.c2}, Pot: Pot{Value: 1e13, Position: 0.5}},
			Load:  Load{R: math.Inf(1)},
		}
		k := c.Compile()
		t1, t2 := tc.r1*tc.c1, tc.r2*tc.c2
		r := t1 / t2
		f0 := 1 / (2 * math.Pi * math.Sqrt(t1*t2))
		for _, f := range []float64{f0 / 10, f0, f0 * 3} {
			s := complex(0, 2*math.Pi*f)
			want := 0.5 * (1/(1+s*complex(t1, 0)) + s*complex(t2, 0)/(1+s*complex(t2, 0)))
			if d := relDiff(k.Transfer(f), want); d > 1e-6 {
				t.Errorf("f=%g: differs from closed form by %g", f, d)
			}
		}
		// The metric on a band wide enough for the shoulders to reach ½.
		m := NewMeter(Band{From: f0 / 1e4, To: f0 * 1e4})
		sc, ok := m.Scoop(k)
		if !ok {
			t.Fatal("no scoop found")
		}
		if math.Abs(sc.Hz/f0-1) > 1e-6 {
			t.Errorf("scoop at %g Hz, closed form %g", sc.Hz, f0)
		}
		if want := 20 * math.Log10(2/(r+1)); math.Abs(sc.DepthDB-want) > 1e-3 {
			t.Errorf("depth %.5f dB, closed form %.5f", sc.DepthDB, want)
		}
		if math.Abs(sc.BalanceDB) > 1e-3 {
			t.Errorf("balance %.5f dB, want 0", sc.BalanceDB)
		}
	}
}

// With the level pot at 0 the wiper sits on the ground end: only the end
// resistance is left, and the output is more than 90 dB down.
func TestLevelAtZeroIsSilent(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 50; trial++ {
		c := randomChain(rng)
		c.Level = &Level{Pot: Pot{Value: 100e3, Taper: Taper{Law: Audio}, Position: 0}}
		k := c.Compile()
		for _, f := range []float64{20, 1000, 20000} {
			if g := k.GainDB(f); g > -90 {
				t.Fatalf("trial %d f=%g: %g dB with the level at 0", trial, f, g)
			}
		}
	}
}

// Knob 0 with an ideal source, an open load and a pot too large to load the
// legs is the low-pass leg alone: 1/(1 + sR₁C₁) (circuit theory).
func TestKnobZeroIsLowpassLeg(t *testing.T) {
	c := Chain{
		Blend: Blend{Lowpass: RC{R: 22e3, C: 10e-9}, Highpass: RC{R: 47e3, C: 1e-9}, Pot: Pot{Value: 1e13, Position: 0}},
		Load:  Load{R: math.Inf(1)},
	}
	k := c.Compile()
	for _, f := range LogGrid(20, 20000, 5) {
		want := 1 / (1 + complex(0, 2*math.Pi*f*22e3*10e-9))
		if d := relDiff(k.Transfer(f), want); d > 1e-6 {
			t.Errorf("f=%g: %v, low-pass leg %v", f, k.Transfer(f), want)
		}
	}
}

func TestNetworkNodesOfChain(t *testing.T) {
	c := Chain{
		Source:  Source{Impedance: 1e3, SeriesC: 1e-6},
		Blend:   Blend{Lowpass: RC{R: 22e3, C: 10e-9}, Highpass: RC{R: 47e3, C: 1e-9}, Pot: Pot{Value: 1e5, Position: 0.3}},
		Filters: []RC{{R: 1e4, C: 1e-9}},
		Level:   &Level{Pot: Pot{Value: 1e5, Position: 1}},
		Load:    Load{R: 1e6, C: 1e-10},
	}
	s := mustCompile(t, c.Network())
	want := map[string]bool{"drive": true, "in": true, "lp": true, "hp": true, "tone": true, "filtered": true, "out": true, "(source)": true}
	for _, n := range s.Nodes() {
		if !want[n] {
			t.Errorf("unexpected node %q", n)
		}
		delete(want, n)
	}
	if len(want) != 0 {
		t.Errorf("missing nodes %v", want)
	}
	if cmplx.IsNaN(s.Transfer(1000)) {
		t.Error("NaN transfer")
	}
}

// GainDB's real arithmetic equals the complex two-port form on random
// chains (invented) within 1e-9 relative in |H|, and both equal the nodal
// solver.
func TestCompiledGainDBRealArithmetic(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 9))
	freqs := LogGrid(10, 100e3, 20)
	for trial := 0; trial < 500; trial++ {
		c := randomChain(rng)
		k := c.Compile()
		s := mustCompile(t, c.Network())
		for _, f := range freqs {
			g, ref := k.GainDB(f), k.gainDBComplex(f)
			// 1e-9 relative in |H| is 20·log10(1 + 1e-9) ≈ 8.7e-9 dB.
			if math.Abs(g-ref) > 8.7e-9 || math.Abs(g-s.GainDB(f)) > 8.7e-9 {
				t.Fatalf("trial %d f=%g: GainDB %.12f, complex form %.12f, nodal %.12f", trial, f, g, ref, s.GainDB(f))
			}
		}
	}
}

// Twenty RC sections of 1 GΩ and 1 F, the design validator's limits: the
// gain is about −5600 dB at 20 kHz, below the range of a float64 (the
// nodal solver and the complex form underflow), yet GainDB stays finite.
// It is checked against a closed form: far above its poles the ladder's
// transfer from its input node is 1/(s^n·Π R_i·C_i) within O(1/(ωRC)) (the
// leading term of its denominator is the product of every series R and
// shunt C; circuit theory), and a ladder of 1 GΩ input impedance barely
// loads the blend network (a relative effect of 10⁻⁶), so the gain is the
// blend network's alone (the nodal solver, no filters) minus
// 20·20·log10(ωRC), within 1e-4 dB.
func TestCompiledGainDBFiniteAtLimits(t *testing.T) {
	c := Chain{
		Blend: Blend{Lowpass: RC{R: 1e3, C: 1e-9}, Highpass: RC{R: 1e3, C: 1e-9}, Pot: Pot{Value: 1e4, Position: 0}},
		Load:  Load{R: math.Inf(1)},
	}
	blendOnly := mustCompile(t, c.Network())
	for i := 0; i < 20; i++ {
		c.Filters = append(c.Filters, RC{R: 1e9, C: 1})
	}
	k := c.Compile()
	for _, f := range []float64{20, 1000, 20000} {
		g := k.GainDB(f)
		want := blendOnly.GainDB(f) - 400*math.Log10(2*math.Pi*f*1e9)
		if math.IsInf(g, 0) || math.IsNaN(g) || math.Abs(g-want) > 1e-4 {
			t.Errorf("at %g Hz: %.6f dB, closed form %.6f dB", f, g, want)
		}
	}
}
