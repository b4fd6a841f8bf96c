package eseries

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// allMembers lists every member of s, built through strconv.
func allMembers(s *Series) []float64 {
	var out []float64
	for k := minDecade; k <= maxDecade; k++ {
		for _, m := range s.Mantissas {
			v, _ := strconv.ParseFloat(strconv.FormatFloat(m, 'f', -1, 64)+"e"+strconv.Itoa(k), 64)
			out = append(out, v)
		}
	}
	return out
}

// bruteBelow and bruteAbove are the definitions of Below and Above.
func bruteBelow(vals []float64, v float64) (float64, bool) {
	best, ok := 0.0, false
	for _, x := range vals {
		if x <= v+RelTol*math.Abs(v) {
			best, ok = x, true
		}
	}
	return best, ok
}

func bruteAbove(vals []float64, v float64) (float64, bool) {
	for _, x := range vals {
		if x >= v-RelTol*math.Abs(v) {
			return x, true
		}
	}
	return 0, false
}

func TestSeriesAgainstBrute(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, s := range standard {
		vals := allMembers(s)
		var probes []float64
		for _, x := range vals {
			// Members, and values just inside and just outside the tolerance.
			probes = append(probes, x, x*(1+0.5e-9), x*(1-0.5e-9), x*(1+2e-9), x*(1-2e-9))
		}
		for range 2000 {
			probes = append(probes, math.Pow(10, rng.Float64()*34-17))
		}
		probes = append(probes, 0, -1, math.Inf(1), math.Inf(-1), 1e-300, 1e300)
		for _, v := range probes {
			gb, okb := s.Below(v)
			wb, wokb := bruteBelow(vals, v)
			if gb != wb || okb != wokb {
				t.Fatalf("%s.Below(%v) = %v, %v; want %v, %v", s, v, gb, okb, wb, wokb)
			}
			ga, oka := s.Above(v)
			wa, woka := bruteAbove(vals, v)
			if ga != wa || oka != woka {
				t.Fatalf("%s.Above(%v) = %v, %v; want %v, %v", s, v, ga, oka, wa, woka)
			}
		}
	}
}

func TestBelowAbove(t *testing.T) {
	inf := math.Inf(1)
	for _, test := range []struct {
		s            Set
		v            float64
		below, above float64 // 0 means none
	}{
		{E24, 4700, 4700, 4700},
		{E24, 4699.999999, 4700, 4700}, // within RelTol
		{E24, 4699.99, 4300, 4700},
		{E24, 5000, 4700, 5100},
		{E24, 9500, 9100, 10000},
		{E24, 1e-16, 0, 1e-15},
		{E24, 1e-15, 1e-15, 1e-15},
		{E24, 9.1e15, 9.1e15, 9.1e15},
		{E24, 1e16, 9.1e15, 0},
		{E24, inf, 9.1e15, 0},
		{E24, 0, 0, 1e-15},
		{E24, -5, 0, 1e-15},
		{E24, math.NaN(), 0, 0},
		{E12, 2.2e-9, 2.2e-9, 2.2e-9},
		{E12, 3e-9, 2.7e-9, 3.3e-9},
		{E3, 1e3, 1e3, 1e3},
		{E3, 5e3, 4.7e3, 1e4},
		{E192, 9.19, 9.09, 9.2},
		{mustList(t, 10, 22, 47), 30, 22, 47},
		{mustList(t, 10, 22, 47), 5, 0, 10},
		{mustList(t, 10, 22, 47), 50, 47, 0},
		{mustList(t, 10, 22, 47), -1, 0, 10},
		{mustList(t, 10, 22, 47), math.NaN(), 0, 0},
		{Range(E24, 1e3, 1e6), 500, 0, 1e3},
		{Range(E24, 1e3, 1e6), 2e6, 1e6, 0},
		{Range(E24, 1e3, 1e6), 5e3, 4.7e3, 5.1e3},
		{Range(E24, 1e3, 1e6), 1e3 * (1 + 1e-10), 1e3, 1e3}, // bound within RelTol
		{Range(E24, 4.8e3, 4.9e3), 4.85e3, 0, 0},
		{Range(E24, 1e6, 1e3), 5e3, 0, 0},
		{Range(E24, math.NaN(), 1e3), 5e2, 0, 0},
		{Range(E24, 0, inf), 5e3, 4.7e3, 5.1e3},
		{Range(E24, math.Inf(-1), inf), 1e20, 9.1e15, 0},
		{&List{}, 1, 0, 0},
		{(*List)(nil), 1, 0, 0},
		{&Series{}, 1, 0, 0},
		{(*Series)(nil), 1, 0, 0},
	} {
		b, okb := test.s.Below(test.v)
		if b != test.below || okb != (test.below != 0) {
			t.Errorf("%v.Below(%v) = %v, %v; want %v", test.s, test.v, b, okb, test.below)
		}
		a, oka := test.s.Above(test.v)
		if a != test.above || oka != (test.above != 0) {
			t.Errorf("%v.Above(%v) = %v, %v; want %v", test.s, test.v, a, oka, test.above)
		}
	}
}

func TestNextPrevContains(t *testing.T) {
	inf := math.Inf(1)
	close := mustList(t, 1, 1+1.5e-9, 2) // 1+1.5e-9 is just outside RelTol of 1
	for _, test := range []struct {
		s          Set
		v          float64
		prev, next float64 // 0 means none
		contains   bool
	}{
		{E24, 4700, 4300, 5100, true},
		{E24, 4700 * (1 + 1e-10), 4300, 5100, true},
		{E24, 4800, 4700, 5100, false},
		{E24, 1e4, 9.1e3, 1.1e4, true},
		{E24, 9.1e3, 8.2e3, 1e4, true},
		{E24, 1e-15, 0, 1.1e-15, true},
		{E24, 9.1e15, 8.2e15, 0, true},
		{E24, inf, 9.1e15, 0, false},
		{E24, math.Inf(-1), 0, 1e-15, false},
		{E24, 0, 0, 1e-15, false},
		{E24, -3, 0, 1e-15, false},
		{E24, math.NaN(), 0, 0, false},
		{E192, 9.2, 9.09, 9.31, true},
		{E192, 9.19, 9.09, 9.2, false},
		{close, 1, 0, 1 + 1.5e-9, true},
		{close, 1 + 1.5e-9, 1, 2, true},
		{close, 2, 1 + 1.5e-9, 0, true},
		{Range(E12, 1e3, 1e4), 1e3, 0, 1.2e3, true},
		{Range(E12, 1e3, 1e4), 1e4, 8.2e3, 0, true},
		{Range(E12, 1e3, 1e4), 1.2e4, 1e4, 0, false},
		{Range(E12, 1e3, 1e4), 1e2, 0, 1e3, false},
		{&List{}, 1, 0, 0, false},
	} {
		n, okn := Next(test.s, test.v)
		if n != test.next || okn != (test.next != 0) {
			t.Errorf("Next(%v, %v) = %v, %v; want %v", test.s, test.v, n, okn, test.next)
		}
		p, okp := Prev(test.s, test.v)
		if p != test.prev || okp != (test.prev != 0) {
			t.Errorf("Prev(%v, %v) = %v, %v; want %v", test.s, test.v, p, okp, test.prev)
		}
		if c := Contains(test.s, test.v); c != test.contains {
			t.Errorf("Contains(%v, %v) = %v, want %v", test.s, test.v, c, test.contains)
		}
	}
	if _, ok := Next(nil, 1); ok {
		t.Error("Next(nil, 1) reported a member")
	}
	if _, ok := Prev(nil, 1); ok {
		t.Error("Prev(nil, 1) reported a member")
	}
	if Contains(nil, 1) {
		t.Error("Contains(nil, 1) = true")
	}
}

// TestStepThrough walks a whole series with Next and back with Prev.
func TestStepThrough(t *testing.T) {
	for _, s := range standard {
		vals := allMembers(s)
		v, ok := s.Above(0)
		for i, want := range vals {
			if !ok || v != want {
				t.Fatalf("%s: step %d up gave %v, %v; want %v", s, i, v, ok, want)
			}
			v, ok = Next(s, v)
		}
		if ok {
			t.Fatalf("%s: Next past the last member gave %v", s, v)
		}
		v, ok = s.Below(math.Inf(1))
		for i := len(vals) - 1; i >= 0; i-- {
			if !ok || v != vals[i] {
				t.Fatalf("%s: step down to %d gave %v, %v; want %v", s, i, v, ok, vals[i])
			}
			v, ok = Prev(s, v)
		}
		if ok {
			t.Fatalf("%s: Prev past the first member gave %v", s, v)
		}
	}
}

func mustList(t testing.TB, vals ...float64) *List {
	t.Helper()
	l, err := NewList(vals)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func TestNewList(t *testing.T) {
	l := mustList(t, 47, 10, 22, 10, 47*(1+1e-10), 4.7)
	want := []float64{4.7, 10, 22, 47}
	got := l.Values()
	if len(got) != len(want) {
		t.Fatalf("Values() = %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("Values() = %v, want %v", got, want)
		}
	}
	got[0] = 99 // Values returns a copy
	if l.Values()[0] != 4.7 {
		t.Error("changing the slice from Values changed the list")
	}
	if l.Len() != 4 {
		t.Errorf("Len() = %d, want 4", l.Len())
	}

	for _, test := range []struct {
		vals []float64
		want string // in the error
	}{
		{nil, "empty"},
		{[]float64{}, "empty"},
		{[]float64{10, -3}, "item 2 of the list is -3"},
		{[]float64{0}, "item 1 of the list is 0"},
		{[]float64{1, math.NaN()}, "NaN"},
		{[]float64{math.Inf(1)}, "+Inf"},
		{[]float64{math.Inf(-1)}, "-Inf"},
	} {
		l, err := NewList(test.vals)
		if err == nil {
			t.Errorf("NewList(%v) = %v, want error", test.vals, l)
			continue
		}
		if !strings.Contains(err.Error(), test.want) {
			t.Errorf("NewList(%v) error %q should contain %q", test.vals, err, test.want)
		}
	}
}

func TestSetString(t *testing.T) {
	for _, test := range []struct {
		s    Set
		want string
	}{
		{E24, "E24"},
		{mustList(t, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12), "stock list (12 values)"},
		{mustList(t, 1), "stock list (1 value)"},
		{&List{}, "stock list (0 values)"},
		{Range(E24, 1e3, 1e6), "E24 in 1k..1M"},
		{Range(E96, 4.7e-9, 2.2e-6), "E96 in 4.7n..2.2u"},
		{Range(E12, 0, math.Inf(1)), "E12 in 0..+Inf"},
		{Range(nil, 1, 2), "empty set in 1..2"},
	} {
		if got := test.s.String(); got != test.want {
			t.Errorf("String() = %q, want %q", got, test.want)
		}
	}
}

// TestNoAllocs checks that the hot paths do not allocate.
func TestNoAllocs(t *testing.T) {
	l := mustList(t, allMembers(E12)...)
	r := Range(E24, 1e3, 1e6)
	vals := []float64{4321, 4.7e3, 1e-16, 1e16, 2.2e-9, 999.99}
	for _, test := range []struct {
		name string
		f    func(v float64)
	}{
		{"Series.Below", func(v float64) { E192.Below(v) }},
		{"Series.Above", func(v float64) { E192.Above(v) }},
		{"Nearest(Series)", func(v float64) { Nearest(E24, v) }},
		{"SnapTo(Series)", func(v float64) { SnapTo(E24, v) }},
		{"Next", func(v float64) { Next(E24, v) }},
		{"Prev", func(v float64) { Prev(E24, v) }},
		{"Contains", func(v float64) { Contains(E24, v) }},
		{"List.Below", func(v float64) { l.Below(v) }},
		{"List.Above", func(v float64) { l.Above(v) }},
		{"Nearest(Range)", func(v float64) { Nearest(r, v) }},
	} {
		allocs := testing.AllocsPerRun(100, func() {
			for _, v := range vals {
				test.f(v)
			}
		})
		if allocs != 0 {
			t.Errorf("%s allocates %v times per run", test.name, allocs)
		}
	}
}

func BenchmarkSeriesBelow(b *testing.B) {
	v := 4321.0
	for b.Loop() {
		E192.Below(v)
	}
}

func BenchmarkNearest(b *testing.B) {
	v := 4321.0
	for b.Loop() {
		Nearest(E24, v)
	}
}
