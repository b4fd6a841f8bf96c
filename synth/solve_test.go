package synth

import (
	"math"
	"reflect"
	"strings"
	"testing"

	"tonewright/eseries"
	"tonewright/networks"
)

// knownDesign is an invented board with parts from E24/E12 and a common pot
// (test data, not a real product).
func knownDesign(lpR, lpC, hpC, hpR, pot, fR, fC, zs float64, n int) *networks.Design {
	d := &networks.Design{
		Name:   "invented test board",
		Band:   networks.DefaultBand,
		Source: networks.Source{Impedance: zs},
		Tone: networks.Tone{Network: networks.BlendNetwork,
			Lowpass: networks.RC{R: lpR, C: lpC}, Highpass: networks.RC{R: hpR, C: hpC},
			Pot: networks.PotPart{Value: pot, Taper: networks.Taper{Law: networks.Linear}}},
		Load: networks.DefaultLoad,
	}
	for i := 0; i < n; i++ {
		d.Filters = append(d.Filters, networks.RC{R: fR, C: fC})
	}
	return d
}

// targetsOf measures a design's figures with networks' metrics.
func targetsOf(t *testing.T, d *networks.Design) Targets {
	t.Helper()
	m := networks.NewMeter(d.Band)
	c := d.Chain(0.5)
	s, ok := m.Scoop(c.Compile())
	if !ok {
		t.Fatalf("test design has no scoop at knob 0.5")
	}
	tg := Targets{ScoopHz: ptr(s.Hz), DepthDB: ptr(s.DepthDB), BalanceDB: ptr(s.BalanceDB)}
	if hz := networks.CornerOf(d, m); hz != nil {
		tg.CornerHz = hz
	}
	return tg
}

// checkMembers fails unless every chosen part is a member of its set.
func checkMembers(t *testing.T, r *Result, res, caps eseries.Set, pots []float64) {
	t.Helper()
	pl, _ := eseries.NewList(pots)
	for _, c := range r.Parts {
		var s eseries.Set
		switch c.Kind {
		case networks.PartResistor:
			s = res
		case networks.PartCapacitor:
			s = caps
		default:
			s = pl
		}
		if c.Free && !eseries.Contains(s, c.Chosen) {
			t.Errorf("%s = %s is not in %s", c.Name, eseries.Format(c.Chosen), s)
		}
	}
}

// Round trip: the figures of designs with known parts are synthesised
// again, fresh, in the same surroundings. The continuous stage must meet
// them within IdealTolerance (0.5 %, 0.1 dB) and the E24/E12 parts within
// PartsTolerance (5 %, 1 dB), the accuracy the issue promises. The known
// parts are themselves E24/E12 values and common pots, so the walk must
// bring back the original or a design as close: within 0.1 % and 0.02 dB.
func TestRoundTrip(t *testing.T) {
	for _, c := range []struct {
		name string
		d    *networks.Design
	}{
		{"mid scoop, 6.8k source", knownDesign(47e3, 22e-9, 3.3e-9, 47e3, 250e3, 10e3, 1e-9, 6.8e3, 2)},
		{"low scoop, buffered", knownDesign(100e3, 10e-9, 1e-9, 100e3, 500e3, 22e3, 470e-12, 100, 2)},
		{"upper-mid scoop", knownDesign(22e3, 10e-9, 2.2e-9, 22e3, 100e3, 4.7e3, 1e-9, 1e3, 2)},
		{"one section", knownDesign(33e3, 15e-9, 2.2e-9, 33e3, 100e3, 10e3, 1.5e-9, 4.7e3, 1)},
	} {
		t.Run(c.name, func(t *testing.T) {
			tg := targetsOf(t, c.d)
			n := len(c.d.Filters)
			p := &Problem{Targets: tg, Source: &c.d.Source, Filters: &n}
			r, err := Solve(p, Options{})
			if err != nil {
				t.Fatal(err)
			}
			for _, ch := range r.Checks {
				if !ch.IdealMet {
					t.Errorf("ideal %s: wanted %v, got %v (error %v)", ch.Name, ch.Wanted, ch.Ideal, ch.IdealError)
				}
				if !ch.Met {
					t.Errorf("chosen %s: wanted %v, got %v (error %v)", ch.Name, ch.Wanted, ch.Achieved, ch.Error)
				}
			}
			if !r.Feasible || !r.Met {
				t.Errorf("feasible %v, met %v", r.Feasible, r.Met)
			}
			if !within(r, Tolerance{Freq: 0.001, Level: 0.02}) {
				t.Errorf("the original board is not found again: %+v", r.Checks)
			}
			checkMembers(t, r, eseries.E24, eseries.E12, DefaultPots)
			// The reported figures are networks' own: Analyze agrees.
			an, err := networks.Analyze(r.Design, []float64{0.5})
			if err != nil {
				t.Fatal(err)
			}
			if an.Positions[0].Scoop == nil || *an.Positions[0].Scoop != r.Metrics.Scoop {
				t.Errorf("Analyze gives scoop %+v, Result %+v", an.Positions[0].Scoop, r.Metrics.Scoop)
			}
			if an.CornerHz == nil || *an.CornerHz != r.Metrics.CornerHz {
				t.Errorf("Analyze gives corner %v, Result %v", an.CornerHz, r.Metrics.CornerHz)
			}
		})
	}
}

// Same inputs, same result; and the seed is the only randomness.
func TestDeterministic(t *testing.T) {
	p := &Problem{Targets: Targets{ScoopHz: ptr(700.0), DepthDB: ptr(-8.0), CornerHz: ptr(9000.0)},
		Source: &networks.Source{Impedance: 4.7e3}}
	a, err := Solve(p, Options{Seed: 7})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := Solve(p, Options{Seed: 7})
	if !reflect.DeepEqual(a.Design, b.Design) || !reflect.DeepEqual(a.Ideal, b.Ideal) || a.Evaluations != b.Evaluations {
		t.Errorf("two runs differ:\n%s\n%s", a.Design.YAML(), b.Design.YAML())
	}
}

// A stock list is honoured: every free part comes from it.
func TestStock(t *testing.T) {
	st := &Stock{
		Resistors:  []float64{1e3, 2.2e3, 4.7e3, 10e3, 22e3, 33e3, 47e3, 68e3, 100e3, 220e3, 470e3, 1e6},
		Capacitors: []float64{220e-12, 470e-12, 1e-9, 2.2e-9, 3.3e-9, 4.7e-9, 10e-9, 22e-9, 47e-9, 100e-9},
		Pots:       []float64{25e3, 100e3, 500e3},
	}
	p := &Problem{Targets: Targets{ScoopHz: ptr(600.0), DepthDB: ptr(-8.0), CornerHz: ptr(12000.0)},
		Source: &networks.Source{Impedance: 2.2e3}, Parts: Parts{Stock: st}}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	rl, _ := eseries.NewList(st.Resistors)
	cl, _ := eseries.NewList(st.Capacitors)
	checkMembers(t, r, rl, cl, st.Pots)
	for _, c := range r.Parts {
		if c.Set != "stock" {
			t.Errorf("%s: from %q, want stock", c.Name, c.Set)
		}
	}
}

// Targets the topology cannot give are reported, not errors: Feasible and
// Met are false, the miss is named, and the nearest achievable figures are
// those of the ideal design.
func TestInfeasible(t *testing.T) {
	for _, c := range []struct {
		name string
		tg   Targets
		miss string
	}{
		// A 50 dB dip at 40 Hz: the lower shoulder would lie below the band.
		{"too deep for the band", Targets{ScoopHz: ptr(40.0), DepthDB: ptr(-50.0), CornerHz: ptr(10e3)}, "scoop depth"},
		// The legs' loading cannot tilt the shoulders by 60 dB.
		{"balance", Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-8.0), BalanceDB: ptr(60.0), CornerHz: ptr(10e3)}, "scoop balance"},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := &Problem{Targets: c.tg, Source: &networks.Source{Impedance: 1e3}}
			r, err := Solve(p, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if r.Feasible || r.Met {
				t.Fatalf("feasible %v, met %v: %+v", r.Feasible, r.Met, r.Checks)
			}
			var names []string
			for _, ch := range r.Checks {
				if !ch.Met {
					names = append(names, ch.Name)
				}
			}
			if !strings.Contains(strings.Join(names, ","), c.miss) {
				t.Errorf("missed %v, want %s among them", names, c.miss)
			}
			if err := r.Design.Validate(); err != nil {
				t.Errorf("the best design is not valid: %v", err)
			}
		})
	}
}

// Re-voicing: a board whose low-pass leg capacitor is moved from 10n to
// 15n gives the targets; from the original board with at most one change,
// the search swaps exactly that capacitor.
func TestRevoiceOneCapacitor(t *testing.T) {
	orig := knownDesign(33e3, 10e-9, 2.2e-9, 33e3, 100e3, 10e3, 1e-9, 6.8e3, 2)
	moved := orig.Clone()
	moved.Tone.Lowpass.C = 15e-9
	p := &Problem{Targets: targetsOf(t, moved), From: orig, MaxChanges: 1}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Met {
		t.Errorf("not met: %+v", r.Checks)
	}
	want := []Change{{Part: "lowpass.c", Role: "blend low-pass leg C", From: 10e-9, To: 15e-9, Kind: networks.PartCapacitor}}
	if !reflect.DeepEqual(r.Changes, want) {
		t.Errorf("changes %+v, want %+v", r.Changes, want)
	}
}

// Only free parts change, and targets not given keep the design's figures
// (the filter capacitors alone cannot move the corner without moving the
// scoop too, so whether the targets are met is not the point here).
func TestRevoiceFree(t *testing.T) {
	orig := knownDesign(33e3, 10e-9, 2.2e-9, 33e3, 100e3, 10e3, 1e-9, 6.8e3, 2)
	before := targetsOf(t, orig)
	p := &Problem{Targets: Targets{CornerHz: ptr(*before.CornerHz * 0.8)}, From: orig, Free: []string{"filters.c"}}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, ch := range r.Changes {
		if ch.Part != "filter1.c" && ch.Part != "filter2.c" {
			t.Errorf("%s changed, but only the filter capacitors are free", ch.Part)
		}
	}
	if len(r.Changes) == 0 {
		t.Errorf("nothing changed")
	}
	if got := *r.Targets.ScoopHz; got != *before.ScoopHz {
		t.Errorf("kept scoop target %v, want the design's %v", got, *before.ScoopHz)
	}
}

// Problems that cannot be searched are errors naming the key.
func TestProblemErrors(t *testing.T) {
	d := knownDesign(33e3, 10e-9, 2.2e-9, 33e3, 100e3, 10e3, 1e-9, 6.8e3, 2)
	for _, c := range []struct {
		name string
		p    Problem
		want string
	}{
		{"no depth", Problem{Targets: Targets{ScoopHz: ptr(800.0), CornerHz: ptr(5e3)}}, "targets.scoop: a fresh synthesis needs"},
		{"no corner", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0)}}, "targets.corner_hz"},
		{"scoop outside band", Problem{Targets: Targets{ScoopHz: ptr(30e3), DepthDB: ptr(-10.0), CornerHz: ptr(5e3)}}, "outside the band"},
		{"corner past 10 × band top", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(400e3)}}, "outside what the corner can measure"},
		{"corner of 1e30 Hz", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(1e30)}}, "targets.corner_hz"},
		{"corner below the band", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10.0)}}, "targets.corner_hz"},
		{"zero depth", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(0.0), CornerHz: ptr(5e3)}}, "targets.scoop.depth_db"},
		{"positive depth", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(3.0), CornerHz: ptr(5e3)}}, "targets.scoop.depth_db"},
		{"knob", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-3.0), CornerHz: ptr(5e3), At: ptr(2.0)}}, "targets.scoop.at"},
		{"unknown part", Problem{From: d, Free: []string{"lowpass.x"}}, `unknown part "lowpass.x"`},
		{"level", Problem{From: d, Free: []string{"level"}}, "taken as given"},
		{"range", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-3.0), CornerHz: ptr(5e3)},
			Parts: Parts{ResistorRange: [2]float64{1e6, 1e3}}}, "parts.resistor_range"},
		{"empty range", Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-3.0), CornerHz: ptr(5e3)},
			Parts: Parts{ResistorRange: [2]float64{1.01e3, 1.05e3}}}, "no resistor of E24"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Solve(&c.p, Options{})
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want one containing %q", err, c.want)
			}
		})
	}
}

// Progress reports are made and end at the total.
func TestProgress(t *testing.T) {
	var calls, last, total int
	p := &Problem{Targets: Targets{ScoopHz: ptr(700.0), DepthDB: ptr(-8.0), CornerHz: ptr(9000.0)}}
	_, err := Solve(p, Options{Progress: func(d, n int) { calls++; last, total = d, n }})
	if err != nil {
		t.Fatal(err)
	}
	if calls < 2 || last != total {
		t.Errorf("%d calls, last %d of %d", calls, last, total)
	}
}

func TestChoose(t *testing.T) {
	got := choose(4, 2)
	want := [][]int{{0, 1}, {0, 2}, {0, 3}, {1, 2}, {1, 3}, {2, 3}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("choose(4, 2) = %v", got)
	}
	if choose(20, 5) != nil {
		t.Errorf("choose(20, 5) should exceed maxSubsets")
	}
	_ = math.Pi
}
