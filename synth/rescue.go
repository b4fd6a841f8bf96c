package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"

	"gonum.org/v1/gonum/optimize"

	"tonewright/networks"
)

// The rescue: before a synthesis says that the ideal parts cannot meet the
// targets, it tries many more starts. Each is pulled onto the targets by
// damped Gauss–Newton steps on the measured errors (Levenberg–Marquardt,
// the least change when there are more parts than targets; manifold.restore
// moving every part). The starts are the physics seeds of every pot value
// and leg ratio (freshSeeds, for a fresh synthesis), random starts over
// every part drawn log-uniformly over its range from a fixed stream, and
// the point the first search reached; none depends on Options.Seed, so the
// verdict is the same for every seed whenever the rescue decides it.
//
// When none meets the targets, the nearest figures keep the targets in
// priority order (Problem.Priority; by default the scoop frequency and the
// corner first, then the depth, then the balance): the best points are
// pulled again onto the targets weighted by rank, so that a lower-ranked
// target gives way before a higher one.
const (
	rescueRandom  = 24 // random starts over every part
	rescueSeeds   = 24 // physics seeds, the best by cost (at least one per pot)
	rescueSteps   = 20 // restoring steps per start
	rescueBest    = 4  // points pulled again by priority
	prioritySteps = 30
	priorityEvals = 400 // Nelder–Mead evaluations per point pulled by priority
	cmaEvals      = 600 // per CMA-ES run
	// rescueStream is the fixed PCG stream of the random starts.
	rescueStream = 0x72657363756521
)

// The targets a priority orders, by their --priority names.
const (
	TargetHz      = "hz"
	TargetDepth   = "depth"
	TargetBalance = "balance"
	TargetCorner  = "corner"
)

// DefaultPriority is the order in which targets that cannot all be met are
// kept: the scoop frequency and the corner first, then the depth, then the
// balance.
var DefaultPriority = [][]string{{TargetHz, TargetCorner}, {TargetDepth}, {TargetBalance}}

// ParsePriority reads a priority: groups separated by commas, the targets
// of a group joined by +, highest first, e.g. "hz+corner,depth,balance".
// Targets left out rank last, in the default order.
func ParsePriority(s string) ([][]string, error) {
	var out [][]string
	seen := map[string]bool{}
	for _, grp := range strings.Split(s, ",") {
		var g []string
		for _, name := range strings.Split(grp, "+") {
			name = strings.TrimSpace(name)
			switch name {
			case TargetHz, TargetDepth, TargetBalance, TargetCorner:
			default:
				return nil, fmt.Errorf("%q is not a target: use hz, depth, balance and corner, highest first, comma separated, + joining equals (e.g. hz+corner,depth,balance)", name)
			}
			if seen[name] {
				return nil, fmt.Errorf("%q is named twice", name)
			}
			seen[name] = true
			g = append(g, name)
		}
		out = append(out, g)
	}
	var rest []string
	for _, g := range DefaultPriority {
		for _, name := range g {
			if !seen[name] {
				rest = append(rest, name)
			}
		}
	}
	if len(rest) > 0 {
		out = append(out, rest)
	}
	return out, nil
}

// targetNames are the priority names of the goal's targets, in the order
// of evaluator.targetErrors.
func (g goal) targetNames() []string {
	if len(g.items) > 0 {
		return g.itemPriority()
	}
	var out []string
	if g.scoop {
		out = append(out, TargetHz, TargetDepth, TargetBalance)
	}
	if g.corner {
		out = append(out, TargetCorner)
	}
	return out
}

// ranks gives each of the goal's targets its priority rank (0 highest).
func (g goal) ranks() []int {
	pr := g.priority
	if pr == nil {
		pr = DefaultPriority
	}
	var out []int
	for _, name := range g.targetNames() {
		r := len(pr)
		for k, grp := range pr {
			if slices.Contains(grp, name) {
				r = k
			}
		}
		out = append(out, r)
	}
	return out
}

// rescued is the outcome of a rescue.
type rescued struct {
	x      []float64 // log values: on the targets, or the nearest by priority
	met    bool
	starts int
}

// rescue tries the starts described above from the evaluator's variables;
// x0 is the first search's point (log values) and seeds the physics seeds
// (values; nil when there are none).
func rescue(e *evaluator, x0 []float64, seeds [][]float64) rescued {
	nv := len(e.vars)
	all := make([]int, nv)
	for i := range all {
		all[i] = i
	}
	nt := len(e.goal.targetNames())
	out := rescued{x: slices.Clone(x0)}
	if nv < nt {
		// Fewer parts than targets: restoring cannot move onto them; the
		// priority pass alone.
		out.x = priorityPull(e, [][]float64{x0})
		out.starts = 1
		return out
	}
	mf := newManifold(e, all[:nt], nil)
	mf.moving(all)
	var starts [][]float64
	starts = append(starts, slices.Clone(x0))
	if len(seeds) == 0 && nv >= 2 {
		// No physics seed (a re-voicing of any network): a global
		// search first, CMA-ES with restarts of growing step, each
		// result a start for the pull.
		for k, step := range cmaSteps {
			x, _ := cmaES(e, x0, step, cmaEvals, uint64(k))
			starts = append(starts, x)
		}
	}
	// Physics seeds: the best by cost, and the best of each pot value.
	if len(seeds) > 0 {
		type sc struct {
			x []float64
			f float64
		}
		var ss []sc
		for _, s := range seeds {
			x := make([]float64, nv)
			for i, v := range s {
				x[i] = math.Log(v)
			}
			ss = append(ss, sc{x, e.f(x)})
		}
		slices.SortStableFunc(ss, func(a, b sc) int {
			switch {
			case a.f < b.f:
				return -1
			case a.f > b.f:
				return 1
			}
			return 0
		})
		pot := slices.IndexFunc(e.vars, func(v variable) bool { return v.kind == networks.PartPot })
		var pots []float64
		for _, s := range ss {
			if pot >= 0 && !slices.Contains(pots, s.x[pot]) {
				pots = append(pots, s.x[pot])
				starts = append(starts, s.x)
			}
		}
		for _, s := range ss {
			if len(starts) >= 1+rescueSeeds {
				break
			}
			if !slices.ContainsFunc(starts, func(x []float64) bool { return slices.Equal(x, s.x) }) {
				starts = append(starts, s.x)
			}
		}
	}
	rng := rand.New(rand.NewPCG(1, rescueStream))
	for k := 0; k < rescueRandom; k++ {
		x := make([]float64, nv)
		for i := range x {
			v := &e.vars[i]
			x[i] = v.lo + rng.Float64()*(v.hi-v.lo)
		}
		starts = append(starts, x)
	}
	type end struct {
		x  []float64
		ss float64
	}
	var ends []end
	for _, s := range starts {
		x := slices.Clone(s)
		mf.have = false
		_, ss, ok := mf.restore(x, rescueSteps)
		out.starts++
		if ok {
			out.x, out.met = x, true
			return out
		}
		ends = append(ends, end{x, ss})
	}
	slices.SortStableFunc(ends, func(a, b end) int {
		switch {
		case a.ss < b.ss:
			return -1
		case a.ss > b.ss:
			return 1
		}
		return 0
	})
	var best [][]float64
	best = append(best, x0)
	for _, en := range ends[:min(rescueBest, len(ends))] {
		best = append(best, en.x)
	}
	out.x = priorityPull(e, best)
	return out
}

// priorityPull pulls each of the points (log values) onto the targets
// weighted by priority rank, and returns the one that keeps the most
// ranks within IdealTolerance, highest first (ties: the smaller weighted
// error).
func priorityPull(e *evaluator, points [][]float64) []float64 {
	nv := len(e.vars)
	all := make([]int, nv)
	for i := range all {
		all[i] = i
	}
	ranks := e.goal.ranks()
	weights := priorityWeights(ranks)
	mf := newManifold(e, all[:min(nv, len(ranks))], nil)
	if nv < len(ranks) {
		// More targets than parts: size the buffers by the targets.
		mf = newManifold(e, make([]int, len(ranks)), nil)
	}
	mf.moving(all)
	mf.weights = weights
	mf.leastSquares = true
	var best []float64
	var bestKey []float64
	for _, p := range points {
		x := slices.Clone(p)
		mf.have = false
		mf.restore(x, prioritySteps)
		// Then Nelder–Mead on the weighted errors, which goes where
		// the steps stall against a part's range.
		e.weights = weights
		x, _ = nelderMead(e, x, 0.3, priorityEvals)
		x, _ = nelderMead(e, x, 0.05, priorityEvals/2)
		e.weights = nil
		k := priorityKey(e, x, ranks, weights)
		if best == nil || lessKey(k, bestKey) {
			best, bestKey = x, k
		}
	}
	mf.weights = nil
	return best
}

// priorityKey is how a point keeps the targets by priority: for each rank,
// highest first, 0 when every target of that rank is within
// IdealTolerance, else 1; then the weighted sum of squared errors.
func priorityKey(e *evaluator, x []float64, ranks []int, weights []float64) []float64 {
	e.setLog(x)
	var m Metrics
	e.measure(&m)
	var errs [maxTargets]float64
	n := e.targetErrors(&m, &errs)
	top := 0
	for _, r := range ranks {
		top = max(top, r)
	}
	key := make([]float64, top+2)
	ss := 0.0
	for i := 0; i < n; i++ {
		if math.Abs(errs[i]) > 1 || math.IsNaN(errs[i]) {
			key[ranks[i]] = 1
		}
		ss += sq(weights[i] * errs[i])
	}
	if math.IsInf(e.worst(&m), 1) {
		for i := range key {
			key[i] = 1
		}
		ss = math.Inf(1)
	}
	key[top+1] = ss
	return key
}

func lessKey(a, b []float64) bool {
	for i := range a {
		if a[i] != b[i] {
			return a[i] < b[i]
		}
	}
	return false
}

// priorityWeights weigh each target's error by its rank: a factor of 30
// per rank, so that a target gives way before one ranked above it.
func priorityWeights(ranks []int) []float64 {
	w := make([]float64, len(ranks))
	for i, r := range ranks {
		w[i] = math.Pow(30, float64(3-min(r, 3)))
	}
	return w
}

// cmaSteps are the initial step sizes (log units) of the CMA-ES runs.
var cmaSteps = []float64{0.5, 1.5}

// cmaES runs gonum/optimize's CMA-ES (the Cholesky variant) on the
// objective from x0 with the initial step size and evaluation budget, its
// samples drawn from a PCG seeded by run (not by Options.Seed, so that the
// verdict does not depend on it), one evaluation at a time. It returns the
// best point and its cost, never worse than x0's.
func cmaES(e *evaluator, x0 []float64, step float64, evals int, run uint64) ([]float64, float64) {
	f0 := e.f(x0)
	method := &optimize.CmaEsChol{InitStepSize: step, Src: rand.NewPCG(run, rescueStream)}
	settings := &optimize.Settings{FuncEvaluations: evals, Converger: &optimize.FunctionConverge{Absolute: 1e-7, Iterations: 40}}
	res, _ := optimize.Minimize(optimize.Problem{Func: e.f}, x0, settings, method)
	if res == nil || !(res.F < f0) {
		return slices.Clone(x0), f0
	}
	return res.X, res.F
}
