package live

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"tonewright/networks"
)

// The figures the page shows are analyze's: at every blend position the
// gain at 1 kHz and the scoop equal networks.Analyze exactly, the corner
// at blend 1 equals analyze's corner (defined at knob 1), and the
// impedances at the centre equal analyze's (reported at the centre).
func TestFiguresAreAnalyze(t *testing.T) {
	for _, path := range []string{demoDesign, exampleDesign} {
		d, err := networks.LoadDesign(path)
		if err != nil {
			t.Fatal(err)
		}
		m, err := NewDesignModel(d, "x")
		if err != nil {
			t.Fatal(err)
		}
		an, err := networks.Analyze(d, []float64{0, 0.13, 0.5, 0.77, 1})
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range an.Positions {
			f, err := m.Figures(Setting{KnobBlend: p.Blend})
			if err != nil {
				t.Fatal(err)
			}
			if *f.Gain1kDB != p.Gain1kDB {
				t.Errorf("%s blend %v: gain %v, analyze %v", path, p.Blend, *f.Gain1kDB, p.Gain1kDB)
			}
			if (f.Scoop == nil) != (p.Scoop == nil) || (f.Scoop != nil && *f.Scoop != *p.Scoop) {
				t.Errorf("%s blend %v: scoop %+v, analyze %+v", path, p.Blend, f.Scoop, p.Scoop)
			}
			if (f.Peak == nil) != (p.Peak == nil) || (f.Peak != nil && *f.Peak != *p.Peak) {
				t.Errorf("%s blend %v: peak %+v, analyze %+v", path, p.Blend, f.Peak, p.Peak)
			}
			if (f.CornerHz == nil) != (p.CornerHz == nil) || (f.CornerHz != nil && *f.CornerHz != *p.CornerHz) {
				t.Errorf("%s blend %v: corner %v, analyze %v", path, p.Blend, f.CornerHz, p.CornerHz)
			}
		}
		f1, _ := m.Figures(Setting{KnobBlend: 1})
		if (f1.CornerHz == nil) != (an.CornerHz == nil) || (an.CornerHz != nil && *f1.CornerHz != *an.CornerHz) {
			t.Errorf("%s: corner at blend 1 %v, analyze %v", path, f1.CornerHz, an.CornerHz)
		}
		fc, _ := m.Figures(Setting{KnobBlend: networks.ImpedanceBlend})
		if *fc.InputImpedanceOhm != an.InputImpedanceOhm || *fc.OutputImpedanceOhm != an.OutputImpedanceOhm {
			t.Errorf("%s: impedances %v %v, analyze %v %v", path, *fc.InputImpedanceOhm, *fc.OutputImpedanceOhm, an.InputImpedanceOhm, an.OutputImpedanceOhm)
		}
	}
}

// The level knob is the design's level position: the figures at level x
// are analyze's for the design file with position: x.
func TestLevelKnobIsLevelPosition(t *testing.T) {
	d, err := networks.LoadDesign(demoDesign)
	if err != nil {
		t.Fatal(err)
	}
	m, _ := NewDesignModel(d, "x")
	for _, lv := range []float64{0, 0.3, 1} {
		e := d.Clone()
		e.Level.Position = lv
		an, err := networks.Analyze(e, []float64{0.4})
		if err != nil {
			t.Fatal(err)
		}
		f, err := m.Figures(Setting{KnobBlend: 0.4, KnobLevel: lv})
		if err != nil {
			t.Fatal(err)
		}
		if *f.Gain1kDB != an.Positions[0].Gain1kDB {
			t.Errorf("level %v: gain %v, analyze %v", lv, *f.Gain1kDB, an.Positions[0].Gain1kDB)
		}
	}
}

func TestWithRefusesNamingThePart(t *testing.T) {
	m := loadModel(t, demoDesign)
	for _, c := range []struct {
		values map[string]float64
		field  string
	}{
		{map[string]float64{"lowpass.r": 1e15}, "lowpass.r"},
		{map[string]float64{"filter2.c": 5}, "filter2.c"},
		{map[string]float64{"level": -1}, "level"},
		{map[string]float64{"load.r": 0}, "load.r"},
		{map[string]float64{"source.impedance": math.NaN()}, "source.impedance"},
		{map[string]float64{"filter9.r": 1e3}, "filter9.r"},
		{map[string]float64{"nothing": 1}, "nothing"},
	} {
		_, err := m.With(c.values)
		var ve *ValueError
		if !errors.As(err, &ve) || ve.Field != c.field {
			t.Errorf("With(%v) = %v, want a ValueError for %s", c.values, err, c.field)
		}
	}
	// The model itself is unchanged.
	if p := m.Parts()[0]; p.Value != 120e3 {
		t.Errorf("lowpass.r is %v after refused changes", p.Value)
	}
}

// A design encoded at a setting reads back, with the same parts and the
// level at the setting.
func TestEncodeReadsBack(t *testing.T) {
	m := loadModel(t, demoDesign)
	m2, err := m.With(map[string]float64{"lowpass.r": 4700, "filter1.c": 2.2e-9, "load.r": math.Inf(1), "source.series_c": 0})
	if err != nil {
		t.Fatal(err)
	}
	data, err := m2.Encode(Setting{KnobBlend: 0.3, KnobLevel: 0.625})
	if err != nil {
		t.Fatal(err)
	}
	d, err := networks.ParseDesign(data, "encoded")
	if err != nil {
		t.Fatalf("%v\n%s", err, data)
	}
	back, _ := NewDesignModel(d, "x")
	if fmt.Sprint(back.Parts()) != fmt.Sprint(m2.Parts()) {
		t.Errorf("parts read back\n%v\nwant\n%v", back.Parts(), m2.Parts())
	}
	if d.Level.Position != 0.625 {
		t.Errorf("level position read back %v, want 0.625", d.Level.Position)
	}
}

func TestParseValue(t *testing.T) {
	r := Part{Name: "lowpass.r", Role: "R", Unit: "Ω"}
	c := Part{Name: "load.c", Role: "C", Unit: "F", Zero: "none"}
	l := Part{Name: "load.r", Role: "load", Unit: "Ω", Open: true}
	for _, tc := range []struct {
		p    Part
		in   string
		want float64
		ok   bool
	}{
		{r, "4k7", 4700, true},
		{r, "4.7 kΩ", 4700, true},
		{r, "4700", 4700, true},
		{c, "100nF", 100e-9, true},
		{c, "22n", 22e-9, true},
		{c, "0", 0, true},
		{c, "none", 0, true},
		{l, "open", math.Inf(1), true},
		{r, "0", 0, false},
		{r, "open", 0, false},
		{r, "22nF", 0, false},
		{r, "-4k7", 0, false},
		{r, "4k7k", 0, false},
		{r, "", 0, false},
	} {
		v, err := parseValue(tc.p, tc.in)
		if (err == nil) != tc.ok || (tc.ok && math.Abs(v-tc.want) > 1e-12*math.Abs(tc.want)) {
			t.Errorf("parseValue(%s, %q) = %v, %v", tc.p.Name, tc.in, v, err)
		}
	}
}

// Steps follow the IEC 60063 tables: 4.7k is followed by 5.6k in E12,
// 5.1k in E24, and in E96 (which lacks 4.7k) 4.75k; a value between members steps to the
// nearest member on that side.
func TestStep(t *testing.T) {
	r := Part{Name: "r", Kind: "resistor", Unit: "Ω"}
	pot := Part{Name: "pot", Kind: "pot", Unit: "Ω"}
	for _, tc := range []struct {
		p      Part
		v      float64
		series string
		dir    int
		want   float64
	}{
		{r, 4700, "E12", 1, 5600},
		{r, 4700, "E24", 1, 5100},
		{r, 4700, "E96", 1, 4750},
		{r, 4700, "E24", -1, 4300},
		{r, 4500, "E12", 1, 4700},
		{pot, 50e3, "E24", 1, 100e3},  // common pot values, common practice, no published source
		{pot, 100e3, "E96", -1, 50e3}, // pots ignore the series
	} {
		got, err := step(tc.p, tc.v, tc.series, tc.dir)
		if err != nil || math.Abs(got-tc.want) > 1e-9*tc.want {
			t.Errorf("step(%s, %v, %s, %d) = %v, %v; want %v", tc.p.Kind, tc.v, tc.series, tc.dir, got, err, tc.want)
		}
	}
	if _, err := step(r, 4700, "E48", 1); err == nil {
		t.Error("E48 is not one of the page's series but was accepted")
	}
	if _, err := step(r, 4700, "E12", 0); err == nil {
		t.Error("direction 0 accepted")
	}
}

// A design without a level pot has one knob, and a level in a request is
// refused by name.
func TestDesignWithoutLevel(t *testing.T) {
	d, err := networks.ParseDesign([]byte(`tone:
  network: blend
  lowpass:  {r: 22k, c: 10n}
  highpass: {c: 2n2, r: 47k}
  pot: 100k
source: {impedance: 1k}
`), "invented.yaml") // invented values
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewDesignModel(d, "x")
	if err != nil {
		t.Fatal(err)
	}
	if ks := m.Knobs(); len(ks) != 1 || ks[0].Name != KnobBlend {
		t.Errorf("knobs %v, want blend alone", ks)
	}
	for _, p := range m.Parts() {
		if p.Name == "level" {
			t.Error("a level part without a level pot")
		}
	}
	var ve *ValueError
	if _, err := m.Figures(Setting{KnobLevel: 1}); !errors.As(err, &ve) || ve.Field != KnobLevel {
		t.Errorf("level on a design without one: %v", err)
	}
}

// A netlist design's knobs are its pots; the figures at a setting are
// analyze's, and a save keeps the positions of the knobs that have one.
func TestNetlistModel(t *testing.T) {
	d, err := networks.LoadDesign("../../../testdata/examples/stack-netlist.yaml")
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewDesignModel(d, "x")
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, k := range m.Knobs() {
		names = append(names, k.Name)
	}
	if strings.Join(names, ",") != "treble,bass,mid" {
		t.Fatalf("knobs %v", names)
	}
	s := Setting{"treble": 0.3, "bass": 0.9}
	f, err := m.Figures(s)
	if err != nil {
		t.Fatal(err)
	}
	full, _ := d.Setting(s)
	an, err := networks.AnalyzeSettings(d, []networks.Setting{full})
	if err != nil {
		t.Fatal(err)
	}
	p := an.Positions[0]
	if *f.Gain1kDB != p.Gain1kDB || (f.Scoop == nil) != (p.Scoop == nil) || (f.Scoop != nil && *f.Scoop != *p.Scoop) {
		t.Errorf("figures %+v, analyze %+v", f, p)
	}
	if _, err := m.Figures(Setting{"presence": 0.5}); err == nil {
		t.Error("an unknown knob was accepted")
	}
	b, err := m.Encode(s)
	if err != nil {
		t.Fatal(err)
	}
	back, err := networks.ParseDesign(b, "saved.yaml")
	if err != nil {
		t.Fatalf("%v\n%s", err, b)
	}
	if ks := back.Knobs(); ks[1].Name != "bass" || ks[1].Position != 0.9 || ks[0].Set {
		t.Errorf("saved knobs %+v", ks)
	}
}
