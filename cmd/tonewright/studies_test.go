package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The studies' command tests run on the demo design (an invented scenario,
// testdata/demo-design.yaml); the computations themselves are checked
// against their references in package networks.

func TestSweepTable(t *testing.T) {
	code, out, errs := tw(t, "sweep", demoFile, "--source", "100,1k,4.7k,22k")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"design's own:", "source", "Δ dB", "100 Ω", "22 kΩ", "Δ: shift from the design's own values"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
	if n := strings.Count(out, "1 MΩ  "); n < 4 {
		t.Errorf("want 4 rows at the design's 1 MΩ load, found %d:\n%s", n, out)
	}
}

func TestSweepJSONShape(t *testing.T) {
	code, out, errs := tw(t, "sweep", demoFile, "--source", "1k,22k", "--load", "100k,open", "--blend", "0.7", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var v struct {
		Blend *float64 `json:"blend"`
		Rows  []struct {
			SourceOhm *float64 `json:"source_ohm"`
			LoadOhm   *float64 `json:"load_ohm"`
			Metrics   struct {
				Positions []struct {
					Blend    float64  `json:"blend"`
					Gain1kDB *float64 `json:"gain_1k_db"`
				} `json:"positions"`
				CornerHz *float64 `json:"corner_hz"`
			} `json:"metrics"`
			Shift map[string]*float64 `json:"shift"`
		} `json:"rows"`
	}
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if v.Blend == nil || *v.Blend != 0.7 || len(v.Rows) != 4 {
		t.Fatalf("blend %v, %d rows:\n%s", v.Blend, len(v.Rows), out)
	}
	wantLoads := []any{100e3, nil, 100e3, nil}
	for i, r := range v.Rows {
		if r.SourceOhm == nil || *r.SourceOhm != []float64{1e3, 1e3, 22e3, 22e3}[i] {
			t.Errorf("row %d: source %v", i, r.SourceOhm)
		}
		if (r.LoadOhm == nil) != (wantLoads[i] == nil) || (r.LoadOhm != nil && *r.LoadOhm != 100e3) {
			t.Errorf("row %d: load %v, want %v (null for open)", i, r.LoadOhm, wantLoads[i])
		}
		if len(r.Metrics.Positions) != 1 || r.Metrics.Positions[0].Blend != 0.7 || r.Metrics.Positions[0].Gain1kDB == nil || r.Metrics.CornerHz == nil {
			t.Errorf("row %d: metrics %+v", i, r.Metrics)
		}
		for _, k := range []string{"gain_1k_db", "scoop_hz_pct", "depth_db", "balance_db", "corner_pct"} {
			if _, ok := r.Shift[k]; !ok {
				t.Errorf("row %d: shift lacks %s", i, k)
			}
		}
	}
}

func TestStudiesPlots(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		file string
		args []string
	}{
		{"sweep.png", []string{"sweep", demoFile, "--source", "100,4.7k,22k"}},
		{"sweep.svg", []string{"sweep", demoFile, "--load", "100k,1M"}},
		{"tolerance.png", []string{"tolerance", demoFile, "--trials", "300"}},
		{"tolerance.svg", []string{"tolerance", demoFile, "--trials", "300", "--json"}},
	} {
		p := filepath.Join(dir, tc.file)
		code, out, errs := tw(t, append(tc.args, "--plot", p)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.args, code, errs)
		}
		st, err := os.Stat(p)
		if err != nil || st.Size() < 1000 {
			t.Errorf("%s: %v (size %v)", tc.file, err, st)
		}
		if strings.Contains(strings.Join(tc.args, " "), "--json") != json.Valid([]byte(out)) {
			t.Errorf("%s: JSON output %v, want it only with --json:\n%s", tc.file, json.Valid([]byte(out)), out)
		}
	}
}

func TestToleranceTable(t *testing.T) {
	code, out, errs := tw(t, "tolerance", demoFile, "--trials", "400", "--resistors", "1%")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if errs != "" {
		t.Errorf("stderr is not a terminal, yet it got %q", errs)
	}
	for _, want := range []string{"400 trials, uniform", "given for resistors", "± 1 %", "capacitor default", "5th pct", "median", "95th pct", "scoop at", "corner (knob 1)", "no scoop in 0 % of the trials"} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q:\n%s", want, out)
		}
	}
}

type toleranceJSON struct {
	Trials int    `json:"trials"`
	Dist   string `json:"dist"`
	Parts  []struct {
		Name      string  `json:"name"`
		Tolerance float64 `json:"tolerance"`
		Basis     string  `json:"basis"`
	} `json:"parts"`
	ScoopHz  *struct{ P5, P50, P95 float64 } `json:"scoop_hz"`
	CornerHz *struct{ P5, P50, P95 float64 } `json:"corner_hz"`
	NoScoop  *float64                        `json:"no_scoop_share"`
}

// The same seed gives the same report, byte for byte, on one worker and on
// two.
func TestToleranceWorkersSameReport(t *testing.T) {
	args := []string{"tolerance", demoFile, "--trials", "250", "--seed", "11", "--dist", "normal", "--json"}
	_, one, _ := tw(t, append(args, "--workers", "1")...)
	code, two, errs := tw(t, append(args, "--workers", "2")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if one != two {
		t.Errorf("reports differ:\n%s\n%s", one, two)
	}
	var v toleranceJSON
	if err := json.Unmarshal([]byte(two), &v); err != nil {
		t.Fatal(err)
	}
	if v.Trials != 250 || v.Dist != "normal" || v.ScoopHz == nil || v.NoScoop == nil || !(v.ScoopHz.P5 < v.ScoopHz.P95) {
		t.Errorf("report %+v", v)
	}
}

func TestToleranceZeroFlags(t *testing.T) {
	code, out, errs := tw(t, "tolerance", demoFile, "--trials", "50", "--resistors", "0", "--capacitors", "0%", "--pots", "0 %", "--tapers", "0", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var v toleranceJSON
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	for _, p := range v.Parts {
		if p.Tolerance != 0 || !strings.HasPrefix(p.Basis, "given for") {
			t.Errorf("%s: %v from %q", p.Name, p.Tolerance, p.Basis)
		}
	}
	if v.ScoopHz.P5 != v.ScoopHz.P95 || v.CornerHz.P5 != v.CornerHz.P95 {
		t.Errorf("zero tolerance spreads: %+v %+v", *v.ScoopHz, *v.CornerHz)
	}
}

func TestSensitivityOutput(t *testing.T) {
	code, out, errs := tw(t, "sensitivity", demoFile)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"frequencies in % per %, levels in dB per %", "scoop frequency (blend 0.5), %/%:", "scoop depth (blend 0.5), dB/%:", "output corner (knob 1), %/%:", "gain at 1 kHz (blend 0.5), dB/%:", "lowpass.c"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	code, out, errs = tw(t, "sensitivity", demoFile, "--json", "--blend", "0.8")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var v struct {
		Blend   float64                     `json:"blend"`
		Step    float64                     `json:"step"`
		Parts   []map[string]any            `json:"parts"`
		Ranking map[string][]string         `json:"ranking"`
		Nominal map[string]*json.RawMessage `json:"nominal"`
	}
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	// The demo's ten parts and its coupling capacitor, source.series_c.
	if v.Blend != 0.8 || v.Step != 1e-3 || len(v.Parts) != 11 {
		t.Errorf("blend %v step %v, %d parts", v.Blend, v.Step, len(v.Parts))
	}
	for _, k := range []string{"scoop_hz_pct_per_pct", "depth_db_per_pct", "balance_db_per_pct", "corner_pct_per_pct", "gain_1k_db_per_pct"} {
		if _, ok := v.Parts[0][k]; !ok {
			t.Errorf("part lacks %s: %v", k, v.Parts[0])
		}
		if len(v.Ranking[k]) != 11 {
			t.Errorf("ranking %s: %v", k, v.Ranking[k])
		}
	}
}

// Bad input gets a message naming the flag and exit 2, and writes nothing.
func TestStudiesBadInput(t *testing.T) {
	dir := t.TempDir()
	plot := filepath.Join(dir, "out.png")
	bad := writeTemp(t, "bad.yaml", "tone:\n  lowpass: {r: -10k, c: 10n}\n  highpass: {c: 1n, r: 10k}\n  pot: 50k\n")
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"sweep", demoFile}, "--source, --load, --load-c or some of them"},
		{[]string{"sweep", demoFile, "--source", ""}, "--source: the list is empty"},
		{[]string{"sweep", demoFile, "--source", " , "}, "--source: the list is empty"},
		{[]string{"sweep", demoFile, "--load", ""}, "--load: the list is empty"},
		{[]string{"sweep", demoFile, "--source", "-1k"}, "--source: \"-1k\""},
		{[]string{"sweep", demoFile, "--source", "4k7x"}, "--source:"},
		{[]string{"sweep", demoFile, "--load", "0"}, "--load: \"0\""},
		{[]string{"sweep", demoFile, "--source", "1k", "--blend", "1.5"}, "--blend"},
		{[]string{"sweep", demoFile, "--source", "1k", "--plot", filepath.Join(dir, "out.txt")}, ".png or .svg"},
		{[]string{"sweep", demoFile, "--source", "1k", "--plot", dir + "/"}, "--plot"},
		{[]string{"sweep", bad, "--source", "1k", "--plot", plot}, "tone.lowpass.r"},
		{[]string{"tolerance", demoFile, "--trials", "0", "--plot", plot}, "--trials: 0 trials"},
		{[]string{"tolerance", demoFile, "--trials", "-5"}, "--trials"},
		{[]string{"tolerance", demoFile, "--resistors", "-5%"}, "--resistors: \"-5%\" is not a tolerance"},
		{[]string{"tolerance", demoFile, "--capacitors", "100%"}, "--capacitors"},
		{[]string{"tolerance", demoFile, "--pots", "NaN"}, "--pots"},
		{[]string{"tolerance", demoFile, "--pots", "ten"}, "5%, 5 or 0.5%"},
		{[]string{"tolerance", demoFile, "--dist", "gauss"}, "--dist: unknown distribution \"gauss\": use uniform or normal"},
		{[]string{"tolerance", demoFile, "--blend", "-0.1"}, "--blend"},
		{[]string{"tolerance", demoFile, "--workers", "-1"}, "--workers"},
		{[]string{"tolerance", demoFile, "--seed", "-1"}, "seed"},
		{[]string{"tolerance", bad}, "tone.lowpass.r"},
		{[]string{"sensitivity", demoFile, "--blend", "2"}, "--blend"},
		{[]string{"sensitivity", bad}, "tone.lowpass.r"},
		{[]string{"sensitivity"}, "DESIGN.yaml"},
		{[]string{"sensitivity", filepath.Join(dir, "missing.yaml")}, "missing.yaml"},
	} {
		code, _, errs := tw(t, tc.args...)
		if code != 2 {
			t.Errorf("%v: exit %d, want 2 (%s)", tc.args, code, errs)
		}
		if !strings.Contains(errs, tc.want) {
			t.Errorf("%v: message %q lacks %q", tc.args, errs, tc.want)
		}
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 0 {
		t.Errorf("bad input left files: %v", entries)
	}
}
