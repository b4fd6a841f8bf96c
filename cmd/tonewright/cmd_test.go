package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// top is the repository's testdata directory.
const top = "../../testdata"

// tw runs the command line through the cobra root as main does.
func tw(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	code = run(args, &o, &e)
	if strings.Contains(e.String(), "panic") || strings.Contains(e.String(), "goroutine ") {
		t.Fatalf("%v: panic output:\n%s", args, e.String())
	}
	return code, o.String(), e.String()
}

// golden compares got with testdata/golden/name, rewriting it with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	p := filepath.Join(top, "golden", name)
	if *update {
		if err := os.WriteFile(p, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(p)
	if err != nil {
		t.Fatalf("%v (run go test ./cmd/tonewright -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("output differs from %s (run with -update if the change is right):\n--- got\n%s--- want\n%s", p, got, want)
	}
}

func writeTemp(t *testing.T, name, text string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

var (
	demoFile    = filepath.Join(top, "demo-design.yaml")
	exampleFile = filepath.Join(top, "example-board.yaml") // hand-made, fixed
)

func TestAnalyzeTable(t *testing.T) {
	code, out, errs := tw(t, "analyze", demoFile)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	golden(t, "analyze-demo.txt", out)
}

func TestAnalyzeJSON(t *testing.T) {
	code, out, errs := tw(t, "analyze", demoFile, "--json", "--positions", "0,0.5,1")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var v struct {
		Name      string `json:"name"`
		Positions []struct {
			Blend    *float64 `json:"blend"`
			Gain1kDB *float64 `json:"gain_1k_db"`
			Scoop    *struct {
				Hz        *float64 `json:"hz"`
				DepthDB   *float64 `json:"depth_db"`
				BalanceDB *float64 `json:"balance_db"`
			} `json:"scoop"`
		} `json:"positions"`
		CornerHz           *float64 `json:"corner_hz"`
		InputImpedanceOhm  *float64 `json:"input_impedance_ohm"`
		OutputImpedanceOhm *float64 `json:"output_impedance_ohm"`
	}
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	if v.Name == "" || len(v.Positions) != 3 || v.CornerHz == nil || v.InputImpedanceOhm == nil || v.OutputImpedanceOhm == nil {
		t.Fatalf("JSON lacks keys: %s", out)
	}
	if p := v.Positions[1]; p.Blend == nil || *p.Blend != 0.5 || p.Gain1kDB == nil || p.Scoop == nil || p.Scoop.Hz == nil || p.Scoop.DepthDB == nil || p.Scoop.BalanceDB == nil {
		t.Fatalf("position 0.5 lacks keys: %s", out)
	}
	if !strings.Contains(out, `"scoop": null`) {
		t.Errorf("knob 0 of the demo should have no scoop (null): %s", out)
	}
}

func TestAnalyzeCSV(t *testing.T) {
	p := filepath.Join(t.TempDir(), "c.csv")
	code, _, errs := tw(t, "analyze", demoFile, "--positions", "0,1", "--csv", p)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if lines[0] != "hz,db_at_0,deg_at_0,db_at_1,deg_at_1" || len(lines) < 300 {
		t.Errorf("csv header %q, %d lines", lines[0], len(lines))
	}
	if !strings.HasPrefix(lines[1], "20,") {
		t.Errorf("first row %q", lines[1])
	}
}

func TestPlotFiles(t *testing.T) {
	dir := t.TempDir()
	for _, name := range []string{"a.png", "b.svg"} {
		p := filepath.Join(dir, name)
		code, out, errs := tw(t, "plot", demoFile, "-o", p, "--phase")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", name, code, errs)
		}
		b, err := os.ReadFile(p)
		if err != nil || len(b) < 1000 {
			t.Fatalf("%s: %v, %d bytes", name, err, len(b))
		}
		if name == "a.png" && !bytes.HasPrefix(b, []byte("\x89PNG")) {
			t.Error("not a PNG")
		}
		if name == "b.svg" && !bytes.Contains(b[:200], []byte("<svg")) {
			t.Error("not an SVG")
		}
		if !strings.Contains(out, p) {
			t.Errorf("output %q does not say what it wrote", out)
		}
	}
	leftovers, _ := filepath.Glob(filepath.Join(dir, ".*tmp*"))
	if len(leftovers) > 0 {
		t.Errorf("temporary files left: %v", leftovers)
	}
}

func TestSnap(t *testing.T) {
	code, out, _ := tw(t, "snap", "5k")
	if code != 0 {
		t.Fatal(code)
	}
	golden(t, "snap-5k.txt", out)
	code, out, _ = tw(t, "snap", "4k", "--series", "E12", "--json")
	if code != 0 {
		t.Fatal(code)
	}
	var v map[string]any
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	// E12 around 4k: 3.9k and 4.7k (IEC 60063, from memory); 3.9k is nearer
	// in log space.
	if v["value"] != 4000.0 || v["series"] != "E12" || v["nearest"] != 3900.0 || v["below"] != 3900.0 || v["above"] != 4700.0 {
		t.Errorf("snap JSON %v", v)
	}
	if e, ok := v["error_pct"].(float64); !ok || e > -2.49 || e < -2.51 {
		t.Errorf("error_pct %v, want -2.5", v["error_pct"])
	}
}

func TestNetlistDeck(t *testing.T) {
	code, out, _ := tw(t, "netlist", demoFile, "--blend", "0.25")
	if code != 0 {
		t.Fatal(code)
	}
	golden(t, "netlist-demo.cir", out)
	for _, want := range []string{"V1 src 0 DC 0 AC 1", ".ac dec 100 2e+01 2e+04", "Rload out 0 1e+06"} {
		if !strings.Contains(out, want) {
			t.Errorf("deck lacks %q", want)
		}
	}
	for _, line := range strings.Split(out, "\n") {
		if strings.HasPrefix(line, "*") || line == "" {
			continue
		}
		for _, bad := range []string{"k ", "M ", "n ", "u ", "p "} {
			if strings.HasSuffix(line+" ", bad) {
				t.Errorf("deck line %q uses a prefix", line)
			}
		}
	}
}

func TestDemoWritesFiles(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "demo")
	code, out, errs := tw(t, "demo", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, f := range []string{"targets.yaml", "design.yaml", "synth.txt", "analysis.txt", "analysis.json", "sweep.txt", "tolerance.txt", "curves.png", "curves-phase.svg", "sweep.png", "tolerance.png", "listen.wav"} {
		p := filepath.Join(dir, f)
		if _, err := os.Stat(p); err != nil {
			t.Errorf("demo did not write %s", f)
		}
		if !strings.Contains(out, p) {
			t.Errorf("demo output does not list %s", p)
		}
	}
	// What it prints before the list of files is kept in a golden file.
	golden(t, "demo.txt", out[:strings.Index(out, "wrote:")])
	// The design it wrote is the committed demo design, and a valid input
	// for the other commands.
	if got, want := mustRead(t, filepath.Join(dir, "design.yaml")), mustRead(t, demoFile); !bytes.Equal(got, want) && !*update {
		t.Errorf("the demo's design differs from %s: regenerate it with the command in DEVELOPERS.md", demoFile)
	} else if *update {
		if err := os.WriteFile(demoFile, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if code, _, errs := tw(t, "analyze", filepath.Join(dir, "design.yaml")); code != 0 {
		t.Errorf("analyze of the demo's design: exit %d %s", code, errs)
	}
}

// Bad input: a clear message and exit 2, never a panic.
func TestBadInput(t *testing.T) {
	dir := t.TempDir()
	empty := writeTemp(t, "empty.yaml", "")
	neg := writeTemp(t, "neg.yaml", strings.Replace(string(mustRead(t, exampleFile)), "r: 27k", "r: -27k", 1))
	band := writeTemp(t, "band.yaml", strings.Replace(string(mustRead(t, exampleFile)), "band: {from: 20, to: 20k}", "band: {from: 20k, to: 20}", 1))
	nan := writeTemp(t, "nan.yaml", strings.Replace(string(mustRead(t, exampleFile)), "c: 12n", "c: NaN", 1))
	inf := writeTemp(t, "inf.yaml", strings.Replace(string(mustRead(t, exampleFile)), "c: 12n", "c: Inf", 1))
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"analyze", filepath.Join(dir, "missing.yaml")}, "missing.yaml"},
		{[]string{"analyze", empty}, "empty"},
		{[]string{"analyze", dir}, "directory"},
		{[]string{"analyze", neg}, "tone.lowpass.r"},
		{[]string{"analyze", band}, "band"},
		{[]string{"analyze", nan}, "tone.lowpass.c"},
		{[]string{"analyze", inf}, "tone.lowpass.c"},
		{[]string{"analyze", demoFile, "--positions", "0,1.2"}, "0 to 1"},
		{[]string{"analyze", demoFile, "--positions", "x"}, "--positions"},
		{[]string{"analyze", demoFile, "--positions", "NaN"}, "--positions"},
		{[]string{"analyze"}, "DESIGN.yaml"},
		{[]string{"analyze", demoFile, "--nonsense"}, "unknown flag"},
		{[]string{"frobnicate"}, "unknown command"},
		{[]string{"plot", demoFile}, "-o"},
		{[]string{"plot", demoFile, "-o", filepath.Join(dir, "x.gif")}, ".png or .svg"},
		{[]string{"plot", demoFile, "-o", dir + "/"}, ".png or .svg"},
		{[]string{"plot", demoFile, "-o", demoFile}, ".png or .svg"},
		{[]string{"analyze", demoFile, "--csv", dir}, "directory"},
		{[]string{"analyze", demoFile, "--csv", demoFile}, "input file"},
		{[]string{"analyze", demoFile, "--csv", filepath.Join(dir, "no-such-dir", "c.csv")}, "does not exist"},
		{[]string{"synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "10nF"}, "this flag takes a value in Hz (or no unit)"},
		{[]string{"synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--source", "10nF"}, "--source"},
		{[]string{"sweep", exampleFile, "--load", "10nF"}, "in F"},
		{[]string{"snap", "4x7"}, `"4x7"`},
		{[]string{"snap", "--", "-1k"}, "positive"},
		{[]string{"snap", "1k", "--series", "E7"}, "E24"},
		{[]string{"netlist", demoFile, "--blend", "2"}, "0..1"},
		{[]string{"demo", demoFile}, "not a directory"},
	} {
		code, _, errs := tw(t, tc.args...)
		if code != 2 {
			t.Errorf("%v: exit %d, want 2 (%s)", tc.args, code, errs)
			continue
		}
		if !strings.Contains(errs, tc.want) {
			t.Errorf("%v: message %q lacks %q", tc.args, errs, tc.want)
		}
	}
}

// A plot over a directory, or over a PNG-named directory, is refused.
func TestRefuseDirectoryOutput(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "x.png")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	code, _, errs := tw(t, "plot", demoFile, "-o", dir)
	if code != 2 || !strings.Contains(errs, "directory") {
		t.Errorf("exit %d %s", code, errs)
	}
}

// An output given through a symbolic link replaces the file the link
// points to and keeps the link.
func TestWriteFollowsSymlink(t *testing.T) {
	dir := t.TempDir()
	real, link := filepath.Join(dir, "real.csv"), filepath.Join(dir, "link.csv")
	if err := os.WriteFile(real, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(real, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	if code, _, errs := tw(t, "analyze", exampleFile, "--csv", link); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if st, err := os.Lstat(link); err != nil || st.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link was replaced: %v", err)
	}
	if b := mustRead(t, real); !bytes.HasPrefix(b, []byte("hz,")) {
		t.Errorf("the linked file was not written: %q", b[:min(len(b), 20)])
	}
}

func mustRead(t *testing.T, p string) []byte {
	t.Helper()
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestHelpHasExamples(t *testing.T) {
	a := &app{out: &bytes.Buffer{}, err: &bytes.Buffer{}}
	for _, c := range newRoot(a).Commands() {
		if c.Name() == "help" || c.Name() == "completion" {
			continue
		}
		if c.Example == "" {
			t.Errorf("command %s has no example in its help", c.Name())
		}
	}
	code, out, _ := tw(t, "completion", "bash")
	if code != 0 || !strings.Contains(out, "tonewright") {
		t.Errorf("completion: exit %d", code)
	}
}

// The README shows the real tables of the demo: the synthesis and the
// analysis of the chosen design.
func TestReadmeShowsRealTables(t *testing.T) {
	readme := string(mustRead(t, "../../README.md"))
	for _, g := range []string{"analyze-demo.txt", "demo-synth.txt", "listen-demo.txt"} {
		want := string(mustRead(t, filepath.Join(top, "golden", g)))
		if !strings.Contains(readme, "```text\n"+want+"```") {
			t.Errorf("README differs from testdata/golden/%s: paste the golden file into it", g)
		}
	}
}

// The synth part of the demo's output, as the README shows it.
func TestDemoSynthTable(t *testing.T) {
	code, out, errs := tw(t, "synth", "demodata/targets.yaml")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	golden(t, "demo-synth.txt", out)
}
