package audio

import (
	"math"
	"math/cmplx"
)

// Turn renders one channel through a knob that moves: Filters are fitted at
// increasing knob positions, evenly spaced, and the knob's position u (0 at
// Filters[0], 1 at the last) moves linearly from 0 to 1 over Frames
// samples, then stays at 1. At position u between filters i and i+1 the
// output is the crossfade (1−w)·y_i + w·y_{i+1} of the two filters'
// outputs, with w updated every sample, so no step is ever heard. When the
// knob reaches filter i+1, filter i stops; filter i+2 starts, unheard,
// with the state of filter i+1 (see State.CopyFrom) three time constants of
// the slowest section (at least MinPreroll samples, at most a step of the
// knob) before its weight starts to rise from 0, so the small mismatch of
// the handed-over state has died away by the time it is heard, and no
// filter is ever heard starting cold. Two filters run, three while one
// runs ahead.
type Turn struct {
	Filters []*Filter
	Frames  int64

	states  []*State
	at      int64 // samples processed
	lo      int   // the lower audible filter
	ahead   int   // the highest filter running
	preroll int64 // samples a filter runs unheard before its weight rises
	ya, yb  []float64
	yc      []float64
}

// NewTurn returns a turn through filters over frames samples.
func NewTurn(filters []*Filter, frames int64) *Turn {
	t := &Turn{Filters: filters, Frames: max(frames, 1), states: make([]*State, len(filters))}
	for i, f := range filters {
		t.states[i] = f.NewState()
	}
	t.ahead = min(1, len(filters)-1)
	// Three time constants of the slowest section, at least MinPreroll.
	slow := 0.0
	for _, f := range filters {
		for _, p := range f.reals {
			slow = math.Max(slow, math.Abs(p))
		}
		for _, q := range f.pairs {
			slow = math.Max(slow, math.Sqrt(math.Abs(q.a2)))
		}
	}
	t.preroll = MinPreroll
	if slow > 0 && slow < 1 {
		t.preroll = max(t.preroll, int64(math.Ceil(-3/math.Log(slow))))
	}
	return t
}

// MinPreroll is the fewest samples a filter runs ahead, unheard.
const MinPreroll = 1024

// chunk is the longest run of samples processed with one pair of filters.
const chunk = 256

// Process filters in into out (the same length, not sharing memory).
func (t *Turn) Process(in, out []float64) {
	if len(t.ya) < chunk {
		t.ya, t.yb, t.yc = make([]float64, chunk), make([]float64, chunk), make([]float64, chunk)
	}
	k := len(t.Filters) - 1
	if k == 0 {
		t.Filters[0].Process(t.states[0], in, out)
		return
	}
	step := float64(k) / float64(t.Frames) // knob travel per sample, in filters
	for len(in) > 0 {
		n := min(chunk, len(in))
		u := t.pos(t.at)
		for i := min(int(u), k-1); t.lo < i; {
			t.lo++
			if t.lo+1 > t.ahead {
				// A jump of more than one filter in one chunk.
				t.states[t.lo+1].CopyFrom(t.states[t.lo])
				t.ahead = t.lo + 1
			}
		}
		if next := t.lo + 2; next <= k && next > t.ahead && t.at >= t.reach(t.lo+1)-t.preroll {
			t.states[next].CopyFrom(t.states[next-1])
			t.ahead = next
		}
		if t.lo+1 <= k-1 {
			// Stop the chunk where the knob reaches the next filter, so
			// that the next pair takes over exactly there, and where the
			// filter after it is to start.
			b := t.reach(t.lo + 1)
			if b > t.at && b-t.at < int64(n) {
				n = int(b - t.at)
			}
			if b -= t.preroll; b > t.at && b-t.at < int64(n) {
				n = int(b - t.at)
			}
		}
		ya, yb := t.ya[:n], t.yb[:n]
		t.Filters[t.lo].Process(t.states[t.lo], in[:n], ya)
		t.Filters[t.lo+1].Process(t.states[t.lo+1], in[:n], yb)
		if t.ahead == t.lo+2 {
			t.Filters[t.ahead].Process(t.states[t.ahead], in[:n], t.yc[:n])
		}
		w := u - float64(t.lo)
		dw := step
		if t.at >= t.Frames {
			dw = 0
		}
		o := out[:n]
		for j := range o {
			c := min(max(w, 0), 1)
			o[j] = ya[j] + c*(yb[j]-ya[j])
			w += dw
		}
		t.at += int64(n)
		in, out = in[n:], out[n:]
	}
}

// reach is the sample at which the knob reaches filter j.
func (t *Turn) reach(j int) int64 {
	return int64(math.Ceil(float64(j) * float64(t.Frames) / float64(len(t.Filters)-1)))
}

// pos is the knob position at sample n in filter-index units.
func (t *Turn) pos(n int64) float64 {
	k := float64(len(t.Filters) - 1)
	return k * min(float64(n)/float64(t.Frames), 1)
}

// Setting returns a network's exact response and poles at knob position
// pos (0 to 1); TurnFilters calls it.
type Setting func(pos float64) (Response, []complex128, error)

// The knob grid of a turn: it starts with MinTurnFilters positions, evenly
// spaced, and doubles its density until, at every frequency of a
// twelfth-octave grid from 20 Hz to FitTop·rate, two neighbouring filters'
// complex responses differ by at most TurnStep times the larger filter's
// peak gain, or it holds MaxTurnFilters. The crossfade's error halfway
// between two filters is about a quarter of that difference at most (the
// responses move smoothly with the knob), under 1.5 % of the peak: a
// deep notch may be a little shallower mid-way, the tone is not audibly
// changed (common practice, no published source).
const (
	MinTurnFilters = 17
	MaxTurnFilters = 257
	TurnStep       = 0.06
)

// TurnFilters fits the filters of a turn of the knob at rate and returns
// them with their knob positions.
func TurnFilters(at Setting, rate float64) ([]*Filter, []float64, error) {
	fit := func(pos float64) (*Filter, error) {
		h, poles, err := at(pos)
		if err != nil {
			return nil, err
		}
		return Fit(h, poles, rate)
	}
	var grid []float64
	for hz := 20.0; hz <= FitTop*rate; hz *= math.Pow(2, 1.0/12) {
		grid = append(grid, hz)
	}
	gains := func(f *Filter) []complex128 {
		g := make([]complex128, len(grid))
		for i, hz := range grid {
			g[i] = f.Response(hz)
		}
		return g
	}
	peak := func(g []complex128) float64 {
		m := 0.0
		for _, v := range g {
			m = math.Max(m, cmplx.Abs(v))
		}
		return m
	}
	n := MinTurnFilters
	fs := make([]*Filter, n)
	gs := make([][]complex128, n)
	for i := range fs {
		f, err := fit(float64(i) / float64(n-1))
		if err != nil {
			return nil, nil, err
		}
		fs[i], gs[i] = f, gains(f)
	}
	for {
		step := 0.0
		for i := 1; i < n; i++ {
			p := math.Max(peak(gs[i]), peak(gs[i-1]))
			for j := range grid {
				step = math.Max(step, cmplx.Abs(gs[i][j]-gs[i-1][j])/p)
			}
		}
		if step <= TurnStep || 2*n-1 > MaxTurnFilters {
			break
		}
		// Double the density: fit the midpoints.
		m := 2*n - 1
		nf, ng := make([]*Filter, m), make([][]complex128, m)
		for i := 0; i < m; i++ {
			if i%2 == 0 {
				nf[i], ng[i] = fs[i/2], gs[i/2]
				continue
			}
			f, err := fit(float64(i) / float64(m-1))
			if err != nil {
				return nil, nil, err
			}
			nf[i], ng[i] = f, gains(f)
		}
		fs, gs, n = nf, ng, m
	}
	pos := make([]float64, n)
	for i := range pos {
		pos[i] = float64(i) / float64(n-1)
	}
	return fs, pos, nil
}
