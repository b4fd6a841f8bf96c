package synth

import (
	"math"
	"slices"

	"tonewright/networks"
)

// The margin of the pruning pass (prune): pruneMissGain is, for a design that misses, the least progress on a
// missed target, in units of the tolerance it is judged by (a quarter:
// 1.25 % of frequency or 0.25 dB with PartsTolerance), that makes swaps
// worth keeping.
var pruneMissGain = 0.25

// standing is how a re-voicing's values fare: the cost, and target by
// target whether it is met, whether its figure was found and its error in
// units of the tolerance.
type standing struct {
	cost  float64
	met   []bool
	found []bool
	err   []float64
}

func stand(e *evaluator, vals []float64, tol Tolerance) standing {
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	s := standing{cost: e.cost(&m)}
	if math.IsNaN(s.cost) {
		s.cost = math.Inf(1)
	}
	for _, c := range checks(e.goal, &m, &m, tol) {
		s.met = append(s.met, c.Met)
		s.found = append(s.found, c.Found)
		x := math.Abs(c.Error) / tol.Level
		if c.Unit == "Hz" {
			x = math.Abs(math.Log1p(c.Error)) / math.Log1p(tol.Freq)
		}
		s.err = append(s.err, x)
	}
	return s
}

func (s standing) misses() int {
	n := 0
	for _, m := range s.met {
		if !m {
			n++
		}
	}
	return n
}

// serves reports whether s does what ref does: every target ref meets
// still met (a re-voicing that meets them all wants the fewest changes,
// not the closest figures); when ref misses some, no missed target found
// by ref lost or pushed pruneMissGain or more further off.
func (s standing) serves(ref standing) bool {
	for i := range ref.met {
		switch {
		case ref.met[i] && !s.met[i]:
			return false
		case !ref.met[i] && ref.found[i] && (!s.found[i] || s.err[i] >= ref.err[i]+pruneMissGain):
			return false
		}
	}
	return true
}

// prune undoes the swaps of a re-voicing that buy nothing. It restores the
// changed parts of r to their original values one at a time, letting the
// parts still changed settle by single steps in their sets (settle), and
// keeps a restoration while the design still serves as r does (see
// standing.serves: the same targets met, the misses no meaningfully
// worse); of the restorations that qualify it keeps the one of the lowest cost (ties: the
// earlier part), and stops when none does. The comparison is always with
// r, so restorations cannot drift away from it by small steps. It returns
// r itself when nothing is restored, else a new run. It is deterministic.
func prune(base *networks.Design, g goal, r *run, tol Tolerance) *run {
	e := newEvaluator(base.Clone(), g)
	all := bind(r.vars, e.d)
	e.vars = all
	ref := stand(e, r.chosen, tol)
	cur := slices.Clone(r.chosen)
	for {
		var best []float64
		var bestS standing
		for i := range all {
			v := &all[i]
			if v.original <= 0 || same(cur[i], v.original) {
				continue
			}
			trial := slices.Clone(cur)
			trial[i] = v.original
			trial = settle(e, all, trial)
			s := stand(e, trial, tol)
			if s.serves(ref) && (best == nil || s.cost < bestS.cost) {
				best, bestS = trial, s
			}
		}
		if best == nil {
			break
		}
		cur = best
	}
	if slices.Equal(cur, r.chosen) {
		return r
	}
	s := stand(e, cur, tol)
	n := s.misses()
	return &run{vars: r.vars, ideal: r.ideal, chosen: cur, cost: s.cost, misses: n, met: n == 0}
}

// settle lets the parts of vals not at their original values move to the
// next member of their set up or down, or back to the original, while one
// such step lowers the cost (the best step first); the parts at their
// original values stay. vars are bound to e's design; it returns the
// values, e.vars left as vars.
func settle(e *evaluator, vars []variable, vals []float64) []float64 {
	e.vars = vars
	f := e.at(vals)
	var buf [3]float64
	for iter := 0; iter < 50; iter++ {
		moveI, moveV, moveF := -1, 0.0, f
		for i := range vars {
			v := &vars[i]
			if v.original > 0 && same(vals[i], v.original) {
				continue
			}
			old := vals[i]
			for _, x := range moves(v, old, buf[:0]) {
				vals[i] = x
				if c := e.at(vals); c < moveF-1e-12*math.Abs(moveF) {
					moveI, moveV, moveF = i, x, c
				}
			}
			vals[i] = old
		}
		if moveI < 0 {
			break
		}
		vals[moveI], f = moveV, moveF
	}
	return vals
}
