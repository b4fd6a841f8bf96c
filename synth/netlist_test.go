package synth

import (
	"fmt"
	"strconv"
	"strings"
	"testing"

	"tonewright/networks"
)

// blendNetlist is the invented example board's blend network written as a
// netlist: the same parts, named by us, the pot on the knob "blend".
func blendNetlist(lpC float64) *networks.Design {
	d := exampleBoard()
	d.Name = "blend written as a netlist (invented)"
	d.Tone = networks.Tone{Network: networks.NetlistNetwork, Parts: []networks.NetPart{
		{Name: "rlp", Kind: networks.PartResistor, Value: 27e3, From: "in", To: "lp"},
		{Name: "clp", Kind: networks.PartCapacitor, Value: lpC, From: "lp", To: "gnd"},
		{Name: "chp", Kind: networks.PartCapacitor, Value: 2.2e-9, From: "in", To: "hp"},
		{Name: "rhp", Kind: networks.PartResistor, Value: 56e3, From: "hp", To: "gnd"},
		{Name: "mix", Kind: networks.PartPot, Value: 100e3, From: "lp", To: "hp", Wiper: "out",
			Taper: networks.Taper{Law: networks.Linear}, Knob: "blend"},
	}}
	return d
}

// Any network: a netlist design is re-voiced through its named parts and
// knob. The targets are the figures of the same netlist with its low-pass
// leg capacitor at 18 nF; with only that part free, at most one change,
// the search swaps exactly it, from 12 nF to 18 nF.
func TestRevoiceNetlist(t *testing.T) {
	if testing.Short() {
		t.Skip("a re-voicing through the nodal solver")
	}
	orig, moved := blendNetlist(12e-9), blendNetlist(18e-9)
	if err := orig.Validate(); err != nil {
		t.Fatal(err)
	}
	g := goal{at: 0.5}
	e := newEvaluator(moved, g)
	e.compile(0.5)
	m := networks.NewMeter(moved.Band)
	s, ok := m.Scoop(e.resp())
	if !ok {
		t.Fatal("the moved netlist has no scoop at knob 0.5")
	}
	e.compile(1)
	corner, ok := m.Corner(e.resp())
	if !ok {
		t.Fatal("the moved netlist has no corner at knob 1")
	}
	p := &Problem{Targets: Targets{ScoopHz: ptr(s.Hz), DepthDB: ptr(s.DepthDB), BalanceDB: ptr(s.BalanceDB), CornerHz: ptr(corner)},
		From: orig, Free: []string{"clp"}}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Met || len(r.Changes) != 1 || r.Changes[0].Part != "clp" || !same(r.Changes[0].To, 18e-9) {
		t.Errorf("met %v, changes %+v: want clp 12 nF → 18 nF", r.Met, r.Changes)
	}
}

// The list form: figures at their own knob settings. The targets are the
// moved netlist's scoop at blend 0.5, its corner at blend 1 and its gain
// at 100 Hz at blend 0; with the low-pass leg's parts free the search
// brings the capacitor back to 18 nF within the tolerance.
func TestRevoiceListForm(t *testing.T) {
	if testing.Short() {
		t.Skip("a re-voicing through the nodal solver")
	}
	moved := blendNetlist(18e-9)
	m := networks.NewMeter(moved.Band)
	at := func(p float64) networks.Evaluator { return compiledAt(t, moved, map[string]float64{"blend": p}) }
	s, _ := m.Scoop(at(0.5))
	corner, _ := m.Corner(at(1))
	items := []Item{
		{Knobs: map[string]float64{"blend": 0.5}, Kind: ItemScoop, Hz: s.Hz, DepthDB: s.DepthDB, BalanceDB: ptr(s.BalanceDB)},
		{Knobs: map[string]float64{"blend": 1}, Kind: ItemCorner, Hz: corner},
		{Knobs: map[string]float64{"blend": 0}, Kind: ItemGain, Hz: 100, DB: at(0).GainDB(100)},
	}
	r, err := Solve(&Problem{Items: items, From: blendNetlist(12e-9), Free: []string{"clp"}}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Met || len(r.Checks) != 5 || len(r.Changes) != 1 || !same(r.Changes[0].To, 18e-9) {
		t.Errorf("met %v, %d checks, changes %+v: want clp → 18 nF", r.Met, len(r.Checks), r.Changes)
	}
	if _, err := Solve(&Problem{Items: items}, Options{}); err == nil {
		t.Errorf("a fresh synthesis took the list form")
	}
	bad := []Item{{Knobs: map[string]float64{"treble": 1}, Kind: ItemCorner, Hz: 5e3}}
	if _, err := Solve(&Problem{Items: bad, From: blendNetlist(12e-9)}, Options{}); err == nil {
		t.Errorf("an unknown knob was accepted")
	}
}

// A curve made by the analyze CSV of a design is fitted back, to under
// 0.05 dB RMS at every setting, by the same topology with the parts free:
// the invented blend netlist with rlp 33 kΩ and clp 18 nF gives the curve;
// from 27 kΩ and 12 nF with those two free the fit returns them.
func TestCurveFitBack(t *testing.T) {
	if testing.Short() {
		t.Skip("a curve fit through the nodal solver")
	}
	target := blendNetlist(18e-9)
	target.Tone.Parts[0].Value = 33e3
	// The CSV analyze --csv writes: hz, then db_at_P and deg_at_P per
	// blend position (here three positions, 60 points per decade).
	var sb strings.Builder
	sb.WriteString("hz,db_at_0,deg_at_0,db_at_0.5,deg_at_0.5,db_at_1,deg_at_1\n")
	for _, f := range networks.LogGrid(20, 20e3, 60) {
		sb.WriteString(strconv.FormatFloat(f, 'g', 6, 64))
		for _, p := range []float64{0, 0.5, 1} {
			fmt.Fprintf(&sb, ",%.4f,0", compiledAt(t, target, map[string]float64{"blend": p}).GainDB(f))
		}
		sb.WriteString("\n")
	}
	c, err := ParseCurve([]byte(sb.String()), "curve.csv")
	if err != nil {
		t.Fatal(err)
	}
	r, err := Solve(&Problem{Curve: c, From: blendNetlist(12e-9), Free: []string{"rlp", "clp"}}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Curves) != 3 {
		t.Fatalf("curves %+v", r.Curves)
	}
	for _, cf := range r.Curves {
		if !(cf.RMSDB < 0.05) {
			t.Errorf("%s: RMS %.3f dB, worst %.3f dB; want under 0.05 dB RMS (changes %+v)", cf.Setting, cf.RMSDB, cf.WorstDB, r.Changes)
		}
	}
}

// compiledAt compiles d with its knobs set as knobs says.
func compiledAt(tb testing.TB, d *networks.Design, knobs map[string]float64) networks.Evaluator {
	tb.Helper()
	s, err := d.Setting(knobs)
	if err != nil {
		tb.Fatal(err)
	}
	ev, err := d.Compile(s)
	if err != nil {
		tb.Fatal(err)
	}
	return ev
}
