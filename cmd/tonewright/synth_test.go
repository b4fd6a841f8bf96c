package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/eseries"
	"tonewright/networks"
)

// synthTargets is an invented scenario: a 700 Hz scoop behind a 4.7k stage.
const synthTargets = `name: invented mid scoop
targets:
  scoop: {hz: 700, depth_db: -8, balance_db: 0, at: 0.5}
  corner_hz: 9k
source: {impedance: 4.7k}
load: {r: 1M, c: 0}
filters: 2
`

// synthBoard is an invented existing board for re-voicing.
const synthBoard = `name: invented test board
source: {impedance: 6.8k}
tone:
  network: blend
  lowpass:  {r: 33k, c: 10n}
  highpass: {c: 2.2n, r: 33k}
  pot: {value: 100k, taper: linear}
filters:
  - {r: 10k, c: 1n}
  - {r: 10k, c: 1n}
load: {r: 1M, c: 0}
`

func TestSynthTargetsFile(t *testing.T) {
	in := writeTemp(t, "voice.yaml", synthTargets)
	out := filepath.Join(filepath.Dir(in), "board.yaml")
	png := filepath.Join(filepath.Dir(in), "board.png")
	code, stdout, stderr := tw(t, "synth", in, "-o", out, "--plot", png)
	if code != 0 {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	for _, want := range []string{"lowpass.r", "blend low-pass leg R", "E24", "E12", "common pots",
		"scoop frequency (knob 0.5)", "corner (knob 1)", "design written to " + out} {
		if !strings.Contains(stdout, want) {
			t.Errorf("report lacks %q:\n%s", want, stdout)
		}
	}
	if stderr != "" {
		t.Errorf("stderr not empty (no progress when not a terminal): %q", stderr)
	}
	// The written design is a design file the other commands take.
	d, err := networks.LoadDesign(out)
	if err != nil {
		t.Fatalf("written design: %v", err)
	}
	for _, p := range d.Parts() {
		var s eseries.Set = eseries.E24
		if p.Kind == networks.PartCapacitor {
			s = eseries.E12
		}
		if p.Kind != networks.PartPot && !eseries.Contains(s, p.Value) {
			t.Errorf("%s = %s is not in %s", p.Name, eseries.Format(p.Value), s)
		}
	}
	if code, _, errs := tw(t, "analyze", out); code != 0 {
		t.Errorf("analyze of the written design: exit %d %s", code, errs)
	}
	if st, err := os.Stat(png); err != nil || st.Size() < 1000 {
		t.Errorf("plot: %v", err)
	}
}

func TestSynthJSON(t *testing.T) {
	code, stdout, stderr := tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--source", "4.7k", "--json")
	if code != 0 {
		t.Fatalf("exit %d %s", code, stderr)
	}
	var v map[string]json.RawMessage
	if err := json.Unmarshal([]byte(stdout), &v); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"targets", "ideal", "design", "achieved"} {
		if _, ok := v[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	var d struct {
		Name   string `json:"name"`
		Band   struct{ From, To float64 }
		Source struct {
			Impedance float64 `json:"impedance"`
		} `json:"source"`
		Tone struct {
			Network string `json:"network"`
			Pot     struct {
				Value float64 `json:"value"`
				Taper string  `json:"taper"`
			} `json:"pot"`
		} `json:"tone"`
		Filters []struct{ R, C float64 } `json:"filters"`
		Load    struct {
			R any `json:"r"`
		} `json:"load"`
	}
	if err := json.Unmarshal(v["design"], &d); err != nil {
		t.Fatal(err)
	}
	if d.Source.Impedance != 4700 || d.Tone.Network != "blend" || d.Tone.Pot.Taper != "linear" || len(d.Filters) != 2 || d.Band.To != 20000 {
		t.Errorf("design JSON %+v", d)
	}
	var a networks.Analysis
	if err := json.Unmarshal(v["achieved"], &a); err != nil || len(a.Positions) != 5 || a.CornerHz == nil {
		t.Errorf("achieved %+v %v", a, err)
	}
	var tg struct {
		Scoop struct {
			Hz, At float64
		} `json:"scoop"`
		CornerHz float64 `json:"corner_hz"`
	}
	if err := json.Unmarshal(v["targets"], &tg); err != nil || tg.Scoop.Hz != 700 || tg.Scoop.At != 0.5 || tg.CornerHz != 9000 {
		t.Errorf("targets %s", v["targets"])
	}
}

// Re-voicing names the one capacitor to swap.
func TestSynthRevoice(t *testing.T) {
	board := writeTemp(t, "board.yaml", synthBoard)
	moved := writeTemp(t, "moved.yaml", strings.Replace(synthBoard, "c: 10n", "c: 15n", 1))
	d, err := networks.LoadDesign(moved)
	if err != nil {
		t.Fatal(err)
	}
	an, err := networks.Analyze(d, []float64{0.5})
	if err != nil {
		t.Fatal(err)
	}
	s := an.Positions[0].Scoop
	f := func(v float64) string { return eseries.FormatSig(v, 17) }
	code, stdout, stderr := tw(t, "synth", "--from", board, "--max-changes", "1",
		"--scoop-hz", f(s.Hz), "--depth", f(s.DepthDB), "--balance", f(s.BalanceDB), "--corner", f(*an.CornerHz))
	if code != 0 {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	if !strings.Contains(stdout, "swap 1 part:\n  lowpass.c (blend low-pass leg C): 10 nF → 15 nF") {
		t.Errorf("report does not name the capacitor:\n%s", stdout)
	}
}

// Unreachable targets: a report of the nearest achievable figures, the
// design still written, exit 3.
func TestSynthInfeasible(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "best.yaml")
	code, stdout, stderr := tw(t, "synth", "--scoop-hz", "800", "--depth", "-8", "--balance", "30", "--corner", "10k", "--source", "1k", "-o", out)
	if code != 3 {
		t.Fatalf("exit %d, want 3\n%s%s", code, stdout, stderr)
	}
	for _, want := range []string{"not met:", "scoop balance: wanted +30.0 dB", "nearest found with ideal parts",
		"chosen: no design of allowed values is within tolerance",
		"targets kept first: scoop frequency and corner, then depth, then balance (the default; --priority changes it)",
		"no design within the tolerance was found in", "starts (physics seeds, random starts over every part, each pot value)",
		"scoop balance: wanted +30.0 dB; the nearest that keeps the scoop frequency at 800 Hz, scoop depth at -8.0 dB and corner at 10 kHz is"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("report lacks %q:\n%s", want, stdout)
		}
	}
	if strings.Contains(stdout, "ask for more than") || strings.Contains(stdout, "impossible") {
		t.Errorf("the report claims more than the search shows:\n%s", stdout)
	}
	if !strings.Contains(stderr, "targets not met:") || !strings.Contains(stderr, "balance") {
		t.Errorf("stderr %q", stderr)
	}
	if _, err := networks.LoadDesign(out); err != nil {
		t.Errorf("best design not written: %v", err)
	}
}

// A stock file is honoured.
func TestSynthStock(t *testing.T) {
	stock := writeTemp(t, "stock.yaml", "resistors: [1k, 2.2k, 4.7k, 10k, 22k, 47k, 100k, 220k, 470k, 1M]\ncapacitors: [220p, 470p, 1n, 2.2n, 4.7n, 10n, 22n, 47n]\npots: [100k, 250k]\n")
	code, stdout, stderr := tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--source", "4.7k", "--stock", stock, "--json")
	if code != 0 && code != 3 {
		t.Fatalf("exit %d %s", code, stderr)
	}
	var v struct {
		Parts []struct {
			Name   string  `json:"name"`
			Chosen float64 `json:"chosen"`
			From   string  `json:"from"`
		} `json:"parts"`
	}
	if err := json.Unmarshal([]byte(stdout), &v); err != nil {
		t.Fatal(err)
	}
	st, _ := os.ReadFile(stock)
	for _, p := range v.Parts {
		if p.From != "stock" || !strings.Contains(string(st), eseries.Format(p.Chosen)) {
			t.Errorf("%s = %s from %s: not from the stock file", p.Name, eseries.Format(p.Chosen), p.From)
		}
	}
}

// Bad input: exit 2 with a message naming the file, line, key or flag and
// the accepted forms; nothing written.
func TestSynthBadInput(t *testing.T) {
	dir := t.TempDir()
	bad := writeTemp(t, "bad.yaml", "targets:\n  scoop: {hz: 800, depth_db: -10}\n  corner_hz: fast\n")
	board := writeTemp(t, "board.yaml", synthBoard)
	out := filepath.Join(dir, "out.yaml")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"synth", bad, "-o", out}, "bad.yaml:3: targets.corner_hz:"},
		{[]string{"synth", "--scoop-hz", "800"}, "targets.scoop: a fresh synthesis needs the scoop's frequency and depth"},
		{[]string{"synth", "--scoop-hz", "loud", "--depth", "-10", "--corner", "5k"}, "--scoop-hz:"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "10", "--corner", "5k"}, "--depth 10: a scoop's depth is negative"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "--resistors", "E25"}, "--resistors \"E25\": give a series (E3, E6"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "--at", "2"}, "--at: knob position 2 is outside 0..1"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "1e30"}, "--corner 1e30: 1e30 Hz lies outside what the corner can measure"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "250k"}, "--corner 250k: 250 kHz lies outside what the corner can measure (20 Hz to 10 × band high = 200 kHz)"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "--prefer", "cheap"}, "--prefer \"cheap\": give closest"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "--priority", "treble"}, "--priority \"treble\":"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "--plot", filepath.Join(dir, "x.gif")}, "must end in .png or .svg"},
		{[]string{"synth", "--scoop-hz", "800", "--depth", "-10", "--corner", "5k", "-o", dir}, "is a directory"},
		{[]string{"synth", "--from", board, "--free", "lowpass.x"}, `free: unknown part "lowpass.x": this design's parts are lowpass.r`},
		{[]string{"synth", "--free", "lowpass.r", "--scoop-hz", "800"}, "give it with --from"},
		{[]string{"synth", "--from", board, "-o", board}, "refusing to write over it"},
		{[]string{"synth", "a.yaml", "b.yaml"}, "takes at most one TARGETS.yaml"},
	} {
		code, _, stderr := tw(t, c.args...)
		if code != 2 || !strings.Contains(stderr, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args[1:], code, stderr, c.want)
		}
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("%s written despite bad input", out)
	}
}

// The misses are blamed on their cause: the change limit (with the swaps
// that meet the targets without it), or the stock (invented boards and
// stock).
func TestSynthUnmetCause(t *testing.T) {
	bare := writeTemp(t, "bare.yaml", strings.Replace(synthBoard, "filters:\n  - {r: 10k, c: 1n}\n  - {r: 10k, c: 1n}\n", "", 1))
	code, stdout, stderr := tw(t, "synth", "--from", bare, "--scoop-hz", "800", "--max-changes", "1")
	if code != 3 || !strings.Contains(stdout, "not reachable with at most 1 change (--max-changes 1);") ||
		!strings.Contains(stdout, "changes meet every target:") || !strings.Contains(stderr, "not reachable with at most 1 change") ||
		strings.Contains(stdout, "ask for more than the network") {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
	stock := writeTemp(t, "drawer.yaml", "resistors: [1k, 100k, 1M]\ncapacitors: [100p, 100n]\n")
	code, stdout, stderr = tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--stock", stock)
	if code != 3 || !strings.Contains(stdout, "the stocked parts miss: the values in "+stock) || !strings.Contains(stderr, stock) {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
}

// Small things: a design file given as TARGETS gets a hint; an unnamed
// targets file names the design; a corner without sections or load
// capacitance is bad input; checks use the tool's JSON keys.
func TestSynthInputHints(t *testing.T) {
	board := writeTemp(t, "board.yaml", synthBoard)
	code, _, stderr := tw(t, "synth", board)
	if code != 2 || !strings.Contains(stderr, `unknown key "tone"`) || !strings.Contains(stderr, "this looks like a design file: re-voice it with --from "+board) {
		t.Errorf("exit %d %s", code, stderr)
	}
	voice := writeTemp(t, "my-voice.yaml", strings.Replace(synthTargets, "name: invented mid scoop\n", "", 1))
	code, stdout, stderr := tw(t, "synth", voice)
	if code != 0 || !strings.HasPrefix(stdout, "my-voice: ") {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
	code, _, stderr = tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--filters", "0")
	if code != 2 || !strings.Contains(stderr, "--corner 9k:") || !strings.Contains(stderr, "--corner") ||
		!strings.Contains(stderr, "needs at least one filter section or a load capacitance") {
		t.Errorf("exit %d %s", code, stderr)
	}
	code, stdout, stderr = tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k", "--source", "4.7k", "--json")
	if code != 0 {
		t.Fatalf("exit %d %s", code, stderr)
	}
	var v struct {
		Checks []map[string]any `json:"checks"`
	}
	if err := json.Unmarshal([]byte(stdout), &v); err != nil || len(v.Checks) != 4 {
		t.Fatalf("%v %s", err, stdout)
	}
	for _, c := range v.Checks {
		keys := []string{"name", "key", "unit", "wanted", "ideal", "achieved", "met", "ideal_met", "error_pct", "ideal_error_pct"}
		if c["unit"] == "dB" {
			keys[8], keys[9] = "error_db", "ideal_error_db"
		}
		for _, k := range keys {
			if _, ok := c[k]; !ok {
				t.Errorf("check %v lacks %q", c, k)
			}
		}
	}
}

// The CSV analyze --csv writes is a valid curve target: the invented test
// board with its low-pass leg capacitor at 15 nF gives the curve, and the
// board as it is, that capacitor free, is fitted back to it; a list form
// of targets re-voices by figures at knob settings.
func TestSynthCurveAndList(t *testing.T) {
	dir := t.TempDir()
	board := writeTemp(t, "board.yaml", synthBoard)
	moved := writeTemp(t, "moved.yaml", strings.Replace(synthBoard, "c: 10n", "c: 15n", 1))
	csvPath := filepath.Join(dir, "moved.csv")
	if code, _, stderr := tw(t, "analyze", moved, "--csv", csvPath); code != 0 {
		t.Fatalf("analyze: exit %d %s", code, stderr)
	}
	code, stdout, stderr := tw(t, "synth", "--from", board, "--free", "lowpass.c", "--curve", csvPath)
	if code != 0 || !strings.Contains(stdout, "curve fit (blend=0.5): RMS 0.000 dB") || !strings.Contains(stdout, "lowpass.c (blend low-pass leg C): 10 nF → 15 nF") {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
	list := writeTemp(t, "list.yaml", "targets:\n  - {knobs: {blend: 1}, corner_hz: 8k}\n")
	code, stdout, stderr = tw(t, "synth", list, "--from", board, "--free", "filters.c")
	if code != 0 || !strings.Contains(stdout, "corner (blend=1)") {
		t.Errorf("exit %d\n%s%s", code, stdout, stderr)
	}
	code, _, stderr = tw(t, "synth", list)
	if code != 2 || !strings.Contains(stderr, "the list form of targets re-voices a design") {
		t.Errorf("exit %d %s", code, stderr)
	}
}

// The report names the priority it kept the targets in: the one given by
// --priority, said to be given.
func TestSynthPriorityNamed(t *testing.T) {
	code, stdout, stderr := tw(t, "synth", "--scoop-hz", "800", "--depth", "-8", "--balance", "30", "--corner", "10k", "--source", "1k",
		"--priority", "balance,hz+corner,depth", "-o", filepath.Join(t.TempDir(), "best.yaml"))
	if code != 3 {
		t.Fatalf("exit %d, want 3\n%s%s", code, stdout, stderr)
	}
	if want := "targets kept first: balance, then scoop frequency and corner, then depth (--priority)"; !strings.Contains(stdout, want) {
		t.Errorf("report lacks %q:\n%s", want, stdout)
	}
}

// When the free parts miss and freeing every part misses too, the report
// says --free is not what stops it.
func TestSynthFreeNotTheCause(t *testing.T) {
	board := writeTemp(t, "board.yaml", synthBoard)
	code, stdout, stderr := tw(t, "synth", "--from", board, "--balance", "30", "--free", "filters.r", "-o", filepath.Join(t.TempDir(), "out.yaml"))
	if code != 3 {
		t.Fatalf("exit %d, want 3\n%s%s", code, stdout, stderr)
	}
	if want := "with every part free no design within the tolerance was found either: --free is not what stops it"; !strings.Contains(stdout, want) {
		t.Errorf("report lacks %q:\n%s", want, stdout)
	}
}
