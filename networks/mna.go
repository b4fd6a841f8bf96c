package networks

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// Solver evaluates a compiled Network by modified nodal analysis. Its
// unknowns are the voltages of the non-ground nodes and the current of the
// source; each Solve stamps the admittance matrix at one frequency and
// factorises it with partial pivoting. A Solver reuses its workspace, so it
// does not allocate per frequency; it is not safe for concurrent use.
type Solver struct {
	names  []string // node names by index; index 0 is ground
	index  map[string]int
	elems  []stamp
	emf    int // index of the node the ideal source sets
	out    int
	vs     int // row of the source's current unknown
	m      int // matrix order
	a      []complex128
	x      []complex128
	solved bool
}

type stamp struct {
	i, j int
	e    Element
}

// Compile checks the network and returns its solver. A floating node (one
// with no path through the elements to ground) is an error naming the node.
func (n *Network) Compile() (*Solver, error) {
	if err := n.check(); err != nil {
		return nil, err
	}
	s := &Solver{index: map[string]int{Ground: 0}, names: []string{Ground}}
	node := func(name string) int {
		if isGround(name) {
			return 0
		}
		if k, ok := s.index[name]; ok {
			return k
		}
		s.index[name] = len(s.names)
		s.names = append(s.names, name)
		return len(s.names) - 1
	}
	flat := n.Flatten()
	drive := node(n.source)
	if n.sourceZ > 0 {
		// The ideal source sits on a hidden node behind its resistance.
		s.emf = node("(source)")
		s.elems = append(s.elems, stamp{s.emf, drive, Element{Name: "source impedance", Kind: Resistor, Value: n.sourceZ}})
	} else {
		s.emf = drive
	}
	for _, e := range flat {
		s.elems = append(s.elems, stamp{node(e.A), node(e.B), e})
	}
	out, ok := s.index[n.out]
	if !ok && !isGround(n.out) {
		return nil, fmt.Errorf("output node %q is not connected to any element", n.out)
	}
	if isGround(n.out) {
		return nil, fmt.Errorf("the output node is the ground node")
	}
	s.out = out
	if err := s.checkFloating(); err != nil {
		return nil, err
	}
	nn := len(s.names) - 1
	s.vs = nn
	s.m = nn + 1
	s.a = make([]complex128, s.m*s.m)
	s.x = make([]complex128, s.m)
	return s, nil
}

// checkFloating finds nodes with no element path to ground. The source
// counts as a path from its node to ground.
func (s *Solver) checkFloating() error {
	uf := newUnionFind(len(s.names))
	find := uf.find
	uf.union(s.emf, 0)
	for _, st := range s.elems {
		uf.union(st.i, st.j)
	}
	var floating []string
	for k := 1; k < len(s.names); k++ {
		if find(k) != find(0) {
			floating = append(floating, s.names[k])
		}
	}
	if len(floating) > 0 {
		sort.Strings(floating)
		return fmt.Errorf("node %q is floating: no element path to ground or the source", floating[0])
	}
	return nil
}

// Nodes returns the names of the non-ground nodes in matrix order.
func (s *Solver) Nodes() []string { return append([]string(nil), s.names[1:]...) }

// Solve computes every node voltage and the source current at frequency f
// (Hz, positive) for a unit source.
func (s *Solver) Solve(f float64) error {
	return s.solve(f, false)
}

// solve stamps and solves; with zeroSource the source is shorted and a unit
// current is injected into the output node instead (for the Thevenin
// impedance).
func (s *Solver) solve(f float64, zeroSource bool) error {
	s.solved = false
	if !(f > 0) || math.IsInf(f, 0) {
		return fmt.Errorf("frequency %v Hz must be positive and finite", f)
	}
	w := 2 * math.Pi * f
	m := s.m
	a := s.a
	for i := range a {
		a[i] = 0
	}
	for i := range s.x {
		s.x[i] = 0
	}
	at := func(r, c int) *complex128 { return &a[(r-1)*m+(c-1)] }
	for k := range s.elems {
		st := &s.elems[k]
		y := st.e.admittance(w)
		if st.i != 0 {
			*at(st.i, st.i) += y
		}
		if st.j != 0 {
			*at(st.j, st.j) += y
		}
		if st.i != 0 && st.j != 0 {
			*at(st.i, st.j) -= y
			*at(st.j, st.i) -= y
		}
	}
	// Source branch: row vs says V(emf) = E; column vs carries its current
	// into the emf node.
	vs := s.vs
	a[(s.emf-1)*m+vs] += 1
	a[vs*m+(s.emf-1)] += 1
	if zeroSource {
		s.x[s.out-1] = 1
	} else {
		s.x[vs] = 1
	}
	if k, ok := luSolve(a, s.x, m); !ok {
		if k < len(s.names)-1 {
			return fmt.Errorf("singular network at %g Hz: node %q has no defined voltage", f, s.names[k+1])
		}
		return fmt.Errorf("singular network at %g Hz: the source is shorted", f)
	}
	s.solved = true
	return nil
}

// Voltage returns the last solution's voltage at node.
func (s *Solver) Voltage(node string) complex128 {
	if isGround(node) {
		return 0
	}
	k, ok := s.index[node]
	if !ok || !s.solved {
		return cmplx.NaN()
	}
	return s.x[k-1]
}

// SourceCurrent returns the last solution's current delivered by the source.
func (s *Solver) SourceCurrent() complex128 {
	if !s.solved {
		return cmplx.NaN()
	}
	return -s.x[s.vs]
}

// Transfer returns V(out)/V(source) at frequency f. It returns NaN for a
// frequency the network cannot be solved at; use Solve for the error.
func (s *Solver) Transfer(f float64) complex128 {
	if s.Solve(f) != nil {
		return cmplx.NaN()
	}
	return s.x[s.out-1]
}

// OutputImpedance returns the impedance seen looking into the output node
// with the source shorted, everything connected to the node included.
func (s *Solver) OutputImpedance(f float64) (complex128, error) {
	if err := s.solve(f, true); err != nil {
		return cmplx.NaN(), err
	}
	s.solved = false
	return s.x[s.out-1], nil
}

// luSolve solves a·x = b in place (b is overwritten by x) by Gaussian
// elimination with partial pivoting. It returns false and the column of a
// vanishing pivot when the matrix is singular.
func luSolve(a, b []complex128, m int) (int, bool) {
	var norm float64
	for _, v := range a {
		if r := cmplx.Abs(v); r > norm {
			norm = r
		}
	}
	tiny := norm * 1e-15
	for k := 0; k < m; k++ {
		p, best := k, abs1(a[k*m+k])
		for r := k + 1; r < m; r++ {
			if v := abs1(a[r*m+k]); v > best {
				p, best = r, v
			}
		}
		if cmplx.Abs(a[p*m+k]) <= tiny {
			return k, false
		}
		if p != k {
			for c := k; c < m; c++ {
				a[k*m+c], a[p*m+c] = a[p*m+c], a[k*m+c]
			}
			b[k], b[p] = b[p], b[k]
		}
		inv := 1 / a[k*m+k]
		for r := k + 1; r < m; r++ {
			l := a[r*m+k] * inv
			if l == 0 {
				continue
			}
			for c := k + 1; c < m; c++ {
				a[r*m+c] -= l * a[k*m+c]
			}
			b[r] -= l * b[k]
		}
	}
	for k := m - 1; k >= 0; k-- {
		v := b[k]
		for c := k + 1; c < m; c++ {
			v -= a[k*m+c] * b[c]
		}
		b[k] = v / a[k*m+k]
	}
	return 0, true
}

// abs1 is |re| + |im|, a cheap pivot size.
func abs1(z complex128) float64 { return math.Abs(real(z)) + math.Abs(imag(z)) }

// GainDB returns 20·log10|V(out)/V(source)| at frequency f, NaN where the
// network cannot be solved.
func (s *Solver) GainDB(f float64) float64 {
	return 20 * math.Log10(cmplx.Abs(s.Transfer(f)))
}
