package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newAnalyzeCmd) }

func newAnalyzeCmd(a *app) *cobra.Command {
	var csvPath, zPlot string
	var asJSON, impedance bool
	var points int
	kc := knobChoice{flag: "positions"}
	c := &cobra.Command{
		Use:   "analyze DESIGN.yaml",
		Short: "Measure a design: gain, scoop, peak, corners and impedances at several knob settings",
		Long: `analyze solves the design exactly at each knob setting and prints, per
setting, the gain at 1 kHz, the scoop (frequency, depth, balance), the peak,
and the output corner and low corner; then the input and output impedances
at 1 kHz with the knobs as designed (a knob without a position at its
centre), and the section's thermal noise at each setting: 4kT·Re Z(f) at
the output (290 K) integrated over the band, unweighted and A-weighted
(IEC 61672-1), at the output and referred back through the section's loss
at 1 kHz. --impedance adds |Z_in| and |Z_out| over the band at each
setting (--impedance-plot draws them). With no --knob the design's swept knob (the blend knob, or the
first pot without a position) turns through --positions. The README
defines every figure.`,
		Example: `  tonewright analyze board.yaml
  tonewright analyze board.yaml --positions 0,0.5,1 --json
  tonewright analyze stack.yaml --knob treble=0,0.5,1 --knob bass=0.5
  tonewright analyze board.yaml --csv curves.csv
  tonewright analyze board.yaml --csv - --points 20 | head
  tonewright analyze cut.yaml --impedance --impedance-plot z.png`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if points < 1 || points > 100000 {
				return usageErrorf("--points %d: use a whole number from 1 to 100000", points)
			}
			if err := checkCSVFlags(cmd, csvPath, asJSON); err != nil {
				return err
			}
			if zPlot != "" {
				if err := checkPlotFlag("impedance-plot", zPlot, args[0]); err != nil {
					return err
				}
				impedance = true
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			ss, err := kc.settings(cmd, d)
			if err != nil {
				return err
			}
			an, err := networks.AnalyzeSettings(d, ss)
			if err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			if impedance {
				for _, s := range ss {
					z, err := d.ImpedanceCurveAt(s, impedanceGrid(d.Band))
					if err != nil {
						return badInput(fmt.Errorf("%s: %w", args[0], err))
					}
					an.Impedance = append(an.Impedance, z)
				}
				if zPlot != "" {
					if err := impedancePlot(d, an).render(zPlot, args[0]); err != nil {
						return err
					}
				}
			}
			if csvPath != "" {
				data, err := curvesCSV(d, ss, points)
				if err != nil {
					return badInput(fmt.Errorf("%s: %w", args[0], err))
				}
				if csvPath == stdoutName {
					_, err := a.out.Write(data)
					return err
				}
				if err := writeFile(csvPath, data, args[0]); err != nil {
					return err
				}
			}
			if asJSON {
				return printJSON(a.out, an)
			}
			writeAnalysis(a.out, d, an)
			if impedance {
				writeImpedance(a.out, d, an)
			}
			if zPlot != "" {
				fmt.Fprintf(a.out, "\nwrote %s\n", zPlot)
			}
			if csvPath != "" {
				fmt.Fprintf(a.out, "\nwrote %s\n", csvPath)
			}
			return nil
		},
	}
	c.Flags().StringVar(&kc.positions, "positions", "0,0.25,0.5,0.75,1", "positions of the swept knob (the blend knob: 0 low-pass end, 1 high-pass end)")
	addKnobFlag(c, &kc, true)
	c.Flags().BoolVar(&asJSON, "json", false, "print the analysis as JSON")
	c.Flags().StringVar(&csvPath, "csv", "", "write the curves (frequency, then magnitude dB and phase ° per setting) to `FILE` (- for standard output, instead of the table)")
	c.Flags().IntVar(&points, "points", 100, "points per decade in the --csv output (needs --csv)")
	c.Flags().BoolVar(&impedance, "impedance", false, "add the input and output impedances over the band at each setting (JSON: impedance)")
	c.Flags().StringVar(&zPlot, "impedance-plot", "", "draw |Z_in| and |Z_out| against frequency at each setting to `FILE` (.png or .svg); implies --impedance")
	return c
}

// exactArgs is cobra.ExactArgs with a message that names the argument.
func exactArgs(n int, what string) cobra.PositionalArgs {
	return func(cmd *cobra.Command, args []string) error {
		if len(args) != n {
			return usageErrorf("%s takes %s (got %d arguments); see %s --help", cmd.CommandPath(), what, len(args), cmd.CommandPath())
		}
		return nil
	}
}

// yamlFiles completes the design-file argument with YAML files.
func yamlFiles(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	if len(args) > 0 {
		return nil, cobra.ShellCompDirectiveNoFileComp
	}
	return []string{"yaml", "yml"}, cobra.ShellCompDirectiveFilterFileExt
}

func printJSON(w io.Writer, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return err
	}
	_, err = fmt.Fprintf(w, "%s\n", b)
	return err
}

// describeDesign is the one-line summary of a design's surroundings used in
// table headings and plot titles.
func describeDesign(d *networks.Design) string {
	src := "ideal source"
	if d.Source.Impedance > 0 {
		src = "source " + ohm(d.Source.Impedance)
	}
	if d.Source.SeriesC > 0 {
		src += " via " + withUnit(d.Source.SeriesC, 3, "F")
	}
	load := "open load"
	if !math.IsInf(d.Load.R, 1) {
		load = "load " + ohm(d.Load.R)
	}
	if d.Load.C > 0 {
		load += " with " + withUnit(d.Load.C, 3, "F")
	}
	parts := []string{src, load}
	if d.Level != nil {
		parts = append(parts, fmt.Sprintf("level %s %s at %s", ohm(d.Level.Pot.Value), d.Level.Pot.Taper, posLabel(d.Level.Position)))
	}
	return strings.Join(parts, ", ")
}

func designTitle(d *networks.Design) string {
	if d.Name != "" {
		return d.Name
	}
	return "design"
}

// writeAnalysis prints the analysis table.
func writeAnalysis(w io.Writer, d *networks.Design, an *networks.Analysis) {
	fmt.Fprintf(w, "%s: %s, band %s–%s\n\n", designTitle(d), describeDesign(d), hz(d.Band.From), hz(d.Band.To))
	ss := make([]networks.Setting, len(an.Positions))
	for i, p := range an.Positions {
		ss[i] = p.Knobs
	}
	varied := d.Varied(ss)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	head := append(append([]string(nil), varied...), "gain at 1 kHz", "scoop at", "depth", "notch", "balance", "peak at", "rise", "corner", "low corner")
	fmt.Fprintln(tw, strings.Join(head, "\t")+"\t")
	opt := func(v *float64) string {
		if v == nil {
			return "—"
		}
		return hz(*v)
	}
	for _, p := range an.Positions {
		var row []string
		for _, k := range varied {
			row = append(row, posLabel(p.Knobs[k]))
		}
		row = append(row, db(p.Gain1kDB))
		if p.Scoop == nil {
			row = append(row, "no scoop", "", "", "")
		} else {
			row = append(row, hz(p.Scoop.Hz), db(p.Scoop.DepthDB), db(p.Scoop.NotchDB), db(p.Scoop.BalanceDB))
		}
		if p.Peak == nil {
			row = append(row, "no peak", "")
		} else {
			row = append(row, hz(p.Peak.Hz), db(p.Peak.RiseDB))
		}
		row = append(row, opt(p.CornerHz), opt(p.LowCornerHz))
		fmt.Fprintln(tw, strings.Join(row, "\t")+"\t")
	}
	tw.Flush()
	fmt.Fprintln(w, "\ndepth: the scoop's level minus the mean of its two shoulders (negative: a dip); notch: minus the lower shoulder;")
	fmt.Fprintln(w, "balance: the upper shoulder minus the lower (positive: brighter, negative: darker);")
	fmt.Fprintln(w, "rise: the peak's level above the higher of the lowest levels on either side (the JSON adds its height above their mean).")
	fmt.Fprintln(w)
	at := "knobs as designed"
	if an.Blend {
		at = "blend " + posLabel(an.ImpedanceBlend)
		corner := "none below " + hz(10*d.Band.To)
		if an.CornerHz != nil {
			corner = hz(*an.CornerHz)
		}
		fmt.Fprintf(w, "output corner (knob 1, -3 dB):       %s\n", corner)
	} else if l := an.ImpedanceKnobs.Label(d.KnobNames()); l != "" {
		at = l
	}
	fmt.Fprintf(w, "input impedance (1 kHz, %s):  %s\n", at, ohm(an.InputImpedanceOhm))
	fmt.Fprintf(w, "output impedance (1 kHz, %s): %s\n", at, ohm(an.OutputImpedanceOhm))
	writeNoise(w, d, an, varied)
}

// curvesCSV tabulates magnitude and phase at each setting over the band.
func curvesCSV(d *networks.Design, ss []networks.Setting, perDecade int) ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("hz")
	varied := d.Varied(ss)
	for _, s := range ss {
		l := csvSetting(s, varied)
		fmt.Fprintf(&b, ",db_at_%s,deg_at_%s", l, l)
	}
	b.WriteString("\n")
	es := make([]networks.Evaluator, len(ss))
	for i, s := range ss {
		e, err := d.Compile(s)
		if err != nil {
			return nil, err
		}
		es[i] = e
	}
	buf := b.Bytes()
	prev := make([]float64, len(es)) // each column's last phase, for unwrapping
	for i, f := range networks.LogGrid(d.Band.From, d.Band.To, perDecade) {
		buf = strconv.AppendFloat(buf, f, 'g', 6, 64)
		for k, e := range es {
			ph := cmplx.Phase(e.Transfer(f)) * 180 / math.Pi
			if i > 0 { // unwrapped as the plots draw it: no 360° jumps
				ph -= 360 * math.Round((ph-prev[k])/360)
			}
			prev[k] = ph
			buf = append(buf, ',')
			buf = strconv.AppendFloat(buf, e.GainDB(f), 'f', 4, 64)
			buf = append(buf, ',')
			buf = strconv.AppendFloat(buf, ph, 'f', 3, 64)
		}
		buf = append(buf, '\n')
	}
	return buf, nil
}

// stdoutName is the file name that means standard output, as for most
// tools.
const stdoutName = "-"

// checkCSVFlags refuses --points without --csv (it would do nothing) and
// --csv - with --json (both would go to standard output).
func checkCSVFlags(cmd *cobra.Command, csvPath string, asJSON bool) error {
	if cmd.Flags().Changed("points") && csvPath == "" {
		return usageErrorf("--points sets the density of the --csv output: give --csv FILE (or --csv - for standard output) too")
	}
	if csvPath == stdoutName && asJSON {
		return usageErrorf("--csv - and --json both write to standard output: give --csv a file name, or leave out --json")
	}
	return nil
}
