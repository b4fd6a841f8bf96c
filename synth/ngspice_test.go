package synth

import (
	"math"
	"math/cmplx"
	"sort"
	"strconv"
	"strings"
	"testing"

	"tonewright/networks"
)

// spiceResponse is a response read from ngspice's AC analysis: the gain
// interpolated linearly in log f between the simulator's points.
type spiceResponse struct{ hz, db []float64 }

func (s *spiceResponse) GainDB(f float64) float64 {
	i := sort.SearchFloat64s(s.hz, f)
	switch {
	case i <= 0:
		return s.db[0]
	case i >= len(s.hz):
		return s.db[len(s.db)-1]
	}
	a, b := math.Log(s.hz[i-1]), math.Log(s.hz[i])
	w := (math.Log(f) - a) / (b - a)
	return s.db[i-1] + w*(s.db[i]-s.db[i-1])
}

// runSpice simulates the design's chain at blend position p with ngspice
// from band low to 10 × band top, densely enough for interpolation to be
// far below the tolerances.
func runSpice(t *testing.T, d *networks.Design, p float64) *spiceResponse {
	t.Helper()
	return spiceAt(t, d, map[string]float64{"blend": p})
}

// An independent check of the achieved figures: the chosen design is
// simulated by the ngspice simulator (AC analysis), and the same metric
// definitions applied to its curves give the figures synth reports, within
// 0.1 % in frequency and 0.01 dB.
func TestAchievedAgainstNgspice(t *testing.T) {
	networks.RequireNgspice(t)
	p := &Problem{Targets: Targets{ScoopHz: ptr(700.0), DepthDB: ptr(-8.0), CornerHz: ptr(9000.0)},
		Source: &networks.Source{Impedance: 4.7e3}}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	m := networks.NewMeter(r.Design.Band)
	s, ok := m.Scoop(runSpice(t, r.Design, 0.5))
	if !ok {
		t.Fatal("ngspice's curve at knob 0.5 has no scoop")
	}
	hz, ok := m.Corner(runSpice(t, r.Design, 1))
	if !ok {
		t.Fatal("ngspice's curve at knob 1 has no corner")
	}
	got := r.Metrics
	if math.Abs(s.Hz/got.Scoop.Hz-1) > 1e-3 || math.Abs(s.DepthDB-got.Scoop.DepthDB) > 0.01 || math.Abs(s.BalanceDB-got.Scoop.BalanceDB) > 0.01 {
		t.Errorf("scoop: ngspice %+v, synth %+v", s, got.Scoop)
	}
	if math.Abs(hz/got.CornerHz-1) > 1e-3 {
		t.Errorf("corner: ngspice %v, synth %v", hz, got.CornerHz)
	}
	g1k := runSpice(t, r.Design, 0.5).GainDB(1000)
	if math.Abs(g1k-got.Gain1kDB) > 0.01 {
		t.Errorf("gain at 1 kHz: ngspice %v, synth %v", g1k, got.Gain1kDB)
	}
}

// spiceAt simulates a design of any form at a knob setting with ngspice,
// as runSpice does for the blend chain.
func spiceAt(t *testing.T, d *networks.Design, knobs map[string]float64) *spiceResponse {
	t.Helper()
	s, err := d.Setting(knobs)
	if err != nil {
		t.Fatal(err)
	}
	var deck strings.Builder
	if err := d.Network(s).WriteSPICE(&deck, "synth check", networks.Band{From: d.Band.From, To: 10 * d.Band.To}, 2000); err != nil {
		t.Fatal(err)
	}
	pts, err := networks.RunNgspice(deck.String(), networks.NodeOut)
	if err != nil {
		t.Fatal(err)
	}
	r := &spiceResponse{}
	for _, pt := range pts {
		r.hz = append(r.hz, pt.Hz)
		r.db = append(r.db, 20*math.Log10(cmplx.Abs(pt.V)))
	}
	return r
}

// The list form's achieved figures, each at its own knob setting, against
// ngspice: the re-voicing of TestRevoiceListForm (a scoop at blend 0.5, a
// corner at blend 1, the gain at 100 Hz at blend 0), the chosen design
// simulated and measured with the same metric definitions, within 0.1 % in
// frequency and 0.01 dB.
func TestListFormAgainstNgspice(t *testing.T) {
	networks.RequireNgspice(t)
	moved := blendNetlist(18e-9)
	m := networks.NewMeter(moved.Band)
	s, _ := m.Scoop(spiceAt(t, moved, map[string]float64{"blend": 0.5}))
	corner, _ := m.Corner(spiceAt(t, moved, map[string]float64{"blend": 1}))
	items := []Item{
		{Knobs: map[string]float64{"blend": 0.5}, Kind: ItemScoop, Hz: s.Hz, DepthDB: s.DepthDB, BalanceDB: ptr(s.BalanceDB)},
		{Knobs: map[string]float64{"blend": 1}, Kind: ItemCorner, Hz: corner},
		{Knobs: map[string]float64{"blend": 0}, Kind: ItemGain, Hz: 100, DB: spiceAt(t, moved, map[string]float64{"blend": 0}).GainDB(100)},
	}
	r, err := Solve(&Problem{Items: items, From: blendNetlist(12e-9), Free: []string{"clp"}}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Checks) != 5 {
		t.Fatalf("%d checks, want 5", len(r.Checks))
	}
	got, _ := m.Scoop(spiceAt(t, r.Design, map[string]float64{"blend": 0.5}))
	hz, _ := m.Corner(spiceAt(t, r.Design, map[string]float64{"blend": 1}))
	g := spiceAt(t, r.Design, map[string]float64{"blend": 0}).GainDB(100)
	spice := []float64{got.Hz, got.DepthDB, got.BalanceDB, hz, g}
	for i, c := range r.Checks {
		if c.Unit == "Hz" && math.Abs(spice[i]/c.Achieved-1) > 1e-3 || c.Unit == "dB" && math.Abs(spice[i]-c.Achieved) > 0.01 {
			t.Errorf("%s: ngspice %.5g, synth %.5g", c.Name, spice[i], c.Achieved)
		}
	}
}

// A curve fit's reported RMS and worst errors against ngspice: the fit of
// TestCurveFitBack's kind (the blend netlist's curve at three settings,
// two parts free), the chosen design simulated at each setting and its
// differences from the target curve taken over the same points, within
// 0.01 dB.
func TestCurveFitAgainstNgspice(t *testing.T) {
	networks.RequireNgspice(t)
	target := blendNetlist(18e-9)
	target.Tone.Parts[0].Value = 33e3
	positions := []float64{0, 0.5, 1}
	hz := networks.LogGrid(20, 20e3, 60)
	c := &Curve{File: "curve.csv", Hz: hz}
	for _, p := range positions {
		sp := spiceAt(t, target, map[string]float64{"blend": p})
		cs := CurveSetting{Label: strconv.FormatFloat(p, 'g', -1, 64), Swept: ptr(p)}
		for _, f := range hz {
			cs.DB = append(cs.DB, sp.GainDB(f))
		}
		c.Settings = append(c.Settings, cs)
	}
	r, err := Solve(&Problem{Curve: c, From: blendNetlist(12e-9), Free: []string{"rlp", "clp"}}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Curves) != len(positions) {
		t.Fatalf("curves %+v", r.Curves)
	}
	for k, p := range positions {
		sp := spiceAt(t, r.Design, map[string]float64{"blend": p})
		ss, worst := 0.0, 0.0
		for i, f := range hz {
			d := sp.GainDB(f) - c.Settings[k].DB[i] - r.Curves[k].OffsetDB
			ss += d * d
			worst = math.Max(worst, math.Abs(d))
		}
		rms := math.Sqrt(ss / float64(len(hz)))
		if math.Abs(rms-r.Curves[k].RMSDB) > 0.01 || math.Abs(worst-r.Curves[k].WorstDB) > 0.01 {
			t.Errorf("blend %g: ngspice RMS %.4f dB, worst %.4f dB; synth %.4f, %.4f", p, rms, worst, r.Curves[k].RMSDB, r.Curves[k].WorstDB)
		}
	}
}
