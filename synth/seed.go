package synth

import (
	"fmt"
	"math"
	"math/cmplx"
)

// IdealNotch returns the time constants τ₁ = R₁C₁ (low-pass leg) and
// τ₂ = R₂C₂ (high-pass leg) of an ideal blend network (zero source
// impedance, no load, a large linear pot at its centre) whose scoop lies at
// hz with the given depth below the shoulders.
//
// At the centre the ideal network gives H = ½·[1/(1+sτ₁) + sτ₂/(1+sτ₂)].
// With r = τ₁/τ₂ > 1 the minimum of |H| lies at f₀ = 1/(2π√(τ₁τ₂)), where
// H = 1/(1+r) is real, and the shoulders are ½, so the depth is
// 20·log10(2/(r+1)) dB. IdealNotch inverts that: r = 2·10^(−depth/20) − 1.
// depthDB must be negative.
func IdealNotch(hz, depthDB float64) (tau1, tau2 float64, err error) {
	if !(hz > 0) || math.IsInf(hz, 0) {
		return 0, 0, fmt.Errorf("scoop frequency %v Hz must be positive and finite", hz)
	}
	if !(depthDB < 0) || math.IsInf(depthDB, 0) {
		return 0, 0, fmt.Errorf("scoop depth %v dB must be negative and finite", depthDB)
	}
	r := 2*math.Pow(10, -depthDB/20) - 1
	w := 2 * math.Pi * hz
	return math.Sqrt(r) / w, 1 / (w * math.Sqrt(r)), nil
}

// LadderTau returns the time constant τ = RC of each of n identical RC
// low-pass sections in an unbuffered ladder, driven from zero impedance and
// unloaded, whose response is 3 dB down at cornerHz. One section gives the
// familiar τ = 1/(2πf); more sections load one another and need a shorter τ
// (two: about 0.374/(2πf)). n must be at least 1.
func LadderTau(cornerHz float64, n int) float64 {
	return ladderCornerFactor(n) / (2 * math.Pi * cornerHz)
}

// ladderCornerFactor is ωτ at which n identical unloaded sections with
// τ = 1 are 3 dB down, by bisection on the ladder's transmission (ABCD)
// cascade, whose A term is the inverse of the gain.
func ladderCornerFactor(n int) float64 {
	gain := func(x float64) float64 {
		a, b := complex(1, 0), complex(0, 0) // first row of the cascade
		s := complex(0, x)
		for i := 0; i < n; i++ {
			b += a     // series R = 1: [a b]·[[1 1] [0 1]]
			a += b * s // shunt C = 1: [a b]·[[1 0] [s 1]]
		}
		return 1 / cmplx.Abs(a)
	}
	lo, hi := 1e-6, 1.0
	for gain(hi) > 1/math.Sqrt2 {
		hi *= 2
	}
	for hi-lo > 1e-14*hi {
		mid := (lo + hi) / 2
		if gain(mid) > 1/math.Sqrt2 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}
