package networks

import (
	"testing"
)

// benchChain is the full chain: source with coupling capacitor, blend, two
// filter sections, level pot and a load with cable capacitance (invented
// values).
func benchChain() Chain {
	return Chain{
		Source:  Source{Impedance: 6.8e3, SeriesC: 100e-9},
		Blend:   Blend{Lowpass: RC{R: 27e3, C: 12e-9}, Highpass: RC{R: 56e3, C: 2.2e-9}, Pot: Pot{Value: 100e3, Position: 0.5}},
		Filters: []RC{{R: 10e3, C: 1e-9}, {R: 10e3, C: 1e-9}},
		Level:   &Level{Pot: Pot{Value: 100e3, Taper: Taper{Law: Audio}, Position: 1}},
		Load:    Load{R: 1e6, C: 470e-12},
	}
}

// BenchmarkChainFast is the compiled two-port path, one frequency point per
// operation.
func BenchmarkChainFast(b *testing.B) {
	c := benchChain()
	k := c.Compile()
	freqs := LogGrid(20, 20000, 1000)
	b.ReportAllocs()
	b.ResetTimer()
	var sink float64
	for i := 0; i < b.N; i++ {
		sink += k.GainDB(freqs[i%len(freqs)])
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "points/s")
	_ = sink
}

// BenchmarkChainNodal is the general modified-nodal-analysis solver on the
// same chain, one frequency point per operation.
func BenchmarkChainNodal(b *testing.B) {
	c := benchChain()
	s, err := c.Network().Compile()
	if err != nil {
		b.Fatal(err)
	}
	freqs := LogGrid(20, 20000, 1000)
	b.ReportAllocs()
	b.ResetTimer()
	var sink float64
	for i := 0; i < b.N; i++ {
		sink += s.GainDB(freqs[i%len(freqs)])
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "points/s")
	_ = sink
}

// BenchmarkAnalyze is a full analysis of the chain at five knob positions.
func BenchmarkAnalyze(b *testing.B) {
	c := benchChain()
	d := &Design{Band: DefaultBand, Source: c.Source, Tone: Tone{Network: BlendNetwork, Lowpass: c.Blend.Lowpass, Highpass: c.Blend.Highpass, Pot: PotPart{Value: 100e3}},
		Filters: c.Filters, Level: &LevelSetting{Pot: PotPart{Value: 100e3, Taper: Taper{Law: Audio}}, Position: 1}, Load: c.Load}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := Analyze(d, DefaultPositions); err != nil {
			b.Fatal(err)
		}
	}
}
