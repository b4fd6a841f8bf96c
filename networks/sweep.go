package networks

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"

	"tonewright/eseries"
)

// This file holds the source and load sweep, and the single-knob
// measurement (StudyMetrics, probe) that the three studies of a design
// share: the sweep, the tolerance Monte Carlo and the sensitivities.

// DefaultStudyBlend is the blend knob position at which the studies measure
// the gain and the scoop unless told otherwise: the centre.
const DefaultStudyBlend = 0.5

// StudyMetrics are a design's metrics as the studies report them: the gain
// at 1 kHz and the scoop at one blend knob position, and the output corner
// (knob 1). They are the figures Analyze reports, computed the same way.
type StudyMetrics struct {
	Gain1kDB float64  `json:"gain_1k_db"`
	Scoop    *Scoop   `json:"scoop"`     // nil when the curve has no scoop
	CornerHz *float64 `json:"corner_hz"` // nil when there is no corner
}

// MetricsOf returns the study metrics of an analysis made at a single blend
// position (its first).
func MetricsOf(a *Analysis) StudyMetrics {
	m := StudyMetrics{CornerHz: a.CornerHz}
	if len(a.Positions) > 0 {
		m.Gain1kDB = a.Positions[0].Gain1kDB
		m.Scoop = a.Positions[0].Scoop
	}
	return m
}

// Shift is how far a variant's metrics lie from the design's own: the
// frequencies as a percentage, 100·(f/f₀ − 1), the levels as a difference
// in dB. A field is nil when either side lacks the metric (no scoop, no
// corner).
type Shift struct {
	Gain1kDB   float64  `json:"gain_1k_db"`
	ScoopHzPct *float64 `json:"scoop_hz_pct"`
	DepthDB    *float64 `json:"depth_db"`
	BalanceDB  *float64 `json:"balance_db"`
	CornerPct  *float64 `json:"corner_pct"`
}

// ShiftFrom returns the shift of m from the nominal metrics nom.
func (m StudyMetrics) ShiftFrom(nom StudyMetrics) Shift {
	s := Shift{Gain1kDB: m.Gain1kDB - nom.Gain1kDB}
	if m.Scoop != nil && nom.Scoop != nil {
		s.ScoopHzPct = ptr(100 * (m.Scoop.Hz/nom.Scoop.Hz - 1))
		s.DepthDB = ptr(m.Scoop.DepthDB - nom.Scoop.DepthDB)
		s.BalanceDB = ptr(m.Scoop.BalanceDB - nom.Scoop.BalanceDB)
	}
	if m.CornerHz != nil && nom.CornerHz != nil {
		s.CornerPct = ptr(100 * (*m.CornerHz / *nom.CornerHz - 1))
	}
	return s
}

func ptr(v float64) *float64 { return &v }

// SweepRow is the design measured with one source impedance and one load
// resistance.
type SweepRow struct {
	SourceOhm float64   // replaces source.impedance; the coupling capacitor is kept
	LoadOhm   float64   // replaces load.r (+Inf: open); the load capacitance is kept
	Metrics   *Analysis // Analyze at the sweep's blend position only
	Shift     Shift     // from the design's own source and load
}

// MarshalJSON writes the row with the keys source_ohm, load_ohm (null for an
// open load, which JSON cannot write as a number), metrics and shift.
func (r SweepRow) MarshalJSON() ([]byte, error) {
	var load *float64
	if !math.IsInf(r.LoadOhm, 1) {
		load = &r.LoadOhm
	}
	return json.Marshal(struct {
		SourceOhm float64   `json:"source_ohm"`
		LoadOhm   *float64  `json:"load_ohm"`
		Metrics   *Analysis `json:"metrics"`
		Shift     Shift     `json:"shift"`
	}{r.SourceOhm, load, r.Metrics, r.Shift})
}

// SweepResult is a design measured over a grid of source impedances and
// load resistances.
type SweepResult struct {
	Blend   float64    `json:"blend"`
	Nominal *Analysis  `json:"nominal"` // the design as it is, at Blend
	Rows    []SweepRow `json:"rows"`    // every source (outer) with every load (inner)
}

// Variant returns a copy of d driven by a source of impedance sourceOhm and
// loaded by loadOhm (+Inf: open). The source's coupling capacitor and the
// load's capacitance are kept.
func Variant(d *Design, sourceOhm, loadOhm float64) *Design {
	v := d.Clone()
	v.Source.Impedance = sourceOhm
	v.Load.R = loadOhm
	return v
}

// Sweep measures d with every source impedance in sources and every load
// resistance in loads, the blend knob at blend. A nil or empty list stands
// for the design's own value, but at least one list must have values.
// Source impedances must be zero or positive and finite, load resistances
// positive (+Inf is an open load).
func Sweep(d *Design, sources, loads []float64, blend float64) (*SweepResult, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if len(sources) == 0 && len(loads) == 0 {
		return nil, errors.New("nothing to sweep: give source impedances, load resistances or both")
	}
	if !(blend >= 0 && blend <= 1) {
		return nil, fmt.Errorf("blend knob position %v is outside 0..1", blend)
	}
	for _, s := range sources {
		if !nonNegative(s) {
			return nil, fmt.Errorf("source impedance %v Ω must be zero or positive and finite", s)
		}
	}
	for _, l := range loads {
		if !(l > 0) {
			return nil, fmt.Errorf("load resistance %v Ω must be positive (or open)", l)
		}
	}
	if len(sources) == 0 {
		sources = []float64{d.Source.Impedance}
	}
	if len(loads) == 0 {
		loads = []float64{d.Load.R}
	}
	pos := []float64{blend}
	nom, err := Analyze(d, pos)
	if err != nil {
		return nil, err
	}
	res := &SweepResult{Blend: blend, Nominal: nom}
	nm := MetricsOf(nom)
	for _, s := range sources {
		for _, l := range loads {
			a, err := Analyze(Variant(d, s, l), pos)
			if err != nil {
				return nil, fmt.Errorf("source %s, load %s: %w", eseries.WithUnit(s, 3, "Ω"), eseries.WithUnit(l, 3, "Ω"), err)
			}
			res.Rows = append(res.Rows, SweepRow{SourceOhm: s, LoadOhm: l, Metrics: a, Shift: MetricsOf(a).ShiftFrom(nm)})
		}
	}
	return res, nil
}

// probe measures designs at one blend knob position the way Analyze does
// (the same chains, compiled the same way, through the same Meter), but
// reusing its storage: after the first call it allocates nothing. It is
// what the tolerance trials and the sensitivity steps call; it is not safe
// for concurrent use.
type probe struct {
	m      *Meter
	blend  float64
	c      Chain
	lv     Level
	k0, k1 Compiled // at blend, at knob 1
}

func newProbe(band Band, blend float64) *probe {
	return &probe{m: NewMeter(band), blend: blend}
}

// chain sets p.c to d.Chain(pos), the level pot held in p.lv so that
// nothing is allocated. It must build what Design.Chain builds;
// TestProbeChainMatchesDesignChain holds it to that.
func (p *probe) chain(d *Design, pos float64) *Chain {
	p.c = Chain{
		Source:  d.Source,
		Blend:   Blend{Lowpass: d.Tone.Lowpass, Highpass: d.Tone.Highpass, Pot: Pot{Value: d.Tone.Pot.Value, Taper: d.Tone.Pot.Taper, Position: pos}},
		Filters: d.Filters,
		Load:    d.Load,
	}
	if d.Level != nil {
		p.lv = Level{Pot: Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: d.Level.Position}}
		p.c.Level = &p.lv
	}
	return &p.c
}

// sample is one measurement by a probe; a metric that is missing has its
// flag false and its fields zero.
type sample struct {
	gain      float64
	scoop     Scoop
	hasScoop  bool
	corner    float64
	hasCorner bool
}

// measure measures d: the gain at 1 kHz and the scoop at the probe's blend
// position, the corner at knob 1.
func (p *probe) measure(d *Design) sample {
	var s sample
	p.chain(d, p.blend).CompileInto(&p.k0)
	s.gain = Gain1k(&p.k0)
	s.scoop, s.hasScoop = p.m.Scoop(&p.k0)
	if !s.hasScoop {
		s.scoop = Scoop{}
	}
	p.chain(d, 1).CompileInto(&p.k1)
	s.corner, s.hasCorner = p.m.Corner(&p.k1)
	return s
}

// metrics returns a sample as StudyMetrics.
func (s sample) metrics() StudyMetrics {
	m := StudyMetrics{Gain1kDB: s.gain}
	if s.hasScoop {
		sc := s.scoop
		m.Scoop = &sc
	}
	if s.hasCorner {
		m.CornerHz = ptr(s.corner)
	}
	return m
}
