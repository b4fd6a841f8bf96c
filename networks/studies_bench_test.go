package networks

import "testing"

// BenchmarkTolerance10k is one tolerance study of 10 000 trials of the
// study design (the networks test chain's values; default tolerances,
// uniform draws) on two workers. The goal is under 1 s per operation on a
// two-core machine.
func BenchmarkTolerance10k(b *testing.B) {
	d := studyDesign()
	spec := ToleranceSpec{Parts: PartTolerances(d, nil), Trials: 10000, Seed: 1, Blend: DefaultStudyBlend, Workers: 2}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Tolerance(d, spec); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N*spec.Trials)/b.Elapsed().Seconds(), "trials/s")
}

// BenchmarkToleranceTrial is one trial's measurement (the scoop at the
// blend, the gain at 1 kHz and the corner at knob 1) on one core.
func BenchmarkToleranceTrial(b *testing.B) {
	d := studyDesign()
	p := newProbe(d.Band, DefaultStudyBlend)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		p.measure(d)
	}
}

// BenchmarkSensitivities is a full sensitivity study of the study design.
func BenchmarkSensitivities(b *testing.B) {
	d := studyDesign()
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Sensitivities(d, DefaultStudyBlend); err != nil {
			b.Fatal(err)
		}
	}
}
