package synth

import (
	"math"
	"math/cmplx"

	"tonewright/eseries"
	"tonewright/networks"
)

// Metrics are the figures a synthesis aims at, measured on one design with
// networks' definitions: the scoop at the targets' knob position, the
// corner at knob 1 and the gain at 1 kHz at knob 0.5.
type Metrics struct {
	Scoop       networks.Scoop `json:"scoop"` // with ScoopFound false: the levels at the target frequency
	ScoopFound  bool           `json:"scoop_found"`
	CornerHz    float64        `json:"corner_hz"` // with CornerFound false: 0
	CornerFound bool           `json:"corner_found"`
	Gain1kDB    float64        `json:"gain_1k_db"` // at knob 0.5
	// OutputOhm is |Z| looking back into the output at 1 kHz with the
	// knob at the scoop's position; measured only with a
	// max_output_impedance limit, else 0.
	OutputOhm float64 `json:"output_impedance_ohm,omitempty"`

	// The list form's figures, one per row (see itemRows), and whether
	// each was found.
	Figures [maxTargets]float64 `json:"-"`
	Found   [maxTargets]bool    `json:"-"`
	Worst   [maxTargets]float64 `json:"-"` // a curve's largest difference, dB
	Offset  [maxTargets]float64 `json:"-"` // a curve's level offset taken out (FitLevel), dB
	nfig    int
}

// goal is a resolved set of targets.
type goal struct {
	at                 float64
	scoop              bool
	hz, depth, balance float64
	corner             bool
	cornerHz           float64
	maxOut, maxLoss    float64    // limits: output impedance (Ω) and loss (dB); 0: none
	prefer             Prefer     // which design of those within tolerance
	priority           [][]string // which targets give way first; nil: DefaultPriority
	items              []Item     // the list form; nil: the mapping form above
	rows               []row      // the list form's figures
	fitLevel           bool       // curves: an overall level offset goes free
	effort             int        // Options.Effort
}

// tieBreak weighs the insertion loss at 1 kHz (dB) against the squared
// target errors, which are in units of IdealTolerance: 1 dB of loss counts
// as much as a third of the tolerance in one target, so at the optimum the
// tie-break moves each figure by a few hundredths of its tolerance.
const tieBreak = 0.1

// noScoop is added to the cost of a curve with no interior minimum: more
// than any plausible miss of the corner costs (a factor of e²⁵ in
// frequency, through the loss's linear tail), so that when the targets
// cannot all be met the search trades the corner against the scoop's
// figures rather than drop the scoop. Within the curves without a scoop
// the levels at the target frequency still give the search a slope.
const noScoop = 1e5

// noScoopWeighted is noScoop for the priority-weighted cost: more than any
// weighted miss.
const noScoopWeighted = 1e18

// boundWeight is the penalty per squared natural-log unit by which a
// continuous value leaves its range.
const boundWeight = 1e4

// variable is one unknown of the search: a part, or the tied parts of the
// identical filter sections.
type variable struct {
	name     string   // lowpass.r, filters.c, …
	role     string   // for tables
	parts    []string // the design's part names it sets
	kind     networks.PartKind
	slots    []*float64 // where it writes in the evaluator's design
	set      eseries.Set
	setName  string
	lo, hi   float64 // continuous bounds, natural log
	original float64 // the From design's value; 0 when fresh
}

// evaluator measures candidate designs. It owns a working design whose part
// values the variables write, and reuses its chain, compiled form and meter,
// so an evaluation does not allocate. It is not safe for concurrent use.
type evaluator struct {
	d     *networks.Design
	vars  []variable
	goal  goal
	meter *networks.Meter
	chain networks.Chain
	level networks.Level
	k     networks.Compiled
	knob  string             // the knob the targets are measured along, for a non-blend design
	gen   networks.Evaluator // the last compiled response of a non-blend design; nil for the blend form
	evals int
	// weights, when set, weigh the targets' errors by priority in the
	// cost (see priorityWeights); nil: every target alike.
	weights []float64
	// slack, when set with weights, is each target's tolerance in units
	// of IdealTolerance: the weights then apply to the miss beyond it.
	slack []float64
	// ranks are the targets' priority ranks (goal.ranks), with slack.
	ranks []int
	// tolSlack, when set, is each target's tolerance (the one the
	// result is judged by) in units of IdealTolerance: without a
	// priority, grade counts the targets missed beyond it before the
	// cost, so that allowed values meet the tolerance first.
	tolSlack []float64

	progress func()
}

func newEvaluator(d *networks.Design, g goal) *evaluator {
	e := &evaluator{d: d, goal: g, meter: networks.NewMeter(d.Band)}
	if d.Tone.Network != networks.BlendNetwork {
		e.knob = sweptKnob(d)
	}
	return e
}

// sweptKnob is the knob a non-blend design's targets are measured along:
// the design's swept knob, else its first knob ("" when it has none).
func sweptKnob(d *networks.Design) string {
	if k := d.SweptKnob(); k != "" {
		return k
	}
	if ks := d.KnobNames(); len(ks) > 0 {
		return ks[0]
	}
	return ""
}

// resp is the response compiled last.
func (e *evaluator) resp() networks.Response {
	if e.gen != nil {
		return e.gen
	}
	return &e.k
}

// compile builds the working design's response with its knob at position
// p: for the blend form the chain into e.k (no allocation), for any other
// network d.Compile at the design's own setting with the knob moved.
func (e *evaluator) compile(p float64) {
	d := e.d
	if d.Tone.Network != networks.BlendNetwork {
		over := map[string]float64{}
		if e.knob != "" {
			over[e.knob] = p
		}
		s, err := d.Setting(over)
		if err == nil {
			e.gen, err = d.Compile(s)
		}
		if err != nil {
			e.gen = flat{}
		}
		return
	}
	e.gen = nil
	c := &e.chain
	c.Source = d.Source
	c.Blend = networks.Blend{Lowpass: d.Tone.Lowpass, Highpass: d.Tone.Highpass,
		Pot: networks.Pot{Value: d.Tone.Pot.Value, Taper: d.Tone.Pot.Taper, Position: p}}
	c.Filters = d.Filters
	c.Level = nil
	if d.Level != nil {
		e.level.Pot = networks.Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: d.Level.Position}
		c.Level = &e.level
	}
	c.Load = d.Load
	c.CompileInto(&e.k)
}

// measure fills m with the working design's metrics. Where the curve has
// no scoop it measures the levels at the target frequency instead, and
// where the gain does not fall 3 dB by 10 × band top it leaves CornerFound
// false and records in m.CornerHz a surrogate (see cornerSurrogate).
func (e *evaluator) measure(m *Metrics) {
	e.evals++
	if e.progress != nil && e.evals%64 == 0 {
		e.progress()
	}
	g := &e.goal
	if len(g.items) > 0 {
		e.measureItems(m)
		return
	}
	f := g.hz
	if !g.scoop {
		f = math.Sqrt(e.d.Band.From * e.d.Band.To)
	}
	e.compile(g.at)
	m.Scoop, m.ScoopFound = e.meter.ScoopOrLevelsAt(e.resp(), f)
	if g.maxOut > 0 {
		if e.gen == nil {
			m.OutputOhm = cmplx.Abs(e.k.OutputImpedance(1000))
		} else {
			m.OutputOhm = math.Inf(1)
			if s, err := e.d.Setting(map[string]float64{e.knob: g.at}); err == nil {
				if _, out, err := e.d.Impedances(s, 1000); err == nil {
					m.OutputOhm = out
				}
			}
		}
	}
	if g.at == 0.5 {
		m.Gain1kDB = networks.Gain1k(e.resp())
	}
	if g.at != 1 {
		e.compile(1)
	}
	m.CornerHz, m.CornerFound = e.meter.Corner(e.resp())
	if !m.CornerFound {
		m.CornerHz = e.cornerSurrogate()
	}
	if g.at != 0.5 {
		e.compile(0.5)
		m.Gain1kDB = networks.Gain1k(e.resp())
	}
}

// cornerSurrogate gives the search a slope where the knob-1 curve does not
// fall 3 dB by 10 × band top: 10 × band top, moved up by how far the fall
// there is short of 3 dB (the gain at band top against the band's centre).
// e.k must hold the knob-1 chain.
func (e *evaluator) cornerSurrogate() float64 {
	b := e.d.Band
	top := 10 * b.To
	r := e.resp()
	drop := r.GainDB(math.Sqrt(b.From*b.To)) - r.GainDB(top)
	return top * math.Exp(0.1*math.Max(0, 3-drop))
}

// cost is the objective: the errors in units of IdealTolerance through
// loss (squared near the targets), plus the tie-break on insertion loss.
func (e *evaluator) cost(m *Metrics) float64 {
	g := &e.goal
	c := limitPenalty * e.overLimits(m)
	if len(g.items) > 0 {
		var errs [maxTargets]float64
		for k, x := range errs[:e.itemErrors(m, &errs)] {
			c += loss(x)
			if !m.Found[k] {
				c += noScoop
			}
		}
		return c - tieBreak*m.Gain1kDB
	}
	if g.scoop && !m.ScoopFound {
		// The levels at the target frequency keep a slope; the penalty
		// keeps a curve without a dip from ever beating one with it.
		c += noScoop
	}
	if e.weights != nil {
		// Targets that cannot all be met: each error weighed by its
		// priority, squared, so that the lower ranks give way.
		var errs [maxTargets]float64
		for i, x := range errs[:e.targetErrors(m, &errs)] {
			if e.slack == nil {
				c += sq(e.weights[i] * x)
				continue
			}
			// The parts of allowed values: what counts by priority is
			// the miss beyond the tolerance; within it, the error.
			c += sq(e.weights[i]*math.Max(0, math.Abs(x)-e.slack[i])) + sq(x)
		}
		if math.IsInf(e.worst(m), 1) {
			c += noScoopWeighted
		}
		return c - tieBreak*m.Gain1kDB
	}
	if g.scoop {
		c += loss(math.Log(m.Scoop.Hz/g.hz)/IdealTolerance.Freq) +
			loss((m.Scoop.DepthDB-g.depth)/IdealTolerance.Level) +
			loss((m.Scoop.BalanceDB-g.balance)/IdealTolerance.Level)
	}
	if g.corner {
		c += loss(math.Log(m.CornerHz/g.cornerHz) / IdealTolerance.Freq)
	}
	return c - tieBreak*m.Gain1kDB
}

// maxTargets is the number of figures a synthesis can aim at: the scoop's
// frequency, depth and balance, and the corner, or the rows of the list
// form.
const maxTargets = 16

// targetErrors writes the error of each target in units of IdealTolerance to
// dst, in the order scoop frequency, depth, balance, corner (those that
// are targets), and returns how many it wrote. Frequencies are compared
// in log, so that a miss up and a miss down by the same factor weigh the
// same.
func (e *evaluator) targetErrors(m *Metrics, dst *[maxTargets]float64) int {
	g := &e.goal
	if len(g.items) > 0 {
		return e.itemErrors(m, dst)
	}
	n := 0
	if g.scoop {
		dst[0] = math.Log(m.Scoop.Hz/g.hz) / IdealTolerance.Freq
		dst[1] = (m.Scoop.DepthDB - g.depth) / IdealTolerance.Level
		dst[2] = (m.Scoop.BalanceDB - g.balance) / IdealTolerance.Level
		n = 3
	}
	if g.corner {
		dst[n] = math.Log(m.CornerHz/g.cornerHz) / IdealTolerance.Freq
		n++
	}
	return n
}

// worst is the largest error in units of IdealTolerance; +Inf when a
// wanted scoop or corner is missing.
func (e *evaluator) worst(m *Metrics) float64 {
	if e.goal.scoop && !m.ScoopFound || e.goal.corner && !m.CornerFound {
		return math.Inf(1)
	}
	for k := range e.goal.rows {
		if !m.Found[k] {
			return math.Inf(1)
		}
	}
	var errs [maxTargets]float64
	w := 0.0
	for _, x := range errs[:e.targetErrors(m, &errs)] {
		w = math.Max(w, math.Abs(x))
	}
	return w
}

// lossScale is where loss turns from squared to linear, in units of
// IdealTolerance: ten of them, the chosen parts' tolerance (5 %, 1 dB).
const lossScale = 10

// loss is the pseudo-Huber loss of an error e in tolerance units: e² near
// zero, so the figures near the targets are weighed as squared errors, and
// growing only linearly beyond lossScale, so that a target the network
// cannot reach does not drag the others away from theirs.
func loss(e float64) float64 {
	return 2 * lossScale * lossScale * (math.Sqrt(1+sq(e/lossScale)) - 1)
}

func sq(x float64) float64 { return x * x }

// clamp returns a log value held within the variable's bounds and the
// squared distance it was moved, the penalty for leaving them.
func (v *variable) clamp(x float64) (float64, float64) {
	switch {
	case x < v.lo:
		return v.lo, sq(v.lo - x)
	case x > v.hi:
		return v.hi, sq(x - v.hi)
	}
	return x, 0
}

// setLog writes the variables' values exp(x[i]), clamped to their bounds,
// and returns the penalty for leaving them.
func (e *evaluator) setLog(x []float64) float64 {
	pen := 0.0
	for i := range e.vars {
		v := &e.vars[i]
		xi, p := v.clamp(x[i])
		pen += p
		val := math.Exp(xi)
		for _, s := range v.slots {
			*s = val
		}
	}
	return boundWeight * pen
}

// setValues writes the variables' values as given.
func (e *evaluator) setValues(vals []float64) {
	for i := range e.vars {
		for _, s := range e.vars[i].slots {
			*s = vals[i]
		}
	}
}

// values reads the variables' current values.
func (e *evaluator) values(dst []float64) []float64 {
	dst = dst[:0]
	for i := range e.vars {
		dst = append(dst, *e.vars[i].slots[0])
	}
	return dst
}

// f is the continuous objective on log values.
func (e *evaluator) f(x []float64) float64 {
	pen := e.setLog(x)
	var m Metrics
	e.measure(&m)
	c := e.cost(&m) + pen
	if math.IsNaN(c) {
		return math.Inf(1)
	}
	return c
}

// at returns the cost of the design with the variables at vals.
func (e *evaluator) at(vals []float64) float64 {
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	c := e.cost(&m)
	if math.IsNaN(c) {
		return math.Inf(1)
	}
	return c
}

// limitPenalty weighs how far a design breaks a limit (overLimits): more
// than the targets' errors, so that the search keeps within the limits.
const limitPenalty = 1e4

// overLimits is how far the design breaks the limits, squared: the
// output impedance in tenths of its natural log over the limit, the loss
// in tenths of a dB over it; 0 within them.
func (e *evaluator) overLimits(m *Metrics) float64 {
	g := &e.goal
	over := 0.0
	if g.maxOut > 0 && m.OutputOhm > g.maxOut {
		over += sq(10 * math.Log(m.OutputOhm/g.maxOut))
	}
	if g.maxLoss > 0 && -m.Gain1kDB > g.maxLoss {
		over += sq(10 * (-m.Gain1kDB - g.maxLoss))
	}
	return over
}

// flat is the response of a design that cannot be compiled (a part value
// the solver refuses): no gain at any frequency, so no figure is found
// and the search moves away.
type flat struct{}

func (flat) GainDB(float64) float64      { return math.Inf(-1) }
func (flat) Transfer(float64) complex128 { return 0 }
