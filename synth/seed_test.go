package synth

import (
	"math"
	"testing"

	"tonewright/networks"
)

// The closed form of the ideal blend network, derived here and checked
// against the nodal solver (a textbook derivation; the model is the one
// package networks solves).
//
// With zero source impedance, no load and a linear pot of track P at its
// centre, the wiper sees the low-pass node through P/2 and the high-pass
// node through P/2. As P → ∞ the pot draws no current from the legs, so the
// legs are unloaded dividers, V_lp = 1/(1+sτ₁) and V_hp = sτ₂/(1+sτ₂) with
// τ₁ = R₁C₁, τ₂ = R₂C₂, and the wiper is their mean:
//
//	H = ½·[1/(1+sτ₁) + sτ₂/(1+sτ₂)].
//
// At ω₀ = 1/√(τ₁τ₂) write r = τ₁/τ₂, so ω₀τ₁ = √r and ω₀τ₂ = 1/√r. Then
// sτ₂/(1+sτ₂) = j/(√r + j) = 1/(1 − j√r), and H = ½·[1/(1+j√r) + 1/(1−j√r)]
// = 1/(1+r), real. Both shoulders tend to ½ (the low-pass leg passes
// everything at DC, the high-pass leg at high frequency), so the dip
// lies 20·log10((1/(1+r))/(1/2)) = 20·log10(2/(r+1)) dB below them. The
// curve is symmetric in log f about ω₀ (swap f ↔ f₀²/f and the two legs
// trade places), so ω₀ is the minimum.
func TestIdealNotchAgainstSolver(t *testing.T) {
	for _, c := range []struct{ hz, depth float64 }{
		{800, -10}, {300, -6}, {1500, -15}, {2000, -3},
	} {
		tau1, tau2, err := IdealNotch(c.hz, c.depth)
		if err != nil {
			t.Fatal(err)
		}
		r := tau1 / tau2
		if got := 20 * math.Log10(2/(r+1)); math.Abs(got-c.depth) > 1e-9 {
			t.Errorf("%v: closed-form depth %v, want %v", c, got, c.depth)
		}
		// A near-ideal network: tiny source, open load, a pot 10⁴ times
		// the leg resistances, and a band wide enough to reach the
		// shoulders.
		const R = 10e3
		d := &networks.Design{
			Band: networks.Band{From: c.hz / 1e4, To: c.hz * 1e4},
			Tone: networks.Tone{Network: networks.BlendNetwork,
				Lowpass: networks.RC{R: R, C: tau1 / R}, Highpass: networks.RC{R: R, C: tau2 / R},
				Pot: networks.PotPart{Value: 1e4 * R, Taper: networks.Taper{Law: networks.Linear}}},
			Load: networks.Load{R: math.Inf(1)},
		}
		ch := d.Chain(0.5)
		s, err := ch.Network().Compile()
		if err != nil {
			t.Fatal(err)
		}
		m := networks.NewMeter(d.Band)
		sc, ok := m.Scoop(s)
		if !ok {
			t.Fatalf("%v: the solver finds no scoop", c)
		}
		if math.Abs(sc.Hz/c.hz-1) > 1e-3 || math.Abs(sc.DepthDB-c.depth) > 0.01 || math.Abs(sc.BalanceDB) > 0.01 {
			t.Errorf("%v: solver gives %+v", c, sc)
		}
	}
	for _, bad := range [][2]float64{{0, -10}, {800, 0}, {800, 3}, {math.Inf(1), -10}} {
		if _, _, err := IdealNotch(bad[0], bad[1]); err == nil {
			t.Errorf("IdealNotch(%v) accepted", bad)
		}
	}
}

// LadderTau against the solver: n identical sections from an ideal source
// into an open load are 3 dB down at the corner asked for. One section is
// the textbook f = 1/(2πRC); two sections give H = 1/(1 + 3sτ + s²τ²),
// whose −3 dB point is ωτ ≈ 0.3742 (solved from (1 − x²)² + 9x² = 2).
func TestLadderTauAgainstSolver(t *testing.T) {
	if got, want := ladderCornerFactor(2), math.Sqrt((-7+math.Sqrt(53))/2); math.Abs(got-want) > 1e-9 {
		t.Errorf("two sections: ωτ = %v, want %v", got, want)
	}
	if got := ladderCornerFactor(1); math.Abs(got-1) > 1e-9 {
		t.Errorf("one section: ωτ = %v, want 1", got)
	}
	for n := 1; n <= 4; n++ {
		const fc, R = 5000.0, 1e3
		tau := LadderTau(fc, n)
		var n0 networks.Network
		var secs []networks.RC
		for i := 0; i < n; i++ {
			secs = append(secs, networks.RC{R: R, C: tau / R})
		}
		networks.BuildLadder(&n0, secs, "in", "out")
		n0.SetSource("in", 0)
		n0.SetOutput("out")
		s, err := n0.Compile()
		if err != nil {
			t.Fatal(err)
		}
		if g := s.GainDB(fc); math.Abs(g+10*math.Log10(2)) > 1e-6 {
			t.Errorf("%d sections: gain at the corner %v dB, want −3.0103", n, g)
		}
	}
}
