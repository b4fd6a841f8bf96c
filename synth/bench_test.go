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
	evals := 0
	for i := 0; i < b.N; i++ {
		r, err := Solve(p, Options{})
		if err != nil {
			b.Fatal(err)
		}
		evals = r.Evaluations
	}
	b.ReportMetric(float64(evals), "evals/op")
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
	evals := 0
	for i := 0; i < b.N; i++ {
		r, err := Solve(p, Options{})
		if err != nil {
			b.Fatal(err)
		}
		evals = r.Evaluations
		if !r.Met {
			b.Fatalf("not met: %+v", r.Checks)
		}
	}
	b.ReportMetric(float64(evals), "evals/op")
}

// BenchmarkSolveEffort is BenchmarkSolve at each --effort level:
// go test -run XXX -bench SolveEffort -benchtime 2x -cpu 1 ./synth
func BenchmarkSolveEffort(b *testing.B) {
	for _, effort := range []int{1, 2, 3} {
		b.Run(fmt.Sprintf("effort=%d", effort), func(b *testing.B) {
			p := &Problem{Targets: Targets{ScoopHz: ptr(800.0), DepthDB: ptr(-10.0), CornerHz: ptr(10e3)},
				Source: &networks.Source{Impedance: 6.8e3}}
			evals := 0
			for i := 0; i < b.N; i++ {
				r, err := Solve(p, Options{Effort: effort})
				if err != nil {
					b.Fatal(err)
				}
				evals = r.Evaluations
			}
			b.ReportMetric(float64(evals), "evals/op")
		})
	}
}
