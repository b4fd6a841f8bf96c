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
// at 1 kHz and the scoop at one knob setting, and the output corner (for a
// blend design at blend knob 1, else at the same setting). They are the
// figures Analyze reports, computed the same way.
type StudyMetrics struct {
	Gain1kDB float64  `json:"gain_1k_db"`
	Scoop    *Scoop   `json:"scoop"`     // nil when the curve has no scoop
	CornerHz *float64 `json:"corner_hz"` // nil when there is no corner
}

// MetricsOf returns the study metrics of an analysis made at a single knob
// setting (its first).
func MetricsOf(a *Analysis) StudyMetrics {
	m := StudyMetrics{CornerHz: a.CornerHz}
	if len(a.Positions) > 0 {
		m.Gain1kDB = a.Positions[0].Gain1kDB
		m.Scoop = a.Positions[0].Scoop
		if !a.Blend {
			m.CornerHz = a.Positions[0].CornerHz
		}
	}
	return m
}

// blendOf returns the blend knob's position in s, nil for a setting with
// no blend knob.
func blendOf(s Setting) *float64 {
	if b, ok := s[BlendKnob]; ok {
		return &b
	}
	return nil
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
	LoadOhm   float64   // replaces load.r (+Inf: open)
	LoadC     float64   // replaces load.c when the sweep lists load capacitances, else the design's
	Metrics   *Analysis // Analyze at the sweep's blend position only
	Shift     Shift     // from the design's own source and load
}

// MarshalJSON writes the row with the keys source_ohm, load_ohm (null for an
// open load, which JSON cannot write as a number), load_c_farad, metrics
// and shift.
func (r SweepRow) MarshalJSON() ([]byte, error) {
	var load *float64
	if !math.IsInf(r.LoadOhm, 1) {
		load = &r.LoadOhm
	}
	return json.Marshal(struct {
		SourceOhm float64   `json:"source_ohm"`
		LoadOhm   *float64  `json:"load_ohm"`
		LoadC     float64   `json:"load_c_farad"`
		Metrics   *Analysis `json:"metrics"`
		Shift     Shift     `json:"shift"`
	}{r.SourceOhm, load, r.LoadC, r.Metrics, r.Shift})
}

// SweepResult is a design measured over a grid of source impedances and
// load resistances.
type SweepResult struct {
	Blend   *float64   `json:"blend,omitempty"` // the blend knob, for a blend design
	Knobs   Setting    `json:"knobs"`           // the setting measured
	Nominal *Analysis  `json:"nominal"`         // the design as it is, at Knobs
	Rows    []SweepRow `json:"rows"`            // every source (outer) with every load (inner)
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
// resistance in loads, the knobs at the setting at. A nil or empty list stands
// for the design's own value, but at least one list must have values.
// Source impedances must be zero or positive and finite, load resistances
// positive (+Inf is an open load).
func Sweep(d *Design, sources, loads []float64, at Setting) (*SweepResult, error) {
	return SweepLoads(d, sources, loads, nil, at)
}

// SweepLoads is Sweep with a third list, load capacitances (the cable and
// the next stage's input), innermost: each replaces load.c (0 is none).
func SweepLoads(d *Design, sources, loads, loadCs []float64, at Setting) (*SweepResult, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if len(sources) == 0 && len(loads) == 0 && len(loadCs) == 0 {
		return nil, errors.New("nothing to sweep: give source impedances, load resistances, load capacitances or some of them")
	}
	for _, c := range loadCs {
		if !nonNegative(c) || c > MaxFarads {
			return nil, fmt.Errorf("load capacitance %v F must be zero or positive and at most %v F", c, MaxFarads)
		}
	}
	if len(loadCs) == 0 {
		loadCs = []float64{d.Load.C}
	}
	at, err := d.Setting(at)
	if err != nil {
		return nil, err
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
	pos := []Setting{at}
	nom, err := AnalyzeSettings(d, pos)
	if err != nil {
		return nil, err
	}
	res := &SweepResult{Blend: blendOf(at), Knobs: at, Nominal: nom}
	nm := MetricsOf(nom)
	for _, s := range sources {
		for _, l := range loads {
			for _, c := range loadCs {
				v := Variant(d, s, l)
				v.Load.C = c
				a, err := AnalyzeSettings(v, pos)
				if err != nil {
					return nil, fmt.Errorf("source %s, load %s, %s: %w", eseries.WithUnit(s, 3, "Ω"), eseries.WithUnit(l, 3, "Ω"), eseries.WithUnit(c, 3, "F"), err)
				}
				res.Rows = append(res.Rows, SweepRow{SourceOhm: s, LoadOhm: l, LoadC: c, Metrics: a, Shift: MetricsOf(a).ShiftFrom(nm)})
			}
		}
	}
	return res, nil
}

// probe measures designs at one knob setting the way Analyze does (the
// same evaluators, through the same Meter), but for blend designs reusing
// its storage: after the first call it allocates nothing. It is what the
// tolerance trials and the sensitivity steps call; it is not safe for
// concurrent use.
type probe struct {
	m          *Meter
	at, corner Setting // where the gain and scoop, and the corner, are measured
	c          Chain
	lv         Level
	k0, k1     Compiled // blend designs: at at, at corner
	e0, e1     Response // the evaluators of the last measurement
	blend      bool     // a blend design: the corner at blend knob 1
}

// newProbe returns a probe of designs shaped like d at the setting at: the
// corner of a blend design is measured at blend knob 1, of any other at at.
func newProbe(d *Design, at Setting) *probe {
	at = d.complete(at)
	p := &probe{m: NewMeter(d.Band), at: at, corner: at}
	if d.Tone.Network == BlendNetwork {
		p.corner, p.blend = at.With(BlendKnob, 1), true
	}
	return p
}

// setKnob puts a knob of the probe's setting at x, for the gain and the
// scoop and (but for a blend design's blend knob, held at 1) the corner.
// It writes into the probe's own settings, allocating nothing.
func (p *probe) setKnob(name string, x float64) {
	p.at[name] = x
	if _, ok := p.corner[name]; ok && !(name == BlendKnob && p.blend) {
		p.corner[name] = x
	}
}

// chain sets p.c to d.ChainAt(s), the level pot held in p.lv so that
// nothing is allocated. It must build what Design.ChainAt builds;
// TestProbeChainMatchesDesignChain holds it to that.
func (p *probe) chain(d *Design, s Setting) *Chain {
	p.c = Chain{
		Source:  d.Source,
		Blend:   Blend{Lowpass: d.Tone.Lowpass, Highpass: d.Tone.Highpass, Pot: Pot{Value: d.Tone.Pot.Value, Taper: d.Tone.Pot.Taper, Position: s[BlendKnob]}},
		Filters: d.Filters,
		Load:    d.Load,
	}
	if d.Level != nil {
		p.lv = Level{Pot: Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: s[LevelKnob]}}
		p.c.Level = &p.lv
	}
	return &p.c
}

// compile sets p.e0 and p.e1 to d's evaluators at the probe's settings.
func (p *probe) compile(d *Design) {
	if d.Tone.Network == BlendNetwork {
		p.chain(d, p.at).CompileInto(&p.k0)
		p.chain(d, p.corner).CompileInto(&p.k1)
		p.e0, p.e1 = &p.k0, &p.k1
		return
	}
	var e Response = nanResponse{}
	if c, err := d.Compile(p.at); err == nil {
		e = c
	}
	p.e0, p.e1 = e, e
}

// nanResponse stands for a design that cannot be solved: every figure of
// it is missing.
type nanResponse struct{}

func (nanResponse) GainDB(float64) float64 { return math.NaN() }

// sample is one measurement by a probe; a metric that is missing has its
// flag false and its fields zero.
type sample struct {
	gain      float64
	scoop     Scoop
	hasScoop  bool
	corner    float64
	hasCorner bool
}

// measure measures d: the gain at 1 kHz and the scoop at the probe's
// setting, the corner at its corner setting.
func (p *probe) measure(d *Design) sample {
	var s sample
	p.compile(d)
	s.gain = Gain1k(p.e0)
	s.scoop, s.hasScoop = p.m.Scoop(p.e0)
	if !s.hasScoop {
		s.scoop = Scoop{}
	}
	s.corner, s.hasCorner = p.m.Corner(p.e1)
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
