package main

import (
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// colorBar draws a colour map from min to max up the y axis of its plot as
// many thin filled rectangles: vector shapes, drawn alike in PNG and SVG
// by every renderer (an embedded image is not).
type colorBar struct {
	cmap     palette.ColorMap
	min, max float64
}

// colorBarSteps is the number of rectangles: finer than the eye can tell
// apart on a bar a few hundred points high.
const colorBarSteps = 256

// Plot implements plot.Plotter.
func (b colorBar) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x0, x1 := trX(0), trX(1)
	top := trY(b.max)
	for i := range colorBarSteps {
		v0 := b.min + (b.max-b.min)*float64(i)/colorBarSteps
		v1 := b.min + (b.max-b.min)*float64(i+1)/colorBarSteps
		col, err := b.cmap.At((v0 + v1) / 2)
		if err != nil {
			continue
		}
		// Each rectangle runs to the top of the bar and the next covers
		// it from its own bottom up: the anti-aliased edge of one falls
		// on the solid colour of the one below, and no light seam shows.
		r := vg.Rectangle{Min: vg.Point{X: x0, Y: trY(v0)}, Max: vg.Point{X: x1, Y: top}}
		c.SetColor(col)
		c.Fill(r.Path())
	}
}

// DataRange implements plot.DataRanger.
func (b colorBar) DataRange() (xmin, xmax, ymin, ymax float64) { return 0, 1, b.min, b.max }
