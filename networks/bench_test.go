package networks

import (
	"fmt"
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

// BenchmarkChainSections is the fast path with 1 to 6 filter sections, for
// the README's table of how cost grows.
func BenchmarkChainSections(b *testing.B) {
	for n := 1; n <= 6; n++ {
		c := benchChain()
		c.Filters = nil
		for i := 0; i < n; i++ {
			c.Filters = append(c.Filters, RC{R: 10e3, C: 1e-9})
		}
		k := c.Compile()
		freqs := LogGrid(20, 20000, 1000)
		b.Run(fmt.Sprintf("sections=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			var sink float64
			for i := 0; i < b.N; i++ {
				sink += k.GainDB(freqs[i%len(freqs)])
			}
			b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "points/s")
			_ = sink
		})
	}
}

// counting counts the points a measurement evaluates.
type counting struct {
	r Response
	n int
}

func (c *counting) GainDB(f float64) float64 { c.n++; return c.r.GainDB(f) }

// BenchmarkMeter is the metrics of one knob position (the scoop) and of
// knob 1 (the corner), as Analyze computes them, counted in frequency
// points evaluated.
func BenchmarkMeter(b *testing.B) {
	c := benchChain()
	k := c.Compile()
	m := NewMeter(DefaultBand)
	cnt := &counting{r: k}
	m.Scoop(cnt)
	m.Corner(cnt)
	per := cnt.n
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		m.Scoop(k)
		m.Corner(k)
	}
	b.ReportMetric(float64(per*b.N)/b.Elapsed().Seconds(), "points/s")
	b.ReportMetric(float64(per), "points/op")
}
