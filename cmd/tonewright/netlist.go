package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newNetlistCmd) }

func newNetlistCmd(a *app) *cobra.Command {
	var blend float64
	var points int
	kc := knobChoice{flag: "blend"}
	c := &cobra.Command{
		Use:   "netlist DESIGN.yaml",
		Short: "Print the design as a SPICE deck for a circuit simulator",
		Long: `netlist prints the design at one knob setting as a SPICE deck: the source
is V1 with AC 1, the output node is "out", every value is a plain exponent
number (SPICE reads the suffix M as milli), pots are written as their two
segments, and an .ac line sweeps the design's band. --blend sets a blend
design's knob (default 0.5); --knob NAME=P sets any knob; knobs not set
sit at their positions (a knob without one at its centre).`,
		Example: `  tonewright netlist board.yaml > board.cir
  tonewright netlist board.yaml --blend 0.25 --points 1000
  tonewright netlist stack.yaml --knob treble=0.7 --knob bass=0.2
  ngspice -b board.cir`,
		Args:              exactArgs(1, "DESIGN.yaml"),
		ValidArgsFunction: yamlFiles,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := parsePosition("blend", blend); err != nil {
				return err
			}
			kc.positions = posLabel(blend)
			if points < 1 || points > 100000 {
				return usageErrorf("--points %d: use a whole number from 1 to 100000", points)
			}
			d, err := loadDesign(args[0])
			if err != nil {
				return err
			}
			s, err := kc.single(cmd, d)
			if err != nil {
				return err
			}
			title := fmt.Sprintf("%s at %s (tonewright netlist; %s)", designTitle(d), s.Label(d.KnobNames()), describeDesign(d))
			title = strings.NewReplacer("Ω", "ohm", "–", "-", "−", "-").Replace(title)
			var b strings.Builder
			if err := d.Network(s).WriteSPICE(&b, title, d.Band, points); err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			_, err = fmt.Fprint(a.out, b.String())
			return err
		},
	}
	c.Flags().Float64Var(&blend, "blend", networks.ImpedanceBlend, "blend knob position, 0 (low-pass end) to 1 (high-pass end)")
	c.Flags().IntVar(&points, "points", 100, "points per decade on the .ac line")
	addKnobFlag(c, &kc, false)
	return c
}
