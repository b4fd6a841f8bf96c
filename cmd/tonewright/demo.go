package main

import (
	"bytes"
	_ "embed"
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"tonewright/networks"
	"tonewright/networks/audio"
	"tonewright/synth"
)

func init() { register(newDemoCmd) }

// demoTargets is the embedded demo scenario, invented for this tool.
//
//go:embed demodata/targets.yaml
var demoTargets []byte

// demoSources are the driving stages the demo sweeps: a buffer, an emitter
// follower and two high-gain stages (invented); the board's own 6.8 kΩ is
// the dashed reference curve.
var demoSources = []float64{100, 1e3, 22e3, 47e3}

func newDemoCmd(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "demo [DIR]",
		Short: "Run the whole job on an embedded demo board and write the results to DIR",
		Long: `demo runs tonewright end to end on an invented demo scenario: the tone
section of a fuzz-style board whose gain stage has 6.8 kΩ output impedance,
driving a 100 kΩ audio-taper level pot into a 1 MΩ amplifier input. From the
voice wanted (a scoop 8 dB deep at 700 Hz, a 9 kHz corner) it synthesizes the
parts in E24/E12 values, analyses and plots the chosen design, sweeps the
source impedance and runs a tolerance study, and renders listen.wav: the
built-in plucked phrase while the blend knob turns from 0 to 1. It writes
everything into DIR
(default ./tonewright-demo) and prints what it wrote.`,
		Example: `  tonewright demo
  tonewright demo /tmp/voicing`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) > 1 {
				return usageErrorf("demo takes at most one DIR (got %d arguments)", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			dir := "tonewright-demo"
			if len(args) == 1 {
				dir = args[0]
			}
			if st, err := os.Stat(dir); err == nil && !st.IsDir() {
				return usageErrorf("%s exists and is not a directory", dir)
			}
			if err := os.MkdirAll(dir, 0o755); err != nil {
				return badInput(fmt.Errorf("cannot create %s: %w", dir, err))
			}
			return runDemo(a, dir)
		},
	}
}

// runDemo is the main job: targets → parts → analysis, plots and studies.
func runDemo(a *app, dir string) error {
	p, err := synth.ParseTargets(demoTargets, "demo targets")
	if err != nil {
		return fmt.Errorf("embedded demo targets: %w", err)
	}
	res, err := synth.Solve(p, synth.Options{})
	if err != nil {
		return fmt.Errorf("synthesizing the demo: %w", err)
	}
	d := res.Design
	var wrote []string
	path := func(name string) string {
		p := filepath.Join(dir, name)
		wrote = append(wrote, p)
		return p
	}
	put := func(name string, data []byte) error { return writeFile(path(name), data) }

	var report, table, js, sweep, tol bytes.Buffer
	writeSynthReport(&report, res, false)
	an, err := networks.Analyze(d, networks.DefaultPositions)
	if err != nil {
		return err
	}
	writeAnalysis(&table, d, an)
	if err := printJSON(&js, an); err != nil {
		return err
	}
	sw, err := networks.Sweep(d, demoSources, nil, networks.Setting{networks.BlendKnob: networks.DefaultStudyBlend})
	if err != nil {
		return err
	}
	writeSweep(&sweep, d, sw)
	tr, err := networks.Tolerance(d, networks.ToleranceSpec{
		Parts: networks.PartTolerances(d, nil), Trials: 10000, Seed: 1, Tapers: networks.DefaultTaperTolerance, At: networks.Setting{networks.BlendKnob: networks.DefaultStudyBlend},
		CurveHz: networks.LogGrid(d.Band.From, d.Band.To, 40),
	})
	if err != nil {
		return err
	}
	writeTolerance(&tol, d, tr)

	for _, f := range []struct {
		name string
		data []byte
	}{
		{"targets.yaml", demoTargets},
		{"design.yaml", d.YAML()},
		{"synth.txt", report.Bytes()},
		{"analysis.txt", table.Bytes()},
		{"analysis.json", js.Bytes()},
		{"sweep.txt", sweep.Bytes()},
		{"tolerance.txt", tol.Bytes()},
	} {
		if err := put(f.name, f.data); err != nil {
			return err
		}
	}
	if err := plotSynth(res, nil, path("curves.png")); err != nil {
		return err
	}
	phase := &bode{Title: designTitle(d), Caption: describeDesign(d), Range: d.Band, Curves: designCurves(d, atSwept(d, networks.DefaultPositions...), true), Phase: true}
	if err := phase.render(path("curves-phase.svg")); err != nil {
		return err
	}
	if err := sweepPlot(d, sw, true, false, false).render(path("sweep.png")); err != nil {
		return err
	}
	if err := tolerancePlot(d, tr).render(path("tolerance.png")); err != nil {
		return err
	}
	if err := demoListen(d, path("listen.wav")); err != nil {
		return err
	}

	fmt.Fprintf(a.out, "Synthesis from the demo targets (an invented board):\n\n%s\n", report.String())
	fmt.Fprintf(a.out, "Analysis of the chosen design:\n\n%s\n", table.String())
	fmt.Fprintln(a.out, "wrote:")
	for _, w := range wrote {
		fmt.Fprintf(a.out, "  %s\n", w)
	}
	if !res.Met {
		return &unmetError{msg: unmetMessage(res)}
	}
	return nil
}

// demoTurnSeconds is how long the demo's knob turn lasts.
const demoTurnSeconds = 8

// demoListen writes the demo's sound: the built-in plucked phrase at 48 kHz
// while the blend knob turns from 0 to 1, peaking at −1 dBFS.
func demoListen(d *networks.Design, path string) error {
	x, err := audio.Signal("pluck", listenRate, demoTurnSeconds)
	if err != nil {
		return err
	}
	knobs := designKnobs(d)
	fs, _, err := audio.TurnFilters(func(pos float64) (audio.Response, []complex128, error) {
		knobs["blend"] = pos
		n, h, err := designAt(d, knobs)
		if err != nil {
			return nil, nil, err
		}
		poles, err := n.Poles()
		return h, poles, err
	}, listenRate)
	if err != nil {
		return err
	}
	parts := []audio.Part{{Source: &audio.Samples{SampleRate: listenRate, Data: x}, Filters: fs, TurnFrames: demoTurnSeconds * listenRate, Gap: listenGap}}
	measured, err := audio.Render(parts, 1, nil, nil)
	if err != nil {
		return err
	}
	gains := audio.Gains(measured, false, audio.Makeup{Auto: true})
	return writeStream(path, func(f *os.File) error {
		w := audio.NewWAVWriter(f, listenRate, 1, false)
		if _, err := audio.Render(parts, 1, gains, w.Write); err != nil {
			return err
		}
		return w.Close()
	})
}
