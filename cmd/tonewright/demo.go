package main

import (
	"bytes"
	_ "embed"
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"tonewright/networks"
)

func init() { register(newDemoCmd) }

// demoDesign is the embedded demo scenario, invented for this tool.
//
//go:embed demodata/design.yaml
var demoDesign []byte

func newDemoCmd(a *app) *cobra.Command {
	return &cobra.Command{
		Use:   "demo [DIR]",
		Short: "Run the whole job on an embedded demo board and write the results to DIR",
		Long: `demo runs tonewright end to end on an invented demo scenario (a fuzz-style
board whose gain stage has 6.8 kΩ output impedance, driving a 100 kΩ
audio-taper level pot into a 1 MΩ amplifier input). It writes the design,
the analysis table and the plots into DIR (default ./tonewright-demo) and
prints what it wrote.`,
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

func runDemo(a *app, dir string) error {
	d, err := networks.ParseDesign(demoDesign, "demo design")
	if err != nil {
		return fmt.Errorf("embedded demo design: %w", err)
	}
	var wrote []string
	put := func(name string, data []byte) error {
		p := filepath.Join(dir, name)
		if err := writeFile(p, data); err != nil {
			return err
		}
		wrote = append(wrote, p)
		return nil
	}
	if err := put("design.yaml", demoDesign); err != nil {
		return err
	}
	an, err := networks.Analyze(d, networks.DefaultPositions)
	if err != nil {
		return err
	}
	var table bytes.Buffer
	writeAnalysis(&table, d, an)
	if err := put("analysis.txt", table.Bytes()); err != nil {
		return err
	}
	var js bytes.Buffer
	if err := printJSON(&js, an); err != nil {
		return err
	}
	if err := put("analysis.json", js.Bytes()); err != nil {
		return err
	}
	for _, pl := range []struct {
		name  string
		phase bool
	}{{"curves.png", false}, {"curves-phase.svg", true}} {
		b := &bode{Title: designTitle(d), Caption: describeDesign(d), Range: d.Band, Curves: designCurves(d, networks.DefaultPositions, pl.phase), Phase: pl.phase}
		p := filepath.Join(dir, pl.name)
		if err := b.render(p); err != nil {
			return err
		}
		wrote = append(wrote, p)
	}
	fmt.Fprintf(a.out, "%s\n", table.String())
	fmt.Fprintln(a.out, "wrote:")
	for _, w := range wrote {
		fmt.Fprintf(a.out, "  %s\n", w)
	}
	return nil
}
