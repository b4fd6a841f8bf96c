package main

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newKnobCmd) }

func newKnobCmd(a *app) *cobra.Command {
	var knob, at, plotPath string
	var asJSON bool
	c := &cobra.Command{
		Use:   "knob DESIGN.yaml --knob NAME",
		Short: "How a knob feels over its turn: the gain, scoop and corner from 0 to 1",
		Long: `knob turns one knob from 0 to 1 in 41 equal steps of rotation, the other
knobs at their positions (a knob without one at its centre), and prints at
every step the gain at each --at frequency, the scoop's frequency and the
corner. Then, for each frequency, the range of the gain over the turn and
the share of the whole change (the sum of the gain's changes, step by
step) made in the busiest tenth of the turn: 10 % is an even spread, 100 %
a knob that does everything in one tenth. --plot draws the gain at each
frequency against rotation, and below it the scoop frequency and the
corner.`,
		Example: `  tonewright knob cut.yaml --knob cut
  tonewright knob stack.yaml --knob treble --at 100,1k,5k --plot treble.png
  tonewright knob board.yaml --knob blend --json`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if strings.TrimSpace(knob) == "" {
				return usageErrorf("knob needs the knob to turn: --knob NAME")
			}
			if strings.Contains(knob, "=") {
				return usageErrorf("--knob %q: this command turns the knob through its whole turn: give its name alone, e.g. --knob treble", knob)
			}
			var freqs []float64
			for _, f := range strings.Split(at, ",") {
				if f = strings.TrimSpace(f); f == "" {
					continue
				}
				v, err := flagValue("at", f, "Hz")
				if err != nil {
					return err
				}
				if !(v > 0) || v > 1e9 {
					return usageErrorf("--at: %q is not a usable frequency: give values above 0 such as 100,1k,5k", f)
				}
				freqs = append(freqs, v)
			}
			if len(freqs) == 0 {
				return usageErrorf("--at: the list is empty: give frequencies such as 100,1k,5k")
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
			kt, err := networks.TurnKnob(d, strings.TrimSpace(knob), nil, freqs)
			if err != nil {
				if strings.Contains(err.Error(), "unknown knob") {
					return usageErrorf("--knob: %v", err)
				}
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			return a.deliver(studyOutput{
				plotPath: plotPath, input: args[0], asJSON: asJSON, value: kt,
				panels: func() *panels { return knobPlot(d, kt) },
				text:   func(w io.Writer) { writeKnobTurn(w, d, kt) },
			})
		},
	}
	c.Flags().StringVar(&knob, "knob", "", "the knob to turn, by `NAME` (blend, treble, level, …)")
	c.Flags().StringVar(&at, "at", "100,1k,5k", "frequencies to follow, a comma-separated `LIST`")
	c.Flags().StringVar(&plotPath, "plot", "", "draw the gain and the scoop against rotation to `FILE` (.png or .svg)")
	c.Flags().BoolVar(&asJSON, "json", false, "print the study as JSON")
	return c
}

// writeKnobTurn prints the knob-turn table and its summary.
func writeKnobTurn(w io.Writer, d *networks.Design, kt *networks.KnobTurn) {
	fmt.Fprintf(w, "%s: %s\n", designTitle(d), describeDesign(d))
	others := kt.Knobs.Label(otherKnobs(d, kt.Knob))
	if others != "" {
		others = "; " + others
	}
	fmt.Fprintf(w, "turning %s (%s taper) from 0 to 1 in %d steps%s\n\n", kt.Knob, kt.Taper, len(kt.Steps), others)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	head := []string{kt.Knob}
	for _, f := range kt.Hz {
		head = append(head, "at "+hz(f))
	}
	head = append(head, "scoop at", "corner")
	fmt.Fprintln(tw, strings.Join(head, "\t")+"\t")
	for _, st := range kt.Steps {
		row := []string{fmt.Sprintf("%.3f", st.Position)}
		for _, g := range st.GainDB {
			row = append(row, db(g))
		}
		row = append(row, optHz(st.ScoopHz, "—"), optHz(st.CornerHz, "—"))
		fmt.Fprintln(tw, strings.Join(row, "\t")+"\t")
	}
	tw.Flush()
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "frequency\trange over the turn\tbusiest tenth\tits share of the change\t")
	for _, sp := range kt.Spreads {
		where, share := "—", "—"
		if sp.BusiestShare > 0 {
			where = fmt.Sprintf("%s–%s", posLabel(sp.BusiestFrom), posLabel(sp.BusiestTo))
			share = fmt.Sprintf("%.0f %%", 100*sp.BusiestShare)
		}
		fmt.Fprintf(tw, "%s\t%.1f dB\t%s\t%s\t\n", hz(sp.Hz), sp.RangeDB, where, share)
	}
	tw.Flush()
	fmt.Fprintln(w, "\nAn even spread makes 10 % of the change in every tenth of the turn.")
}

func optHz(v *float64, none string) string {
	if v == nil {
		return none
	}
	return hz(*v)
}

// otherKnobs returns the design's knobs but name.
func otherKnobs(d *networks.Design, name string) []string {
	var out []string
	for _, k := range d.KnobNames() {
		if k != name {
			out = append(out, k)
		}
	}
	return out
}

// knobPlot draws the gain at each frequency against rotation, and the
// scoop frequency against rotation below.
func knobPlot(d *networks.Design, kt *networks.KnobTurn) *panels {
	x := make([]float64, len(kt.Steps))
	scoop := make([]float64, len(kt.Steps))
	corner := make([]float64, len(kt.Steps))
	for i, st := range kt.Steps {
		x[i], scoop[i], corner[i] = st.Position, math.NaN(), math.NaN()
		if st.ScoopHz != nil {
			scoop[i] = *st.ScoopHz
		}
		if st.CornerHz != nil {
			corner[i] = *st.CornerHz
		}
	}
	gain := panel{XLabel: kt.Knob + " (rotation)", YLabel: "gain (dB)", XMin: 0, XMax: 1, DBY: true, TenthsX: true, LegendBottom: true}
	for q, f := range kt.Hz {
		y := make([]float64, len(kt.Steps))
		for i, st := range kt.Steps {
			y[i] = st.GainDB[q]
		}
		gain.Series = append(gain.Series, series{Label: "at " + hz(f), X: x, Y: y})
	}
	// The scoop frequency, and the corner beside it (a knob with no scoop
	// still moves its corner); each line breaks where there is none, and
	// where it leaps (the corner passing from one slope of the curve to
	// another) by more than half as much again in one 1/40 of the turn.
	fr := panel{XLabel: kt.Knob + " (rotation)", YLabel: "frequency (Hz)", LogY: true, FreqY: true, XMin: 0, XMax: 1, TenthsX: true,
		YMin: d.Band.From, YMax: d.Band.To, LegendRight: true}
	for _, s := range []series{{Label: "scoop", X: x, Y: scoop, Jump: 1.5}, {Label: "corner (−3 dB)", X: x, Y: corner, Jump: 1.5}} {
		if len(segments(s.X, s.Y)) > 0 {
			fr.Series = append(fr.Series, s)
		}
	}
	var missing []string
	if len(segments(x, scoop)) == 0 {
		missing = append(missing, "no scoop")
	}
	if len(segments(x, corner)) == 0 {
		missing = append(missing, "no corner")
	}
	if len(missing) > 0 {
		fr.YLabel += ": " + strings.Join(missing, ", ") + " at any rotation"
	}
	return &panels{
		Title:  fmt.Sprintf("%s: turning %s (%s taper)\n%s", designTitle(d), kt.Knob, kt.Taper, describeDesign(d)),
		Panels: []panel{gain, fr},
	}
}
