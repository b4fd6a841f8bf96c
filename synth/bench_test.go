package synth

import (
	"fmt"
	"testing"

	"tonewright/networks"
)

// BenchmarkSolve is the default synthesis: E24 resistors, E12 capacitors,
// the common pots, two filter sections, behind a 6.8k stage into 1 MΩ
// (an invented scenario). The goal is under 1 s per operation on one core:
// go test -bench Solve -cpu 1 ./synth/
func BenchmarkSolve(b *testing.B) {
	p := &Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10e3)},
		Source: &networks.Source{Impedance: 6.8e3}}
	b.ReportAllocs()
	benchSolve(b, p, Options{}, false)
}

// BenchmarkObjective is one evaluation of the objective: the scoop, the
// corner and the gain at 1 kHz of a candidate. It must not allocate.
func BenchmarkObjective(b *testing.B) {
	p := &Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10e3)},
		Source: &networks.Source{Impedance: 6.8e3}}
	s, _ := p.Parts.resolve()
	base, _ := p.design()
	g, _ := p.goal(base)
	vars, _ := p.variables(base, s)
	e := newEvaluator(base.Clone(), g)
	e.vars = bind(vars, e.d)
	vals := []float64{100e3, 10e-9, 2.2e-9, 47e3, 250e3, 22e3, 1e-9}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		e.at(vals)
	}
}

// BenchmarkRestore is one restoration of the lean phase: an invented
// board brought onto the default synthesis's targets by moving every part.
// It must not allocate.
func BenchmarkRestore(b *testing.B) {
	p := &Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10e3)},
		Source: &networks.Source{Impedance: 6.8e3}}
	s, _ := p.Parts.resolve()
	base, _ := p.design()
	g, _ := p.goal(base)
	vars, _ := p.variables(base, s)
	e := newEvaluator(base.Clone(), g)
	e.vars = bind(vars, e.d)
	slaved, free := slavedVars(e)
	mf := newManifold(e, slaved, free)
	mf.moving(mf.all)
	x0 := logValues([][]float64{{100e3, 10e-9, 2.2e-9, 47e3, 250e3, 22e3, 1e-9}})[0]
	x := make([]float64, len(x0))
	b.ReportAllocs()
	evals := e.evals
	for i := 0; i < b.N; i++ {
		copy(x, x0)
		mf.have = false
		mf.restore(x, startSteps)
	}
	b.ReportMetric(float64(e.evals-evals)/float64(b.N), "evals/op")
}

// BenchmarkRevoiceNetlist is a synthesis of the nine parts of a netlist
// (the invented blend netlist with its two sections) to the figures of the
// same netlist with other values, through networks.Design.Compile. The
// goal is under 5 s per operation on one core:
// go test -run XXX -bench RevoiceNetlist -benchtime 1x -cpu 1 ./synth
func BenchmarkRevoiceNetlist(b *testing.B) {
	moved := blendNetlist(18e-9)
	moved.Tone.Parts[0].Value = 33e3
	moved.Filters[0].R, moved.Filters[1].R = 12e3, 12e3
	e := newEvaluator(moved, goal{at: 0.5})
	m := networks.NewMeter(moved.Band)
	e.compile(0.5)
	s, _ := m.Scoop(e.resp())
	e.compile(1)
	corner, _ := m.Corner(e.resp())
	p := &Problem{Targets: Targets{ScoopHz: ptr(s.Hz), DepthDB: ptr(s.DepthDB), BalanceDB: ptr(s.BalanceDB), CornerHz: ptr(corner)},
		From: blendNetlist(12e-9)}
	benchSolve(b, p, Options{}, true)
}

// BenchmarkSolveEffort is BenchmarkSolve at each --effort level:
// go test -run XXX -bench SolveEffort -benchtime 2x -cpu 1 ./synth
func BenchmarkSolveEffort(b *testing.B) {
	for _, effort := range []int{1, 2, 3} {
		b.Run(fmt.Sprintf("effort=%d", effort), func(b *testing.B) {
			p := &Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10e3)},
				Source: &networks.Source{Impedance: 6.8e3}}
			benchSolve(b, p, Options{Effort: effort}, false)
		})
	}
}

// BenchmarkRevoiceStack10 re-voices ten parts of the invented three-knob
// stack chain (testdata/examples/stack-chain.yaml: seven tone parts and
// two RC sections; every part free but the treble capacitor) to the
// figures of the same chain with four other values: a mid scoop and the
// gain at 100 Hz with every knob at its centre, and the corner with the
// treble full down. The goal is under 5 s per operation on one core:
// go test -run XXX -bench RevoiceStack10 -benchtime 1x -cpu 1 ./synth
func BenchmarkRevoiceStack10(b *testing.B) {
	load := func() *networks.Design {
		d, err := networks.LoadDesign("../testdata/examples/stack-chain.yaml")
		if err != nil {
			b.Fatal(err)
		}
		return d
	}
	moved := load()
	for i := range moved.Tone.Parts {
		switch p := &moved.Tone.Parts[i]; p.Name {
		case "Rslope":
			p.Value = 56e3
		case "Cb":
			p.Value = 18e-9
		case "Cm":
			p.Value = 39e-9
		}
	}
	moved.Filters[0].C, moved.Filters[1].C = 1.2e-9, 1.2e-9
	mid := map[string]float64{"treble": 0.5, "bass": 0.5, "mid": 0.5}
	dark := map[string]float64{"treble": 0, "bass": 0.5, "mid": 0.5}
	at := func(k map[string]float64) networks.Evaluator { return compiledAt(b, moved, k) }
	m := networks.NewMeter(moved.Band)
	s, ok := m.Scoop(at(mid))
	if !ok {
		b.Fatal("the moved stack has no scoop with its knobs at the centre")
	}
	corner, ok := m.Corner(at(dark))
	if !ok {
		b.Fatal("the moved stack has no corner with the treble full down")
	}
	items := []Item{
		{Knobs: mid, Kind: ItemScoop, Hz: s.Hz, DepthDB: s.DepthDB, BalanceDB: ptr(s.BalanceDB)},
		{Knobs: mid, Kind: ItemGain, Hz: 100, DB: at(mid).GainDB(100)},
		{Knobs: dark, Kind: ItemCorner, Hz: corner},
	}
	free := []string{"Rslope", "treble", "bass", "mid", "Cb", "Cm", "filter1.r", "filter1.c", "filter2.r", "filter2.c"}
	p := &Problem{Items: items, From: load(), Free: free}
	benchSolve(b, p, Options{}, true)
}

// benchSolve solves p b.N times with opt, fails when met is asked for
// and the targets are not met, and reports the evaluations an operation
// takes.
func benchSolve(b *testing.B, p *Problem, opt Options, met bool) {
	b.Helper()
	evals := 0
	for i := 0; i < b.N; i++ {
		r, err := Solve(p, opt)
		if err != nil {
			b.Fatal(err)
		}
		evals = r.Evaluations
		if met && !r.Met {
			b.Fatalf("not met: %+v", r.Checks)
		}
	}
	b.ReportMetric(float64(evals), "evals/op")
}
