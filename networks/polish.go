package networks

import (
	"math"
	"math/cmplx"
)

// transferAt returns H(s) = x_out with (G + sC)·x = b0 + s·b1 and its
// derivative H'(s) = x'_out with (G + sC)·x' = b1 − C·x, at a complex s, by
// one LU factorisation with partial pivoting (LINPACK's order: rows swap
// from the pivot column on, so the stored multipliers stay with their
// step). ok is false where G + sC is singular.
func (p *pencil) transferAt(s complex128) (h, dh complex128, ok bool) {
	m := p.n
	a := make([]complex128, m*m)
	x := make([]complex128, m)
	y := make([]complex128, m)
	piv := make([]int, m)
	var norm float64
	for i := range a {
		a[i] = complex(p.g[i], 0) + s*complex(p.c[i], 0)
		norm = math.Max(norm, abs1(a[i]))
	}
	for i := range x {
		x[i] = complex(p.b0[i], 0) + s*complex(p.b1[i], 0)
	}
	for k := 0; k < m; k++ {
		q, best := k, abs1(a[k*m+k])
		for r := k + 1; r < m; r++ {
			if v := abs1(a[r*m+k]); v > best {
				q, best = r, v
			}
		}
		if !(best > norm*1e-300) {
			return 0, 0, false
		}
		piv[k] = q
		for c := k; c < m; c++ {
			a[k*m+c], a[q*m+c] = a[q*m+c], a[k*m+c]
		}
		inv := 1 / a[k*m+k]
		for r := k + 1; r < m; r++ {
			l := a[r*m+k] * inv
			a[r*m+k] = l
			for c := k + 1; c < m; c++ {
				a[r*m+c] -= l * a[k*m+c]
			}
		}
	}
	solve := func(b []complex128) {
		for k := 0; k < m; k++ {
			b[k], b[piv[k]] = b[piv[k]], b[k]
			for r := k + 1; r < m; r++ {
				b[r] -= a[r*m+k] * b[k]
			}
		}
		for k := m - 1; k >= 0; k-- {
			v := b[k]
			for c := k + 1; c < m; c++ {
				v -= a[k*m+c] * b[c]
			}
			b[k] = v / a[k*m+k]
		}
	}
	solve(x)
	for i := 0; i < m; i++ {
		v := complex(p.b1[i], 0)
		for j := 0; j < m; j++ {
			v -= complex(p.c[i*m+j], 0) * x[j]
		}
		y[i] = v
	}
	solve(y)
	return x[p.out], y[p.out], true
}

// polish refines a zero by Newton's method on H from the unreduced pencil,
// z ← z − H(z)/H'(z), keeping a step only while it makes |H| smaller and
// moves z by less than 10⁻³·|z| (at most six steps); a real zero stays
// real. It is used for the zeros that stand beside the ring of zeros at
// infinity (shifted.zeros), whose eigenvalues the ring perturbs.
func (p *pencil) polish(z complex128) complex128 {
	h, dh, ok := p.transferAt(z)
	if !ok {
		return z
	}
	isReal := imag(z) == 0
	for it := 0; it < 6 && dh != 0; it++ {
		step := h / dh
		if cmplx.Abs(step) > 1e-3*cmplx.Abs(z) {
			break
		}
		next := z - step
		if isReal {
			next = complex(real(next), 0)
		}
		h2, dh2, ok := p.transferAt(next)
		if !ok || !(cmplx.Abs(h2) < cmplx.Abs(h)) {
			break
		}
		z, h, dh = next, h2, dh2
	}
	return z
}
