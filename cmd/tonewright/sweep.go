package main

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newSweepCmd) }

func newSweepCmd(a *app) *cobra.Command {
	var sources, loads, loadCs, plotPath string
	var blend float64
	kc := knobChoice{flag: "blend"}
	var asJSON bool
	c := &cobra.Command{
		Use:   "sweep DESIGN.yaml --source LIST [--load LIST]",
		Short: "Measure the design with other source impedances and loads",
		Long: `sweep measures the design once for every source impedance and every load
resistance given (every combination: sources outer, loads inner) and prints
the gain at 1 kHz and the scoop at the chosen blend knob position, the
output corner (blend designs: at knob 1), and how far each lies from the design's own values.
A source value replaces source.impedance (the coupling capacitor stays); a
load value replaces load.r; a --load-c value replaces load.c, the
capacitance of the cable and the next stage's input (the classic way a
high-impedance output gets dull). Give any of --source, --load and
--load-c; one left out stays as the design has it.

Shifts: frequencies in percent, 100·(f/f_design - 1); levels in dB,
value - value_design.`,
		Example: `  tonewright sweep board.yaml --source 100,1k,4.7k,22k
  tonewright sweep board.yaml --source 1k,10k --load 100k,1M,open --blend 0.3
  tonewright sweep board.yaml --load 250k,1M --plot loads.png --json
  tonewright sweep cut.yaml --load-c 0,470p,1n,2.2n --knob cut=0`,
		Args: exactArgs(1, "DESIGN.yaml"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var srcs, lds []float64
			var err error
			haveSrc, haveLoad, haveC := cmd.Flags().Changed("source"), cmd.Flags().Changed("load"), cmd.Flags().Changed("load-c")
			if !haveSrc && !haveLoad && !haveC {
				return usageErrorf("sweep needs --source, --load, --load-c or some of them: comma-separated values such as --source 100,1k,4.7k,22k")
			}
			var caps []float64
			if haveC {
				if caps, err = parseCapacitances("load-c", loadCs); err != nil {
					return err
				}
			}
			if haveSrc {
				if srcs, err = parseImpedances("source", sources, false); err != nil {
					return err
				}
			}
			if haveLoad {
				if lds, err = parseImpedances("load", loads, true); err != nil {
					return err
				}
			}
			if err := parsePosition("blend", blend); err != nil {
				return err
			}
			if plotPath != "" {
				if err := checkPlotFlag("plot", plotPath, args[0]); err != nil {
					return err
				}
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			kc.positions = posLabel(blend)
			at, err := kc.single(cmd, d)
			if err != nil {
				return err
			}
			res, err := networks.SweepLoads(d, srcs, lds, caps, at)
			if err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			return a.deliver(studyOutput{
				plotPath: plotPath, input: args[0], asJSON: asJSON, value: res,
				plot: func() *bode { return sweepPlot(d, res, haveSrc, haveLoad, haveC) },
				text: func(w io.Writer) { writeSweep(w, d, res) },
			})
		},
	}
	c.Flags().StringVar(&sources, "source", "", "source impedances to try, a comma-separated `LIST` (100,1k,4.7k,22k; 0 is an ideal source)")
	c.Flags().StringVar(&loads, "load", "", "load resistances to try, a comma-separated `LIST` (100k,1M; open for none)")
	c.Flags().StringVar(&loadCs, "load-c", "", "load capacitances to try (cable and next stage), a comma-separated `LIST` (0,470p,1n,2.2n)")
	c.Flags().Float64Var(&blend, "blend", networks.DefaultStudyBlend, "blend knob position for the gain and the scoop, 0 (low-pass end) to 1 (high-pass end); for another design, its swept knob")
	addKnobFlag(c, &kc, false)
	c.Flags().StringVar(&plotPath, "plot", "", "draw the curves at the blend position, one per value, to `FILE` (.png or .svg)")
	c.Flags().BoolVar(&asJSON, "json", false, "print the sweep as JSON")
	return c
}

// parseImpedances reads a comma-separated list of resistances for a flag:
// part values as eseries.Parse reads them, zero or more for a source,
// positive or the word open for a load.
func parseImpedances(flag, s string, load bool) ([]float64, error) {
	var out []float64
	what, forms := "source impedance", "values such as 100,1k,4.7k,22k (0 is an ideal source)"
	if load {
		what, forms = "load resistance", "values above 0 such as 100k,1M, or open"
	}
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		if load && strings.EqualFold(f, "open") {
			out = append(out, math.Inf(1))
			continue
		}
		v, err := flagValue(flag, f, "Ω")
		if err != nil {
			return nil, err
		}
		if v < 0 || (load && v == 0) {
			return nil, usageErrorf("--%s: %q is not a usable %s: give %s", flag, f, what, forms)
		}
		if v > 0 {
			if err := checkFlagRange(flag, f, v, "Ω"); err != nil {
				return nil, err
			}
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		return nil, usageErrorf("--%s: the list is empty: give %s, separated by commas", flag, forms)
	}
	return out, nil
}

// loadLabel names a load resistance, open included.
func loadLabel(r float64) string {
	if math.IsInf(r, 1) {
		return "open"
	}
	return ohm(r)
}

// shiftDB prints a level shift in dB with two decimals and a sign.
func shiftDB(v *float64) string {
	if v == nil {
		return "—"
	}
	x := *v
	if math.Abs(x) < 0.005 {
		x = 0
	}
	return fmt.Sprintf("%+.2f", x)
}

// shiftPct prints a frequency shift in percent with a sign.
func shiftPct(v *float64) string {
	if v == nil {
		return "—"
	}
	x := *v
	if math.Abs(x) < 0.05 {
		x = 0
	}
	return fmt.Sprintf("%+.1f", x)
}

// writeSweep prints the sweep table.
func writeSweep(w io.Writer, d *networks.Design, res *networks.SweepResult) {
	nom := networks.MetricsOf(res.Nominal)
	fmt.Fprintf(w, "%s: %s; %s\n", designTitle(d), describeDesign(d), studyLabel(d, res.Knobs))
	fmt.Fprintf(w, "design's own: %s\n\n", metricsLine(nom, d))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	// The load capacitance has a column when the sweep changes it.
	withC := false
	for _, r := range res.Rows {
		withC = withC || r.LoadC != d.Load.C
	}
	cols := "source\tload\t"
	if withC {
		cols += "load C\t"
	}
	fmt.Fprintln(tw, cols+"gain 1 kHz\tΔ dB\tscoop at\tΔ %\tdepth\tΔ dB\tbalance\tΔ dB\tcorner\tΔ %\t")
	for _, r := range res.Rows {
		m := networks.MetricsOf(r.Metrics)
		fmt.Fprintf(tw, "%s\t%s\t", ohm(r.SourceOhm), loadLabel(r.LoadOhm))
		if withC {
			fmt.Fprintf(tw, "%s\t", capLabel(r.LoadC))
		}
		fmt.Fprintf(tw, "%s\t%s\t", db(m.Gain1kDB), shiftDB(&r.Shift.Gain1kDB))
		if m.Scoop != nil {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t", hz(m.Scoop.Hz), shiftPct(r.Shift.ScoopHzPct), db(m.Scoop.DepthDB), shiftDB(r.Shift.DepthDB), db(m.Scoop.BalanceDB), shiftDB(r.Shift.BalanceDB))
		} else {
			fmt.Fprint(tw, "no scoop\t—\t\t—\t\t—\t")
		}
		if m.CornerHz != nil {
			fmt.Fprintf(tw, "%s\t%s\t\n", hz(*m.CornerHz), shiftPct(r.Shift.CornerPct))
		} else {
			fmt.Fprint(tw, "none\t—\t\n")
		}
	}
	tw.Flush()
	fmt.Fprintln(w, "\nΔ: shift from the design's own values, levels in dB, frequencies in % (100·(f/f_design - 1));")
	fmt.Fprintf(w, "—: the design or the row has no scoop (or no corner). Corner: %s, -3 dB.\n", cornerWhere(d))
}

// metricsLine summarises study metrics on one line.
func metricsLine(m networks.StudyMetrics, d *networks.Design) string {
	s := "gain at 1 kHz " + db(m.Gain1kDB)
	if m.Scoop != nil {
		s += fmt.Sprintf(", scoop at %s (depth %s, balance %s)", hz(m.Scoop.Hz), db(m.Scoop.DepthDB), db(m.Scoop.BalanceDB))
	} else {
		s += ", no scoop"
	}
	if m.CornerHz != nil {
		s += ", corner " + hz(*m.CornerHz)
	} else {
		s += ", no corner below " + hz(10*d.Band.To)
	}
	return s
}

// sweepPlot overlays the curves at the sweep's blend position, one per row,
// with the design's own curve dashed.
func sweepPlot(d *networks.Design, res *networks.SweepResult, bySource, byLoad, byC bool) *bode {
	label := func(src, load, c float64) string {
		var parts []string
		if bySource {
			parts = append(parts, "source "+ohm(src))
		}
		if byLoad {
			parts = append(parts, "load "+loadLabel(load))
		}
		if byC {
			parts = append(parts, "load C "+capLabel(c))
		}
		return strings.Join(parts, ", ")
	}
	var whats []string
	if bySource {
		whats = append(whats, "source impedance")
	}
	if byLoad {
		whats = append(whats, "load resistance")
	}
	if byC {
		whats = append(whats, "load capacitance")
	}
	what := strings.Join(whats, ", ")
	b := &bode{
		Title:   designTitle(d) + ": " + studyLabel(d, res.Knobs),
		Caption: "sweep of the " + what + "; dashed black: the design as it is",
		Range:   d.Band,
	}
	// The curves are a family ordered by the swept value: coloured by the
	// swept dimension with the most values (the earlier on a tie: source,
	// load, load capacitance), styled by the others.
	type dim struct {
		on     bool
		title  string
		vals   []float64
		of     func(r networks.SweepRow) float64
		name   func(v float64) string
		prefix string
	}
	dims := []*dim{
		{on: bySource, title: "source impedance", of: func(r networks.SweepRow) float64 { return r.SourceOhm }, name: ohm, prefix: "source "},
		{on: byLoad, title: "load resistance", of: func(r networks.SweepRow) float64 { return r.LoadOhm }, name: loadLabel, prefix: "load "},
		{on: byC, title: "load capacitance", of: func(r networks.SweepRow) float64 { return r.LoadC }, name: capLabel, prefix: "load C "},
	}
	var colour *dim
	for _, dm := range dims {
		for _, r := range res.Rows {
			if v := dm.of(r); !slices.Contains(dm.vals, v) {
				dm.vals = append(dm.vals, v)
			}
		}
		if dm.on && (colour == nil || len(dm.vals) > len(colour.vals)) {
			colour = dm
		}
	}
	var names []string
	for _, v := range colour.vals {
		names = append(names, colour.name(v))
	}
	b.Scale = rankScale(colour.title, names)
	for _, r := range res.Rows {
		v := networks.Variant(d, r.SourceOhm, r.LoadOhm)
		v.Load.C = r.LoadC
		c := designCurves(v, []networks.Setting{res.Knobs}, false)[0]
		c.Label = label(r.SourceOhm, r.LoadOhm, r.LoadC)
		c.Order = float64(slices.Index(colour.vals, colour.of(r)))
		style, stride := 0, 1
		var styleLabel []string
		for _, dm := range dims {
			if !dm.on || dm == colour {
				continue
			}
			style += stride * slices.Index(dm.vals, dm.of(r))
			stride *= len(dm.vals)
			styleLabel = append(styleLabel, dm.prefix+dm.name(dm.of(r)))
		}
		if len(styleLabel) > 0 {
			c.Style, c.StyleLabel = style, strings.Join(styleLabel, ", ")
		}
		b.Curves = append(b.Curves, c)
	}
	// The design's own curve, dashed black on top. A row with the design's
	// own source and load is the same curve: its legend entry says so,
	// and its ring stands for both.
	own := designCurves(d, []networks.Setting{res.Knobs}, false)[0]
	own.Label = "design: " + label(d.Source.Impedance, d.Load.R, d.Load.C)
	own.Dash, own.Color, own.Family = true, color.Black, false
	for i, r := range res.Rows {
		if r.SourceOhm == d.Source.Impedance && r.LoadOhm == d.Load.R && r.LoadC == d.Load.C {
			b.Curves[i].Label += " (= the design)"
			own.Marks = nil
		}
	}
	b.Curves = append(b.Curves, own)
	return b
}

// parseCapacitances reads a comma-separated list of capacitances for a
// flag, zero or more.
func parseCapacitances(flag, s string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		v, err := flagValue(flag, f, "F")
		if err != nil {
			return nil, err
		}
		if v < 0 || v > networks.MaxFarads {
			return nil, usageErrorf("--%s: %q is not a usable capacitance: give values from 0 such as 0,470p,1n,2.2n", flag, f)
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		return nil, usageErrorf("--%s: the list is empty: give capacitances such as 0,470p,1n,2.2n, separated by commas", flag)
	}
	return out, nil
}

// capLabel names a load capacitance, none included.
func capLabel(c float64) string {
	if c == 0 {
		return "none"
	}
	return withUnit(c, 3, "F")
}
