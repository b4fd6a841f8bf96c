package networks

import "testing"

// stackNetwork is the invented three-knob stack chain of
// testdata/examples/stack-chain.yaml, written in the netlist form: a
// three-knob passive stack behind a 38 kΩ stage and a 22 nF coupling
// capacitor, two RC sections (10 kΩ, 1 nF), a 100 kΩ audio level pot and a
// 1 MΩ load, every knob at half rotation but the level, at 0.7.
func stackNetwork() *Network {
	d, err := LoadDesign("../testdata/examples/stack-chain.yaml")
	if err != nil {
		panic(err)
	}
	return d.Network(Setting{"treble": 0.5, "level": 0.7})
}

// BenchmarkNetlistStack is the compiled form of the stack chain that
// Design.Compile gives (its ZPK), one frequency point per operation.
func BenchmarkNetlistStack(b *testing.B) {
	d, err := LoadDesign("../testdata/examples/stack-chain.yaml")
	if err != nil {
		b.Fatal(err)
	}
	e, err := d.Compile(Setting{"treble": 0.5, "level": 0.7})
	if err != nil {
		b.Fatal(err)
	}
	k, ok := e.(*ZPK)
	if !ok {
		b.Fatalf("Design.Compile gave %T, not the ZPK", e)
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
