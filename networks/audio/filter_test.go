package audio

import (
	"math"
	"math/rand/v2"
	"testing"
)

// reference runs the modal form sample by sample, straight from its
// definition (see Filter).
func reference(f *Filter, in []float64) []float64 {
	s := make([]float64, len(f.reals))
	q := make([][2]float64, len(f.pairs))
	out := make([]float64, len(in))
	for n, x := range in {
		y := 0.0
		for k, c := range f.fir {
			if n-k >= 0 {
				y += c * in[n-k]
			}
		}
		for k, p := range f.reals {
			s[k] = x + p*s[k]
			y += f.resid[k] * s[k]
		}
		for k, pr := range f.pairs {
			v := x + pr.a1*q[k][0] + pr.a2*q[k][1]
			y += pr.b0*v + pr.b1*q[k][0]
			q[k] = [2]float64{v, q[k][0]}
		}
		out[n] = y
	}
	return out
}

// TestProcessMatchesDefinition: every grouping of the one-pole sections
// (one to nine), with and without a pair, with 8 and 5 taps, in blocks of
// odd sizes, gives the definition's output. Invented random filters
// (seeded).
func TestProcessMatchesDefinition(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	in := make([]float64, 3000)
	for i := range in {
		in[i] = 2*rng.Float64() - 1
	}
	for nr := 0; nr <= 9; nr++ {
		for np := 0; np <= 1; np++ {
			for _, taps := range []int{8, 5} {
				f := &Filter{Rate: 48000, fir: make([]float64, taps)}
				for k := 0; k < nr; k++ {
					f.reals = append(f.reals, 0.999-0.1*float64(k))
					f.resid = append(f.resid, rng.Float64()-0.5)
				}
				for k := 0; k < np; k++ {
					f.pairs = append(f.pairs, pair{a1: 1.8, a2: -0.9, b0: rng.Float64(), b1: rng.Float64() - 0.5})
				}
				for k := range f.fir {
					f.fir[k] = rng.Float64() - 0.5
				}
				want := reference(f, in)
				got := make([]float64, len(in))
				st := f.NewState()
				for i, size := 0, 1; i < len(in); i, size = i+size, size*3%17+1 {
					j := min(i+size, len(in))
					f.Process(st, in[i:j], got[i:j])
				}
				for i := range got {
					if math.Abs(got[i]-want[i]) > 1e-9*(1+math.Abs(want[i])) {
						t.Fatalf("%d one-pole, %d pairs, %d taps: sample %d is %v, the definition gives %v", nr, np, taps, i, got[i], want[i])
					}
				}
			}
		}
	}
}
