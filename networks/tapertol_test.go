package networks

import (
	"math"
	"testing"
)

// Rotation inverts Fraction for every law (its closed form is derived in
// its comment).
func TestTaperRotationInvertsFraction(t *testing.T) {
	for _, tp := range []Taper{{Law: Linear}, {Law: Audio}, {Law: Audio, Midpoint: 0.15}, {Law: ReverseAudio}} {
		for x := 0.0; x <= 1; x += 0.05 {
			if got := tp.Rotation(tp.Fraction(x)); math.Abs(got-x) > 1e-12 {
				t.Errorf("%v: Rotation(Fraction(%g)) = %g", tp, x, got)
			}
		}
	}
}

// The taper tolerance alone (every part exact) spreads the figures at the
// centre of the knob, and not at all at an end stop, where the share is
// 0 or 1 whatever the track.
func TestTaperToleranceAlone(t *testing.T) {
	d := studyDesign()
	d.Level = nil
	parts := PartTolerances(d, nil)
	for i := range parts {
		parts[i].Tolerance = 0
	}
	for _, c := range []struct {
		blend  float64
		spread bool
	}{{0.5, true}, {0, false}} {
		rep, err := Tolerance(d, ToleranceSpec{Parts: parts, Trials: 200, Seed: 3, Tapers: 0.2, At: Setting{BlendKnob: c.blend}})
		if err != nil {
			t.Fatal(err)
		}
		w := rep.Gain1kDB.P95 - rep.Gain1kDB.P5
		if c.spread != (w > 0.05) || !c.spread && w > 1e-9 {
			t.Errorf("blend %g: gain at 1 kHz spreads over %g dB", c.blend, w)
		}
	}
	if _, err := Tolerance(d, ToleranceSpec{Parts: parts, Trials: 10, Tapers: 1.5}); err == nil {
		t.Error("a taper tolerance of 150 % was accepted")
	}
}
