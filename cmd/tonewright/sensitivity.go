package main

import (
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newSensitivityCmd) }

func newSensitivityCmd(a *app) *cobra.Command {
	var blend float64
	kc := knobChoice{flag: "blend"}
	var asJSON bool
	c := &cobra.Command{
		Use:   "sensitivity DESIGN.yaml",
		Short: "Rank the parts by how far each moves the scoop, its depth and balance, the corner and the gain",
		Long: `sensitivity changes every part in turn by a small step up and down and
reports how far each metric moves per percent change of the part (central
differences with a step of 0.1 % in the logarithm of the value):

  scoop frequency and corner: percent per percent (-1 means 1 % more of the
    part lowers the frequency by 1 %);
  depth, balance and gain at 1 kHz: dB per percent.

The scoop and the gain are measured at the chosen blend knob position, the
corner at blend knob 1 (for a blend design; for any other, at the same
setting). Each metric gets its own ranking, the part that moves it
most first, so the part to change for each goal reads from the top.`,
		Example: `  tonewright sensitivity board.yaml
  tonewright sensitivity board.yaml --blend 0.3 --json`,
		Args: exactArgs(1, "DESIGN.yaml"),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := parsePosition("blend", blend); err != nil {
				return err
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
			rep, err := networks.Sensitivities(d, at)
			if err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			if asJSON {
				return printJSON(a.out, rep)
			}
			writeSensitivity(a.out, d, rep)
			return nil
		},
	}
	c.Flags().Float64Var(&blend, "blend", networks.DefaultStudyBlend, "blend knob position for the gain and the scoop, 0 (low-pass end) to 1 (high-pass end); for another design, its swept knob")
	addKnobFlag(c, &kc, false)
	c.Flags().BoolVar(&asJSON, "json", false, "print the sensitivities as JSON")
	return c
}

// writeSensitivity prints one ranking per metric.
func writeSensitivity(w io.Writer, d *networks.Design, rep *networks.SensitivityReport) {
	fmt.Fprintf(w, "%s: %s\n", designTitle(d), describeDesign(d))
	fmt.Fprintf(w, "design: %s (%s)\n", metricsLine(rep.Nominal, d), studyLabel(d, rep.Knobs))
	fmt.Fprintln(w, "Change per 1 % more of the part: frequencies in % per %, levels in dB per %.")
	n := rep.Nominal
	for _, m := range networks.SensitivityMetrics {
		title := m.Title + " (" + studyLabel(d, rep.Knobs) + ")"
		if m.Key == "corner_pct_per_pct" {
			title = m.Title + " (" + cornerWhere(d) + ")"
		}
		fmt.Fprintf(w, "\n%s, %s:\n", title, m.Unit)
		ranked := rep.Ranked(m)
		if len(ranked) == 0 {
			switch {
			case m.Key == "corner_pct_per_pct" && n.CornerHz == nil:
				fmt.Fprintf(w, "  no corner below %s\n", hz(10*d.Band.To))
			case n.Scoop == nil:
				fmt.Fprintln(w, "  no scoop at this knob setting")
			default:
				fmt.Fprintln(w, "  the metric vanishes with a small change of every part")
			}
			continue
		}
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		for i, p := range ranked {
			v, _ := m.Get(&p)
			unit := map[string]string{"resistor": "Ω", "capacitor": "F", "pot": "Ω", "inductor": "H"}[p.Kind]
			fmt.Fprintf(tw, "  %d\t%s\t%s\t%s\t%s\n", i+1, p.Name, withUnit(p.Value, 3, unit), signed(v), p.Role)
		}
		tw.Flush()
	}
}

// signed prints a sensitivity with three decimals and a sign; below the
// last digit it prints 0.
func signed(v float64) string {
	if math.Abs(v) < 0.0005 {
		return " 0.000"
	}
	return fmt.Sprintf("%+.3f", v)
}
