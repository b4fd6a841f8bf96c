package networks

import "math"

// This file defines the figures tonewright reports and designs to, each
// once. The README's "How the figures are computed" documents them exactly
// as computed here.

// Response is anything with a gain in dB at a frequency: a Compiled chain, a
// Solver, or any compiled evaluator of a network.
type Response interface {
	GainDB(f float64) float64
}

// PowerResponse is a Response that also gives the power gain |H(f)|²
// without a logarithm. The Meter scans its grids with it, which is cheaper,
// and takes logarithms only where a figure is reported; where the power
// leaves the normal range of float64 it scans in dB instead.
type PowerResponse interface {
	Response
	Power(f float64) float64
}

// GridPerDecade is the density of the log grid the figures search on.
const GridPerDecade = 240

// minStep is how far, in dB, a grid point must lie beyond a neighbour to
// count as a local extremum: far above rounding, far below any audible
// step.
const minStep = 1e-9

// MinProminence is how far, in dB, a local minimum must lie below the lower
// of its two shoulders to count as a scoop, and a local maximum above the
// higher of its two sides to count as a peak. A smaller dip or bump is a
// ripple on a shelf that no ear hears, and measuring it against the far
// shoulder would report a shelf as a deep scoop.
const MinProminence = 0.5

// CornerDrop is the fall, in dB, that defines a corner: exactly 3 dB.
const CornerDrop = 3.0

// Scoop is a mid scoop: the interior minimum of the gain at Hz, its depth
// below the mean of the two shoulders, the balance between them, and its
// dip below the lower shoulder.
type Scoop struct {
	Hz        float64 `json:"hz"`
	DepthDB   float64 `json:"depth_db"`
	BalanceDB float64 `json:"balance_db"`
	NotchDB   float64 `json:"notch_db"`
}

// Peak is a boost: the interior maximum of the gain at Hz, its height above
// the mean of the lowest gains on either side, the balance between them,
// and its rise above the higher of the two.
type Peak struct {
	Hz        float64 `json:"hz"`
	HeightDB  float64 `json:"height_db"`
	RiseDB    float64 `json:"rise_db"` // G(f_p) − max(M_lo, M_hi): the rise above the higher side
	BalanceDB float64 `json:"balance_db"`
}

// Meter measures responses over one band. It keeps its grids and buffers, so
// it does not allocate per measurement; it is not safe for concurrent use.
type Meter struct {
	band  Band
	grid  []float64 // the band, GridPerDecade per decade
	upper []float64 // band low to 10 × band high, for the corner
	lower []float64 // band low / 10 to band high, for the low corner
	g     []float64 // levels on grid
	gu    []float64 // levels on upper
	gl    []float64 // levels on lower
	lv    level     // how the levels in g, gu and gl are held
	pr    PowerResponse
}

// powerFiller is a PowerResponse that fills a whole grid at once, saving
// a dynamic call per point.
type powerFiller interface {
	fillPower(freqs, out []float64)
}

// level says how a Meter holds the gains of its last scan: in dB, or as
// power ratios |H|² (pw), which need no logarithm. The figures' thresholds
// are in dB; by and db convert between the two.
type level struct{ pw bool }

// in returns the level of x dB.
func (v level) in(x float64) float64 {
	if v.pw {
		return math.Pow(10, x/10)
	}
	return x
}

// db returns the level l in dB.
func (v level) db(l float64) float64 {
	if v.pw {
		return 10 * math.Log10(l)
	}
	return l
}

// NewMeter returns a Meter for band, which must pass Band.Check.
func NewMeter(band Band) *Meter {
	m := &Meter{band: band}
	m.grid = LogGrid(band.From, band.To, GridPerDecade)
	m.upper = LogGrid(band.From, 10*band.To, GridPerDecade)
	m.lower = LogGrid(band.From/10, band.To, GridPerDecade)
	m.g = make([]float64, len(m.grid))
	m.gu = make([]float64, len(m.upper))
	m.gl = make([]float64, len(m.lower))
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
// interior); depth_db = G(f_s) − (G_lo + G_hi)/2, balance_db = G_hi − G_lo,
// notch_db = G(f_s) − min(G_lo, G_hi). A minimum less than MinProminence
// below the lower shoulder is not a scoop. found is false when there is no
// scoop.
func (m *Meter) Scoop(r Response) (s Scoop, found bool) {
	g := m.fill(r, m.grid, m.g)
	best := Scoop{DepthDB: math.Inf(1)}
	m.lv.forExtrema(g, 1, func(i, j int) {
		fs, gs := m.golden(r, 1, m.grid[i-1], m.grid[j])
		c := m.shoulders(r, i, fs, gs)
		if c.NotchDB > -MinProminence {
			return
		}
		if c.DepthDB < best.DepthDB {
			best = c
		}
		found = true
	})
	return best, found
}

// Peak finds the response's peak, the mirror of Scoop: at every interior
// local maximum f_p of the band's grid (refined by golden section), M_lo
// and M_hi are the lowest gains on [band low, f_p] and [f_p, band high]
// (refined where interior); the maximum counts when G(f_p) is at least
// MinProminence above max(M_lo, M_hi); height_db = G(f_p) − (M_lo + M_hi)/2
// and balance_db = M_hi − M_lo, rise_db = G(f_p) − max(M_lo, M_hi). The
// peak reported has the largest height.
func (m *Meter) Peak(r Response) (p Peak, found bool) {
	g := m.fill(r, m.grid, m.g)
	best := Peak{HeightDB: math.Inf(-1)}
	m.lv.forExtrema(g, -1, func(i, j int) {
		fp, gp := m.golden(r, -1, m.grid[i-1], m.grid[j])
		lo := m.sideExtreme(r, 0, i, gp, -1)
		hi := m.sideExtreme(r, i, len(m.grid), gp, -1)
		if gp-math.Max(lo, hi) < MinProminence {
			return
		}
		if h := gp - (lo+hi)/2; h > best.HeightDB {
			best = Peak{Hz: fp, HeightDB: h, BalanceDB: hi - lo, RiseDB: gp - math.Max(lo, hi)}
		}
		found = true
	})
	return best, found
}

// forExtrema calls at(i, j) for every interior local minimum (sign 1) or
// maximum (sign −1) of the levels g: g[i] lies more than minStep dB beyond
// g[i−1], equal to it up to g[j−1], and g[j] lies more than minStep dB back
// again.
func (v level) forExtrema(g []float64, sign float64, at func(i, j int)) {
	n := len(g)
	// a lies more than minStep dB beyond b: a < b − minStep (in dB) or
	// a < b·10^(−minStep/10) (in power) for a minimum, the mirror for a
	// maximum.
	step := -sign * minStep
	if v.pw {
		step = math.Pow(10, step/10)
	}
	beyond := func(a, b float64) bool {
		if v.pw {
			b *= step
		} else {
			b += step
		}
		return sign*a < sign*b
	}
	for i := 1; i < n-1; i++ {
		if !beyond(g[i], g[i-1]) {
			continue
		}
		j := i + 1
		for j < n-1 && g[j] == g[i] {
			j++
		}
		if beyond(g[i], g[j]) {
			at(i, j)
		}
		i = j - 1
	}
}

// LevelsAt measures the curve at frequency f as if f were the scoop: the
// gain there against the largest gain on each side of it, with depth_db and
// balance_db defined as for Scoop. The search uses it where a candidate has
// no scoop, so that it always has a slope to follow.
func (m *Meter) LevelsAt(r Response, f float64) Scoop {
	m.fill(r, m.grid, m.g)
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
	return m.shoulders(r, i+1, f, r.GainDB(f))
}

// shoulders completes a Scoop at fs (gain gs), where grid points below
// index split lie at or below fs and the rest above it.
func (m *Meter) shoulders(r Response, split int, fs, gs float64) Scoop {
	lo := m.sideExtreme(r, 0, split, gs, 1)
	hi := m.sideExtreme(r, split, len(m.grid), gs, 1)
	return Scoop{Hz: fs, DepthDB: gs - (lo+hi)/2, BalanceDB: hi - lo, NotchDB: gs - math.Min(lo, hi)}
}

// sideExtreme is the largest (sign 1) or smallest (sign −1) gain on
// grid[from:to] and at the split point (gain gs), refined by golden section
// when it falls strictly inside the side.
func (m *Meter) sideExtreme(r Response, from, to int, gs, sign float64) float64 {
	k, l := -1, m.lv.in(gs)
	for i := from; i < to; i++ {
		if sign*m.g[i] > sign*l {
			k, l = i, m.g[i]
		}
	}
	switch {
	case k < 0:
		return gs
	case k > from && k < to-1:
		_, v := m.golden(r, -sign, m.grid[k-1], m.grid[k+1])
		return v
	}
	return m.lv.db(l)
}

// Corner returns the output low-pass corner of a response. On the grid
// from band low to 10 × band high the reference is the highest-frequency
// interior local maximum of G (refined by golden section), or the band-low
// point when G has none; the corner is the first frequency above the
// reference where G falls CornerDrop below it and after which G stays more
// than CornerDrop below it up to 10 × band high (located by bisection in
// log f). found is false when there is no such frequency.
func (m *Meter) Corner(r Response) (hz float64, found bool) {
	g, k := m.scanForReference(r, m.upper, m.gu, true)
	fref, gref := m.upper[0], m.lv.db(g[0])
	if k > 0 {
		fref, gref = m.golden(r, -1, m.upper[k-1], m.upper[k+1])
	} else {
		k = 0
	}
	target := gref - CornerDrop
	t := m.lv.in(target)
	last := len(g) - 1
	if g[last] >= t {
		return 0, false
	}
	j := last // the first point of the final run below target
	for j > k+1 && g[j-1] < t {
		j--
	}
	lo := m.upper[j-1]
	if j == k+1 {
		lo = fref
	}
	return m.bisect(r, lo, m.upper[j], target), true
}

// LowCorner returns the low corner, the mirror of Corner: on the grid from
// band low / 10 to band high the reference is the lowest-frequency interior
// local maximum of G (the band-high point when G has none); the low corner
// is the first frequency below the reference where G falls CornerDrop
// below it and below which G stays more than CornerDrop below it down to
// band low / 10. found is false when there is none.
func (m *Meter) LowCorner(r Response) (hz float64, found bool) {
	g, k := m.scanForReference(r, m.lower, m.gl, false)
	last := len(g) - 1
	fref, gref := m.lower[last], m.lv.db(g[last])
	if k > 0 {
		fref, gref = m.golden(r, -1, m.lower[k-1], m.lower[k+1])
	} else {
		k = last
	}
	target := gref - CornerDrop
	t := m.lv.in(target)
	if g[0] >= t {
		return 0, false
	}
	j := 0 // the last point of the first run below target
	for j < k-1 && g[j+1] < t {
		j++
	}
	hi := m.lower[j+1]
	if j == k-1 {
		hi = fref
	}
	return m.bisect(r, hi, m.lower[j], target), true
}

// cornerBlock is how many grid points the corners' scans evaluate at a
// time.
const cornerBlock = GridPerDecade / 4

// scanForReference evaluates r on grid a block at a time, from the top end
// (down, for the corner) or from the bottom end (up, for the low corner),
// until it meets the corner's reference: the interior local maximum
// nearest that end, by forExtrema's test on the same values a whole scan
// gives. It returns the levels and the maximum's index, or −1 when there
// is none. The levels are filled from the maximum (or the far end) to the
// near end, which is all the corner's definition reads.
func (m *Meter) scanForReference(r Response, grid, g []float64, down bool) ([]float64, int) {
	n := len(grid)
	m.lv = level{}
	if p, ok := r.(PowerResponse); ok {
		m.lv, m.pr = level{pw: true}, p
	}
	fill := func(a, b int) { // fills [a, b), in dB everywhere once a power is out of range
		if !m.fillRange(r, grid, g, a, b) {
			m.lv = level{}
			if down {
				m.fillRange(r, grid, g, a, n)
			} else {
				m.fillRange(r, grid, g, 0, b)
			}
		}
	}
	k := -1
	if down {
		for lo := n; lo > 0 && k < 0; {
			next := max(0, lo-cornerBlock)
			fill(next, lo)
			// The maxima whose test reads only [next, lo+1] (and a
			// plateau's end above) are the ones not tested before.
			end := min(n, lo+2)
			for end < n && g[end-1] == g[end-2] {
				end++
			}
			m.lv.forExtrema(g[next:end], -1, func(i, j int) { k = next + i })
			lo = next
		}
		return g, k
	}
	for hi, from := 0, 0; hi < n && k < 0; {
		next := min(n, hi+cornerBlock)
		fill(hi, next)
		for next < n && g[next-1] == g[next-2] { // a plateau reaching the block's end
			fill(next, next+1)
			next++
		}
		m.lv.forExtrema(g[from:next], -1, func(i, j int) {
			if k < 0 {
				k = from + i
			}
		})
		hi, from = next, max(0, next-2)
	}
	return g, k
}

// fillRange fills the levels at grid indices [a, b): as powers when m.lv
// says so and they are all normal numbers (it reports false when one is
// not), else in dB.
func (m *Meter) fillRange(r Response, grid, g []float64, a, b int) bool {
	if !m.lv.pw {
		for i := a; i < b; i++ {
			g[i] = r.GainDB(grid[i])
		}
		return true
	}
	if pf, ok := r.(powerFiller); ok {
		pf.fillPower(grid[a:b], g[a:b])
	} else {
		for i := a; i < b; i++ {
			g[i] = m.pr.Power(grid[i])
		}
	}
	for _, v := range g[a:b] {
		if !(v >= 0x1p-1000 && v <= 0x1p1000) {
			return false
		}
	}
	return true
}

// fill evaluates r on grid into g, as power ratios when r gives them and
// they are all normal numbers, else in dB, and sets m.lv to say which.
func (m *Meter) fill(r Response, grid, g []float64) []float64 {
	if p, ok := r.(PowerResponse); ok {
		if pf, ok := r.(powerFiller); ok {
			pf.fillPower(grid, g)
		} else {
			for i, f := range grid {
				g[i] = p.Power(f)
			}
		}
		normal := true
		for _, v := range g {
			normal = normal && v >= 0x1p-1000 && v <= 0x1p1000
		}
		if normal {
			m.lv, m.pr = level{pw: true}, p
			return g
		}
	}
	m.lv = level{}
	for i, f := range grid {
		g[i] = r.GainDB(f)
	}
	return g
}

const golden = 0.6180339887498949

// at returns r's level at f, in the Meter's level domain.
func (m *Meter) at(r Response, f float64) float64 {
	if m.lv.pw {
		return m.pr.Power(f)
	}
	return r.GainDB(f)
}

// golden finds the minimum (sign 1) or maximum (sign −1) of G on [a, b]
// by golden-section search in ln f until the bracket is 1e-10 decade wide,
// and returns its frequency and G there in dB.
func (m *Meter) golden(r Response, sign, a, b float64) (float64, float64) {
	la, lb := math.Log(a), math.Log(b)
	x1 := lb - golden*(lb-la)
	x2 := la + golden*(lb-la)
	g := func(x float64) float64 { return sign * m.at(r, math.Exp(x)) }
	f1, f2 := g(x1), g(x2)
	for lb-la > 1e-10*math.Ln10 {
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
	f := math.Exp((la + lb) / 2)
	return f, r.GainDB(f)
}

// bisect finds f between from and to with G(f) = target dB, where
// G(from) ≥ target > G(to), by bisection in ln f to 1e-12 decade. from
// may lie above or below to.
func (m *Meter) bisect(r Response, from, to, target float64) float64 {
	a, b := math.Log(from), math.Log(to)
	t := m.lv.in(target)
	for math.Abs(b-a) > 1e-12*math.Ln10 {
		c := (a + b) / 2
		if m.at(r, math.Exp(c)) >= t {
			a = c
		} else {
			b = c
		}
	}
	return math.Exp((a + b) / 2)
}
