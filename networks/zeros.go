package networks

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// errNoTransfer is returned when the output does not depend on the source.
var errNoTransfer = errors.New("the output does not depend on the source: no path carries the signal to it")

// zeros returns the finite transmission zeros of the reduced pencil: the
// finite eigenvalues of the Rosenbrock pencil [[G + sC, −b], [cᵀ, 0]].
//
// Method. In the variable λ = 1/(σ − s) the reduction (shifted) is an
// ordinary state space with a direct term:
//
//	H = H(σ) + ck·(λI − K)⁻¹·b̂,  b̂ = bk0 + σ·bk1 − K⁻¹·bk1,  H(σ) = h0 + σ·h1.
//
// (From [I + (s − σ)K]·z = bk0 + s·bk1 for z = Vᵀx and s − σ = −1/λ:
// (λI − K)·z = λ·(bk0 + σ·bk1) − bk1, and y = h0 + s·h1 + ck·z/λ; the terms
// in 1/λ cancel because H is proper.) With the direct term H(σ) ≠ 0 (σ is
// no zero), the zeros in λ are exactly the eigenvalues of
// K_z = K − b̂·ck/H(σ), and each maps back to s = σ − 1/λ. A zero of H at
// infinity of order d is a d-fold eigenvalue λ = 0 of K_z, which rounding
// spreads into a small cluster of radius about (ε·‖K_z‖)^(1/d)·‖K_z‖^(1−1/d).
// An eigenvalue is taken for such a zero at infinity when it lies within
// 100 times its own first-order error bound, κ·ε·(‖K‖ + ‖b̂‖·‖ck‖/|H(σ)|)
// (κ the eigenvalue's
// condition number from its left and right eigenvectors), of λ = 0: it
// cannot be told from infinity, and a finite zero that far out
// (|s| ≳ σ/(100·κ·ε)) changes H in the band by no more than that bound.
func (s *shifted) zeros() ([]complex128, error) {
	r := s.r
	hs := s.h0 + s.sigma*s.h1
	if r == 0 {
		if hs == 0 {
			return nil, errNoTransfer
		}
		return nil, nil
	}
	bh := make([]float64, r)
	for i := range bh {
		bh[i] = s.bk0[i] + s.sigma*s.bk1[i]
	}
	if norm2(s.bk1) > 0 {
		var lu mat.LU
		lu.Factorize(mat.NewDense(r, r, append([]float64(nil), s.k...)))
		var x mat.VecDense
		if err := lu.SolveVecTo(&x, false, mat.NewVecDense(r, append([]float64(nil), s.bk1...))); err != nil {
			return nil, fmt.Errorf("the reduced pencil is singular: %v", err)
		}
		for i := range bh {
			bh[i] -= x.AtVec(i)
		}
	}
	if hs == 0 || math.IsNaN(hs) {
		if norm2(s.ck) == 0 || norm2(bh) == 0 {
			return nil, errNoTransfer
		}
		return nil, fmt.Errorf("the shift σ = %g rad/s is a zero of the transfer", s.sigma)
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
		return nil, fmt.Errorf("the eigenvalue iteration did not converge")
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
	infinite := make([]bool, r)
	top := 0
	for top+1 < len(cand) && cmplx.Abs(lam[cand[top]]) > 3*cmplx.Abs(lam[cand[top+1]]) {
		top++
	}
	for _, i := range cand[top:] {
		infinite[i] = true
	}
	out := make([]complex128, 0, r)
	for i, l := range lam {
		if !infinite[i] {
			out = append(out, complex(s.sigma, 0)-1/l)
		}
	}
	return out, nil
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
