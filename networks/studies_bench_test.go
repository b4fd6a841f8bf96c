package networks

import "testing"

// measurePoints counts the frequency points one study measurement of d
// evaluates (the gain at 1 kHz and the scoop at blend, the corner at
// knob 1), so that the studies' benchmarks can report points/s.
func measurePoints(d *Design, blend float64) int {
	m := NewMeter(d.Band)
	c0, c1 := d.Chain(blend), d.Chain(1)
	k0, k1 := &counting{r: c0.Compile()}, &counting{r: c1.Compile()}
	Gain1k(k0)
	m.Scoop(k0)
	m.Corner(k1)
	return k0.n + k1.n
}

// BenchmarkTolerance10k is one tolerance study of 10 000 trials of the
// study design (the networks test chain's values; default tolerances,
// uniform draws) on two workers. The goal is under 1 s per operation on a
// two-core machine.
func BenchmarkTolerance10k(b *testing.B) {
	d := studyDesign()
	spec := ToleranceSpec{Parts: PartTolerances(d, nil), Trials: 10000, Seed: 1, At: Setting{BlendKnob: DefaultStudyBlend}, Workers: 2}
	per := measurePoints(d, spec.At[BlendKnob])
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Tolerance(d, spec); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N*spec.Trials)/b.Elapsed().Seconds(), "trials/s")
	b.ReportMetric(float64(b.N*spec.Trials*per)/b.Elapsed().Seconds(), "points/s")
}

// BenchmarkToleranceTrial is one trial's measurement (the scoop at the
// blend, the gain at 1 kHz and the corner at knob 1) on one core.
func BenchmarkToleranceTrial(b *testing.B) {
	d := studyDesign()
	p := newProbe(d, Setting{BlendKnob: DefaultStudyBlend})
	per := measurePoints(d, DefaultStudyBlend)
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		p.measure(d)
	}
	b.ReportMetric(float64(b.N*per)/b.Elapsed().Seconds(), "points/s")
}

// BenchmarkSensitivities is a full sensitivity study of the study design:
// the nominal measurement and two per part.
func BenchmarkSensitivities(b *testing.B) {
	d := studyDesign()
	per := measurePoints(d, DefaultStudyBlend) * (1 + 2*len(d.Parts()))
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Sensitivities(d, Setting{BlendKnob: DefaultStudyBlend}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.N*per)/b.Elapsed().Seconds(), "points/s")
}
