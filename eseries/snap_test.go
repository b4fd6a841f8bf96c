package eseries

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func TestSnapTo(t *testing.T) {
	for _, test := range []struct {
		s       Set
		v       float64
		nearest float64
		below   float64 // 0 means none
		above   float64 // 0 means none
	}{
		{E24, 4700, 4700, 4700, 4700},
		{E24, 4500, 4700, 4300, 4700}, // 4700/4500 < 4500/4300: ratio, not difference, decides
		{E24, 4490, 4300, 4300, 4700},
		{E24, 4520, 4700, 4300, 4700},
		{E12, 1234, 1200, 1200, 1500},
		{E12, 9.1e3, 1e4, 8.2e3, 1e4},
		{E12, 2.2e-9 * (1 + 1e-12), 2.2e-9, 2.2e-9, 2.2e-9},
		{E24, 1e-20, 1e-15, 0, 1e-15},
		{E24, 1e20, 9.1e15, 9.1e15, 0},
		{mustList(t, 1, 4), 2, 4, 1, 4}, // exact tie on a log scale: 2/1 == 4/2, goes to Above
		{mustList(t, 1, 4), 1.999, 1, 1, 4},
		{Range(E24, 1e3, 1e6), 10, 1e3, 0, 1e3},
	} {
		got, err := SnapTo(test.s, test.v)
		if err != nil {
			t.Errorf("SnapTo(%v, %v): %v", test.s, test.v, err)
			continue
		}
		want := Snap{
			Value:    test.v,
			Nearest:  test.nearest,
			Below:    test.below,
			Above:    test.above,
			HasBelow: test.below != 0,
			HasAbove: test.above != 0,
		}
		want.NearestErr = (test.nearest - test.v) / test.v
		if want.HasBelow {
			want.BelowErr = (test.below - test.v) / test.v
		}
		if want.HasAbove {
			want.AboveErr = (test.above - test.v) / test.v
		}
		if got != want {
			t.Errorf("SnapTo(%v, %v) =\n %+v\nwant\n %+v", test.s, test.v, got, want)
		}
		n, err := Nearest(test.s, test.v)
		if err != nil || n != test.nearest {
			t.Errorf("Nearest(%v, %v) = %v, %v; want %v", test.s, test.v, n, err, test.nearest)
		}
	}
}

// TestSnapLogSpace checks that the nearest value is chosen by ratio, not by
// difference: between 4300 and 4700 the crossover is sqrt(4300×4700) ≈
// 4495.55, below the arithmetic midpoint 4500.
func TestSnapLogSpace(t *testing.T) {
	mid := math.Sqrt(4300 * 4700)
	for _, test := range []struct {
		v    float64
		want float64
	}{
		{mid * (1 - 1e-6), 4300},
		{mid * (1 + 1e-6), 4700},
		{4500, 4700}, // 200 from either, but the smaller ratio is to 4700
	} {
		got, err := Nearest(E24, test.v)
		if err != nil || got != test.want {
			t.Errorf("Nearest(E24, %v) = %v, %v; want %v", test.v, got, err, test.want)
		}
	}
}

func TestSnapErrors(t *testing.T) {
	for _, test := range []struct {
		s     Set
		v     float64
		want  string
		empty bool
	}{
		{E24, 0, "cannot snap 0", false},
		{E24, -4.7, "cannot snap -4.7", false},
		{E24, math.NaN(), "cannot snap NaN", false},
		{E24, math.Inf(1), "cannot snap +Inf", false},
		{E24, math.Inf(-1), "cannot snap -Inf", false},
		{&List{}, 1, "stock list (0 values)", true},
		{Range(E24, 4.8e3, 4.9e3), 1, "E24 in 4.8k..4.9k", true},
		{nil, 1, "no members", true},
	} {
		_, err := SnapTo(test.s, test.v)
		if err == nil {
			t.Errorf("SnapTo(%v, %v) gave no error", test.s, test.v)
			continue
		}
		if !strings.Contains(err.Error(), test.want) {
			t.Errorf("SnapTo(%v, %v) error %q should contain %q", test.s, test.v, err, test.want)
		}
		if errors.Is(err, ErrEmptySet) != test.empty {
			t.Errorf("SnapTo(%v, %v) error %q: errors.Is(ErrEmptySet) = %v", test.s, test.v, err, !test.empty)
		}
		if _, err := Nearest(test.s, test.v); err == nil {
			t.Errorf("Nearest(%v, %v) gave no error", test.s, test.v)
		}
	}
}

// TestListSnapsLikeSeries checks that a List holding the E12 values of a few
// decades snaps exactly as E12 does inside those decades.
func TestListSnapsLikeSeries(t *testing.T) {
	var vals []float64
	for _, x := range allMembers(E12) {
		if x >= 1 && x < 1e6 {
			vals = append(vals, x)
		}
	}
	l := mustList(t, vals...)
	if l.Len() != 6*12 {
		t.Fatalf("list has %d values, want 72", l.Len())
	}
	lo, hi := vals[0], vals[len(vals)-1]
	var probes []float64
	for i, x := range vals {
		probes = append(probes, x, x*(1+1e-10), x*(1-1e-10), x*(1+1e-8), x*(1-1e-8))
		if i > 0 {
			probes = append(probes, math.Sqrt(x*vals[i-1]), (x+vals[i-1])/2)
		}
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 5000 {
		probes = append(probes, lo*math.Pow(hi/lo, rng.Float64()))
	}
	for _, v := range probes {
		if v < lo || v > hi {
			continue
		}
		a, errA := SnapTo(l, v)
		b, errB := SnapTo(E12, v)
		if errA != nil || errB != nil || a != b {
			t.Fatalf("SnapTo at %v:\n list   %+v %v\n series %+v %v", v, a, errA, b, errB)
		}
	}
	// Outside the decades of the list, only one side exists.
	for _, v := range []float64{0.5, 2e6, math.Inf(1), math.Inf(-1), 0, -1} {
		gb, okb := l.Below(v)
		wb, wokb := bruteBelow(vals, v)
		ga, oka := l.Above(v)
		wa, woka := bruteAbove(vals, v)
		if gb != wb || okb != wokb || ga != wa || oka != woka {
			t.Errorf("list at %v: Below %v %v, Above %v %v; want %v %v, %v %v", v, gb, okb, ga, oka, wb, wokb, wa, woka)
		}
	}
}
