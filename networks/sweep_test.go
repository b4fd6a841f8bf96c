package networks

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

// studyDesign is the design the studies' tests and benchmarks use: the
// values of the networks test chain (benchChain) without the cable
// capacitance. Invented values, not a real board.
func studyDesign() *Design {
	return &Design{
		Name:    "study board",
		Band:    DefaultBand,
		Source:  Source{Impedance: 6.8e3, SeriesC: 100e-9},
		Tone:    Tone{Network: BlendNetwork, Lowpass: RC{R: 27e3, C: 12e-9}, Highpass: RC{R: 56e3, C: 2.2e-9}, Pot: PotPart{Value: 100e3}},
		Filters: []RC{{R: 10e3, C: 1e-9}, {R: 10e3, C: 1e-9}},
		Level:   &LevelSetting{Pot: PotPart{Value: 100e3, Taper: Taper{Law: Audio}}, Position: 1},
		Load:    Load{R: 1e6},
	}
}

// rcDesign is a design that, at blend knob 1 (where the corner is
// measured), is a single RC low-pass section {r, c} behind the source
// impedance rs. A design always has a blend network, so the test makes it
// transparent rather than leaving it out: the high-pass leg's series
// capacitor is 1 F (under 0.01 Ω in the band) and its shunt resistor 1 TΩ;
// the pot's track is 1 TΩ and the low-pass leg (1 Ω, 1 fF) hangs off the
// input through nearly an open circuit (over 0.8 TΩ up to 200 kHz). At
// knob 1 the wiper sits at the high-pass end behind the pot's contact
// resistance, EndResistance. With no level pot and an open load the
// circuit is then rs + EndResistance + r in series and c to ground, to
// within 1e-6 relative.
func rcDesign(rs, r, c float64) *Design {
	return &Design{
		Band:    DefaultBand,
		Source:  Source{Impedance: rs},
		Tone:    Tone{Network: BlendNetwork, Lowpass: RC{R: 1, C: 1e-15}, Highpass: RC{R: 1e12, C: 1}, Pot: PotPart{Value: 1e12}},
		Filters: []RC{{R: r, C: c}},
		Load:    Load{R: math.Inf(1)},
	}
}

// rcCorner is the corner Meter.Corner finds on one RC low-pass pole at
// fc = 1/(2π·R·C) (circuit theory). Corner measures 3 dB (not the
// half-power 3.0103 dB) below the largest gain in the band, which for a
// falling curve is the gain at the band's low edge fLo, so it solves
// 1 + (f/fc)² = 10^0.3·(1 + (fLo/fc)²).
func rcCorner(fc, fLo float64) float64 {
	return fc * math.Sqrt(math.Pow(10, 0.3)*(1+(fLo/fc)*(fLo/fc))-1)
}

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// A single RC section behind a source impedance Rs has its corner at
// 1/(2π(R + Rs)C) (circuit theory), at every swept source value; the model
// adds the pot's contact resistance in series (see rcDesign).
func TestSweepRCCorner(t *testing.T) {
	const r, c = 10e3, 2.2e-9
	d := rcDesign(0, r, c)
	sources := []float64{0, 100, 1e3, 4.7e3, 22e3}
	res, err := Sweep(d, sources, nil, Setting{BlendKnob: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Rows) != len(sources) {
		t.Fatalf("%d rows, want %d", len(res.Rows), len(sources))
	}
	for i, row := range res.Rows {
		rs := sources[i]
		if row.SourceOhm != rs || !math.IsInf(row.LoadOhm, 1) {
			t.Errorf("row %d is source %v, load %v; want %v, open", i, row.SourceOhm, row.LoadOhm, rs)
		}
		fc := 1 / (2 * math.Pi * (r + rs + EndResistance) * c)
		want := rcCorner(fc, d.Band.From)
		if row.Metrics.CornerHz == nil {
			t.Fatalf("Rs = %v: no corner", rs)
		}
		if e := relErr(*row.Metrics.CornerHz, want); e > 1e-6 {
			t.Errorf("Rs = %v: corner %v Hz, circuit theory %v Hz (rel. error %.2g)", rs, *row.Metrics.CornerHz, want, e)
		}
		wantShift := 100 * (want/rcCorner(1/(2*math.Pi*(r+EndResistance)*c), d.Band.From) - 1)
		if row.Shift.CornerPct == nil || math.Abs(*row.Shift.CornerPct-wantShift) > 1e-4 {
			t.Errorf("Rs = %v: corner shift %v %%, want %v %%", rs, row.Shift.CornerPct, wantShift)
		}
	}
}

func TestSweepGrid(t *testing.T) {
	d := studyDesign()
	sources := []float64{100, d.Source.Impedance, 22e3}
	loads := []float64{100e3, d.Load.R, math.Inf(1)}
	res, err := Sweep(d, sources, loads, Setting{BlendKnob: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Rows) != 9 {
		t.Fatalf("%d rows, want 9", len(res.Rows))
	}
	nom, err := Analyze(d, []float64{0.5})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.Nominal, nom) {
		t.Errorf("nominal %+v, want Analyze's %+v", res.Nominal, nom)
	}
	for i, row := range res.Rows {
		if row.SourceOhm != sources[i/3] || row.LoadOhm != loads[i%3] {
			t.Errorf("row %d: source %v load %v, want %v %v (sources outer, loads inner)", i, row.SourceOhm, row.LoadOhm, sources[i/3], loads[i%3])
		}
		want, err := Analyze(Variant(d, row.SourceOhm, row.LoadOhm), []float64{0.5})
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(row.Metrics, want) {
			t.Errorf("row %d: metrics differ from Analyze of the variant", i)
		}
	}
	// The design's own source and load give no shift at all.
	own := res.Rows[4].Shift
	if own.Gain1kDB != 0 || *own.ScoopHzPct != 0 || *own.DepthDB != 0 || *own.BalanceDB != 0 || *own.CornerPct != 0 {
		t.Errorf("the design's own values shift by %+v", own)
	}
	// A heavier load (100k) drops the gain at 1 kHz.
	if res.Rows[3].Shift.Gain1kDB >= 0 {
		t.Errorf("100k load: gain shift %v dB, want a drop", res.Rows[3].Shift.Gain1kDB)
	}
}

func TestVariantKeepsCapacitors(t *testing.T) {
	d := studyDesign()
	d.Load.C = 470e-12
	v := Variant(d, 1e3, 100e3)
	if v.Source != (Source{Impedance: 1e3, SeriesC: 100e-9}) || v.Load != (Load{R: 100e3, C: 470e-12}) {
		t.Errorf("variant source %+v load %+v", v.Source, v.Load)
	}
	if d.Source.Impedance != 6.8e3 || d.Load.R != 1e6 {
		t.Error("Variant changed the design")
	}
}

func TestSweepJSON(t *testing.T) {
	res, err := Sweep(studyDesign(), []float64{1e3}, []float64{math.Inf(1)}, Setting{BlendKnob: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Blend *float64 `json:"blend"`
		Rows  []struct {
			SourceOhm float64         `json:"source_ohm"`
			LoadOhm   *float64        `json:"load_ohm"`
			Metrics   json.RawMessage `json:"metrics"`
			Shift     Shift           `json:"shift"`
		} `json:"rows"`
	}
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if back.Blend == nil || *back.Blend != 0.5 || len(back.Rows) != 1 || back.Rows[0].SourceOhm != 1e3 || back.Rows[0].LoadOhm != nil {
		t.Errorf("JSON %s", b)
	}
	am, _ := json.Marshal(res.Rows[0].Metrics)
	if string(back.Rows[0].Metrics) != string(am) {
		t.Errorf("row metrics are not the analyze JSON:\n%s\n%s", back.Rows[0].Metrics, am)
	}
}

func TestSweepErrors(t *testing.T) {
	d := studyDesign()
	for _, tc := range []struct {
		name           string
		sources, loads []float64
		blend          float64
		want           string
	}{
		{"nothing", nil, nil, 0.5, "nothing to sweep"},
		{"empty lists", []float64{}, []float64{}, 0.5, "nothing to sweep"},
		{"negative source", []float64{-1}, nil, 0.5, "source impedance -1"},
		{"infinite source", []float64{math.Inf(1)}, nil, 0.5, "source impedance +Inf"},
		{"zero load", nil, []float64{0}, 0.5, "load resistance 0"},
		{"NaN load", nil, []float64{math.NaN()}, 0.5, "load resistance NaN"},
		{"blend", []float64{1e3}, nil, 1.5, "knob blend: position 1.5 is outside 0..1"},
	} {
		_, err := Sweep(d, tc.sources, tc.loads, Setting{BlendKnob: tc.blend})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
}

// designOf turns a chain into the design that has it at the chain's blend
// position.
func designOf(c Chain) *Design {
	d := &Design{Band: DefaultBand, Source: c.Source,
		Tone:    Tone{Network: BlendNetwork, Lowpass: c.Blend.Lowpass, Highpass: c.Blend.Highpass, Pot: PotPart{Value: c.Blend.Pot.Value, Taper: c.Blend.Pot.Taper}},
		Filters: c.Filters, Load: c.Load}
	if c.Level != nil {
		d.Level = &LevelSetting{Pot: PotPart{Value: c.Level.Pot.Value, Taper: c.Level.Pot.Taper}, Position: c.Level.Pot.Position}
	}
	return d
}

// The probe builds the chains Design.Chain builds, and measures exactly
// what Analyze reports.
func TestProbeMatchesAnalyze(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 60; trial++ {
		c := randomChain(rng)
		d := designOf(c)
		blend := c.Blend.Pot.Position
		pr := newProbe(d, Setting{BlendKnob: blend})
		for _, pos := range []float64{blend, 1} {
			got, want := *pr.chain(d, pr.at.With(BlendKnob, pos)), d.Chain(pos)
			if (got.Level == nil) != (want.Level == nil) || (got.Level != nil && *got.Level != *want.Level) {
				t.Fatalf("trial %d: level %+v, Design.Chain %+v", trial, got.Level, want.Level)
			}
			got.Level, want.Level = nil, nil
			if !reflect.DeepEqual(got, want) {
				t.Fatalf("trial %d: chain %+v, Design.Chain %+v", trial, got, want)
			}
		}
		a, err := Analyze(d, []float64{blend})
		if err != nil {
			t.Fatal(err)
		}
		if got, want := pr.measure(d).metrics(), MetricsOf(a); !reflect.DeepEqual(got, want) {
			t.Fatalf("trial %d: probe %+v, Analyze %+v", trial, got, want)
		}
	}
}

// After its first measurement a probe allocates nothing.
func TestProbeAllocs(t *testing.T) {
	d := studyDesign()
	pr := newProbe(d, Setting{BlendKnob: 0.5})
	pr.measure(d)
	if n := testing.AllocsPerRun(20, func() { pr.measure(d) }); n != 0 {
		t.Errorf("%v allocations per measurement, want 0", n)
	}
}
