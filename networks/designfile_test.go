package networks

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

// exampleDesign uses every key of the design file (invented values).
const exampleDesign = `name: example board
band: {from: 20, to: 20k}
source: {impedance: 6.8k, series_c: 100n}
tone:
  network: blend
  lowpass:  {r: 27k, c: 12n}
  highpass: {c: 2n2, r: 56k}
  pot: {value: 100k, taper: linear}
filters:
  - {r: 10k, c: 1n}
  - {r: 4k7, c: 2.2nF}
level: {pot: {value: 100k, taper: audio}, position: 0.8}
load: {r: 1M, c: 470p}
`

func TestParseDesign(t *testing.T) {
	d, err := ParseDesign([]byte(exampleDesign), "example.yaml")
	if err != nil {
		t.Fatal(err)
	}
	want := Design{
		Name:    "example board",
		Band:    Band{20, 20000},
		Source:  Source{Impedance: 6800, SeriesC: 100e-9},
		Tone:    Tone{Network: "blend", Lowpass: RC{27e3, 12e-9}, Highpass: RC{R: 56e3, C: 2.2e-9}, Pot: PotPart{Value: 100e3, Taper: Taper{Law: Linear}}},
		Filters: []RC{{10e3, 1e-9}, {4.7e3, 2.2e-9}},
		Level:   &LevelSetting{Pot: PotPart{Value: 100e3, Taper: Taper{Law: Audio}}, Position: 0.8},
		Load:    Load{R: 1e6, C: 470e-12},
	}
	if d.Name != want.Name || d.Band != want.Band || d.Source != want.Source || !reflect.DeepEqual(d.Tone, want.Tone) ||
		len(d.Filters) != 2 || d.Filters[0] != want.Filters[0] || d.Filters[1] != want.Filters[1] ||
		*d.Level != *want.Level || d.Load != want.Load {
		t.Errorf("parsed\n%+v\nwant\n%+v", d, want)
	}
	// Round trip through the writer.
	d2, err := ParseDesign(d.YAML(), "written.yaml")
	if err != nil {
		t.Fatalf("written design does not parse: %v\n%s", err, d.YAML())
	}
	if string(d2.YAML()) != string(d.YAML()) {
		t.Errorf("round trip changed the design:\n%s\n%s", d.YAML(), d2.YAML())
	}
}

func TestParseDesignDefaults(t *testing.T) {
	d, err := ParseDesign([]byte("tone:\n  lowpass: {r: 10k, c: 10n}\n  highpass: {c: 1n, r: 10k}\n  pot: 50k\n"), "min.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if d.Band != DefaultBand || d.Load != DefaultLoad || d.Source != (Source{}) || d.Level != nil || len(d.Filters) != 0 {
		t.Errorf("defaults: %+v", d)
	}
	if d.Tone.Pot.Value != 50e3 || d.Tone.Pot.Taper.Law != Linear || d.Tone.Network != BlendNetwork {
		t.Errorf("bare pot: %+v", d.Tone.Pot)
	}
	d, err = ParseDesign([]byte("tone:\n  lowpass: {r: 10k, c: 10n}\n  highpass: {c: 1n, r: 10k}\n  pot: 50k\nload: {r: open}\n"), "open.yaml")
	if err != nil || !math.IsInf(d.Load.R, 1) {
		t.Errorf("open load: %v %v", d, err)
	}
}

// Every bad input names the file, the line and the key.
func TestParseDesignErrors(t *testing.T) {
	base := strings.Split(exampleDesign, "\n")
	edit := func(line int, text string) string {
		l := append([]string(nil), base...)
		l[line-1] = text
		return strings.Join(l, "\n")
	}
	for _, tc := range []struct {
		name, text string
		want       []string
	}{
		{"unknown key", edit(3, "source: {impedence: 6.8k}"), []string{"bad.yaml:3:", "source.impedence", "unknown key", "impedance, series_c"}},
		{"bad value", edit(6, "  lowpass:  {r: 4x7, c: 12n}"), []string{"bad.yaml:6:", "tone.lowpass.r", `"4x7"`, "4k7"}},
		{"negative", edit(10, "  - {r: -10k, c: 1n}"), []string{"bad.yaml:10:", "filters[0].r", "positive"}},
		{"zero", edit(7, "  highpass: {c: 0, r: 56k}"), []string{"bad.yaml:7:", "tone.highpass.c", "positive"}},
		{"band", edit(2, "band: {from: 20k, to: 20}"), []string{"bad.yaml:2:", "band", "below"}},
		{"type", "name: x\ntone: [1, 2]\n", []string{"bad.yaml:2:", "tone", "mapping"}},
		{"nan", edit(13, "load: {r: NaN, c: 0}"), []string{"bad.yaml:13:", "load.r"}},
		{"position", edit(12, "level: {pot: {value: 100k, taper: audio}, position: 1.5}"), []string{"bad.yaml:12:", "level.position", "0..1"}},
		{"taper", edit(8, "  pot: {value: 100k, taper: S}"), []string{"bad.yaml:8:", "tone.pot.taper", "linear (B)"}},
		{"network", edit(5, "  network: bridged-T"), []string{"bad.yaml:5:", "tone.network", "blend"}},
		{"syntax", edit(4, "tone: {"), []string{"bad.yaml:", "not valid YAML"}},
		{"empty", "\n  \n", []string{"bad.yaml", "empty"}},
		{"no tone", "name: x\n", []string{"bad.yaml", "tone", "missing"}},
		{"missing leg part", edit(6, "  lowpass:  {r: 27k}"), []string{"bad.yaml:6:", "tone.lowpass", "missing key c"}},
		{"twice", edit(13, "load: {r: 1M, r: 2M}"), []string{"bad.yaml:13:", "load.r", "twice"}},
		{"unit r", edit(6, "  lowpass:  {r: 10nF, c: 12n}"), []string{"bad.yaml:6:", "tone.lowpass.r", "resistance"}},
		{"unit c", edit(6, "  lowpass:  {r: 27k, c: 10kΩ}"), []string{"bad.yaml:6:", "tone.lowpass.c", "capacitance"}},
		{"unit H", edit(7, "  highpass: {c: 3n3H, r: 56k}"), []string{"bad.yaml:7:", "tone.highpass.c", "in H"}},
		{"unit pot", edit(8, "  pot: {value: 100kF, taper: linear}"), []string{"bad.yaml:8:", "tone.pot.value", "resistance"}},
		{"linear midpoint", edit(8, "  pot: {value: 100k, taper: linear, midpoint: 0.2}"), []string{"bad.yaml:8:", "tone.pot.midpoint", "linear"}},
		{"huge cap", edit(3, "source: {impedance: 6.8k, series_c: 100}"), []string{"bad.yaml:3:", "source.series_c", "prefix"}},
		{"tiny r", edit(13, "load: {r: 1p, c: 0}"), []string{"bad.yaml:13:", "load.r", "outside"}},
		{"extreme", edit(10, "  - {r: 1e300, c: 1n}"), []string{"bad.yaml:10:", "filters[0].r", "outside"}},
		{"two documents", exampleDesign + "---\nname: other\n", []string{"bad.yaml:", "more than one YAML document"}},
	} {
		_, err := ParseDesign([]byte(tc.text), "bad.yaml")
		if err == nil {
			t.Errorf("%s: accepted", tc.name)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q lacks %q", tc.name, err, w)
			}
		}
	}
}

func FuzzParseDesign(f *testing.F) {
	f.Add([]byte(exampleDesign))
	f.Add([]byte("tone: {lowpass: {r: 1, c: 1}, highpass: {c: 1, r: 1}, pot: 1}"))
	f.Add([]byte("band: {from: 1e-300, to: 1e300}\ntone: {lowpass: {r: 1k, c: 1u}, highpass: {c: 1p, r: 1G}, pot: {value: 1M, taper: C, midpoint: 0.99}}"))
	f.Add([]byte("tone:\n  network: netlist\n  parts:\n    R1: {r: 10k, from: in, to: out}\n    C1: {c: 10n, from: out, to: gnd}\n"))
	f.Add([]byte("source: {impedance: 38k}\ntone:\n  network: netlist\n  parts:\n    C1: {c: 250p, from: in, to: a}\n    t: {pot: 250k, taper: A, from: a, to: c, wiper: out}\n    b: {pot: 1M, from: c, to: d, wiper: d, position: 0.5}\n    g: {pot: 1M, from: d, to: gnd, wiper: d, knob: b, position: 0.5}\n    L1: {l: 500m, from: d, to: gnd}\nlevel: {pot: 100k}\n"))
	f.Add([]byte("tone:\n  network: treble-cut\n  cut: {value: 250k, taper: audio, position: 0.3}\n  c: 1n\n  series_r: 0\n"))
	f.Add([]byte("tone:\n  network: blend-fill\n  lowpass: {r: 47k, c: 10n}\n  highpass: {c: 2.2n, r: 27k}\n  pot: 100k\n  fill: {value: 250k, midpoint: 0.2, taper: A}\n"))
	f.Add([]byte("tone:\n  network: three-band-stack\n  treble: 250k\n  bass: 1M\n  mid: 25k\n  slope_r: 100k\n  treble_c: 220p\n  bass_c: 22n\n  mid_c: 22n\nlevel: {pot: 100k}\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := ParseDesign(data, "fuzz.yaml")
		if err != nil {
			if err.Error() == "" {
				t.Fatal("empty error")
			}
			return
		}
		if _, err := Analyze(d, []float64{0, 0.5, 1}); err != nil {
			return
		}
	})
}
