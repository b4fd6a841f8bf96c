package networks

import (
	"math"
	"testing"
)

// The A-weighting against IEC 61672-1: 0 dB at 1 kHz (within the 0.01 dB
// the rounded 2.00 dB normalisation leaves), and its table's values
// −19.1 dB at 100 Hz and −2.5 dB at 10 kHz (typed from memory of the
// standard's table, to its 0.1 dB).
func TestAWeightingIEC61672(t *testing.T) {
	for _, c := range []struct{ f, db, tol float64 }{
		{1000, 0, 0.01}, {100, -19.1, 0.05}, {10000, -2.5, 0.05},
	} {
		if got := 20 * math.Log10(AWeighting(c.f)); math.Abs(got-c.db) > c.tol {
			t.Errorf("A(%g Hz) = %.3f dB, IEC 61672-1 %.1f dB", c.f, got, c.db)
		}
	}
}

// One resistor's noise against the textbook formula v = √(4kTRB)
// (Johnson 1928, Nyquist 1928): a netlist of one resistor R from in to
// out, an ideal source (its node held at zero) and no load, so Z_out = R
// at every frequency and the integral over the band B is 4kTR·B. And a
// resistor into a capacitor (a first-order low-pass): Re Z = R/(1 + (2πfRC)²),
// whose integral from f₁ to f₂ is (4kTR/(2πRC))·[atan(2πf₂RC) −
// atan(2πf₁RC)] = (2kT/(πC))·[…] (the kT/C noise as f₁ → 0, f₂ → ∞).
func TestNoiseTextbook(t *testing.T) {
	const r, c = 100e3, 1e-9
	kt := Boltzmann * NoiseTemperature
	d := &Design{Band: DefaultBand, Load: Load{R: math.Inf(1)}, Tone: Tone{Network: NetlistNetwork, Parts: []NetPart{
		{Name: "R1", Kind: PartResistor, Value: r, From: NetIn, To: NetOut}}}}
	n, err := d.NoiseAt(nil)
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(4 * kt * r * (d.Band.To - d.Band.From))
	if math.Abs(n.OutputV/want-1) > 1e-4 {
		t.Errorf("resistor: %g V, √(4kTRB) = %g V", n.OutputV, want)
	}
	if math.Abs(n.ReferredV/n.OutputV-1) > 1e-9 {
		t.Errorf("resistor: referred %g V, output %g V, with no loss", n.ReferredV, n.OutputV)
	}
	d.Tone.Parts = append(d.Tone.Parts, NetPart{Name: "C1", Kind: PartCapacitor, Value: c, From: NetOut, To: NetGnd})
	n, err = d.NoiseAt(nil)
	if err != nil {
		t.Fatal(err)
	}
	w := func(f float64) float64 { return math.Atan(2 * math.Pi * f * r * c) }
	want = math.Sqrt(2 * kt / (math.Pi * c) * (w(d.Band.To) - w(d.Band.From)))
	if math.Abs(n.OutputV/want-1) > 1e-4 {
		t.Errorf("RC: %g V, closed form %g V", n.OutputV, want)
	}
}
