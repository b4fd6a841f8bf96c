package eseries

import (
	"errors"
	"fmt"
	"math"
	"strconv"
)

// ErrEmptySet is wrapped by the error SnapTo and Nearest return when the
// set has no members to choose from.
var ErrEmptySet = errors.New("the set has no members")

// Snap is the result of fitting a wanted value to a Set.
type Snap struct {
	Value float64 // the value asked for

	Nearest float64 // the member nearest to Value on a log scale
	Below   float64 // the largest member <= Value; zero if !HasBelow
	Above   float64 // the smallest member >= Value; zero if !HasAbove

	HasBelow, HasAbove bool

	// Relative errors (chosen − Value)/Value of the three members; zero
	// for a member that does not exist.
	NearestErr, BelowErr, AboveErr float64
}

// SnapTo fits v to the members of s. Below and Above are the neighbours of
// v in s (a member within relative RelTol of v is both). Nearest is the
// neighbour with the smaller ratio error: Below if v/Below < Above/v, else
// Above, so an exact tie goes to Above. If v is beyond the ends of s the
// only neighbour is nearest.
//
// SnapTo returns an error if v is not positive and finite or s has no
// members; the latter wraps ErrEmptySet.
func SnapTo(s Set, v float64) (Snap, error) {
	if !(v > 0) || math.IsInf(v, 1) {
		return Snap{}, fmt.Errorf("cannot snap %s: the value must be positive and finite",
			strconv.FormatFloat(v, 'g', -1, 64))
	}
	if s == nil {
		return Snap{}, fmt.Errorf("cannot snap %s: %w", Format(v), ErrEmptySet)
	}
	r := Snap{Value: v}
	r.Below, r.HasBelow = s.Below(v)
	r.Above, r.HasAbove = s.Above(v)
	switch {
	case r.HasBelow && r.HasAbove:
		if r.Below == r.Above || v/r.Below < r.Above/v {
			r.Nearest = r.Below
		} else {
			r.Nearest = r.Above
		}
	case r.HasBelow:
		r.Nearest = r.Below
	case r.HasAbove:
		r.Nearest = r.Above
	default:
		return Snap{}, fmt.Errorf("cannot snap %s to %v: %w", Format(v), s, ErrEmptySet)
	}
	if r.HasBelow {
		r.BelowErr = (r.Below - v) / v
	} else {
		r.Below = 0
	}
	if r.HasAbove {
		r.AboveErr = (r.Above - v) / v
	} else {
		r.Above = 0
	}
	r.NearestErr = (r.Nearest - v) / v
	return r, nil
}

// Nearest returns the member of s nearest to v on a log scale, as
// SnapTo(s, v).Nearest.
func Nearest(s Set, v float64) (float64, error) {
	r, err := SnapTo(s, v)
	if err != nil {
		return 0, err
	}
	return r.Nearest, nil
}
