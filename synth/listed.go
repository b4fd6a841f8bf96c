package synth

import (
	"math"

	"tonewright/eseries"
)

// listedMax bounds the members listed: an E192 series over the default
// ranges holds about a thousand.
const listedMax = 20000

// listed returns set as an eseries.List of its members when it has at most
// listedMax of them (a series within a part range, a stock list), and set
// itself otherwise. The list holds the same members, so Below, Above,
// SnapTo, Next and Prev give the same answers; each is then one binary
// search, where a series finds its decade with logarithms and powers: the
// walk asks millions of times.
func listed(set eseries.Set) eseries.Set {
	if set == nil {
		return set
	}
	if _, ok := set.(*eseries.List); ok {
		return set
	}
	var ms []float64
	m, ok := set.Above(math.SmallestNonzeroFloat64)
	for ok {
		if len(ms) == listedMax {
			return set
		}
		ms = append(ms, m)
		m, ok = eseries.Next(set, m)
	}
	if len(ms) == 0 {
		return set
	}
	l, err := eseries.NewList(ms)
	if err != nil {
		return set
	}
	return l
}
