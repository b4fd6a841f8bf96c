package networks

import (
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"
)

// asNetlist writes a blend design's tone network in the netlist form: the
// same circuit as the blend's short keys, part by part.
func asNetlist(d *Design) *Design {
	n := d.Clone()
	n.Tone = Tone{Network: NetlistNetwork, Parts: d.ToneParts()}
	return n
}

// The netlist form of a blend design is the same circuit written twice:
// the nodal solver of the netlist equals the blend's two-port fast path
// within 1e-9 relative, at every knob position, on random chains
// (invented test data), and every figure agrees.
func TestNetlistFormEqualsBlend(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := 0; trial < 100; trial++ {
		d := designOf(randomChain(rng))
		n := asNetlist(d)
		if err := n.Validate(); err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		if _, err := ParseDesign(n.YAML(), "netlist.yaml"); err != nil {
			t.Fatalf("trial %d: the written netlist does not read back: %v\n%s", trial, err, n.YAML())
		}
		for _, p := range []float64{0, 0.3, 1} {
			s := Setting{BlendKnob: p}
			eb, _ := d.Compile(s)
			sn := mustCompile(t, n.Network(s))
			en, err := n.Compile(s)
			if err != nil {
				t.Fatal(err)
			}
			for _, f := range []float64{20, 300, 1000, 7000, 20000} {
				// The nodal solver of the netlist form and the netlist's
				// compiled path (ZPK, or the solver where the ZPK misses
				// ZPKTolerance) against the blend's two-port path.
				if r := relDiff(eb.Transfer(f), sn.Transfer(f)); r > 1e-9 {
					t.Fatalf("trial %d, blend %v, %g Hz: netlist differs by %.2g relative", trial, p, f, r)
				}
				if r := relDiff(eb.Transfer(f), en.Transfer(f)); r > 1e-9 {
					t.Fatalf("trial %d, blend %v, %g Hz: the netlist's compiled path differs by %.2g relative", trial, p, f, r)
				}
			}
		}
	}
	d, err := LoadDesign("../testdata/example-board.yaml")
	if err != nil {
		t.Fatal(err)
	}
	ab, err := Analyze(d, DefaultPositions)
	if err != nil {
		t.Fatal(err)
	}
	an, err := Analyze(asNetlist(d), DefaultPositions)
	if err != nil {
		t.Fatal(err)
	}
	for i := range ab.Positions {
		b, n := ab.Positions[i], an.Positions[i]
		// The two evaluators differ by about 1e-11 dB; at a flat minimum
		// that moves the frequency a search finds by up to about 1e-5.
		if math.Abs(b.Gain1kDB-n.Gain1kDB) > 1e-9 || (b.Scoop == nil) != (n.Scoop == nil) ||
			b.Scoop != nil && (math.Abs(b.Scoop.Hz/n.Scoop.Hz-1) > 1e-5 || math.Abs(b.Scoop.DepthDB-n.Scoop.DepthDB) > 1e-7) {
			t.Errorf("position %d: blend %+v %+v, netlist %+v %+v", i, b, b.Scoop, n, n.Scoop)
		}
	}
	if math.Abs(ab.InputImpedanceOhm/an.InputImpedanceOhm-1) > 1e-9 || math.Abs(ab.OutputImpedanceOhm/an.OutputImpedanceOhm-1) > 1e-9 {
		t.Errorf("impedances: blend %v/%v, netlist %v/%v", ab.InputImpedanceOhm, ab.OutputImpedanceOhm, an.InputImpedanceOhm, an.OutputImpedanceOhm)
	}
}

// A treble cut: an ideal source behind R_s feeds a pot wired as a variable
// resistor (its wiper tied to its finish) into a capacitor C to ground. The
// wiper shorts the finish segment, so the series resistance is
// R = R_s + R_pot·F(x) + EndResistance (the start segment), and the circuit
// is one RC low-pass: |H|² = 1/(1 + (ωRC)²), whose −3.0103 dB point is
// 1/(2πRC) (circuit theory). The corner figure falls exactly 3 dB from its
// reference, G at band low, so it sits at ω with
// 1 + (ωRC)² = 10^0.3·(1 + (ω_low·RC)²).
func TestTrebleCutClosedForm(t *testing.T) {
	const file = `name: treble cut (invented)
source: {impedance: 10k}
tone:
  network: netlist
  parts:
    treble: {pot: 250k, taper: audio, from: in, to: out, wiper: out}
    C1: {c: 4.7n, from: out, to: gnd}
load: {r: open}
`
	d, err := ParseDesign([]byte(file), "treble-cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	m := NewMeter(d.Band)
	taper := Taper{Law: Audio}
	for _, x := range []float64{0, 0.3, 0.5, 1} {
		e, err := d.Compile(Setting{"treble": x})
		if err != nil {
			t.Fatal(err)
		}
		rc := (10e3 + 250e3*taper.Fraction(x) + EndResistance) * 4.7e-9
		if g, want := e.GainDB(1/(2*math.Pi*rc)), 10*math.Log10(0.5); math.Abs(g-want) > 1e-9 {
			t.Errorf("x=%v: gain at 1/(2πRC) %.12f dB, want %.12f", x, g, want)
		}
		hz, ok := m.Corner(e)
		wl := 2 * math.Pi * d.Band.From * rc
		want := math.Sqrt((1+wl*wl)*math.Pow(10, 0.3)-1) / (2 * math.Pi * rc)
		if !ok || math.Abs(hz/want-1) > 1e-9 {
			t.Errorf("x=%v: corner %v (found %v), want %.6f Hz", x, hz, ok, want)
		}
	}
}

// A series R–L into a shunt C (an invented resonant low-pass) has a hump:
// H = 1/(1 − u² + ju/Q) with u = ω/ω₀, ω₀ = 1/√(LC), Q = √(L/C)/R, so
// |H|² = 1/((1 − u²)² + u²/Q²). Its maximum lies at u_p² = 1 − 1/(2Q²),
// where |H|² = Q²/(1 − 1/(4Q²)) (circuit theory: set d|H|⁻²/d(u²) = 0).
// The corner is measured from that hump: with v = u², the fall of exactly
// 3 dB solves (1 − v)² + v/Q² = 10^0.3/|H|²_max, the larger root of
// v² − (2 − 1/Q²)v + 1 − 10^0.3/|H|²_max = 0.
func TestCornerFromHump(t *testing.T) {
	const r, l, c = 100.0, 0.1, 100e-9
	n := &Network{}
	n.SetSource("in", 0)
	n.Resistor("R1", "in", "m", r)
	n.Inductor("L1", "m", "out", l)
	n.Capacitor("C1", "out", Ground, c)
	n.SetOutput("out")
	s := mustCompile(t, n)
	w0, q := 1/math.Sqrt(l*c), math.Sqrt(l/c)/r
	hmax := q * q / (1 - 1/(4*q*q))
	b, k := 2-1/(q*q), 1-math.Pow(10, 0.3)/hmax
	v := (b + math.Sqrt(b*b-4*k)) / 2
	m := NewMeter(DefaultBand)
	hz, ok := m.Corner(s)
	if want := w0 * math.Sqrt(v) / (2 * math.Pi); !ok || math.Abs(hz/want-1) > 1e-9 {
		t.Errorf("corner %v (found %v), want %.6f Hz", hz, ok, want)
	}
	p, ok := m.Peak(s)
	// A maximum is flat: rounding in G (1e-16 relative) places it to about
	// √1e-16, so its frequency is checked to 1e-7.
	if want := w0 * math.Sqrt(1-1/(2*q*q)) / (2 * math.Pi); !ok || math.Abs(p.Hz/want-1) > 1e-7 {
		t.Errorf("peak %+v (found %v), want %.6f Hz", p, ok, want)
	}
	lo, hi := s.GainDB(DefaultBand.From), s.GainDB(DefaultBand.To)
	if want := 10*math.Log10(hmax) - (lo+hi)/2; math.Abs(p.HeightDB-want) > 1e-6 || math.Abs(p.BalanceDB-(hi-lo)) > 1e-6 {
		t.Errorf("peak height %.9f balance %.9f, want %.9f and %.9f", p.HeightDB, p.BalanceDB, want, hi-lo)
	}
}

// curve is a response given as a formula in f, for figures with known
// answers.
type curve func(f float64) float64

func (c curve) GainDB(f float64) float64 { return c(f) }

// dip is a smooth bump of depth db (negative: a dip) centred at f0, a
// third of a decade wide.
func dip(f, f0, db float64) float64 {
	x := math.Log10(f/f0) / 0.15
	return db * math.Exp(-x*x)
}

// Figures on invented curves with known answers: a dip on a shelf counts
// as a scoop only from MinProminence below its lower shoulder; a U-shaped
// curve with a top roll-off reports its corner on the roll-off, not on the
// scoop's slope; a low roll-off gives the low corner.
func TestFiguresOnKnownCurves(t *testing.T) {
	m := NewMeter(DefaultBand)
	// A high shelf: 0 dB below 300 Hz, −6 dB above 3 kHz, with a dip at
	// 1 kHz on the slope.
	shelf := func(f float64) float64 { return -6 / (1 + math.Pow(1000/f, 2)) }
	for _, tc := range []struct {
		db    float64
		scoop bool
	}{{-0.2, false}, {-0.45, false}, {-3, true}} {
		c := curve(func(f float64) float64 { return shelf(f) + dip(f, 6000, tc.db) })
		s, ok := m.Scoop(c)
		if ok != tc.scoop {
			t.Errorf("dip of %v dB on a shelf: scoop %v (%+v)", tc.db, ok, s)
		}
		if ok && (s.NotchDB > -MinProminence || math.Abs(s.Hz/6000-1) > 0.05) {
			t.Errorf("dip of %v dB: %+v", tc.db, s)
		}
	}
	// U-shaped: a peak at band low, a −10 dB dip at 500 Hz, back up, then
	// a second-order roll-off at 8 kHz: the corner is near 8 kHz.
	u := curve(func(f float64) float64 {
		x := f / 8000
		return dip(f, 500, -10) - 10*math.Log10(1+x*x*x*x)
	})
	hz, ok := m.Corner(u)
	// −10·log10(1 + x⁴) = −3 at x⁴ = 10^0.3 − 1 (the reference is the
	// highest-frequency local maximum, where the dip has long decayed).
	if want := 8000 * math.Pow(math.Pow(10, 0.3)-1, 0.25); !ok || math.Abs(hz/want-1) > 1e-3 {
		t.Errorf("U-shaped curve: corner %v (found %v), want about %.1f Hz", hz, ok, want)
	}
	// A first-order high-pass at 80 Hz: the low corner, mirrored.
	hp := curve(func(f float64) float64 { x := 80 / f; return -10 * math.Log10(1+x*x) })
	lc, ok := m.LowCorner(hp)
	// The reference is band high (no local maximum), where G ≈ −1.4e-4 dB.
	g := hp(DefaultBand.To) - 3
	want := 80 / math.Sqrt(math.Pow(10, -g/10)-1)
	if !ok || math.Abs(lc/want-1) > 1e-9 {
		t.Errorf("high-pass low corner %v (found %v), want %.6f", lc, ok, want)
	}
	if _, ok := m.Corner(hp); ok {
		t.Error("a high-pass has no top corner")
	}
}

// Bad netlists are refused with the key at fault and the accepted forms.
func TestNetlistErrors(t *testing.T) {
	head := "tone:\n  network: netlist\n  parts:\n"
	for _, tc := range []struct{ parts, want string }{
		{"    R1: {r: 10k, from: in, to: out, color: red}\n", `tone.parts.R1.color: unknown key "color"`},
		{"    R1: {r: 10k, to: out}\n    C1: {c: 1n, from: out, to: gnd}\n", "missing key from"},
		{"    R1: {r: 10k, c: 1n, from: in, to: out}\n", "two kinds (r and c)"},
		{"    R1: {from: in, to: out}\n", "no kind"},
		{"    R1: {r: 10k, from: in, to: out}\n    R2: {r: 10k, from: x, to: y}\n", `node "x" is floating`},
		{"    R1: {r: 10k, from: in, to: gnd}\n", "no part touches node out"},
		{"    R1: {r: 10k, from: a, to: out}\n    R2: {r: 1k, from: a, to: gnd}\n", "no part touches node in"},
		{"    P1: {pot: 10k, from: in, to: gnd, wiper: out, position: 1.5}\n", "tone.parts.P1.position: 1.5 is outside 0..1"},
		{"    P1: {pot: 10k, from: in, to: gnd, wiper: out, position: 0.2}\n    P2: {pot: 10k, from: in, to: gnd, wiper: out, knob: P1, position: 0.3}\n", "turn on one knob, P1, but give it different positions"},
		{"    P1: {pot: 10k, from: in, to: gnd}\n", "missing key wiper"},
		{"    R1: {r: 10k, from: in, to: out, wiper: out}\n", "only a pot has wiper"},
		{"    R1: {r: 10k, from: in, to: f1}\n    R2: {r: 1k, from: f1, to: out}\n", `node name "f1" is used by the chain`},
		{"    R1: {r: 10nF, from: in, to: out}\n", `"10nF" is in F`},
		{"    L1: {l: 5k, from: in, to: out}\n", "H is outside"},
		{"    P1: {pot: 10k, taper: linear, midpoint: 0.2, from: in, to: gnd, wiper: out}\n", "a linear taper has no midpoint"},
		{"    R1: {r: 10k, from: in, to: in}\n", "both ends on node"},
		{"    R-1: {r: 10k, from: in, to: out}\n", "use letters, digits and _"},
		{"    R1: {r: 10k, from: in, to: out}\n  lowpass: {r: 1k, c: 1n}\n", `unknown key "lowpass"`},
	} {
		_, err := ParseDesign([]byte(head+tc.parts), "bad.yaml")
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), "bad.yaml:") {
			t.Errorf("%s: error %v, want one with the file and %q", tc.parts, err, tc.want)
		}
	}
	_, err := ParseDesign([]byte("tone: {network: ladder}"), "bad.yaml")
	if err == nil || !strings.Contains(err.Error(), "use blend, netlist") {
		t.Errorf("unknown network: %v", err)
	}
	_, err = ParseDesign([]byte(head+"    level: {pot: 10k, from: in, to: gnd, wiper: out}\nlevel: {pot: 100k}\n"), "bad.yaml")
	if err == nil || !strings.Contains(err.Error(), "level pot's") {
		t.Errorf("a part named level beside a level pot: %v", err)
	}
}

// Knobs: a pot's knob is its name unless knob: says otherwise; gangs turn
// together; a knob with no position is swept; --knob lists combine.
func TestKnobs(t *testing.T) {
	data, err := os.ReadFile("../testdata/examples/stack-netlist.yaml")
	if err != nil {
		t.Fatal(err)
	}
	d, err := ParseDesign(data, "stack.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(d.KnobNames(), ","); got != "treble,bass,mid" {
		t.Errorf("knobs %s", got)
	}
	if d.SweptKnob() != "treble" {
		t.Errorf("swept knob %q", d.SweptKnob())
	}
	ss, err := d.Settings([]KnobList{{"treble", []float64{0, 1}}, {"bass", []float64{0, 0.5, 1}}})
	if err != nil || len(ss) != 6 || ss[1]["bass"] != 0.5 || ss[1]["treble"] != 0 || ss[1]["mid"] != 0.5 {
		t.Fatalf("settings %v, %v", ss, err)
	}
	if _, err := d.Settings([]KnobList{{"presence", []float64{0}}}); err == nil || !strings.Contains(err.Error(), "treble, bass, mid") {
		t.Errorf("unknown knob: %v", err)
	}
	// A second gang on the bass knob moves with it.
	g := d.Clone()
	g.Tone.Parts = append(g.Tone.Parts, NetPart{Name: "gang2", Kind: PartPot, Value: 100e3, From: "out", To: NetGnd, Wiper: "g", Taper: Taper{Law: Linear}, Knob: "bass", Position: ptr(0.5)})
	if err := g.Validate(); err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(g.KnobNames(), ","); got != "treble,bass,mid" {
		t.Errorf("with a gang: knobs %s", got)
	}
	net := g.Network(Setting{"treble": 0.5, "bass": 0.25})
	for _, p := range net.Pots {
		if p.Name == "gang2" && p.Pot.Position != 0.25 {
			t.Errorf("gang2 at %v, want the bass knob's 0.25", p.Pot.Position)
		}
	}
}

// designOfNetwork writes a random network (invented test data) as a design
// in the netlist form: its source node is in, its output node out, no load.
func designOfNetwork(n *Network) *Design {
	src, z := n.Source()
	name := func(node string) string {
		switch {
		case node == src:
			return NetIn
		case node == n.Output():
			return NetOut
		case isGround(node):
			return NetGnd
		}
		return node
	}
	d := &Design{Band: DefaultBand, Source: Source{Impedance: z}, Load: Load{R: math.Inf(1)}, Tone: Tone{Network: NetlistNetwork}}
	for _, e := range n.Elements {
		kind := map[Kind]PartKind{Resistor: PartResistor, Capacitor: PartCapacitor, Inductor: PartInductor}[e.Kind]
		d.Tone.Parts = append(d.Tone.Parts, NetPart{Name: e.Name, Kind: kind, Value: e.Value, From: name(e.A), To: name(e.B)})
	}
	for _, p := range n.Pots {
		pos := p.Pot.Position
		d.Tone.Parts = append(d.Tone.Parts, NetPart{Name: p.Name, Kind: PartPot, Value: p.Pot.Value, From: name(p.Start), To: name(p.Finish), Wiper: name(p.Wiper), Taper: p.Pot.Taper, Position: &pos})
	}
	return d
}

// The compiled path Design.Compile gives a netlist design (the ZPK, or
// the nodal solver where the ZPK misses ZPKTolerance at its check
// frequencies) equals the nodal solver within 1e-9 relative, at 41
// frequencies from 10 Hz to 100 kHz, on random netlists of up to 12 nodes
// with R, C, L and pots (invented test data).
func TestDesignCompileEqualsNodal(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	tested, fast := 0, 0
	for trial := 0; tested < 200 && trial < 2000; trial++ {
		d := designOfNetwork(randomNetlist(rng))
		if d.Validate() != nil {
			continue // floating or unreachable: not a design the file accepts
		}
		e, err := d.Compile(nil)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		if _, ok := e.(*ZPK); ok {
			fast++
		}
		s := mustCompile(t, d.Network(nil))
		for i := 0; i <= 40; i++ {
			f := 10 * math.Pow(10, float64(i)/10)
			if r := relDiff(e.Transfer(f), s.Transfer(f)); r > 1e-9 {
				t.Fatalf("trial %d at %.1f Hz: compiled path differs by %.2g relative", trial, f, r)
			}
		}
		tested++
	}
	if tested < 200 {
		t.Fatalf("only %d random netlists were valid designs", tested)
	}
	t.Logf("%d netlists, %d by the ZPK", tested, fast)
}

// A resistance below 1 Ω (a milli for a mega) and a netlist node that one
// part alone touches (a mistyped node) are warned about, not refused.
func TestDesignWarnings(t *testing.T) {
	data, err := os.ReadFile("../testdata/examples/stack-netlist.yaml")
	if err != nil {
		t.Fatal(err)
	}
	d, err := ParseDesign(data, "stack.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if w := d.Warnings(); len(w) != 0 {
		t.Errorf("warnings on a sound design: %q", w)
	}
	bad := strings.Replace(strings.Replace(string(data), "Cb:     {c: 22n, from: b, to: d}", "Cb:     {c: 22n, from: b, to: zz}", 1), "r: 1M, c: 0", "r: 1m, c: 0", 1)
	d, err = ParseDesign([]byte(bad), "typo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	w := strings.Join(d.Warnings(), "\n")
	for _, want := range []string{"load.r is 1 mΩ", "node zz joins nothing else"} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings %q lack %q", w, want)
		}
	}
}
