package main

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/spf13/cobra"
)

func init() { register(newPlotCmd) }

func newPlotCmd(a *app) *cobra.Command {
	var out string
	var phase bool
	kc := knobChoice{flag: "positions"}
	c := &cobra.Command{
		Use:   "plot DESIGN.yaml -o FILE.png|FILE.svg",
		Short: "Draw the design's Bode plot at several knob settings",
		Long: `plot draws the magnitude (dB) against log frequency over the design's band,
one labelled curve per knob setting (by default the swept knob at
--positions) with its scoop marked by a ring, and with --phase a phase
panel below. The file type follows the extension: .png or .svg.`,
		Example: `  tonewright plot board.yaml -o board.png
  tonewright plot board.yaml -o board.svg --positions 0,0.5,1 --phase
  tonewright plot stack.yaml -o stack.png --knob treble=0,1 --knob bass=0,0.5,1`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if out == "" {
				return usageErrorf("plot needs an output file: -o FILE.png or -o FILE.svg")
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			ss, err := kc.settings(cmd, d)
			if err != nil {
				return err
			}
			b := &bode{
				Title:   designTitle(d),
				Caption: describeDesign(d),
				Range:   d.Band,
				Curves:  designCurves(d, ss, phase),
				Phase:   phase,
			}
			if err := b.render(out, args[0]); err != nil {
				return err
			}
			fmt.Fprintf(a.out, "wrote %s\n", out)
			return nil
		},
	}
	c.Flags().StringVarP(&out, "output", "o", "", "the plot `FILE` (.png or .svg)")
	c.Flags().StringVar(&kc.positions, "positions", "0,0.25,0.5,0.75,1", "positions of the swept knob (the blend knob: 0 low-pass end, 1 high-pass end)")
	addKnobFlag(c, &kc, true)
	c.Flags().BoolVar(&phase, "phase", false, "add a phase panel")
	return c
}

func abs(h complex128) float64 { return cmplx.Abs(h) }

func phaseDeg(h complex128) float64 { return cmplx.Phase(h) * 180 / math.Pi }
