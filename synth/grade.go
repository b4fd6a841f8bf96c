package synth

import "math"

// The standing of allowed values under a priority.
//
// When the targets cannot all be met, the weighted cost (priorityWeights,
// on each figure's miss beyond the tolerance) orders the targets only as
// far as the weights reach: a factor of 30 per rank cannot outweigh a
// lower target that misses by hundreds of tolerances, so a step towards an
// unreachable balance can cost the depth its tolerance. The discrete stage
// therefore compares allowed values by grade: for each rank, highest
// first, how many of its targets miss beyond the tolerance; only then the
// cost.

// grade is how a combination of allowed values keeps the targets: miss[0]
// is 1 when it breaks a limit, miss[1+r] the number of targets of rank r
// missed beyond the evaluator's slack (without a priority, miss[1] the
// number missed beyond tolSlack; all zero when neither is set), then the
// cost.
type grade struct {
	miss [maxTargets + 1]int
	cost float64
}

// better reports whether a ranks before b: fewer misses of the highest
// rank where they differ, then a cost lower by more than rel of b's.
func (a *grade) better(b *grade, rel float64) bool {
	if a.miss != b.miss {
		return a.keepsMore(b)
	}
	return a.cost < b.cost-rel*math.Abs(b.cost)
}

// keepsMore reports whether a misses fewer targets than b of the highest
// rank where their misses differ.
func (a *grade) keepsMore(b *grade) bool {
	for i := range a.miss {
		if a.miss[i] != b.miss[i] {
			return a.miss[i] < b.miss[i]
		}
	}
	return false
}

// grade measures the design with the variables at vals.
func (e *evaluator) grade(vals []float64) grade {
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	g := grade{cost: e.cost(&m)}
	if math.IsNaN(g.cost) {
		g.cost = math.Inf(1)
	}
	priority := e.weights != nil && e.slack != nil
	if !priority && e.tolSlack == nil {
		return g
	}
	if e.overLimits(&m) > 0 {
		g.miss[0] = 1
	}
	var errs [maxTargets]float64
	n := e.targetErrors(&m, &errs)
	lost := math.IsInf(e.worst(&m), 1)
	if !priority {
		// Without a priority every target is of one rank.
		for i := 0; i < n && i < len(e.tolSlack); i++ {
			if lost || !(math.Abs(errs[i]) <= e.tolSlack[i]) {
				g.miss[1]++
			}
		}
		return g
	}
	for i := 0; i < n && i < len(e.ranks) && i < len(e.slack); i++ {
		if lost || !(math.Abs(errs[i]) <= e.slack[i]) {
			g.miss[1+min(e.ranks[i], maxTargets-1)]++
		}
	}
	return g
}
