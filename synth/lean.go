package synth

import (
	"math"
	"slices"
)

// The lean phase of a fresh synthesis: among the designs that meet the
// targets, the one of least insertion loss.
//
// A fresh synthesis has more unknowns than targets. The scoop's frequency,
// depth and balance and the corner fix four of them; what is left is, in
// effect, the impedance level of each part of the network (the high-pass
// leg's R, the pot, the sections' R), and the loss depends mostly on that.
// The first phase's tie-break cannot choose well between levels: it
// refines the starts whose errors are smallest, which says more about the
// closed forms than about the loss, and once Nelder–Mead is in the
// objective's narrow valley along the targets it hardly moves along it.
// The lean phase therefore works on the targets themselves. It solves them
// for four slaved parts (the low-pass leg's R and C, the high-pass leg's C
// and the sections' C) by damped Gauss–Newton steps on the measured
// errors, and maximises the gain at 1 kHz (knob 0.5) over the free parts
// with Nelder–Mead, each trial point first restored to the targets.
//
// The outer search starts from the restored points of least loss among the
// first phase's result and the seeds of freshSeeds with leanSectionRatios;
// restoring a start may move every variable (the least change that meets
// the targets), so that a seed whose impedance level cannot meet them as
// it stands is still a start.
const (
	leanRuns     = 2    // restored starts whose loss is then minimised
	leanWide     = 60   // outer evaluations with a wide simplex, per run
	leanNarrow   = 40   // then with a narrow one
	restoreTol   = 0.05 // largest error of a restored point, in units of IdealTolerance
	restoreSteps = 6    // trial steps per restoration in the outer search
	startSteps   = 12   // and of a start
	maxBlocked   = 4    // steps in a row that run into a bound before restoring gives up
	jacobianStep = 0.005
	// leanFail is the outer cost of a point that cannot be restored: worse
	// than the loss of any design that meets the targets.
	leanFail = 1e3
	// leanEstimate is the lean phase's usual number of objective
	// evaluations, for progress.
	leanEstimate = 1500
)

// manifold restores points to the targets and keeps the best restored
// point found. Its buffers are allocated once, so restoring does not
// allocate.
type manifold struct {
	e      *evaluator
	slaved []int // variables solved for the targets, one per target
	free   []int // the rest: the outer search's coordinates
	all    []int // every variable

	best     []float64 // the best restored point so far (log values)
	bestGain float64

	// move are the variables restoring moves: the slaved ones in the
	// outer search, all of them when restoring a start. jac is
	// ∂error_i/∂x_move[k], row-major, at or near the last point restored:
	// computed by differences, then Broyden-updated along the steps; exact
	// tells whether it has not been updated since.
	move        []int
	jac         []float64
	have, exact bool
	x, y        []float64 // trial points
	r, ry, rd   []float64 // errors and scratch, one per target
	d           []float64 // the step, one per variable moved
	held        []bool    // variables held at a bound in this step
	a           []float64 // the step's equations, n × (n+1) for n targets
	weights     []float64 // per target, on the errors; nil: 1
	// leastSquares lets restoring move fewer variables than there are
	// targets (the damped least-squares step), for the nearest figures.
	leastSquares bool
	// tol is the largest error restore leaves, in units of
	// IdealTolerance; 0: restoreTol.
	tol float64
}

// slavedVars returns the indices of the variables the lean phase solves
// for the targets and of the rest, or nil when the problem is not a fresh
// synthesis whose targets match the slaved parts one to one.
func slavedVars(e *evaluator) (slaved, free []int) {
	if !e.goal.scoop {
		return nil, nil
	}
	names := []string{"lowpass.r", "lowpass.c", "highpass.c"}
	if e.goal.corner {
		names = append(names, "filters.c")
	}
	for _, name := range names {
		i := slices.IndexFunc(e.vars, func(v variable) bool { return v.name == name })
		if i < 0 {
			return nil, nil
		}
		slaved = append(slaved, i)
	}
	for i := range e.vars {
		if !slices.Contains(slaved, i) {
			free = append(free, i)
		}
	}
	return slaved, free
}

func newManifold(e *evaluator, slaved, free []int) *manifold {
	n, nv := len(slaved), len(e.vars)
	all := make([]int, nv)
	for i := range all {
		all[i] = i
	}
	return &manifold{e: e, slaved: slaved, free: free, all: all, move: slaved,
		best: make([]float64, nv), jac: make([]float64, n*nv),
		x: make([]float64, nv), y: make([]float64, nv),
		r: make([]float64, n), ry: make([]float64, n), rd: make([]float64, n), d: make([]float64, nv), held: make([]bool, nv),
		a: make([]float64, n*(n+1))}
}

// moving sets the variables restoring moves; the Jacobian is then stale.
func (mf *manifold) moving(vars []int) {
	mf.move = vars
	mf.have = false
}

// measure writes the errors of the design at x (log values, in range) to
// r and returns its gain at 1 kHz, its sum of squared errors (with a
// penalty when a wanted scoop or corner is missing) and its largest error.
func (mf *manifold) measure(x, r []float64) (gain, ss, worst float64) {
	e := mf.e
	e.setLog(x)
	var m Metrics
	e.measure(&m)
	var errs [maxTargets]float64
	copy(r, errs[:e.targetErrors(&m, &errs)])
	if mf.weights != nil {
		for i := range r {
			r[i] *= mf.weights[i]
		}
	}
	for _, v := range r {
		ss += v * v
	}
	worst = e.worst(&m)
	if math.IsInf(worst, 1) {
		ss += 1e6
	}
	return m.Gain1kDB, ss, worst
}

// jacobian computes the errors' derivatives by forward differences at x,
// whose errors are mf.r.
func (mf *manifold) jacobian(x []float64) {
	n, p := len(mf.r), len(mf.move)
	copy(mf.y, x)
	for k, j := range mf.move {
		mf.y[j] = x[j] + jacobianStep
		mf.measure(mf.y, mf.ry)
		for i := 0; i < n; i++ {
			mf.jac[i*p+k] = (mf.ry[i] - mf.r[i]) / jacobianStep
		}
		mf.y[j] = x[j]
	}
	mf.have, mf.exact = true, true
}

// restore moves the variables mf.move of x (log values, changed in place)
// until every error is within restoreTol: damped Gauss–Newton steps
// (Levenberg–Marquardt; the least change when more variables move than
// there are targets), each no longer than 1 in log, accepted when they
// reduce the squared errors, at most steps of them. A variable at a bound
// that a step would push beyond it is held there; restore gives up when
// that leaves fewer variables free than there are targets, or when
// maxBlocked steps in a row run into a bound: the targets want a part
// beyond its range, and the point is not worth the evaluations. It returns
// the gain at 1 kHz of the result, its sum of squared errors and whether
// it meets the targets.
func (mf *manifold) restore(x []float64, steps int) (gain, ss float64, ok bool) {
	n, p := len(mf.r), len(mf.move)
	for i := range x {
		x[i] = math.Min(math.Max(x[i], mf.e.vars[i].lo), mf.e.vars[i].hi)
	}
	d := mf.d[:p]
	gain, ss, worst := mf.measure(x, mf.r)
	damping := 1e-6
	if mf.leastSquares {
		damping = 1e-3
	}
	tol := restoreTol
	if mf.tol > 0 {
		tol = mf.tol
	}
	blocked := 0 // steps in a row that ran into a bound
	for step := 0; step < steps && !(worst <= tol) && (blocked < maxBlocked || mf.leastSquares); step++ {
		if !mf.have {
			mf.jacobian(x)
		}
		free, held := mf.solve(x, damping)
		if !free {
			break
		}
		if held {
			blocked++
		} else {
			blocked = 0
		}
		copy(mf.y, x)
		dd := 0.0
		for k, j := range mf.move {
			v := &mf.e.vars[j]
			mf.y[j] = math.Min(math.Max(x[j]+d[k], v.lo), v.hi)
			d[k] = mf.y[j] - x[j]
			dd += d[k] * d[k]
		}
		gy, ssy, wy := mf.measure(mf.y, mf.ry)
		switch {
		case dd > 0 && (ssy < ss && math.IsInf(wy, 1) == math.IsInf(worst, 1) || math.IsInf(worst, 1) && !math.IsInf(wy, 1)):
			// Better: a smaller error, and never a step that loses a
			// wanted scoop or corner.
			// Broyden's update: J += (Δr − J·d)·dᵀ / (dᵀd).
			for i := 0; i < n; i++ {
				jd := 0.0
				for k := 0; k < p; k++ {
					jd += mf.jac[i*p+k] * d[k]
				}
				mf.rd[i] = (mf.ry[i] - mf.r[i] - jd) / dd
			}
			for i := 0; i < n; i++ {
				for k := 0; k < p; k++ {
					mf.jac[i*p+k] += mf.rd[i] * d[k]
				}
			}
			mf.exact = false
			copy(x, mf.y)
			copy(mf.r, mf.ry)
			gain, ss, worst = gy, ssy, wy
			damping = math.Max(damping/10, 1e-9)
		case !mf.exact:
			mf.have = false // a stale Jacobian: recompute it here
		default:
			damping *= 100
		}
	}
	return gain, ss, worst <= tol
}

// solve writes to mf.d the damped step from x for the errors mf.r in the
// variables moved: d = −Jᵀu with (JJᵀ + λ·diag(JJᵀ))·u = r over the
// variables not held at a bound, by Gaussian elimination with partial
// pivoting, then scaled down to at most 1 in each variable. It reports
// whether enough variables are free (at least one per target) and whether
// any had to be held at a bound.
func (mf *manifold) solve(x []float64, damping float64) (free, bounded bool) {
	n, p := len(mf.r), len(mf.move)
	d, held := mf.d[:p], mf.held[:p]
	nfree := p
	for q, j := range mf.move {
		v := &mf.e.vars[j]
		held[q] = !(v.lo < v.hi) // a part with one allowed value is a constant
		if held[q] {
			nfree--
		}
	}
	for {
		if nfree < n && !(mf.leastSquares && nfree > 0) {
			return false, true
		}
		mf.step(damping)
		again := false
		for q, j := range mf.move {
			v := &mf.e.vars[j]
			if !held[q] && (x[j] <= v.lo && d[q] < 0 || x[j] >= v.hi && d[q] > 0) {
				held[q], again, bounded = true, true, true
				nfree--
			}
		}
		if !again {
			break
		}
	}
	big := 0.0
	for _, v := range d {
		big = math.Max(big, math.Abs(v))
	}
	if big > 1 {
		for q := range d {
			d[q] /= big
		}
	}
	return true, bounded
}

// step solves the damped normal equations for the variables not held.
func (mf *manifold) step(damping float64) {
	n, p := len(mf.r), len(mf.move)
	a, J, held := mf.a, mf.jac, mf.held[:p]
	w := n + 1
	for i := 0; i < n; i++ {
		for k := 0; k < n; k++ {
			s := 0.0
			for q := 0; q < p; q++ {
				if !held[q] {
					s += J[i*p+q] * J[k*p+q]
				}
			}
			a[i*w+k] = s
		}
		a[i*w+i] += damping*a[i*w+i] + 1e-12
		a[i*w+n] = mf.r[i]
	}
	u := mf.rd
	if !solveAugmented(a, n, u) {
		// Not reached: the damped normal matrix is positive definite.
		for i := range u[:n] {
			u[i] = math.NaN()
		}
	}
	for q := range mf.d[:p] {
		s := 0.0
		if !held[q] {
			for i := 0; i < n; i++ {
				s -= J[i*p+q] * u[i]
			}
		}
		if math.IsNaN(s) {
			s = 0
		}
		mf.d[q] = s
	}
}

// f is the outer objective on the free variables z (log values): the
// insertion loss of the design with those free values, restored to the
// targets from the best point so far, plus the bound penalty; leanFail
// and more when it cannot be restored.
func (mf *manifold) f(z []float64) float64 {
	e := mf.e
	copy(mf.x, mf.best)
	pen := 0.0
	for q, j := range mf.free {
		zq, p := e.vars[j].clamp(z[q])
		pen += p
		mf.x[j] = zq
	}
	gain, ss, ok := mf.restore(mf.x, restoreSteps)
	if !ok {
		return leanFail + math.Sqrt(ss) + boundWeight*pen
	}
	if gain > mf.bestGain {
		copy(mf.best, mf.x)
		mf.bestGain = gain
	}
	c := -gain + boundWeight*pen
	if math.IsNaN(c) {
		return math.Inf(1)
	}
	return c
}

// lean is the second phase of a fresh synthesis. It restores x0 (the
// first phase's result) and the starts (log values) to the targets, and
// from the restored points of least loss minimises the loss over the free
// variables. It returns the design of least loss that meets the targets
// within restoreTol, or x0 when none does better: when the targets are out
// of reach, when x0 already meets them within IdealTolerance with no more
// loss, or when the problem is not one the lean phase handles.
func lean(e *evaluator, x0 []float64, starts [][]float64) []float64 {
	slaved, free := slavedVars(e)
	if slaved == nil {
		return x0
	}
	mf := newManifold(e, slaved, free)
	type restored struct {
		x    []float64
		gain float64
	}
	var cands []restored
	mf.moving(mf.all)
	for i := -1; i < len(starts); i++ {
		x := x0
		if i >= 0 {
			x = starts[i]
		}
		x = slices.Clone(x)
		mf.have = false
		if gain, _, ok := mf.restore(x, startSteps); ok {
			cands = append(cands, restored{x, gain})
		}
	}
	if len(cands) == 0 {
		return x0
	}
	slices.SortStableFunc(cands, func(a, b restored) int {
		switch {
		case a.gain > b.gain:
			return -1
		case a.gain < b.gain:
			return 1
		}
		return 0
	})
	best := restored{gain: math.Inf(-1)}
	z := make([]float64, len(free))
	mf.moving(slaved)
	for _, c := range cands[:min(leanRuns, len(cands))] {
		copy(mf.best, c.x)
		mf.bestGain = c.gain
		mf.have = false
		for q, j := range free {
			z[q] = c.x[j]
		}
		z1, f1 := minimize(mf.f, z, -c.gain, 0.3, leanWide)
		minimize(mf.f, z1, f1, 0.1, leanNarrow)
		if mf.bestGain > best.gain {
			best = restored{slices.Clone(mf.best), mf.bestGain}
		}
	}
	e.setLog(x0)
	var m Metrics
	e.measure(&m)
	if e.worst(&m) <= 1 && m.Gain1kDB >= best.gain {
		return x0
	}
	return best.x
}

// logValues returns the natural logs of the values.
func logValues(vals [][]float64) [][]float64 {
	out := make([][]float64, len(vals))
	for k, v := range vals {
		out[k] = make([]float64, len(v))
		for i, x := range v {
			out[k][i] = math.Log(x)
		}
	}
	return out
}
