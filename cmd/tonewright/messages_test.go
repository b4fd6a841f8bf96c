package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The newcomer's report (issue 15): values and messages say what was wrong
// in the tool's words and in the trade's notation.
func TestNewcomerMessages(t *testing.T) {
	dir := t.TempDir()
	hzBand := writeTemp(t, "hz.yaml", strings.Replace(string(mustRead(t, exampleFile)), "band: {from: 20, to: 20k}", "band: {from: 20Hz, to: 20kHz}", 1))
	load0 := writeTemp(t, "load0.yaml", strings.Replace(string(mustRead(t, demoFile)), "load: {r: 1M", "load: {r: 0", 1))
	neg := writeTemp(t, "neg.yaml", strings.Replace(string(mustRead(t, exampleFile)), "r: 27k", "r: -27k", 1))
	hzPart := writeTemp(t, "hzpart.yaml", strings.Replace(string(mustRead(t, exampleFile)), "r: 27k", "r: 27kHz", 1))
	for _, tc := range []struct {
		args     []string
		code     int
		want     string
		wantNot  string
		wantFile string // a file that must not exist afterwards
	}{
		// Ranges of the design file apply to snap.
		{[]string{"snap", "1e30"}, 2, "1 mΩ to 1 TΩ", "", ""},
		{[]string{"snap", "1e-20"}, 2, "1 fF to 1 F", "", ""},
		{[]string{"snap", "2F"}, 2, "2 F is outside 1 fF to 1 F", "", ""},
		{[]string{"snap", "5kHz"}, 2, "is a frequency", "", ""},
		// Negative positional values and bad flag types.
		{[]string{"snap", "-5k"}, 2, "values are positive", "shorthand", ""},
		{[]string{"synth", "--seed", "-1"}, 2, `--seed "-1": give a whole number, 0 or more`, "strconv", ""},
		{[]string{"completion", "tcsh"}, 2, "bash, fish, powershell or zsh", "", ""},
		// No package names in messages.
		{[]string{"synth", "--scoop-hz", "700", "--depth", "-8", "--resistors", "0,1k"}, 2, "--resistors 0: values are positive", "eseries", ""},
		// A bad flag value is blamed on the flag, not on the design's key.
		{[]string{"sweep", demoFile, "--source", "1e30"}, 2, "--source 1e30: 1e30 Ω is outside 1 mΩ to 1 TΩ", "source.impedance", ""},
		{[]string{"sweep", demoFile, "--load", "0"}, 2, "--load", "prefix", ""},
		{[]string{"synth", "--scoop-hz", "700", "--depth", "-8", "--load", "1e-9"}, 2, "--load 1e-9: 1 nΩ is outside", "load.r", ""},
		// Values in the trade's notation; zero is not a prefix slip.
		{[]string{"analyze", load0}, 2, "load.r: 0 Ω must be positive", "prefix", ""},
		{[]string{"analyze", neg}, 2, "tone.lowpass.r: -27 kΩ must be positive", "", ""},
		// Hz where a frequency is meant, refused elsewhere.
		{[]string{"synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "40kHz", "--filters", "0"}, 2, "corner target (40 kHz)", "", ""},
		{[]string{"analyze", hzBand}, 0, "", "", ""},
		{[]string{"analyze", hzPart}, 2, "is in Hz, but tone.lowpass.r is a resistance", "", ""},
		{[]string{"sweep", demoFile, "--source", "1kHz"}, 2, "is in Hz", "", ""},
		// --points needs --csv; --csv - and --json clash.
		{[]string{"analyze", demoFile, "--points", "20"}, 2, "--points sets the density of the --csv output", "", ""},
		{[]string{"analyze", demoFile, "--csv", "-", "--json"}, 2, "both write to standard output", "", filepath.Join(dir, "-")},
	} {
		code, _, errs := tw(t, tc.args...)
		if code != tc.code {
			t.Errorf("%v: exit %d, want %d (%s)", tc.args, code, tc.code, errs)
			continue
		}
		if !strings.Contains(errs, tc.want) {
			t.Errorf("%v: message %q lacks %q", tc.args, errs, tc.want)
		}
		if tc.wantNot != "" && strings.Contains(errs, tc.wantNot) {
			t.Errorf("%v: message %q has %q", tc.args, errs, tc.wantNot)
		}
	}
}

// --csv - writes the curves to standard output, not to a file named "-".
func TestAnalyzeCSVStdout(t *testing.T) {
	wd, _ := os.Getwd()
	code, out, errs := tw(t, "analyze", demoFile, "--csv", "-", "--points", "2", "--positions", "0,1")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if !strings.HasPrefix(out, "hz,db_at_0,deg_at_0,db_at_1,deg_at_1\n20,") {
		t.Errorf("stdout is not the CSV:\n%s", out)
	}
	if strings.Contains(out, "scoop at") {
		t.Errorf("stdout has the table as well as the CSV:\n%s", out)
	}
	if _, err := os.Stat(filepath.Join(wd, "-")); err == nil {
		t.Errorf("a file named - was written")
	}
}

// The analyze table says what the signs of depth and balance mean.
func TestAnalyzeKeyLine(t *testing.T) {
	_, out, _ := tw(t, "analyze", demoFile)
	for _, want := range []string{"depth: the scoop's level minus the mean of its two shoulders (negative: a dip)", "balance: the upper shoulder minus the lower (positive: brighter"} {
		if !strings.Contains(out, want) {
			t.Errorf("analyze output lacks %q:\n%s", want, out)
		}
	}
}

// --stock and a series for the same kind: the note says the stock wins.
func TestStockWinsNote(t *testing.T) {
	_, _, errs := tw(t, "synth", "--scoop-hz", "700", "--depth", "-8", "--corner", "9k",
		"--stock", filepath.Join("..", "..", "synth", "testdata", "stock.yaml"), "--resistors", "E12")
	if !strings.Contains(errs, "lists resistors: only those are used") || !strings.Contains(errs, "the stock file wins") {
		t.Errorf("no note that the stock file wins over --resistors: %q", errs)
	}
}

// Tables use one sign style: ASCII hyphen-minus for negative numbers and
// em dash for a missing figure, never the Unicode minus or an en dash.
func TestOneSignStyle(t *testing.T) {
	for _, args := range [][]string{
		{"analyze", demoFile},
		{"sweep", demoFile, "--source", "100,47k", "--load", "10k,open"},
		{"tolerance", demoFile, "--trials", "50"},
		{"sensitivity", demoFile},
	} {
		_, out, _ := tw(t, args...)
		if strings.Contains(out, "−") {
			t.Errorf("%v: output has a Unicode minus:\n%s", args, out)
		}
		for _, line := range strings.Split(out, "\n") {
			if strings.Contains(line, "–") && !strings.Contains(line, "band") && !strings.Contains(line, "Hz–") {
				t.Errorf("%v: en dash outside a range: %q", args, line)
			}
		}
	}
}
