package main

import (
	"encoding/json"
	"math"
	"math/cmplx"
	"testing"

	"tonewright/networks"
)

// The deck that netlist prints, run through the ngspice simulator (an
// outside reference), reproduces what analyze reports at every knob
// position: the gain at 1 kHz, the scoop's frequency, depth and balance,
// and the corner, measured on ngspice's own 1000-points-per-decade data by
// the definitions in the README (grid version, no refinement).
func TestNetlistReproducesAnalyze(t *testing.T) {
	networks.RequireNgspice(t)
	code, out, errs := tw(t, "analyze", demoFile, "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var an networks.Analysis
	if err := json.Unmarshal([]byte(out), &an); err != nil {
		t.Fatal(err)
	}
	for _, pm := range an.Positions {
		code, deck, errs := tw(t, "netlist", demoFile, "--blend", posLabel(pm.Blend), "--points", "1000")
		if code != 0 {
			t.Fatal(errs)
		}
		pts, err := networks.RunNgspice(deck, "out")
		if err != nil {
			t.Fatal(err)
		}
		f := make([]float64, len(pts))
		g := make([]float64, len(pts))
		for i, p := range pts {
			f[i], g[i] = p.Hz, 20*math.Log10(cmplx.Abs(p.V))
		}
		if got := interpLog(f, g, 1000); math.Abs(got-pm.Gain1kDB) > 0.01 {
			t.Errorf("blend %g: ngspice gain at 1 kHz %.4f dB, analyze %.4f", pm.Blend, got, pm.Gain1kDB)
		}
		// The deepest interior grid minimum at least MinProminence below its
		// lower shoulder, and its shoulders.
		best, bestDepth, bestBal := -1, math.Inf(1), 0.0
		for i := 1; i < len(g)-1; i++ {
			if g[i] < g[i-1] && g[i] < g[i+1] {
				lo, hi := maxOf(g[:i+1]), maxOf(g[i:])
				if math.Min(lo, hi)-g[i] < networks.MinProminence {
					continue
				}
				if d := g[i] - (lo+hi)/2; d < bestDepth {
					best, bestDepth, bestBal = i, d, hi-lo
				}
			}
		}
		if (best >= 0) != (pm.Scoop != nil) {
			t.Fatalf("blend %g: ngspice scoop %v, analyze %v", pm.Blend, best >= 0, pm.Scoop)
		}
		if best < 0 {
			continue
		}
		if r := f[best] / pm.Scoop.Hz; math.Abs(math.Log10(r)) > 1.5e-3 {
			t.Errorf("blend %g: ngspice scoop at %.2f Hz, analyze %.2f", pm.Blend, f[best], pm.Scoop.Hz)
		}
		if math.Abs(bestDepth-pm.Scoop.DepthDB) > 0.01 || math.Abs(bestBal-pm.Scoop.BalanceDB) > 0.01 {
			t.Errorf("blend %g: ngspice depth %.4f balance %.4f, analyze %.4f %.4f", pm.Blend, bestDepth, bestBal, pm.Scoop.DepthDB, pm.Scoop.BalanceDB)
		}
		if pm.Blend == 1 && an.CornerHz != nil {
			k := 0
			for i := range g {
				if g[i] > g[k] {
					k = i
				}
			}
			for i := k + 1; i < len(g); i++ {
				if g[i] < g[k]-3 {
					// Linear interpolation in log f between the bracketing points.
					x := math.Log10(f[i-1]) + (g[k]-3-g[i-1])/(g[i]-g[i-1])*math.Log10(f[i]/f[i-1])
					if c := math.Pow(10, x); math.Abs(c / *an.CornerHz - 1) > 1e-3 {
						t.Errorf("ngspice corner %.2f Hz, analyze %.2f", c, *an.CornerHz)
					}
					break
				}
			}
		}
	}
}

func maxOf(xs []float64) float64 {
	m := math.Inf(-1)
	for _, x := range xs {
		m = math.Max(m, x)
	}
	return m
}

// interpLog interpolates y(x) linearly in log x.
func interpLog(x, y []float64, at float64) float64 {
	for i := 1; i < len(x); i++ {
		if x[i] >= at {
			t := math.Log(at/x[i-1]) / math.Log(x[i]/x[i-1])
			return y[i-1] + t*(y[i]-y[i-1])
		}
	}
	return math.NaN()
}

// A netlist-form design's deck at several knob settings, run through the
// ngspice simulator (an outside reference), matches tonewright's own
// evaluation of the design within 0.01 dB and 0.1° over the band.
func TestNetlistKnobsAgainstNgspice(t *testing.T) {
	networks.RequireNgspice(t)
	const file = "../../testdata/examples/stack-netlist.yaml"
	d, err := networks.LoadDesign(file)
	if err != nil {
		t.Fatal(err)
	}
	for _, knobs := range [][]string{
		{"--knob", "treble=0", "--knob", "bass=1"},
		{"--knob", "treble=0.6", "--knob", "bass=0.2", "--knob", "mid=0"},
		{"--knob", "treble=1", "--knob", "mid=1"},
	} {
		code, deck, errs := tw(t, append([]string{"netlist", file, "--points", "50"}, knobs...)...)
		if code != 0 {
			t.Fatal(errs)
		}
		s := networks.Setting{}
		for i := 1; i < len(knobs); i += 2 {
			l, err := networks.ParseKnobFlag(knobs[i])
			if err != nil {
				t.Fatal(err)
			}
			s[l.Name] = l.Positions[0]
		}
		e, err := d.Compile(s)
		if err != nil {
			t.Fatal(err)
		}
		pts, err := networks.RunNgspice(deck, "out")
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range pts {
			h := e.Transfer(p.Hz)
			dg := 20 * math.Log10(cmplx.Abs(p.V)/cmplx.Abs(h))
			dp := math.Remainder(cmplx.Phase(p.V)-cmplx.Phase(h), 2*math.Pi) * 180 / math.Pi
			if math.Abs(dg) > 0.01 || math.Abs(dp) > 0.1 {
				t.Fatalf("%v at %.1f Hz: ngspice differs by %.4f dB, %.4f°", knobs, p.Hz, dg, dp)
			}
		}
	}
}
