package networks

import "testing"

// stackNetwork is the three-knob passive tone stack of valve amplifiers
// with generic textbook-typical values (not any product's): from the input
// node a 250 pF treble capacitor to the top of a 250 kΩ audio treble pot
// whose wiper is the output; a 56 kΩ slope resistor to a junction from
// which one 22 nF capacitor goes to the treble pot's bottom and another to
// the top of the 25 kΩ linear mid pot, a variable resistor to ground; the
// 1 MΩ audio bass pot, a variable resistor, joins the treble pot's bottom
// to the mid pot's top. It is driven from 38 kΩ through a 22 nF coupling
// capacitor, and followed by two RC low-pass sections (10 kΩ, 1 nF), a
// 100 kΩ audio level pot and a 1 MΩ load. All knobs at half rotation but
// the level, at 0.7. Invented as a benchmark.
func stackNetwork() *Network {
	n := &Network{}
	n.SetSource("drive", 38e3)
	n.Capacitor("Cc", "drive", "in", 22e-9)
	n.Capacitor("Ctreble", "in", "top", 250e-12)
	n.Potentiometer("Ptreble", "top", "tone", "bottom", Pot{Value: 250e3, Taper: Taper{Law: Audio}, Position: 0.5})
	n.Resistor("Rslope", "in", "junction", 56e3)
	n.Capacitor("Cbass", "junction", "bottom", 22e-9)
	n.Capacitor("Cmid", "junction", "mid", 22e-9)
	n.Potentiometer("Pbass", "bottom", "mid", "mid", Pot{Value: 1e6, Taper: Taper{Law: Audio}, Position: 0.5})
	n.Potentiometer("Pmid", "mid", Ground, Ground, Pot{Value: 25e3, Taper: Taper{Law: Linear}, Position: 0.5})
	BuildLadder(n, []RC{{R: 10e3, C: 1e-9}, {R: 10e3, C: 1e-9}}, "tone", "filtered")
	Level{Pot: Pot{Value: 100e3, Taper: Taper{Law: Audio}, Position: 0.7}}.Build(n, "filtered", NodeOut)
	Load{R: 1e6}.Build(n, NodeOut)
	n.SetOutput(NodeOut)
	return n
}

// BenchmarkNetlistStack is the compiled ZPK form of the tone stack, one
// frequency point per operation.
func BenchmarkNetlistStack(b *testing.B) {
	k, err := stackNetwork().CompileZPK()
	if err != nil {
		b.Fatal(err)
	}
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

// BenchmarkNetlistStackBatch is the batch form, GainsDB over a 3001-point
// grid per operation, counted in points.
func BenchmarkNetlistStackBatch(b *testing.B) {
	k, err := stackNetwork().CompileZPK()
	if err != nil {
		b.Fatal(err)
	}
	freqs := LogGrid(20, 20000, 1000)
	dst := make([]float64, len(freqs))
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		k.GainsDB(dst, freqs)
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N*len(freqs))/b.Elapsed().Seconds(), "points/s")
}

// BenchmarkNetlistStackNodal is the nodal solver on the same network, for
// comparison.
func BenchmarkNetlistStackNodal(b *testing.B) {
	s, err := stackNetwork().Compile()
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

// BenchmarkCompileZPK is the cost of compiling the tone stack, reusing the
// ZPK's storage.
func BenchmarkCompileZPK(b *testing.B) {
	n := stackNetwork()
	var k ZPK
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if err := n.CompileZPKInto(&k); err != nil {
			b.Fatal(err)
		}
	}
}
