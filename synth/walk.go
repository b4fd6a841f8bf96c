package synth

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/floats"

	"tonewright/eseries"
	"tonewright/networks"
)

// The standard-value walk: the discrete stage of a fresh synthesis.
//
// The targets fix only as many parts as there are targets; the exact
// solutions form a set with one dimension per remaining part, and the best
// designs made of allowed values lie along it, not around one point. The
// walk therefore first moves the first phase's point along the exact
// solutions toward the middle of the free parts' ranges (toward), then
// spreads anchors over the exact solutions (mesh: every allowed pot near
// it, and at each pot steps along the solutions themselves, each restored
// onto the targets). About each anchor, the local slopes (a Jacobian by
// differences) predict, for every combination of allowed values of the
// parts left free within reach and of the members below and above each
// solved part's linearised solution, the errors and the insertion loss;
// the parts solved for are the best-conditioned at that anchor (split).
// The best predicted combinations, a few hundred, are measured exactly
// (the predictions of a design 0.4 in log from its anchor err by about 1 %,
// so a design of allowed values that meets the targets exactly ranks among
// the few hundred best predicted, not first), the best measured are
// re-anchored and their neighbourhood predicted and measured again, and
// the best is polished by moves of one or two parts to neighbouring
// members. (An earlier stage solved the free values of the best predicted
// exactly and measured their roundings; on the 90 experiment targets it
// changed no result once the shortlist was measured, and was dropped.)
//
// Combinations are ranked first by the targets missed beyond the
// tolerance, then by the preference: Closest (the largest error in units
// of FineTolerance, then the sum of squares) or LeastLoss (the gain at
// 1 kHz, knob 0.5).
const (
	walkPotFactor   = 50.0 // pots within this factor of the start's pot are meshed
	walkPots        = 8    // at most this many pots, the nearest
	walkTowardSteps = 8    // steps of toward
	walkMeasure     = 400  // predicted combinations measured exactly (a few per cent of the evaluations)
	walkReanchor    = 8    // measured combinations re-anchored
	walkRemeasure   = 12   // and combinations measured about each
	walkAnchorMax   = 800  // anchors at most
	walkSameBranch  = 0.1  // log distance within which two exact designs' solved parts are one
)

// FineTolerance is the unit in which the walk ranks how close a design
// comes: 1 % in frequency, 0.25 dB in level.
var FineTolerance = Tolerance{Freq: 0.01, Level: 0.25}

// Prefer says which of the designs that meet the tolerance a synthesis
// chooses.
type Prefer int

const (
	// Closest chooses the design whose figures lie closest to the
	// targets (the default).
	Closest Prefer = iota
	// LeastLoss chooses the design that loses least at 1 kHz (knob 0.5).
	LeastLoss
)

// ParsePrefer reads a Prefer: closest or loss.
func ParsePrefer(s string) (Prefer, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "closest":
		return Closest, nil
	case "loss":
		return LeastLoss, nil
	}
	return Closest, fmt.Errorf("%q: give closest (the figures nearest the targets) or loss (the least insertion loss)", s)
}

// String is the --prefer word.
func (p Prefer) String() string {
	if p == LeastLoss {
		return "loss"
	}
	return "closest"
}

// candidate is a combination of allowed values with its (predicted or
// measured) standing.
type candidate struct {
	vals   []float64
	key    string // key(vals), once known
	misses int
	close  float64 // closeness: worst² + mean of squares, in FineTolerance units
	gain   float64
}

// walker holds the state of a walk.
type walker struct {
	e              *evaluator
	mf             *manifold
	slaved, free   []int
	nonPot         []int // the variables other than pots that can move
	nt             int   // number of targets
	tol            Tolerance
	prefer         Prefer
	unit           [maxTargets]float64 // IdealTolerance units per FineTolerance unit, per target
	userUnit       [maxTargets]float64 // IdealTolerance units per tol unit
	jac            []float64           // (nt+1) × nv: errors and gain against log values
	r0             []float64
	seen           map[string]bool
	best           []candidate // measured, best first
	evalsAtStart   int
	predictedCount int
}

// better orders candidates: fewer misses, then the preference.
func (w *walker) better(a, b *candidate) bool {
	if a.misses != b.misses {
		return a.misses < b.misses
	}
	if w.prefer == LeastLoss && a.misses == 0 {
		if a.gain != b.gain {
			return a.gain > b.gain
		}
	}
	return a.close < b.close
}

// judge fills a candidate's misses and closeness from its errors (in
// IdealTolerance units) and gain.
func (w *walker) judge(c *candidate, errs []float64, gain float64) {
	c.misses, c.gain = 0, gain
	worst, ss := 0.0, 0.0
	if math.IsNaN(gain) {
		c.gain = math.Inf(-1) // ranks last by loss
	}
	for i, x := range errs {
		if !(math.Abs(x) <= w.userUnit[i]) { // NaN included
			c.misses++
		}
		f := x / w.unit[i]
		worst = math.Max(worst, math.Abs(f))
		ss += f * f
	}
	if g := &w.e.goal; g.maxLoss > 0 && -gain > g.maxLoss {
		c.misses++
	}
	c.close = worst*worst + ss/float64(max(1, len(errs)))
	if math.IsNaN(c.close) {
		c.close = math.Inf(1)
	}
}

// units fills the conversion factors for the goal's targets.
func (w *walker) units() {
	g := &w.e.goal
	n := 0
	add := func(freq bool) {
		if freq {
			w.unit[n] = math.Log1p(FineTolerance.Freq) / IdealTolerance.Freq
			w.userUnit[n] = math.Log1p(w.tol.Freq) / IdealTolerance.Freq
		} else {
			w.unit[n] = FineTolerance.Level / IdealTolerance.Level
			w.userUnit[n] = w.tol.Level / IdealTolerance.Level
		}
		n++
	}
	if g.scoop {
		add(true)
		add(false)
		add(false)
	}
	if g.corner {
		add(true)
	}
	w.nt = n
}

// exact measures the design at vals (allowed values) and records it.
func (w *walker) exact(vals []float64) candidate {
	e := w.e
	e.setValues(vals)
	var m Metrics
	e.measure(&m)
	var errs [maxTargets]float64
	n := e.targetErrors(&m, &errs)
	c := candidate{vals: slices.Clone(vals)}
	w.judge(&c, errs[:n], m.Gain1kDB)
	if math.IsInf(e.worst(&m), 1) {
		c.misses, c.close = w.nt+1, math.Inf(1)
	}
	if e.goal.maxOut > 0 && m.OutputOhm > e.goal.maxOut {
		c.misses++
	}
	w.best = insertSorted(w, w.best, c, len(w.best)+1)
	return c
}

// slopes computes w.jac and w.r0 at x (log values): the errors and the
// gain at 1 kHz, and their derivatives by forward differences in the
// variables cols (nil: all; the other columns are zero). r0, when not nil,
// holds the errors at x already measured and gain the gain: x is then not
// measured again.
func (w *walker) slopes(x []float64, cols []int, r0 []float64, gain float64) float64 {
	e := w.e
	nv := len(e.vars)
	rows := w.nt + 1
	if len(w.jac) != rows*nv {
		w.jac = make([]float64, rows*nv)
		w.r0 = make([]float64, rows)
	}
	read := func(dst []float64) {
		var m Metrics
		e.measure(&m)
		var errs [maxTargets]float64
		k := e.targetErrors(&m, &errs)
		copy(dst, errs[:k])
		dst[w.nt] = m.Gain1kDB
	}
	if r0 != nil {
		copy(w.r0, r0[:w.nt])
		w.r0[w.nt] = gain
	} else {
		e.setLog(x)
		read(w.r0)
	}
	y := slices.Clone(x)
	tmp := make([]float64, rows)
	clear(w.jac)
	for j := 0; j < nv; j++ {
		if cols != nil && !slices.Contains(cols, j) {
			continue
		}
		y[j] = x[j] + jacobianStep
		e.setLog(y)
		read(tmp)
		for i := 0; i < rows; i++ {
			w.jac[i*nv+j] = (tmp[i] - w.r0[i]) / jacobianStep
		}
		y[j] = x[j]
	}
	return w.r0[w.nt]
}

// key identifies a combination of values.
func key(vals []float64) string {
	b := make([]byte, 0, 8*len(vals))
	for _, v := range vals {
		u := math.Float64bits(float64(float32(v)))
		for k := 0; k < 8; k++ {
			b = append(b, byte(u>>(8*k)))
		}
	}
	return string(b)
}

// predictAround ranks, by the errors and slopes at the anchor xa (log
// values, near the targets: w.r0 holds its errors), the combinations of
// allowed values about it: each of the parts free at the members given in
// freeVals (one list per part), the slaved parts at the members either
// side of their linearised solution (and, with wide, one member further
// either way). It adds them to list. With curv,
// the predictions take in how the slopes change (see curvature): for each
// combination of the free parts, the errors and the slopes are carried to
// the point where the slopes solve the slaved parts, the slaved parts are
// solved again there, and the combinations about it predicted from there.
func (w *walker) predictAround(xa []float64, slaved, free []int, freeVals [][]float64, wide bool, list *shortlist, curv *curvature) {
	e := w.e
	nv := len(e.vars)
	ns := len(slaved)
	nt := w.nt
	// The square system in the slaved parts: Js·Δs = −(r0 + Jf·Δf).
	js := make([]float64, ns*ns)
	for i := 0; i < ns; i++ {
		for k, j := range slaved {
			js[i*ns+k] = w.jac[i*nv+j]
		}
	}
	// The free members' log distances from the anchor.
	freeDx := make([][]float64, len(free))
	for q, j := range free {
		freeDx[q] = make([]float64, len(freeVals[q]))
		for m, v := range freeVals[q] {
			freeDx[q][m] = math.Log(v) - xa[j]
		}
	}
	rhs := make([]float64, ns)
	ds := make([]float64, ns)
	idx := make([]int, len(free))
	vals := make([]float64, nv)
	// base: the errors and the gain predicted with the free parts moved
	// and the slaved ones at the anchor; rp: at p, the slaved ones moved
	// to their solution too; contrib[k][m]: what the slaved part k at its
	// member m adds to rp (nt+1 each).
	base := make([]float64, nt+1)
	contrib := make([][][]float64, ns)
	slavedCands := make([][]float64, ns)
	sidx := make([]int, ns)
	pred := make([]float64, nt)
	rp := make([]float64, nt+1)
	jp := make([]float64, (nt+1)*ns)
	rq := make([]float64, nt+1)
	jq := make([]float64, (nt+1)*ns)
	centre := make([]float64, ns)
	step := make([]float64, ns)
	dx := make([]float64, nv)
	for {
		copy(base, w.r0)
		for q, j := range free {
			vals[j] = freeVals[q][idx[q]]
			if d := freeDx[q][idx[q]]; d != 0 {
				for i := 0; i <= nt; i++ {
					base[i] += w.jac[i*nv+j] * d
				}
			}
		}
		for i := 0; i < ns; i++ {
			rhs[i] = -base[i]
		}
		if solveSquare(js, rhs, ds, ns) {
			// rp and jp: the errors and gain, and their slopes in the
			// slaved parts, at p (the free parts at their members, the
			// slaved ones at ds from the anchor).
			copy(rp, base)
			for i := 0; i <= nt; i++ {
				for k, j := range slaved {
					jp[i*ns+k] = w.jac[i*nv+j]
					rp[i] += w.jac[i*nv+j] * ds[k]
				}
			}
			copy(centre, ds)
			if curv != nil {
				clear(dx)
				for q, j := range free {
					dx[j] = freeDx[q][idx[q]]
				}
				for k, j := range slaved {
					dx[j] = ds[k]
				}
				copy(rq, rp)
				copy(jq, jp)
				curv.carry(dx, slaved, rq, jq)
				// One Newton step for the slaved parts with the slopes
				// at p. A long step means the second-order model is
				// carried beyond where it holds: the first-order
				// prediction stands.
				for i := 0; i < ns; i++ {
					rhs[i] = -rq[i]
				}
				if solveSquare(jq[:ns*ns], rhs, step, ns) && floats.Norm(step, math.Inf(1)) <= curvatureStepMax {
					copy(rp, rq)
					copy(jp, jq)
					for k := range centre {
						centre[k] += step[k]
					}
				}
			}
			ok := true
			for k, j := range slaved {
				v := &e.vars[j]
				cs := candidates(slavedCands[k][:0], v, math.Exp(xa[j]+centre[k]))
				if wide && len(cs) > 0 {
					if p, ok := eseries.Prev(v.set, cs[0]); ok {
						cs = append([]float64{p}, cs...)
					}
					if n, ok := eseries.Next(v.set, cs[len(cs)-1]); ok {
						cs = append(cs, n)
					}
				}
				slavedCands[k] = cs
				sidx[k] = 0
				ok = ok && len(cs) > 0
				for len(contrib[k]) < len(cs) {
					contrib[k] = append(contrib[k], make([]float64, nt+1))
				}
				for m, c := range cs {
					d := math.Log(c) - xa[j] - ds[k]
					for i := 0; i <= nt; i++ {
						contrib[k][m][i] = jp[i*ns+k] * d
					}
				}
			}
			for ok {
				for i := 0; i < nt; i++ {
					s := rp[i]
					for k := range slaved {
						s += contrib[k][sidx[k]][i]
					}
					pred[i] = s
				}
				gain := rp[nt]
				for k := range slaved {
					gain += contrib[k][sidx[k]][nt]
				}
				c := candidate{}
				w.judge(&c, pred, gain)
				w.predictedCount++
				if list.admits(&c) {
					for k, j := range slaved {
						vals[j] = slavedCands[k][sidx[k]]
					}
					c.vals = slices.Clone(vals)
					list.add(c)
				}
				if !nextCombination(sidx, func(k int) int { return len(slavedCands[k]) }) {
					break
				}
			}
		}
		if !nextCombination(idx, func(q int) int { return len(freeVals[q]) }) {
			break
		}
	}
}

// split chooses which parts to solve for about an anchor, from the slopes
// in w.jac: w.nt of the parts other than pots, picked by column-pivoted
// Gram–Schmidt on the errors' columns (each next the part whose slope is
// largest once the chosen ones' are taken out), so that the square system
// in them is well conditioned. The lean phase's fixed choice is nearly
// singular on parts of the exact solutions (where the low-pass leg's R and
// C act almost only through their product), and its predictions run wild
// there. The other parts, pots included, are free.
func (w *walker) split() (slaved, free []int) {
	e := w.e
	nv := len(e.vars)
	cols := make([][]float64, nv)
	for _, j := range w.nonPot {
		c := make([]float64, w.nt)
		for i := range c {
			c[i] = w.jac[i*nv+j]
		}
		cols[j] = c
	}
	for len(slaved) < w.nt {
		bestJ, bestN := -1, 0.0
		for j, c := range cols {
			if c == nil || slices.Contains(slaved, j) {
				continue
			}
			if n := floats.Dot(c, c); n > bestN {
				bestJ, bestN = j, n
			}
		}
		if bestJ < 0 {
			return w.slaved, w.free
		}
		slaved = append(slaved, bestJ)
		q := cols[bestJ]
		for j, c := range cols {
			if c != nil && !slices.Contains(slaved, j) {
				f := floats.Dot(c, q) / bestN
				for i := range c {
					c[i] -= f * q[i]
				}
			}
		}
	}
	for j := range e.vars {
		if !slices.Contains(slaved, j) {
			free = append(free, j)
		}
	}
	return slaved, free
}

// toward moves x0 (log values, on the targets) along the exact solutions
// toward the middle of the free parts' ranges (the pots' included), in
// walkTowardSteps steps, each restored onto the targets, and returns the
// last point restored. The first phase's point often sits at a range's end
// (a 1 MΩ leg into 100 pF sections), where the mesh would spend its anchors
// on designs nobody builds; from the middle it reaches the common values
// first.
func (w *walker) toward(x0 []float64) []float64 {
	e := w.e
	cur := slices.Clone(x0)
	x := make([]float64, len(x0))
	for s := 1; s <= walkTowardSteps; s++ {
		copy(x, cur)
		for _, j := range w.free {
			v := &e.vars[j]
			x[j] = x0[j] + ((v.lo+v.hi)/2-x0[j])*float64(s)/walkTowardSteps
		}
		w.mf.have = false
		if _, _, ok := w.mf.restore(x, startSteps); !ok {
			break
		}
		copy(cur, x)
	}
	return cur
}

// cmpFloat orders a and b for sorting.
func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// insertSorted keeps top sorted, best first, at most keep long; c is not
// in it.
func insertSorted(w *walker, top []candidate, c candidate, keep int) []candidate {
	i, _ := slices.BinarySearchFunc(top, &c, func(t candidate, c *candidate) int {
		if w.better(c, &t) {
			return 1
		}
		return -1
	})
	if i >= keep {
		return top
	}
	top = slices.Insert(top, i, c)
	if len(top) > keep {
		top = top[:keep]
	}
	return top
}

// solveSquare solves the n×n system a·x = b by Gaussian elimination with
// partial pivoting (a and b are not changed); false when singular.
func solveSquare(a0, b0, x []float64, n int) bool {
	var buf [5 * 6]float64
	if n > 5 {
		return false
	}
	w := n + 1
	a := buf[:n*w]
	for i := 0; i < n; i++ {
		copy(a[i*w:i*w+n], a0[i*n:i*n+n])
		a[i*w+n] = b0[i]
	}
	return solveAugmented(a, n, x)
}

// solveAugmented solves the n×n system whose augmented matrix [A | b]
// (n rows of n+1, row-major) is a, overwriting it, by Gaussian elimination
// with partial pivoting, into x; false when a pivot is zero or NaN.
func solveAugmented(a []float64, n int, x []float64) bool {
	w := n + 1
	for c := 0; c < n; c++ {
		piv := c
		for r := c + 1; r < n; r++ {
			if math.Abs(a[r*w+c]) > math.Abs(a[piv*w+c]) {
				piv = r
			}
		}
		if a[piv*w+c] == 0 || math.IsNaN(a[piv*w+c]) {
			return false
		}
		if piv != c {
			for k := 0; k < w; k++ {
				a[c*w+k], a[piv*w+k] = a[piv*w+k], a[c*w+k]
			}
		}
		for r := c + 1; r < n; r++ {
			f := a[r*w+c] / a[c*w+c]
			for k := c; k < w; k++ {
				a[r*w+k] -= f * a[c*w+k]
			}
		}
	}
	for c := n - 1; c >= 0; c-- {
		s := a[c*w+n]
		for k := c + 1; k < n; k++ {
			s -= a[c*w+k] * x[k]
		}
		x[c] = s / a[c*w+c]
	}
	return true
}

// membersNear lists the members of v's set within half-width h (log) of x,
// at least the nearest one.
func membersNear(v *variable, x, h float64) []float64 {
	var out []float64
	lo, hi := math.Exp(x-h), math.Exp(x+h)
	m, ok := v.set.Above(lo)
	for ok && m <= hi*(1+eseries.RelTol) {
		out = append(out, m)
		m, ok = eseries.Next(v.set, m)
	}
	if len(out) == 0 {
		if n, err := eseries.Nearest(v.set, math.Exp(x)); err == nil {
			out = append(out, n)
		}
	}
	return out
}

// walk is the standard-value walk from the ideal values (exact, on the
// targets). It returns the chosen values and whether it could run (the
// problem has slaved parts); the values are then the best measured, and
// ideal is overwritten with the exact design nearest them (the free parts
// at their chosen values, or where the slaved parts have no solution
// there, the least change of the parts other than pots) when one is found.
func walk(e *evaluator, ideal []float64, tol Tolerance, prefer Prefer, effort int) ([]float64, bool) {
	// A higher effort spreads more anchors, closer together, over more
	// pots: pots within a factor F, at most P pots, A anchors a step of
	// meshStep/√effort apart (the anchors cover effort times the area,
	// and a design lies nearer an anchor, where the slopes predict it
	// better).
	effort = max(1, effort)
	potFactor := walkPotFactor * math.Pow(4, float64(effort-1))
	maxPots := walkPots + 2*(effort-1)
	anchorMax := walkAnchorMax * effort * effort
	keep := walkMeasure * effort * effort
	slaved, free := slavedVars(e)
	if slaved == nil || len(free) == 0 {
		return nil, false
	}
	w := &walker{e: e, slaved: slaved, free: free, tol: tol, prefer: prefer, seen: map[string]bool{}}
	w.units()
	w.mf = newManifold(e, slaved, free)
	w.mf.moving(slaved)
	for j := range e.vars {
		if v := &e.vars[j]; v.kind != networks.PartPot && v.lo < v.hi {
			w.nonPot = append(w.nonPot, j)
		}
	}
	nv := len(e.vars)
	x0 := make([]float64, nv)
	for i, v := range ideal {
		x0[i] = math.Log(v)
	}
	x0 = w.toward(x0)
	// The pots the anchors take: the allowed ones nearest the start's,
	// then in order of value, for stepping to neighbours.
	potVar, pots := -1, []float64{0}
	for _, j := range free {
		v := &e.vars[j]
		if v.kind != networks.PartPot {
			continue
		}
		ps := membersNear(v, x0[j], math.Log(potFactor))
		slices.SortStableFunc(ps, func(a, b float64) int {
			return cmpFloat(math.Abs(math.Log(a)-x0[j]), math.Abs(math.Log(b)-x0[j]))
		})
		potVar, pots = j, ps[:min(maxPots, len(ps))]
		slices.Sort(pots)
	}
	top := w.mesh(x0, pots, potVar, anchorMax, keep, meshStep/math.Sqrt(float64(effort)))
	x := make([]float64, nv)
	for _, c := range top {
		w.seen[key(c.vals)] = true
		w.exact(c.vals)
	}
	if len(w.best) == 0 {
		return nil, false
	}
	// Re-anchor the best measured: restore the slaved parts with the free
	// ones at their allowed values, and predict the neighbourhood.
	reanchor := slices.Clone(w.best[:min(walkReanchor, len(w.best))])
	for _, c := range reanchor {
		for j := range x {
			x[j] = math.Log(c.vals[j])
		}
		w.mf.have = false
		if _, _, ok := w.mf.restore(x, startSteps); !ok {
			continue
		}
		w.slopes(x, nil, nil, 0)
		freeVals := make([][]float64, len(free))
		for q, j := range free {
			v := &e.vars[j]
			fv := []float64{c.vals[j]}
			if p, ok := eseries.Prev(v.set, c.vals[j]); ok {
				fv = append(fv, p)
			}
			if n, ok := eseries.Next(v.set, c.vals[j]); ok {
				fv = append(fv, n)
			}
			freeVals[q] = fv
		}
		list := newShortlist(w, walkRemeasure)
		w.predictAround(x, w.slaved, w.free, freeVals, true, list, nil)
		for _, p := range list.c {
			w.seen[key(p.vals)] = true
			w.exact(p.vals)
		}
	}
	best := w.best[0]
	vals := w.descend(slices.Clone(best.vals))
	// The exact design nearest the chosen one: the free parts at their
	// chosen values, the slaved parts solved for the targets, or where
	// they cannot be, the least change of the parts other than pots that
	// meets the targets. It is the ideal the report compares the chosen
	// parts with.
	for _, move := range [][]int{w.slaved, w.nonPot} {
		for j := range x {
			x[j] = math.Log(vals[j])
		}
		w.mf.moving(move)
		_, _, ok := w.mf.restore(x, startSteps)
		if ok {
			for j := range ideal {
				ideal[j] = math.Exp(x[j])
			}
			break
		}
	}
	w.mf.moving(w.slaved)
	e.setValues(vals)
	return vals, true
}

// descend makes moves of one part, then of two, to neighbouring members
// while one improves the exact standing.
func (w *walker) descend(vals []float64) []float64 {
	e := w.e
	cur := w.exact(vals)
	trial := make([]float64, len(vals))
	var m1, m2 [3]float64
	for iter := 0; iter < 50; iter++ {
		improved := false
		for i := range e.vars {
			for _, v := range moves(&e.vars[i], cur.vals[i], m1[:0]) {
				copy(trial, cur.vals)
				trial[i] = v
				if w.seen[key(trial)] {
					continue
				}
				w.seen[key(trial)] = true
				if c := w.exact(trial); w.better(&c, &cur) {
					cur, improved = c, true
				}
			}
		}
		if improved {
			continue
		}
		for i := range e.vars {
			for j := i + 1; j < len(e.vars); j++ {
				for _, a := range moves(&e.vars[i], cur.vals[i], m1[:0]) {
					for _, b := range moves(&e.vars[j], cur.vals[j], m2[:0]) {
						copy(trial, cur.vals)
						trial[i], trial[j] = a, b
						if w.seen[key(trial)] {
							continue
						}
						w.seen[key(trial)] = true
						if c := w.exact(trial); w.better(&c, &cur) {
							cur, improved = c, true
						}
					}
				}
			}
		}
		if !improved {
			break
		}
	}
	e.setValues(cur.vals)
	return cur.vals
}

// walkBranchRatios are the ratios of the low-pass leg's R to the pot from
// which branches restores the ideal point, its C moved to keep the leg's
// time constant.
var walkBranchRatios = []float64{0.1, 0.3, 1, 3}

// branches are the points the anchors start from: x0 (exact, on the
// targets) and the other exact designs with the same free values. The
// targets can have more than one solution in the slaved parts (the
// low-pass leg high in impedance or low), and an anchor restored from its
// neighbour stays on its neighbour's branch, so the walk from x0 alone
// never reaches the others. branches restores x0 with the low-pass leg's R
// at each of walkBranchRatios to the pot and keeps the distinct results.
func (w *walker) branches(x0 []float64) [][]float64 {
	out := [][]float64{x0}
	e := w.e
	lr := slices.IndexFunc(e.vars, func(v variable) bool { return v.name == "lowpass.r" })
	lc := slices.IndexFunc(e.vars, func(v variable) bool { return v.name == "lowpass.c" })
	pi := slices.IndexFunc(e.vars, func(v variable) bool { return v.kind == networks.PartPot })
	if lr < 0 || lc < 0 || pi < 0 {
		return out
	}
	for _, f := range walkBranchRatios {
		x := slices.Clone(x0)
		tau := x[lr] + x[lc]
		x[lr] = math.Min(math.Max(x0[pi]+math.Log(f), e.vars[lr].lo), e.vars[lr].hi)
		x[lc] = tau - x[lr]
		w.mf.have = false
		_, _, ok := w.mf.restore(x, startSteps)
		if !ok {
			continue
		}
		if !slices.ContainsFunc(out, func(o []float64) bool { return w.sameSlaved(o, x) }) {
			out = append(out, x)
		}
	}
	return out
}

// sameSlaved reports whether the exact designs a and b (log values, the
// same free values) are one: their slaved parts within walkSameBranch.
func (w *walker) sameSlaved(a, b []float64) bool {
	for _, j := range w.slaved {
		if math.Abs(a[j]-b[j]) > walkSameBranch {
			return false
		}
	}
	return true
}

// nextCombination steps idx, an odometer over choices where digit k has
// size(k) choices (the first digit fastest), to the next combination; it
// reports false, with idx back at all zeros, after the last.
func nextCombination(idx []int, size func(k int) int) bool {
	for k := range idx {
		idx[k]++
		if idx[k] < size(k) {
			return true
		}
		idx[k] = 0
	}
	return false
}
