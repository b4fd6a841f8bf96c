package eseries

import (
	"fmt"
	"math"
	"slices"
	"strconv"
)

// RelTol is the relative difference below which two values count as the
// same value: Below, Above, Next, Prev and Contains treat x as equal to v
// when |x-v| <= RelTol×|v|. It absorbs the rounding of values that went
// through arithmetic or printing on their way in.
const RelTol = 1e-9

// Set is a set of allowed part values, ascending, positive.
type Set interface {
	// Below returns the largest allowed value <= v (within relative
	// RelTol); false if there is none.
	Below(v float64) (float64, bool)
	// Above returns the smallest allowed value >= v (within relative
	// RelTol); false if there is none.
	Above(v float64) (float64, bool)
	// String describes the set: "E24", "stock list (12 values)",
	// "E24 in 1k..1M".
	String() string
}

// List is a Set holding an explicit list of values, such as the parts in
// stock. The zero value is an empty list.
type List struct {
	values []float64 // ascending, no two within RelTol
}

// NewList returns a List holding values, sorted and with duplicates
// removed; values within relative RelTol of a smaller one are dropped. Every
// value must be positive and finite, and there must be at least one. The
// slice is copied.
func NewList(values []float64) (*List, error) {
	if len(values) == 0 {
		return nil, fmt.Errorf("empty value list: give at least one positive value")
	}
	for i, v := range values {
		if !(v > 0) || math.IsInf(v, 1) {
			return nil, fmt.Errorf("item %d of the list is %s: values must be positive and finite",
				i+1, strconv.FormatFloat(v, 'g', -1, 64))
		}
	}
	vs := slices.Clone(values)
	slices.Sort(vs)
	out := vs[:1]
	for _, v := range vs[1:] {
		if v > out[len(out)-1]*(1+RelTol) {
			out = append(out, v)
		}
	}
	return &List{values: slices.Clip(out)}, nil
}

// Values returns a copy of the values of l, ascending.
func (l *List) Values() []float64 {
	if l == nil {
		return nil
	}
	return slices.Clone(l.values)
}

// Len returns the number of values in l.
func (l *List) Len() int {
	if l == nil {
		return 0
	}
	return len(l.values)
}

// Below returns the largest value of l that is <= v (within relative
// RelTol); false if there is none.
func (l *List) Below(v float64) (float64, bool) {
	if l == nil || len(l.values) == 0 || math.IsNaN(v) || math.IsInf(v, -1) {
		return 0, false
	}
	t := v + RelTol*math.Abs(v)
	// Find the first index with values[i] > t.
	i, j := 0, len(l.values)
	for i < j {
		h := (i + j) / 2
		if l.values[h] <= t {
			i = h + 1
		} else {
			j = h
		}
	}
	if i == 0 {
		return 0, false
	}
	return l.values[i-1], true
}

// Above returns the smallest value of l that is >= v (within relative
// RelTol); false if there is none.
func (l *List) Above(v float64) (float64, bool) {
	if l == nil || len(l.values) == 0 || math.IsNaN(v) || math.IsInf(v, 1) {
		return 0, false
	}
	t := v - RelTol*math.Abs(v)
	// Find the first index with values[i] >= t.
	i, j := 0, len(l.values)
	for i < j {
		h := (i + j) / 2
		if l.values[h] < t {
			i = h + 1
		} else {
			j = h
		}
	}
	if i == len(l.values) {
		return 0, false
	}
	return l.values[i], true
}

// String returns "stock list (n values)".
func (l *List) String() string {
	n := l.Len()
	if n == 1 {
		return "stock list (1 value)"
	}
	return fmt.Sprintf("stock list (%d values)", n)
}

// rangeSet is the part of a Set within [lo, hi].
type rangeSet struct {
	s      Set
	lo, hi float64
}

// Range returns the members of s within [lo, hi], the bounds included
// within relative RelTol. Use 0 or math.Inf for an open end. The set is
// empty if lo > hi or either bound is NaN.
func Range(s Set, lo, hi float64) Set {
	return &rangeSet{s: s, lo: lo, hi: hi}
}

func (r *rangeSet) empty() bool {
	return r.s == nil || !(r.lo <= r.hi)
}

func (r *rangeSet) Below(v float64) (float64, bool) {
	if r.empty() || math.IsNaN(v) {
		return 0, false
	}
	x, ok := r.s.Below(min(v, r.hi))
	if !ok || x < r.lo-RelTol*math.Abs(r.lo) {
		return 0, false
	}
	return x, true
}

func (r *rangeSet) Above(v float64) (float64, bool) {
	if r.empty() || math.IsNaN(v) {
		return 0, false
	}
	x, ok := r.s.Above(max(v, r.lo))
	if !ok || x > r.hi+RelTol*math.Abs(r.hi) {
		return 0, false
	}
	return x, true
}

func (r *rangeSet) String() string {
	name := "empty set"
	if r.s != nil {
		name = r.s.String()
	}
	return name + " in " + Format(r.lo) + ".." + Format(r.hi)
}

// Next returns the smallest member of s strictly greater than v, members
// within relative RelTol of v counting as v itself. It reports false if
// there is none.
func Next(s Set, v float64) (float64, bool) {
	if s == nil || math.IsNaN(v) {
		return 0, false
	}
	if math.IsInf(v, -1) {
		return s.Above(v)
	}
	limit := v + RelTol*math.Abs(v) // the answer must exceed this
	// Above(w) looks down to w×(1-RelTol); aim that at limit.
	w := limit / (1 - RelTol)
	if limit < 0 {
		w = limit / (1 + RelTol)
	}
	for range 8 {
		x, ok := s.Above(w)
		if !ok {
			return 0, false
		}
		if x > limit {
			return x, true
		}
		// Rounding let a member equal to v through; aim past it.
		w = math.Nextafter(max(w, x/(1-RelTol)), math.Inf(1))
	}
	return 0, false
}

// Prev returns the largest member of s strictly smaller than v, members
// within relative RelTol of v counting as v itself. It reports false if
// there is none.
func Prev(s Set, v float64) (float64, bool) {
	if s == nil || math.IsNaN(v) {
		return 0, false
	}
	if math.IsInf(v, 1) {
		return s.Below(v)
	}
	limit := v - RelTol*math.Abs(v) // the answer must be below this
	if limit <= 0 {
		return 0, false // members are positive
	}
	// Below(w) looks up to w×(1+RelTol); aim that at limit.
	w := limit / (1 + RelTol)
	for range 8 {
		x, ok := s.Below(w)
		if !ok {
			return 0, false
		}
		if x < limit {
			return x, true
		}
		// Rounding let a member equal to v through; aim below it.
		w = math.Nextafter(min(w, x/(1+RelTol)), math.Inf(-1))
	}
	return 0, false
}

// Contains reports whether s has a member within relative RelTol of v.
func Contains(s Set, v float64) bool {
	if s == nil || !(v > 0) || math.IsInf(v, 1) {
		return false
	}
	x, ok := s.Below(v)
	return ok && x >= v-RelTol*v
}
