package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/networks"
)

// new writes a design for every built-in, in its own form and in the
// netlist form, and each loads back to the same figures as the built-in's
// starting design.
func TestNewLoadsBack(t *testing.T) {
	dir := t.TempDir()
	for _, tp := range networks.Topologies() {
		want, err := networks.AnalyzeSettings(tp.DefaultDesign(), mustSettings(t, tp.DefaultDesign()))
		if err != nil {
			t.Fatal(err)
		}
		wj, _ := json.Marshal(want)
		for _, form := range [][]string{nil, {"--netlist"}} {
			file := filepath.Join(dir, tp.Name+strings.Join(form, "")+".yaml")
			args := append([]string{"new", tp.Name, "-o", file}, form...)
			if code, _, errs := tw(t, args...); code != 0 {
				t.Fatalf("%v: exit %d: %s", args, code, errs)
			}
			data, _ := os.ReadFile(file)
			if !strings.Contains(string(data), "invented") || !strings.Contains(string(data), "10 kΩ") {
				t.Errorf("%s: the file does not say its values are invented for a 10 kΩ source:\n%s", file, data)
			}
			code, out, errs := tw(t, "analyze", file, "--json")
			if code != 0 {
				t.Fatalf("%s: exit %d: %s", file, code, errs)
			}
			// The same figures; the blend form's fast path and the netlist
			// form's nodal solver agree to 1e-9 relative, so to 1e-6 here.
			var got, exp networks.Analysis
			_ = json.Unmarshal([]byte(out), &got)
			_ = json.Unmarshal(wj, &exp)
			if len(got.Positions) != len(exp.Positions) {
				t.Fatalf("%s: %d settings, want %d", file, len(got.Positions), len(exp.Positions))
			}
			for i, g := range got.Positions {
				e := exp.Positions[i]
				if !near(g.Gain1kDB, e.Gain1kDB) || (g.Scoop == nil) != (e.Scoop == nil) || g.Scoop != nil && !near(g.Scoop.Hz, e.Scoop.Hz) ||
					(g.CornerHz == nil) != (e.CornerHz == nil) || g.CornerHz != nil && !near(*g.CornerHz, *e.CornerHz) || !near(g.Noise.OutputV, e.Noise.OutputV) {
					t.Errorf("%s, %v: figures differ from the starting design's: %+v, want %+v", file, g.Knobs, g, e)
				}
			}
		}
	}
}

func near(a, b float64) bool { return a == b || (a-b)*(a-b) <= 1e-12*(a*a+b*b) }

func mustSettings(t *testing.T, d *networks.Design) []networks.Setting {
	ss, err := d.Settings(nil)
	if err != nil {
		t.Fatal(err)
	}
	return ss
}

func TestNewListAndBadNames(t *testing.T) {
	code, out, _ := tw(t, "new", "--list")
	if code != 0 || len(strings.Split(strings.TrimSpace(out), "\n")) != len(networks.Topologies()) || !strings.Contains(out, "three-band-stack") {
		t.Errorf("new --list: exit %d\n%s", code, out)
	}
	code, _, errs := tw(t, "new", "tone-stack")
	if code != 2 || !strings.Contains(errs, "unknown topology \"tone-stack\": the built-ins are blend, bass-treble, blend-fill") {
		t.Errorf("unknown topology: exit %d: %s", code, errs)
	}
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.yaml")
	_ = os.WriteFile(bad, []byte("tone:\n  network: tilt\n  tilt: 500k\n  dark_r: 180k\n  dark_shunt_r: 47k\n  dark_c: 1.5n\n  bright_r: 180k\n  bright_c: 2.2n\n  bright_shunt_r: 47k\n  pivot: 1k\n"), 0o644)
	code, _, errs = tw(t, "analyze", bad)
	if code != 2 || !strings.Contains(errs, "bad.yaml:10: tone.pivot: unknown key \"pivot\": accepted keys here are bright_c, bright_r, bright_shunt_r, dark_c, dark_r, dark_shunt_r, network, tilt") {
		t.Errorf("unknown key: exit %d: %s", code, errs)
	}
}

// The studies on a built-in: sweep over load capacitances, a tolerance
// study with and without the tapers' tolerance, the knob turn, the
// impedances over frequency.
func TestStudiesOnBuiltins(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "cut.yaml")
	if code, _, errs := tw(t, "new", "treble-cut", "-o", file); code != 0 {
		t.Fatal(errs)
	}
	code, out, errs := tw(t, "sweep", file, "--load-c", "0,470p,1n,2.2n", "--knob", "cut=0", "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var rows struct {
		Rows []struct {
			LoadC   float64 `json:"load_c_farad"`
			Metrics struct {
				Positions []struct {
					CornerHz *float64 `json:"corner_hz"`
				} `json:"positions"`
			} `json:"metrics"`
		} `json:"rows"`
	}
	if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows.Rows) != 4 {
		t.Fatalf("%v: %d rows", err, len(rows.Rows))
	}
	// More capacitance on the output, a lower corner: the cable dulls it.
	for i := 1; i < 4; i++ {
		if *rows.Rows[i].Metrics.Positions[0].CornerHz >= *rows.Rows[i-1].Metrics.Positions[0].CornerHz {
			t.Errorf("load C %g: corner does not fall", rows.Rows[i].LoadC)
		}
	}
	code, out, errs = tw(t, "knob", file, "--knob", "cut", "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var kt networks.KnobTurn
	if err := json.Unmarshal([]byte(out), &kt); err != nil || len(kt.Steps) != networks.KnobTurnSteps || len(kt.Spreads) != 3 {
		t.Fatalf("%v: %+v", err, kt)
	}
	if code, _, errs := tw(t, "knob", file, "--knob", "treble"); code != 2 || !strings.Contains(errs, "this design's knobs are cut") {
		t.Errorf("unknown knob: exit %d: %s", code, errs)
	}
	code, out, errs = tw(t, "analyze", file, "--impedance", "--json", "--positions", "0,1")
	if code != 0 {
		t.Fatal(errs)
	}
	var an networks.Analysis
	if err := json.Unmarshal([]byte(out), &an); err != nil || len(an.Impedance) != 2 || an.Positions[0].Noise == nil {
		t.Fatalf("%v: %+v", err, an)
	}
	png := filepath.Join(dir, "z.png")
	if code, _, errs := tw(t, "analyze", file, "--impedance-plot", png); code != 0 {
		t.Fatal(errs)
	}
	if code, _, errs := tw(t, "tolerance", file, "--tapers", "150%"); code != 2 || !strings.Contains(errs, "--tapers") {
		t.Errorf("bad --tapers: exit %d: %s", code, errs)
	}
	code, out, errs = tw(t, "tolerance", file, "--knob", "cut=0.5", "--trials", "200", "--resistors", "0", "--capacitors", "0", "--pots", "0", "--json")
	if code != 0 {
		t.Fatal(errs)
	}
	var rep struct {
		Tapers   float64         `json:"taper_tolerance"`
		Gain1kDB networks.Spread `json:"gain_1k_db"`
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil || rep.Tapers != networks.DefaultTaperTolerance || rep.Gain1kDB.P95-rep.Gain1kDB.P5 <= 0 {
		t.Errorf("tapers alone: %v %+v", err, rep.Gain1kDB)
	}
}

// The README's audio-against-linear comparison is the tool's own output.
func TestReadmeKnobComparison(t *testing.T) {
	readme := string(mustRead(t, "../../README.md"))
	for _, f := range []string{"treble-cut-audio.yaml", "treble-cut-linear.yaml"} {
		code, out, errs := tw(t, "knob", filepath.Join(top, "examples", f), "--knob", "cut", "--at", "1k,5k")
		if code != 0 {
			t.Fatal(errs)
		}
		i := strings.Index(out, "  frequency")
		j := strings.Index(out, "\n\nAn even")
		if i < 0 || j < i {
			t.Fatalf("%s: no summary in\n%s", f, out)
		}
		if sum := out[i:j]; !strings.Contains(readme, "```text\n"+sum+"\n```") {
			t.Errorf("README lacks the summary of %s:\n%s", f, sum)
		}
	}
}

// new will not replace an existing file (it may be the user's board)
// unless told to with --force.
func TestNewRefusesExistingFile(t *testing.T) {
	p := writeTemp(t, "board.yaml", "my board\n")
	if code, _, errs := tw(t, "new", "tilt", "-o", p); code != 2 || !strings.Contains(errs, "exists") {
		t.Errorf("exit %d, %q", code, errs)
	}
	if got := string(mustRead(t, p)); got != "my board\n" {
		t.Errorf("the file was changed: %q", got)
	}
	if code, _, errs := tw(t, "new", "tilt", "-o", p, "--force"); code != 0 {
		t.Errorf("--force: exit %d, %s", code, errs)
	}
}
