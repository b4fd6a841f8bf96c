package main

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

var stackFile = filepath.Join(top, "examples", "stack-netlist.yaml") // invented, hand-made

// analyze on a netlist design: every entry names its knobs and has the
// new figures; the blend-only keys are left out.
func TestAnalyzeKnobsJSON(t *testing.T) {
	code, out, errs := tw(t, "analyze", stackFile, "--knob", "treble=0,1", "--knob", "bass=0,0.5,1", "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var v map[string]any
	if err := json.Unmarshal([]byte(out), &v); err != nil {
		t.Fatal(err)
	}
	if _, ok := v["corner_hz"]; ok {
		t.Error("a netlist design has no blend knob-1 corner_hz at the top level")
	}
	ps := v["positions"].([]any)
	if len(ps) != 6 {
		t.Fatalf("%d positions, want 2 × 3", len(ps))
	}
	first := ps[1].(map[string]any)
	knobs := first["knobs"].(map[string]any)
	if knobs["treble"] != 0.0 || knobs["bass"] != 0.5 || knobs["mid"] != 0.5 {
		t.Errorf("knobs %v", knobs)
	}
	for _, k := range []string{"gain_1k_db", "scoop", "peak", "corner_hz", "low_corner_hz"} {
		if _, ok := first[k]; !ok {
			t.Errorf("entry lacks %s: %v", k, first)
		}
	}
	if _, ok := first["blend"]; ok {
		t.Error("a netlist entry has a blend key")
	}
	// A blend design keeps blend in every entry and its top-level corner.
	code, out, _ = tw(t, "analyze", demoFile, "--json")
	if code != 0 || !strings.Contains(out, `"blend": 0.5`) || !strings.Contains(out, `"impedance_blend"`) || !strings.Contains(out, `"knobs"`) {
		t.Errorf("blend JSON:\n%s", out)
	}
}

// The table, the CSV header and the plot legend name the settings.
func TestKnobLabels(t *testing.T) {
	code, out, errs := tw(t, "analyze", stackFile, "--knob", "treble=1", "--knob", "bass=0,1")
	if code != 0 {
		t.Fatal(errs)
	}
	if !strings.Contains(out, "treble  bass") {
		t.Errorf("table heading lacks the knobs:\n%s", out)
	}
	csv := filepath.Join(t.TempDir(), "c.csv")
	if code, _, errs := tw(t, "analyze", stackFile, "--knob", "bass=0,1", "--csv", csv); code != 0 {
		t.Fatal(errs)
	}
	if h := strings.SplitN(string(mustRead(t, csv)), "\n", 2)[0]; h != "hz,db_at_treble=0.5;bass=0,deg_at_treble=0.5;bass=0,db_at_treble=0.5;bass=1,deg_at_treble=0.5;bass=1" {
		t.Errorf("CSV header %q", h)
	}
	if code, _, errs := tw(t, "plot", stackFile, "--knob", "treble=0,1", "-o", filepath.Join(t.TempDir(), "p.png")); code != 0 {
		t.Fatal(errs)
	}
}

// Bad --knob values: exit 2, naming the flag and the accepted forms.
func TestBadKnobFlags(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"analyze", stackFile, "--knob", "presence=0.5"}, "this design's knobs are treble, bass, mid"},
		{[]string{"analyze", stackFile, "--knob", "treble=2"}, "outside 0..1"},
		{[]string{"analyze", stackFile, "--knob", "treble"}, "NAME=POSITIONS"},
		{[]string{"analyze", stackFile, "--knob", "treble=x"}, "not a knob position"},
		{[]string{"analyze", stackFile, "--knob", "bass=0", "--knob", "bass=1"}, "given twice"},
		{[]string{"analyze", demoFile, "--positions", "0,1", "--knob", "blend=0.5"}, "both set the blend knob"},
		{[]string{"netlist", stackFile, "--knob", "treble=0,1"}, "one knob setting"},
		{[]string{"sweep", stackFile, "--source", "1k", "--knob", "mid=-1"}, "outside 0..1"},
	} {
		code, _, errs := tw(t, tc.args...)
		if code != 2 || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, %q; want 2 and %q", tc.args, code, errs, tc.want)
		}
	}
}

// The studies run on a netlist design at a knob setting.
func TestStudiesOnNetlist(t *testing.T) {
	for _, args := range [][]string{
		{"sweep", stackFile, "--source", "1k,40k", "--knob", "treble=0.8"},
		{"sensitivity", stackFile, "--knob", "bass=0.2"},
		{"tolerance", stackFile, "--trials", "50", "--knob", "mid=0.1"},
	} {
		code, out, errs := tw(t, args...)
		if code != 0 {
			t.Errorf("%v: exit %d: %s", args, code, errs)
		}
		if !strings.Contains(out, "treble") && !strings.Contains(out, "bass") && !strings.Contains(out, "mid") {
			t.Errorf("%v: the setting is not named:\n%s", args, out)
		}
	}
}

// Designs at the validator's limits (invented): twenty sections of 1 GΩ and
// 1 F behind a blend of extreme parts, and every part at 1 mΩ or 1 fF, in
// the blend form and in the netlist form. analyze reports finite figures
// (thousands of dB down, as computed) and its JSON is valid.
func TestAnalyzeAtValidatorLimits(t *testing.T) {
	secs := strings.Repeat("  - {r: 1G, c: 1}\n", 20)
	for name, text := range map[string]string{
		"deep.yaml":         "tone:\n  network: blend\n  lowpass: {r: 1G, c: 1}\n  highpass: {c: 1e-15, r: 1m}\n  pot: 1e12\nfilters:\n" + secs + "load: {r: 1M}\n",
		"tiny.yaml":         "tone:\n  network: blend\n  lowpass: {r: 1m, c: 1e-15}\n  highpass: {c: 1e-15, r: 1m}\n  pot: 1m\nfilters: [{r: 1m, c: 1e-15}]\nload: {r: 1m}\n",
		"deep-netlist.yaml": "tone:\n  network: netlist\n  parts:\n    R1: {r: 1G, from: in, to: a}\n    C1: {c: 1, from: a, to: gnd}\n    R2: {r: 1G, from: a, to: out}\n    C2: {c: 1, from: out, to: gnd}\nfilters:\n" + secs + "load: {r: 1M}\n",
	} {
		p := writeTemp(t, name, text)
		code, out, errs := tw(t, "analyze", p, "--json")
		if code != 0 {
			t.Errorf("%s: exit %d: %s", name, code, errs)
			continue
		}
		var v map[string]any
		if err := json.Unmarshal([]byte(out), &v); err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		for _, pos := range v["positions"].([]any) {
			g := pos.(map[string]any)["gain_1k_db"].(float64)
			if math.IsNaN(g) || math.IsInf(g, 0) {
				t.Errorf("%s: gain %v", name, g)
			}
		}
		if code, out, _ := tw(t, "analyze", p); code != 0 || strings.Contains(out, "Inf") || strings.Contains(out, "NaN") {
			t.Errorf("%s: table exit %d:\n%s", name, code, out)
		}
	}
}

// snap on a series member gives its neighbours, IEC 60063's E24 values
// 4.3k and 5.1k around 4.7k; a value written with a unit keeps it.
func TestSnapMemberNeighbours(t *testing.T) {
	code, out, errs := tw(t, "snap", "4.7k", "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var v struct{ Below, Above float64 }
	if err := json.Unmarshal([]byte(out), &v); err != nil || v.Below != 4300 || v.Above != 5100 {
		t.Errorf("below %v, above %v (%v)", v.Below, v.Above, err)
	}
	if _, out, _ := tw(t, "snap", "220uF"); !strings.Contains(out, "200 µF") {
		t.Errorf("unit lost:\n%s", out)
	}
}
