package synth

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// curvature is how the slopes at an anchor change toward its neighbours:
// the second-order part of the walk's predictions.
//
// A prediction from an anchor's slopes alone errs by half the change of
// the slopes over the way, which 0.4 in log from the anchor is about 1 %
// in frequency where the exact solutions curve fast. The slopes at the
// neighbouring anchors tell how they change: with Δ_k the way to neighbour
// k and J_k its slopes, the slopes a way δ from the anchor are
// J_a + Σ_k w_k (J_k − J_a) with w = pinv(D)·δ (D's columns the Δ_k), exact
// for the directions the Δ_k span when the slopes change linearly. The
// errors a way δ off are then r_a + ½ (J_a + J(δ))·δ (the trapezoid rule,
// exact for errors quadratic in δ).
type curvature struct {
	dJ   [][]float64 // per neighbour: J_k − J_a, (nt+1) × nv
	pinv *mat.Dense  // m × nv: pinv(D)
	w    []float64   // scratch: the weights for one way
}

const (
	curvatureReach = 1.6  // neighbours within this many steps (largest log distance)
	curvatureMax   = 8    // at most this many, the nearest
	curvatureCut   = 0.15 // directions the neighbours span less than this (of the widest) are not used
	// a Newton step of the solved parts longer than this (in log) with the
	// second-order model leaves the first-order prediction standing
	curvatureStepMax = 0.25
)

// meshAnchor is an anchor with the slopes and split measured at it.
type meshAnchor struct {
	x, r0, jac []float64
	slaved     []int
	free       []int
	freeVals   [][]float64
}

// curvatureAt returns the curvature at anchors[i] from the anchors at the
// same pot (potVar, -1 for none) within curvatureReach steps of stepLen,
// or nil when they span no direction.
func (w *walker) curvatureAt(anchors []meshAnchor, i, potVar int, stepLen float64) *curvature {
	nv := len(w.e.vars)
	a := &anchors[i]
	if !finite(a.jac) {
		return nil
	}
	type nb struct {
		k int
		d float64
	}
	var nbs []nb
	for k := range anchors {
		b := &anchors[k]
		if k == i || potVar >= 0 && math.Abs(a.x[potVar]-b.x[potVar]) > 1e-9 || !finite(b.jac) {
			continue
		}
		d := 0.0
		for _, j := range w.nonPot {
			d = math.Max(d, math.Abs(a.x[j]-b.x[j]))
		}
		if d <= curvatureReach*stepLen {
			nbs = append(nbs, nb{k, d})
		}
	}
	if len(nbs) == 0 {
		return nil
	}
	slices.SortStableFunc(nbs, func(p, q nb) int { return cmpFloat(p.d, q.d) })
	nbs = nbs[:min(curvatureMax, len(nbs))]
	m := len(nbs)
	d := mat.NewDense(nv, m, nil)
	c := &curvature{dJ: make([][]float64, m), w: make([]float64, m)}
	for q, n := range nbs {
		b := &anchors[n.k]
		for _, j := range w.nonPot {
			d.Set(j, q, b.x[j]-a.x[j])
		}
		dj := make([]float64, len(a.jac))
		for t := range dj {
			dj[t] = b.jac[t] - a.jac[t]
		}
		c.dJ[q] = dj
	}
	// pinv(D) = V Σ⁺ Uᵀ, the directions spanned too thinly left out.
	var svd mat.SVD
	if !svd.Factorize(d, mat.SVDThin) {
		return nil
	}
	sv := svd.Values(nil)
	if len(sv) == 0 || sv[0] == 0 {
		return nil
	}
	var u, v mat.Dense
	svd.UTo(&u)
	svd.VTo(&v)
	c.pinv = mat.NewDense(m, nv, nil)
	for s, val := range sv {
		if val < curvatureCut*sv[0] {
			continue
		}
		for q := 0; q < m; q++ {
			f := v.At(q, s) / val
			for j := 0; j < nv; j++ {
				c.pinv.Set(q, j, c.pinv.At(q, j)+f*u.At(j, s))
			}
		}
	}
	return c
}

// weights sets c.w to pinv(D)·dx.
func (c *curvature) weights(dx []float64) {
	r, cols := c.pinv.Dims()
	raw := c.pinv.RawMatrix()
	for q := 0; q < r; q++ {
		s := 0.0
		row := raw.Data[q*raw.Stride : q*raw.Stride+cols]
		for j, v := range row {
			s += v * dx[j]
		}
		c.w[q] = s
	}
}

// carry adds to r (the errors and gain a way dx from the anchor, to first
// order) and jac (their slopes in the parts slaved, row-major) the second
// order: ½ Σ_k w_k (J_k − J_a)·dx to r and Σ_k w_k (J_k − J_a) to jac, with
// w = pinv(D)·dx.
func (c *curvature) carry(dx []float64, slaved []int, r, jac []float64) {
	c.weights(dx)
	nv, ns := len(dx), len(slaved)
	for q, wq := range c.w {
		if wq == 0 {
			continue
		}
		dj := c.dJ[q]
		for i := range r {
			row := dj[i*nv : (i+1)*nv]
			r[i] += 0.5 * wq * floats.Dot(row, dx)
			for k, j := range slaved {
				jac[i*ns+k] += wq * row[j]
			}
		}
	}
}

// finite reports whether every value of xs is finite: slopes measured
// where a probe lost the scoop are not.
func finite(xs []float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
