package synth

import (
	"math"
	"math/cmplx"
	"sort"
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
	c := d.Chain(p)
	var deck strings.Builder
	if err := c.Network().WriteSPICE(&deck, "synth check", networks.Band{From: d.Band.From, To: 10 * d.Band.To}, 2000); err != nil {
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
