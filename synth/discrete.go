package synth

import (
	"math"
	"slices"

	"tonewright/eseries"
	"tonewright/networks"
)

// maxCombinations bounds the joint enumeration of the discrete stage; with
// more combinations than this it starts from the nearest members instead
// and relies on the local moves.
const maxCombinations = 512

// discrete chooses allowed values for the variables near their ideal
// values jointly: it evaluates every combination of the members just below
// and just above each ideal value (and, when re-voicing, the part's
// original value), keeps the best, then makes single-part moves to the next
// member up or down (or back to the original) while one improves the cost.
// It returns the chosen values and their cost.
func discrete(e *evaluator, ideal []float64) ([]float64, float64) {
	n := len(e.vars)
	cands := make([][]float64, n)
	total := 1
	for i := range e.vars {
		cands[i] = candidates(nil, &e.vars[i], ideal[i])
		total *= len(cands[i])
		if total > maxCombinations {
			total = maxCombinations + 1
		}
	}
	cur := make([]float64, n)
	best := make([]float64, n)
	bestG := grade{cost: math.Inf(1)}
	for i := range bestG.miss {
		bestG.miss[i] = math.MaxInt
	}
	if total <= maxCombinations {
		idx := make([]int, n)
		for {
			for i := range cur {
				cur[i] = cands[i][idx[i]]
			}
			if g := e.grade(cur); g.better(&bestG, 0) {
				bestG = g
				copy(best, cur)
			}
			k := 0
			for k < n {
				idx[k]++
				if idx[k] < len(cands[k]) {
					break
				}
				idx[k] = 0
				k++
			}
			if k == n {
				break
			}
		}
	} else {
		for i := range best {
			best[i] = nearest(&e.vars[i], ideal[i])
		}
	}
	return discreteFrom(e, best)
}

// discreteFrom makes local moves from the allowed values best: the best
// single change, repeated while one improves; when none does, the best
// change of two parts at once. It returns the values and their cost.
//
// Under a priority (the ideal values miss) a change is better when it
// misses fewer targets of the highest rank where the misses differ, then
// when it lowers the cost (see grade).
func discreteFrom(e *evaluator, best []float64) ([]float64, float64) {
	n := len(e.vars)
	cur := make([]float64, n)
	bestG := e.grade(best)
	var m1, m2 [3]float64
	for iter := 0; iter < 200; iter++ {
		moveI, moveV, moveG := -1, 0.0, bestG
		for i := range e.vars {
			for _, v := range moves(&e.vars[i], best[i], m1[:0]) {
				copy(cur, best)
				cur[i] = v
				if g := e.grade(cur); g.better(&moveG, 1e-12) {
					moveI, moveV, moveG = i, v, g
				}
			}
		}
		if moveI >= 0 {
			best[moveI], bestG = moveV, moveG
			continue
		}
		pairI, pairJ, vi, vj, pairG := -1, -1, 0.0, 0.0, bestG
		for i := range e.vars {
			for j := i + 1; j < n; j++ {
				for _, a := range moves(&e.vars[i], best[i], m1[:0]) {
					for _, b := range moves(&e.vars[j], best[j], m2[:0]) {
						copy(cur, best)
						cur[i], cur[j] = a, b
						if g := e.grade(cur); g.better(&pairG, 1e-12) {
							pairI, pairJ, vi, vj, pairG = i, j, a, b, g
						}
					}
				}
			}
		}
		if pairI < 0 {
			break
		}
		best[pairI], best[pairJ], bestG = vi, vj, pairG
	}
	e.setValues(best)
	return best, bestG.cost
}

// candidates are the allowed values next to the ideal value x: the members
// just below and just above it and, when re-voicing, the original value;
// written over dst, which may be nil.
func candidates(dst []float64, v *variable, x float64) []float64 {
	out := dst[:0]
	s, err := eseries.SnapTo(v.set, x)
	if err == nil {
		if s.HasBelow {
			out = append(out, s.Below)
		}
		if s.HasAbove {
			out = append(out, s.Above)
		}
	}
	if v.original > 0 {
		out = append(out, v.original)
	}
	slices.Sort(out)
	return slices.CompactFunc(out, same)
}

func same(a, b float64) bool { return math.Abs(a-b) <= eseries.RelTol*math.Abs(b) }

// nearest is the allowed value nearest to x on a log scale.
func nearest(v *variable, x float64) float64 {
	if n, err := eseries.Nearest(v.set, x); err == nil {
		return n
	}
	return v.original
}

// moves appends to dst the values a local move may give a variable now at
// x: the next member of its set up and down and, when re-voicing, its
// original value.
func moves(v *variable, x float64, dst []float64) []float64 {
	if p, ok := eseries.Prev(v.set, x); ok {
		dst = append(dst, p)
	}
	if n, ok := eseries.Next(v.set, x); ok {
		dst = append(dst, n)
	}
	if v.original > 0 && !same(x, v.original) {
		dst = append(dst, v.original)
	}
	return dst
}

// snapSequential is the discrete stage's second try, used when the joint
// snap misses the tolerance: it fixes one variable at a time, coarsest set
// first (the pot, then capacitors, then resistors), at whichever of its two
// neighbouring members lets the variables not yet fixed, re-optimised
// continuously, reach the lower cost; then it makes the local moves of
// discrete from there. It returns the chosen values and their cost.
func snapSequential(e *evaluator, ideal []float64) ([]float64, float64) {
	n := len(e.vars)
	order := make([]int, n)
	for i := range order {
		order[i] = i
	}
	rank := func(k int) int {
		switch e.vars[k].kind {
		case networks.PartPot:
			return 0
		case networks.PartCapacitor:
			return 1
		}
		return 2
	}
	slices.SortStableFunc(order, func(a, b int) int { return rank(a) - rank(b) })
	vals := slices.Clone(ideal)
	all := e.vars
	fixed := make([]bool, n)
	for _, k := range order {
		bestF, bestV := math.Inf(1), vals[k]
		var bestRest []float64
		for _, c := range candidates(nil, &all[k], vals[k]) {
			trial := slices.Clone(vals)
			trial[k] = c
			fixed[k] = true
			f, rest := reoptimize(e, all, fixed, trial)
			fixed[k] = false
			if f < bestF {
				bestF, bestV, bestRest = f, c, rest
			}
		}
		fixed[k] = true
		if bestRest != nil {
			vals = bestRest
		}
		vals[k] = bestV
	}
	e.vars = all
	return discreteFrom(e, vals)
}

// reoptimize minimises the cost over the variables not fixed, from vals,
// with a short Nelder–Mead run; it returns the cost and the values.
func reoptimize(e *evaluator, all []variable, fixed []bool, vals []float64) (float64, []float64) {
	e.vars = all
	e.setValues(vals)
	var free []variable
	var x []float64
	for i := range all {
		if !fixed[i] {
			free = append(free, all[i])
			x = append(x, math.Log(vals[i]))
		}
	}
	out := slices.Clone(vals)
	if len(free) == 0 {
		e.vars = all
		return e.at(vals), out
	}
	e.vars = free
	x, _ = nelderMead(e, x, 0.05, 150)
	x, f := nelderMead(e, x, 0.02, 100)
	e.setLog(x)
	j := 0
	for i := range all {
		if !fixed[i] {
			out[i] = math.Exp(math.Min(math.Max(x[j], all[i].lo), all[i].hi))
			j++
		}
	}
	e.vars = all
	return f, out
}
