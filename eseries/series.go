package eseries

import (
	"fmt"
	"math"
	"strings"
)

// Series is a preferred-number series: a fixed list of mantissas repeated in
// every decade. A *Series is a Set whose members are m × 10^k for every
// mantissa m and every decade k from -15 to 15, so the smallest member is
// Mantissas[0] × 1e-15 and the largest Mantissas[len-1] × 1e15.
//
// Members are the float64 nearest to the decimal value m × 10^k, the same
// float64 that Parse returns for that value written out in any accepted
// form, so E24 holds 4700 and 2.2e-9 exactly.
//
// The package-level series must not be modified. A caller may build a
// custom Series; its Mantissas must be ascending and lie in [1, 10).
type Series struct {
	Name      string    // "E24"
	Mantissas []float64 // ascending, in [1, 10)
	Tolerance float64   // tolerance implied by the series, as a fraction (0.05 for E24)
}

// The IEC 60063 preferred-number series. The mantissas are typed in from the
// tables of IEC 60063 (from memory), not computed: the tables differ from
// rounded powers 10^(i/n) in several places, most visibly in E24 (2.7, 3.0,
// 3.3, 3.6, 3.9, 4.3, 4.7, 8.2) and in E192 (9.20, where the formula gives
// 9.19).
var (
	// E3 is the IEC 60063 E3 series. The standard gives no tolerance other
	// than "wider than 20 %"; 40 % is the figure commonly quoted (from
	// memory).
	E3 = &Series{Name: "E3", Tolerance: 0.40, Mantissas: []float64{
		1.0, 2.2, 4.7,
	}}

	// E6 is the IEC 60063 E6 series, 20 % parts.
	E6 = &Series{Name: "E6", Tolerance: 0.20, Mantissas: []float64{
		1.0, 1.5, 2.2, 3.3, 4.7, 6.8,
	}}

	// E12 is the IEC 60063 E12 series, 10 % parts.
	E12 = &Series{Name: "E12", Tolerance: 0.10, Mantissas: []float64{
		1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2,
	}}

	// E24 is the IEC 60063 E24 series, 5 % parts.
	E24 = &Series{Name: "E24", Tolerance: 0.05, Mantissas: []float64{
		1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
		3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
	}}

	// E48 is the IEC 60063 E48 series, 2 % parts.
	E48 = &Series{Name: "E48", Tolerance: 0.02, Mantissas: []float64{
		1.00, 1.05, 1.10, 1.15, 1.21, 1.27, 1.33, 1.40, 1.47, 1.54, 1.62, 1.69,
		1.78, 1.87, 1.96, 2.05, 2.15, 2.26, 2.37, 2.49, 2.61, 2.74, 2.87, 3.01,
		3.16, 3.32, 3.48, 3.65, 3.83, 4.02, 4.22, 4.42, 4.64, 4.87, 5.11, 5.36,
		5.62, 5.90, 6.19, 6.49, 6.81, 7.15, 7.50, 7.87, 8.25, 8.66, 9.09, 9.53,
	}}

	// E96 is the IEC 60063 E96 series, 1 % parts.
	E96 = &Series{Name: "E96", Tolerance: 0.01, Mantissas: []float64{
		1.00, 1.02, 1.05, 1.07, 1.10, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.30,
		1.33, 1.37, 1.40, 1.43, 1.47, 1.50, 1.54, 1.58, 1.62, 1.65, 1.69, 1.74,
		1.78, 1.82, 1.87, 1.91, 1.96, 2.00, 2.05, 2.10, 2.15, 2.21, 2.26, 2.32,
		2.37, 2.43, 2.49, 2.55, 2.61, 2.67, 2.74, 2.80, 2.87, 2.94, 3.01, 3.09,
		3.16, 3.24, 3.32, 3.40, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12,
		4.22, 4.32, 4.42, 4.53, 4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49,
		5.62, 5.76, 5.90, 6.04, 6.19, 6.34, 6.49, 6.65, 6.81, 6.98, 7.15, 7.32,
		7.50, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76,
	}}

	// E192 is the IEC 60063 E192 series, 0.5 % parts.
	E192 = &Series{Name: "E192", Tolerance: 0.005, Mantissas: []float64{
		1.00, 1.01, 1.02, 1.04, 1.05, 1.06, 1.07, 1.09, 1.10, 1.11, 1.13, 1.14,
		1.15, 1.17, 1.18, 1.20, 1.21, 1.23, 1.24, 1.26, 1.27, 1.29, 1.30, 1.32,
		1.33, 1.35, 1.37, 1.38, 1.40, 1.42, 1.43, 1.45, 1.47, 1.49, 1.50, 1.52,
		1.54, 1.56, 1.58, 1.60, 1.62, 1.64, 1.65, 1.67, 1.69, 1.72, 1.74, 1.76,
		1.78, 1.80, 1.82, 1.84, 1.87, 1.89, 1.91, 1.93, 1.96, 1.98, 2.00, 2.03,
		2.05, 2.08, 2.10, 2.13, 2.15, 2.18, 2.21, 2.23, 2.26, 2.29, 2.32, 2.34,
		2.37, 2.40, 2.43, 2.46, 2.49, 2.52, 2.55, 2.58, 2.61, 2.64, 2.67, 2.71,
		2.74, 2.77, 2.80, 2.84, 2.87, 2.91, 2.94, 2.98, 3.01, 3.05, 3.09, 3.12,
		3.16, 3.20, 3.24, 3.28, 3.32, 3.36, 3.40, 3.44, 3.48, 3.52, 3.57, 3.61,
		3.65, 3.70, 3.74, 3.79, 3.83, 3.88, 3.92, 3.97, 4.02, 4.07, 4.12, 4.17,
		4.22, 4.27, 4.32, 4.37, 4.42, 4.48, 4.53, 4.59, 4.64, 4.70, 4.75, 4.81,
		4.87, 4.93, 4.99, 5.05, 5.11, 5.17, 5.23, 5.30, 5.36, 5.42, 5.49, 5.56,
		5.62, 5.69, 5.76, 5.83, 5.90, 5.97, 6.04, 6.12, 6.19, 6.26, 6.34, 6.42,
		6.49, 6.57, 6.65, 6.73, 6.81, 6.90, 6.98, 7.06, 7.15, 7.23, 7.32, 7.41,
		7.50, 7.59, 7.68, 7.77, 7.87, 7.96, 8.06, 8.16, 8.25, 8.35, 8.45, 8.56,
		8.66, 8.76, 8.87, 8.98, 9.09, 9.20, 9.31, 9.42, 9.53, 9.65, 9.76, 9.88,
	}}
)

// standard lists the IEC 60063 series from coarsest to finest.
var standard = []*Series{E3, E6, E12, E24, E48, E96, E192}

// SeriesNames returns the names of the standard series, coarsest first:
// "E3", "E6", "E12", "E24", "E48", "E96", "E192".
func SeriesNames() []string {
	names := make([]string, len(standard))
	for i, s := range standard {
		names[i] = s.Name
	}
	return names
}

// SeriesByName returns the standard series with the given name. The match
// ignores case and surrounding white space, so "E24", "e24" and " E24 " all
// give E24.
func SeriesByName(name string) (*Series, error) {
	n := strings.TrimSpace(name)
	for _, s := range standard {
		if strings.EqualFold(n, s.Name) {
			return s, nil
		}
	}
	return nil, fmt.Errorf("unknown series %q: use one of %s", name, strings.Join(SeriesNames(), ", "))
}

// String returns the name of the series, or a description if it has none.
func (s *Series) String() string {
	if s == nil {
		return "empty series"
	}
	if s.Name != "" {
		return s.Name
	}
	return fmt.Sprintf("custom series (%d values per decade)", len(s.Mantissas))
}

// Decades spanned by a Series: members are m × 10^k for minDecade <= k <= maxDecade.
const (
	minDecade = -15
	maxDecade = 15
)

// pow10tab holds the powers of ten that are exact in float64.
var pow10tab = [...]float64{
	1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
}

// member returns the float64 nearest to the decimal m × 10^k.
//
// The mantissa is first turned into an integer r = m × 10^d with the fewest
// decimals d (22 for 2.2, 920 for 9.20). Both r and 10^|k-d| are then exact
// in float64, so one IEEE multiplication or division rounds the exact
// decimal value correctly. This is the fast path of decimal conversion; it
// gives the same float64 as strconv.ParseFloat without allocating.
func member(m float64, k int) float64 {
	for d := 0; d < 16; d++ {
		s := m * pow10tab[d]
		r := math.Round(s)
		if math.Abs(s-r) > 1e-12*s {
			continue
		}
		switch e := k - d; {
		case e >= 0 && e < len(pow10tab):
			return r * pow10tab[e]
		case e < 0 && -e < len(pow10tab):
			return r / pow10tab[-e]
		}
		break
	}
	// A mantissa with many digits in an extreme decade: close, not exact.
	return m * math.Pow10(k)
}

// first returns the smallest member of s. s must have mantissas.
func (s *Series) first() float64 { return member(s.Mantissas[0], minDecade) }

// last returns the largest member of s. s must have mantissas.
func (s *Series) last() float64 { return member(s.Mantissas[len(s.Mantissas)-1], maxDecade) }

// decade returns the largest decade k in [minDecade, maxDecade] whose first
// member is <= t. The caller guarantees t >= s.first().
func (s *Series) decade(t float64) int {
	m0 := s.Mantissas[0]
	k := minDecade
	if l := math.Log10(t / m0); l > minDecade {
		k = min(int(math.Floor(l)), maxDecade)
	}
	for k < maxDecade && member(m0, k+1) <= t {
		k++
	}
	for k > minDecade && member(m0, k) > t {
		k--
	}
	return k
}

// Below returns the largest member of s that is <= v, allowing a relative
// difference of RelTol. It reports false if there is none.
func (s *Series) Below(v float64) (float64, bool) {
	if s == nil || len(s.Mantissas) == 0 || !(v > 0) {
		return 0, false
	}
	t := v + RelTol*v
	if t < s.first() {
		return 0, false
	}
	if hi := s.last(); t >= hi {
		return hi, true
	}
	k := s.decade(t)
	// Invariant: member(i, k) <= t < member(j, k), j == n meaning the next decade.
	i, j := 0, len(s.Mantissas)
	for j-i > 1 {
		h := (i + j) / 2
		if member(s.Mantissas[h], k) <= t {
			i = h
		} else {
			j = h
		}
	}
	return member(s.Mantissas[i], k), true
}

// Above returns the smallest member of s that is >= v, allowing a relative
// difference of RelTol. It reports false if there is none.
func (s *Series) Above(v float64) (float64, bool) {
	if s == nil || len(s.Mantissas) == 0 || math.IsNaN(v) || math.IsInf(v, 1) {
		return 0, false
	}
	t := v - RelTol*math.Abs(v)
	if lo := s.first(); t <= lo {
		return lo, true
	}
	n := len(s.Mantissas)
	if t > s.last() {
		return 0, false
	}
	k := s.decade(t)
	if member(s.Mantissas[n-1], k) < t {
		// t lies between this decade's last member and the next decade's
		// first; k < maxDecade because t <= s.last().
		return member(s.Mantissas[0], k+1), true
	}
	// Invariant: member(i, k) < t <= member(j, k).
	i, j := -1, n-1
	for j-i > 1 {
		h := (i + j) / 2
		if member(s.Mantissas[h], k) >= t {
			j = h
		} else {
			i = h
		}
	}
	return member(s.Mantissas[j], k), true
}
