package audio

import (
	"math"
	"math/cmplx"
)

// Filter is a fitted digital filter in modal form: one-pole sections
// s[n] = x[n] + p·s[n−1] adding r·s[n] to the output, second-order sections
// s[n] = x[n] + a1·s[n−1] + a2·s[n−2] adding b0·s[n] + b1·s[n−1], and direct
// taps c[k]·x[n−k]. A section's state depends on its pole only, not on its
// numerator, so the state of one setting's filter can be handed to the
// filter of a nearby setting (see Turn). A Filter is immutable and safe for
// concurrent use; its running state lives in a State.
type Filter struct {
	Rate  float64 // sample rate, Hz
	Delay int     // samples by which the output lags the network's; see Lookahead
	reals []float64
	resid []float64
	pairs []pair
	fir   []float64
}

type pair struct{ a1, a2, b0, b1 float64 }

// Sections returns the number of one-pole and second-order sections.
func (f *Filter) Sections() (onePole, twoPole int) { return len(f.reals), len(f.pairs) }

// Response returns the filter's frequency response at hz with its Delay
// taken back: the response Render gives.
func (f *Filter) Response(hz float64) complex128 {
	zi := cmplx.Exp(complex(0, -2*math.Pi*hz/f.Rate))
	var h complex128
	for i, p := range f.reals {
		h += complex(f.resid[i], 0) / (1 - complex(p, 0)*zi)
	}
	for _, q := range f.pairs {
		h += (complex(q.b0, 0) + complex(q.b1, 0)*zi) / (1 - complex(q.a1, 0)*zi - complex(q.a2, 0)*zi*zi)
	}
	t := complex(1, 0)
	for _, c := range f.fir {
		h += complex(c, 0) * t
		t *= zi
	}
	return h * cmplx.Exp(complex(0, 2*math.Pi*hz*float64(f.Delay)/f.Rate))
}

// State is one channel's running state of a Filter.
type State struct {
	s  []float64    // one-pole sections
	q  [][2]float64 // second-order sections: s[n−1], s[n−2]
	xh []float64    // the last inputs, newest first, for the FIR taps
}

// NewState returns a state at rest for f.
func (f *Filter) NewState() *State {
	return &State{s: make([]float64, len(f.reals)), q: make([][2]float64, len(f.pairs)), xh: make([]float64, len(f.fir))}
}

// Reset puts the state at rest.
func (st *State) Reset() {
	clear(st.s)
	clear(st.q)
	clear(st.xh)
}

// CopyFrom takes over another state, section by section in pole order. It
// is exact for the FIR history; for the sections it is exact when the two
// filters' poles are equal and close when they are near, which is what
// Turn needs. Sections the other state lacks start at rest.
func (st *State) CopyFrom(o *State) {
	st.Reset()
	copy(st.s, o.s)
	copy(st.q, o.q)
	copy(st.xh, o.xh)
}

// Process filters in into out, which must have in's length and must not
// share its memory, advancing st. The output lags the network's by
// f.Delay samples (Render takes that lag back). It does not allocate.
func (f *Filter) Process(st *State, in, out []float64) {
	n := len(in)
	out = out[:n]
	c := f.fir
	head := min(len(c), n)
	for i := 0; i < head; i++ {
		v := 0.0
		for k, ck := range c {
			if j := i - k; j >= 0 {
				v += ck * in[j]
			} else {
				v += ck * st.xh[-j-1]
			}
		}
		out[i] = v
	}
	switch len(c) {
	case 8:
		c0, c1, c2, c3, c4, c5, c6, c7 := c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7]
		for i := head; i < n; i++ {
			x := in[i-7 : i+1 : i+1]
			out[i] = c0*x[7] + c1*x[6] + c2*x[5] + c3*x[4] + c4*x[3] + c5*x[2] + c6*x[1] + c7*x[0]
		}
	default:
		for i := head; i < n; i++ {
			v := 0.0
			x := in[i-len(c)+1 : i+1]
			for k, ck := range c {
				v += ck * x[len(x)-1-k]
			}
			out[i] = v
		}
	}
	f.sections(st, in, out)
	m := len(st.xh)
	if n < m {
		copy(st.xh[n:], st.xh[:m-n])
	}
	for k := 0; k < m && k < n; k++ {
		st.xh[k] = in[n-1-k]
	}
}

// sections adds the sections' outputs to out. The one-pole sections run
// two, three or four at a time, so that their independent recursions overlap in
// the processor.
func (f *Filter) sections(st *State, in, out []float64) {
	k := 0
	for ; k+4 <= len(f.reals) && len(f.reals)-k != 5; k += 4 {
		p0, p1, p2, p3 := f.reals[k], f.reals[k+1], f.reals[k+2], f.reals[k+3]
		r0, r1, r2, r3 := f.resid[k], f.resid[k+1], f.resid[k+2], f.resid[k+3]
		s0, s1, s2, s3 := st.s[k], st.s[k+1], st.s[k+2], st.s[k+3]
		for i, x := range in {
			s0 = x + p0*s0
			s1 = x + p1*s1
			s2 = x + p2*s2
			s3 = x + p3*s3
			out[i] += r0*s0 + r1*s1 + r2*s2 + r3*s3
		}
		st.s[k], st.s[k+1], st.s[k+2], st.s[k+3] = s0, s1, s2, s3
	}
	if len(f.reals)-k == 5 || len(f.reals)-k == 3 {
		p0, p1, p2 := f.reals[k], f.reals[k+1], f.reals[k+2]
		r0, r1, r2 := f.resid[k], f.resid[k+1], f.resid[k+2]
		s0, s1, s2 := st.s[k], st.s[k+1], st.s[k+2]
		for i, x := range in {
			s0 = x + p0*s0
			s1 = x + p1*s1
			s2 = x + p2*s2
			out[i] += r0*s0 + r1*s1 + r2*s2
		}
		st.s[k], st.s[k+1], st.s[k+2] = s0, s1, s2
		k += 3
	}
	for ; k+2 <= len(f.reals); k += 2 {
		p0, p1 := f.reals[k], f.reals[k+1]
		r0, r1 := f.resid[k], f.resid[k+1]
		s0, s1 := st.s[k], st.s[k+1]
		for i, x := range in {
			s0 = x + p0*s0
			s1 = x + p1*s1
			out[i] += r0*s0 + r1*s1
		}
		st.s[k], st.s[k+1] = s0, s1
	}
	for ; k < len(f.reals); k++ {
		p, r, s := f.reals[k], f.resid[k], st.s[k]
		for i, x := range in {
			s = x + p*s
			out[i] += r * s
		}
		st.s[k] = s
	}
	for k := range f.pairs {
		q := &f.pairs[k]
		a1, a2, b0, b1 := q.a1, q.a2, q.b0, q.b1
		s1, s2 := st.q[k][0], st.q[k][1]
		for i, x := range in {
			s := x + a1*s1 + a2*s2
			out[i] += b0*s + b1*s1
			s1, s2 = s, s1
		}
		st.q[k] = [2]float64{s1, s2}
	}
}
