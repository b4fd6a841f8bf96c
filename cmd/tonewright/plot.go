package main

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/spf13/cobra"
)

func init() { register(newPlotCmd) }

func newPlotCmd(a *app) *cobra.Command {
	var positions, out string
	var phase bool
	c := &cobra.Command{
		Use:   "plot DESIGN.yaml -o FILE.png|FILE.svg",
		Short: "Draw the design's Bode plot at several blend knob positions",
		Long: `plot draws the magnitude (dB) against log frequency over the design's band,
one labelled curve per blend knob position with its scoop marked by a ring,
and with --phase a phase panel below. The file type follows the extension:
.png or .svg.`,
		Example: `  tonewright plot board.yaml -o board.png
  tonewright plot board.yaml -o board.svg --positions 0,0.5,1 --phase`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if out == "" {
				return usageErrorf("plot needs an output file: -o FILE.png or -o FILE.svg")
			}
			ps, err := parsePositions("positions", positions)
			if err != nil {
				return err
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			b := &bode{
				Title:   designTitle(d),
				Caption: describeDesign(d),
				Range:   d.Band,
				Curves:  designCurves(d, ps, phase),
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
	c.Flags().StringVar(&positions, "positions", "0,0.25,0.5,0.75,1", "blend knob positions, 0 (low-pass end) to 1 (high-pass end)")
	c.Flags().BoolVar(&phase, "phase", false, "add a phase panel")
	return c
}

func abs(h complex128) float64 { return cmplx.Abs(h) }

func phaseDeg(h complex128) float64 { return cmplx.Phase(h) * 180 / math.Pi }
