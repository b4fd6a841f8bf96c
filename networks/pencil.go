package networks

import (
	"fmt"
	"math"
	"sort"
)

// pencil is a Network's modified-nodal-analysis equations as a real matrix
// pencil,
//
//	(G + s·C)·x = (b0 + s·b1)·u,
//
// for the source voltage u. Its unknowns x are the voltages of the
// non-ground nodes and one branch current per inductor, whose row is
// V_a − V_b − s·L·I = 0. The source enters in one of two forms:
//
//   - behind a series resistance R_s (> 0) as its Norton equivalent: a
//     conductance 1/R_s from the driven node to ground and the current u/R_s
//     into it (b0 = e_drive/R_s, b1 = 0);
//   - as an ideal source (R_s = 0): the driven node's voltage is u itself, so
//     it is not an unknown; its column moves to the right-hand side
//     (b0 = −G[:, drive], b1 = −C[:, drive]) and its current-balance row, which
//     only fixes the source current, is dropped.
//
// Either way the pencil with u = 0 is the network with the source shorted,
// whose natural frequencies are the poles of V(out)/V(source); and it has no
// loop of capacitors through an ideal source, which would raise the pencil's
// index.
type pencil struct {
	n      int       // order
	g, c   []float64 // n×n, row-major
	b0, b1 []float64
	out    int // the output's unknown; −1 when it is the ideal source's node (H ≡ 1)
	names  []string
	nodes  int   // the first nodes unknowns are node voltages, the rest inductor currents
	caps   []int // nodes (unknown indices) touched by a capacitor, ascending
	// grounded marks the nodes with a capacitor to ground or to the ideal
	// source's node.
	grounded map[int]bool
}

// pencilOf builds the pencil of a network that Compile accepts.
func pencilOf(n *Network) (*pencil, error) {
	if err := n.check(); err != nil {
		return nil, err
	}
	flat := n.Flatten()
	ideal := n.sourceZ == 0
	drive := n.source
	index := map[string]int{}
	var names []string
	// node returns an element terminal's unknown: −1 for ground, −2 for the
	// ideal source's node.
	node := func(name string) int {
		if isGround(name) {
			return -1
		}
		if ideal && name == drive {
			return -2
		}
		if k, ok := index[name]; ok {
			return k
		}
		index[name] = len(names)
		names = append(names, name)
		return len(names) - 1
	}
	if !ideal {
		node(drive)
	}
	for _, e := range flat {
		node(e.A)
		node(e.B)
	}
	nodes := len(names)
	nl := 0
	for _, e := range flat {
		if e.Kind == Inductor {
			names = append(names, "I("+e.Name+")")
			nl++
		}
	}
	p := &pencil{n: nodes + nl, names: names, nodes: nodes}
	m := p.n
	p.g = make([]float64, m*m)
	p.c = make([]float64, m*m)
	p.b0 = make([]float64, m)
	p.b1 = make([]float64, m)
	// stampTo adds v·(e_i − e_j)(e_i − e_j)ᵀ to mat, moving the ideal
	// source's column to rhs with its sign changed.
	stampTo := func(mat, rhs []float64, i, j int, v float64) {
		for _, r := range [2][2]int{{i, j}, {j, i}} {
			a, b := r[0], r[1]
			if a < 0 {
				continue
			}
			mat[a*m+a] += v
			switch {
			case b >= 0:
				mat[a*m+b] -= v
			case b == -2:
				rhs[a] += v // −(−v)·u moved to the right
			}
		}
	}
	if !ideal {
		d := index[drive]
		p.g[d*m+d] += 1 / n.sourceZ
		p.b0[d] = 1 / n.sourceZ
	}
	capNode := map[int]bool{}
	p.grounded = map[int]bool{}
	k := nodes
	for _, e := range flat {
		i, j := node(e.A), node(e.B)
		switch e.Kind {
		case Resistor:
			stampTo(p.g, p.b0, i, j, 1/e.Value)
		case Capacitor:
			stampTo(p.c, p.b1, i, j, e.Value)
			for _, q := range [2][2]int{{i, j}, {j, i}} {
				if q[0] >= 0 {
					capNode[q[0]] = true
					if q[1] < 0 {
						p.grounded[q[0]] = true
					}
				}
			}
		case Inductor:
			// KCL: the branch current leaves A and enters B.
			// Branch row: V_A − V_B − s·L·I = 0.
			for _, t := range [2]struct {
				q    int
				sign float64
			}{{i, 1}, {j, -1}} {
				switch {
				case t.q >= 0:
					p.g[t.q*m+k] += t.sign
					p.g[k*m+t.q] += t.sign
				case t.q == -2:
					p.b0[k] -= t.sign
				}
			}
			p.c[k*m+k] -= e.Value
			k++
		}
	}
	for q := range capNode {
		p.caps = append(p.caps, q)
	}
	sort.Ints(p.caps)
	switch {
	case isGround(n.out):
		return nil, fmt.Errorf("the output node is the ground node")
	case ideal && n.out == drive:
		p.out = -1
	default:
		o, ok := index[n.out]
		if !ok {
			return nil, fmt.Errorf("output node %q is not connected to any element", n.out)
		}
		p.out = o
	}
	return p, nil
}

// factorC writes the pencil's C as U·Vᵀ with U and V of full column rank r,
// the number of independent capacitor voltages and inductor currents (its
// exact rank, found from the circuit's graph rather than numerically):
//
//   - the capacitors fall into groups of nodes joined by capacitors. In a
//     group that reaches ground (or the ideal source's node) every node is a
//     coordinate; in one that does not, the voltages relative to one of its
//     nodes are. In those coordinates y the group's capacitance matrix W
//     (the nodal matrix without the reference row and column) is positive
//     definite and C = S·W·Sᵀ, where S maps node voltages to y. With the
//     Cholesky factor W = L·Lᵀ, U = V = S·L: the coordinates are scaled by
//     the square roots of the capacitances, so no part's size dominates;
//   - an inductor's row adds −L on the diagonal: U = −√L·e_k, V = √L·e_k.
//
// U and V are n×r, row-major, returned with r.
func (p *pencil) factorC() (u, v []float64, r int, err error) {
	m := p.n
	// Groups of capacitor-joined nodes; the ground and the ideal source's
	// node are the group "grounded".
	uf := newUnionFind(m + 1) // m is ground
	find := uf.find
	for _, i := range p.caps {
		for _, j := range p.caps {
			if j != i && p.c[i*m+j] != 0 {
				uf.union(i, j)
			}
		}
		if p.grounded[i] {
			uf.union(i, m)
		}
	}
	groups := map[int][]int{}
	var roots []int
	for _, i := range p.caps {
		rt := find(i)
		if _, ok := groups[rt]; !ok {
			roots = append(roots, rt)
		}
		groups[rt] = append(groups[rt], i)
	}
	var cols [][]float64 // columns of U (= V for the capacitor part)
	for _, rt := range roots {
		g := groups[rt]
		ref := -1
		coords := g
		if rt != find(m) {
			ref, coords = g[0], g[1:]
		}
		q := len(coords)
		if q == 0 {
			continue
		}
		w := make([]float64, q*q)
		for a, i := range coords {
			for b, j := range coords {
				w[a*q+b] = p.c[i*m+j]
			}
		}
		l, ok := cholesky(w, q)
		if !ok {
			return nil, nil, 0, fmt.Errorf("the capacitors at node %q have no positive-definite capacitance matrix", p.names[coords[0]])
		}
		// Column b of S·L: Σ_a L[a][b]·(e_coords[a] − e_ref).
		for b := 0; b < q; b++ {
			col := make([]float64, m)
			for a := b; a < q; a++ {
				col[coords[a]] += l[a*q+b]
				if ref >= 0 {
					col[ref] -= l[a*q+b]
				}
			}
			cols = append(cols, col)
		}
	}
	nc := len(cols)
	for k := p.nodes; k < m; k++ {
		col := make([]float64, m)
		col[k] = math.Sqrt(-p.c[k*m+k])
		cols = append(cols, col)
	}
	r = len(cols)
	u = make([]float64, m*r)
	v = make([]float64, m*r)
	for j, col := range cols {
		for i := 0; i < m; i++ {
			v[i*r+j] = col[i]
			u[i*r+j] = col[i]
			if j >= nc {
				u[i*r+j] = -col[i]
			}
		}
	}
	return u, v, r, nil
}

// cholesky returns the lower-triangular L with L·Lᵀ = w (q×q, row-major),
// false when w is not numerically positive definite.
func cholesky(w []float64, q int) ([]float64, bool) {
	l := make([]float64, q*q)
	for j := 0; j < q; j++ {
		d := w[j*q+j]
		for k := 0; k < j; k++ {
			d -= l[j*q+k] * l[j*q+k]
		}
		if !(d > 1e-14*w[j*q+j]) {
			return nil, false
		}
		d = math.Sqrt(d)
		l[j*q+j] = d
		for i := j + 1; i < q; i++ {
			s := w[i*q+j]
			for k := 0; k < j; k++ {
				s -= l[i*q+k] * l[j*q+k]
			}
			l[i*q+j] = s / d
		}
	}
	return l, true
}
