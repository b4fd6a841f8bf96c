package audio

// Turn renders one channel through a knob that moves: Filters are fitted at
// increasing knob positions, evenly spaced, and the knob's position u (0 at
// Filters[0], 1 at the last) moves linearly from 0 to 1 over Frames
// samples, then stays at 1. At position u between filters i and i+1 the
// output is the crossfade (1−w)·y_i + w·y_{i+1} of the two filters' outputs,
// with w updated every sample, so no step is ever heard. Filter i+2 runs
// ahead, unheard, from the moment filter i+1 becomes audible; when it
// starts it takes over the state of filter i+1 (see State.CopyFrom), so no
// filter is heard starting cold in the middle of the signal. Three filters
// run at any time.
type Turn struct {
	Filters []*Filter
	Frames  int64

	states  []*State
	at      int64 // samples processed
	lo      int   // the lower audible filter
	started int   // filters up to this index are running
	ya, yb  []float64
	scratch []float64
}

// NewTurn returns a turn through filters over frames samples.
func NewTurn(filters []*Filter, frames int64) *Turn {
	t := &Turn{Filters: filters, Frames: max(frames, 1), states: make([]*State, len(filters))}
	for i, f := range filters {
		t.states[i] = f.NewState()
	}
	t.started = min(2, len(filters)-1)
	return t
}

// chunk is the longest run of samples processed with one pair of filters.
const chunk = 64

// Process filters in into out (the same length, not sharing memory).
func (t *Turn) Process(in, out []float64) {
	if len(t.ya) < chunk {
		t.ya, t.yb, t.scratch = make([]float64, chunk), make([]float64, chunk), make([]float64, chunk)
	}
	k := len(t.Filters) - 1
	for len(in) > 0 {
		n := min(chunk, len(in))
		u := t.pos(t.at)
		i := min(int(u), max(k-1, 0))
		for t.lo < i {
			t.lo++
			if next := t.lo + 1; next <= k && next > t.started {
				t.states[next].CopyFrom(t.states[next-1])
				t.started = next
			}
		}
		if next := t.lo + 2; next <= k && next > t.started {
			t.states[next].CopyFrom(t.states[next-1])
			t.started = next
		}
		ya, yb := t.ya[:n], t.yb[:n]
		t.Filters[t.lo].Process(t.states[t.lo], in[:n], ya)
		if k == 0 {
			copy(out[:n], ya)
		} else {
			t.Filters[t.lo+1].Process(t.states[t.lo+1], in[:n], yb)
			if ahead := t.lo + 2; ahead <= k {
				t.Filters[ahead].Process(t.states[ahead], in[:n], t.scratch[:n])
			}
			for j := 0; j < n; j++ {
				w := t.pos(t.at+int64(j)) - float64(t.lo)
				w = min(max(w, 0), 1)
				out[j] = ya[j] + w*(yb[j]-ya[j])
			}
		}
		t.at += int64(n)
		in, out = in[n:], out[n:]
	}
}

// pos is the knob position at sample n in filter-index units.
func (t *Turn) pos(n int64) float64 {
	k := float64(len(t.Filters) - 1)
	return k * min(float64(n)/float64(t.Frames), 1)
}
