package main

import (
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/networks"
	"tonewright/synth"
)

// distinctLooks fails when two curves of a plot would be drawn alike
// (colour, dash pattern and marker all equal).
func distinctLooks(t *testing.T, name string, b *bode) {
	t.Helper()
	looks, _, _ := b.looks()
	seen := map[string]string{}
	for i, l := range looks {
		r, g, bl, _ := l.color.RGBA()
		key := fmt.Sprintf("%d,%d,%d|%v|%T", r>>8, g>>8, bl>>8, l.dashes, l.glyph)
		if prev, ok := seen[key]; ok {
			t.Errorf("%s: %q and %q look the same", name, prev, b.Curves[i].Label)
		}
		seen[key] = b.Curves[i].Label
	}
}

func positions(n int) []float64 {
	ps := make([]float64, n)
	for i := range ps {
		ps[i] = float64(i) / float64(n-1)
	}
	return ps
}

// No two curves of one plot look the same, with a legend (up to 8) or
// along the colour map (more), and a sweep of sources and loads styles the
// second dimension.
func TestPlotCurvesDistinct(t *testing.T) {
	d, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{2, 5, 8, 9, 21, 105} {
		b := &bode{Range: d.Band, Curves: designCurves(d, atSwept(d, positions(n)...), true)}
		if got, want := b.usesColorMap(), n > maxLegendFamily; got != want {
			t.Errorf("%d positions: colour map %v, want %v", n, got, want)
		}
		distinctLooks(t, fmt.Sprintf("%d positions", n), b)
	}
	var srcs []float64
	for i := range 10 {
		srcs = append(srcs, 100*math.Pow(2, float64(i)))
	}
	res, err := networks.Sweep(d, srcs, []float64{100e3, 470e3, math.Inf(1)}, networks.Setting{networks.BlendKnob: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	b := sweepPlot(d, res, true, true, false)
	if !b.usesColorMap() {
		t.Errorf("a sweep of 30 rows uses a legend")
	}
	distinctLooks(t, "sweep 10 × 3", b)
	styles := map[int]bool{}
	for _, c := range b.Curves {
		if c.Family {
			styles[c.Style] = true
		}
	}
	if len(styles) != 3 {
		t.Errorf("sweep 10 sources × 3 loads: %d styles, want one per load", len(styles))
	}
	// The design's own curve is black and dashed, outside the family.
	own := b.Curves[len(b.Curves)-1]
	if own.Family || !own.Dash || own.Color != color.Black {
		t.Errorf("the design's own curve %+v is not the black dashed reference", own.Label)
	}
}

// Frequency ticks: a band narrower than a decade is labelled at its
// edges; a wide band is labelled at the decades only, so that labels do
// not run together.
func TestFreqTicks(t *testing.T) {
	labels := func(lo, hi float64) (vs []float64, ls []string) {
		for _, tk := range (freqTicks{}).Ticks(lo, hi) {
			if tk.Label != "" {
				vs = append(vs, tk.Value)
				ls = append(ls, tk.Label)
			}
		}
		return
	}
	vs, ls := labels(300, 2000)
	has := func(v float64) bool {
		for _, x := range vs {
			if math.Abs(x-v) < 1e-9*v {
				return true
			}
		}
		return false
	}
	if !has(300) || !has(2000) {
		t.Errorf("300 Hz–2 kHz: labels %v lack an edge", ls)
	}
	vs, ls = labels(0.1, 1e6)
	if len(vs) != 8 {
		t.Errorf("0.1 Hz–1 MHz: %d labels %v, want the 8 decades", len(vs), ls)
	}
	for i := 1; i < len(vs); i++ {
		if r := vs[i] / vs[i-1]; r < 9.99 {
			t.Errorf("0.1 Hz–1 MHz: labels %v closer than a decade", ls)
			break
		}
	}
	if ls[0] != "0.1" || ls[len(ls)-1] != "1M" {
		t.Errorf("0.1 Hz–1 MHz: labels %v", ls)
	}
	_, ls = labels(20, 20000)
	if strings.Join(ls, " ") != "20 50 100 200 500 1k 2k 5k 10k 20k" {
		t.Errorf("20 Hz–20 kHz: labels %v", ls)
	}
}

// An SVG embeds its font and names a generic fallback.
func TestSVGFont(t *testing.T) {
	d, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(t.TempDir(), "p.svg")
	b := &bode{Title: "t", Range: d.Band, Curves: designCurves(d, atSwept(d, 0.5), false)}
	if err := b.render(p); err != nil {
		t.Fatal(err)
	}
	svg, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	s := string(svg)
	if !strings.Contains(s, "@font-face") {
		t.Errorf("the SVG does not embed its font")
	}
	if !strings.Contains(s, "font-family:'Liberation Serif',serif;") {
		t.Errorf("the SVG's text names no generic fallback font")
	}
}

// A re-voicing plot shows the original design's curve, dashed.
func TestRevoicePlotShowsOriginal(t *testing.T) {
	d, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	changed := d.Clone()
	changed.Tone.Lowpass.C *= 1.5
	res := &synth.Result{Design: changed}
	b, err := synthBode(res, &synth.Problem{From: d})
	if err != nil {
		t.Fatal(err)
	}
	last := b.Curves[len(b.Curves)-1]
	if !last.Dash || !strings.Contains(last.Label, "original design") {
		t.Errorf("re-voicing plot: last curve %q (dashed %v), want the original design dashed", last.Label, last.Dash)
	}
	if b, _ := synthBode(res, nil); strings.Contains(b.Curves[len(b.Curves)-1].Label, "original") {
		t.Errorf("a fresh synthesis plot shows an original design")
	}
}

// The colour bar is drawn as vector shapes, not an embedded image, so that
// every SVG renderer shows its colours.
func TestColorBarIsVector(t *testing.T) {
	d, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(t.TempDir(), "p.svg")
	b := &bode{Title: "t", Range: d.Band, Curves: designCurves(d, atSwept(d, positions(11)...), false)}
	if !b.usesColorMap() {
		t.Fatal("11 positions: no colour bar")
	}
	if err := b.render(p); err != nil {
		t.Fatal(err)
	}
	svg, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(svg), "<image") {
		t.Errorf("the SVG's colour bar is an embedded image")
	}
}

// builtin is the default design of a built-in topology.
func builtin(t *testing.T, name string) *networks.Design {
	t.Helper()
	for _, tp := range networks.Topologies() {
		if tp.Name == name {
			return tp.DefaultDesign()
		}
	}
	t.Fatalf("no built-in %q", name)
	return nil
}

// A family over two or three knobs is coloured by one knob and styled by
// the others: no two curves look alike, the colour bar names the knob it
// maps and runs over its positions, and only the blend knob's bar speaks
// of low-pass and high-pass ends.
func TestPlotKnobFamilies(t *testing.T) {
	p3 := []float64{0, 0.5, 1}
	for _, tc := range []struct {
		design string
		lists  []networks.KnobList
		colour string // the knob the colours follow
		bar    string // the colour bar's label ("" with a legend)
	}{
		{"bass-treble", []networks.KnobList{{Name: "bass", Positions: p3}, {Name: "treble", Positions: p3}}, "", "knob position"},
		{"bass-treble", []networks.KnobList{{Name: "bass", Positions: []float64{0, 1}}, {Name: "treble", Positions: p3}}, "treble", ""},
		{"bass-treble", []networks.KnobList{{Name: "bass", Positions: positions(11)}}, "bass", "bass knob position"},
		{"three-band-stack", []networks.KnobList{{Name: "treble", Positions: p3}, {Name: "bass", Positions: p3}, {Name: "mid", Positions: p3}}, "", "knob position"},
		{"blend", []networks.KnobList{{Name: networks.BlendKnob, Positions: positions(11)}}, "blend", "blend knob (0 low-pass end, 1 high-pass end)"},
	} {
		d := builtin(t, tc.design)
		ss, err := d.Settings(tc.lists)
		if err != nil {
			t.Fatal(err)
		}
		name := fmt.Sprintf("%s %v", tc.design, tc.lists)
		b := &bode{Range: d.Band, Curves: designCurves(d, ss, false)}
		distinctLooks(t, name, b)
		_, scale, _ := b.looks()
		if tc.colour != "" {
			for _, c := range b.Curves {
				if c.OrderKnob != tc.colour {
					t.Errorf("%s: coloured by %q, want %q", name, c.OrderKnob, tc.colour)
					break
				}
			}
		}
		if !b.usesColorMap() {
			continue
		}
		if !strings.HasSuffix(scale.Label, tc.bar) || (tc.design != "blend" && strings.Contains(scale.Label, "low-pass")) {
			t.Errorf("%s: colour bar %q, want one ending %q", name, scale.Label, tc.bar)
		}
		if scale.Min != 0 || scale.Max != 1 {
			t.Errorf("%s: colour bar runs %g–%g, want the knob's positions 0–1", name, scale.Min, scale.Max)
		}
	}
}

// A swept row with the design's own source and load is the design's curve:
// its legend entry says so, the design's dashed curve is drawn thinner on
// top of it, and the row's ring stands for both.
func TestSweepRowEqualToDesign(t *testing.T) {
	d, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	res, err := networks.SweepLoads(d, nil, nil, []float64{d.Load.C, 470e-12, 1e-9}, networks.Setting{networks.BlendKnob: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	b := sweepPlot(d, res, false, false, true)
	if got := b.Curves[0].Label; !strings.HasSuffix(got, " (= the design)") {
		t.Errorf("the row at the design's load C is labelled %q, want it to say it is the design", got)
	}
	for _, c := range b.Curves[1 : len(b.Curves)-1] {
		if strings.Contains(c.Label, "the design") {
			t.Errorf("row %q is not the design", c.Label)
		}
	}
	if own := b.Curves[len(b.Curves)-1]; !own.Dash || len(own.Marks) != 0 {
		t.Errorf("the design's curve: dashed %v, %d rings; want dashed with its ring left to the row", own.Dash, len(own.Marks))
	}
}
