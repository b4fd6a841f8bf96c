package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newToleranceCmd) }

func newToleranceCmd(a *app) *cobra.Command {
	var resistors, capacitors, pots, tapers, dist, plotPath string
	var trials, workers int
	var seed uint64
	var blend float64
	kc := knobChoice{flag: "blend"}
	var asJSON bool
	c := &cobra.Command{
		Use:   "tolerance DESIGN.yaml",
		Short: "Monte Carlo over part tolerances: how far built units stray from the design",
		Long: `tolerance builds the design many times in simulation, each part drawn within
its tolerance, and reports the 5th, 50th and 95th percentile of the gain at
1 kHz, the scoop (frequency, depth, balance) at the chosen blend knob
position and the output corner (blend designs: at knob 1), and the share of trials with no
scoop.

A part's tolerance, unless its kind is given by a flag: the smaller of its
kind's (resistors 5 %, capacitors 10 %, pots 20 %; common practice) and the
tolerance of the coarsest E-series that holds its value (a 4.99k resistor is
in E96 only, so 1 %). The parts are every part of the design plus the
source's coupling capacitor (source.series_c) and the load's capacitance
(load.c) when it has them. Each pot's taper varies too: at its knob's
rotation the share of the track on the wiper's shorter side moves by up to
± --tapers of itself (default 20 %, common practice). --dist uniform draws within ± the tolerance;
--dist normal takes the tolerance as 3σ and draws again beyond it.

Percentiles interpolate linearly between the sorted trials (type 7). The
trials run on all cores; the report depends on --seed only.`,
		Example: `  tonewright tolerance board.yaml
  tonewright tolerance board.yaml --resistors 1% --capacitors 5% --dist normal
  tonewright tolerance board.yaml --trials 50000 --seed 7 --plot spread.png --json`,
		Args: exactArgs(1, "DESIGN.yaml"),
		RunE: func(cmd *cobra.Command, args []string) error {
			given := map[networks.PartKind]float64{}
			for _, f := range []struct {
				flag, value string
				kind        networks.PartKind
			}{{"resistors", resistors, networks.PartResistor}, {"capacitors", capacitors, networks.PartCapacitor}, {"pots", pots, networks.PartPot}} {
				if !cmd.Flags().Changed(f.flag) {
					continue
				}
				t, err := parseTolerance(f.flag, f.value)
				if err != nil {
					return err
				}
				given[f.kind] = t
			}
			taperTol, err := parseTolerance("tapers", tapers)
			if err != nil {
				return err
			}
			if trials < 1 || trials > networks.MaxTrials {
				return usageErrorf("--trials: %d trials: give a whole number from 1 to %d", trials, networks.MaxTrials)
			}
			if workers < 0 {
				return usageErrorf("--workers: %d: give 0 (all cores) or a positive number", workers)
			}
			ds, err := networks.ParseDistribution(dist)
			if err != nil {
				return usageErrorf("--dist: %v", err)
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
			spec := networks.ToleranceSpec{
				Parts: networks.PartTolerances(d, given), Dist: ds,
				Trials: trials, Seed: seed, At: at, Workers: workers, Tapers: taperTol,
			}
			if plotPath != "" {
				spec.CurveHz = networks.LogGrid(d.Band.From, d.Band.To, 40)
			}
			var bar *progressbar.ProgressBar
			if a.tty {
				bar = progressbar.NewOptions(trials,
					progressbar.OptionSetWriter(a.err),
					progressbar.OptionSetDescription("trials"),
					progressbar.OptionShowCount(),
					progressbar.OptionThrottle(100*time.Millisecond),
					progressbar.OptionClearOnFinish())
				spec.Progress = func(n int) { _ = bar.Add(n) }
			}
			rep, err := networks.Tolerance(d, spec)
			if bar != nil {
				_ = bar.Finish()
			}
			if err != nil {
				return badInput(fmt.Errorf("%s: %w", args[0], err))
			}
			return a.deliver(studyOutput{
				plotPath: plotPath, input: args[0], asJSON: asJSON, value: rep,
				plot: func() *bode { return tolerancePlot(d, rep) },
				text: func(w io.Writer) { writeTolerance(w, d, rep) },
			})
		},
	}
	c.Flags().StringVar(&resistors, "resistors", "", "tolerance of every resistor in `PERCENT`, e.g. 5% or 1% (default: from its E-series, else 5%)")
	c.Flags().StringVar(&capacitors, "capacitors", "", "tolerance of every capacitor in `PERCENT`, e.g. 10% (default: from its E-series, else 10%)")
	c.Flags().StringVar(&pots, "pots", "", "tolerance of every pot's track in `PERCENT`, e.g. 20% (default 20%)")
	c.Flags().StringVar(&tapers, "tapers", "20%", "taper tolerance in `PERCENT`: how far each pot's share of the track at its rotation may stray, of itself (0 for exact tapers)")
	c.Flags().IntVar(&trials, "trials", 10000, "number of simulated builds")
	c.Flags().Uint64Var(&seed, "seed", 1, "seed of the random draws; the same seed gives the same report")
	c.Flags().StringVar(&dist, "dist", "uniform", "distribution `NAME` of the draws: uniform (within ± tolerance) or normal (tolerance = 3σ, truncated)")
	_ = c.RegisterFlagCompletionFunc("dist", cobra.FixedCompletions([]string{"uniform", "normal"}, cobra.ShellCompDirectiveNoFileComp))
	c.Flags().Float64Var(&blend, "blend", networks.DefaultStudyBlend, "blend knob position for the gain and the scoop, 0 (low-pass end) to 1 (high-pass end); for another design, its swept knob")
	addKnobFlag(c, &kc, false)
	c.Flags().IntVar(&workers, "workers", 0, "goroutines to run the trials on (0: all cores); the report does not depend on it")
	c.Flags().StringVar(&plotPath, "plot", "", "draw the design's curve with the 5th–95th percentile band to `FILE` (.png or .svg)")
	c.Flags().BoolVar(&asJSON, "json", false, "print the report as JSON")
	return c
}

// parseTolerance reads a tolerance in percent, with or without the sign:
// "5%", "5", "0.5%". It returns a fraction.
func parseTolerance(flag, s string) (float64, error) {
	t := strings.TrimSpace(s)
	t = strings.TrimSpace(strings.TrimSuffix(t, "%"))
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || v >= 100 {
		return 0, usageErrorf("--%s: %q is not a tolerance: give a percentage from 0 to below 100, such as 5%%, 5 or 0.5%%", flag, s)
	}
	return v / 100, nil
}

// pct prints a fraction as a percentage, trimmed: 0.05 is "5 %", 0.005
// "0.5 %".
func pct(f float64) string {
	return strconv.FormatFloat(100*f, 'g', 4, 64) + " %"
}

// writeTolerance prints the tolerance report.
func writeTolerance(w io.Writer, d *networks.Design, rep *networks.ToleranceReport) {
	how := "uniform within ± the tolerance"
	if rep.Dist == networks.Normal {
		how = "normal, tolerance = 3σ, truncated there"
	}
	fmt.Fprintf(w, "%s: %s\n", designTitle(d), describeDesign(d))
	fmt.Fprintf(w, "%d trials, %s, seed %d, %s\n\n", rep.Trials, how, rep.Seed, studyLabel(d, rep.Knobs))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "part\tvalue\ttolerance\tfrom")
	for _, p := range rep.Parts {
		unit := map[string]string{"resistor": "Ω", "capacitor": "F", "pot": "Ω", "inductor": "H"}[p.Kind]
		fmt.Fprintf(tw, "%s\t%s\t± %s\t%s\n", p.Name, withUnit(p.Value, 3, unit), pct(p.Tolerance), p.Basis)
	}
	if rep.Tapers > 0 {
		fmt.Fprintf(tw, "every knob's taper\tshare at its rotation\t± %s\tof the shorter side's share\n", pct(rep.Tapers))
	}
	tw.Flush()
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "metric\tdesign\t5th pct\tmedian\t95th pct\ttrials\t")
	row := func(name string, nominal *float64, s *networks.Spread, f func(float64) string) {
		nom := "—"
		if nominal != nil {
			nom = f(*nominal)
		}
		if s == nil {
			fmt.Fprintf(tw, "%s\t%s\t—\t—\t—\t0\t\n", name, nom)
			return
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%d\t\n", name, nom, f(s.P5), f(s.P50), f(s.P95), s.Trials)
	}
	n := rep.Nominal
	var sHz, sDepth, sBal *float64
	if n.Scoop != nil {
		sHz, sDepth, sBal = &n.Scoop.Hz, &n.Scoop.DepthDB, &n.Scoop.BalanceDB
	}
	db2 := func(v float64) string { return fmt.Sprintf("%+.2f dB", v) }
	row("gain at 1 kHz", &n.Gain1kDB, &rep.Gain1kDB, db2)
	row("scoop at", sHz, rep.ScoopHz, hz)
	row("depth", sDepth, rep.DepthDB, db2)
	row("balance", sBal, rep.BalanceDB, db2)
	row("corner ("+cornerWhere(d)+")", n.CornerHz, rep.CornerHz, hz)
	tw.Flush()
	fmt.Fprintf(w, "\nno scoop in %s of the trials", pct(rep.NoScoopShare))
	if rep.NoCornerShare > 0 {
		fmt.Fprintf(w, "; no corner below %s in %s", hz(10*d.Band.To), pct(rep.NoCornerShare))
	}
	fmt.Fprintln(w, ".")
	fmt.Fprintln(w, "Scoop figures are over the trials with a scoop, the corner over those with a corner.")
}

// tolerancePlot draws the nominal curve at the study's blend position with
// the band between the 5th and 95th percentile of the gain at each
// frequency.
func tolerancePlot(d *networks.Design, rep *networks.ToleranceReport) *bode {
	nominal := designCurves(d, []networks.Setting{rep.Knobs}, false)[0]
	nominal.Label, nominal.Family = "design", false
	bd := band{Label: "5th to 95th percentile"}
	median := curve{Label: "median", Dash: true}
	for _, c := range rep.Curve {
		bd.Hz = append(bd.Hz, c.Hz)
		bd.Lo = append(bd.Lo, c.P5)
		bd.Hi = append(bd.Hi, c.P95)
		median.Hz = append(median.Hz, c.Hz)
		median.DB = append(median.DB, c.P50)
	}
	return &bode{
		Title:   fmt.Sprintf("%s: %s, part tolerances", designTitle(d), studyLabel(d, rep.Knobs)),
		Caption: fmt.Sprintf("%d trials, %s draws, seed %d", rep.Trials, rep.Dist, rep.Seed),
		Range:   d.Band,
		Curves:  []curve{nominal, median},
		Bands:   []band{bd},
	}
}
