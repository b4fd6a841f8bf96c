package networks

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"
)

// randomNetlist draws a random network of 2 to 12 non-ground nodes:
// invented test data, not a real circuit. A random spanning tree of
// resistors joins every node to node 1, the source's, and it to ground, so
// every node has a DC path to ground (as in a real circuit, where a node
// reached through capacitors only would hold an arbitrary charge), none is
// reached through inductors alone, and the output is reached from the
// source; then between half and one and a half times as many random
// pots are added. Values
// are log-uniform over 10 Ω–10 MΩ, 10 pF–10 µF and 1 mH–10 H; the source
// is ideal in a third of the draws, else behind 10 Ω–100 kΩ.
func randomNetlist(rng *rand.Rand) *Network {
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	nodes := 2 + rng.IntN(11)
	name := func(i int) string {
		if i == 0 {
			return Ground
		}
		return fmt.Sprintf("n%d", i)
	}
	n := &Network{}
	count := 0
	add := func(kind Kind, a, b int) {
		count++
		nm := fmt.Sprintf("%d", count)
		switch kind {
		case Resistor:
			n.Resistor("R"+nm, name(a), name(b), logU(10, 10e6))
		case Capacitor:
			n.Capacitor("C"+nm, name(a), name(b), logU(10e-12, 10e-6))
		default:
			n.Inductor("L"+nm, name(a), name(b), logU(1e-3, 10))
		}
	}
	for i := 1; i <= nodes; i++ {
		kind := Resistor
		to := 0 // node 1 hangs from ground, the others from earlier nodes
		if i > 1 {
			to = 1 + rng.IntN(i-1)
		}
		add(kind, i, to)
	}
	for extra := 1 + nodes/2 + rng.IntN(nodes+1); extra > 0; extra-- {
		a, b := rng.IntN(nodes+1), rng.IntN(nodes+1)
		if a == b {
			continue
		}
		if rng.IntN(4) == 0 {
			count++
			tapers := []Taper{{Law: Linear}, {Law: Audio}, {Law: ReverseAudio}}
			n.Potentiometer(fmt.Sprintf("P%d", count), name(a), name(1+rng.IntN(nodes)), name(b),
				Pot{Value: logU(1e3, 1e6), Taper: tapers[rng.IntN(3)], Position: rng.Float64()})
			continue
		}
		add([]Kind{Resistor, Resistor, Capacitor, Inductor}[rng.IntN(4)], a, b)
	}
	rs := 0.0
	if rng.IntN(3) > 0 {
		rs = logU(10, 100e3)
	}
	n.SetSource(name(1), rs)
	n.SetOutput(name(2 + rng.IntN(nodes-1)))
	return n
}

// The compiled poles, zeros and gain against the nodal solver, two
// independent computations of the same circuit, on 400 random netlists
// (invented, seeded): the complex transfer within 5e-9 relative over
// 10 Hz–100 kHz, the gain within 5e-8 dB and the phase within 1e-8 rad.
// Nearly all points agree within 1e-9; the worst few, beside parts six
// decades apart, reach 3e-9, the order of the nodal solver's own rounding
// (its LU factorisation of a matrix whose entries span 10⁷).
func TestZPKEqualsNodal(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	freqs := LogGrid(10, 100e3, 10)
	worst := 0.0
	for trial := 0; trial < 400; trial++ {
		n := randomNetlist(rng)
		k, err := n.CompileZPK()
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		s := mustCompile(t, n)
		for _, f := range freqs {
			h := s.Transfer(f)
			d := relDiff(k.Transfer(f), h)
			worst = math.Max(worst, d)
			if d > 5e-9 {
				t.Errorf("trial %d f=%g: ZPK %v, nodal %v (relative %g); %d poles %v, %d zeros %v", trial, f, k.Transfer(f), h, d,
					len(k.poles), k.poles, len(k.zeros), k.zeros)
				break
			}
			if g := 20 * math.Log10(cmplx.Abs(h)); math.Abs(k.GainDB(f)-g) > 5e-8 {
				t.Errorf("trial %d f=%g: GainDB %g, nodal %g", trial, f, k.GainDB(f), g)
				break
			}
			if dp := math.Remainder(k.Phase(f)-cmplx.Phase(h), 2*math.Pi); math.Abs(dp) > 1e-8 {
				t.Errorf("trial %d f=%g: phase %g, nodal %g", trial, f, k.Phase(f), cmplx.Phase(h))
				break
			}
		}
	}
	t.Logf("largest relative difference %g", worst)
}

// The compiled form against an outside reference: the ngspice simulator's
// AC analysis (Debian package ngspice) on 30 random netlists (invented,
// seeded, as for TestZPKEqualsNodal). Magnitude within 0.01 dB and phase
// within 0.1° over 10 Hz–100 kHz.
func TestZPKAgainstNgspice(t *testing.T) {
	RequireNgspice(t)
	rng := rand.New(rand.NewPCG(30, 31))
	for trial := 0; trial < 30; trial++ {
		n := randomNetlist(rng)
		k, err := n.CompileZPK()
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		var deck strings.Builder
		if err := n.WriteSPICE(&deck, "random netlist (invented)", Band{From: 10, To: 100e3}, 10); err != nil {
			t.Fatal(err)
		}
		pts, err := RunNgspice(deck.String(), n.Output())
		if err != nil {
			t.Fatalf("trial %d: %v\n%s", trial, err, deck.String())
		}
		if len(pts) < 40 {
			t.Fatalf("trial %d: only %d points from ngspice", trial, len(pts))
		}
		for _, p := range pts {
			g := k.GainDB(p.Hz)
			dm := g - 20*math.Log10(cmplx.Abs(p.V))
			dp := math.Remainder(k.Phase(p.Hz)-cmplx.Phase(p.V), 2*math.Pi) * 180 / math.Pi
			if math.Abs(dm) > 0.01 || math.Abs(dp) > 0.1 {
				t.Fatalf("trial %d at %g Hz: ZPK %.4f dB %.3f°, ngspice %.4f dB %.3f°\n%s", trial, p.Hz,
					g, k.Phase(p.Hz)*180/math.Pi, 20*math.Log10(cmplx.Abs(p.V)), cmplx.Phase(p.V)*180/math.Pi, deck.String())
			}
		}
	}
}

// A treble cut: the source's resistance R_s, then a pot wired as a variable
// resistor (its start at the input, its wiper tied to its finish) in series
// into a capacitor C to ground, the output across C. The pot's track from
// start to wiper is R_pot·F(x) plus the model's end resistance (Pot.Segments);
// the segment from wiper to finish is shorted by the tie. So the network is
// one series resistance R = R_s + R_pot·F(x) + EndResistance into C, a
// voltage divider with H = (1/sC)/(R + 1/sC) = 1/(1 + sRC) (circuit theory).
// |H|² = 1/(1 + (ωRC)²) is one half, −10·log10 2 ≈ −3.0103 dB, at
// ω = 1/(RC): f = 1/(2π(R_s + R_pot·F(x) + EndResistance)·C). The one pole is
// −1/(RC) and there is no finite zero.
func TestZPKTrebleCutClosedForm(t *testing.T) {
	for _, tc := range []struct {
		rs, rpot, c float64
		taper       Taper
		x           float64
	}{
		{rs: 10e3, rpot: 250e3, c: 1e-9, taper: Taper{Law: Audio}, x: 0.5},
		{rs: 1e3, rpot: 1e6, c: 470e-12, taper: Taper{Law: Linear}, x: 0.3},
		{rs: 47e3, rpot: 100e3, c: 10e-9, taper: Taper{Law: ReverseAudio}, x: 0.9},
		{rs: 100, rpot: 500e3, c: 2.2e-9, taper: Taper{Law: Audio}, x: 0},
	} {
		var n Network
		n.SetSource("in", tc.rs)
		n.Potentiometer("P", "in", "out", "out", Pot{Value: tc.rpot, Taper: tc.taper, Position: tc.x})
		n.Capacitor("C", "out", Ground, tc.c)
		n.SetOutput("out")
		k, err := n.CompileZPK()
		if err != nil {
			t.Fatal(err)
		}
		r := tc.rs + tc.rpot*tc.taper.Fraction(tc.x) + EndResistance
		fc := 1 / (2 * math.Pi * r * tc.c)
		if g, want := k.GainDB(fc), -10*math.Log10(2); math.Abs(g-want) > 1e-9 {
			t.Errorf("%+v: %.12f dB at the closed-form corner %g Hz, want %.12f", tc, g, fc, want)
		}
		if p := k.Phase(fc); math.Abs(p+math.Pi/4) > 1e-9 {
			t.Errorf("%+v: phase %g rad at the corner, want −π/4", tc, p)
		}
		if d := matchRoots(k.Poles(), []complex128{complex(-1/(r*tc.c), 0)}); d > 1e-12 || len(k.Zeros()) != 0 {
			t.Errorf("%+v: poles %v zeros %v, want one pole at %g", tc, k.Poles(), k.Zeros(), -1/(r*tc.c))
		}
	}
}

// The twin-T notch: two T networks in parallel from the input to the
// output, one of R, R in series with 2C to ground at its middle, the other
// of C, C in series with R/2 to ground, the output open. Its transfer is
// (1 + s²R²C²)/(1 + 4sRC + s²R²C²) (a textbook result: the two T's are
// each reduced to their Y parameters and added), so the zeros are ±j/(RC)
// on the jω axis and the poles the roots of 1 + 4sRC + s²R²C². The network
// has three natural frequencies: the reduction also cancels a common
// factor (1 + sRC), so −1/(RC) is both a pole and a zero here, as Poles
// documents for modes the output does not see.
func TestZerosTwinTClosedForm(t *testing.T) {
	const r, c = 10e3, 10e-9
	var n Network
	n.SetSource("in", 0)
	n.Resistor("R1", "in", "a", r)
	n.Resistor("R2", "a", "out", r)
	n.Capacitor("C3", "a", Ground, 2*c)
	n.Capacitor("C1", "in", "b", c)
	n.Capacitor("C2", "b", "out", c)
	n.Resistor("R3", "b", Ground, r/2)
	n.SetOutput("out")
	zs, err := n.Zeros()
	if err != nil {
		t.Fatal(err)
	}
	w0 := 1 / (r * c)
	if d := matchRoots(zs, []complex128{complex(-w0, 0), complex(0, -w0), complex(0, w0)}); d > 1e-9 {
		t.Errorf("zeros %v, closed form ±j%g and the cancelled %g", zs, w0, -w0)
	}
	ps, err := n.Poles()
	if err != nil {
		t.Fatal(err)
	}
	q := quadRoots(r*r*c*c, 4*r*c, 1)
	if d := matchRoots(ps, []complex128{q[0], q[1], complex(-w0, 0)}); d > 1e-12 {
		t.Errorf("poles %v, closed form %v", ps, q)
	}
	// At the notch itself the gain is finite, far down.
	k, err := n.CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	if g := k.GainDB(w0 / (2 * math.Pi)); math.IsInf(g, 0) || math.IsNaN(g) || g > -120 {
		t.Errorf("gain at the notch %g dB, want finite and below −120 dB", g)
	}
}

// At the design validator's limits (MinOhms…MaxFarads) the gain stays
// finite. Twenty RC sections of 1 GΩ and 1 F from an ideal source, output
// open: far above its poles a ladder's transfer tends to
// 1/(s^n·Π R_i·C_i), the leading term of its denominator (the product of
// every series R and shunt C; circuit theory), so the gain is
// −20·n·log10(ωRC) within O(1/(ωRC)), about −5600 dB at 20 kHz, far below
// the range of a float64. Twenty sections of 1 mΩ and 1 fF have their
// poles near 10¹⁸ rad/s and pass the audio band at 0 dB.
func TestZPKAtValidatorLimits(t *testing.T) {
	ladder := func(r, c float64) *Network {
		n := &Network{}
		n.SetSource("in", 0)
		secs := make([]RC, 20)
		for i := range secs {
			secs[i] = RC{R: r, C: c}
		}
		BuildLadder(n, secs, "in", NodeOut)
		n.SetOutput(NodeOut)
		return n
	}
	deep, err := ladder(1e9, 1).CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []float64{20, 1000, 20000} {
		g := deep.GainDB(f)
		want := -20 * 20 * math.Log10(2*math.Pi*f*1e9*1)
		if math.IsInf(g, 0) || math.IsNaN(g) || math.Abs(g-want) > 1e-6 {
			t.Errorf("1 GΩ/1 F ladder at %g Hz: %g dB, asymptote %g dB", f, g, want)
		}
	}
	flat, err := ladder(1e-3, 1e-15).CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []float64{20, 1000, 20000} {
		if g := flat.GainDB(f); math.IsInf(g, 0) || math.IsNaN(g) || math.Abs(g) > 1e-9 {
			t.Errorf("1 mΩ/1 fF ladder at %g Hz: %g dB, want 0", f, g)
		}
	}
	dst := make([]float64, 3)
	deep.GainsDB(dst, []float64{20, 1000, 20000})
	for i, f := range []float64{20, 1000, 20000} {
		if dst[i] != deep.GainDB(f) {
			t.Errorf("GainsDB[%d] = %g, GainDB = %g", i, dst[i], deep.GainDB(f))
		}
	}
}

// The blend chains the tool designs with (randomChain: invented parts over
// the ranges a tone section uses) compiled to ZPK equal the nodal solver
// within 1e-9 relative over 20 Hz–20 kHz.
func TestZPKOfChainsEqualsNodal(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	freqs := LogGrid(20, 20000, 10)
	var k ZPK
	for trial := 0; trial < 300; trial++ {
		c := randomChain(rng)
		n := c.Network()
		if err := n.CompileZPKInto(&k); err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		s := mustCompile(t, n)
		for _, f := range freqs {
			if d := relDiff(k.Transfer(f), s.Transfer(f)); d > 1e-9 {
				t.Fatalf("trial %d f=%g: differs from the nodal solver by %g", trial, f, d)
			}
		}
	}
}

// The tone stack of the benchmarks compiled to ZPK equals the nodal solver.
func TestZPKOfStackEqualsNodal(t *testing.T) {
	n := stackNetwork()
	k, err := n.CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	s := mustCompile(t, n)
	for _, f := range LogGrid(10, 100e3, 20) {
		if d := relDiff(k.Transfer(f), s.Transfer(f)); d > 1e-9 {
			t.Fatalf("f=%g: differs from the nodal solver by %g", f, d)
		}
	}
}

// Bad networks are errors that say what is wrong, never panics.
func TestZPKErrors(t *testing.T) {
	for _, tc := range []struct {
		name  string
		build func(n *Network)
		want  string
	}{
		{"no source", func(n *Network) { n.Resistor("R", "a", "out", 1e3); n.SetOutput("out") }, "no source"},
		{"output is ground", func(n *Network) { n.SetSource("in", 0); n.Resistor("R", "in", "0", 1e3); n.SetOutput("0") }, "ground"},
		{"floating node", func(n *Network) {
			n.SetSource("in", 0)
			n.Resistor("R", "in", "0", 1e3)
			n.Resistor("R2", "x", "out", 1e3)
			n.SetOutput("out")
		}, "floating"},
		{"output cut off from the source", func(n *Network) {
			n.SetSource("in", 100)
			n.Resistor("R", "in", "0", 1e3)
			n.Resistor("R2", "out", "0", 1e3)
			n.Capacitor("C", "out", "0", 1e-9)
			n.SetOutput("out")
		}, "does not depend on the source"},
		{"negative part", func(n *Network) {
			n.SetSource("in", 0)
			n.Capacitor("C", "in", "out", -1e-9)
			n.Resistor("R", "out", "0", 1e3)
			n.SetOutput("out")
		}, "must be positive"},
	} {
		var n Network
		tc.build(&n)
		_, err := n.CompileZPK()
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one saying %q", tc.name, err, tc.want)
		}
	}
}

// A known limit of the ZPK form: a blend network ahead of twenty 1 GΩ / 1 F
// sections (the validator's limits). The transfer has a zero at infinity
// of order 20, which rounding spreads into a ring of eigenvalues about
// ε^(1/20) ≈ 0.16 of the shifted matrix's size, and with the poles 18
// decades apart no shift keeps the blend's zero at −10⁶ rad/s outside it:
// the zero is lost, and the gain is off by 20·log10|1 + jω/10⁶|, 0.07 dB at
// 20 kHz. Compiled.GainDB, exact there (TestCompiledGainDBFiniteAtLimits),
// is the reference; the ZPK form is held to finite gains within 0.1 dB.
func TestZPKBlendAheadOfDeepLadder(t *testing.T) {
	c := Chain{
		Blend: Blend{Lowpass: RC{R: 1e3, C: 1e-9}, Highpass: RC{R: 1e3, C: 1e-9}, Pot: Pot{Value: 1e4, Position: 0}},
		Load:  Load{R: math.Inf(1)},
	}
	for i := 0; i < 20; i++ {
		c.Filters = append(c.Filters, RC{R: 1e9, C: 1})
	}
	z, err := c.Network().CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	k := c.Compile()
	for _, f := range []float64{20, 1000, 20000} {
		if g := z.GainDB(f); math.IsInf(g, 0) || math.IsNaN(g) || math.Abs(g-k.GainDB(f)) > 0.1 {
			t.Errorf("at %g Hz: ZPK %.8f dB, two-port %.8f dB", f, g, k.GainDB(f))
		}
	}
}

// Degenerate wiring never panics: random small networks (invented, seeded)
// with self-loops, parallel parts, nodes reached through capacitors or
// inductors alone, loops of capacitors through the ideal source, and parts
// cut off from the source. Each either compiles and equals the nodal
// solver within 1e-6 relative in the band (all but a few within 1e-9; the
// worst sit beside modes that only rounding separates from the origin), or
// is an error: in this draw, a floating node, an output connected to
// nothing, or an output the signal cannot reach (the solver's transfer is
// then exactly zero).
func TestZPKDegenerateNetworks(t *testing.T) {
	rng := rand.New(rand.NewPCG(41, 42))
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	names := []string{Ground, "a", "b", "c", "d"}
	compiled := 0
	for trial := 0; trial < 2000; trial++ {
		var n Network
		for i := 1 + rng.IntN(7); i > 0; i-- {
			a, b := names[rng.IntN(len(names))], names[rng.IntN(len(names))]
			switch rng.IntN(4) {
			case 0, 1:
				n.Resistor(fmt.Sprintf("R%d", i), a, b, logU(10, 1e6))
			case 2:
				n.Capacitor(fmt.Sprintf("C%d", i), a, b, logU(1e-11, 1e-6))
			default:
				n.Inductor(fmt.Sprintf("L%d", i), a, b, logU(1e-3, 10))
			}
		}
		if rng.IntN(4) == 0 {
			n.Potentiometer("P", names[rng.IntN(len(names))], names[rng.IntN(len(names))], names[rng.IntN(len(names))],
				Pot{Value: 1e5, Position: rng.Float64()})
		}
		n.SetSource("a", []float64{0, 100}[rng.IntN(2)])
		n.SetOutput(names[1+rng.IntN(len(names)-1)])
		k, err := n.CompileZPK()
		if err != nil {
			continue
		}
		s, err := n.Compile()
		if err != nil {
			t.Fatalf("trial %d: ZPK compiled a network the solver refuses: %v", trial, err)
		}
		compiled++
		for _, f := range []float64{20, 1000, 20000} {
			h := s.Transfer(f)
			if cmplx.IsNaN(h) {
				continue
			}
			if d := relDiff(k.Transfer(f), h); d > 1e-6 {
				t.Errorf("trial %d f=%g: ZPK %v, nodal %v", trial, f, k.Transfer(f), h)
				break
			}
		}
	}
	t.Logf("%d of 2000 compiled", compiled)
}

// A ZPK is a Response: the metrics measure it as they measure a Compiled
// chain or a Solver.
var _ Response = (*ZPK)(nil)

// The metrics of a chain measured on its ZPK equal those on the two-port
// path (the scoop and the corner, metrics.go's definitions).
func TestZPKMetricsEqualCompiled(t *testing.T) {
	c := benchChain()
	z, err := c.Network().CompileZPK()
	if err != nil {
		t.Fatal(err)
	}
	k := c.Compile()
	m := NewMeter(DefaultBand)
	s1, ok1 := m.Scoop(z)
	s2, ok2 := m.Scoop(k)
	if ok1 != ok2 || math.Abs(s1.Hz/s2.Hz-1) > 1e-6 || math.Abs(s1.DepthDB-s2.DepthDB) > 1e-6 {
		t.Errorf("scoop on ZPK %+v (%v), on two-port %+v (%v)", s1, ok1, s2, ok2)
	}
	c1, ok1 := m.Corner(z)
	c2, ok2 := m.Corner(k)
	if ok1 != ok2 || math.Abs(c1/c2-1) > 1e-6 {
		t.Errorf("corner on ZPK %g (%v), on two-port %g (%v)", c1, ok1, c2, ok2)
	}
}
