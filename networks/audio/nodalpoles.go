package audio

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mat"

	"tonewright/networks"
)

// NodalPoles returns the finite poles, in rad/s, of V(out)/V(source) of a
// network of resistors and capacitors: the natural frequencies of the
// network with its source shorted, the roots s of det(G + s·C) = 0 with G
// and C the nodal conductance and capacitance matrices, whose roots it finds as eigenvalues (see below). It refuses inductors. It is a
// stand-in until the networks package computes poles from its own pencil.
func NodalPoles(n *networks.Network) ([]complex128, error) {
	index := map[string]int{}
	m := 0 // nodes with an unknown voltage
	src, zs := n.Source()
	ground := func(s string) bool { return s == networks.Ground || s == "gnd" || s == "GND" }
	node := func(s string) int {
		if ground(s) {
			return -1
		}
		if k, ok := index[s]; ok {
			return k
		}
		index[s] = m
		m++
		return index[s]
	}
	type br struct {
		i, j int
		g, c float64
	}
	var brs []br
	if zs > 0 {
		// With the source shorted, its emf node is ground.
		brs = append(brs, br{i: -1, j: node(src), g: 1 / zs})
	} else {
		index[src] = -2 // the source's node is held at 0 V
	}
	for _, e := range n.Flatten() {
		i, j := node(e.A), node(e.B)
		switch e.Kind {
		case networks.Resistor:
			brs = append(brs, br{i: i, j: j, g: 1 / e.Value})
		case networks.Capacitor:
			brs = append(brs, br{i: i, j: j, c: e.Value})
		default:
			return nil, fmt.Errorf("%s %s: poles are found for resistor and capacitor networks only", e.Kind, e.Name)
		}
	}
	if m == 0 {
		return nil, nil
	}
	G, C := mat.NewDense(m, m, nil), mat.NewDense(m, m, nil)
	stampM := func(a *mat.Dense, i, j int, v float64) {
		if i >= 0 {
			a.Set(i, i, a.At(i, i)+v)
		}
		if j >= 0 {
			a.Set(j, j, a.At(j, j)+v)
		}
		if i >= 0 && j >= 0 {
			a.Set(i, j, a.At(i, j)-v)
			a.Set(j, i, a.At(j, i)-v)
		}
	}
	for _, b := range brs {
		stampM(G, b.i, b.j, b.g)
		stampM(C, b.i, b.j, b.c)
	}
	// With a shift σ that is not a pole (σ > 0; the poles of a passive
	// network lie in the left half plane), (G + sC)v = 0 becomes
	// (G + σC)⁻¹C·v = v/(σ − s): the eigenvalues λ of M = (G + σC)⁻¹C give
	// s = σ − 1/λ, and λ = 0 belongs to a pole at infinity.
	sigma := 2 * math.Pi * 1000
	var K mat.Dense
	K.Scale(sigma, C)
	K.Add(&K, G)
	var A mat.Dense
	if err := A.Solve(&K, C); err != nil {
		return nil, fmt.Errorf("a node has no path to ground: %v", err)
	}
	var eig mat.Eigen
	if !eig.Factorize(&A, mat.EigenNone) {
		return nil, fmt.Errorf("the pole computation did not converge")
	}
	lambdas := eig.Values(nil)
	var big float64
	for _, l := range lambdas {
		big = math.Max(big, cmplx.Abs(l))
	}
	var out []complex128
	for _, l := range lambdas {
		if cmplx.Abs(l) > 1e-10*big {
			out = append(out, complex(sigma, 0)-1/l)
		}
	}
	return out, nil
}
