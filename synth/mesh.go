package synth

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"

	"tonewright/eseries"
	"tonewright/networks"
)

// The mesh: anchors spread over the exact solutions by stepping along them.
//
// With a pot at one of its allowed values the exact solutions form a
// surface (one dimension per free part but the pot), and no fixed choice of
// coordinates charts it well: where the low-pass leg's R and C act nearly
// as their product the surface is steep in them, and a grid over the other
// free parts leaves wide gaps on it. The mesh therefore steps from each
// anchor along the surface itself, in the directions that keep the
// targets (the null space of the errors' slopes), restores each step onto
// the targets by the least change, and keeps it when no anchor with the
// same pot lies within meshMerge steps, until the anchors run out: in rings
// about the start, every part's log value moving at most meshStep a step.
// A step is restored only when its turn comes (the steps still queued when
// the anchors run out cost nothing), and one near a step already queued is
// not queued. Each pot starts from the start's branches restored at it and
// from a few steps off anchors at the neighbouring pots. Anchors cost an
// evaluation per part for the slopes and about two restores; the slopes
// are not reused from the restore's (Broyden-updated) Jacobian, which
// ranks the predictions so much worse that the exact design of allowed
// values is found in fewer cases for the same time. The predictions are
// made once every anchor is placed, each with how its slopes change toward
// its neighbours (curvature.go).
const (
	meshStep  = 0.7  // largest log change of any part from an anchor to its neighbour (×2), at effort 1; /√effort above
	meshMerge = 0.5  // a new anchor this close (in steps, largest log distance) to another is one
	meshReach = 0.75 // free values predicted within this many steps of an anchor
	// at most this many of them per part, the nearest: all of an E24
	// series's within reach, a ninth of E96's width of them (the dense
	// series hold close designs everywhere, and their combinations would
	// cost more than the evaluations)
	meshMembers = 13
	// at most this many steps to each pot from anchors at its neighbours:
	// the first reach its exact solutions where the start's branches
	// restored at it do not, the rest would only land on anchors there
	meshPotSteps = 8
	// an anchor is restored to within this many IdealTolerance units:
	// the predictions start from its errors, so it need not lie on the
	// targets, only near enough for the slopes to hold
	meshTol = 1.0
)

// mesh places up to anchorMax anchors over the exact solutions, steps of
// stepLen apart, from the branches of x0 (log values, on the targets) at
// each of pots, predicts the combinations of allowed values about each and
// returns the best keep predicted. pots are in order of value; potVar is the
// pot's variable, -1 when the network has none.
func (w *walker) mesh(x0 []float64, pots []float64, potVar int, anchorMax, keep int, stepLen float64) []candidate {
	e := w.e
	nv := len(e.vars)
	list := newShortlist(w, keep)
	var anchors []meshAnchor
	// The queue holds steps not yet restored, each with the anchor it
	// leaves (-1 for the starts): a step is restored only when its turn
	// comes, so the steps still queued when the anchors run out cost
	// nothing.
	type step struct {
		start  []float64
		parent int
	}
	var queue []step
	head := 0 // queue[head:] are waiting
	x := make([]float64, nv)
	w.mf.moving(w.nonPot)
	defer func() {
		w.mf.moving(w.slaved)
		w.mf.tol = 0
	}()
	var gain float64
	restore := func(start []float64, parent int) bool {
		copy(x, start)
		w.mf.have = false
		if parent >= 0 {
			// The anchor's slopes (in the parts other than pots, the
			// ones restore moves) as the first Jacobian: a step from
			// the anchor starts near the targets, and restore
			// recomputes the Jacobian when a step with it fails.
			p, jac := len(w.nonPot), anchors[parent].jac
			for i := 0; i < w.nt; i++ {
				for k, j := range w.nonPot {
					w.mf.jac[i*p+k] = jac[i*nv+j]
				}
			}
			w.mf.have, w.mf.exact = true, false
		}
		var ok bool
		gain, _, ok = w.mf.restore(x, startSteps)
		return ok
	}
	// nearOne reports whether y lies within meshMerge steps of a (the
	// largest log distance over the parts other than pots) at the same pot.
	nearOne := func(y, a []float64) bool {
		if potVar >= 0 && math.Abs(a[potVar]-y[potVar]) > eseries.RelTol {
			return false
		}
		for _, j := range w.nonPot {
			if math.Abs(a[j]-y[j]) >= meshMerge*stepLen {
				return false
			}
		}
		return true
	}
	near := func(y []float64) bool {
		return slices.ContainsFunc(anchors, func(a meshAnchor) bool { return nearOne(y, a.x) })
	}
	// The starts: each branch at each pot, the nearest pots first.
	byNear := slices.Clone(pots)
	if potVar >= 0 {
		slices.SortStableFunc(byNear, func(a, b float64) int {
			return cmpFloat(math.Abs(math.Log(a)-x0[potVar]), math.Abs(math.Log(b)-x0[potVar]))
		})
	}
	// The branches are exact designs (restoreTol); the anchors are
	// restored to meshTol.
	branches := w.branches(x0)
	w.mf.tol = meshTol
	for _, p := range byNear {
		for _, b := range branches {
			start := slices.Clone(b)
			if potVar >= 0 {
				start[potVar] = math.Log(p)
			}
			queue = append(queue, step{start, -1})
		}
	}
	// enqueue queues a step from the last anchor placed unless it is near
	// an anchor or a step already queued, and reports whether it did.
	enqueue := func(start []float64) bool {
		if near(start) || slices.ContainsFunc(queue[head:], func(q step) bool { return nearOne(start, q.start) }) {
			return false
		}
		queue = append(queue, step{start, len(anchors) - 1})
		return true
	}
	var null mat.Dense
	var svd mat.SVD
	var jn *mat.Dense
	if len(w.nonPot) > w.nt {
		jn = mat.NewDense(w.nt, len(w.nonPot), nil)
	}
	dir := make([]float64, nv)
	potSteps := make([]int, len(pots)) // steps queued to each pot from its neighbours
	for head < len(queue) && len(anchors) < anchorMax {
		st := queue[head]
		head++
		// A step is restored when neither it nor where it lands is near
		// an anchor.
		if near(st.start) || !restore(st.start, st.parent) || near(x) {
			continue
		}
		a := slices.Clone(x)
		// The slopes in the parts other than pots (the pot stays at
		// its member about an anchor), from the errors restore
		// measured at a.
		w.slopes(a, w.nonPot, w.mf.r, gain)
		// The parts to solve for about the anchor (its best
		// conditioned) and the free values to predict; the predictions
		// wait for the neighbours' slopes.
		sl, fr := w.split()
		fv := make([][]float64, len(fr))
		for q, j := range fr {
			v := &e.vars[j]
			if v.kind == networks.PartPot {
				fv[q] = []float64{math.Exp(a[j])}
			} else {
				fv[q] = nearestMembers(membersNear(v, a[j], meshReach*stepLen), a[j], meshMembers)
			}
		}
		anchors = append(anchors, meshAnchor{x: a, r0: slices.Clone(w.r0), jac: slices.Clone(w.jac), slaved: sl, free: fr, freeVals: fv})
		// The directions along the exact solutions: the null space of
		// the errors' slopes in the parts other than pots.
		if jn == nil {
			continue
		}
		for i := 0; i < w.nt; i++ {
			for k, j := range w.nonPot {
				jn.Set(i, k, w.jac[i*nv+j])
			}
		}
		if !svd.Factorize(jn, mat.SVDFull) {
			continue
		}
		svd.VTo(&null)
		for k := w.nt; k < len(w.nonPot); k++ {
			big := 0.0
			for q := range w.nonPot {
				big = math.Max(big, math.Abs(null.At(q, k)))
			}
			if big == 0 {
				continue
			}
			for _, sign := range []float64{1, -1} {
				clear(dir)
				for q, j := range w.nonPot {
					dir[j] = sign * stepLen * null.At(q, k) / big
				}
				start := slices.Clone(a)
				for j := range start {
					start[j] += dir[j]
				}
				enqueue(start)
			}
		}
		// And to the neighbouring pots.
		if potVar >= 0 {
			pi := slices.IndexFunc(pots, func(p float64) bool { return same(p, math.Exp(a[potVar])) })
			for _, d := range []int{-1, 1} {
				if pi < 0 || pi+d < 0 || pi+d >= len(pots) || potSteps[pi+d] >= meshPotSteps {
					continue
				}
				start := slices.Clone(a)
				start[potVar] = math.Log(pots[pi+d])
				if enqueue(start) {
					potSteps[pi+d]++
				}
			}
		}
	}
	// Predict about each anchor, once its neighbours' slopes tell how its
	// own change.
	for i := range anchors {
		a := &anchors[i]
		copy(w.jac, a.jac)
		copy(w.r0, a.r0)
		w.predictAround(a.x, a.slaved, a.free, a.freeVals, false, list, w.curvatureAt(anchors, i, potVar, stepLen))
	}
	return list.c
}

// nearestMembers keeps the n of ms nearest x (a log value), in their order.
func nearestMembers(ms []float64, x float64, n int) []float64 {
	for len(ms) > n {
		// Drop the farther end.
		if x-math.Log(ms[0]) > math.Log(ms[len(ms)-1])-x {
			ms = ms[1:]
		} else {
			ms = ms[:len(ms)-1]
		}
	}
	return ms
}
