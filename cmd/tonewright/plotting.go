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

	"tonewright/networks"
)

// curve is one labelled response on a Bode plot.
type curve struct {
	Label string
	Hz    []float64
	DB    []float64
	Deg   []float64 // phase; may be nil
	Marks []point   // drawn as open circles in the curve's colour
	Dash  bool
	Color color.Color // nil: the next colour of the palette
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

// bode describes a magnitude plot with an optional phase panel below it.
type bode struct {
	Title   string
	Caption string
	Range   networks.Band
	Curves  []curve
	Bands   []band
	Targets []target
	Phase   bool
}

// curveColors runs from warm (the low-pass end of the blend knob) to cool
// (the high-pass end); chosen for this tool, readable on white.
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

func colorFor(i, n int) color.RGBA {
	if n <= len(curveColors) && n > 1 && n <= 5 {
		// Spread a few curves across the warm-to-cool run.
		return curveColors[int(math.Round(float64(i)*4/float64(n-1)))]
	}
	return curveColors[i%len(curveColors)]
}

// freqTicks labels a log frequency axis at 1-2-5 steps: 20, 50, 100, … 20k.
type freqTicks struct{}

func (freqTicks) Ticks(min, max float64) []plot.Tick {
	var ts []plot.Tick
	for d := math.Floor(math.Log10(min)); d <= math.Ceil(math.Log10(max)); d++ {
		base := math.Pow(10, d)
		for m := 1; m < 10; m++ {
			v := float64(m) * base
			if v < min*(1-1e-9) || v > max*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 || m == 2 || m == 5 {
				t.Label = strings.TrimSuffix(withUnit(v, 3, ""), " ")
				t.Label = strings.ReplaceAll(t.Label, " ", "")
			}
			ts = append(ts, t)
		}
	}
	return ts
}

func styleAxes(p *plot.Plot) {
	p.Title.TextStyle.Font.Size = vg.Points(13)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font.Size = vg.Points(12)
		ax.Tick.Label.Font.Size = vg.Points(10.5)
	}
	p.Legend.TextStyle.Font.Size = vg.Points(10.5)
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

// render draws the plot and writes it to path as PNG or SVG, chosen by the
// extension.
func (b *bode) render(path string, inputs ...string) error {
	if err := checkPlotFile(path, inputs...); err != nil {
		return err
	}
	ext := strings.ToLower(filepath.Ext(path))
	mag := plot.New()
	title := b.Title
	if b.Caption != "" {
		title += "\n" + b.Caption
	}
	mag.Title.Text = title
	styleAxes(mag)
	freqAxis(mag, b.Range)
	mag.Y.Label.Text = "gain (dB)"
	mag.Y.Tick.Marker = dbTicks{}
	mag.Legend.Top = false
	mag.Legend.Left = true
	mag.Legend.XOffs = vg.Points(8)
	mag.Legend.YOffs = vg.Points(8)
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
			mag.Legend.Add(bd.Label, pg)
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
	palette := 0
	for _, c := range b.Curves {
		if c.Color == nil {
			palette++
		}
	}
	next := 0
	for _, c := range b.Curves {
		var col color.Color = c.Color
		var cycle int
		if col == nil {
			col, cycle = colorFor(next, palette), next/len(curveColors)
			next++
		}
		l, err := plotter.NewLine(xys(c.Hz, c.DB))
		if err != nil {
			return err
		}
		l.Color, l.Width = col, vg.Points(2)
		switch {
		case c.Dash:
			l.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
		case cycle > 0:
			// Past the palette's length the colours come round again,
			// dotted.
			l.Dashes = []vg.Length{vg.Points(2), vg.Points(2.5)}
		}
		mag.Add(l)
		if c.Label != "" {
			mag.Legend.Add(c.Label, l)
		}
		if len(c.Marks) > 0 {
			var pts plotter.XYs
			for _, m := range c.Marks {
				pts = append(pts, plotter.XY{X: m.Hz, Y: m.DB})
			}
			s, err := plotter.NewScatter(pts)
			if err != nil {
				return err
			}
			s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(4.5), Shape: draw.RingGlyph{}}
			mag.Add(s)
		}
		if pha != nil && c.Deg != nil {
			pl, err := plotter.NewLine(xys(c.Hz, c.Deg))
			if err != nil {
				return err
			}
			pl.Color, pl.Width = col, vg.Points(1.6)
			pha.Add(pl)
		}
	}
	for _, t := range b.Targets {
		if err := addTarget(mag, t); err != nil {
			return err
		}
	}
	w, h := vg.Length(9)*vg.Inch, vg.Length(5.6)*vg.Inch
	if pha != nil {
		h = vg.Length(8.4) * vg.Inch
	}
	var buf bytes.Buffer
	var canvas vg.CanvasWriterTo
	switch ext {
	case ".png":
		canvas = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(110), vgimg.UseBackgroundColor(color.White))}
	default:
		canvas = vgsvg.New(w, h)
	}
	dc := draw.New(canvas)
	if pha == nil {
		mag.Draw(dc)
	} else {
		tiles := draw.Tiles{Rows: 2, Cols: 1, PadTop: vg.Points(4), PadBottom: vg.Points(4), PadLeft: vg.Points(4), PadRight: vg.Points(10), PadY: vg.Points(10)}
		cs := plot.Align([][]*plot.Plot{{mag}, {pha}}, tiles, dc)
		mag.Draw(cs[0][0])
		pha.Draw(cs[1][0])
	}
	if _, err := canvas.WriteTo(&buf); err != nil {
		return fmt.Errorf("drawing %s: %w", path, err)
	}
	return writeFile(path, buf.Bytes(), inputs...)
}

func reversed(p plotter.XYs) plotter.XYs {
	out := make(plotter.XYs, len(p))
	for i := range p {
		out[i] = p[len(p)-1-i]
	}
	return out
}

// addTarget draws a target: a black cross at a (frequency, level) point, or
// a dashed vertical line at a frequency.
func addTarget(p *plot.Plot, t target) error {
	if math.IsNaN(t.DB) {
		l, err := plotter.NewLine(plotter.XYs{{X: t.Hz, Y: p.Y.Min}, {X: t.Hz, Y: p.Y.Max}})
		if err != nil {
			return err
		}
		l.Color = color.Gray{40}
		l.Width = vg.Points(1.2)
		l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		p.Add(l)
		if t.Label != "" {
			p.Legend.Add(t.Label, l)
		}
		return nil
	}
	s, err := plotter.NewScatter(plotter.XYs{{X: t.Hz, Y: t.DB}})
	if err != nil {
		return err
	}
	s.GlyphStyle = draw.GlyphStyle{Color: color.Black, Radius: vg.Points(6), Shape: draw.CrossGlyph{}}
	p.Add(s)
	if t.Label != "" {
		p.Legend.Add(t.Label, s)
	}
	return nil
}

// designCurves computes the design's curves at the knob settings, each
// labelled by the knobs that vary and with its scoop marked.
func designCurves(d *networks.Design, ss []networks.Setting, withPhase bool) []curve {
	m := networks.NewMeter(d.Band)
	freqs := networks.LogGrid(d.Band.From, d.Band.To, 120)
	varied := d.Varied(ss)
	var cs []curve
	for _, s := range ss {
		k, err := d.Compile(s)
		if err != nil {
			continue // a valid design always compiles; nothing to draw otherwise
		}
		c := curve{Label: settingLabel(s, varied), Hz: freqs, DB: make([]float64, len(freqs))}
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

// degTicks labels a phase axis every 45°.
type degTicks struct{}

func (degTicks) Ticks(min, max float64) []plot.Tick {
	step := 45.0
	if max-min > 450 {
		step = 90
	}
	var ts []plot.Tick
	for v := math.Ceil(min/step) * step; v <= max; v += step {
		ts = append(ts, plot.Tick{Value: v, Label: fmt.Sprintf("%g", v)})
	}
	return ts
}

// dbTicks labels a level axis at a round step that gives four to ten
// labels.
type dbTicks struct{}

func (dbTicks) Ticks(min, max float64) []plot.Tick {
	step := 1.0
	for _, s := range []float64{1, 2, 5, 10, 20, 50, 100} {
		step = s
		if (max-min)/s <= 10 {
			break
		}
	}
	var ts []plot.Tick
	for v := math.Ceil(min/step) * step; v <= max+1e-9; v += step {
		ts = append(ts, plot.Tick{Value: v, Label: fmt.Sprintf("%g", v)})
	}
	return ts
}
