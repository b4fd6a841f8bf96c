package synth

import (
	"math"
	"math/rand/v2"
	"testing"

	"tonewright/eseries"
)

// The listed form of a set answers every query as the set does.
func TestListedMatchesSet(t *testing.T) {
	stock, err := eseries.NewList([]float64{1e3, 4.7e3, 10e3, 22e3, 100e3})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		set  eseries.Set
	}{
		{"E24 in 1k..1M", eseries.Range(eseries.E24, 1e3, 1e6)},
		{"E12 in 100p..1µ", eseries.Range(eseries.E12, 100e-12, 1e-6)},
		{"E96 in 10..10M", eseries.Range(eseries.E96, 10, 10e6)},
		{"E6 between members", eseries.Range(eseries.E6, 1.1e3, 3.2e3)},
		{"stock", stock},
	} {
		l := listed(c.set)
		if _, ok := l.(*eseries.List); !ok {
			t.Errorf("%s: not listed", c.name)
		}
		rng := rand.New(rand.NewPCG(1, 2))
		for i := 0; i < 20000; i++ {
			v := math.Exp(rng.Float64()*math.Log(1e12)) * 1e-10
			if i%3 == 0 {
				// exactly a member, or within rounding of one
				if m, ok := c.set.Above(v); ok {
					v = m * (1 + (rng.Float64()-0.5)*4e-12)
				}
			}
			b1, ok1 := c.set.Below(v)
			b2, ok2 := l.Below(v)
			a1, ok3 := c.set.Above(v)
			a2, ok4 := l.Above(v)
			n1, ok5 := eseries.Next(c.set, v)
			n2, ok6 := eseries.Next(l, v)
			p1, ok7 := eseries.Prev(c.set, v)
			p2, ok8 := eseries.Prev(l, v)
			if b1 != b2 || ok1 != ok2 || a1 != a2 || ok3 != ok4 || n1 != n2 || ok5 != ok6 || p1 != p2 || ok7 != ok8 {
				t.Fatalf("%s at %g: below %g %v / %g %v, above %g %v / %g %v, next %g / %g, prev %g / %g",
					c.name, v, b1, ok1, b2, ok2, a1, ok3, a2, ok4, n1, n2, p1, p2)
			}
		}
	}
}
