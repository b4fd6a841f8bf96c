package networks

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// errNoTransfer is returned when the output does not depend on the source.
var errNoTransfer = errors.New("the output does not depend on the source: no path carries the signal to it")

// zeros returns the finite transmission zeros of the reduced pencil, the
// finite eigenvalues of the Rosenbrock pencil [[G + sC, −b], [cᵀ, 0]], as a
// zeroSet: those surely finite, and the candidates for zeros at infinity.
//
// Method. In the variable λ = 1/(σ − s) the reduction (shifted) is an
// ordinary state space with a direct term:
//
//	H = H(σ) + ck·(λI − K)⁻¹·b̂,  b̂ = bk0 + σ·bk1 − K⁻¹·bk1,  H(σ) = h0 + σ·h1.
//
// (From [I + (s − σ)K]·z = bk0 + s·bk1 for z = Vᵀx and s − σ = −1/λ:
// (λI − K)·z = λ·(bk0 + σ·bk1) − bk1, and y = h0 + s·h1 + ck·z/λ; the terms
// in 1/λ cancel because H is proper.) With the direct term H(σ) ≠ 0, the
// zeros in λ are exactly the eigenvalues of K_z = K − b̂·ck/H(σ) (the
// standard result for a state space with an invertible direct term: they
// are the poles of 1/H), and each maps back to s = σ − 1/λ.
//
// A zero of H at infinity of order d is a d-fold eigenvalue λ = 0 of K_z,
// which rounding spreads into a ring of radius about ε^(1/d) times K_z's
// size. An eigenvalue is a candidate for such a zero when it lies within
// 100 times its own first-order error bound, κ·ε·(‖K‖ + ‖b̂‖·‖ck‖/|H(σ)|)
// (κ its condition number from its left and right eigenvectors), of
// λ = 0: it cannot be told from infinity. Candidates that stand above the
// rest past a gap of more than a factor 3 in size are judged finite: a
// finite zero beside the ring has its condition number inflated by it. A
// near-multiple eigenvalue (multiple) is never a candidate: its condition
// number says nothing. ZPK.fit settles the candidates against the nodal
// solver.
func (s *shifted) zeros() (z zeroSet, err error) {
	r := s.r
	hs := s.h0 + s.sigma*s.h1
	if r == 0 {
		if hs == 0 {
			return z, errNoTransfer
		}
		return z, nil
	}
	bh := make([]float64, r)
	for i := range bh {
		bh[i] = s.bk0[i] + s.sigma*s.bk1[i]
	}
	if norm2(s.bk1) > 0 {
		x, err := solveMinNorm(s.k, s.bk1, r)
		if err != nil {
			return z, err
		}
		for i := range bh {
			bh[i] -= x[i]
		}
	}
	if hs == 0 {
		// Exactly zero: no path carries the signal (a zero of H that
		// happened to fall on σ would leave rounding behind).
		return z, errNoTransfer
	}
	if math.IsNaN(hs) || math.IsInf(hs, 0) {
		return z, fmt.Errorf("the transfer at the shift σ = %g rad/s is %v", s.sigma, hs)
	}
	kz := make([]float64, r*r)
	for i := 0; i < r; i++ {
		for j := 0; j < r; j++ {
			v := s.k[i*r+j] - bh[i]*s.ck[j]/hs
			kz[i*r+j] = v
		}
	}
	// The scale of K_z's rounding is that of the terms it is the
	// difference of, not its own (which vanishes for a zero at infinity).
	fro := norm2(s.k) + norm2(bh)*norm2(s.ck)/math.Abs(hs)
	var e mat.Eigen
	if !e.Factorize(mat.NewDense(r, r, kz), mat.EigenBoth) {
		return z, fmt.Errorf("the eigenvalue iteration did not converge")
	}
	lam := e.Values(nil)
	var vr, vl mat.CDense
	e.VectorsTo(&vr)
	e.LeftVectorsTo(&vl)
	const eps = 0x1p-52
	// Candidates for zeros at infinity: eigenvalues within 100 times their
	// first-order error bound of λ = 0.
	var cand []int
	for i, l := range lam {
		if l == 0 {
			cand = append(cand, i) // exactly at infinity (an inductor with a dangling end)
			continue
		}
		if multiple(lam, i) {
			continue
		}
		var dot complex128
		var nr, nl float64
		for q := 0; q < r; q++ {
			a, b := vr.At(q, i), vl.At(q, i)
			dot += cmplx.Conj(b) * a
			nr += real(a)*real(a) + imag(a)*imag(a)
			nl += real(b)*real(b) + imag(b)*imag(b)
		}
		kappa := math.Sqrt(nr*nl) / cmplx.Abs(dot)
		if !(cmplx.Abs(l) > 100*kappa*eps*fro) {
			cand = append(cand, i)
		}
	}
	// The zeros at infinity form one ring around λ = 0, its members of
	// similar size. A finite zero beside the ring, whose condition number
	// the ring inflates, stands above it past a gap wider than a factor 3:
	// from the largest candidate down, those past such a gap are kept, and
	// the rest, from the first pair without one, are the ring.
	sort.Slice(cand, func(a, b int) bool { return cmplx.Abs(lam[cand[a]]) > cmplx.Abs(lam[cand[b]]) })
	top := 0
	for top < len(cand) {
		// A conjugate pair is one level: compare with the next smaller one.
		size := cmplx.Abs(lam[cand[top]])
		next := top + 1
		for next < len(cand) && cmplx.Abs(lam[cand[next]]) >= size*(1-1e-9) {
			next++
		}
		if next == len(cand) || size <= 3*cmplx.Abs(lam[cand[next]]) {
			break
		}
		top = next
	}
	for i, l := range lam {
		if !slices.Contains(cand, i) {
			z.sure = append(z.sure, complex(s.sigma, 0)-1/l)
		}
	}
	for _, i := range cand {
		if lam[i] == 0 {
			continue // exactly at infinity: never a finite zero
		}
		z.cand = append(z.cand, complex(s.sigma, 0)-1/lam[i])
	}
	z.keep = min(top, len(z.cand))
	return z, nil
}

// zeroSet is the outcome of shifted.zeros: the zeros that are surely
// finite, and the candidates for zeros at infinity ordered from the
// smallest |s| up, of which the first keep are judged finite.
type zeroSet struct {
	sure, cand []complex128
	keep       int
}

// with returns the zeros when the first j candidates are finite.
func (z zeroSet) with(j int) []complex128 {
	return append(append([]complex128(nil), z.sure...), z.cand[:j]...)
}

// multiple reports whether lam[i] has another eigenvalue within 5 % of its
// size: a multiple zero (say two coupling capacitors' double zero at s = 0)
// whose eigenvalues rounding splits only slightly, and whose condition
// numbers are therefore useless. The eigenvalues of a zero at infinity of
// order d lie on a ring around 0, neighbours 2·sin(π/d) of its radius apart,
// more than 5 % for any d below 120.
func multiple(lam []complex128, i int) bool {
	for j, m := range lam {
		if j != i && cmplx.Abs(m-lam[i]) <= 0.05*cmplx.Abs(lam[i]) && !(imag(m) == -imag(lam[i]) && imag(m) != 0 && real(m) == real(lam[i])) {
			return true
		}
	}
	return false
}

func norm2(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x * x
	}
	return math.Sqrt(s)
}

// solveMinNorm solves K·x = b (K r×r, row-major) by LU, or, when K is
// singular, which a node reached through inductors alone makes it (a pole
// at infinity that C's factorisation cannot see), by the pseudo-inverse
// from the singular value decomposition, singular values below 10⁻¹³ of
// the largest taken as zero: H being proper, b lies in K's range.
func solveMinNorm(k, b []float64, r int) ([]float64, error) {
	km := mat.NewDense(r, r, append([]float64(nil), k...))
	var lu mat.LU
	lu.Factorize(km)
	var x mat.VecDense
	if lu.Cond() < 1e13 {
		if err := lu.SolveVecTo(&x, false, mat.NewVecDense(r, append([]float64(nil), b...))); err == nil {
			return x.RawVector().Data, nil
		}
	}
	var svd mat.SVD
	if !svd.Factorize(km, mat.SVDThin) {
		return nil, fmt.Errorf("the singular value decomposition of the reduced pencil did not converge")
	}
	var u, v mat.Dense
	svd.UTo(&u)
	svd.VTo(&v)
	sv := svd.Values(nil)
	out := make([]float64, r)
	for j, sj := range sv {
		if !(sj > 1e-13*sv[0]) {
			break
		}
		var c float64
		for i := 0; i < r; i++ {
			c += u.At(i, j) * b[i]
		}
		c /= sj
		for i := 0; i < r; i++ {
			out[i] += v.At(i, j) * c
		}
	}
	return out, nil
}
