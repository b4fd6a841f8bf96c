package networks

import (
	"math"
	"testing"
)

// The busiest tenth: a gain that changes evenly over the turn makes a
// tenth of its change in every tenth; one that changes only in its last
// tenth makes all of it there. (Invented curves, for the definition.)
func TestSpreadOver(t *testing.T) {
	even := make([]float64, KnobTurnSteps)
	late := make([]float64, KnobTurnSteps)
	for i := range even {
		even[i] = -float64(i) / 2
		if i > 36 {
			late[i] = -float64(i - 36)
		}
	}
	if s := spreadOver(1000, even); math.Abs(s.BusiestShare-0.1) > 1e-12 || math.Abs(s.RangeDB-20) > 1e-12 {
		t.Errorf("even: %+v", s)
	}
	if s := spreadOver(1000, late); s.BusiestShare != 1 || s.BusiestFrom != 0.9 || s.BusiestTo != 1 {
		t.Errorf("late: %+v", s)
	}
	if s := spreadOver(1000, make([]float64, KnobTurnSteps)); s.BusiestShare != 0 || s.RangeDB != 0 {
		t.Errorf("flat: %+v", s)
	}
}

// The treble cut turned through: with an ideal source and no load the gain
// at f is −10·log10(1 + (2πf(series_r + 1 Ω + F(x)·R)C)²) (the closed form
// of TestTopologyClosedForms at any rotation x, F the taper's share), at
// every step.
func TestTurnKnobTrebleCut(t *testing.T) {
	d := ideal(topologies[TrebleCutNetwork].DefaultDesign())
	v := parts(d)
	kt, err := TurnKnob(d, "cut", nil, []float64{1000, 5000})
	if err != nil {
		t.Fatal(err)
	}
	if len(kt.Steps) != KnobTurnSteps || kt.Taper != "audio" {
		t.Fatalf("%d steps, taper %s", len(kt.Steps), kt.Taper)
	}
	tp := Taper{Law: Audio}
	for _, st := range kt.Steps {
		for q, f := range kt.Hz {
			r := v["series_r"] + EndResistance + tp.Fraction(st.Position)*v["cut"]
			want := -10 * math.Log10(1+math.Pow(2*math.Pi*f*r*v["cut_c"], 2))
			if math.Abs(st.GainDB[q]-want) > 1e-9 {
				t.Errorf("cut %g, %g Hz: %g dB, closed form %g", st.Position, f, st.GainDB[q], want)
			}
		}
	}
	if _, err := TurnKnob(d, "treble", nil, DefaultTurnHz); err == nil {
		t.Error("an unknown knob was accepted")
	}
}
