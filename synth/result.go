package synth

import (
	"math"

	"tonewright/networks"
)

// Result is a finished synthesis.
type Result struct {
	Targets Targets `json:"targets"` // as resolved: defaults and kept figures filled in

	Ideal  *networks.Design `json:"ideal"`  // the continuous optimum: exact values
	Design *networks.Design `json:"design"` // the chosen parts

	IdealMetrics Metrics `json:"ideal_metrics"` // of Ideal
	Metrics      Metrics `json:"metrics"`       // of Design

	Parts   []Choice     `json:"parts"`            // every part of Design, in signal order
	Checks  []Check      `json:"checks"`           // every target
	Limits  []LimitCheck `json:"limits,omitempty"` // every limit set
	Changes []Change     `json:"changes"`          // re-voicing: the parts to swap

	// Feasible reports whether the continuous optimum meets every target
	// within IdealTolerance; when it does not, the targets ask for more
	// than the topology, band and surroundings can give (or, re-voicing,
	// than the parts allowed to change can: see Cause), and IdealMetrics
	// are the nearest achievable figures.
	Feasible bool `json:"feasible"`
	// Met reports whether the chosen parts meet every target within the
	// tolerance (Options.Tolerance, by default PartsTolerance).
	Met bool `json:"met"`

	// Cause says why, when Met is false: CauseNetwork, CauseParts or
	// CauseMaxChanges; "" when Met.
	Cause string `json:"cause,omitempty"`
	// Unlimited is, when a re-voicing limited by Problem.MaxChanges
	// misses, the best design without the limit (its Changes are the
	// swaps it needs); nil otherwise.
	Unlimited *Result `json:"unlimited,omitempty"`
	// MaxChanges is Problem.MaxChanges when it limited the search (it was
	// below the number of free parts), else 0; StockFile is the stock
	// file's name when a stock restricted the parts ("stock" for one
	// built in code), else "".
	// Freed is, when a re-voicing limited by Problem.Free misses, the
	// best design with every part free; nil otherwise.
	Freed *Result `json:"freed,omitempty"`
	// AtLimit lists the free parts whose ideal value sits at a limit of
	// its range (a resistor or capacitor range, the pot list's ends).
	AtLimit []AtLimit `json:"at_limit,omitempty"`
	// Widened is, when the ideal values miss with a part at a range
	// limit, the search with every range widened a hundredfold.
	Widened    *Result `json:"widened,omitempty"`
	MaxChanges int     `json:"max_changes,omitempty"`
	StockFile  string  `json:"stock_file,omitempty"`

	// Starts is, when the first search missed a target, how many starts
	// the rescue pulled onto the targets (see rescue); 0 otherwise. When
	// Feasible is false no design within IdealTolerance was found in
	// that many starts: the verdict rests on that search, not on a proof.
	Starts int `json:"starts,omitempty"`
	// Conflicts are, when the ideal parts miss, the targets missed, each
	// with the nearest figure found while keeping the targets met
	// (Held), those ranked above it first (Problem.Priority).
	Conflicts []Conflict `json:"conflicts,omitempty"`
	// GainSetting says where Metrics.Gain1kDB is measured: "knob 0.5"
	// for the blend network, the swept knob at 0.5 for another, or "its
	// knobs as set" for the list form and curve targets.
	GainSetting string `json:"-"`
	// Knob names the knob the mapping form's figures are taken at: "knob"
	// for the blend network's, else the swept knob's name.
	Knob string `json:"-"`
	// Priority is, with Conflicts, the order the targets were kept in,
	// highest first (Problem.Priority, or DefaultPriority).
	Priority [][]string `json:"priority,omitempty"`
	// Curves are, for a curve target, the fit at each setting.
	Curves []CurveFit `json:"curves,omitempty"`
	// Prefer is how the chosen design was chosen among those within the
	// tolerance: "closest" or "loss".
	Prefer string `json:"prefer"`

	Evaluations int `json:"evaluations"` // of the objective, in all
}

// LimitCheck is one practical limit against the ideal and chosen designs.
type LimitCheck struct {
	Name     string  `json:"name"` // "output impedance", "loss at 1 kHz", "smallest capacitor"
	Key      string  `json:"key"`  // limits.max_output_impedance, …
	Unit     string  `json:"unit"` // "Ω", "dB" or "F"
	Limit    float64 `json:"limit"`
	Ideal    float64 `json:"ideal"`
	Achieved float64 `json:"achieved"`
	IdealMet bool    `json:"ideal_met"`
	Met      bool    `json:"met"`
}

// LimitsMet reports whether the chosen design keeps every limit.
func (r *Result) LimitsMet() bool {
	for _, l := range r.Limits {
		if !l.Met {
			return false
		}
	}
	return true
}

// AtLimit is an ideal value at a limit of its range.
type AtLimit struct {
	Kind  networks.PartKind `json:"-"`
	Part  string            `json:"part"`
	Value float64           `json:"value"`
	Limit string            `json:"limit"` // "low", "high", or "pinned" (a range of one value)
	Key   string            `json:"key"`   // the targets-file key of the range
}

// CurveFit is how closely the chosen design follows a target curve at one
// setting: the RMS and the largest difference over the band, in dB, after
// the level offset taken out (with Problem.FitLevel; else 0).
type CurveFit struct {
	Setting  string  `json:"setting"`
	RMSDB    float64 `json:"rms_db"`
	WorstDB  float64 `json:"worst_db"`
	OffsetDB float64 `json:"offset_db"`
}

// Conflict is a target the ideal parts miss: the nearest figure found
// (none when Found is false) while keeping the targets in Held met.
type Conflict struct {
	Target  string   `json:"target"` // the Check name: "scoop balance", …
	Key     string   `json:"key"`
	Unit    string   `json:"unit"`
	Wanted  float64  `json:"wanted"`
	Nearest float64  `json:"nearest"`
	Found   bool     `json:"found"`
	Held    []string `json:"held"` // Check names
}

// Choice is one part of the chosen design.
type Choice struct {
	Name     string            `json:"name"` // networks.Design.Parts name: lowpass.r, filter2.c, …
	Role     string            `json:"role"`
	Kind     networks.PartKind `json:"-"`
	Ideal    float64           `json:"ideal"` // the continuous optimum's value
	Chosen   float64           `json:"chosen"`
	Set      string            `json:"from"`               // E24, stock, list, common pots, unchanged; "given" when not free
	Original float64           `json:"original,omitempty"` // the From design's value; 0 when fresh or a new part
	Free     bool              `json:"free"`
}

// Check is one target against what the ideal and the chosen designs
// achieve. Frequency errors are relative ((achieved − wanted)/wanted),
// level errors in dB (achieved − wanted); as JSON (see MarshalJSON) the
// keys are snake_case and frequency errors are in percent.
type Check struct {
	Name   string // "scoop frequency", "scoop depth", "scoop balance", "corner"
	Key    string // the targets-file key: targets.scoop.hz, …
	Unit   string // "Hz" or "dB"
	Wanted float64

	Ideal, Achieved   float64
	IdealFound, Found bool // false: no scoop, or no corner below 10 × band top
	IdealError, Error float64
	IdealMet, Met     bool
}

// Change is a part a re-voicing swaps.
type Change struct {
	Kind networks.PartKind `json:"-"`
	Part string            `json:"part"`
	Role string            `json:"role"`
	From float64           `json:"from"` // 0 for a part the original design did not have
	To   float64           `json:"to"`
}

func (r *run) result(p *Problem, base *networks.Design, g goal, tol Tolerance, evals int) *Result {
	res := &Result{Targets: g.targets(), Evaluations: evals}
	res.Ideal, res.IdealMetrics = r.build(base, g, r.ideal)
	res.Design, res.Metrics = r.build(base, g, r.chosen)
	res.Ideal.Name, res.Design.Name = base.Name, base.Name

	free := map[string]*variable{}
	for i := range r.vars {
		for _, name := range r.vars[i].parts {
			free[name] = &r.vars[i]
		}
	}
	ideal := res.Ideal.Parts()
	var orig map[string]float64
	if p.From != nil {
		orig = map[string]float64{}
		for _, pt := range p.From.Parts() {
			orig[pt.Name] = pt.Value
		}
	}
	for i, pt := range res.Design.Parts() {
		c := Choice{Name: pt.Name, Role: pt.Role, Kind: pt.Kind, Ideal: ideal[i].Value, Chosen: pt.Value, Set: "given"}
		if v, ok := free[pt.Name]; ok {
			c.Free, c.Set = true, v.setName
			if same(pt.Value, v.original) {
				c.Set = "unchanged"
			}
		} else {
			c.Ideal = pt.Value
		}
		if orig != nil {
			c.Original = orig[pt.Name]
			if !same(c.Chosen, c.Original) && pt.Name != "level" {
				res.Changes = append(res.Changes, Change{Part: pt.Name, Role: pt.Role, From: c.Original, To: c.Chosen, Kind: pt.Kind})
			}
		}
		res.Parts = append(res.Parts, c)
	}

	res.Checks = checks(g, &res.IdealMetrics, &res.Metrics, tol)
	res.Feasible, res.Met = true, true
	for _, c := range res.Checks {
		res.Feasible = res.Feasible && c.IdealMet
		res.Met = res.Met && c.Met
	}
	if g.maxOut > 0 {
		res.Limits = append(res.Limits, LimitCheck{Name: "output impedance", Key: "limits.max_output_impedance", Unit: "Ω", Limit: g.maxOut,
			Ideal: res.IdealMetrics.OutputOhm, Achieved: res.Metrics.OutputOhm,
			IdealMet: res.IdealMetrics.OutputOhm <= g.maxOut, Met: res.Metrics.OutputOhm <= g.maxOut})
	}
	if g.maxLoss > 0 {
		res.Limits = append(res.Limits, LimitCheck{Name: "loss at 1 kHz", Key: "limits.max_loss_db", Unit: "dB", Limit: g.maxLoss,
			Ideal: -res.IdealMetrics.Gain1kDB, Achieved: -res.Metrics.Gain1kDB,
			IdealMet: -res.IdealMetrics.Gain1kDB <= g.maxLoss+0.05, Met: -res.Metrics.Gain1kDB <= g.maxLoss})
	}
	for _, l := range res.Limits {
		res.Met = res.Met && l.Met
	}
	res.Starts, res.Prefer = r.starts, g.prefer.String()
	res.Knob = "knob"
	if k := sweptKnob(base); base.Tone.Network != networks.BlendNetwork && k != "" {
		res.Knob = k
	}
	res.GainSetting = res.Knob + " 0.5"
	if len(g.items) > 0 {
		res.GainSetting = "its knobs as set"
	}
	for k, rw := range g.rows {
		if rw.figure == "rms" {
			res.Curves = append(res.Curves, CurveFit{Setting: g.items[rw.item].label(), RMSDB: res.Metrics.Figures[k],
				WorstDB: res.Metrics.Worst[k], OffsetDB: res.Metrics.Offset[k]})
		}
	}
	if !res.Feasible {
		var held []string
		for _, c := range res.Checks {
			if c.IdealMet {
				held = append(held, c.Name)
			}
		}
		for _, c := range res.Checks {
			if !c.IdealMet {
				res.Conflicts = append(res.Conflicts, Conflict{Target: c.Name, Key: c.Key, Unit: c.Unit, Wanted: c.Wanted,
					Nearest: c.Ideal, Found: c.IdealFound, Held: held})
			}
		}
		if len(res.Conflicts) > 0 {
			res.Priority = g.priority
			if res.Priority == nil {
				res.Priority = DefaultPriority
			}
		}
	}
	return res
}

// build writes vals into a copy of base and measures it.
func (r *run) build(base *networks.Design, g goal, vals []float64) (*networks.Design, Metrics) {
	e := newEvaluator(base.Clone(), g)
	e.vars = bind(r.vars, e.d)
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	if !m.CornerFound {
		m.CornerHz = 0
	}
	return e.d, m
}

// checks compares the metrics with the goal.
func checks(g goal, ideal, got *Metrics, tol Tolerance) []Check {
	if len(g.items) > 0 {
		return itemChecks(g, ideal, got, tol)
	}
	var cs []Check
	freq := func(name, key string, want, a float64, af bool, b float64, bf bool) {
		c := Check{Name: name, Key: key, Unit: "Hz", Wanted: want, Ideal: a, IdealFound: af, Achieved: b, Found: bf}
		if af {
			c.IdealError = a/want - 1
			c.IdealMet = math.Abs(math.Log(a/want)) <= math.Log1p(IdealTolerance.Freq)
		}
		if bf {
			c.Error = b/want - 1
			c.Met = math.Abs(math.Log(b/want)) <= math.Log1p(tol.Freq)
		}
		cs = append(cs, c)
	}
	level := func(name, key string, want, a float64, af bool, b float64, bf bool) {
		c := Check{Name: name, Key: key, Unit: "dB", Wanted: want, Ideal: a, IdealFound: af, Achieved: b, Found: bf}
		if af {
			c.IdealError = a - want
			c.IdealMet = math.Abs(c.IdealError) <= IdealTolerance.Level
		}
		if bf {
			c.Error = b - want
			c.Met = math.Abs(c.Error) <= tol.Level
		}
		cs = append(cs, c)
	}
	if g.scoop {
		freq("scoop frequency", "targets.scoop.hz", g.hz, ideal.Scoop.Hz, ideal.ScoopFound, got.Scoop.Hz, got.ScoopFound)
		level("scoop depth", "targets.scoop.depth_db", g.depth, ideal.Scoop.DepthDB, ideal.ScoopFound, got.Scoop.DepthDB, got.ScoopFound)
		level("scoop balance", "targets.scoop.balance_db", g.balance, ideal.Scoop.BalanceDB, ideal.ScoopFound, got.Scoop.BalanceDB, got.ScoopFound)
	}
	if g.corner {
		freq("corner", "targets.corner_hz", g.cornerHz, ideal.CornerHz, ideal.CornerFound, got.CornerHz, got.CornerFound)
	}
	return cs
}
