package networks

import (
	"math"
	"testing"
)

// The faster evaluation (the real-arithmetic chain, the Meter's scans in
// |H|² and its searches in ln f) leaves the tolerance study's results as
// they were: these percentiles are what tonewright printed before that
// work (commit 113a145, `tolerance testdata/demo-design.yaml --trials 2000
// --seed 7 --json` on the design now kept as testdata/fixed-board.yaml;
// values copied from its output), for the parts it
// studied then and no taper tolerance. Frequencies agree to 1e-9
// relative, levels to 1e-9 dB; the scoop's frequency, found at a flat
// minimum, to 1e-6.
func TestToleranceResultsAsBefore(t *testing.T) {
	d, err := LoadDesign("../testdata/fixed-board.yaml")
	if err != nil {
		t.Fatal(err)
	}
	var parts []PartTolerance
	for _, p := range PartTolerances(d, nil) {
		if p.Name != SourceCouplingPart && p.Name != LoadCapPart {
			parts = append(parts, p)
		}
	}
	rep, err := Tolerance(d, ToleranceSpec{Parts: parts, Trials: 2000, Seed: 7, At: Setting{BlendKnob: 0.5}, Tapers: 0})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name    string
		got     *Spread
		want    [3]float64
		rel, db float64
	}{
		{"gain", &rep.Gain1kDB, [3]float64{-26.403181429362363, -25.13110892745749, -23.981372970657088}, 0, 1e-9},
		{"scoop", rep.ScoopHz, [3]float64{642.6997803768766, 697.4312777665889, 758.6952620415007}, 1e-6, 0},
		{"depth", rep.DepthDB, [3]float64{-8.753765317943257, -7.462847499375828, -6.1864163874432805}, 0, 1e-9},
		{"balance", rep.BalanceDB, [3]float64{-0.555805035882379, 0.1790436881401014, 0.8889130489475531}, 0, 1e-9},
		{"corner", rep.CornerHz, [3]float64{8425.515035694618, 9005.272659138538, 9588.191227141468}, 1e-9, 0},
	} {
		got := [3]float64{c.got.P5, c.got.P50, c.got.P95}
		for i := range got {
			if c.rel > 0 && math.Abs(got[i]/c.want[i]-1) > c.rel || c.db > 0 && math.Abs(got[i]-c.want[i]) > c.db {
				t.Errorf("%s percentile %d: %v, before %v", c.name, i, got[i], c.want[i])
			}
		}
	}
}
