package networks

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"
)

// The solver against an outside reference: the ngspice simulator's AC
// analysis (Debian package ngspice) on random blend chains with random
// parts, source, load, 0–3 filter sections, level pot and knob positions.
// Magnitude within 0.01 dB and phase within 0.1° over 20 Hz–20 kHz.
func TestAgainstNgspice(t *testing.T) {
	RequireNgspice(t)
	rng := rand.New(rand.NewPCG(20, 26))
	for trial := 0; trial < 24; trial++ {
		c := randomChain(rng)
		n := c.Network()
		var deck strings.Builder
		if err := n.WriteSPICE(&deck, "random chain", DefaultBand, 20); err != nil {
			t.Fatal(err)
		}
		pts, err := RunNgspice(deck.String(), NodeOut)
		if err != nil {
			t.Fatalf("trial %d: %v\n%s", trial, err, deck.String())
		}
		if len(pts) < 60 {
			t.Fatalf("trial %d: only %d points from ngspice", trial, len(pts))
		}
		s := mustCompile(t, n)
		for _, p := range pts {
			h := s.Transfer(p.Hz)
			dm := 20*math.Log10(cmplx.Abs(h)) - 20*math.Log10(cmplx.Abs(p.V))
			dp := math.Remainder(cmplx.Phase(h)-cmplx.Phase(p.V), 2*math.Pi) * 180 / math.Pi
			if math.Abs(dm) > 0.01 || math.Abs(dp) > 0.1 {
				t.Fatalf("trial %d at %g Hz: ours %.4f dB %.3f°, ngspice %.4f dB %.3f°\n%s", trial, p.Hz,
					20*math.Log10(cmplx.Abs(h)), cmplx.Phase(h)*180/math.Pi,
					20*math.Log10(cmplx.Abs(p.V)), cmplx.Phase(p.V)*180/math.Pi, deck.String())
			}
		}
	}
}
