package synth

import (
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
	at := func(p float64) networks.Evaluator {
		s, err := moved.Setting(map[string]float64{"blend": p})
		if err != nil {
			t.Fatal(err)
		}
		ev, err := moved.Compile(s)
		if err != nil {
			t.Fatal(err)
		}
		return ev
	}
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
