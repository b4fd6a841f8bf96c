package main

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// panels is a figure of plots stacked one above the other that share
// nothing but the page: the impedance and knob-turn plots. (The Bode plot
// has its own renderer, bode.)
type panels struct {
	Title  string
	Panels []panel
}

// panel is one plot of a panels figure.
type panel struct {
	XLabel, YLabel string
	LogX, LogY     bool
	FreqX, FreqY   bool // label a log axis at 1-2-5 steps in Hz
	DBY            bool // label the y axis in dB steps
	TenthsX        bool // label the x axis (a rotation, 0..1) in tenths
	OhmY           bool // label a log y axis at 1-2-5 steps in Ω
	LegendBottom   bool
	LegendRight    bool
	XMin, XMax     float64
	YMin, YMax     float64 // the y range when no series has a point (a log axis needs one)
	Series         []series
}

// series is one line of a panel; NaN values break it, and so does a jump
// by more than a factor of Jump (when above 1) in one 1/40 of the x
// range (a figure that leaps from one feature of the curve to another).
type series struct {
	Label string
	X, Y  []float64
	Jump  float64
}

// jumpStep is the x step over which a series may change by its Jump
// factor; a longer step allows the factor once per jumpStep.
const jumpStep = 1.0 / 40

// runs is segments with the series' jumps broken too.
func (s series) runs() []plotter.XYs {
	if s.Jump <= 1 {
		return segments(s.X, s.Y)
	}
	var out []plotter.XYs
	for _, seg := range segments(s.X, s.Y) {
		start := 0
		for i := 1; i < len(seg); i++ {
			steps := math.Max(1, math.Abs(seg[i].X-seg[i-1].X)/jumpStep)
			if r := seg[i].Y / seg[i-1].Y; r > math.Pow(s.Jump, steps) || r < math.Pow(s.Jump, -steps) {
				out = append(out, seg[start:i])
				start = i
			}
		}
		out = append(out, seg[start:])
	}
	return out
}

// segments splits x, y at NaN values into runs to draw as lines.
func segments(x, y []float64) []plotter.XYs {
	var out []plotter.XYs
	var cur plotter.XYs
	for i := range x {
		if math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			if len(cur) > 0 {
				out = append(out, cur)
				cur = nil
			}
			continue
		}
		cur = append(cur, plotter.XY{X: x[i], Y: y[i]})
	}
	if len(cur) > 0 {
		out = append(out, cur)
	}
	return out
}

// render draws the figure to path, PNG or SVG by the extension.
func (f *panels) render(path string, inputs ...string) error {
	if err := checkPlotFile(path, inputs...); err != nil {
		return err
	}
	var plots [][]*plot.Plot
	var legends []*sideLegend // beside each panel, on a white panel, covering no curve
	for i, pn := range f.Panels {
		p := plot.New()
		if i == 0 {
			p.Title.Text = f.Title
		}
		styleAxes(p)
		p.X.Label.Text, p.Y.Label.Text = pn.XLabel, pn.YLabel
		if pn.LogX {
			p.X.Scale = plot.LogScale{}
			p.X.Tick.Marker = plot.LogTicks{Prec: -1}
		}
		if pn.FreqX {
			p.X.Tick.Marker = freqTicks{}
		}
		if pn.LogY {
			p.Y.Scale = plot.LogScale{}
			p.Y.Tick.Marker = plot.LogTicks{Prec: -1}
		}
		if pn.FreqY {
			p.Y.Tick.Marker = freqTicks{Gap: verticalGap}
		}
		if pn.OhmY {
			p.Y.Tick.Marker = ohmTicks{Gap: verticalGap}
		}
		if pn.DBY {
			p.Y.Tick.Marker = dbTicks{}
		}
		if pn.TenthsX {
			p.X.Tick.Marker = tenths{}
		}
		if pn.XMax > pn.XMin {
			p.X.Min, p.X.Max = pn.XMin, pn.XMax
		}
		empty := true
		for _, s := range pn.Series {
			empty = empty && len(segments(s.X, s.Y)) == 0
		}
		if empty && pn.YMax > pn.YMin {
			p.Y.Min, p.Y.Max = pn.YMin, pn.YMax
		}
		var entries []legendEntry
		for k, s := range pn.Series {
			col := colorFor(k, len(pn.Series))
			first := true
			for _, seg := range s.runs() {
				l, err := plotter.NewLine(seg)
				if err != nil {
					return err
				}
				l.Color, l.Width = col, vg.Points(2)
				if k >= len(curveColors) {
					l.Dashes = []vg.Length{vg.Points(2), vg.Points(2.5)}
				}
				p.Add(l)
				if first && s.Label != "" {
					entries = append(entries, legendEntry{s.Label, l})
					first = false
				}
				if len(seg) == 1 {
					sc, err := plotter.NewScatter(seg)
					if err != nil {
						return err
					}
					sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2), Shape: draw.CircleGlyph{}}
					p.Add(sc)
				}
			}
		}
		plots = append(plots, []*plot.Plot{p})
		legends = append(legends, newSideLegend(entries))
	}
	w, h := vg.Length(9)*vg.Inch, vg.Length(3.6*float64(len(plots))+0.8)*vg.Inch
	var side vg.Length
	for _, l := range legends {
		side = max(side, l.width())
	}
	if side > 0 {
		side += vg.Points(16)
		w += side
	}
	svg := strings.ToLower(filepath.Ext(path)) != ".png"
	var canvas vg.CanvasWriterTo
	if !svg {
		canvas = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(110), vgimg.UseBackgroundColor(color.White))}
	} else {
		canvas = vgsvg.NewWith(vgsvg.UseWH(w, h), vgsvg.EmbedFonts(true))
	}
	dc := draw.New(canvas)
	main := draw.Crop(dc, 0, -side, 0, 0)
	tiles := draw.Tiles{Rows: len(plots), Cols: 1, PadTop: vg.Points(4), PadBottom: vg.Points(4), PadLeft: vg.Points(4), PadRight: vg.Points(10), PadY: vg.Points(14)}
	cs := plot.Align(plots, tiles, main)
	for i := range plots {
		plots[i][0].Draw(cs[i][0])
		top := cs[i][0].Max.Y
		if i == 0 {
			top -= plots[0][0].Title.TextStyle.Height(plots[0][0].Title.Text) + vg.Points(10)
		}
		legends[i].draw(dc, dc.Max.X-side+vg.Points(6), top)
	}
	var buf bytes.Buffer
	if _, err := canvas.WriteTo(&buf); err != nil {
		return fmt.Errorf("drawing %s: %w", path, err)
	}
	data := buf.Bytes()
	if svg {
		data = svgFontFallback(data)
	}
	return writeFile(path, data, inputs...)
}
