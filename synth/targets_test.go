package synth

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tonewright/eseries"
	"tonewright/networks"
)

func TestParseTargets(t *testing.T) {
	p, err := LoadTargets("testdata/voice.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if p.Name != "invented mid scoop" || *p.Targets.ScoopHz != 700 || *p.Targets.DepthDB != -8 || *p.Targets.BalanceDB != 0 ||
		*p.Targets.At != 0.5 || *p.Targets.CornerHz != 9000 {
		t.Errorf("targets %+v", p.Targets)
	}
	if p.Source.Impedance != 4700 || p.Load.R != 1e6 || *p.Filters != 2 {
		t.Errorf("surroundings %+v %+v %v", p.Source, p.Load, *p.Filters)
	}
	if p.Parts.Resistors != eseries.E24 || p.Parts.Capacitors != eseries.E12 || len(p.Parts.Pots) != 4 ||
		p.Parts.ResistorRange != [2]float64{1e3, 1e6} || p.Parts.CapacitorRange != [2]float64{100e-12, 1e-6} {
		t.Errorf("parts %+v", p.Parts)
	}
	if p.Parts.Stock == nil || len(p.Parts.Stock.Resistors) != 18 || len(p.Parts.Stock.Capacitors) != 11 ||
		p.Parts.Stock.File != filepath.Join("testdata", "stock.yaml") {
		t.Errorf("stock %+v", p.Parts.Stock)
	}
}

// Bad targets files: every error names the file, the line and the key.
func TestParseTargetsErrors(t *testing.T) {
	for _, c := range []struct {
		name, text, want string
	}{
		{"unknown key", "targets:\n  scoop: {hz: 800, depth_db: -10}\n  conrer_hz: 5k\n", `t.yaml:3: targets.conrer_hz: unknown key "conrer_hz": accepted keys here are corner_hz, curve, fit_level, scoop`},
		{"bad value", "targets:\n  scoop: {hz: 8x0, depth_db: -10}\n", "t.yaml:2: targets.scoop.hz:"},
		{"positive depth", "targets:\n  scoop: {hz: 800, depth_db: 4}\n", "t.yaml:2: targets.scoop.depth_db: 4 dB: a scoop's depth is negative"},
		{"knob", "targets:\n  scoop: {hz: 800, depth_db: -4, at: 1.5}\n", "t.yaml:2: targets.scoop.at: knob position 1.5 is outside 0..1"},
		{"series", "parts:\n  resistors: E25\n", `t.yaml:2: parts.resistors: unknown series "E25": use one of E3, E6, E12, E24, E48, E96, E192, or a list`},
		{"range", "parts:\n  resistor_range: [1M, 1k]\n", "t.yaml:2: parts.resistor_range: a range is two values, low then high"},
		{"filters", "filters: -1\n", "t.yaml:1: filters: -1 sections: give a number from 0 to 20"},
		{"empty pots", "parts:\n  pots: []\n", "t.yaml:2: parts.pots: the list is empty"},
		{"stock missing", "parts:\n  stock: nowhere.yaml\n", "t.yaml:2: parts.stock: cannot read the stock file"},
		{"not yaml", "targets: [\n", "t.yaml:1: not valid YAML"},
		{"empty", "", "t.yaml: the file is empty"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseTargets([]byte(c.text), "t.yaml")
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v\nwant one containing %q", err, c.want)
			}
		})
	}
}

// Errors Solve finds are placed on the targets file's lines too.
func TestSolveErrorPlaced(t *testing.T) {
	p, err := ParseTargets([]byte("targets:\n  scoop: {hz: 30k, depth_db: -10}\n  corner_hz: 5k\n"), "t.yaml")
	if err != nil {
		t.Fatal(err)
	}
	_, err = Solve(p, Options{})
	if err == nil || !strings.HasPrefix(err.Error(), "t.yaml:2: targets.scoop.hz: 30 kHz lies outside the band 20 Hz–20 kHz") {
		t.Errorf("error %v", err)
	}
}

func TestParseStockErrors(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "s.yaml")
	os.WriteFile(path, []byte("resistors: [1k, -2k]\n"), 0o644)
	_, err := LoadStock(path)
	if err == nil || !strings.Contains(err.Error(), path+":1: resistors[1]: -2000 must be a positive value") {
		t.Errorf("error %v", err)
	}
	_, err = ParseStock([]byte("transistors: [1]\n"), "s.yaml")
	var fe *networks.FieldError
	if err == nil || !strings.Contains(err.Error(), `unknown key "transistors"`) || !asFieldError(err, &fe) {
		t.Errorf("error %v", err)
	}
}

func asFieldError(err error, fe **networks.FieldError) bool {
	e, ok := err.(*networks.FieldError)
	*fe = e
	return ok
}

// The list form of the targets file reads each figure with its knobs; bad
// entries name the line and key.
func TestParseTargetsList(t *testing.T) {
	p, err := ParseTargets([]byte(`targets:
  - {knobs: {blend: 0.5}, scoop: {hz: 700, depth_db: -8, balance_db: 0}}
  - {knobs: {blend: 1}, corner_hz: 9k}
  - {knobs: {treble: 1, bass: 0}, gain_db: {hz: 5k, db: -3}}
  - {knobs: {mid: 0.5}, peak: {hz: 500, height_db: 4}}
  - {knobs: {treble: 0}, low_corner_hz: 80}
`), "list.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Items) != 5 || p.Items[1].Kind != ItemCorner || p.Items[1].Hz != 9e3 || p.Items[2].Knobs["bass"] != 0 || p.Items[3].HeightDB != 4 {
		t.Errorf("items %+v", p.Items)
	}
	for _, c := range []struct{ in, want string }{
		{"targets:\n  - {knobs: {blend: 2}, corner_hz: 9k}\n", "list.yaml:2: targets[0].knobs.blend: knob position 2 is outside 0..1"},
		{"targets:\n  - {knobs: {blend: 1}, corner_hz: 9k, low_corner_hz: 80}\n", "give exactly one figure per entry"},
		{"targets:\n  - {scoop: {hz: 700}}\n", "needs hz and depth_db"},
		{"targets: []\n", "the list is empty"},
	} {
		_, err := ParseTargets([]byte(c.in), "list.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.in, err, c.want)
		}
	}
}
