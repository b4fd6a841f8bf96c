package networks

import (
	"fmt"
	"math"
	"math/cmplx"
)

// ZPK is a Network compiled to its poles, zeros and gain constant,
//
//	H(s) = k · Π(s − z_i) / Π(s − p_j),  s = j·2π·f,
//
// the transfer V(out)/V(source) of the network it was compiled from. It
// evaluates a frequency in a few nanoseconds per pole and zero, without
// allocating, and keeps the gain finite however far down a section is: a
// response 3000 dB down reports −3000 dB, not −Inf. Make it with
// Network.CompileZPK or, reusing its storage, CompileZPKInto. A ZPK is
// read-only after compiling, so it is safe for concurrent use.
type ZPK struct {
	poles, zeros []complex128
	// The factors of |H|² in x = ω²: a real root a gives x + a²; a pair of
	// complex roots c ± jd gives (|z|² − x)² + (2c)²·x.
	realZ, realP []float64 // a²
	pairZ, pairP []pairFactor
	logK         float64 // ln|k|
	negK         bool    // k < 0
	refHz        float64
}

// pairFactor is a conjugate pair of roots z, z̄: (s − z)(s − z̄) at s = jω is
// (mag2 − ω²) − j·t·ω with t = 2·Re z.
type pairFactor struct{ mag2, t, t2 float64 }

// CompileZPK compiles the network to its poles, zeros and gain constant.
// The poles and zeros are those of Poles and Zeros; the gain constant k is
// set so that H equals the nodal solver's V(out)/V(source) at a reference
// frequency: the geometric middle of the poles and zeros (the shift at
// which they were found), moved off any pole or zero nearby.
func (n *Network) CompileZPK() (*ZPK, error) {
	var k ZPK
	if err := n.CompileZPKInto(&k); err != nil {
		return nil, err
	}
	return &k, nil
}

// CompileZPKInto compiles the network into k, reusing k's storage. After an
// error k holds nothing usable until it is compiled again.
func (n *Network) CompileZPKInto(k *ZPK) error {
	an, err := n.analyse()
	if err != nil {
		return err
	}
	if an.p.out < 0 {
		// The output is the ideal source's node: H = 1.
		k.set(nil, nil)
		k.logK, k.negK, k.refHz = 0, false, 1000
		return nil
	}
	zs, err := an.s.zeros()
	if err != nil {
		return err
	}
	solver := an.solver
	var next ZPK
	next.poles, next.zeros = k.poles, k.zeros
	next.realZ, next.realP, next.pairZ, next.pairP = k.realZ, k.realP, k.pairZ, k.pairP
	if err := next.fit(an, zs, solver); err != nil {
		return err
	}
	*k = next
	return nil
}

// set stores the roots and their factors.
func (k *ZPK) set(poles, zeros []complex128) {
	k.poles = append(k.poles[:0], poles...)
	k.zeros = append(k.zeros[:0], zeros...)
	sortRoots(k.poles)
	sortRoots(k.zeros)
	k.realP, k.pairP = factors(k.poles, k.realP[:0], k.pairP[:0])
	k.realZ, k.pairZ = factors(k.zeros, k.realZ[:0], k.pairZ[:0])
}

// factors sorts roots into real ones and conjugate pairs. The eigenvalue
// routine returns complex roots of a real matrix as exact conjugate pairs,
// so a root with a positive imaginary part stands for its pair.
func factors(roots []complex128, re []float64, pairs []pairFactor) ([]float64, []pairFactor) {
	for _, z := range roots {
		switch {
		case imag(z) == 0:
			re = append(re, real(z)*real(z))
		case imag(z) > 0:
			t := 2 * real(z)
			m := real(z)*real(z) + imag(z)*imag(z)
			pairs = append(pairs, pairFactor{mag2: m, t: t, t2: t * t})
		}
	}
	return re, pairs
}

// fit sets the roots and the gain constant. Which of the candidates for
// zeros at infinity (zeroSet) are finite is decided by the ring heuristic
// of shifted.zeros unless another choice agrees better with the nodal
// solver: each choice that keeps conjugate pairs whole is calibrated and
// compared with the solver at the candidates' own frequencies (where a
// zero wrongly kept or dropped shows most), at decades around the shift
// and across the audio band, by the largest |ln(H/H_solver)|; the
// heuristic's choice stands unless another halves that error.
func (k *ZPK) fit(an *analysis, zs zeroSet, s *Solver) error {
	if len(zs.cand) == 0 {
		k.set(an.poles, zs.sure)
		return k.calibrate(s, an.s.sigma)
	}
	var ws []float64
	for _, p := range an.poles {
		ws = append(ws, cmplx.Abs(p))
	}
	for _, f := range []float64{1e-2, 1e-1, 1, 10, 100, 1e3} {
		ws = append(ws, an.s.sigma*f)
	}
	for _, f := range []float64{10, 100, 1e3, 1e4, 1e5} {
		ws = append(ws, 2*math.Pi*f)
	}
	// The candidates' own frequencies come last: the fit far out there is
	// judged by the choice of zeros, not by the retry below.
	core := len(ws)
	for _, c := range zs.cand {
		ws = append(ws, cmplx.Abs(c))
	}
	var pts []fitPoint
	for i, w := range ws {
		if !(w > 0) {
			continue
		}
		// The solver's rounding is relative only while its numbers stay
		// well inside the range of a float64.
		if h := s.Transfer(w / (2 * math.Pi)); cmplx.Abs(h) > 1e-290 && !cmplx.IsNaN(h) && !cmplx.IsInf(h) {
			pts = append(pts, fitPoint{w, h, i < core})
		}
	}
	best, bestMis, coreMis := k.choose(an, zs, s, pts)
	// A zero at infinity of high order spreads into a wide ring that can
	// swallow finite zeros far from the shift: if the fit at the poles,
	// the shift and the band is poor, the
	// zeros are sought again at shifts a decade apart, up to ten times the
	// fastest pole and down to a tenth of the slowest, and the best fit
	// is kept.
	if coreMis > 1e-9 {
		lo, hi := math.Inf(1), 0.0
		for _, p := range an.poles {
			if a := cmplx.Abs(p); a > 1e-9*an.s.sigma {
				lo, hi = math.Min(lo, a), math.Max(hi, a)
			}
		}
		var shifts []float64
		for f := 10.0; an.s.sigma*f <= 10*hi && len(shifts) < 12; f *= 10 {
			shifts = append(shifts, an.s.sigma*f)
		}
		for f := 0.1; an.s.sigma*f >= lo/10 && len(shifts) < 24; f /= 10 {
			shifts = append(shifts, an.s.sigma*f)
		}
		for _, sigma := range shifts {
			red, err := an.p.reduce(an.u, an.v, an.r, sigma)
			if err != nil {
				continue
			}
			zs2, err := red.zeros()
			if err != nil {
				continue
			}
			if set, m, _ := k.choose(an, zs2, s, pts); m < bestMis/2 {
				best, bestMis = set, m
			}
		}
	}
	k.set(an.poles, best)
	return k.calibrate(s, an.s.sigma)
}

// fitPoint is the nodal solver's transfer at an angular frequency.
type fitPoint struct {
	w    float64
	h    complex128
	core bool // a pole's, the shift's or the band's frequency
}

// choose polishes the candidates of zs and returns the set of zeros, among
// those that keep the first j candidates for each j that keeps conjugate
// pairs whole, that fits the solver's points best, with its misfit, the
// largest |ln(H/H_solver)|; the ring heuristic's j (zs.keep) stands unless
// another halves its misfit.
func (k *ZPK) choose(an *analysis, zs zeroSet, s *Solver, pts []fitPoint) (set []complex128, misfit, core float64) {
	for i, c := range zs.cand {
		if imag(c) >= 0 {
			zs.cand[i] = an.p.polish(c)
		}
	}
	for i, c := range zs.cand { // conjugates follow their polished partner
		if imag(c) < 0 && i > 0 && imag(zs.cand[i-1]) > 0 {
			zs.cand[i] = cmplx.Conj(zs.cand[i-1])
		}
	}
	fit := func(j int) (all, core float64) {
		k.set(an.poles, zs.with(j))
		if k.calibrate(s, an.s.sigma) != nil {
			return math.Inf(1), math.Inf(1)
		}
		for _, p := range pts {
			q, e := k.product(p.w)
			if k.negK {
				q = -q
			}
			d := cmplx.Log(q/p.h) + complex(k.logK+float64(e)*math.Ln2, 0)
			m := cmplx.Abs(complex(real(d), math.Remainder(imag(d), 2*math.Pi)))
			all = math.Max(all, m)
			if p.core {
				core = math.Max(core, m)
			}
		}
		return all, core
	}
	best := zs.keep
	misfit, core = fit(best)
	for j := 0; j <= len(zs.cand); j++ {
		if j == zs.keep || (j > 0 && j < len(zs.cand) && imag(zs.cand[j]) != 0 && zs.cand[j] == cmplx.Conj(zs.cand[j-1])) {
			continue
		}
		if m, c := fit(j); m < misfit/2 {
			best, misfit, core = j, m, c
		}
	}
	return zs.with(best), misfit, core
}

// calibrate sets k from the solver at the reference frequency.
func (k *ZPK) calibrate(s *Solver, sigma float64) error {
	w := sigma
	for try := 0; try < 40; try, w = try+1, w*1.37 {
		if k.nearRoot(w) {
			continue
		}
		f := w / (2 * math.Pi)
		h := s.Transfer(f)
		if cmplx.IsNaN(h) || h == 0 || cmplx.IsInf(h) {
			continue
		}
		p, e := k.product(w)
		if p == 0 || cmplx.IsNaN(p) {
			continue
		}
		ratio := h / p
		k.logK = math.Log(cmplx.Abs(ratio)) - float64(e)*math.Ln2
		k.negK = real(ratio) < 0
		k.refHz = f
		return nil
	}
	return fmt.Errorf("no reference frequency near %g rad/s where the nodal solver gives a usable transfer", sigma)
}

// nearRoot reports whether jω lies within 10⁻³·ω of a pole or zero.
func (k *ZPK) nearRoot(w float64) bool {
	s := complex(0, w)
	for _, rs := range [2][]complex128{k.poles, k.zeros} {
		for _, z := range rs {
			if cmplx.Abs(s-z) < 1e-3*w {
				return true
			}
		}
	}
	return false
}

// product returns Π(jω − z)/Π(jω − p) as p·2^e, scaled so that p neither
// overflows nor underflows.
func (k *ZPK) product(w float64) (complex128, int) {
	s := complex(0, w)
	num, den := complex(1, 0), complex(1, 0)
	e := 0
	for _, z := range k.zeros {
		num *= s - z
		num, e = rescale(num, e, 1)
	}
	for _, p := range k.poles {
		den *= s - p
		den, e = rescale(den, e, -1)
	}
	return num / den, e
}

// rescale keeps z's size near 1 by moving powers of two into the exponent
// e (sign +1 for a numerator, −1 for a denominator).
func rescale(z complex128, e, sign int) (complex128, int) {
	a := math.Abs(real(z)) + math.Abs(imag(z))
	if a > 0x1p200 || (a < 0x1p-200 && a > 0) {
		_, x := math.Frexp(a)
		f := math.Ldexp(1, -x)
		return z * complex(f, 0), e + sign*x
	}
	return z, e
}

// Poles returns a copy of the poles, rad/s.
func (k *ZPK) Poles() []complex128 { return append([]complex128(nil), k.poles...) }

// Zeros returns a copy of the finite zeros, rad/s.
func (k *ZPK) Zeros() []complex128 { return append([]complex128(nil), k.zeros...) }

// Gain returns the gain constant k of H(s) = k·Π(s − z)/Π(s − p) as its
// natural logarithm ln|k| and its sign; k itself can lie beyond the range of
// a float64.
func (k *ZPK) Gain() (logAbs float64, negative bool) { return k.logK, k.negK }

// ReferenceHz returns the frequency at which the gain constant was set
// from the nodal solver.
func (k *ZPK) ReferenceHz() float64 { return k.refHz }

// Transfer returns H = V(out)/V(source) at frequency f (Hz). A response
// below about −6000 dB underflows to 0; GainDB and Phase stay exact there.
func (k *ZPK) Transfer(f float64) complex128 {
	w := 2 * math.Pi * f
	p, e := k.product(w)
	p *= complex(math.Exp(k.logK), 0)
	if k.negK {
		p = -p
	}
	return p * complex(math.Ldexp(1, e), 0)
}

// Phase returns the phase of H at frequency f, in radians in (−π, π].
func (k *ZPK) Phase(f float64) float64 {
	p, _ := k.product(2 * math.Pi * f)
	if k.negK {
		p = -p
	}
	return cmplx.Phase(p)
}

// dBPerLn converts ln|H|² to 20·log10|H| = 10·log10|H|².
const dBPerLn = 10 / math.Ln10

// GainDB returns 20·log10|V(out)/V(source)| at frequency f, as
// Response.GainDB means it. It is finite for any f between 0 and 10¹⁵⁰ Hz
// (ω² must not overflow) at which H has no zero exactly: |H|² is formed as a product of its real factors in ω²
// (x + a² for a real root a, (|z|² − x)² + (2·Re z)²·x for a pair) with the
// numerator and denominator kept in range by moving powers of two into an
// integer exponent, and only their mantissas' ratio goes through the
// logarithm. It does not allocate.
func (k *ZPK) GainDB(f float64) float64 {
	w := 2 * math.Pi * f
	return dBPerLn * k.logMag2(w*w)
}

// GainsDB writes GainDB(freqs[i]) into dst[i] for every i; dst must be at
// least as long as freqs. It does not allocate.
func (k *ZPK) GainsDB(dst, freqs []float64) {
	dst = dst[:len(freqs)]
	for i, f := range freqs {
		w := 2 * math.Pi * f
		dst[i] = dBPerLn * k.logMag2(w*w)
	}
}

// big and small bound the running products between rescalings; a factor
// of |H|² lies within 2^±300 for any part values a design accepts, so the
// products stay normal numbers.
const (
	big   = 0x1p300
	small = 0x1p-300
)

// logMag2 returns ln|H(jω)|² for x = ω².
func (k *ZPK) logMag2(x float64) float64 {
	num, den := 1.0, 1.0
	e := 0
	for _, a := range k.realZ {
		num *= x + a
		if num > big || num < small {
			num, e = renorm(num, e, 1)
		}
	}
	for _, p := range k.pairZ {
		d := p.mag2 - x
		num *= d*d + p.t2*x
		if num > big || num < small {
			num, e = renorm(num, e, 1)
		}
	}
	for _, a := range k.realP {
		den *= x + a
		if den > big || den < small {
			den, e = renorm(den, e, -1)
		}
	}
	for _, p := range k.pairP {
		d := p.mag2 - x
		den *= d*d + p.t2*x
		if den > big || den < small {
			den, e = renorm(den, e, -1)
		}
	}
	num, e = renorm(num, e, 1)
	den, e = renorm(den, e, -1)
	return math.Log(num/den) + float64(e)*math.Ln2 + 2*k.logK
}

// renorm splits a positive normal v into a mantissa in [1, 2) and a power
// of two added to e with the given sign; 0 (H exactly at a zero on the jω
// axis) is taken as the smallest normal number, so the result stays finite.
func renorm(v float64, e, sign int) (float64, int) {
	if !(v >= 0x1p-1022) {
		v = 0x1p-1022
	}
	b := math.Float64bits(v)
	x := int(b>>52&0x7ff) - 1023
	return math.Float64frombits(b&^(0x7ff<<52) | 1023<<52), e + sign*x
}

// Zeros returns the finite zeros of V(out)/V(source) in rad/s, sorted by
// magnitude, then by imaginary part: the transmission zeros, the finite
// eigenvalues of the Rosenbrock pencil [[G + sC, −b], [cᵀ, 0]].
//
// Method: the pencil is reduced at a real shift σ exactly as for Poles, to
// the order r of the circuit's independent capacitor voltages and inductor
// currents; in λ = 1/(σ − s) it is then an ordinary state space with a
// direct term H(σ), whose zeros are the eigenvalues of one r×r matrix
// (shifted.zeros). The zeros at infinity appear as a ring of eigenvalues
// around λ = 0, told apart by their error bounds and checked against the
// nodal solver (ZPK.fit). As with Poles, a mode the source cannot excite or
// the output cannot see appears among the zeros as well as among the poles.
func (n *Network) Zeros() ([]complex128, error) {
	k, err := n.CompileZPK()
	if err != nil {
		return nil, err
	}
	return k.Zeros(), nil
}
