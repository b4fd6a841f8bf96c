package synth

import (
	"math"
	"testing"
)

// For errors quadratic in the log values, the slopes change linearly, and
// the curvature from the neighbours' slopes predicts the errors anywhere
// in the directions the neighbours span exactly: J(δ) = J_a + H·δ, and
// r(δ) = r_a + ½ (J_a + J(δ))·δ is the trapezoid rule, exact for a
// quadratic (textbook calculus: the error term is −(h³/12)·f‴).
func TestCurvatureExactForQuadratics(t *testing.T) {
	const nv, rows = 3, 2
	w := &walker{e: &evaluator{vars: make([]variable, nv)}, nonPot: []int{0, 1, 2}}
	// r_i(x) = g_i·x + ½ xᵀ H_i x, symmetric H_i.
	g := [rows][nv]float64{{1, -2, 0.5}, {0.3, 0.7, -1}}
	h := [rows][nv][nv]float64{
		{{0.8, 0.2, -0.1}, {0.2, -0.5, 0.3}, {-0.1, 0.3, 0.4}},
		{{-0.3, 0.6, 0.1}, {0.6, 0.2, -0.2}, {0.1, -0.2, 0.9}},
	}
	r := func(x []float64) []float64 {
		out := make([]float64, rows)
		for i := range out {
			for j := 0; j < nv; j++ {
				out[i] += g[i][j] * x[j]
				for k := 0; k < nv; k++ {
					out[i] += 0.5 * x[j] * h[i][j][k] * x[k]
				}
			}
		}
		return out
	}
	jac := func(x []float64) []float64 {
		out := make([]float64, rows*nv)
		for i := 0; i < rows; i++ {
			for j := 0; j < nv; j++ {
				out[i*nv+j] = g[i][j]
				for k := 0; k < nv; k++ {
					out[i*nv+j] += h[i][j][k] * x[k]
				}
			}
		}
		return out
	}
	at := func(x ...float64) meshAnchor { return meshAnchor{x: x, r0: r(x), jac: jac(x)} }
	// An anchor and four neighbours spanning the first two directions.
	anchors := []meshAnchor{at(0.1, -0.2, 0.05), at(0.8, -0.2, 0.05), at(-0.6, -0.2, 0.05), at(0.1, 0.5, 0.05), at(0.1, -0.9, 0.05)}
	c := w.curvatureAt(anchors, 0, -1, 0.7)
	if c == nil {
		t.Fatal("no curvature from four neighbours")
	}
	a := anchors[0]
	for _, d := range [][]float64{{0.4, 0, 0}, {0, -0.35, 0}, {0.3, 0.3, 0}, {-0.5, 0.2, 0}} {
		x := make([]float64, nv)
		for j := range x {
			x[j] = a.x[j] + d[j]
		}
		c.weights(d)
		want := r(x)
		for i := 0; i < rows; i++ {
			lin, quad := a.r0[i], a.r0[i]
			for j := 0; j < nv; j++ {
				jd := a.jac[i*nv+j]
				for q, wq := range c.w {
					jd += wq * c.dJ[q][i*nv+j]
				}
				lin += a.jac[i*nv+j] * d[j]
				quad += 0.5 * (a.jac[i*nv+j] + jd) * d[j]
			}
			if math.Abs(quad-want[i]) > 1e-12 {
				t.Errorf("way %v, error %d: predicted %.15g, exact %.15g", d, i, quad, want[i])
			}
			if math.Abs(lin-want[i]) < 1e-3 {
				t.Errorf("way %v, error %d: the slopes alone already predict it (%.6g): not a test of the curvature", d, i, lin)
			}
		}
	}
}
