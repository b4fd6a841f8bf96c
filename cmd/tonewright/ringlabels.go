package main

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// ringLabels labels the scoop rings of a magnitude panel with their
// frequency. Each label goes beside its ring (below it if there is room,
// else above, to a side, at a corner or a line further off), inside the
// axes and clear of every curve, ring, target and label already placed; a
// label that fits nowhere is left out. The places are found in drawing
// units on the panel's own data area, so what is checked is what is drawn.
// It is a plotter that draws no glyph outside the data and claims no data
// range, so adding it changes neither the axes nor the data area.
type ringLabels struct {
	labels  []ringLabel
	rings   []plotter.XY  // every ring, labelled or not
	crosses []plotter.XY  // targets drawn as crosses
	curves  []plotter.XYs // every magnitude curve
	font    font.Font
}

// ringLabel is a ring to label: where it is, what to write, in which colour.
type ringLabel struct {
	at    plotter.XY
	text  string
	color color.Color
}

// Sizes of the things a label keeps clear of, in points.
const (
	ringRadius  = 4.5 // the rings' glyph radius
	crossRadius = 6   // the targets' cross
	labelClear  = 1.2 // between a label and anything else
)

func newRingLabels() *ringLabels {
	return &ringLabels{font: font.From(plot.DefaultFont, vg.Points(9))}
}

func (r *ringLabels) style(col color.Color) text.Style {
	return text.Style{Color: col, Font: r.font, XAlign: draw.XCenter, YAlign: draw.YCenter, Handler: plot.DefaultTextHandler}
}

// placedLabel is a label with the centre it was given.
type placedLabel struct {
	ringLabel
	centre vg.Point
}

// place finds the labels' places on the data canvas c of p; it returns
// those placed and how many were left out.
func (r *ringLabels) place(c draw.Canvas, p *plot.Plot) (out []placedLabel, left int) {
	trX, trY := p.Transforms(&c)
	pt := func(xy plotter.XY) vg.Point { return vg.Point{X: trX(xy.X), Y: trY(xy.Y)} }
	var curves [][]vg.Point
	for _, cv := range r.curves {
		ps := make([]vg.Point, len(cv))
		for i, xy := range cv {
			ps[i] = pt(xy)
		}
		curves = append(curves, ps)
	}
	type disc struct {
		at vg.Point
		r  vg.Length
	}
	var discs []disc
	for _, g := range r.rings {
		discs = append(discs, disc{pt(g), vg.Points(ringRadius)})
	}
	for _, g := range r.crosses {
		discs = append(discs, disc{pt(g), vg.Points(crossRadius)})
	}
	var boxes []vg.Rectangle
	pad := vg.Points(labelClear)
	area := vg.Rectangle{Min: vg.Point{X: c.Min.X + pad, Y: c.Min.Y + pad}, Max: vg.Point{X: c.Max.X - pad, Y: c.Max.Y - pad}}
	free := func(b vg.Rectangle) bool {
		if b.Min.X < area.Min.X || b.Max.X > area.Max.X || b.Min.Y < area.Min.Y || b.Max.Y > area.Max.Y {
			return false
		}
		for _, o := range boxes {
			if b.Min.X < o.Max.X+pad && o.Min.X < b.Max.X+pad && b.Min.Y < o.Max.Y+pad && o.Min.Y < b.Max.Y+pad {
				return false
			}
		}
		for _, d := range discs {
			dx := math.Max(0, math.Max(float64(b.Min.X-d.at.X), float64(d.at.X-b.Max.X)))
			dy := math.Max(0, math.Max(float64(b.Min.Y-d.at.Y), float64(d.at.Y-b.Max.Y)))
			if math.Hypot(dx, dy) < float64(d.r+pad) {
				return false
			}
		}
		grown := vg.Rectangle{Min: vg.Point{X: b.Min.X - pad, Y: b.Min.Y - pad}, Max: vg.Point{X: b.Max.X + pad, Y: b.Max.Y + pad}}
		for _, cv := range curves {
			for i := 1; i < len(cv); i++ {
				if segmentMeetsBox(cv[i-1], cv[i], grown) {
					return false
				}
			}
		}
		return true
	}
	for _, l := range r.labels {
		st := r.style(l.color)
		w, h := st.Width(l.text), st.Height(l.text)
		ring := pt(l.at)
		gap := vg.Points(ringRadius) + pad
		diag := gap * 0.75
		var offsets = []vg.Point{
			{X: 0, Y: -(gap + h/2)},              // below
			{X: 0, Y: gap + h/2},                 // above
			{X: gap + w/2, Y: 0},                 // right
			{X: -(gap + w/2), Y: 0},              // left
			{X: diag + w/2, Y: -(diag + h/2)},    // below right
			{X: -(diag + w/2), Y: -(diag + h/2)}, // below left
			{X: diag + w/2, Y: diag + h/2},       // above right
			{X: -(diag + w/2), Y: diag + h/2},    // above left
			{X: 0, Y: -(gap + 1.5*h)},            // a line further below
			{X: 0, Y: gap + 1.5*h},               // a line further above
		}
		ok := false
		for _, o := range offsets {
			centre := vg.Point{X: ring.X + o.X, Y: ring.Y + o.Y}
			b := vg.Rectangle{Min: vg.Point{X: centre.X - w/2, Y: centre.Y - h/2}, Max: vg.Point{X: centre.X + w/2, Y: centre.Y + h/2}}
			if free(b) {
				boxes = append(boxes, b)
				out = append(out, placedLabel{l, centre})
				ok = true
				break
			}
		}
		if !ok {
			left++
		}
	}
	return out, left
}

// makeRoom lowers p's level axis, drawn on area, so that a label fits
// under the lowest ring to label (scoops often sit at the bottom of the
// curves); it reports whether it did.
func (r *ringLabels) makeRoom(p *plot.Plot, area draw.Canvas) bool {
	if len(r.labels) == 0 {
		return false
	}
	lowest := math.Inf(1)
	for _, l := range r.labels {
		lowest = math.Min(lowest, l.at.Y)
	}
	dataC := p.DataCanvas(area)
	_, trY := p.Transforms(&dataC)
	need := float64(vg.Points(ringRadius) + 3*vg.Points(labelClear) + r.style(color.Black).Height("1 kHz"))
	h := float64(dataC.Max.Y - dataC.Min.Y)
	if float64(trY(lowest)-dataC.Min.Y) >= need || h <= 3*need {
		return false
	}
	p.Y.Min = (lowest*h - need*p.Y.Max) / (h - need)
	return true
}

// Plot implements plot.Plotter.
func (r *ringLabels) Plot(c draw.Canvas, p *plot.Plot) {
	placed, _ := r.place(c, p)
	for _, l := range placed {
		c.FillText(r.style(l.color), l.centre, l.text)
	}
}

// segmentMeetsBox reports whether the segment from a to b touches box b
// (Liang–Barsky clipping).
func segmentMeetsBox(a, b vg.Point, box vg.Rectangle) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	for _, e := range [4][2]float64{
		{-dx, float64(a.X - box.Min.X)},
		{dx, float64(box.Max.X - a.X)},
		{-dy, float64(a.Y - box.Min.Y)},
		{dy, float64(box.Max.Y - a.Y)},
	} {
		p, q := e[0], e[1]
		if p == 0 {
			if q < 0 {
				return false
			}
			continue
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return false
		}
	}
	return true
}
