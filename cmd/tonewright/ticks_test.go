package main

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot"
)

// labelled keeps the labelled ticks of ts.
func labelled(ts []plot.Tick) (vs []float64, ls []string) {
	for _, tk := range ts {
		if tk.Label != "" {
			vs = append(vs, tk.Value)
			ls = append(ls, tk.Label)
		}
	}
	return vs, ls
}

// Linear axes (phase, level): three to ten labels at a round step for any
// range, and never "-0".
func TestLinearTicks(t *testing.T) {
	for _, r := range [][2]float64{{-0.4, 0.3}, {-2.5, 1}, {-32, 35}, {-360, 0}, {-700, 10}, {-45, 0}, {-12, -3}} {
		for name, m := range map[string]plot.Ticker{"phase": degTicks{}, "level": dbTicks{}} {
			_, ls := labelled(m.Ticks(r[0], r[1]))
			if len(ls) < 3 || len(ls) > 10 {
				t.Errorf("%s %v: %d labels %v, want 3 to 10", name, r, len(ls), ls)
			}
			for _, l := range ls {
				if l == "-0" || strings.Contains(l, "000000") {
					t.Errorf("%s %v: label %q", name, r, l)
				}
			}
		}
	}
	if _, ls := labelled(degTicks{}.Ticks(-360, 0)); strings.Join(ls, " ") != "-360 -315 -270 -225 -180 -135 -90 -45 0" {
		t.Errorf("phase -360..0: labels %v, want every 45°", ls)
	}
}

// Log axes keep their labels apart: no two closer than the gap, and a
// vertical axis a little over a decade high does not label every step.
func TestLogTicksApart(t *testing.T) {
	for _, r := range [][2]float64{{700, 11000}, {300, 9000}, {20, 20000}, {460, 2100}} {
		for _, gap := range []float64{labelGap, verticalGap} {
			vs, ls := labelled(freqTicks{Gap: gap}.Ticks(r[0], r[1]))
			if len(vs) < 3 {
				t.Errorf("%v gap %g: labels %v, want at least three", r, gap, ls)
			}
			for i := range vs {
				for j := range i {
					if math.Abs(math.Log10(vs[i]/vs[j])) < gap*math.Log10(r[1]/r[0])*(1-1e-9) {
						t.Errorf("%v gap %g: labels %s and %s run together", r, gap, ls[j], ls[i])
					}
				}
			}
		}
	}
}

// An impedance axis gets at least three labels, 1-2-5 first.
func TestOhmTicks(t *testing.T) {
	for _, r := range [][2]float64{{8e3, 25e3}, {9.5e3, 21e3}, {35e3, 180e3}, {10e3, 10.4e3}, {100, 1e6}} {
		_, ls := labelled(ohmTicks{Gap: verticalGap}.Ticks(r[0], r[1]))
		if len(ls) < 3 {
			t.Errorf("%v: labels %v, want at least three", r, ls)
		}
	}
	if _, ls := labelled(ohmTicks{Gap: verticalGap}.Ticks(100, 1e6)); ls[0] != "100 Ω" || len(ls) != 13 {
		t.Errorf("100 Ω–1 MΩ: labels %v, want the 1-2-5 steps", ls)
	}
}

// A panel line breaks where it leaps by more than its Jump factor in one
// step, and where a value is missing.
func TestSeriesRunsBreakAtJumps(t *testing.T) {
	x := []float64{0, 0.025, 0.05, 0.075, 0.1, 0.125, 0.15}
	y := []float64{350, 340, 330, 8000, 8100, math.NaN(), 8200}
	got := series{X: x, Y: y, Jump: 1.5}.runs()
	if len(got) != 3 || len(got[0]) != 3 || len(got[1]) != 2 || len(got[2]) != 1 {
		t.Errorf("runs %v, want three: up to the jump, to the gap, after it", got)
	}
	if n := len(series{X: x, Y: y}.runs()); n != 2 {
		t.Errorf("without Jump: %d runs, want 2 (the gap only)", n)
	}
}
