package synth

import (
	"math"
	"math/rand/v2"
	"slices"

	"tonewright/eseries"
	"tonewright/networks"
)

// seedStream is the second word of the PCG state, fixed so that
// Options.Seed alone picks the random starts.
const seedStream = 0x746f6e6577726974

// Solve synthesises the design. Errors are about the problem itself (a
// missing target, an unknown part name, an empty part set) and are
// *networks.FieldError values naming the key; targets that cannot be met
// are not errors but a Result with Met false.
func Solve(p *Problem, opt Options) (*Result, error) {
	s, err := p.Parts.resolve()
	if err != nil {
		return nil, p.place(err)
	}
	if err := p.Limits.apply(s); err != nil {
		return nil, p.place(err)
	}
	base, err := p.design()
	if err != nil {
		return nil, p.place(err)
	}
	g, err := p.goal(base)
	if err != nil {
		return nil, p.place(err)
	}
	g.prefer = opt.Prefer
	if p.Prefer != nil { // the targets file's choice (or the command's)
		g.prefer = *p.Prefer
	}
	g.effort = opt.Effort
	g.maxOut, g.maxLoss = p.Limits.MaxOutputImpedance, p.Limits.MaxLossDB
	g.priority = p.Priority
	vars, err := p.variables(base, s)
	if err != nil {
		return nil, p.place(err)
	}
	tol := opt.Tolerance
	if tol == (Tolerance{}) {
		tol = PartsTolerance
	}
	rng := rand.New(rand.NewPCG(opt.Seed, seedStream))

	pr := &progress{f: opt.Progress}
	var best *run
	limited := p.From != nil && p.MaxChanges > 0 && p.MaxChanges < len(vars)
	// withChanges re-voices with at most k parts changed: every subset of
	// k parts when there are few, else greedily.
	withChanges := func(k int) *run {
		subsets := choose(len(vars), k)
		if subsets == nil {
			pr.total += greedyRuns(len(vars), k) * runEstimate(k, false)
			return greedy(base, g, vars, k, s, rng, pr, tol)
		}
		pr.total += len(subsets) * runEstimate(k, false)
		var best *run
		for _, sub := range subsets {
			vs := make([]variable, len(sub))
			for j, i := range sub {
				vs[j] = vars[i]
			}
			// Ties go to the earlier subset, so the order of the parts
			// decides, never the scheduling.
			if r := solveRun(base, g, vs, false, s, rng, pr, tol, nil); r.better(best) {
				best = r
			}
		}
		return best
	}
	switch {
	case !limited && p.From == nil:
		pr.total = runEstimate(len(vars), true)
		best = solveRun(base, g, vars, true, s, rng, pr, tol, nil)
	case !limited:
		pr.total = runEstimate(len(vars), false) + len(vars)*runEstimate(1, false)
		best = unlimited(base, g, vars, s, rng, pr, tol, nil)
	default:
		best = withChanges(p.MaxChanges)
	}
	if p.From != nil && !g.hasCurve() {
		// (A curve fit wants the least error, not the fewest swaps
		// within tolerance.)
		best = prune(base, g, best, tol)
	}
	// A limited re-voicing that misses: would the design meet the targets
	// without the limit? Then the limit is the cause, not the network.
	var free *run
	if limited && !best.met {
		pr.total += runEstimate(len(vars), false)
		free = prune(base, g, unlimited(base, g, vars, s, rng, pr, tol, []*run{best}), tol)
		// The swaps it lists should be the fewest that meet the
		// targets: the pruned unlimited search's are not always, so
		// fewer are tried while they meet.
		for k := free.swaps() - 1; free.met && k > p.MaxChanges; k-- {
			r := prune(base, g, withChanges(k), tol)
			if !r.met || r.swaps() >= free.swaps() {
				break
			}
			free = r
		}
	}
	// A re-voicing whose free parts miss: would freeing every part meet
	// the targets? Then --free is the cause, and that search gives the
	// nearest figures with the changes they need.
	var freed *run
	var freedP *Problem
	if p.From != nil && p.Free != nil && !best.met && (free == nil || !free.met) {
		q := *p
		q.Free = nil
		if all, err := q.variables(base, s); err == nil && len(all) > len(vars) {
			pr.total += runEstimate(len(all), false)
			freed = prune(base, g, unlimited(base, g, all, s, rng, pr, tol, nil), tol)
			freedP = &q
		}
	}
	res := best.result(p, base, g, tol, 0)
	if free != nil {
		res.Unlimited = free.result(p, base, g, tol, 0)
	}
	if freed != nil {
		res.Freed = freed.result(freedP, base, g, tol, 0)
	}
	// Ideal values that sit at a range limit: would wider ranges meet the
	// targets? Then the range is the cause.
	res.AtLimit = atLimits(best, s)
	if !res.Feasible && len(res.AtLimit) > 0 {
		ws := s.widened(rangeWidening)
		if wv, err := p.variables(base, ws); err == nil {
			pr.total += runEstimate(len(wv), p.From == nil)
			var wr *run
			if p.From == nil {
				wr = solveRun(base, g, wv, true, ws, rng, pr, tol, nil)
			} else {
				wr = unlimited(base, g, wv, ws, rng, pr, tol, nil)
			}
			res.Widened = wr.result(p, base, g, tol, 0)
		}
	}
	pr.done()
	res.Evaluations = pr.evals
	if limited {
		res.MaxChanges = p.MaxChanges
	}
	if st := p.Parts.Stock; st != nil {
		res.StockFile = st.File
		if st.File == "" {
			res.StockFile = "stock"
		}
	}
	res.Cause = cause(res)
	return res, nil
}

// The causes of a miss (Result.Cause).
const (
	// CauseNetwork: even the ideal (continuous) values miss; the targets
	// ask for more than the network, band and surroundings can give.
	CauseNetwork = "network"
	// CauseParts: the ideal values meet the targets, the allowed values
	// (the series, list or stock) cannot get close enough.
	CauseParts = "parts"
	// CauseMaxChanges: the targets are not reachable within
	// Problem.MaxChanges; without the limit the ideal values meet them
	// (Result.Unlimited is that search).
	CauseMaxChanges = "max-changes"
	// CauseFree: the parts --free leaves free cannot reach the targets;
	// with every part free they can (Result.Freed is that search).
	CauseFree = "free"
	// CauseRange: the ideal values miss with a part at a range limit
	// (Result.AtLimit); with every range widened a hundredfold they
	// meet the targets (Result.Widened is that search).
	CauseRange = "range"
	// CauseLimit: the chosen parts meet the targets only by breaking a
	// limit (Result.Limits says which).
	CauseLimit = "limit"
)

// cause says why res misses, "" when it does not.
func cause(res *Result) string {
	helps := func(r *Result) bool { return r != nil && (r.Met || r.Feasible && !res.Feasible) }
	switch {
	case res.Met:
		return ""
	case helps(res.Unlimited):
		return CauseMaxChanges
	case helps(res.Freed):
		return CauseFree
	case res.Feasible && !res.LimitsMet():
		return CauseLimit
	case res.Widened != nil && res.Widened.Feasible:
		return CauseRange
	case res.Feasible:
		return CauseParts
	}
	return CauseNetwork
}

// rangeWidening is the factor by which the check of a binding range
// widens every range, either way.
const rangeWidening = 100

// widened returns the sets with every continuous range widened by the
// factor either way (the series are not limited by a range there; a list
// or a stock keeps its members).
func (s *sets) widened(k float64) *sets {
	w := *s
	w.resRange = [2]float64{s.resRange[0] / k, s.resRange[1] * k}
	w.capRange = [2]float64{s.capRange[0] / k, s.capRange[1] * k}
	w.potRange = [2]float64{s.potRange[0] / k, s.potRange[1] * k}
	return &w
}

// atLimits lists the free parts whose ideal value sits at a limit of its
// continuous range.
func atLimits(r *run, s *sets) []AtLimit {
	key := map[networks.PartKind]string{networks.PartResistor: "parts.resistor_range",
		networks.PartCapacitor: "parts.capacitor_range", networks.PartPot: "parts.pots"}
	var out []AtLimit
	for i, v := range r.vars {
		x := math.Log(r.ideal[i])
		_, _, rg := s.of(v.kind)
		// The range's own figures, not their logs' round trip.
		exact := func(lg float64) float64 {
			for _, b := range rg {
				if math.Abs(math.Log(b)-lg) < 1e-9 {
					return b
				}
			}
			return math.Exp(lg)
		}
		switch {
		case !(v.lo < v.hi):
			out = append(out, AtLimit{Kind: v.kind, Part: v.name, Value: exact(v.lo), Limit: "pinned", Key: key[v.kind]})
		case x <= v.lo+1e-3:
			out = append(out, AtLimit{Kind: v.kind, Part: v.name, Value: exact(v.lo), Limit: "low", Key: key[v.kind]})
		case x >= v.hi-1e-3:
			out = append(out, AtLimit{Kind: v.kind, Part: v.name, Value: exact(v.hi), Limit: "high", Key: key[v.kind]})
		}
	}
	return out
}

// unlimited searches a re-voicing over every free part at once. A search
// over many parts from the one start of the design as it is can settle
// where a search over fewer would not (moving one capacitor of two may
// meet what moving both from the same start misses), so it also searches
// each part alone, unless given runs to start from (from, e.g. a limited
// search), and starts the joint search from the best of those too; it
// keeps the better of the joint result and that run. So the search without
// a limit is never worse than the limited searches of one part it
// contains.
func unlimited(base *networks.Design, g goal, vars []variable, s *sets, rng *rand.Rand, pr *progress, tol Tolerance, from []*run) *run {
	if from == nil && len(vars) > 1 {
		for i := range vars {
			from = append(from, solveRun(base, g, vars[i:i+1], false, s, rng, pr, tol, nil))
		}
	}
	var bestFrom *run
	for _, r := range from {
		if r.better(bestFrom) {
			bestFrom = r
		}
	}
	var extra [][]float64
	if bestFrom != nil {
		bestFrom = bestFrom.embed(base, vars)
		extra = [][]float64{bestFrom.ideal, bestFrom.chosen}
	}
	r := solveRun(base, g, vars, false, s, rng, pr, tol, extra)
	if bestFrom != nil && bestFrom.better(r) {
		return bestFrom
	}
	return r
}

// embed returns the run r, made over some of vars, as a run over all of
// them: the others at the base design's values.
func (r *run) embed(base *networks.Design, vars []variable) *run {
	out := &run{vars: vars, cost: r.cost, misses: r.misses, met: r.met,
		ideal: make([]float64, len(vars)), chosen: make([]float64, len(vars))}
	for i, v := range vars {
		out.ideal[i] = *base.PartRef(v.parts[0])
		out.chosen[i] = out.ideal[i]
		for j, w := range r.vars {
			if w.name == v.name {
				out.ideal[i], out.chosen[i] = r.ideal[j], r.chosen[j]
			}
		}
	}
	return out
}

// better reports whether r is a better result than q (nil: no result):
// the one that misses fewer targets (beyond the tolerance), then the one
// of lower cost; a tie keeps q.
// swaps counts the parts whose chosen value differs from the original.
func (r *run) swaps() int {
	n := 0
	for i, v := range r.vars {
		if v.original > 0 && !same(r.chosen[i], v.original) {
			n++
		}
	}
	return n
}

func (r *run) better(q *run) bool {
	if q == nil {
		return true
	}
	if r.misses != q.misses {
		return r.misses < q.misses
	}
	return r.cost < q.cost
}

// maxSubsets bounds the exhaustive search over which parts a re-voicing
// changes; beyond it the parts are chosen greedily, one at a time.
const maxSubsets = 64

// greedyRuns is the number of runs greedy makes choosing k of n parts.
func greedyRuns(n, k int) int {
	runs := 0
	for i := 0; i < k; i++ {
		runs += n - i
	}
	return runs
}

// choose returns the index sets of size k out of n, in lexical order, or
// nil when there are more than maxSubsets of them.
func choose(n, k int) [][]int {
	count := 1.0
	for i := 0; i < k; i++ {
		count = count * float64(n-i) / float64(i+1)
	}
	if count > maxSubsets {
		return nil
	}
	var out [][]int
	idx := make([]int, k)
	for i := range idx {
		idx[i] = i
	}
	for {
		out = append(out, append([]int(nil), idx...))
		i := k - 1
		for i >= 0 && idx[i] == n-k+i {
			i--
		}
		if i < 0 {
			return out
		}
		idx[i]++
		for j := i + 1; j < k; j++ {
			idx[j] = idx[j-1] + 1
		}
	}
}

// run is one search over a set of variables.
type run struct {
	vars   []variable
	ideal  []float64 // continuous optimum
	chosen []float64 // allowed values
	cost   float64   // of the chosen values
	misses int       // targets the chosen values miss (beyond the tolerance)
	met    bool      // misses == 0
	starts int       // starts of the rescue; 0 when the first search met the targets
}

// solveRun searches one set of variables: the continuous stage from the
// seeds, for a fresh synthesis the lean phase from its result, then the
// discrete stage.
// A re-voicing starts from the design's values and from extra (values, one
// per variable), and the discrete stage also tries extra's values that are
// allowed ones; tol decides whether the result meets the targets.
func solveRun(base *networks.Design, g goal, vars []variable, fresh bool, s *sets, rng *rand.Rand, pr *progress, tol Tolerance, extra [][]float64) *run {
	e := newEvaluator(base.Clone(), g)
	e.vars = bind(vars, e.d)
	e.progress = pr.tick
	var seeds [][]float64
	var tune tuner
	if fresh {
		seeds, tune = freshSeeds(e.d, g, s, sectionRatios), tuneBalance
	} else {
		seeds = append([][]float64{e.values(nil)}, extra...)
	}
	x, _ := continuous(e, seeds, tune, rng)
	if fresh && g.prefer == LeastLoss {
		// The second phase: the least loss among the designs that meet
		// the targets. (For the closest design the walk starts from the
		// first phase's point: the least-loss designs crowd the ends of
		// the part ranges, where few allowed values lie near.)
		x = lean(e, x, logValues(freshSeeds(e.d, g, s, leanSectionRatios)))
	}
	// Before a verdict that the ideal parts miss, many more starts.
	starts := 0
	if !onTargets(e, x) {
		var rs [][]float64
		if fresh {
			rs = freshSeeds(e.d, g, s, sectionRatios)
		}
		rc := rescue(e, x, rs)
		starts = rc.starts
		x = rc.x
		if rc.met && fresh {
			x = lean(e, x, nil)
		}
		if !rc.met {
			// The parts of allowed values keep the same priority, on
			// their misses beyond the tolerance.
			e.weights = priorityWeights(g.ranks())
			if fresh {
				// (A re-voicing's runs of single parts are starts
				// for the joint one, which the pruning pass trims;
				// they keep the plain weights.)
				e.slack, e.ranks = slackOf(g, tol), g.ranks()
			}
		}
	}
	// Allowed values meet the tolerance first (with a priority, rank by
	// rank).
	e.tolSlack = slackOf(g, tol)
	e.setLog(x)
	ideal := e.values(nil)
	var chosen []float64
	var cost float64
	walked := false
	if fresh {
		// Walk the allowed values along the exact solutions.
		if vals, ok := walk(e, ideal, tol, g.prefer, g.effort); ok {
			chosen, cost, walked = vals, e.at(vals), true
		}
	}
	if !walked {
		chosen, cost = discrete(e, ideal)
	}
	// A second try at the snap, when the joint one misses the tolerance
	// but the ideal values meet it (else no snap will); under a priority,
	// when it misses a target of a rank the ideal values keep.
	if !walked {
		retry := !meets(e, chosen, PartsTolerance) && meets(e, ideal, PartsTolerance)
		var gc grade
		if e.slack != nil {
			gi := e.grade(ideal)
			gc = e.grade(chosen)
			retry = gi.keepsMore(&gc)
		}
		if retry {
			c2, f2 := snapSequential(e, ideal)
			if e.slack != nil {
				if g2 := e.grade(c2); g2.better(&gc, 0) {
					chosen, cost = c2, f2
				}
			} else if f2 < cost {
				chosen, cost = c2, f2
			}
			e.setValues(chosen)
		}
	}
	miss := misses(e, chosen, tol)
	for _, x := range extra {
		if !allowed(e, x) {
			continue
		}
		f := e.at(x)
		if m := misses(e, x, tol); m < miss || m == miss && f < cost {
			chosen, cost, miss = slices.Clone(x), f, m
		}
	}
	pr.evals += e.evals
	pr.cur = 0
	return &run{vars: vars, ideal: ideal, chosen: chosen, cost: cost, misses: miss, met: miss == 0, starts: starts}
}

// onTargets reports whether the variables at x (log values) meet every
// target within IdealTolerance.
func onTargets(e *evaluator, x []float64) bool {
	e.setLog(x)
	var m Metrics
	e.measure(&m)
	return e.worst(&m) <= 1
}

// allowed reports whether every value of vals is one the variable may
// take: a member of its set or its original value.
func allowed(e *evaluator, vals []float64) bool {
	for i := range e.vars {
		v := &e.vars[i]
		if v.original > 0 && same(vals[i], v.original) {
			continue
		}
		if n, err := eseries.Nearest(v.set, vals[i]); err != nil || !same(n, vals[i]) {
			return false
		}
	}
	return true
}

// greedy chooses up to k parts to change one at a time: each step frees
// the part whose addition gives the lowest cost.
func greedy(base *networks.Design, g goal, vars []variable, k int, s *sets, rng *rand.Rand, pr *progress, tol Tolerance) *run {
	var picked []int
	var best *run
	for len(picked) < k {
		var stepBest *run
		stepPick := -1
		for i := range vars {
			if containsInt(picked, i) {
				continue
			}
			var vs []variable
			for _, j := range append(append([]int(nil), picked...), i) {
				vs = append(vs, vars[j])
			}
			r := solveRun(base, g, vs, false, s, rng, pr, tol, nil)
			if r.better(stepBest) {
				stepBest, stepPick = r, i
			}
		}
		// Each step re-optimises every part picked so far together.
		picked = append(picked, stepPick)
		best = stepBest
	}
	return best
}

func containsInt(xs []int, x int) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// freshSeeds are the starting points of a fresh synthesis, from the
// physics: the ideal blend network's time constants (IdealNotch) corrected
// for the source impedance and the loading of the legs by the pot; for each
// pot value, one leg's resistance at a few ratios to the pot and the other
// leg's solved for the wanted balance from the legs' dividers at the
// centre; and the filter sections' time constant from the ladder's corner
// (LadderTau) with their R at each of the ratios to the blend's output
// resistance (R₂ in parallel with the pot). Values outside their ranges
// are clamped.
func freshSeeds(d *networks.Design, g goal, s *sets, ratios []float64) [][]float64 {
	zs := d.Source.Impedance
	tau1, tau2, err := IdealNotch(g.hz, g.depth)
	if err != nil {
		tau1, tau2, _ = IdealNotch(1000, -6)
	}
	clampR := func(v float64) float64 { return clamp(v, s.resRange) }
	clampC := func(v float64) float64 { return clamp(v, s.capRange) }
	par := func(a, b float64) float64 { return a * b / (a + b) }
	// The shoulders at the centre, ignoring the filters: the upper one is
	// the high-pass leg and pot against the source, the lower one the
	// low-pass leg's divider into the pot and R₂ (the wiper halfway).
	balance := func(r1, r2, pot float64) float64 {
		hi := 0.5 * par(r2, pot) / (zs + par(r2, pot))
		lo := (pot/2 + r2) / (zs + r1 + pot + r2)
		return 20 * math.Log10(hi/lo)
	}
	// solve finds the leg resistance in range giving the wanted balance
	// (bisection in log R; balance falls as R₂ falls and rises with R₁).
	solve := func(f func(r float64) float64, rising bool) float64 {
		lo, hi := math.Log(s.resRange[0]), math.Log(s.resRange[1])
		for i := 0; i < 40; i++ {
			mid := (lo + hi) / 2
			if (f(math.Exp(mid)) < g.balance) == rising {
				lo = mid
			} else {
				hi = mid
			}
		}
		return math.Exp((lo + hi) / 2)
	}
	potVals := s.pots.(interface{ Values() []float64 }).Values()
	var tauF float64
	n := len(d.Filters)
	if n > 0 && g.corner {
		tauF = LadderTau(g.cornerHz, n)
	}
	var seeds [][]float64
	for _, pot := range potVals {
		for _, q := range []float64{10, 3} {
			leg := clampR(pot / q)
			r1B := solve(func(r float64) float64 { return balance(r, leg, pot) }, true)
			r2B := solve(func(r float64) float64 { return balance(leg, r, pot) }, false)
			for _, legs := range [][2]float64{{r1B, leg}, {leg, r2B}} {
				r1, r2 := legs[0], legs[1]
				c1 := clampC(tau1 / par(r1+zs, pot+r2))
				c2 := clampC(tau2 / (zs + par(r2, pot)))
				v := []float64{r1, c1, c2, r2, pot}
				if n == 0 {
					seeds = append(seeds, v)
					continue
				}
				for _, k := range ratios {
					rf := clampR(k * par(r2, pot))
					cf := clampC(tauF / rf)
					if tauF == 0 {
						cf = s.capRange[0]
					}
					seeds = append(seeds, append(append([]float64(nil), v...), rf, cf))
				}
			}
		}
	}
	return seeds
}

// The ratios of the filter sections' R to the blend's output resistance in
// the seeds: of the continuous stage, a spread; of the lean phase, one,
// high enough that the sections barely load the blend (the lean phase
// moves it anyway). Restoring every seed to the targets costs a few dozen
// evaluations, so the lean phase takes a quarter of them.
var (
	sectionRatios     = []float64{10, 3, 1, 0.3}
	leanSectionRatios = []float64{10}
)

func clamp(v float64, r [2]float64) float64 { return math.Min(math.Max(v, r[0]), r[1]) }

// runEstimate is the usual number of evaluations of one run, for progress;
// fresh adds the lean phase.
func runEstimate(nvars int, fresh bool) int {
	n := 120 + perturbations + refineStarts*refineEvals + 2*polishEvals + (1<<min(nvars, 9))*2
	if fresh {
		n += leanEstimate
	}
	return n
}

// progress forwards evaluation counts to Options.Progress.
type progress struct {
	f     func(done, total int)
	evals int // finished runs
	cur   int // in the current run, by ticks
	total int
}

func (p *progress) tick() {
	p.cur += 64
	if p.f != nil {
		done := p.evals + p.cur
		if done > p.total {
			p.total = done + done/10
		}
		p.f(done, p.total)
	}
}

func (p *progress) done() {
	if p.f != nil {
		p.f(p.total, p.total)
	}
}

// meets reports whether the variables at vals meet every target within tol.
func meets(e *evaluator, vals []float64, tol Tolerance) bool {
	return misses(e, vals, tol) == 0
}

// misses counts the targets the variables at vals miss by more than tol.
func misses(e *evaluator, vals []float64, tol Tolerance) int {
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	n := 0
	for _, c := range checks(e.goal, &m, &m, tol) {
		if !c.Met {
			n++
		}
	}
	if e.overLimits(&m) > 0 {
		n++
	}
	return n
}

// apply checks the limits and raises the capacitor range to the smallest
// capacitor allowed.
func (l *Limits) apply(s *sets) error {
	if !(l.MaxOutputImpedance >= 0) || math.IsInf(l.MaxOutputImpedance, 0) {
		return fieldErrorf("limits.max_output_impedance", "%v Ω: give a positive impedance, such as 10k, or leave it out", l.MaxOutputImpedance)
	}
	if !(l.MaxLossDB >= 0) || math.IsInf(l.MaxLossDB, 0) {
		return fieldErrorf("limits.max_loss_db", "%v dB: give the largest loss at 1 kHz as a positive number of dB, such as 20, or leave it out", l.MaxLossDB)
	}
	minC := DefaultMinCapacitor
	if l.MinCapacitor != nil {
		minC = *l.MinCapacitor
		if !(minC > 0) || math.IsInf(minC, 0) {
			return fieldErrorf("limits.min_capacitor", "%v F: give a positive capacitance, such as 100p", minC)
		}
	}
	if minC > s.capRange[1] {
		return fieldErrorf("limits.min_capacitor", "%sF is above the capacitor range's top (%sF): lower the limit or raise parts.capacitor_range",
			eseries.Format(minC), eseries.Format(s.capRange[1]))
	}
	if minC > s.capRange[0] {
		s.capRange[0] = minC
		if _, err := eseries.SnapTo(eseries.Range(s.caps, minC, s.capRange[1]), minC); err != nil {
			return fieldErrorf("limits.min_capacitor", "no capacitor of %s lies between %sF and %sF", s.capName, eseries.Format(minC), eseries.Format(s.capRange[1]))
		}
		s.caps = eseries.Range(s.caps, minC, s.capRange[1])
	}
	return nil
}

// slackOf is each target's tolerance tol in units of IdealTolerance, in
// the order of evaluator.targetErrors.
func slackOf(g goal, tol Tolerance) []float64 {
	var out []float64
	freq := func(f bool) {
		if f {
			out = append(out, math.Log1p(tol.Freq)/IdealTolerance.Freq)
		} else {
			out = append(out, tol.Level/IdealTolerance.Level)
		}
	}
	if len(g.rows) > 0 {
		for _, r := range g.rows {
			freq(r.unit == "Hz")
		}
		return out
	}
	if g.scoop {
		freq(true)
		freq(false)
		freq(false)
	}
	if g.corner {
		freq(true)
	}
	return out
}
