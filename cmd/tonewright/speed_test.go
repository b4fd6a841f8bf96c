package main

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"tonewright/networks"
)

var speed = flag.Bool("speed", false, "time tonewright against ngspice (TestSpeedAgainstNgspice)")

// TestSpeedAgainstNgspice times one sweep in both tools on this machine in
// one run and prints the ratio: the demo chain, 1000 points per decade over
// 20 Hz–20 kHz, at 11 blend knob positions (0, 0.1, …, 1). tonewright runs
// `analyze --csv --points 1000` (which also measures every position);
// ngspice runs one batch deck that alters the blend pot's two segments and
// repeats its AC analysis for each position, writing every sweep to a file.
// Both are whole processes, timed from start to exit, best of five.
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
	d, err := networks.LoadDesign(demoFile)
	if err != nil {
		t.Fatal(err)
	}
	var positions []string
	var control strings.Builder
	control.WriteString(".control\nset wr_singlescale\n")
	for i := 0; i <= 10; i++ {
		p := float64(i) / 10
		positions = append(positions, posLabel(p))
		c := d.Chain(p)
		a, b := c.Blend.Pot.Segments()
		fmt.Fprintf(&control, "alter R_Ptone_a = %s\nalter R_Ptone_b = %s\nac dec 1000 20 20000\nwrdata %s v(out)\n",
			networks.SPICEValue(a), networks.SPICEValue(b), filepath.Join(dir, fmt.Sprintf("ng%d.txt", i)))
	}
	control.WriteString(".endc\n")
	ch := d.Chain(0)
	var deck strings.Builder
	if err := ch.Network().WriteSPICE(&deck, "speed comparison", d.Band, 1000); err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(deck.String(), ".end\n", control.String()+".end\n", 1)
	cir := filepath.Join(dir, "deck.cir")
	if err := os.WriteFile(cir, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	best := func(name string, cmd func() *exec.Cmd) time.Duration {
		var ts []time.Duration
		for i := 0; i < 5; i++ {
			c := cmd()
			t0 := time.Now()
			out, err := c.CombinedOutput()
			el := time.Since(t0)
			if err != nil && name == "tonewright" {
				t.Fatalf("%s: %v\n%s", name, err, out)
			}
			ts = append(ts, el)
		}
		sort.Slice(ts, func(i, j int) bool { return ts[i] < ts[j] })
		return ts[0]
	}
	csv := filepath.Join(dir, "tw.csv")
	tt := best("tonewright", func() *exec.Cmd {
		return exec.Command(bin, "analyze", demoFile, "--positions", strings.Join(positions, ","), "--points", "1000", "--csv", csv)
	})
	// ngspice exits 1 after a batch run whose analyses are all in a control
	// block; check the data it wrote instead.
	tn := best("ngspice", func() *exec.Cmd { return exec.Command("ngspice", "-b", cir) })
	for i := 0; i <= 10; i++ {
		if st, err := os.Stat(filepath.Join(dir, fmt.Sprintf("ng%d.txt", i))); err != nil || st.Size() < 3000*30 {
			t.Fatalf("ngspice sweep %d missing or short: %v", i, err)
		}
	}
	t.Logf("sweep of 11 positions × 3001 points: tonewright %v, ngspice %v: ngspice takes %.1f× as long", tt, tn, float64(tn)/float64(tt))
}
