package networks

import (
	"fmt"
	"math"

	"tonewright/eseries"
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
		return fmt.Errorf("band %s–%s: both ends must be positive and finite", eseries.WithUnit(b.From, 3, "Hz"), eseries.WithUnit(b.To, 3, "Hz"))
	}
	if b.From >= b.To {
		return fmt.Errorf("band %s–%s: from must be below to", eseries.WithUnit(b.From, 3, "Hz"), eseries.WithUnit(b.To, 3, "Hz"))
	}
	if b.From < MinHz || b.To > MaxHz || b.To/b.From > MaxSpan {
		return fmt.Errorf("band %s–%s spans %.3g decades: keep it within %s–%s and at most %g decades wide", eseries.WithUnit(b.From, 3, "Hz"), eseries.WithUnit(b.To, 3, "Hz"), math.Log10(b.To/b.From), eseries.WithUnit(MinHz, 3, "Hz"), eseries.WithUnit(MaxHz, 3, "Hz"), math.Log10(MaxSpan))
	}
	return nil
}

// LogGrid returns frequencies from lo to hi inclusive, spaced exactly
// 1/perDecade of a decade apart from lo (lo·10^(k/perDecade)), with hi
// added as the last point when the steps do not land on it.
func LogGrid(lo, hi float64, perDecade int) []float64 {
	steps := math.Log10(hi/lo) * float64(perDecade)
	n := int(math.Floor(steps + 1e-9))
	g := make([]float64, 0, n+2)
	for k := 0; k <= n; k++ {
		g = append(g, lo*math.Pow(10, float64(k)/float64(perDecade)))
	}
	if steps-float64(n) > 1e-9 || len(g) < 2 {
		g = append(g, hi)
	} else {
		g[len(g)-1] = hi
	}
	return g
}
