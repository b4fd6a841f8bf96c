package main

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"tonewright/networks"
)

// curve is one labelled response on a Bode plot.
type curve struct {
	Label string
	Hz    []float64
	DB    []float64
	Deg   []float64   // phase; may be nil
	Marks []point     // drawn as open circles in the curve's colour
	Dash  bool        // the reference style: a plain dash (the design as it is)
	Color color.Color // nil: the palette's, or the colour map's for a family member

	// Family curves are members of an ordered family (knob positions,
	// swept values): Order places the curve on the family's colour scale,
	// OrderKnob names the knob it is a position of (knob families). Style
	// picks a dash pattern and marker for a second dimension (the loads of
	// a sweep of sources and loads, the other knobs of a family of several
	// knobs); StyleLabel names it.
	Family     bool
	Order      float64
	OrderKnob  string
	Style      int
	StyleLabel string
}

// point is a marked spot on a plot.
type point struct{ Hz, DB float64 }

// band is a shaded range between two curves (a tolerance spread, say).
type band struct {
	Label  string
	Hz     []float64
	Lo, Hi []float64
}

// target is a wanted value drawn on the plot: a cross at (Hz, DB), or a
// vertical line where DB is NaN.
type target struct {
	Label string
	Hz    float64
	DB    float64
}

// colorScale is what the colour bar of an ordered family shows: its label,
// the range of the curves' Order and where it is labelled.
type colorScale struct {
	Label    string
	Min, Max float64
	Ticks    []plot.Tick
}

// bode describes a magnitude plot with an optional phase panel below it.
type bode struct {
	Title   string
	Caption string
	Range   networks.Band
	Curves  []curve
	Bands   []band
	Targets []target
	Phase   bool
	// Scale is the family's colour scale; nil: the blend knob's, from the
	// family curves' Order.
	Scale *colorScale
}

// maxLegendFamily is the largest family drawn with a legend entry per
// curve; a larger one is coloured along the colour map with a colour bar.
const maxLegendFamily = 8

// curveColors are the palette of plots with a legend: eight colours that
// are told apart on white, running from warm (the low-pass end of the
// blend knob) to cool (the high-pass end); chosen for this tool. A plot
// never needs more: a larger family takes the colour map.
var curveColors = []color.RGBA{
	{176, 58, 46, 255},  // brick red
	{211, 132, 24, 255}, // amber
	{60, 140, 64, 255},  // green
	{32, 112, 170, 255}, // blue
	{108, 62, 160, 255}, // violet
	{90, 90, 90, 255},   // grey
	{190, 70, 140, 255}, // magenta
	{20, 150, 150, 255}, // teal
}

// colorFor is the palette colour of the i-th of n curves: a few curves
// are spread across the warm-to-cool run, more take the colours in turn.
func colorFor(i, n int) color.RGBA {
	if n > 1 && n <= 5 {
		return curveColors[int(math.Round(float64(i)*4/float64(n-1)))]
	}
	return curveColors[i%len(curveColors)]
}

// familyMap is the colour map of large families: the perceptually uniform
// sequential map of Kindlmann, Reinhard and Creem (2002, luminance-matched;
// gonum's moreland.Kindlmann), used from dark violet to light green: its
// black and white ends would vanish into the axes and the background.
type familyMap struct {
	palette.ColorMap
	lo, hi float64 // the scale's range
}

// The part of the Kindlmann map used, as fractions of its luminance run.
const mapFrom, mapTo = 0.12, 0.76

func newFamilyMap(s *colorScale) *familyMap {
	base := moreland.Kindlmann()
	base.SetMin(0)
	base.SetMax(1)
	return &familyMap{ColorMap: base, lo: s.Min, hi: s.Max}
}

func (m *familyMap) At(v float64) (color.Color, error) {
	t := 0.5
	if m.hi > m.lo {
		t = math.Max(0, math.Min(1, (v-m.lo)/(m.hi-m.lo)))
	}
	return m.ColorMap.At(mapFrom + (mapTo-mapFrom)*t)
}
func (m *familyMap) Min() float64     { return m.lo }
func (m *familyMap) Max() float64     { return m.hi }
func (m *familyMap) SetMin(v float64) { m.lo = v }
func (m *familyMap) SetMax(v float64) { m.hi = v }
func (m *familyMap) color(v float64) color.Color {
	c, err := m.At(v)
	if err != nil {
		return color.Black
	}
	return c
}

// Line styles. The reference dash (the design as it is, the median) is a
// plain dash that no family style uses; family styles combine a pattern
// with a marker, so that up to 24 second-dimension values differ.
var (
	refDash       = []vg.Length{vg.Points(7), vg.Points(5)}
	styleDashes   = [][]vg.Length{nil, {vg.Points(1.5), vg.Points(2.5)}, {vg.Points(7), vg.Points(2.5), vg.Points(1.5), vg.Points(2.5)}, {vg.Points(7), vg.Points(2.5), vg.Points(1.5), vg.Points(2.5), vg.Points(1.5), vg.Points(2.5)}}
	styleGlyphs   = []draw.GlyphDrawer{nil, draw.CircleGlyph{}, draw.SquareGlyph{}, draw.TriangleGlyph{}, draw.PlusGlyph{}, draw.CrossGlyph{}}
	markerEvery   = 30 // grid points between markers (the grid has 120 a decade)
	maxRingLabels = maxLegendFamily
)

// curveLook is how one curve is drawn.
type curveLook struct {
	color  color.Color
	dashes []vg.Length
	glyph  draw.GlyphDrawer
}

func lookOf(c curve, col color.Color) curveLook {
	l := curveLook{color: col}
	if c.Dash {
		l.dashes = refDash
		return l
	}
	l.dashes = styleDashes[c.Style%len(styleDashes)]
	l.glyph = styleGlyphs[(c.Style/len(styleDashes))%len(styleGlyphs)]
	return l
}

// addCurve draws xs, ys in the look, markers spaced along it.
func addCurve(p *plot.Plot, pts plotter.XYs, look curveLook, width vg.Length, phase int) (plot.Thumbnailer, error) {
	l, err := plotter.NewLine(pts)
	if err != nil {
		return nil, err
	}
	l.Color, l.Width, l.Dashes = look.color, width, look.dashes
	p.Add(l)
	if look.glyph == nil {
		return l, nil
	}
	var ms plotter.XYs
	for i := phase % markerEvery; i < len(pts); i += markerEvery {
		ms = append(ms, pts[i])
	}
	s, err := plotter.NewScatter(ms)
	if err != nil {
		return nil, err
	}
	s.GlyphStyle = draw.GlyphStyle{Color: look.color, Radius: vg.Points(3), Shape: look.glyph}
	p.Add(s)
	return lineAndGlyph{l, s}, nil
}

// lineAndGlyph draws a legend thumbnail with the line and its marker.
type lineAndGlyph struct {
	l *plotter.Line
	s *plotter.Scatter
}

func (t lineAndGlyph) Thumbnail(c *draw.Canvas) {
	t.l.Thumbnail(c)
	t.s.Thumbnail(c)
}

// freqLabel writes a frequency tick label: 20, 500, 1k, 20k, 0.1.
func freqLabel(v float64) string {
	if v < 1 {
		return strconv.FormatFloat(v, 'g', 3, 64)
	}
	return strings.ReplaceAll(strings.TrimSuffix(withUnit(v, 3, ""), " "), " ", "")
}

func styleAxes(p *plot.Plot) {
	p.Title.TextStyle.Font.Size = vg.Points(13)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font.Size = vg.Points(12)
		ax.Tick.Label.Font.Size = vg.Points(10.5)
	}
	grid := plotter.NewGrid()
	grid.Vertical.Color = color.Gray{215}
	grid.Horizontal.Color = color.Gray{215}
	p.Add(grid)
}

func freqAxis(p *plot.Plot, r networks.Band) {
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = freqTicks{}
	p.X.Min, p.X.Max = r.From, r.To
	p.X.Label.Text = "frequency (Hz)"
}

func xys(x, y []float64) plotter.XYs {
	pts := make(plotter.XYs, 0, len(x))
	for i := range x {
		if !math.IsNaN(y[i]) && !math.IsInf(y[i], 0) {
			pts = append(pts, plotter.XY{X: x[i], Y: y[i]})
		}
	}
	return pts
}

// checkPlotFile refuses a plot file name before any work is done: it must
// end in .png or .svg and pass checkOutput.
func checkPlotFile(path string, inputs ...string) error {
	if ext := strings.ToLower(filepath.Ext(path)); ext != ".png" && ext != ".svg" {
		return usageErrorf("plot file %s: the name must end in .png or .svg", path)
	}
	return checkOutput(path, inputs...)
}

// checkPlotFlag is checkPlotFile for the file given with --flag.
func checkPlotFlag(flag, path string, inputs ...string) error {
	if err := checkPlotFile(path, inputs...); err != nil {
		return usageErrorf("--%s: %v", flag, err)
	}
	return nil
}

// knobScale is the colour scale of a family of knob positions: the bar
// names the knob (the blend knob with what its ends do) and runs over its
// positions.
func knobScale(cs []curve) *colorScale {
	s := &colorScale{Label: "knob position", Min: math.Inf(1), Max: math.Inf(-1)}
	var orders []float64
	for _, c := range cs {
		if !c.Family {
			continue
		}
		switch c.OrderKnob {
		case "":
		case networks.BlendKnob:
			s.Label = "blend knob (0 low-pass end, 1 high-pass end)"
		default:
			s.Label = c.OrderKnob + " knob position"
		}
		s.Min, s.Max = math.Min(s.Min, c.Order), math.Max(s.Max, c.Order)
		if !slices.Contains(orders, c.Order) {
			orders = append(orders, c.Order)
		}
	}
	if len(orders) <= 11 {
		for _, o := range orders {
			s.Ticks = append(s.Ticks, plot.Tick{Value: o, Label: posLabel(o)})
		}
		return s
	}
	for _, o := range orders {
		s.Ticks = append(s.Ticks, plot.Tick{Value: o})
	}
	for v := 0.0; v <= 1; v += 0.25 {
		if v >= s.Min-1e-9 && v <= s.Max+1e-9 {
			s.Ticks = append(s.Ticks, plot.Tick{Value: v, Label: posLabel(v)})
		}
	}
	return s
}

// rankScale is the colour scale of a family of swept values, coloured by
// their rank (even steps for the usual log-spaced sweeps): names[i] labels
// rank i, every one when there are few, else about ten of them.
func rankScale(label string, names []string) *colorScale {
	s := &colorScale{Label: label, Min: -0.5, Max: float64(len(names)) - 0.5}
	step := max(1, (len(names)+9)/10)
	for i, n := range names {
		t := plot.Tick{Value: float64(i)}
		if i%step == 0 || (i == len(names)-1 && 2*(i%step) > step) {
			t.Label = n
		}
		s.Ticks = append(s.Ticks, t)
	}
	return s
}

// usesColorMap reports whether the plot's family is large enough to be
// coloured along the colour map, with a colour bar instead of a legend.
func (b *bode) usesColorMap() bool {
	n := 0
	for _, c := range b.Curves {
		if c.Family {
			n++
		}
	}
	return n > maxLegendFamily
}

// looks assigns every curve its colour, dash pattern and marker: a fixed
// colour if it has one, the colour map's for a member of a large family,
// else the palette's in turn; the magnitude and phase panels share them.
func (b *bode) looks() ([]curveLook, *colorScale, *familyMap) {
	useMap := b.usesColorMap()
	scale := b.Scale
	if scale == nil {
		scale = knobScale(b.Curves)
	}
	cmap := newFamilyMap(scale)
	// A family of two or more dimensions (styled members) takes its
	// palette colours by Order, as the colour map does: one colour per
	// value of the colour dimension.
	var orders []float64
	styled := false
	for _, c := range b.Curves {
		if c.Family && c.Color == nil {
			styled = styled || c.StyleLabel != ""
			if !slices.Contains(orders, c.Order) {
				orders = append(orders, c.Order)
			}
		}
	}
	slices.Sort(orders)
	byOrder := styled && !useMap
	palette := 0
	for _, c := range b.Curves {
		if c.Color == nil && !(useMap && c.Family) && !(byOrder && c.Family) {
			palette++
		}
	}
	next := 0
	if byOrder {
		palette += len(orders)
		next = len(orders)
	}
	var out []curveLook
	for _, c := range b.Curves {
		var col color.Color = c.Color
		switch {
		case col != nil:
		case useMap && c.Family:
			col = cmap.color(c.Order)
		case byOrder && c.Family:
			col = colorFor(slices.Index(orders, c.Order), len(orders))
		default:
			col = colorFor(next, palette)
			next++
		}
		out = append(out, lookOf(c, col))
	}
	return out, scale, cmap
}

// legendEntry is one line of the legend beside the plot.
type legendEntry struct {
	label string
	thumb plot.Thumbnailer
}

// render draws the plot and writes it to path as PNG or SVG, chosen by the
// extension. The legend stands beside the axes, on a white panel, where it
// covers no curve; a family of more than maxLegendFamily curves is
// coloured along the colour map and explained by a colour bar instead.
func (b *bode) render(path string, inputs ...string) error {
	if err := checkPlotFile(path, inputs...); err != nil {
		return err
	}
	ext := strings.ToLower(filepath.Ext(path))
	mag := plot.New()
	title := b.Title
	caption := b.Caption
	marked := 0
	for _, c := range b.Curves {
		if len(c.Marks) > 0 {
			marked++
		}
	}
	useMap := b.usesColorMap()
	// Label every ring when there are few; else an even selection, the
	// first and last among them. A label that finds no free place beside
	// its ring is left out; the title says when any is.
	ringStep := max(1, (marked+maxRingLabels-1)/maxRingLabels)
	rl := newRingLabels()
	skipped := ringStep > 1
	if caption != "" {
		title += "\n" + caption
	}
	mag.Title.Text = title
	styleAxes(mag)
	freqAxis(mag, b.Range)
	mag.Y.Label.Text = "gain (dB)"
	mag.Y.Tick.Marker = dbTicks{}
	var legend []legendEntry
	for i, bd := range b.Bands {
		poly := append(xys(bd.Hz, bd.Hi), reversed(xys(bd.Hz, bd.Lo))...)
		pg, err := plotter.NewPolygon(poly)
		if err != nil {
			return err
		}
		c := colorFor(i, len(b.Bands))
		pg.Color = color.NRGBA{c.R, c.G, c.B, 60}
		pg.LineStyle.Width = 0
		mag.Add(pg)
		if bd.Label != "" {
			legend = append(legend, legendEntry{bd.Label, pg})
		}
	}
	var pha *plot.Plot
	if b.Phase {
		pha = plot.New()
		styleAxes(pha)
		freqAxis(pha, b.Range)
		pha.Y.Label.Text = "phase (°)"
		pha.Y.Tick.Marker = degTicks{}
	}
	looks, scale, cmap := b.looks()
	styles := map[int]bool{}
	var styleEntries []legendEntry
	ring := 0
	for i, c := range b.Curves {
		look := looks[i]
		col := look.color
		// The reference (dashed) is drawn thinner, and after the family,
		// so that a curve it lies on still shows around and between its
		// dashes.
		width, phaseWidth := vg.Points(2), vg.Points(1.6)
		if c.Dash {
			width, phaseWidth = vg.Points(1.2), vg.Points(1)
		}
		pts := xys(c.Hz, c.DB)
		thumb, err := addCurve(mag, pts, look, width, i*7)
		if err != nil {
			return err
		}
		rl.curves = append(rl.curves, pts)
		if c.Label != "" && !(useMap && c.Family) {
			legend = append(legend, legendEntry{c.Label, thumb})
		}
		if useMap && c.Family && c.StyleLabel != "" && !styles[c.Style] {
			// One legend entry per second-dimension style, in grey.
			styles[c.Style] = true
			grey := lookOf(c, color.Gray{70})
			l, _ := plotter.NewLine(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 0}})
			l.Color, l.Width, l.Dashes = grey.color, vg.Points(2), grey.dashes
			var th plot.Thumbnailer = l
			if grey.glyph != nil {
				s, _ := plotter.NewScatter(plotter.XYs{{X: 0, Y: 0}})
				s.GlyphStyle = draw.GlyphStyle{Color: grey.color, Radius: vg.Points(3), Shape: grey.glyph}
				th = lineAndGlyph{l, s}
			}
			styleEntries = append(styleEntries, legendEntry{c.StyleLabel, th})
		}
		if len(c.Marks) > 0 {
			var pts plotter.XYs
			label := ring%ringStep == 0 || ring == marked-1
			ring++
			for _, m := range c.Marks {
				at := plotter.XY{X: m.Hz, Y: m.DB}
				pts = append(pts, at)
				rl.rings = append(rl.rings, at)
				if label {
					rl.labels = append(rl.labels, ringLabel{at, hz(m.Hz), col})
				}
			}
			s, err := plotter.NewScatter(pts)
			if err != nil {
				return err
			}
			s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(4.5), Shape: draw.RingGlyph{}}
			mag.Add(s)
		}
		if pha != nil && c.Deg != nil {
			if _, err := addCurve(pha, xys(c.Hz, c.Deg), look, phaseWidth, i*7); err != nil {
				return err
			}
		}
	}
	mag.Add(rl)
	legend = append(legend, styleEntries...)
	for _, t := range b.Targets {
		e, err := addTarget(mag, t)
		if err != nil {
			return err
		}
		if math.IsNaN(t.DB) {
			rl.curves = append(rl.curves, plotter.XYs{{X: t.Hz, Y: mag.Y.Min}, {X: t.Hz, Y: mag.Y.Max}})
		} else {
			rl.crosses = append(rl.crosses, plotter.XY{X: t.Hz, Y: t.DB})
		}
		if e.label != "" {
			legend = append(legend, e)
		}
	}

	w, h := vg.Length(10.5)*vg.Inch, vg.Length(5.8)*vg.Inch
	if pha != nil {
		h = vg.Length(8.6) * vg.Inch
	}
	var buf bytes.Buffer
	var canvas vg.CanvasWriterTo
	switch ext {
	case ".png":
		canvas = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(110), vgimg.UseBackgroundColor(color.White))}
	default:
		canvas = vgsvg.NewWith(vgsvg.UseWH(w, h), vgsvg.EmbedFonts(true))
	}
	dc := draw.New(canvas)
	lg := newSideLegend(legend)
	side := lg.width()
	if useMap {
		side = max(side, vg.Points(100))
	}
	side += vg.Points(16)
	main := draw.Crop(dc, 0, -side, 0, 0)
	tiles := draw.Tiles{Rows: 2, Cols: 1, PadTop: vg.Points(4), PadBottom: vg.Points(4), PadLeft: vg.Points(4), PadRight: vg.Points(10), PadY: vg.Points(10)}
	areas := func() (magC, phaC draw.Canvas) {
		if b.Phase {
			cs := plot.Align([][]*plot.Plot{{mag}, {pha}}, tiles, main)
			return cs[0][0], cs[1][0]
		}
		return main, draw.Canvas{}
	}
	magArea, phaArea := areas()
	// Room for a label under the lowest labelled ring: a scoop near the
	// bottom of the curves lowers the axis a little.
	if rl.makeRoom(mag, magArea) {
		magArea, phaArea = areas()
	}
	// The title says when a ring went unlabelled: try the labels on the
	// data area as it is, and if any is left out, add the line (which
	// shrinks the area a little; the labels are placed again when drawn).
	if _, left := rl.place(mag.DataCanvas(magArea), mag); left > 0 || skipped {
		mag.Title.Text += "\nrings: the scoops, labelled where room allows"
		magArea, phaArea = areas()
	}
	mag.Draw(magArea)
	if pha != nil {
		pha.Draw(phaArea)
	}
	// The side column: the legend at the top of the axes (below the
	// title), the colour bar under it.
	titleH := mag.Title.TextStyle.Height(mag.Title.Text) + vg.Points(10)
	top := magArea.Max.Y - titleH
	x0 := dc.Max.X - side + vg.Points(6)
	bottom := lg.draw(dc, x0, top)
	if useMap {
		cb := plot.New()
		cb.HideX()
		cb.Y.Label.Text = scale.Label
		cb.Y.Label.TextStyle.Font.Size = vg.Points(10.5)
		cb.Y.Tick.Label.Font.Size = vg.Points(9.5)
		cb.Y.Tick.Marker = plot.ConstantTicks(scale.Ticks)
		cb.Y.Min, cb.Y.Max = scale.Min, scale.Max
		cb.Add(colorBar{cmap: cmap, min: scale.Min, max: scale.Max})
		area := draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{
			Min: vg.Point{X: x0, Y: magArea.Min.Y + vg.Points(40)},
			Max: vg.Point{X: x0 + vg.Points(95), Y: bottom - vg.Points(14)},
		}}
		if area.Max.Y-area.Min.Y < vg.Points(80) {
			area.Min.Y = area.Max.Y - vg.Points(80)
		}
		cb.Draw(area)
	}
	if _, err := canvas.WriteTo(&buf); err != nil {
		return fmt.Errorf("drawing %s: %w", path, err)
	}
	data := buf.Bytes()
	if ext == ".svg" {
		data = svgFontFallback(data)
	}
	return writeFile(path, data, inputs...)
}

// svgFontFallback gives every font-family in an SVG a generic fallback, so
// that a viewer that ignores the embedded font still uses one of the same
// kind (gonum writes the bare family name).
func svgFontFallback(svg []byte) []byte {
	return fontFamily.ReplaceAllFunc(svg, func(m []byte) []byte {
		name := strings.TrimSuffix(strings.TrimPrefix(string(m), "font-family:"), ";")
		name = strings.Trim(name, `"'`)
		generic := "serif"
		if strings.Contains(strings.ToLower(name), "sans") {
			generic = "sans-serif"
		}
		if strings.Contains(strings.ToLower(name), "mono") {
			generic = "monospace"
		}
		return []byte("font-family:'" + name + "'," + generic + ";")
	})
}

var fontFamily = regexp.MustCompile(`font-family:[^;,"]+;`)

// sideLegend is the legend drawn beside the axes on a white panel.
type sideLegend struct {
	plot.Legend
	entries []legendEntry
}

func newSideLegend(es []legendEntry) *sideLegend {
	l := &sideLegend{Legend: plot.NewLegend(), entries: es}
	l.TextStyle.Font.Size = vg.Points(10.5)
	l.Top, l.Left = true, true
	l.Padding = vg.Points(3)
	for _, e := range es {
		l.Add(e.label, e.thumb)
	}
	return l
}

func (l *sideLegend) width() vg.Length {
	if len(l.entries) == 0 {
		return 0
	}
	var w vg.Length
	for _, e := range l.entries {
		w = max(w, l.TextStyle.Width(" "+e.label))
	}
	return l.ThumbnailWidth + w + vg.Points(12)
}

// draw draws the legend with its top-left corner at (x, top) on a white
// panel with a grey border, and returns the panel's bottom.
func (l *sideLegend) draw(dc draw.Canvas, x, top vg.Length) vg.Length {
	if len(l.entries) == 0 {
		return top
	}
	pad := vg.Points(5)
	var enth vg.Length
	for _, e := range l.entries {
		enth = max(enth, l.TextStyle.Rectangle(e.label).Max.Y)
	}
	h := vg.Length(len(l.entries))*(enth+l.Padding) - l.Padding + l.TextStyle.FontExtents().Descent
	r := vg.Rectangle{Min: vg.Point{X: x - pad, Y: top - h - 2*pad}, Max: vg.Point{X: x + l.width() - pad, Y: top}}
	dc.SetColor(color.White)
	dc.Fill(r.Path())
	dc.SetLineStyle(draw.LineStyle{Color: color.Gray{150}, Width: vg.Points(0.8)})
	dc.Stroke(r.Path())
	l.Legend.Draw(draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{
		Min: vg.Point{X: x, Y: r.Min.Y + pad},
		Max: vg.Point{X: r.Max.X, Y: top - pad},
	}})
	return r.Min.Y
}

func reversed(p plotter.XYs) plotter.XYs {
	out := make(plotter.XYs, len(p))
	for i := range p {
		out[i] = p[len(p)-1-i]
	}
	return out
}

// addTarget draws a target: a black cross at a (frequency, level) point, or
// a dotted vertical line at a frequency; it returns the legend entry.
func addTarget(p *plot.Plot, t target) (legendEntry, error) {
	if math.IsNaN(t.DB) {
		l, err := plotter.NewLine(plotter.XYs{{X: t.Hz, Y: p.Y.Min}, {X: t.Hz, Y: p.Y.Max}})
		if err != nil {
			return legendEntry{}, err
		}
		l.Color = color.Gray{40}
		l.Width = vg.Points(1.4)
		l.Dashes = []vg.Length{vg.Points(2), vg.Points(3)}
		p.Add(l)
		return legendEntry{t.Label, l}, nil
	}
	s, err := plotter.NewScatter(plotter.XYs{{X: t.Hz, Y: t.DB}})
	if err != nil {
		return legendEntry{}, err
	}
	s.GlyphStyle = draw.GlyphStyle{Color: color.Black, Radius: vg.Points(6), Shape: draw.CrossGlyph{}}
	p.Add(s)
	return legendEntry{t.Label, s}, nil
}

// designCurves computes the design's curves at the knob settings, each
// labelled by the knobs that vary and with its scoop marked.
func designCurves(d *networks.Design, ss []networks.Setting, withPhase bool) []curve {
	m := networks.NewMeter(d.Band)
	freqs := networks.LogGrid(d.Band.From, d.Band.To, 120)
	varied := d.Varied(ss)
	colour, styles := familyKnobs(d, ss, varied)
	var cs []curve
	for i, s := range ss {
		k, err := d.Compile(s)
		if err != nil {
			continue // a valid design always compiles; nothing to draw otherwise
		}
		c := curve{Label: settingLabel(s, varied), Hz: freqs, DB: make([]float64, len(freqs)), Family: true, Order: float64(i)}
		if colour != "" {
			c.Order, c.OrderKnob = s[colour], colour
		}
		stride := 1
		var styleLabel []string
		for _, st := range styles {
			c.Style += stride * slices.Index(st.positions, s[st.name])
			stride *= len(st.positions)
			styleLabel = append(styleLabel, st.name+" "+posLabel(s[st.name]))
		}
		c.StyleLabel = strings.Join(styleLabel, ", ")
		if withPhase {
			c.Deg = make([]float64, len(freqs))
		}
		for i, f := range freqs {
			c.DB[i] = k.GainDB(f)
			if withPhase {
				c.Deg[i] = phaseDeg(k.Transfer(f))
			}
		}
		if withPhase {
			unwrap(c.Deg)
		}
		if s, ok := m.Scoop(k); ok {
			c.Marks = []point{{s.Hz, k.GainDB(s.Hz)}}
		}
		cs = append(cs, c)
	}
	return cs
}

// knobPositions is a knob of a family of settings with its positions.
type knobPositions struct {
	name      string
	positions []float64
}

// familyKnobs chooses how a family of settings is drawn: coloured by the
// knob with the most positions (on a tie the swept knob, else the first),
// styled (dash and marker) by the other knobs that take more than one
// position. colour is "" when no knob moves.
func familyKnobs(d *networks.Design, ss []networks.Setting, varied []string) (colour string, styles []knobPositions) {
	var ks []knobPositions
	for _, n := range varied {
		k := knobPositions{name: n}
		for _, s := range ss {
			if !slices.Contains(k.positions, s[n]) {
				k.positions = append(k.positions, s[n])
			}
		}
		if len(k.positions) > 1 {
			slices.Sort(k.positions)
			ks = append(ks, k)
		}
	}
	best := -1
	for i, k := range ks {
		if best < 0 || len(k.positions) > len(ks[best].positions) ||
			len(k.positions) == len(ks[best].positions) && k.name == d.SweptKnob() {
			best = i
		}
	}
	if best < 0 {
		return "", nil
	}
	colour = ks[best].name
	return colour, slices.Delete(ks, best, best+1)
}

// atSwept returns the design's settings with its swept knob (the blend
// knob of a blend design) at each of ps.
func atSwept(d *networks.Design, ps ...float64) []networks.Setting {
	var lists []networks.KnobList
	if k := d.SweptKnob(); k != "" {
		lists = []networks.KnobList{{Name: k, Positions: ps}}
	}
	ss, _ := d.Settings(lists)
	return ss
}

// unwrap removes the 360° jumps from a phase curve.
func unwrap(deg []float64) {
	off := 0.0
	for i := 1; i < len(deg); i++ {
		d := deg[i] + off - deg[i-1]
		switch {
		case d > 180:
			off -= 360
		case d < -180:
			off += 360
		}
		deg[i] += off
	}
}
