package networks

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
)

// randomChain draws a chain with parts spread over the ranges a tone
// section uses: invented test data, not a real board.
func randomChain(rng *rand.Rand) Chain {
	logU := func(lo, hi float64) float64 { return lo * math.Pow(hi/lo, rng.Float64()) }
	tapers := []Taper{{Law: Linear}, {Law: Audio}, {Law: ReverseAudio}}
	c := Chain{
		Source: Source{Impedance: logU(10, 50e3)},
		Blend: Blend{
			Lowpass:  RC{R: logU(1e3, 220e3), C: logU(1e-9, 220e-9)},
			Highpass: RC{R: logU(1e3, 470e3), C: logU(470e-12, 47e-9)},
			Pot:      Pot{Value: logU(10e3, 1e6), Taper: tapers[rng.IntN(3)], Position: rng.Float64()},
		},
		Load: Load{R: logU(10e3, 2e6)},
	}
	if rng.IntN(2) == 0 {
		c.Source.SeriesC = logU(10e-9, 10e-6)
	}
	if rng.IntN(3) == 0 {
		c.Load.C = logU(100e-12, 2e-9)
	}
	for i := rng.IntN(4); i > 0; i-- {
		c.Filters = append(c.Filters, RC{R: logU(1e3, 100e3), C: logU(100e-12, 47e-9)})
	}
	if rng.IntN(3) > 0 {
		c.Level = &Level{Pot: Pot{Value: logU(10e3, 500e3), Taper: tapers[rng.IntN(3)], Position: 0.05 + 0.95*rng.Float64()}}
	}
	return c
}

func relDiff(a, b complex128) float64 {
	return cmplx.Abs(a-b) / math.Max(cmplx.Abs(a), cmplx.Abs(b))
}
