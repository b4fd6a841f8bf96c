package main

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"tonewright/networks"
)

var speed = flag.Bool("speed", false, "time tonewright against ngspice (TestSpeedAgainstNgspice)")

// TestSpeedAgainstNgspice times the same sweep in tonewright and in the
// ngspice simulator, like for like, and prints the ratios:
//
//   - whole processes: one design at 11 settings of one knob (0, 0.1, …,
//     1), 1000 points per decade over 20 Hz–20 kHz. tonewright runs
//     `analyze --knob K=… --points 1000 --csv FILE` (which also measures
//     every figure at each setting and prints a short table, thrown away);
//     ngspice runs one batch deck with no .ac or .print of its own whose
//     control block alters the knob's pot segments and runs one AC analysis
//     per setting, writing each to a file with wrdata. Both write their data
//     to files; runs alternate, best of 9.
//   - per point: one long sweep (300 001 points) against a short one (301
//     points) of each tool, at one setting, the difference divided by the
//     difference in points, so that start-up is subtracted.
//
// It runs on the demo (blend) design and the invented three-knob stack
// chain (testdata/examples/stack-chain.yaml).
//
//	go test ./cmd/tonewright -run TestSpeedAgainstNgspice -speed -v
func TestSpeedAgainstNgspice(t *testing.T) {
	if !*speed {
		t.Skip("timing comparison: run with -speed")
	}
	networks.RequireNgspice(t)
	dir := t.TempDir()
	bin := filepath.Join(dir, "tonewright")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	for _, tc := range []struct{ file, knob string }{
		{demoFile, networks.BlendKnob},
		{filepath.Join(top, "examples", "stack-chain.yaml"), "treble"},
	} {
		d, err := networks.LoadDesign(tc.file)
		if err != nil {
			t.Fatal(err)
		}
		sweepDeck := func(positions []float64, points string, data func(i int) string) string {
			var control strings.Builder
			control.WriteString(".control\nset wr_singlescale\n")
			for i, p := range positions {
				for _, pot := range d.Network(networks.Setting{tc.knob: p}).Pots {
					if pot.Pot.Position != p || (pot.Name != tc.knob && !(tc.knob == networks.BlendKnob && pot.Name == "Ptone")) {
						continue
					}
					a, b := pot.Pot.Segments()
					fmt.Fprintf(&control, "alter R_%s_a = %s\nalter R_%s_b = %s\n", pot.Name, networks.SPICEValue(a), pot.Name, networks.SPICEValue(b))
				}
				fmt.Fprintf(&control, "ac %s\nwrdata %s v(out)\n", points, data(i))
			}
			control.WriteString(".endc\n")
			var deck strings.Builder
			if err := d.Network(networks.Setting{tc.knob: positions[0]}).WriteSPICE(&deck, "speed comparison", d.Band, 1000); err != nil {
				t.Fatal(err)
			}
			var kept []string
			for _, l := range strings.SplitAfter(deck.String(), "\n") {
				if strings.HasPrefix(l, ".ac ") || strings.HasPrefix(l, ".print ") || strings.HasPrefix(l, "* vdb") {
					continue // like for like: only the control block's sweeps
				}
				kept = append(kept, l)
			}
			return strings.Replace(strings.Join(kept, ""), ".end\n", control.String()+".end\n", 1)
		}
		write := func(name, text string) string {
			p := filepath.Join(dir, name)
			if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
				t.Fatal(err)
			}
			return p
		}
		var positions []float64
		var labels []string
		for i := 0; i <= 10; i++ {
			positions = append(positions, float64(i)/10)
			labels = append(labels, posLabel(float64(i)/10))
		}
		cir := write("sweep.cir", sweepDeck(positions, "dec 1000 20 20000", func(i int) string { return filepath.Join(dir, fmt.Sprintf("ng%d.txt", i)) }))
		csv := filepath.Join(dir, "tw.csv")
		twCmd := func(points string) *exec.Cmd {
			return exec.Command(bin, "analyze", tc.file, "--knob", tc.knob+"="+strings.Join(labels, ","), "--points", points, "--csv", csv)
		}
		tt, tn := interleaved(t, 9, func() *exec.Cmd { return twCmd("1000") }, func() *exec.Cmd { return exec.Command("ngspice", "-b", cir) })
		for i := range positions {
			if st, err := os.Stat(filepath.Join(dir, fmt.Sprintf("ng%d.txt", i))); err != nil || st.Size() < 3000*30 {
				t.Fatalf("ngspice sweep %d missing or short: %v", i, err)
			}
		}
		t.Logf("%s: %s at 11 settings × 3001 points, whole processes, best of 9: tonewright %v, ngspice %v: ngspice takes %.1f× as long",
			d.Name, tc.knob, tt, tn, float64(tn)/float64(tt))

		// Per point: one setting, a long and a short sweep of each.
		one := []float64{0.5}
		long := write("long.cir", sweepDeck(one, "dec 100000 20 20000", func(int) string { return filepath.Join(dir, "long.txt") }))
		short := write("short.cir", sweepDeck(one, "dec 100 20 20000", func(int) string { return filepath.Join(dir, "short.txt") }))
		oneCmd := func(points string) func() *exec.Cmd {
			return func() *exec.Cmd {
				return exec.Command(bin, "analyze", tc.file, "--knob", tc.knob+"=0.5", "--points", points, "--csv", csv)
			}
		}
		twLong, ngLong := interleaved(t, 3, oneCmd("100000"), func() *exec.Cmd { return exec.Command("ngspice", "-b", long) })
		twShort, ngShort := interleaved(t, 3, oneCmd("100"), func() *exec.Cmd { return exec.Command("ngspice", "-b", short) })
		n := float64(300001 - 301)
		pt, pn := float64(twLong-twShort)/n, float64(ngLong-ngShort)/n
		t.Logf("%s: per point on one long sweep, start-up subtracted: tonewright %.0f ns (CSV writing included), ngspice %.0f ns: %.1f×",
			d.Name, pt, pn, pn/pt)
	}
}

// interleaved runs a and b in turn n times each and returns the best time
// of each, as whole processes from start to exit. ngspice exits 1 after a
// batch run whose analyses are all in a control block, so only a's errors
// count.
func interleaved(t *testing.T, n int, a, b func() *exec.Cmd) (ta, tb time.Duration) {
	t.Helper()
	run := func(c *exec.Cmd, check bool) time.Duration {
		t0 := time.Now()
		out, err := c.CombinedOutput()
		el := time.Since(t0)
		if err != nil && check {
			t.Fatalf("%v: %v\n%s", c.Args, err, out)
		}
		return el
	}
	ta, tb = time.Duration(1<<62), time.Duration(1<<62)
	for i := 0; i < n; i++ {
		ta = min(ta, run(a(), true))
		tb = min(tb, run(b(), false))
	}
	return ta, tb
}
