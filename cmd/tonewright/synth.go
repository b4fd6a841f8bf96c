package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"image/color"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"

	"tonewright/eseries"
	"tonewright/networks"
	"tonewright/synth"
)

func init() { register(newSynthCmd) }

// synthFlags are the synth command's flags, as typed.
type synthFlags struct {
	scoopHz, depth, balance, at, corner string
	source, load, loadC                 string
	filters                             int
	resistors, capacitors, pots, stock  string
	from, free                          string
	maxChanges                          int
	prefer, priority                    string
	curve                               string
	fitLevel                            bool
	knobs                               []string
	maxOut, minCap, maxLoss             string
	out, plot                           string
	json                                bool
	seed                                uint64
	effort                              int
}

func newSynthCmd(a *app) *cobra.Command {
	var f synthFlags
	c := &cobra.Command{
		Use:   "synth [TARGETS.yaml]",
		Short: "Find the parts for a wanted scoop, balance and corner in E-series values or from stock",
		Long: `synth chooses the blend network's parts, its pot and the RC low-pass
sections' R and C for the voice you want: the scoop's frequency, depth and
balance at one knob position, and the output corner at knob 1, with the
impedances around the network taken into account. It finds the exact
(ideal) values first, then the nearest allowed combination of E-series or
stocked parts, and reports how close both come.

Targets come from a targets file, from flags, or both (flags win). With
--from it re-voices an existing design instead, changing only the parts
named by --free and at most --max-changes of them; targets not given keep
the design's current figures.

Exit status: 0 all targets met, 2 bad input, 3 targets not met (the best
design is still reported and written).`,
		Example: `  tonewright synth voice.yaml -o board.yaml
  tonewright synth --scoop-hz 700 --depth -9 --corner 9k --source 6.8k --plot synth.png
  tonewright synth --from board.yaml --scoop-hz 600 --max-changes 1
  tonewright synth voice.yaml --stock drawer.yaml --json`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) > 1 {
				return usageErrorf("%s takes at most one TARGETS.yaml file (got %d arguments); see %s --help", cmd.CommandPath(), len(args), cmd.CommandPath())
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return runSynth(a, cmd, args, &f)
		},
	}
	fl := c.Flags()
	fl.StringVar(&f.scoopHz, "scoop-hz", "", "scoop frequency, e.g. 800 or 1.2k")
	fl.StringVar(&f.depth, "depth", "", "scoop depth below the shoulders in dB, negative, e.g. -10")
	fl.StringVar(&f.balance, "balance", "", "upper shoulder minus lower shoulder in dB (default 0; re-voicing: kept)")
	fl.StringVar(&f.at, "at", "", "blend knob position the scoop is measured at, 0..1 (default 0.5)")
	fl.StringVar(&f.corner, "corner", "", "output corner at knob 1 (-3 dB), e.g. 5k")
	fl.StringVar(&f.source, "source", "", "output impedance of the driving stage, e.g. 6.8k")
	fl.StringVar(&f.load, "load", "", "load resistance, e.g. 1M, or open")
	fl.StringVar(&f.loadC, "load-c", "", "load capacitance (cable), e.g. 470p")
	fl.IntVar(&f.filters, "filters", synth.DefaultFilters, "number of identical RC low-pass sections")
	fl.StringVar(&f.resistors, "resistors", "", "resistor values: a series E3…E192 or a comma list (default E24)")
	fl.StringVar(&f.capacitors, "capacitors", "", "capacitor values: a series E3…E192 or a comma list (default E12)")
	fl.StringVar(&f.pots, "pots", "", "blend pot values, a comma list (default 10k,20k,25k,50k,100k,250k,500k,1M)")
	fl.StringVar(&f.stock, "stock", "", "use only the values listed in the stock `FILE`")
	fl.StringVar(&f.from, "from", "", "re-voice the design in `DESIGN.yaml`")
	fl.StringVar(&f.free, "free", "", "parts that may change, comma separated, e.g. lowpass.r,lowpass.c,highpass.c (default all)")
	fl.IntVar(&f.maxChanges, "max-changes", 0, "re-voicing: change at most N parts (0: no limit)")
	fl.StringVarP(&f.out, "output", "o", "", "write the chosen design to `DESIGN.yaml`")
	fl.StringVar(&f.plot, "plot", "", "draw the chosen design with the targets to `FILE` (.png or .svg)")
	fl.BoolVar(&f.json, "json", false, "print targets, ideal and chosen designs and the analysis as JSON")
	fl.Uint64Var(&f.seed, "seed", 0, "seed of the search's random starts")
	fl.IntVar(&f.effort, "effort", 1, "how widely the standard values are searched: 1, 2 or 3 (the README gives what each costs)")
	fl.StringVar(&f.prefer, "prefer", "closest", "among the designs within tolerance: closest (figures nearest the targets) or loss (least loss at 1 kHz)")
	fl.StringVar(&f.curve, "curve", "", "re-voicing: fit the whole curve in `FILE.csv` (hz and db_at_SETTING columns as analyze --csv writes them, or hz,db)")
	fl.BoolVar(&f.fitLevel, "fit-level", false, "curve: let an overall level offset go free (a measured curve's gain is unknown)")
	fl.StringArrayVar(&f.knobs, "knob", nil, "curve: the knob setting of a measured hz,db curve: `NAME=P` (repeat for more knobs)")
	fl.StringVar(&f.maxOut, "max-output-impedance", "", "limit: |Z| looking back into the output at 1 kHz (knob at --at), e.g. 10k")
	fl.StringVar(&f.minCap, "min-capacitor", "", "limit: the smallest capacitor chosen (default 100p)")
	fl.StringVar(&f.maxLoss, "max-loss", "", "limit: the insertion loss at 1 kHz (knob 0.5) in dB, e.g. 20")
	fl.StringVar(&f.priority, "priority", "", "targets kept first when they cannot all be met, e.g. hz+corner,depth,balance (the default)")
	return c
}

func runSynth(a *app, cmd *cobra.Command, args []string, f *synthFlags) error {
	p := &synth.Problem{}
	var inputs []string
	if len(args) == 1 {
		var err error
		if p, err = synth.LoadTargets(args[0]); err != nil {
			if _, derr := networks.LoadDesign(args[0]); derr == nil {
				return badInput(fmt.Errorf("%w\nthis looks like a design file: re-voice it with --from %s (TARGETS is a targets file: targets, source, load, filters, parts)", err, args[0]))
			}
			return badInput(err)
		}
		if p.Name == "" && f.from == "" {
			p.Name = strings.TrimSuffix(filepath.Base(args[0]), filepath.Ext(args[0]))
		}
		inputs = append(inputs, args[0])
		if p.Parts.Stock != nil {
			inputs = append(inputs, p.Parts.Stock.File)
		}
	}
	if f.from != "" {
		d, err := loadDesign(f.from)
		if err != nil {
			return err
		}
		p.From = d
		inputs = append(inputs, f.from)
	} else if cmd.Flags().Changed("free") || cmd.Flags().Changed("max-changes") {
		return usageErrorf("--free and --max-changes re-voice an existing design: give it with --from DESIGN.yaml")
	}
	if err := applySynthFlags(cmd, f, p); err != nil {
		return err
	}
	if f.stock != "" {
		inputs = append(inputs, f.stock)
	}
	for _, n := range stockWins(cmd, p) {
		fmt.Fprintf(a.err, "tonewright: note: %s\n", n)
	}
	// Refuse bad output names before the search, not after it.
	if f.out != "" {
		if err := checkOutput(f.out, inputs...); err != nil {
			return err
		}
	}
	if f.plot != "" {
		if err := checkPlotFlag("plot", f.plot, append(inputs, f.out)...); err != nil {
			return err
		}
	}

	if f.effort < 1 || f.effort > 3 {
		return usageErrorf("--effort %d: give 1 (the default), 2 or 3", f.effort)
	}
	opt := synth.Options{Seed: f.seed, Effort: f.effort}
	pr, err := synth.ParsePrefer(f.prefer)
	if err != nil {
		return usageErrorf("--prefer %v", err)
	}
	if cmd.Flags().Changed("prefer") || p.Prefer == nil {
		p.Prefer = &pr // the flag wins over the file
	}
	var bar *progressbar.ProgressBar
	if a.tty {
		bar = progressbar.NewOptions(1, progressbar.OptionSetWriter(a.err), progressbar.OptionSetDescription("synth"),
			progressbar.OptionThrottle(100*time.Millisecond), progressbar.OptionClearOnFinish(), progressbar.OptionSetWidth(30))
		opt.Progress = func(done, total int) {
			bar.ChangeMax(total)
			_ = bar.Set(done)
		}
	}
	res, err := synth.Solve(p, opt)
	if bar != nil {
		_ = bar.Finish()
	}
	if err != nil {
		return badInput(flagBlamed(cmd, err))
	}

	if f.out != "" {
		if err := writeFile(f.out, res.Design.YAML(), inputs...); err != nil {
			return err
		}
	}
	if f.plot != "" {
		if err := plotSynth(res, p, f.plot, inputs...); err != nil {
			return err
		}
	}
	if f.json {
		an, err := networks.Analyze(res.Design, networks.DefaultPositions)
		if err != nil {
			return fmt.Errorf("analysing the chosen design: %w", err)
		}
		if err := printJSON(a.out, synthJSON{Targets: res.Targets, Ideal: synth.NewDesignJSON(res.Ideal),
			Design: synth.NewDesignJSON(res.Design), Achieved: an, Met: res.Met, Feasible: res.Feasible,
			Parts: res.Parts, Checks: res.Checks, Changes: nonNil(res.Changes), Prefer: res.Prefer, Cause: res.Cause,
			Starts: res.Starts, Conflict: res.Conflicts, Priority: res.Priority, AtLimit: res.AtLimit, Limits: res.Limits, Curves: res.Curves}); err != nil {
			return err
		}
	} else {
		writeSynthReport(a.out, res, p.From != nil)
		if f.out != "" {
			fmt.Fprintf(a.out, "\ndesign written to %s\n", f.out)
		}
		if f.plot != "" {
			fmt.Fprintf(a.out, "wrote %s\n", f.plot)
		}
	}
	if !res.Met {
		return &unmetError{msg: unmetMessage(res)}
	}
	return nil
}

// synthJSON is the --json output.
type synthJSON struct {
	Targets  synth.Targets      `json:"targets"`
	Ideal    *synth.DesignJSON  `json:"ideal"`
	Design   *synth.DesignJSON  `json:"design"`
	Achieved *networks.Analysis `json:"achieved"`
	Met      bool               `json:"met"`
	Feasible bool               `json:"feasible"`
	Parts    []synth.Choice     `json:"parts"`
	Checks   []synth.Check      `json:"checks"`
	Changes  []synth.Change     `json:"changes"`
	Prefer   string             `json:"prefer"`
	Cause    string             `json:"cause,omitempty"`
	Starts   int                `json:"starts,omitempty"`
	Conflict []synth.Conflict   `json:"conflicts,omitempty"`
	Priority [][]string         `json:"priority,omitempty"`
	AtLimit  []synth.AtLimit    `json:"at_limit,omitempty"`
	Limits   []synth.LimitCheck `json:"limits,omitempty"`
	Curves   []synth.CurveFit   `json:"curves,omitempty"`
}

func nonNil(c []synth.Change) []synth.Change {
	if c == nil {
		return []synth.Change{}
	}
	return c
}

// applySynthFlags lays the flags that were given over the problem.
func applySynthFlags(cmd *cobra.Command, f *synthFlags, p *synth.Problem) error {
	set := cmd.Flags().Changed
	value := func(name, s, what string) (*float64, error) {
		if !set(name) {
			return nil, nil
		}
		v, err := flagValue(name, s, "Hz")
		if err != nil {
			return nil, err
		}
		if !(v > 0) {
			return nil, usageErrorf("--%s %s: %s must be positive, e.g. %s", name, s, what, flagExample[name])
		}
		return &v, nil
	}
	number := func(name, s string) (*float64, error) {
		if !set(name) {
			return nil, nil
		}
		v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, usageErrorf("--%s %q: give a plain number, e.g. %s", name, s, flagExample[name])
		}
		return &v, nil
	}
	var err error
	t := &p.Targets
	if v, e := value("scoop-hz", f.scoopHz, "the scoop frequency"); e != nil {
		return e
	} else if v != nil {
		t.ScoopHz = v
	}
	if v, e := number("depth", f.depth); e != nil {
		return e
	} else if v != nil {
		if !(*v < 0) {
			return usageErrorf("--depth %s: a scoop's depth is negative (a dip below the shoulders), e.g. -10", f.depth)
		}
		t.DepthDB = v
	}
	if v, e := number("balance", f.balance); e != nil {
		return e
	} else if v != nil {
		t.BalanceDB = v
	}
	if v, e := number("at", f.at); e != nil {
		return e
	} else if v != nil {
		if err := parsePosition("at", *v); err != nil {
			return err
		}
		t.At = v
	}
	if v, e := value("corner", f.corner, "the corner"); e != nil {
		return e
	} else if v != nil {
		t.CornerHz = v
	}
	if set("source") {
		v, err := flagValue("source", f.source, "Ω")
		if err != nil {
			return err
		}
		if v < 0 {
			return usageErrorf("--source %q: give the driving stage's output impedance, e.g. 6.8k or 0", f.source)
		}
		if v > 0 {
			if err := checkFlagRange("source", f.source, v, "Ω"); err != nil {
				return err
			}
		}
		s := networks.Source{}
		if p.Source != nil {
			s = *p.Source
		}
		s.Impedance = v
		p.Source = &s
	}
	if set("load") || set("load-c") {
		l := networks.DefaultLoad
		switch {
		case p.Load != nil:
			l = *p.Load
		case p.From != nil:
			// The design's load, keeping what the flags do not give.
			l = p.From.Load
		}
		if set("load") {
			if strings.EqualFold(strings.TrimSpace(f.load), "open") {
				l.R = math.Inf(1)
			} else if l.R, err = flagValue("load", f.load, "Ω"); err != nil {
				return err
			} else if !(l.R > 0) {
				return usageErrorf("--load %q: give the load resistance, e.g. 1M, or open", f.load)
			} else if err := checkFlagRange("load", f.load, l.R, "Ω"); err != nil {
				return err
			}
		}
		if set("load-c") {
			if l.C, err = flagValue("load-c", f.loadC, "F"); err != nil {
				return err
			} else if l.C < 0 {
				return usageErrorf("--load-c %q: give the load capacitance, e.g. 470p, or 0", f.loadC)
			} else if l.C > 0 {
				if err := checkFlagRange("load-c", f.loadC, l.C, "F"); err != nil {
					return err
				}
			}
		}
		p.Load = &l
	}
	if set("filters") {
		if f.filters < 0 || f.filters > networks.MaxFilters {
			return usageErrorf("--filters %d: give a number of sections from 0 to %d", f.filters, networks.MaxFilters)
		}
		n := f.filters
		p.Filters = &n
	}
	if set("resistors") {
		if p.Parts.Resistors, err = flagSet("resistors", f.resistors); err != nil {
			return err
		}
	}
	if set("capacitors") {
		if p.Parts.Capacitors, err = flagSet("capacitors", f.capacitors); err != nil {
			return err
		}
	}
	if set("pots") {
		if p.Parts.Pots, err = parseList("pots", f.pots); err != nil {
			return err
		}
	}
	if set("stock") {
		st, err := synth.LoadStock(f.stock)
		if err != nil {
			return badInput(err)
		}
		p.Parts.Stock = st
	}
	if set("free") {
		p.Free = nil
		for _, name := range strings.Split(f.free, ",") {
			if name = strings.TrimSpace(name); name != "" {
				p.Free = append(p.Free, name)
			}
		}
		if len(p.Free) == 0 {
			return usageErrorf("--free: no part named: give part names separated by commas, e.g. lowpass.c,highpass.c")
		}
	}
	if set("max-output-impedance") {
		v, err := flagValue("max-output-impedance", f.maxOut, "Ω")
		if err != nil {
			return err
		}
		if !(v > 0) {
			return usageErrorf("--max-output-impedance %q: give a positive impedance, e.g. 10k", f.maxOut)
		}
		p.Limits.MaxOutputImpedance = v
	}
	if set("min-capacitor") {
		v, err := flagValue("min-capacitor", f.minCap, "F")
		if err != nil {
			return err
		}
		if !(v > 0) {
			return usageErrorf("--min-capacitor %q: give a positive capacitance, e.g. 100p", f.minCap)
		}
		p.Limits.MinCapacitor = &v
	}
	if v, e := number("max-loss", f.maxLoss); e != nil {
		return e
	} else if v != nil {
		if !(*v > 0) {
			return usageErrorf("--max-loss %s: give the largest loss at 1 kHz in dB, a positive number, e.g. 20", f.maxLoss)
		}
		p.Limits.MaxLossDB = *v
	}
	if set("curve") {
		c, err := synth.LoadCurve(f.curve)
		if err != nil {
			return badInput(err)
		}
		p.Curve = c
	}
	if set("fit-level") {
		p.FitLevel = f.fitLevel
	}
	if set("knob") {
		p.CurveKnobs = map[string]float64{}
		for _, k := range f.knobs {
			l, err := networks.ParseKnobFlag(k)
			if err != nil {
				return usageErrorf("--knob %v", err)
			}
			if len(l.Positions) != 1 {
				return usageErrorf("--knob %s: a measured curve has one setting: give one position, e.g. treble=0.3", k)
			}
			p.CurveKnobs[l.Name] = l.Positions[0]
		}
	}
	if set("priority") {
		pr, err := synth.ParsePriority(f.priority)
		if err != nil {
			return usageErrorf("--priority %q: %v", f.priority, err)
		}
		p.Priority = pr
	}
	if set("max-changes") {
		if f.maxChanges < 0 {
			return usageErrorf("--max-changes %d: give a number of parts, 1 or more (0: no limit)", f.maxChanges)
		}
		p.MaxChanges = f.maxChanges
	}
	return nil
}

// stockWins says, for each kind of part that both the stock file and a
// series or list (flag or targets file) give, that the stock file wins.
func stockWins(cmd *cobra.Command, p *synth.Problem) []string {
	st := p.Parts.Stock
	if st == nil {
		return nil
	}
	var notes []string
	for _, k := range []struct {
		kind  string
		stock []float64
		given bool
	}{
		{"resistors", st.Resistors, cmd.Flags().Changed("resistors") || p.Parts.Resistors != nil},
		{"capacitors", st.Capacitors, cmd.Flags().Changed("capacitors") || p.Parts.Capacitors != nil},
		{"pots", st.Pots, cmd.Flags().Changed("pots") || p.Parts.Pots != nil},
	} {
		if len(k.stock) > 0 && k.given {
			notes = append(notes, fmt.Sprintf("the stock file %s lists %s: only those are used, not the %s series or list given (the stock file wins)", st.File, k.kind, k.kind))
		}
	}
	return notes
}

var flagExample = map[string]string{
	"scoop-hz": "800 or 1.2k", "corner": "5k", "max-loss": "20", "depth": "-10", "balance": "0 or +2", "at": "0.5",
}

// flagSet reads a series name or a comma list of values.
func flagSet(name, s string) (eseries.Set, error) {
	if se, err := eseries.SeriesByName(s); err == nil {
		return se, nil
	}
	if w := strings.ToUpper(strings.TrimSpace(s)); !strings.Contains(w, ",") && (strings.HasPrefix(w, "E") || !strings.ContainsAny(w, "0123456789")) {
		return nil, usageErrorf("--%s %q: give a series (%s) or values separated by commas, e.g. 1k,4.7k,10k",
			name, s, strings.Join(eseries.SeriesNames(), ", "))
	}
	vs, err := parseList(name, s)
	if err != nil {
		return nil, err
	}
	l, err := eseries.NewList(vs)
	if err != nil {
		return nil, usageErrorf("--%s: %v", name, err)
	}
	return l, nil
}

// heavyLossDB is the insertion loss beyond which the report warns: more
// than a gain stage usually has to spare (common practice, no published
// source).
const heavyLossDB = -40

// writeSynthReport prints the parts table, the targets table and, when
// re-voicing, the swaps.
func writeSynthReport(w io.Writer, res *synth.Result, revoice bool) {
	d := res.Design
	fmt.Fprintf(w, "%s: %s, %s, band %s–%s\n\n", designTitle(d), describeDesign(d), sections(len(d.Filters)), hz(d.Band.From), hz(d.Band.To))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	if revoice {
		fmt.Fprintln(tw, "part\trole\twas\tideal\tchosen\tfrom\t")
	} else {
		fmt.Fprintln(tw, "part\trole\tideal\tchosen\tfrom\t")
	}
	for _, c := range res.Parts {
		unit := kindUnit(c.Kind)
		ideal := withUnit(c.Ideal, 4, unit)
		if !c.Free {
			ideal = "—"
		}
		if revoice {
			was := "new"
			if c.Original > 0 {
				was = withUnit(c.Original, 3, unit)
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t\n", c.Name, c.Role, was, ideal, withUnit(c.Chosen, 3, unit), c.Set)
			continue
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t\n", c.Name, c.Role, ideal, withUnit(c.Chosen, 3, unit), c.Set)
	}
	tw.Flush()
	fmt.Fprintln(w)

	at := synth.DefaultAt
	if res.Targets.At != nil {
		at = *res.Targets.At
	}
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "target\twanted\tideal parts\terror\tchosen parts\terror\t")
	for _, c := range res.Checks {
		name := c.Name
		if strings.HasPrefix(c.Key, "targets[") || c.Key == "targets.curve" {
			// The list form: the name carries its knob setting.
		} else if strings.HasPrefix(name, "scoop") {
			name += " (" + res.Knob + " " + posLabel(at) + ")"
		} else {
			name += " (" + res.Knob + " 1)"
		}
		fig := func(v float64, found bool) string { return figure(c.Unit, v, found) }
		if c.Key == "targets.curve" {
			// An RMS error of hundredths of a dB: as many places as
			// the error column.
			fig = func(v float64, _ bool) string { return fmt.Sprintf("%.2f dB", v) }
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t\n", name, fig(c.Wanted, true),
			fig(c.Ideal, c.IdealFound), checkError(c.Unit, c.IdealError, c.IdealFound, c.IdealMet, synth.IdealTolerance),
			fig(c.Achieved, c.Found), checkError(c.Unit, c.Error, c.Found, c.Met, synth.PartsTolerance))
	}
	tw.Flush()
	fmt.Fprintf(w, "\ngain at 1 kHz (%s): ideal %s, chosen %s\n", res.GainSetting, db(res.IdealMetrics.Gain1kDB), db(res.Metrics.Gain1kDB))
	if res.Metrics.Gain1kDB < heavyLossDB {
		fmt.Fprintf(w, "note: the section loses %.0f dB at 1 kHz; the stage before it must make that up, and noise and hum pick-up grow with it\n", -res.Metrics.Gain1kDB)
	}
	fmt.Fprintf(w, "tolerances: ideal parts %.1f %% and %.1f dB, chosen parts %.0f %% and %.0f dB (* marks a miss)\n",
		100*synth.IdealTolerance.Freq, synth.IdealTolerance.Level, 100*synth.PartsTolerance.Freq, synth.PartsTolerance.Level)

	for _, c := range res.Curves {
		line := fmt.Sprintf("curve fit (%s): RMS %.3f dB, worst %.3f dB", c.Setting, c.RMSDB, c.WorstDB)
		if c.OffsetDB != 0 {
			line += fmt.Sprintf(", level offset %+.2f dB taken out (--fit-level)", c.OffsetDB)
		}
		fmt.Fprintln(w, line)
	}
	for _, l := range res.Limits {
		mark := ""
		if !l.Met {
			mark = " *"
		}
		fmt.Fprintf(w, "limit %s (%s): at most %s; ideal %s, chosen %s%s\n", l.Name, l.Key, limitFigure(l.Unit, l.Limit), limitFigure(l.Unit, l.Ideal), limitFigure(l.Unit, l.Achieved), mark)
	}
	switch {
	case !res.Met:
		fmt.Fprintln(w, "chosen: no design of allowed values is within tolerance; the one that misses the fewest targets (those kept first counting first), then the closest")
	case res.Prefer == "loss":
		fmt.Fprintln(w, "chosen: of the designs within tolerance, the one of least loss at 1 kHz (--prefer loss)")
	default:
		fmt.Fprintln(w, "chosen: of the designs within tolerance, the one closest to the targets (--prefer closest)")
	}
	for _, l := range res.AtLimit {
		fmt.Fprintf(w, "note: %s\n", atLimitLine(l))
	}

	if revoice {
		fmt.Fprintln(w)
		switch {
		case len(res.Changes) == 0 && res.Met:
			fmt.Fprintln(w, "no part needs to change")
		case len(res.Changes) == 0:
			fmt.Fprintln(w, "no change of the free parts brings the missed targets closer")
		default:
			fmt.Fprintf(w, "swap %d %s:\n", len(res.Changes), plural(len(res.Changes), "part", "parts"))
			for _, ch := range res.Changes {
				fmt.Fprintf(w, "  %s\n", changeLine(ch))
			}
		}
	}
	if res.Met && !res.Feasible {
		fmt.Fprintf(w, "note: the ideal column's * are against the ideal parts' tighter tolerance (%.1f %%, %.1f dB): the exact optimum cannot quite reach those figures, but the chosen parts meet every target within theirs\n",
			100*synth.IdealTolerance.Freq, synth.IdealTolerance.Level)
	}
	if !res.Met {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "not met:")
		for _, c := range res.Checks {
			if !c.Met {
				fmt.Fprintf(w, "  %s\n", missLine(c))
			}
		}
		switch res.Cause {
		case synth.CauseMaxChanges:
			fmt.Fprintf(w, "%s\n", limitCause(res))
			if u := res.Unlimited; u != nil && u.Met {
				for _, ch := range u.Changes {
					fmt.Fprintf(w, "  %s\n", changeLine(ch))
				}
			}
		case synth.CauseParts:
			fmt.Fprintf(w, "%s\n", partsCause(res))
		case synth.CauseFree:
			fmt.Fprintf(w, "%s\n", freeCause(res))
			if u := res.Freed; u != nil {
				for _, ch := range u.Changes {
					fmt.Fprintf(w, "  %s\n", changeLine(ch))
				}
			}
		case synth.CauseRange:
			fmt.Fprintf(w, "%s\n", rangeCause(res))
		case synth.CauseLimit:
			fmt.Fprintf(w, "%s\n", limitBreak(res))
		default:
			if held := heldParts(res); len(held) > 0 {
				fmt.Fprintf(w, "the ideal values of the free parts miss too: with %s held as they are (--free), no design within the tolerance was found;\n", strings.Join(held, ", "))
				if u := res.Freed; u != nil && !u.Met {
					fmt.Fprintln(w, "with every part free no design within the tolerance was found either: --free is not what stops it;")
				}
				fmt.Fprintln(w, "the ideal column shows the nearest figures found")
			} else {
				fmt.Fprintf(w, "the ideal parts miss too: %s;\n", searchSaid(res))
				fmt.Fprintln(w, "the ideal column shows the nearest figures found")
			}
		}
		for _, c := range res.Conflicts {
			fmt.Fprintf(w, "  %s\n", conflictLine(c, res.Checks))
		}
		if len(res.Conflicts) > 0 {
			fmt.Fprintln(w, priorityLine(res.Priority))
		}
	}
}

// changeLine is one swap: part (role): from → to.
func changeLine(ch synth.Change) string {
	unit := kindUnit(ch.Kind)
	was := "(new)"
	if ch.From > 0 {
		was = withUnit(ch.From, 3, unit)
	}
	return fmt.Sprintf("%s (%s): %s → %s", ch.Part, ch.Role, was, withUnit(ch.To, 3, unit))
}

// limitCause says that the change limit, not the network, stops the
// re-voicing, and what meets the targets without it.
func limitCause(res *synth.Result) string {
	k := res.MaxChanges
	msg := fmt.Sprintf("not reachable with at most %d %s (--max-changes %d)", k, plural(k, "change", "changes"), k)
	u := res.Unlimited
	switch {
	case u != nil && u.Met:
		n := len(u.Changes)
		msg += fmt.Sprintf("; %d %s meet every target:", n, plural(n, "change", "changes"))
	default:
		msg += "; without the limit the ideal parts meet every target"
	}
	return msg
}

// partsCause says that the allowed values, not the network, miss: the
// ideal parts meet every target.
func partsCause(res *synth.Result) string {
	var sets []string
	stock := false
	for _, c := range res.Parts {
		if !c.Free || c.Set == "unchanged" || slices.Contains(sets, c.Set) {
			continue
		}
		if c.Set == "stock" {
			stock = true
		}
		sets = append(sets, c.Set)
	}
	if stock {
		return fmt.Sprintf("the ideal parts meet every target, the stocked parts miss: the values in %s (%s) cannot get close enough; add values near the ideal column to the stock",
			res.StockFile, strings.Join(sets, ", "))
	}
	return fmt.Sprintf("the ideal parts meet every target, the chosen values (%s) cannot get close enough: try a finer series or a list of values", strings.Join(sets, ", "))
}

func sections(n int) string {
	switch n {
	case 0:
		return "no filter sections"
	case 1:
		return "1 filter section"
	}
	return fmt.Sprintf("%d filter sections", n)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// figure prints a target or achieved figure.
func figure(unit string, v float64, found bool) string {
	if !found {
		return "none"
	}
	if unit == "Hz" {
		return hz(v)
	}
	return db(v)
}

// checkError prints an error: relative for frequencies, dB for levels,
// with * where it is beyond the tolerance.
func checkError(unit string, e float64, found, met bool, tol synth.Tolerance) string {
	if !found {
		return "*"
	}
	var s string
	if unit == "Hz" {
		s = fmt.Sprintf("%+.2f %%", 100*e)
	} else {
		s = fmt.Sprintf("%+.2f dB", e)
	}
	if !met {
		s += " *"
	}
	return s
}

// missLine says which target is missed and by how much, and the nearest
// achievable figure.
func missLine(c synth.Check) string {
	what := func(v float64, found bool) string {
		if !found && c.Key == "targets.corner_hz" {
			return "no corner below 10 × band top"
		}
		if !found {
			return "no scoop"
		}
		return figure(c.Unit, v, true)
	}
	by := ""
	if c.Found {
		if c.Unit == "Hz" {
			by = fmt.Sprintf(", off by %+.1f %%", 100*c.Error)
		} else {
			by = fmt.Sprintf(", off by %+.2f dB", c.Error)
		}
	}
	return fmt.Sprintf("%s: wanted %s, chosen parts give %s%s; nearest found with ideal parts %s",
		c.Name, figure(c.Unit, c.Wanted, true), what(c.Achieved, c.Found), by, what(c.Ideal, c.IdealFound))
}

// targetFlags are the flags that set a targets key.
var targetFlags = map[string]string{"targets.corner_hz": "corner", "targets.scoop.hz": "scoop-hz",
	"targets.scoop.depth_db": "depth", "targets.scoop.balance_db": "balance", "targets.scoop.at": "at"}

// flagBlamed names the flag, when a flag set the targets key an error is
// about: the person typed --corner, not targets.corner_hz.
func flagBlamed(cmd *cobra.Command, err error) error {
	var fe *networks.FieldError
	if !errors.As(err, &fe) {
		return err
	}
	name, ok := targetFlags[fe.Key]
	if !ok || !cmd.Flags().Changed(name) {
		return err
	}
	return usageErrorf("--%s %s: %v", name, cmd.Flags().Lookup(name).Value.String(), fe.Err)
}

// priorityLine says in which order the targets were kept.
func priorityLine(pr [][]string) string {
	names := map[string]string{synth.TargetHz: "scoop frequency", synth.TargetCorner: "corner",
		synth.TargetDepth: "depth", synth.TargetBalance: "balance"}
	var groups []string
	for _, g := range pr {
		var ns []string
		for _, t := range g {
			ns = append(ns, names[t])
		}
		groups = append(groups, strings.Join(ns, " and "))
	}
	how := "(--priority)"
	if slices.EqualFunc(pr, synth.DefaultPriority, slices.Equal) {
		how = "(the default; --priority changes it)"
	}
	return "targets kept first: " + strings.Join(groups, ", then ") + " " + how
}

// unmetMessage is the one-line error for exit status 3.
func unmetMessage(res *synth.Result) string {
	var missed []string
	for _, c := range res.Checks {
		if !c.Met {
			missed = append(missed, c.Name)
		}
	}
	msg := "targets not met: " + strings.Join(missed, ", ")
	if len(missed) == 0 {
		msg = "limits broken"
	}
	switch res.Cause {
	case synth.CauseMaxChanges:
		msg += " (" + limitCause(res)
		if u := res.Unlimited; u != nil && u.Met {
			msg += " " + swappedParts(u.Changes)
		}
		msg += ")"
	case synth.CauseParts:
		msg += " (" + partsCause(res) + ")"
	case synth.CauseFree:
		msg += " (" + freeCause(res)
		if u := res.Freed; u != nil && u.Met {
			msg += " " + swappedParts(u.Changes)
		}
		msg += ")"
	case synth.CauseRange:
		msg += " (" + rangeCause(res) + ")"
	case synth.CauseLimit:
		msg += " (" + limitBreak(res) + ")"
	default:
		if held := heldParts(res); len(held) > 0 {
			msg += " (no design within the tolerance found with " + strings.Join(held, ", ") + " held by --free)"
			break
		}
		msg += " (" + searchSaid(res) + "; see the nearest figures above)"
	}
	return msg
}

// searchSaid says what the verdict that the ideal parts miss rests on.
func searchSaid(res *synth.Result) string {
	if res.Starts > 0 {
		return fmt.Sprintf("no design within the tolerance was found in %d starts (physics seeds, random starts over every part, each pot value) pulled onto the targets by least squares", res.Starts)
	}
	return "no design within the tolerance was found"
}

// conflictLine says how near a missed target comes while the targets met
// are kept.
func conflictLine(c synth.Conflict, checks []synth.Check) string {
	near := "none found"
	if c.Found {
		near = figure(c.Unit, c.Nearest, true)
	}
	if len(c.Held) == 0 {
		return fmt.Sprintf("%s: wanted %s, nearest found %s", c.Target, figure(c.Unit, c.Wanted, true), near)
	}
	var hs []string
	for _, name := range c.Held {
		h := name
		for _, ch := range checks {
			if ch.Name == name {
				h += " at " + figure(ch.Unit, ch.Wanted, true)
			}
		}
		hs = append(hs, h)
	}
	held := strings.Join(hs, ", ")
	if k := len(hs); k > 1 {
		held = strings.Join(hs[:k-1], ", ") + " and " + hs[k-1]
	}
	return fmt.Sprintf("%s: wanted %s; the nearest that keeps the %s is %s", c.Target, figure(c.Unit, c.Wanted, true), held, near)
}

// atLimitLine flags an ideal value at a limit of its range.
func atLimitLine(l synth.AtLimit) string {
	unit := kindUnit(l.Kind)
	switch l.Limit {
	case "pinned":
		return fmt.Sprintf("%s is pinned at %s by %s (a range of one value)", l.Part, withUnit(l.Value, 3, unit), l.Key)
	case "low":
		return fmt.Sprintf("the ideal %s sits at the low end of %s (%s)", l.Part, l.Key, withUnit(l.Value, 3, unit))
	}
	return fmt.Sprintf("the ideal %s sits at the high end of %s (%s)", l.Part, l.Key, withUnit(l.Value, 3, unit))
}

// rangeCause blames the ranges the ideal values sit at, and says what
// wider ranges give.
func rangeCause(res *synth.Result) string {
	var parts []string
	for _, l := range res.AtLimit {
		parts = append(parts, fmt.Sprintf("%s at %s (%s)", l.Part, withUnit(l.Value, 3, kindUnit(l.Kind)), l.Key))
	}
	msg := "the part ranges bind: " + strings.Join(parts, ", ")
	if w := res.Widened; w != nil && w.Feasible {
		var need []string
		for _, l := range res.AtLimit {
			name := l.Part
			if strings.HasPrefix(name, "filters.") {
				name = "filter1." + strings.TrimPrefix(name, "filters.") // the sections are tied
			}
			for _, c := range w.Parts {
				if c.Name == name {
					need = append(need, fmt.Sprintf("%s %s", l.Part, withUnit(c.Ideal, 3, kindUnit(c.Kind))))
				}
			}
		}
		msg += "; with every range widened 100× the ideal parts meet every target"
		if len(need) > 0 {
			msg += " (" + strings.Join(need, ", ") + ")"
		}
	}
	return msg
}

// freeCause says that the parts --free left free cannot reach the targets.
func freeCause(res *synth.Result) string {
	held := heldParts(res)
	u := res.Freed
	msg := fmt.Sprintf("the free parts cannot reach the targets with %s held (--free)", strings.Join(held, ", "))
	if u != nil && u.Met {
		n := len(u.Changes)
		msg += fmt.Sprintf("; with every part free, %d %s meet every target:", n, plural(n, "change", "changes"))
	} else if u != nil {
		msg += "; with every part free the ideal parts meet every target"
	}
	return msg
}

// kindUnit is the unit of a part's value.
func kindUnit(k networks.PartKind) string {
	switch k {
	case networks.PartCapacitor:
		return "F"
	case networks.PartInductor:
		return "H"
	}
	return "Ω"
}

// heldParts lists the parts a re-voicing kept fixed because --free left
// them out (the level pot, never designed, is not listed).
func heldParts(res *synth.Result) []string {
	var held []string
	for _, p := range res.Parts {
		if !p.Free && p.Name != "level" {
			held = append(held, p.Name)
		}
	}
	return held
}

// plotSynth draws the chosen design at the standard knob positions with the
// targets: the scoop as a cross at the wanted frequency and level on the
// measured curve's shoulders, the corner as a dotted line. For a
// re-voicing (p.From) the original design's curve at the scoop's knob
// position is added, dashed black; for a curve target, the achieved curves
// at its settings with the targets dashed. p may be nil (a fresh
// synthesis).
func plotSynth(res *synth.Result, p *synth.Problem, path string, inputs ...string) error {
	b, err := synthBode(res, p)
	if err != nil {
		return err
	}
	return b.render(path, inputs...)
}

// synthBode is the plot plotSynth draws.
func synthBode(res *synth.Result, p *synth.Problem) (*bode, error) {
	if p == nil {
		p = &synth.Problem{}
	}
	original := p.From
	d := res.Design
	b := &bode{
		Title:   "synthesized: " + designTitle(d),
		Caption: describeDesign(d),
		Range:   d.Band,
		Curves:  designCurves(d, atSwept(d, networks.DefaultPositions...), false),
	}
	if c := p.Curve; c != nil {
		// A curve target: the achieved curves at its settings, each with
		// its target dashed in the same colour (moved by the level
		// offset taken out, if any).
		var ss []networks.Setting
		for _, cs := range c.Settings {
			over := cs.Knobs
			switch {
			case cs.Swept != nil:
				kn := d.SweptKnob()
				if kn == "" {
					kn = networks.BlendKnob
				}
				over = map[string]float64{kn: *cs.Swept}
			case cs.Label == "":
				over = p.CurveKnobs
			}
			st, err := d.Setting(over)
			if err != nil {
				return nil, err
			}
			ss = append(ss, st)
		}
		b.Curves = designCurves(d, ss, false)
		for i, cs := range c.Settings {
			off := 0.0
			if i < len(res.Curves) {
				off = res.Curves[i].OffsetDB
			}
			db := make([]float64, len(cs.DB))
			for j, v := range cs.DB {
				db[j] = v + off
			}
			b.Curves = append(b.Curves, curve{Label: "target " + b.Curves[i].Label, Hz: c.Hz, DB: db, Dash: true,
				Color: curveColors[i%len(curveColors)]})
		}
	}
	t := res.Targets
	if original != nil {
		at := synth.DefaultAt
		if t.At != nil {
			at = *t.At
		}
		os := atSwept(original, at)
		o := designCurves(original, os, false)[0]
		o.Label = "original design, " + studyLabel(original, os[0])
		o.Dash, o.Color, o.Family, o.Marks = true, color.Black, false, nil
		b.Curves = append(b.Curves, o)
		b.Title = "re-voiced: " + designTitle(d)
		b.Caption += "; dashed black: the original design"
	}
	if t.ScoopHz != nil && res.Metrics.ScoopFound {
		at := synth.DefaultAt
		if t.At != nil {
			at = *t.At
		}
		over := map[string]float64{}
		if kn := d.SweptKnob(); kn != "" {
			over[kn] = at
		} else if ks := d.KnobNames(); len(ks) > 0 {
			over[ks[0]] = at
		}
		st, err := d.Setting(over)
		if err != nil {
			return nil, err
		}
		k, err := d.Compile(st)
		if err != nil {
			return nil, err
		}
		s := res.Metrics.Scoop
		shoulders := k.GainDB(s.Hz) - s.DepthDB
		b.Targets = append(b.Targets, target{Label: fmt.Sprintf("scoop target (knob %s)", posLabel(at)),
			Hz: *t.ScoopHz, DB: shoulders + *t.DepthDB})
	}
	if t.CornerHz != nil && *t.CornerHz < d.Band.To*10 {
		b.Targets = append(b.Targets, target{Label: "corner target (knob 1)", Hz: *t.CornerHz, DB: math.NaN()})
	}
	if t.CornerHz != nil && *t.CornerHz > d.Band.To {
		b.Range.To = math.Min(*t.CornerHz*1.5, 10*d.Band.To)
	}
	return b, nil
}

// limitFigure prints a limit's figure in its unit.
func limitFigure(unit string, v float64) string {
	if unit == "dB" {
		return fmt.Sprintf("%.1f dB", v)
	}
	return withUnit(v, 3, unit)
}

// limitBreak names the limits the design breaks.
func limitBreak(res *synth.Result) string {
	var names []string
	for _, l := range res.Limits {
		if !l.Met {
			names = append(names, fmt.Sprintf("%s %s over %s (%s)", l.Name, limitFigure(l.Unit, l.Achieved), limitFigure(l.Unit, l.Limit), l.Key))
		}
	}
	return "no design found meets the targets within the limits; the nearest breaks " + strings.Join(names, ", ")
}

// swappedParts names the parts a list of swaps changes.
func swappedParts(changes []synth.Change) string {
	var sw []string
	for _, ch := range changes {
		sw = append(sw, ch.Part)
	}
	return strings.Join(sw, ", ")
}
