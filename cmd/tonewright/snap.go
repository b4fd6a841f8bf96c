package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"tonewright/eseries"
	"tonewright/networks"
)

func init() { register(newSnapCmd) }

// snapReport is the JSON of the snap command; other tools read these keys.
type snapReport struct {
	Value         float64  `json:"value"`
	Series        string   `json:"series"`
	Nearest       float64  `json:"nearest"`
	Below         *float64 `json:"below"`
	Above         *float64 `json:"above"`
	ErrorPct      float64  `json:"error_pct"`
	BelowErrorPct *float64 `json:"below_error_pct"`
	AboveErrorPct *float64 `json:"above_error_pct"`
	TolerancePct  float64  `json:"tolerance_pct"`
}

func newSnapCmd(a *app) *cobra.Command {
	var series string
	var asJSON bool
	c := &cobra.Command{
		Use:   "snap VALUE",
		Short: "Fit a value to a preferred-number series: nearest, below and above",
		Long: `snap finds the member of an IEC 60063 series nearest to a value (in log
space), the next member below it and the next above it (for a value that is
a member, its neighbours), with the errors in percent.
VALUE is written as the trade writes it: 4700, 4.7k, 4k7, 2n2, 100nF, R47.
It must lie in the range the design file accepts for a part: 1 mΩ to 1 TΩ
for a resistance (a value written in Ω), 1 fF to 1 F for a capacitance (in
F), and 1 fF to 1 TΩ for a value without a unit.`,
		Example: `  tonewright snap 5k
  tonewright snap 3n3 --series E6
  tonewright snap 12.3k --series E96 --json`,
		Args: exactArgs(1, "one VALUE"),
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := eseries.SeriesByName(series)
			if err != nil {
				return usageErrorf("--series: %v", err)
			}
			v, unit, err := snapValue(args[0])
			if err != nil {
				return err
			}
			sn, err := eseries.SnapTo(s, v)
			if err != nil {
				return badInput(fmt.Errorf("value %q: %v", args[0], err))
			}
			r := snapReport{Value: v, Series: s.Name, Nearest: sn.Nearest, ErrorPct: 100 * sn.NearestErr, TolerancePct: 100 * s.Tolerance}
			if sn.HasBelow && sn.HasAbove && sn.Below == sn.Above {
				// The value is a member: its neighbours are the next lower
				// and next higher members, as a designer asks.
				sn.Below, sn.HasBelow = s.Below(v * (1 - 4*eseries.RelTol))
				sn.Above, sn.HasAbove = s.Above(v * (1 + 4*eseries.RelTol))
				sn.BelowErr, sn.AboveErr = (sn.Below-v)/v, (sn.Above-v)/v
			}
			if sn.HasBelow {
				b, e := sn.Below, 100*sn.BelowErr
				r.Below, r.BelowErrorPct = &b, &e
			}
			if sn.HasAbove {
				b, e := sn.Above, 100*sn.AboveErr
				r.Above, r.AboveErrorPct = &b, &e
			}
			if asJSON {
				return printJSON(a.out, r)
			}
			show := eseries.Format
			if unit != "" {
				show = func(x float64) string { return withUnit(x, 4, unit) }
			}
			fmt.Fprintf(a.out, "%s in %s (%g %% parts):\n", show(v), s.Name, 100*s.Tolerance)
			fmt.Fprintf(a.out, "  nearest  %-8s %+.2f %%\n", show(sn.Nearest), r.ErrorPct)
			if r.Below != nil {
				fmt.Fprintf(a.out, "  below    %-8s %+.2f %%\n", show(*r.Below), *r.BelowErrorPct)
			}
			if r.Above != nil {
				fmt.Fprintf(a.out, "  above    %-8s %+.2f %%\n", show(*r.Above), *r.AboveErrorPct)
			}
			return nil
		},
	}
	c.Flags().StringVar(&series, "series", "E24", "the series: E3, E6, E12, E24, E48, E96 or E192")
	c.Flags().BoolVar(&asJSON, "json", false, "print the result as JSON")
	_ = c.RegisterFlagCompletionFunc("series", cobra.FixedCompletions(eseries.SeriesNames(), cobra.ShellCompDirectiveNoFileComp))
	return c
}

// snapValue reads snap's VALUE: a positive part value within the design
// file's ranges for its unit (either range when it has none).
func snapValue(s string) (float64, string, error) {
	v, unit, err := eseries.ParseUnit(s)
	if err != nil {
		return 0, "", badInput(err)
	}
	if !(v > 0) {
		return 0, "", usageErrorf("value %q: values are positive, e.g. 4.7k", s)
	}
	switch unit {
	case "Hz":
		return 0, "", usageErrorf("value %q is a frequency: snap fits part values, in Ω, F or without a unit", s)
	case "Ω", "F", "H":
		if err := networks.CheckRange(v, unit); err != nil {
			return 0, "", usageErrorf("value %q: %v", s, err)
		}
	default:
		if v < networks.MinFarads || v > networks.MaxOhms {
			return 0, "", usageErrorf("value %q is outside the ranges a part may have (1 mΩ to 1 TΩ for resistances, 1 fF to 1 F for capacitances): is the prefix right?", s)
		}
	}
	return v, unit, nil
}
