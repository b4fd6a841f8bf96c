package synth

import (
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/optimize"
)

// The continuous stage's budget, in objective evaluations: the seeds are
// all evaluated, the best few are refined by Nelder–Mead with a wide
// simplex, and the best result is polished with narrow restarts until they
// stop gaining.
const (
	perturbations = 8   // random starts around the best seeds
	refineStarts  = 3   // starts refined
	refineEvals   = 350 // per refinement
	polishEvals   = 250 // per polishing restart
	polishRounds  = 3
	tuneStarts    = 6 // seeds corrected by the tuner
)

// tuner returns corrected copies of a start (log values).
type tuner func(e *evaluator, x []float64) [][]float64

// continuous minimises the objective over the variables in log space from
// the seeds (values, one per variable) and returns the best log point and
// its cost. tune, if not nil, corrects the best few seeds first; rng draws
// the random starts.
func continuous(e *evaluator, seeds [][]float64, tune tuner, rng *rand.Rand) ([]float64, float64) {
	type start struct {
		x []float64
		f float64
	}
	var starts []start
	for _, s := range seeds {
		x := make([]float64, len(s))
		for i, v := range s {
			x[i] = math.Log(v)
		}
		starts = append(starts, start{x, e.f(x)})
	}
	byCost := func(a, b start) int {
		switch {
		case a.f < b.f:
			return -1
		case a.f > b.f:
			return 1
		}
		return 0
	}
	slices.SortStableFunc(starts, byCost)
	if tune != nil {
		for i := 0; i < min(tuneStarts, len(starts)); i++ {
			for _, x := range tune(e, starts[i].x) {
				starts = append(starts, start{x, e.f(x)})
			}
		}
		slices.SortStableFunc(starts, byCost)
	}
	// Random starts around the two best seeds: log-normal moves of each
	// value, clamped to the variables' ranges.
	n := len(starts)
	for i := 0; i < perturbations && n > 0; i++ {
		base := starts[i%min(2, n)].x
		x := make([]float64, len(base))
		for j := range x {
			v := &e.vars[j]
			x[j] = math.Min(math.Max(base[j]+0.7*rng.NormFloat64(), v.lo), v.hi)
		}
		starts = append(starts, start{x, e.f(x)})
	}
	slices.SortStableFunc(starts, byCost)
	// Refine the best starts that differ in impedance level (the
	// rounded log of the mean of the values), so that the tie-break can
	// choose between families of solutions, not only within one.
	best := start{f: math.Inf(1)}
	var levels []float64
	for i := 0; i < len(starts) && len(levels) < refineStarts; i++ {
		lv := 0.0
		for _, xi := range starts[i].x {
			lv += xi
		}
		lv = math.Round(lv / float64(len(starts[i].x)) / 0.5)
		if slices.Contains(levels, lv) {
			continue
		}
		levels = append(levels, lv)
		x, f := nelderMead(e, starts[i].x, 0.25, refineEvals)
		if f < best.f {
			best = start{x, f}
		}
	}
	for r := 0; r < polishRounds; r++ {
		x, f := nelderMead(e, best.x, 0.05, polishEvals)
		gain := best.f - f
		if f < best.f {
			best = start{x, f}
		}
		if !(gain > 1e-6) {
			break
		}
	}
	return best.x, best.f
}

// nelderMead runs gonum/optimize's Nelder–Mead from x0 with an initial
// simplex of the given size (log units) and evaluation budget, returning the
// best point and its cost (never worse than x0's). For more than one
// variable it uses the dimension-adaptive coefficients of Gao and Han
// (2012): reflection 1, expansion 1 + 2/n, contraction 0.75 − 1/(2n),
// shrink 1 − 1/n, which keep the simplex from collapsing in the seven or
// more dimensions of a tone section. One evaluation at a time, so the
// result does not depend on scheduling.
func nelderMead(e *evaluator, x0 []float64, size float64, evals int) ([]float64, float64) {
	return minimize(e.f, x0, e.f(x0), size, evals)
}

// minimize is nelderMead on any objective f, whose value at x0 is f0.
func minimize(f func([]float64) float64, x0 []float64, f0, size float64, evals int) ([]float64, float64) {
	method := &optimize.NelderMead{SimplexSize: size}
	if n := float64(len(x0)); n > 1 {
		method.Reflection, method.Expansion = 1, 1+2/n
		method.Contraction, method.Shrink = 0.75-1/(2*n), 1-1/n
	}
	settings := &optimize.Settings{
		FuncEvaluations: evals,
		Converger:       &optimize.FunctionConverge{Absolute: 1e-7, Iterations: 8 * len(x0)},
	}
	res, err := optimize.Minimize(optimize.Problem{Func: f}, x0, settings, method)
	if err != nil || res == nil || !(res.F < f0) {
		return slices.Clone(x0), f0
	}
	return res.X, res.F
}

// tuneBalance corrects a fresh seed's balance with the true metric: it
// moves the low-pass leg's R (index 0), and separately the high-pass leg's
// R (index 3), by bisection in log R until the balance measured at the
// target frequency matches the target. The closed-form seeds ignore the
// filter sections, which at the centre often set the upper shoulder.
func tuneBalance(e *evaluator, x []float64) [][]float64 {
	if !e.goal.scoop {
		return nil
	}
	var out [][]float64
	for _, c := range []struct {
		i      int
		rising bool // the balance rises with this R
	}{{0, true}, {3, false}} {
		y := slices.Clone(x)
		lo, hi := e.vars[c.i].lo, e.vars[c.i].hi
		for it := 0; it < 14; it++ {
			y[c.i] = (lo + hi) / 2
			e.setLog(y)
			var m Metrics
			e.measure(&m)
			if (m.Scoop.BalanceDB < e.goal.balance) == c.rising {
				lo = y[c.i]
			} else {
				hi = y[c.i]
			}
		}
		y[c.i] = (lo + hi) / 2
		out = append(out, y)
	}
	return out
}
