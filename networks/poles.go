package networks

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// shifted is a network's pencil reduced at a real shift σ: with
// Z = (G + σC)⁻¹ and C = U·Vᵀ (pencil.factorC),
//
//	K = Vᵀ·Z·U                      (r×r)
//	bk0 = Vᵀ·Z·b0, bk1 = Vᵀ·Z·b1    (r)
//	ck = e_outᵀ·Z·U                 (r)
//	h0 = e_outᵀ·Z·b0, h1 = e_outᵀ·Z·b1.
//
// The eigenvalues of K are the non-zero eigenvalues μ of the shift-and-invert
// matrix M = (G + σC)⁻¹·C, since M = (Z·U)·Vᵀ and K = Vᵀ·(Z·U) share their
// non-zero eigenvalues; a pole s satisfies μ = 1/(σ − s). Forming K rather
// than M drops the null space of C exactly, so no eigenvalue has to be
// judged "infinite" by its size.
type shifted struct {
	sigma    float64
	r        int
	k        []float64
	bk0, bk1 []float64
	ck       []float64
	h0, h1   float64
	cond     float64 // condition number estimate of G + σC
}

// maxShiftCond is the largest condition number of G + σC accepted for a
// shift; past it another shift is tried.
const maxShiftCond = 1e15

// reduce forms the reduction at shift sigma.
func (p *pencil) reduce(u, v []float64, r int, sigma float64) (*shifted, error) {
	m := p.n
	a := mat.NewDense(m, m, nil)
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			a.Set(i, j, p.g[i*m+j]+sigma*p.c[i*m+j])
		}
	}
	var lu mat.LU
	lu.Factorize(a)
	cond := lu.Cond()
	if math.IsInf(cond, 1) || math.IsNaN(cond) || cond > maxShiftCond {
		return nil, fmt.Errorf("G + σC is singular or ill-conditioned at σ = %g (condition %g)", sigma, cond)
	}
	// Right-hand sides: the columns of U, then b0 and b1.
	rhs := mat.NewDense(m, r+2, nil)
	for i := 0; i < m; i++ {
		for j := 0; j < r; j++ {
			rhs.Set(i, j, u[i*r+j])
		}
		rhs.Set(i, r, p.b0[i])
		rhs.Set(i, r+1, p.b1[i])
	}
	var x mat.Dense
	if err := lu.SolveTo(&x, false, rhs); err != nil {
		return nil, fmt.Errorf("G + σC at σ = %g: %v", sigma, err)
	}
	s := &shifted{sigma: sigma, r: r, cond: cond,
		k: make([]float64, r*r), bk0: make([]float64, r), bk1: make([]float64, r), ck: make([]float64, r)}
	for i := 0; i < r; i++ {
		for j := 0; j < r+2; j++ {
			var t float64
			for q := 0; q < m; q++ {
				t += v[q*r+i] * x.At(q, j)
			}
			switch {
			case j < r:
				s.k[i*r+j] = t
			case j == r:
				s.bk0[i] = t
			default:
				s.bk1[i] = t
			}
		}
	}
	if p.out >= 0 {
		for j := 0; j < r; j++ {
			s.ck[j] = x.At(p.out, j)
		}
		s.h0, s.h1 = x.At(p.out, r), x.At(p.out, r+1)
	}
	return s, nil
}

// eigenvalues returns the eigenvalues of the r×r row-major matrix k.
func eigenvalues(k []float64, r int) ([]complex128, error) {
	if r == 0 {
		return nil, nil
	}
	var e mat.Eigen
	if !e.Factorize(mat.NewDense(r, r, append([]float64(nil), k...)), mat.EigenNone) {
		return nil, fmt.Errorf("the eigenvalue iteration did not converge")
	}
	return e.Values(nil), nil
}

// shiftScale returns a first shift: the geometric mean of the rates the
// parts set on their own, conductance over capacitance and resistance over
// inductance, with the network's conductances and capacitances each taken
// at their geometric mean.
func (n *Network) shiftScale() float64 {
	var lg, lc, ll float64
	var ng, nc, nl int
	if n.sourceZ > 0 {
		lg -= math.Log(n.sourceZ)
		ng++
	}
	for _, e := range n.Flatten() {
		switch e.Kind {
		case Resistor:
			lg -= math.Log(e.Value)
			ng++
		case Capacitor:
			lc += math.Log(e.Value)
			nc++
		case Inductor:
			ll += math.Log(e.Value)
			nl++
		}
	}
	g := 0.0 // log of the mean conductance
	if ng > 0 {
		g = lg / float64(ng)
	}
	var rates []float64
	if nc > 0 {
		rates = append(rates, g-lc/float64(nc))
	}
	if nl > 0 {
		rates = append(rates, -g-ll/float64(nl))
	}
	if len(rates) == 0 {
		return 2 * math.Pi * 1000
	}
	var t float64
	for _, r := range rates {
		t += r
	}
	return math.Exp(t / float64(len(rates)))
}

// analysis is the pencil of a network with its factorisation of C and the
// reduction at a well-chosen shift.
type analysis struct {
	p      *pencil
	u, v   []float64
	r      int
	s      *shifted
	poles  []complex128
	solver *Solver // the same network's nodal solver
}

// analyse builds the pencil and reduces it, choosing the shift in two
// rounds: first from the parts' values (shiftScale), then at the
// geometric mean of the smallest and largest non-zero pole found, which
// balances the relative accuracy of the extreme poles (see Poles). A shift
// at which G + σC is ill-conditioned is replaced by one a decade off.
func (n *Network) analyse() (*analysis, error) {
	p, err := pencilOf(n)
	if err != nil {
		return nil, err
	}
	solver, err := n.Compile() // also finds floating nodes, named
	if err != nil {
		return nil, err
	}
	u, v, r, err := p.factorC()
	if err != nil {
		return nil, err
	}
	an := &analysis{p: p, u: u, v: v, r: r, solver: solver}
	if p.out < 0 {
		return an, nil // the output is the ideal source's node: H = 1, no poles
	}
	sigma := n.shiftScale()
	if err := an.at(sigma); err != nil {
		return nil, err
	}
	// Poles at the origin (a node joined to the rest by capacitors only
	// holds its charge) come out as rounding noise and say nothing of the
	// scale.
	sigma = an.s.sigma
	lo, hi := math.Inf(1), 0.0
	for _, q := range an.poles {
		a := cmplx.Abs(q)
		if a > 1e-9*sigma {
			lo, hi = math.Min(lo, a), math.Max(hi, a)
		}
	}
	if hi > 0 {
		next := math.Sqrt(lo * hi)
		if next > 10*sigma || next < sigma/10 {
			first := *an
			if err := an.at(next); err != nil {
				*an = first
			}
		}
	}
	return an, nil
}

// at reduces the pencil at sigma, or at the nearest of a few shifts a
// decade apart where G + σC is well-conditioned, and finds the poles.
func (an *analysis) at(sigma float64) error {
	var err error
	for _, f := range []float64{1, 10, 0.1, 100, 0.01, 3.7, 0.27} {
		var s *shifted
		if s, err = an.p.reduce(an.u, an.v, an.r, sigma*f); err != nil {
			continue
		}
		mu, err2 := eigenvalues(s.k, s.r)
		if err2 != nil {
			err = err2
			continue
		}
		poles := make([]complex128, 0, len(mu))
		var big float64
		for _, x := range mu {
			big = math.Max(big, cmplx.Abs(x))
		}
		for _, x := range mu {
			if cmplx.Abs(x) <= infiniteEigen*big {
				continue
			}
			poles = append(poles, complex(s.sigma, 0)-1/x)
		}
		an.s, an.poles = s, poles
		return nil
	}
	return fmt.Errorf("no usable shift near %g rad/s: %v", sigma, err)
}

// infiniteEigen is the relative size below which an eigenvalue μ of the
// shift-and-invert matrix counts as zero, a pole at infinity: μ = 1/(σ − s),
// so such a pole would lie beyond 10¹⁴·σ.
const infiniteEigen = 1e-14

// Poles returns the finite poles of V(out)/V(source) in rad/s (s-plane),
// sorted by magnitude, then by imaginary part.
//
// Method: shift and invert on the network's modified-nodal-analysis pencil
// (G + sC)·x = b·u with the source shorted (see pencil). For a real shift
// σ > 0 — a passive network has no pole in the right half-plane, so G + σC
// is regular there; shifts are retried a decade off when it is
// ill-conditioned (condition number above 10¹⁵) — the eigenvalues μ of
// M = (G + σC)⁻¹·C give the poles s = σ − 1/μ. gonum's mat.Eigen computes μ
// from the equivalent r×r matrix K = Vᵀ(G + σC)⁻¹U, where C = U·Vᵀ is a
// factorisation of exact rank r read from the circuit's graph (pencil.factorC):
// the zero eigenvalues of M that C's null space brings (the poles at
// infinity) never appear. An eigenvalue below 10⁻¹⁴ of the largest still
// counts as a pole at infinity (beyond 10¹⁴·σ) and is dropped. The shift is
// placed at the geometric mean of the extreme poles (after a first round
// from the parts' values), so a pole ρ times faster or slower than σ has a
// relative error of about ρ times the rounding unit.
//
// These are the natural frequencies of the network as seen from its
// source: a mode that the source cannot excite or the output cannot see
// (say, a section isolated by a balanced bridge) is still listed, and the
// transfer function's zeros then include the same value. A consumer that
// evaluates the poles and zeros together, or fits residues, is not
// affected.
func (n *Network) Poles() ([]complex128, error) {
	an, err := n.analyse()
	if err != nil {
		return nil, err
	}
	out := append([]complex128(nil), an.poles...)
	sortRoots(out)
	return out, nil
}

// sortRoots sorts by magnitude, then imaginary part.
func sortRoots(z []complex128) {
	sort.Slice(z, func(i, j int) bool {
		a, b := cmplx.Abs(z[i]), cmplx.Abs(z[j])
		if a != b {
			return a < b
		}
		return imag(z[i]) < imag(z[j])
	})
}
