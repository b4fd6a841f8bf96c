package networks

import "math"

// This file defines the metrics tonewright reports and designs to. The
// README's "Metrics" section documents them exactly as computed here.

// Response is anything with a gain in dB at a frequency: a Compiled chain or
// a Solver.
type Response interface {
	GainDB(f float64) float64
}

// GridPerDecade is the density of the log grid the metrics search on.
const GridPerDecade = 240

// minStep is how far, in dB, a grid point must lie below both neighbours to
// count as a local minimum: far above rounding, far below any audible dip.
const minStep = 1e-9

// MinProminence is how far, in dB, a local minimum must lie below the lower
// of its two shoulders to count as a scoop. A shallower dip is a ripple on
// a shelf that no ear hears, and measuring it against the far shoulder
// would report a shelf as a deep scoop.
const MinProminence = 0.1

// Scoop is a mid scoop: the interior minimum of the gain at Hz, its depth
// below the mean of the two shoulders and the balance between them.
type Scoop struct {
	Hz        float64 `json:"hz"`
	DepthDB   float64 `json:"depth_db"`
	BalanceDB float64 `json:"balance_db"`
}

// Meter measures responses over one band. It keeps its grids and buffers, so
// it does not allocate per measurement; it is not safe for concurrent use.
type Meter struct {
	band Band
	grid []float64 // the band, GridPerDecade per decade
	wide []float64 // band low to 10 × band high, for the corner
	g    []float64 // gains on grid
	gw   []float64 // gains on wide
}

// NewMeter returns a Meter for band, which must pass Band.Check.
func NewMeter(band Band) *Meter {
	m := &Meter{band: band}
	m.grid = LogGrid(band.From, band.To, GridPerDecade)
	m.wide = LogGrid(band.From, 10*band.To, GridPerDecade)
	m.g = make([]float64, len(m.grid))
	m.gw = make([]float64, len(m.wide))
	return m
}

// Band returns the meter's band.
func (m *Meter) Band() Band { return m.band }

// Gain1k returns G(1 kHz), the gain in dB at 1 kHz.
func Gain1k(r Response) float64 { return r.GainDB(1000) }

// Scoop finds the response's scoop. On the band's grid it takes every
// interior local minimum (a point more than minStep below both neighbours,
// equal neighbours allowed on the rising side), refines each by golden
// section in log f, and keeps the deepest: the one whose depth_db is the
// most negative. Shoulders: G_lo is the largest gain on [band low, f_s],
// G_hi the largest on [f_s, band high] (grid maxima, refined where they are
// interior); depth_db = G(f_s) − (G_lo + G_hi)/2, balance_db = G_hi − G_lo.
// A minimum less than MinProminence below the lower shoulder is not a
// scoop. found is false when there is no scoop.
func (m *Meter) Scoop(r Response) (s Scoop, found bool) {
	g := m.fill(r)
	n := len(g)
	best := Scoop{DepthDB: math.Inf(1)}
	for i := 1; i < n-1; i++ {
		if !(g[i] < g[i-1]-minStep) {
			continue
		}
		j := i + 1
		for j < n-1 && g[j] == g[i] {
			j++
		}
		if !(g[j] > g[i]+minStep) {
			continue
		}
		fs, gs := goldenMin(r, m.grid[i-1], m.grid[j])
		c, lower := m.shoulders(r, i, fs, gs)
		if lower-gs < MinProminence {
			i = j - 1
			continue
		}
		if c.DepthDB < best.DepthDB {
			best = c
		}
		found = true
		i = j - 1
	}
	return best, found
}

// LevelsAt measures the curve at frequency f as if f were the scoop: the
// gain there against the largest gain on each side of it, with depth_db and
// balance_db defined as for Scoop. The search uses it where a candidate has
// no scoop, so that it always has a slope to follow.
func (m *Meter) LevelsAt(r Response, f float64) Scoop {
	m.fill(r)
	return m.levelsAt(r, f)
}

// ScoopOrLevelsAt returns the scoop if there is one, else LevelsAt(f), with
// one pass over the grid.
func (m *Meter) ScoopOrLevelsAt(r Response, f float64) (s Scoop, found bool) {
	if s, ok := m.Scoop(r); ok {
		return s, true
	}
	return m.levelsAt(r, f), false
}

func (m *Meter) levelsAt(r Response, f float64) Scoop {
	f = math.Min(math.Max(f, m.band.From), m.band.To)
	i := 0
	for i < len(m.grid)-1 && m.grid[i+1] <= f {
		i++
	}
	s, _ := m.shoulders(r, i+1, f, r.GainDB(f))
	return s
}

// shoulders completes a Scoop at fs (gain gs), where grid points below
// index split lie at or below fs and the rest above it, and returns the
// lower of the two shoulders too.
func (m *Meter) shoulders(r Response, split int, fs, gs float64) (Scoop, float64) {
	lo := m.sideMax(r, 0, split, gs)
	hi := m.sideMax(r, split, len(m.grid), gs)
	return Scoop{Hz: fs, DepthDB: gs - (lo+hi)/2, BalanceDB: hi - lo}, math.Min(lo, hi)
}

// sideMax is the largest gain on grid[from:to] and at the split point,
// refined by golden section when it falls strictly inside the side.
func (m *Meter) sideMax(r Response, from, to int, gs float64) float64 {
	k, v := -1, gs
	for i := from; i < to; i++ {
		if m.g[i] > v {
			k, v = i, m.g[i]
		}
	}
	if k > from && k < to-1 {
		_, v = goldenMax(r, m.grid[k-1], m.grid[k+1])
	}
	return v
}

// Corner returns the output low-pass corner of a response (the chain at
// knob 1): from the frequency of maximum gain, searched from band low to
// 10 × band high, upward, the first frequency where the gain is 3 dB below
// that maximum (grid search, then bisection in log f). found is false when
// the gain does not fall 3 dB by 10 × band high.
func (m *Meter) Corner(r Response) (hz float64, found bool) {
	g := m.gw
	for i, f := range m.wide {
		g[i] = r.GainDB(f)
	}
	k := 0
	for i := range g {
		if g[i] > g[k] {
			k = i
		}
	}
	fmax, gmax := m.wide[k], g[k]
	if k > 0 && k < len(g)-1 {
		fmax, gmax = goldenMax(r, m.wide[k-1], m.wide[k+1])
	}
	target := gmax - 3
	for j := k + 1; j < len(g); j++ {
		if g[j] < target {
			lo := m.wide[j-1]
			if j == k+1 {
				lo = fmax
			}
			return bisectDown(r, lo, m.wide[j], target), true
		}
	}
	return 0, false
}

func (m *Meter) fill(r Response) []float64 {
	for i, f := range m.grid {
		m.g[i] = r.GainDB(f)
	}
	return m.g
}

const golden = 0.6180339887498949

// goldenMin returns the frequency and gain of the minimum of r on [a, b],
// by golden-section search in log f.
func goldenMin(r Response, a, b float64) (float64, float64) {
	return goldenSearch(r, a, b, 1)
}

// goldenMax returns the frequency and gain of the maximum of r on [a, b].
func goldenMax(r Response, a, b float64) (float64, float64) {
	f, g := goldenSearch(r, a, b, -1)
	return f, g
}

// goldenSearch minimises sign·G over [a, b] in log f until the bracket is
// 1e-10 decade wide.
func goldenSearch(r Response, a, b, sign float64) (float64, float64) {
	la, lb := math.Log10(a), math.Log10(b)
	x1 := lb - golden*(lb-la)
	x2 := la + golden*(lb-la)
	g := func(x float64) float64 { return sign * r.GainDB(math.Pow(10, x)) }
	f1, f2 := g(x1), g(x2)
	for lb-la > 1e-10 {
		if f1 <= f2 {
			lb, x2, f2 = x2, x1, f1
			x1 = lb - golden*(lb-la)
			f1 = g(x1)
		} else {
			la, x1, f1 = x1, x2, f2
			x2 = la + golden*(lb-la)
			f2 = g(x2)
		}
	}
	x := (la + lb) / 2
	return math.Pow(10, x), sign * g(x)
}

// bisectDown finds f in [lo, hi] with G(f) = target, where G(lo) ≥ target >
// G(hi), by bisection in log f to 1e-12 decade.
func bisectDown(r Response, lo, hi, target float64) float64 {
	a, b := math.Log10(lo), math.Log10(hi)
	for b-a > 1e-12 {
		c := (a + b) / 2
		if r.GainDB(math.Pow(10, c)) >= target {
			a = c
		} else {
			b = c
		}
	}
	return math.Pow(10, (a+b)/2)
}

// Peak returns the frequency and gain of the response's largest gain on the
// band: the largest grid point, refined by golden section in log f when it
// lies strictly inside the band (an end of the band is reported as it is).
func (m *Meter) Peak(r Response) (hz, gainDB float64) {
	g := m.fill(r)
	k := 0
	for i := range g {
		if g[i] > g[k] {
			k = i
		}
	}
	if k > 0 && k < len(g)-1 {
		return goldenMax(r, m.grid[k-1], m.grid[k+1])
	}
	return m.grid[k], g[k]
}
