package synth

import (
	"testing"

	"tonewright/networks"
)

// Limits hold: with a capacitor range down to 10 pF no capacitor below
// the default 100 pF limit is chosen; a loss limit that can be kept is
// kept; one that cannot is reported as the cause, not as met. Invented
// targets.
func TestLimits(t *testing.T) {
	p := &Problem{Targets: Targets{ScoopHz: ptr(2000.0), DepthDB: ptr(-6.0), CornerHz: ptr(15e3)},
		Source: &networks.Source{Impedance: 47e3}, Parts: Parts{CapacitorRange: [2]float64{10e-12, 1e-6}}}
	r, err := Solve(p, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Parts {
		if c.Kind == networks.PartCapacitor && c.Chosen < DefaultMinCapacitor*(1-1e-9) {
			t.Errorf("%s = %g F, below the %g F limit", c.Name, c.Chosen, DefaultMinCapacitor)
		}
	}
	demo := Problem{Targets: Targets{ScoopHz: ptr(700.0), DepthDB: ptr(-8.0), CornerHz: ptr(9e3)},
		Source: &networks.Source{Impedance: 6.8e3, SeriesC: 100e-9},
		Level:  &networks.LevelSetting{Pot: networks.PotPart{Value: 100e3, Taper: networks.Taper{Law: networks.Audio}}, Position: 1}}
	keep := demo
	keep.Limits = Limits{MaxLossDB: 26.5, MaxOutputImpedance: 30e3}
	r, err = Solve(&keep, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Met || -r.Metrics.Gain1kDB > 26.5 || len(r.Limits) != 2 || !r.LimitsMet() {
		t.Errorf("met %v, loss %.1f dB, limits %+v: want the limits kept", r.Met, -r.Metrics.Gain1kDB, r.Limits)
	}
	tight := demo
	tight.Limits = Limits{MaxLossDB: 3}
	r, err = Solve(&tight, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Met || r.Cause != CauseLimit {
		t.Errorf("met %v, cause %q with a 3 dB loss limit: want it named as the cause", r.Met, r.Cause)
	}
	bad := demo
	bad.Limits = Limits{MinCapacitor: ptr(2e-6)}
	if _, err := Solve(&bad, Options{}); err == nil {
		t.Errorf("a smallest capacitor above the range's top was accepted")
	}
}
