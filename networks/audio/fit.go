package audio

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
)

// Response is a network's exact transfer function: V(out)/V(source) at a
// frequency in Hz. networks.Compiled and networks.Solver are Responses.
type Response interface {
	Transfer(f float64) complex128
}

// The fit's settings.
const (
	// FitTop is the top of the fitted band as a fraction of the sample rate.
	FitTop = 0.45
	// FitFrom is the bottom of the fitted band, Hz.
	FitFrom = 5.0
	// FitPerDecade is the density of the fit's log-spaced grid.
	FitPerDecade = 60
	// Lookahead is how many samples late the fitted filter's output is.
	// The fit's target is the network's response delayed by Lookahead
	// samples, and Render reads the output that much later, so what is
	// heard keeps the network's own phase and delay. The two samples give
	// the fit room for the part of a band-limited response that comes
	// before its impulse (a response whose impulse response jumps at t = 0,
	// such as a one-pole RC or a network with a direct path, has one), which
	// no causal filter could otherwise follow.
	Lookahead = 2
	// FIRTaps is the number of direct taps fitted beside the sections.
	FIRTaps = 8
	// ridge keeps the least-squares problem well posed when two poles are
	// nearly equal; on columns scaled to unit length it is far below any
	// audible error.
	ridge = 1e-9
	// PhaseFrom is, as a fraction of the sample rate, where the fit stops
	// holding the phase. A real digital filter's response is real at the
	// Nyquist frequency, while the network's phase there is not a multiple
	// of 180°; a fit that held the phase to the top would spread that clash
	// over the whole band. Below PhaseFrom the fit's error is the relative
	// complex error (magnitude and phase); above it, the error of the log
	// magnitude only.
	PhaseFrom = 0.2
	// newtonSteps is the most Gauss–Newton steps taken from the complex
	// least-squares fit towards the fit of that mixed error; a step is
	// halved until it lowers the error, and the steps stop when none does.
	newtonSteps = 10
	// firPole: a pole whose digital image is smaller than this decays
	// within the FIR taps' span, so the taps carry it instead of a section
	// that would be nearly collinear with them.
	firPole = 0.01
	// linearPoints are spread evenly up to the top of the band, where a log
	// grid is thin and the fit is hardest.
	linearPoints = 200
)

// Fit returns the digital filter at sample rate rate (Hz) whose response
// follows h, the network's exact response, given the network's finite
// poles in rad/s (conjugate pairs may be given once or twice). Every pole
// must lie in the left half plane. See the package documentation for the
// method.
func Fit(h Response, poles []complex128, rate float64) (*Filter, error) {
	if !(rate > 0) || math.IsInf(rate, 0) {
		return nil, fmt.Errorf("sample rate %v Hz must be positive and finite", rate)
	}
	T := 1 / rate
	f := &Filter{Rate: rate, Delay: Lookahead}
	for _, p := range poles {
		if cmplx.IsNaN(p) || cmplx.IsInf(p) {
			return nil, fmt.Errorf("pole %v is not finite", p)
		}
		if !(real(p) < 0) {
			return nil, fmt.Errorf("pole %v rad/s is not in the left half plane: the network is not stable", p)
		}
		z := cmplx.Exp(p * complex(T, 0))
		if cmplx.Abs(z) < firPole {
			// Far above the band: the FIR taps carry it.
			continue
		}
		switch {
		case math.Abs(imag(p)) <= 1e-9*cmplx.Abs(p):
			f.reals = append(f.reals, real(z))
		case imag(p) > 0:
			f.pairs = append(f.pairs, pair{a1: 2 * real(z), a2: -real(z)*real(z) - imag(z)*imag(z)})
		}
	}
	// Slowest first, so that filters fitted at nearby knob positions list
	// their sections in the same order even when a fast pole is left to
	// the taps in one and not in the other (see State.CopyFrom).
	sort.Sort(sort.Reverse(sort.Float64Slice(f.reals)))
	sort.Slice(f.pairs, func(i, j int) bool { return f.pairs[i].a2 < f.pairs[j].a2 })
	f.fir = make([]float64, FIRTaps)

	grid := fitGrid(rate)
	target := make([]complex128, len(grid))
	for i, hz := range grid {
		target[i] = h.Transfer(hz) * cmplx.Exp(complex(0, -2*math.Pi*hz*float64(Lookahead)/rate))
		if cmplx.IsNaN(target[i]) || cmplx.IsInf(target[i]) {
			return nil, fmt.Errorf("the network has no response at %g Hz", hz)
		}
	}
	ls, err := f.design(grid, target)
	if err != nil {
		return nil, err
	}
	if err := ls.solve(f, target); err != nil {
		return nil, err
	}
	if err := f.refine(grid, target); err != nil {
		return nil, err
	}
	return f, nil
}

// leastSquares is the fit's linear problem, factorised once: the rows are
// the real and imaginary parts of the basis at each grid frequency,
// weighted by 1/|H| so that the error is relative; the columns are scaled
// to unit length and a ridge row is added per column.
type leastSquares struct {
	qr     mat.QR
	w      []float64 // row weight per grid point
	scale  []float64
	rows   int
	b, x   mat.VecDense
	nr, np int
}

func (f *Filter) design(grid []float64, target []complex128) (*leastSquares, error) {
	nr, np := len(f.reals), len(f.pairs)
	cols := nr + 2*np + FIRTaps
	rows := 2*len(grid) + cols
	A := mat.NewDense(rows, cols, nil)
	ls := &leastSquares{w: make([]float64, len(grid)), scale: make([]float64, cols), rows: rows, nr: nr, np: np}
	basis := make([]complex128, cols)
	for i, hz := range grid {
		m := cmplx.Abs(target[i])
		if m == 0 {
			continue
		}
		w := 1 / m
		ls.w[i] = w
		f.basis(hz, basis)
		for j, v := range basis {
			A.Set(2*i, j, real(v)*w)
			A.Set(2*i+1, j, imag(v)*w)
		}
	}
	for j := 0; j < cols; j++ {
		s := mat.Norm(A.ColView(j), 2)
		if s == 0 {
			s = 1
		}
		ls.scale[j] = s
		for i := 0; i < 2*len(grid); i++ {
			A.Set(i, j, A.At(i, j)/s)
		}
		A.Set(2*len(grid)+j, j, math.Sqrt(ridge))
	}
	ls.qr.Factorize(A)
	ls.b = *mat.NewVecDense(rows, nil)
	return ls, nil
}

// solve sets f's numerators and taps to the fit of want.
func (ls *leastSquares) solve(f *Filter, want []complex128) error {
	for i, w := range ls.w {
		ls.b.SetVec(2*i, real(want[i])*w)
		ls.b.SetVec(2*i+1, imag(want[i])*w)
	}
	if err := ls.qr.SolveVecTo(&ls.x, false, &ls.b); err != nil {
		return fmt.Errorf("fitting the filter: %v", err)
	}
	c := make([]float64, len(ls.scale))
	for j := range c {
		c[j] = ls.x.AtVec(j) / ls.scale[j]
	}
	f.resid = c[:ls.nr]
	for k := range f.pairs {
		f.pairs[k].b0, f.pairs[k].b1 = c[ls.nr+2*k], c[ls.nr+2*k+1]
	}
	copy(f.fir, c[ls.nr+2*ls.np:])
	return nil
}

// refine improves the fit by Gauss–Newton steps on the error that matters:
// below PhaseFrom·rate the relative complex error 1 − H_d/H (linear in the
// coefficients), above it the error of the log magnitude, ln|H| − ln|H_d|,
// whose derivative in coefficient j is Re(B_j/H_d) with B_j that
// coefficient's basis response.
func (f *Filter) refine(grid []float64, target []complex128) error {
	nr, np := len(f.reals), len(f.pairs)
	cols := nr + 2*np + len(f.fir)
	B := make([]complex128, len(grid)*cols)
	rows := 0
	for i, hz := range grid {
		f.basis(hz, B[i*cols:(i+1)*cols])
		if hz/f.Rate < PhaseFrom {
			rows += 2
		} else {
			rows++
		}
	}
	c := make([]float64, cols)
	copy(c, f.resid)
	for k, q := range f.pairs {
		c[nr+2*k], c[nr+2*k+1] = q.b0, q.b1
	}
	copy(c[nr+2*np:], f.fir)
	A := mat.NewDense(rows+cols, cols, nil)
	b := mat.NewVecDense(rows+cols, nil)
	scale := make([]float64, cols)
	var x mat.VecDense
	response := func(c []float64, i int) complex128 {
		var hd complex128
		for j, v := range B[i*cols : (i+1)*cols] {
			hd += complex(c[j], 0) * v
		}
		return hd
	}
	cost := func(c []float64) float64 {
		e := 0.0
		for i, hz := range grid {
			hd := response(c, i)
			if hz/f.Rate < PhaseFrom {
				d := cmplx.Abs(1 - hd/target[i])
				e += d * d
			} else {
				d := math.Log(cmplx.Abs(target[i]) / cmplx.Abs(hd))
				e += d * d
			}
		}
		if math.IsNaN(e) {
			return math.Inf(1)
		}
		return e
	}
	now := cost(c)
	trial := make([]float64, cols)
	for step := 0; step < newtonSteps; step++ {
		r := 0
		for i, hz := range grid {
			row := B[i*cols : (i+1)*cols]
			hd := response(c, i)
			if hd == 0 || target[i] == 0 {
				return fmt.Errorf("the fit has no response at %g Hz", hz)
			}
			if hz/f.Rate < PhaseFrom {
				e := (target[i] - hd) / target[i]
				for j, v := range row {
					d := v / target[i]
					A.Set(r, j, real(d))
					A.Set(r+1, j, imag(d))
				}
				b.SetVec(r, real(e))
				b.SetVec(r+1, imag(e))
				r += 2
				continue
			}
			for j, v := range row {
				A.Set(r, j, real(v/hd))
			}
			b.SetVec(r, math.Log(cmplx.Abs(target[i])/cmplx.Abs(hd)))
			r++
		}
		for j := 0; j < cols; j++ {
			s := 0.0
			for i := 0; i < rows; i++ {
				s += A.At(i, j) * A.At(i, j)
			}
			s = math.Sqrt(s)
			if s == 0 {
				s = 1
			}
			scale[j] = s
			for i := 0; i < rows; i++ {
				A.Set(i, j, A.At(i, j)/s)
			}
			A.Set(rows+j, j, math.Sqrt(ridge))
			b.SetVec(rows+j, 0)
		}
		if err := x.SolveVec(A, b); err != nil {
			return fmt.Errorf("refining the filter: %v", err)
		}
		// Take the step, halved until it lowers the error.
		better := false
		for t := 1.0; t > 1e-3; t /= 2 {
			for j := range c {
				trial[j] = c[j] + t*x.AtVec(j)/scale[j]
			}
			if e := cost(trial); e < now {
				now, better = e, true
				copy(c, trial)
				break
			}
		}
		if !better {
			break
		}
	}
	copy(f.resid, c[:nr])
	for k := range f.pairs {
		f.pairs[k].b0, f.pairs[k].b1 = c[nr+2*k], c[nr+2*k+1]
	}
	copy(f.fir, c[nr+2*np:])
	return nil
}

// fitGrid is the log-spaced grid from FitFrom to FitTop·rate.
func fitGrid(rate float64) []float64 {
	lo, hi := math.Log10(FitFrom), math.Log10(FitTop*rate)
	n := int(math.Ceil((hi-lo)*FitPerDecade)) + 1
	g := make([]float64, n, n+linearPoints)
	for i := range g {
		g[i] = math.Pow(10, lo+(hi-lo)*float64(i)/float64(n-1))
	}
	for i := 1; i <= linearPoints; i++ {
		g = append(g, FitTop*rate*float64(i)/linearPoints)
	}
	return g
}

// basis fills out with the response at hz of each unknown's unit
// coefficient: the one-pole sections, the two numerator terms of each pair,
// then the FIR taps.
func (f *Filter) basis(hz float64, out []complex128) {
	zi := cmplx.Exp(complex(0, -2*math.Pi*hz/f.Rate)) // z⁻¹
	k := 0
	for _, p := range f.reals {
		out[k] = 1 / (1 - complex(p, 0)*zi)
		k++
	}
	for _, q := range f.pairs {
		d := 1 - complex(q.a1, 0)*zi - complex(q.a2, 0)*zi*zi
		out[k], out[k+1] = 1/d, zi/d
		k += 2
	}
	t := complex(1, 0)
	for j := 0; j < FIRTaps; j++ {
		out[k] = t
		t *= zi
		k++
	}
}
