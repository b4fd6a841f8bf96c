package synth

import (
	"fmt"
	"testing"

	"tonewright/eseries"
	"tonewright/networks"
)

// scalingProblem is the demo's voice (an invented scenario): a 700 Hz scoop
// 8 dB deep, a 9 kHz corner, behind 6.8 kΩ and a 100 nF coupling capacitor,
// with a 100 kΩ audio level pot into 1 MΩ.
func scalingProblem(filters int, s *eseries.Series) *Problem {
	return &Problem{
		Targets: Targets{ScoopHz: ptr(700.0), DepthDB: ptr(-8.0), CornerHz: ptr(9e3)},
		Source:  &networks.Source{Impedance: 6.8e3, SeriesC: 100e-9},
		Filters: &filters,
		Level:   &networks.LevelSetting{Pot: networks.PotPart{Value: 100e3, Taper: networks.Taper{Law: networks.Audio}}, Position: 1},
		Parts:   Parts{Resistors: s, Capacitors: s},
	}
}

// BenchmarkSolveScaling is how synthesis time grows with the number of
// filter sections (1 to 6, E24 resistors and capacitors) and with the
// series (E12 to E96, two sections), for the README's table:
//
//	go test -run XXX -bench SolveScaling -cpu 1 ./synth
func BenchmarkSolveScaling(b *testing.B) {
	run := func(name string, p *Problem) {
		b.Run(name, func(b *testing.B) {
			evals, met := 0, false
			for i := 0; i < b.N; i++ {
				r, err := Solve(p, Options{})
				if err != nil {
					b.Fatal(err)
				}
				evals, met = r.Evaluations, r.Met
			}
			b.ReportMetric(float64(evals), "evals/op")
			if !met {
				b.Logf("%s: targets not all met", name)
			}
		})
	}
	for n := 1; n <= 6; n++ {
		run(fmt.Sprintf("filters=%d", n), scalingProblem(n, eseries.E24))
	}
	for _, s := range []*eseries.Series{eseries.E12, eseries.E24, eseries.E48, eseries.E96} {
		run("series="+s.Name, scalingProblem(2, s))
	}
}
