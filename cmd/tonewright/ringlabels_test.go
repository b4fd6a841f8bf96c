package main

import (
	"image/color"
	"math"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"tonewright/networks"
)

func TestSegmentMeetsBox(t *testing.T) {
	box := vg.Rectangle{Min: vg.Point{X: 0, Y: 0}, Max: vg.Point{X: 10, Y: 5}}
	for _, tc := range []struct {
		a, b vg.Point
		want bool
	}{
		{vg.Point{X: 2, Y: 2}, vg.Point{X: 3, Y: 3}, true},   // inside
		{vg.Point{X: -5, Y: 2}, vg.Point{X: 15, Y: 2}, true}, // across
		{vg.Point{X: 5, Y: -5}, vg.Point{X: 5, Y: 10}, true}, // up through
		{vg.Point{X: -5, Y: -5}, vg.Point{X: -1, Y: 10}, false},
		{vg.Point{X: 11, Y: -1}, vg.Point{X: 20, Y: 8}, false}, // beside
		{vg.Point{X: -1, Y: 4}, vg.Point{X: 1, Y: 7}, false},   // past a corner
		{vg.Point{X: -1, Y: 5}, vg.Point{X: 1, Y: 5.5}, false},
	} {
		if got := segmentMeetsBox(tc.a, tc.b, box); got != tc.want {
			t.Errorf("segment %v–%v: %v, want %v", tc.a, tc.b, got, tc.want)
		}
	}
}

// Ring labels stay inside the axes, off every curve and every other ring,
// and apart: checked on the drawn positions of a three-knob stack with its
// scoops crowded at the bottom of the curves, and of the demo's sweep.
func TestRingLabelsPlaced(t *testing.T) {
	demo, err := loadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	stack := builtin(t, "three-band-stack")
	ss, err := stack.Settings([]networks.KnobList{{Name: "treble", Positions: positions(5)}})
	if err != nil {
		t.Fatal(err)
	}
	res, err := networks.Sweep(demo, []float64{100, 1e3, 22e3, 47e3}, nil, networks.Setting{networks.BlendKnob: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	for name, b := range map[string]*bode{
		"stack": {Range: stack.Band, Curves: designCurves(stack, ss, false)},
		"sweep": sweepPlot(demo, res, true, false, false),
		"demo":  {Range: demo.Band, Curves: designCurves(demo, atSwept(demo, positions(11)...), false)},
	} {
		p := plot.New()
		freqAxis(p, b.Range)
		rl := newRingLabels()
		for _, c := range b.Curves {
			pts := xys(c.Hz, c.DB)
			l, _ := plotter.NewLine(pts)
			p.Add(l)
			rl.curves = append(rl.curves, pts)
			for _, m := range c.Marks {
				rl.rings = append(rl.rings, plotter.XY{X: m.Hz, Y: m.DB})
				rl.labels = append(rl.labels, ringLabel{plotter.XY{X: m.Hz, Y: m.DB}, hz(m.Hz), color.Black})
			}
		}
		dc := draw.New(vgimg.New(9*vg.Inch, 5*vg.Inch))
		rl.makeRoom(p, dc)
		c := p.DataCanvas(dc)
		placed, left := rl.place(c, p)
		if len(placed) == 0 {
			t.Errorf("%s: no ring labelled (%d left out)", name, left)
		}
		trX, trY := p.Transforms(&c)
		for i, l := range placed {
			w, h := rl.style(l.color).Width(l.text), rl.style(l.color).Height(l.text)
			box := vg.Rectangle{Min: vg.Point{X: l.centre.X - w/2, Y: l.centre.Y - h/2}, Max: vg.Point{X: l.centre.X + w/2, Y: l.centre.Y + h/2}}
			if box.Min.X < c.Min.X || box.Max.X > c.Max.X || box.Min.Y < c.Min.Y || box.Max.Y > c.Max.Y {
				t.Errorf("%s: label %s leaves the axes", name, l.text)
			}
			for k, cv := range rl.curves {
				for j := 1; j < len(cv); j++ {
					a := vg.Point{X: trX(cv[j-1].X), Y: trY(cv[j-1].Y)}
					e := vg.Point{X: trX(cv[j].X), Y: trY(cv[j].Y)}
					if segmentMeetsBox(a, e, box) {
						t.Errorf("%s: label %s lies on curve %d", name, l.text, k)
						break
					}
				}
			}
			for _, g := range rl.rings {
				x, y := trX(g.X), trY(g.Y)
				dx := math.Max(0, math.Max(float64(box.Min.X-x), float64(x-box.Max.X)))
				dy := math.Max(0, math.Max(float64(box.Min.Y-y), float64(y-box.Max.Y)))
				if math.Hypot(dx, dy) < ringRadius {
					t.Errorf("%s: label %s lies on the ring at %s", name, l.text, hz(g.X))
				}
			}
			for _, o := range placed[:i] {
				if math.Abs(float64(o.centre.X-l.centre.X)) < float64(w) && math.Abs(float64(o.centre.Y-l.centre.Y)) < float64(h) {
					t.Errorf("%s: labels %s and %s overlap", name, o.text, l.text)
				}
			}
		}
	}
}
