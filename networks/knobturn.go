package networks

import (
	"fmt"
	"math"
)

// This file is the knob-turn study: how a knob feels over its turn. It
// turns one knob from 0 to 1, the others at their positions, and measures
// the gain at a few frequencies, the scoop and the corner at every step;
// then, per frequency, how far the gain moves and how much of that
// movement the busiest tenth of the turn makes (a knob that does
// everything in its last tenth is the commonest complaint about a tone
// control).

// KnobTurnSteps is the number of positions the study measures, 0 to 1 in
// equal steps of rotation.
const KnobTurnSteps = 41

// DefaultTurnHz are the frequencies the study reports by default.
var DefaultTurnHz = []float64{100, 1000, 5000}

// TurnStep is the design measured at one rotation of the knob.
type TurnStep struct {
	Position float64   `json:"position"`
	GainDB   []float64 `json:"gain_db"`  // at KnobTurn.Hz, in order
	ScoopHz  *float64  `json:"scoop_hz"` // nil: no scoop
	CornerHz *float64  `json:"corner_hz"`
}

// TurnSpread is, for one frequency, how the gain moves over the turn.
type TurnSpread struct {
	Hz      float64 `json:"hz"`
	RangeDB float64 `json:"range_db"` // largest minus smallest gain over the turn
	// BusiestShare is the share, 0..1, of the whole change (the sum of
	// |gain change| over the steps) made in the tenth of the turn that
	// changes most (four consecutive steps of the forty); an even spread
	// gives 0.1. 0 when the gain does not change at all.
	BusiestShare float64 `json:"busiest_tenth_share"`
	// BusiestFrom and BusiestTo are where that tenth of the turn lies.
	BusiestFrom float64 `json:"busiest_tenth_from"`
	BusiestTo   float64 `json:"busiest_tenth_to"`
}

// KnobTurn is the result of the knob-turn study.
type KnobTurn struct {
	Knob    string       `json:"knob"`
	Taper   string       `json:"taper"` // the knob's pot's taper
	Knobs   Setting      `json:"knobs"` // the other knobs' positions (and this one's as designed)
	Hz      []float64    `json:"hz"`
	Steps   []TurnStep   `json:"steps"`
	Spreads []TurnSpread `json:"spreads"` // per frequency, in the order of Hz
}

// TurnKnob turns the knob named knob from 0 to 1 in KnobTurnSteps steps,
// the other knobs at the setting at (knobs it leaves out at their
// positions), and measures the gain at each of hz, the scoop and the
// corner at every step.
func TurnKnob(d *Design, knob string, at Setting, hz []float64) (*KnobTurn, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if err := d.checkKnob(knob); err != nil {
		return nil, err
	}
	if len(hz) == 0 {
		return nil, fmt.Errorf("no frequencies given")
	}
	for _, f := range hz {
		if !positive(f) || f > 1e9 {
			return nil, fmt.Errorf("frequency %v Hz must be positive and at most 1 GHz", f)
		}
	}
	base, err := d.Setting(at)
	if err != nil {
		return nil, err
	}
	kt := &KnobTurn{Knob: knob, Taper: d.knobTaper(knob).String(), Knobs: base, Hz: hz}
	m := NewMeter(d.Band)
	for i := 0; i < KnobTurnSteps; i++ {
		p := float64(i) / float64(KnobTurnSteps-1)
		e, err := d.Compile(base.With(knob, p))
		if err != nil {
			return nil, err
		}
		st := TurnStep{Position: p}
		for _, f := range hz {
			st.GainDB = append(st.GainDB, e.GainDB(f))
		}
		if s, ok := m.Scoop(e); ok {
			st.ScoopHz = ptr(s.Hz)
		}
		if c, ok := m.Corner(e); ok {
			st.CornerHz = ptr(c)
		}
		kt.Steps = append(kt.Steps, st)
	}
	for q, f := range hz {
		g := make([]float64, len(kt.Steps))
		for i, st := range kt.Steps {
			g[i] = st.GainDB[q]
		}
		kt.Spreads = append(kt.Spreads, spreadOver(f, g))
	}
	return kt, nil
}

// spreadOver measures one frequency's gains over the turn (g[i] at
// rotation i/(len(g)−1)).
func spreadOver(hz float64, g []float64) TurnSpread {
	sp := TurnSpread{Hz: hz}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range g {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	sp.RangeDB = hi - lo
	n := len(g) - 1 // steps
	w := n / 10     // steps in a tenth of the turn
	var total float64
	for i := 1; i <= n; i++ {
		total += math.Abs(g[i] - g[i-1])
	}
	if total == 0 || w < 1 {
		return sp
	}
	best, at := -1.0, 0
	for s := 0; s+w <= n; s++ {
		var sum float64
		for i := s + 1; i <= s+w; i++ {
			sum += math.Abs(g[i] - g[i-1])
		}
		if sum > best {
			best, at = sum, s
		}
	}
	sp.BusiestShare = best / total
	sp.BusiestFrom, sp.BusiestTo = float64(at)/float64(n), float64(at+w)/float64(n)
	return sp
}
