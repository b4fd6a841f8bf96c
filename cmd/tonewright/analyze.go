package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newAnalyzeCmd) }

func newAnalyzeCmd(a *app) *cobra.Command {
	var positions, csvPath string
	var asJSON bool
	var points int
	c := &cobra.Command{
		Use:   "analyze DESIGN.yaml",
		Short: "Measure a design: gain, scoop, corner and impedances at several knob positions",
		Long: `analyze solves the design exactly at each blend knob position and prints,
per position, the gain at 1 kHz and the scoop (frequency, depth, balance);
then the output corner at knob 1 and the input and output impedances at
1 kHz with the blend at its centre. The README defines every figure.`,
		Example: `  tonewright analyze board.yaml
  tonewright analyze board.yaml --positions 0,0.5,1 --json
  tonewright analyze board.yaml --csv curves.csv
  tonewright analyze board.yaml --csv - --points 20 | head`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			ps, err := parsePositions("positions", positions)
			if err != nil {
				return err
			}
			if points < 1 || points > 100000 {
				return usageErrorf("--points %d: use a whole number from 1 to 100000", points)
			}
			if err := checkCSVFlags(cmd, csvPath, asJSON); err != nil {
				return err
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			an, err := networks.Analyze(d, ps)
			if err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			if csvPath == stdoutName {
				_, err := a.out.Write(curvesCSV(d, ps, points))
				return err
			}
			if csvPath != "" {
				if err := writeFile(csvPath, curvesCSV(d, ps, points), args[0]); err != nil {
					return err
				}
			}
			if asJSON {
				return printJSON(a.out, an)
			}
			writeAnalysis(a.out, d, an)
			if csvPath != "" {
				fmt.Fprintf(a.out, "\ncurves written to %s\n", csvPath)
			}
			return nil
		},
	}
	c.Flags().StringVar(&positions, "positions", "0,0.25,0.5,0.75,1", "blend knob positions, 0 (low-pass end) to 1 (high-pass end)")
	c.Flags().BoolVar(&asJSON, "json", false, "print the analysis as JSON")
	c.Flags().StringVar(&csvPath, "csv", "", "write the curves (frequency, then magnitude dB and phase ° per position) to `FILE` (- for standard output, instead of the table)")
	c.Flags().IntVar(&points, "points", 100, "points per decade in the --csv output (needs --csv)")
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
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "blend\tgain at 1 kHz\tscoop at\tdepth\tbalance\t")
	for _, p := range an.Positions {
		if p.Scoop == nil {
			fmt.Fprintf(tw, "%s\t%s\tno scoop\t\t\t\n", posLabel(p.Blend), db(p.Gain1kDB))
			continue
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t\n", posLabel(p.Blend), db(p.Gain1kDB), hz(p.Scoop.Hz), db(p.Scoop.DepthDB), db(p.Scoop.BalanceDB))
	}
	tw.Flush()
	fmt.Fprintln(w, "\ndepth: the scoop's level minus the mean of its two shoulders (negative: a dip);")
	fmt.Fprintln(w, "balance: the upper shoulder minus the lower (positive: brighter, negative: darker).")
	fmt.Fprintln(w)
	corner := "none below " + hz(10*d.Band.To)
	if an.CornerHz != nil {
		corner = hz(*an.CornerHz)
	}
	fmt.Fprintf(w, "output corner (knob 1, -3 dB):       %s\n", corner)
	fmt.Fprintf(w, "input impedance (1 kHz, blend %s):  %s\n", posLabel(an.ImpedanceBlend), ohm(an.InputImpedanceOhm))
	fmt.Fprintf(w, "output impedance (1 kHz, blend %s): %s\n", posLabel(an.ImpedanceBlend), ohm(an.OutputImpedanceOhm))
}

// curvesCSV tabulates magnitude and phase at each position over the band.
func curvesCSV(d *networks.Design, ps []float64, perDecade int) []byte {
	var b bytes.Buffer
	b.WriteString("hz")
	for _, p := range ps {
		fmt.Fprintf(&b, ",db_at_%s,deg_at_%s", posLabel(p), posLabel(p))
	}
	b.WriteString("\n")
	ks := make([]*networks.Compiled, len(ps))
	for i, p := range ps {
		c := d.Chain(p)
		ks[i] = c.Compile()
	}
	for _, f := range networks.LogGrid(d.Band.From, d.Band.To, perDecade) {
		fmt.Fprintf(&b, "%.6g", f)
		for _, k := range ks {
			h := k.Transfer(f)
			fmt.Fprintf(&b, ",%.4f,%.3f", 20*math.Log10(cmplx.Abs(h)), cmplx.Phase(h)*180/math.Pi)
		}
		b.WriteString("\n")
	}
	return b.Bytes()
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
