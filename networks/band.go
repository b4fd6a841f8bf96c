package networks

import (
	"fmt"
	"math"
)

// Band is the analysis band in hertz.
type Band struct {
	From, To float64
}

// DefaultBand is the audio band, 20 Hz to 20 kHz.
var DefaultBand = Band{From: 20, To: 20000}

// The limits of a band: the metrics search up to ten times its top, on a
// grid whose size grows with its width.
const (
	MinHz   = 1e-3
	MaxHz   = 1e9
	MaxSpan = 1e8 // to/from
)

// Check reports whether the band is usable.
func (b Band) Check() error {
	if !(b.From > 0) || math.IsInf(b.From, 0) || !(b.To > 0) || math.IsInf(b.To, 0) {
		return fmt.Errorf("band %v–%v Hz: both ends must be positive and finite", b.From, b.To)
	}
	if b.From >= b.To {
		return fmt.Errorf("band %v–%v Hz: from must be below to", b.From, b.To)
	}
	if b.From < MinHz || b.To > MaxHz || b.To/b.From > MaxSpan {
		return fmt.Errorf("band %v–%v Hz: keep it within %g Hz–%g Hz and at most %g decades wide", b.From, b.To, MinHz, MaxHz, math.Log10(MaxSpan))
	}
	return nil
}

// LogGrid returns n ≥ 2 frequencies from lo to hi inclusive, evenly spaced in
// log f, with at least perDecade points per decade.
func LogGrid(lo, hi float64, perDecade int) []float64 {
	dec := math.Log10(hi / lo)
	n := int(math.Ceil(dec*float64(perDecade))) + 1
	if n < 2 {
		n = 2
	}
	g := make([]float64, n)
	step := dec / float64(n-1)
	l0 := math.Log10(lo)
	for i := range g {
		g[i] = math.Pow(10, l0+step*float64(i))
	}
	g[0], g[n-1] = lo, hi
	return g
}
