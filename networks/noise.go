package networks

import (
	"fmt"
	"math"
	"math/cmplx"
)

// This file is the thermal noise of a section. A passive section that
// loses 25 dB must be made up by gain, and its resistances add Johnson
// noise that the make-up gain amplifies with the signal.
//
// By Nyquist's theorem (H. Nyquist, "Thermal agitation of electric charge
// in conductors", Phys. Rev. 32, 1928) the open-circuit noise voltage of a
// passive reciprocal one-port at temperature T has the spectral density
// 4kT·Re Z(f) (V²/Hz), Z its impedance. The one-port here is the output
// node against ground, with the source's voltage set to zero (its
// impedance counted as a resistor at T, its coupling capacitor in place)
// and the load connected (the next stage's input resistor is a resistor
// too): the noise the next stage sees at its input.

// NoiseTemperature is the temperature the noise is computed at: 290 K,
// the reference temperature of noise figures (IEEE Std 161 / ITU usage).
const NoiseTemperature = 290.0

// Boltzmann is the Boltzmann constant in J/K (exact in the 2019 SI).
const Boltzmann = 1.380649e-23

// NoisePerDecade is the density of the log grid the noise is integrated
// on.
const NoisePerDecade = 200

// Noise is the thermal noise of a design at one knob setting, in volts
// rms over the band.
type Noise struct {
	TemperatureK float64 `json:"temperature_k"`
	OutputV      float64 `json:"output_v"`            // unweighted, at the output
	OutputAV     float64 `json:"output_a_weighted_v"` // A-weighted (IEC 61672-1)
	// The same referred back through the section's loss at 1 kHz: what a
	// flat make-up gain that restores the 1 kHz level would bring up.
	ReferredV  float64 `json:"referred_v"`
	ReferredAV float64 `json:"referred_a_weighted_v"`
}

// NoiseAt returns the design's thermal noise at the setting s over its
// band: v² = ∫ 4kT·Re Z(f) df (and with the A-weighting's power gain
// |A(f)|² inside the integral), by the trapezoid rule in log f on a grid of
// NoisePerDecade points per decade, then referred back by the gain at
// 1 kHz.
func (d *Design) NoiseAt(s Setting) (Noise, error) {
	s = d.complete(s)
	sv, err := d.circuit(s, circuitOptions{}).Compile()
	if err != nil {
		return Noise{}, err
	}
	grid := LogGrid(d.Band.From, d.Band.To, NoisePerDecade)
	dens := make([]float64, len(grid))
	for i, f := range grid {
		z, err := sv.OutputImpedance(f)
		if err != nil {
			return Noise{}, err
		}
		dens[i] = 4 * Boltzmann * NoiseTemperature * math.Max(real(z), 0)
	}
	n := Noise{TemperatureK: NoiseTemperature}
	n.OutputV = math.Sqrt(integrateLog(grid, dens, func(float64) float64 { return 1 }))
	n.OutputAV = math.Sqrt(integrateLog(grid, dens, func(f float64) float64 { a := AWeighting(f); return a * a }))
	h := cmplx.Abs(sv.Transfer(1000))
	if !(h > 0) || math.IsInf(h, 0) {
		return n, fmt.Errorf("the gain at 1 kHz is %v: the noise cannot be referred back", h)
	}
	n.ReferredV, n.ReferredAV = n.OutputV/h, n.OutputAV/h
	return n, nil
}

// integrateLog returns ∫ dens(f)·w(f) df over the grid by the trapezoid
// rule in ln f (df = f·d ln f).
func integrateLog(grid, dens []float64, w func(float64) float64) float64 {
	var sum float64
	for i := 1; i < len(grid); i++ {
		a := dens[i-1] * w(grid[i-1]) * grid[i-1]
		b := dens[i] * w(grid[i]) * grid[i]
		sum += 0.5 * (a + b) * math.Log(grid[i]/grid[i-1])
	}
	return sum
}

// AWeighting returns the A-weighting's gain (as a ratio, not in dB) at
// frequency f, by the analytic form of IEC 61672-1:
//
//	R_A(f) = 12194²·f⁴ / ((f² + 20.6²)·√((f² + 107.7²)(f² + 737.9²))·(f² + 12194²))
//	A(f) = R_A(f)·10^(2.00/20)
//
// the 2.00 dB normalising the gain at 1 kHz to 0 dB.
func AWeighting(f float64) float64 {
	f2 := f * f
	ra := 12194.0 * 12194.0 * f2 * f2 /
		((f2 + 20.6*20.6) * math.Sqrt((f2+107.7*107.7)*(f2+737.9*737.9)) * (f2 + 12194.0*12194.0))
	return ra * math.Pow(10, 2.0/20)
}
