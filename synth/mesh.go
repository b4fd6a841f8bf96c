package synth

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"

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
const (
	meshStep  = 0.7  // largest log change of any part from an anchor to its neighbour (×2)
	meshMerge = 0.5  // a new anchor this close (in steps, largest log distance) to another is one
	meshReach = 0.75 // free values predicted within this many steps of an anchor
	// at most this many of them per part, the nearest: all of an E24
	// series's within reach, a ninth of E96's width of them (the dense
	// series hold close designs everywhere, and their combinations would
	// cost more than the evaluations)
	meshMembers = 13
)

// mesh places up to anchorMax anchors over the exact solutions from the
// branches of x0 (log values, on the targets) at each of pots, predicts the
// combinations of allowed values about each and returns the best keep
// predicted and the anchors. pots are in order of value; potVar is the
// pot's variable, -1 when the network has none.
func (w *walker) mesh(x0 []float64, pots []float64, potVar int, anchorMax, keep int) ([]candidate, [][]float64) {
	e := w.e
	nv := len(e.vars)
	var top []candidate
	var anchors [][]float64
	var queue [][]float64
	x := make([]float64, nv)
	w.mf.moving(w.nonPot)
	defer w.mf.moving(w.slaved)
	restore := func(start []float64, seeded bool) bool {
		copy(x, start)
		w.mf.have = false
		if seeded {
			// The anchor's slopes as the first Jacobian: a step from
			// the anchor starts near the targets, and restore
			// recomputes the Jacobian when a step with it fails.
			p := len(w.nonPot)
			for i := 0; i < w.nt; i++ {
				for k, j := range w.nonPot {
					w.mf.jac[i*p+k] = w.jac[i*nv+j]
				}
			}
			w.mf.have, w.mf.exact = true, false
		}
		_, _, ok := w.mf.restore(x, startSteps)
		return ok
	}
	near := func(y []float64) bool {
		for _, a := range anchors {
			if potVar >= 0 && !same(math.Exp(a[potVar]), math.Exp(y[potVar])) {
				continue
			}
			d := 0.0
			for _, j := range w.nonPot {
				d = math.Max(d, math.Abs(a[j]-y[j]))
			}
			if d < meshMerge*meshStep {
				return true
			}
		}
		return false
	}
	// The starts: each branch at each pot, the nearest pots first.
	byNear := slices.Clone(pots)
	if potVar >= 0 {
		slices.SortStableFunc(byNear, func(a, b float64) int {
			return cmpFloat(math.Abs(math.Log(a)-x0[potVar]), math.Abs(math.Log(b)-x0[potVar]))
		})
	}
	branches := w.branches(x0)
	for _, p := range byNear {
		for _, b := range branches {
			start := slices.Clone(b)
			if potVar >= 0 {
				start[potVar] = math.Log(p)
			}
			if restore(start, false) {
				queue = append(queue, slices.Clone(x))
			}
		}
	}
	// enqueue restores a step from an anchor and queues it when neither the
	// step nor where it lands is near an anchor.
	enqueue := func(start []float64) {
		if !near(start) && restore(start, true) && !near(x) {
			queue = append(queue, slices.Clone(x))
		}
	}
	var null mat.Dense
	var svd mat.SVD
	var jn *mat.Dense
	if len(w.nonPot) > w.nt {
		jn = mat.NewDense(w.nt, len(w.nonPot), nil)
	}
	dir := make([]float64, nv)
	for len(queue) > 0 && len(anchors) < anchorMax {
		a := queue[0]
		queue = queue[1:]
		if near(a) {
			continue
		}
		anchors = append(anchors, a)
		w.slopes(a)
		// Predict about the anchor, solving for its best-conditioned
		// parts.
		sl, fr := w.split()
		fv := make([][]float64, len(fr))
		for q, j := range fr {
			v := &e.vars[j]
			if v.kind == networks.PartPot {
				fv[q] = []float64{math.Exp(a[j])}
			} else {
				fv[q] = nearestMembers(membersNear(v, a[j], meshReach*meshStep), a[j], meshMembers)
			}
		}
		for _, c := range w.predictAround(a, sl, fr, fv, false, keep) {
			top = insertCandidate(w, top, c, keep)
		}
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
					dir[j] = sign * meshStep * null.At(q, k) / big
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
				if pi < 0 || pi+d < 0 || pi+d >= len(pots) {
					continue
				}
				start := slices.Clone(a)
				start[potVar] = math.Log(pots[pi+d])
				enqueue(start)
			}
		}
	}
	return top, anchors
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
