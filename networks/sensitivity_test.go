package networks

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// For a single RC section the corner is fc = 1/(2πRC) (circuit theory), so
// d ln fc/d ln C = −1 and d ln fc/d ln R = −1. In rcDesign the resistance
// in series is R + Rs + EndResistance, which makes the R sensitivity
// −R/(R + Rs + EndResistance). The Meter's corner f3 (rcCorner) solves
// 1 + (f3/fc)² = A·(1 + x²) with A = 10^0.3 and x = fLo/fc, so
// d ln f3/d ln fc = 1 − A·x²/(A·(1 + x²) − 1), a factor within 1e-4 of 1
// here; the expected values include it. The corner search resolves f3 to
// a few parts in 1e9 on this circuit, which the central difference with
// h = 1e-3 turns into a few parts in 1e6: the tolerance is 1e-5.
func TestSensitivityRCCorner(t *testing.T) {
	for _, tc := range []struct{ rs, r, c float64 }{
		{0, 10e3, 2.2e-9},
		{4.7e3, 22e3, 1e-9},
		{0, 100e3, 470e-12},
	} {
		d := rcDesign(tc.rs, tc.r, tc.c)
		rep, err := Sensitivities(d, Setting{BlendKnob: 1})
		if err != nil {
			t.Fatal(err)
		}
		got := map[string]float64{}
		for _, p := range rep.Parts {
			if p.CornerHz == nil {
				t.Fatalf("%s: no corner sensitivity", p.Name)
			}
			got[p.Name] = *p.CornerHz
		}
		fc := 1 / (2 * math.Pi * (tc.r + tc.rs + EndResistance) * tc.c)
		a, x := math.Pow(10, 0.3), d.Band.From/fc
		meter := 1 - a*x*x/(a*(1+x*x)-1)
		for name, want := range map[string]float64{
			"filter1.c": -1 * meter,
			"filter1.r": -tc.r / (tc.r + tc.rs + EndResistance) * meter,
		} {
			if math.Abs(got[name]-want) > 1e-5 {
				t.Errorf("%+v: corner sensitivity to %s %v, want %v (circuit theory)", tc, name, got[name], want)
			}
		}
		if math.Abs(got["filter1.r"]+1) > 3e-4+tc.rs/tc.r {
			t.Errorf("%+v: corner sensitivity to R %v, want about −1", tc, got["filter1.r"])
		}
		// The transparent blend's parts do not move the corner.
		for _, name := range []string{"lowpass.r", "lowpass.c", "highpass.c", "highpass.r", "pot"} {
			if math.Abs(got[name]) > 1e-5 {
				t.Errorf("%+v: corner sensitivity to %s %v, want 0", tc, name, got[name])
			}
		}
		if r := rep.Ranking["corner_pct_per_pct"]; len(r) < 2 || !(r[0] == "filter1.c" || r[0] == "filter1.r") {
			t.Errorf("corner ranking %v", r)
		}
	}
}

// solverSample measures a design with the general nodal solver instead of
// the compiled cascade.
func solverSample(t *testing.T, d *Design, blend float64) sample {
	t.Helper()
	m := NewMeter(d.Band)
	c0, c1 := d.Chain(blend), d.Chain(1)
	s0, err := c0.Network().Compile()
	if err != nil {
		t.Fatal(err)
	}
	s1, err := c1.Network().Compile()
	if err != nil {
		t.Fatal(err)
	}
	var s sample
	s.gain = Gain1k(s0)
	s.scoop, s.hasScoop = m.Scoop(s0)
	s.corner, s.hasCorner = m.Corner(s1)
	return s
}

// The sensitivities agree with central differences taken on the nodal
// solver (an independent computation of the same circuit, see
// TestCompiledEqualsNodal), part by part and metric by metric.
func TestSensitivityAgreesWithNodalSolver(t *testing.T) {
	d := studyDesign()
	d.Load.C = 470e-12
	const blend = 0.6
	rep, err := Sensitivities(d, Setting{BlendKnob: blend})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Parts) != len(d.StudyParts()) {
		t.Fatalf("%d parts, want %d", len(rep.Parts), len(d.StudyParts()))
	}
	h := SensitivityStep
	for _, got := range rep.Parts {
		w := d.Clone()
		v, _ := w.PartValue(got.Name)
		w.SetPart(got.Name, v*math.Exp(h))
		up := solverSample(t, w, blend)
		w.SetPart(got.Name, v*math.Exp(-h))
		down := solverSample(t, w, blend)
		want := sensitivityOf(Part{Name: got.Name}, up, down, h)
		for _, m := range SensitivityMetrics {
			g, gok := m.Get(&got)
			x, xok := m.Get(&want)
			if gok != xok {
				t.Errorf("%s %s: present %v, nodal %v", got.Name, m.Key, gok, xok)
				continue
			}
			// A minimum's location is fixed only to about the square
			// root of the gain's rounding: the two solvers, which agree to
			// about 1e-12, put the scoop up to ~1e-6 apart in ln f, which a
			// central difference with h = 1e-3 turns into ±5e-4.
			tol := 1e-5
			if m.Key == "scoop_hz_pct_per_pct" {
				tol = 2e-3
			}
			if math.Abs(g-x) > tol*math.Max(1, math.Abs(x)) {
				t.Errorf("%s %s: %v, nodal solver %v", got.Name, m.Key, g, x)
			}
		}
	}
	// Every metric of this design moves with some part.
	for _, m := range SensitivityMetrics {
		r := rep.Ranked(m)
		if len(r) == 0 {
			t.Errorf("%s: no part moves it", m.Key)
			continue
		}
		top, _ := m.Get(&r[0])
		for _, p := range r[1:] {
			if v, _ := m.Get(&p); math.Abs(v) > math.Abs(top) {
				t.Errorf("%s: ranking not by magnitude: %s %v after %v", m.Key, p.Name, v, top)
			}
		}
		if len(rep.Ranking[m.Key]) != len(r) || rep.Ranking[m.Key][0] != r[0].Name {
			t.Errorf("%s: Ranking %v, Ranked starts with %s", m.Key, rep.Ranking[m.Key], r[0].Name)
		}
	}
}

// A sensitivity needs the metric at both steps: with the blend at knob 0
// the study design has no scoop, so the scoop's sensitivities are missing
// while the gain's and the corner's are there.
func TestSensitivityMissingScoop(t *testing.T) {
	rep, err := Sensitivities(studyDesign(), Setting{BlendKnob: 0})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range rep.Parts {
		if p.ScoopHz != nil || p.DepthDB != nil || p.BalanceDB != nil || p.CornerHz == nil {
			t.Errorf("%s: %+v", p.Name, p)
		}
	}
	if len(rep.Ranking["scoop_hz_pct_per_pct"]) != 0 || len(rep.Ranking["gain_1k_db_per_pct"]) != len(rep.Parts) {
		t.Errorf("ranking %v", rep.Ranking)
	}
	b, err := json.Marshal(rep)
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{`"scoop_hz_pct_per_pct":null`, `"depth_db_per_pct":null`, `"corner_pct_per_pct":`, `"gain_1k_db_per_pct":`, `"balance_db_per_pct":null`, `"step":0.001`} {
		if !strings.Contains(string(b), key) {
			t.Errorf("JSON lacks %s: %s", key, b)
		}
	}
}

func TestSensitivityErrors(t *testing.T) {
	if _, err := Sensitivities(studyDesign(), Setting{BlendKnob: 2}); err == nil || !strings.Contains(err.Error(), "knob blend: position 2 is outside 0..1") {
		t.Errorf("blend 2: %v", err)
	}
	d := studyDesign()
	d.Filters[0].R = -1
	if _, err := Sensitivities(d, Setting{BlendKnob: 0.5}); err == nil || !strings.Contains(err.Error(), "filters[0].r") {
		t.Errorf("negative R: %v", err)
	}
}
