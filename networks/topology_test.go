package networks

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// Every built-in's starting design, written with YAML and read back, both
// in its own form and in the netlist form, gives the same curve.
func TestTopologyRoundTrip(t *testing.T) {
	for _, tp := range Topologies() {
		t.Run(tp.Name, func(t *testing.T) {
			d := tp.DefaultDesign()
			if err := d.Validate(); err != nil {
				t.Fatal(err)
			}
			back, err := ParseDesign(d.YAML(), tp.Name+".yaml")
			if err != nil {
				t.Fatalf("%v\n%s", err, d.YAML())
			}
			nl := d.Clone()
			nl.Tone = Tone{Network: NetlistNetwork, Parts: d.ToneParts()}
			nlBack, err := ParseDesign(nl.YAML(), tp.Name+"-netlist.yaml")
			if err != nil {
				t.Fatalf("%v\n%s", err, nl.YAML())
			}
			if got, want := strings.Join(back.KnobNames(), ","), strings.Join(tp.Knobs(), ","); got != want {
				t.Errorf("knobs %s, want %s", got, want)
			}
			ss, err := d.Settings(nil)
			if err != nil {
				t.Fatal(err)
			}
			for _, s := range ss {
				e0, _ := d.Compile(s)
				e1, _ := back.Compile(s)
				e2, _ := nlBack.Compile(s)
				for _, f := range []float64{20, 200, 1000, 5000, 20000} {
					h := e0.Transfer(f)
					if relDiff(h, e1.Transfer(f)) > 1e-12 || relDiff(h, e2.Transfer(f)) > 1e-9 {
						t.Fatalf("%v at %g Hz: %v, read back %v, netlist %v", s, f, h, e1.Transfer(f), e2.Transfer(f))
					}
				}
			}
		})
	}
}

// The fill knob at 0 gives the blend network: only the fill pot's end
// resistance (EndResistance, 1 Ω) is left in series with the high-pass
// leg's resistor, so the curve equals the blend network's with 1 Ω more
// in highpass.r exactly (1e-9 relative, the solvers' agreement), and the
// plain blend network's within 0.001 dB.
func TestBlendFillAtZeroIsBlend(t *testing.T) {
	bf := topologies[BlendFillNetwork].DefaultDesign()
	bf.Source.SeriesC, bf.Load.C = 100e-9, 220e-12
	v := map[string]float64{}
	for _, p := range bf.Tone.Parts {
		v[p.Name] = p.Value
	}
	blend := func(extra float64) *Design {
		b := bf.Clone()
		b.Tone = Tone{Network: BlendNetwork, Lowpass: RC{R: v["lowpass_r"], C: v["lowpass_c"]},
			Highpass: RC{R: v["highpass_r"] + extra, C: v["highpass_c"]}, Pot: PotPart{Value: v["blend"], Taper: Taper{Law: Linear}}}
		return b
	}
	exact, plain := blend(EndResistance), blend(0)
	for _, p := range DefaultPositions {
		ef, _ := bf.Compile(Setting{BlendKnob: p, "fill": 0})
		ee, _ := exact.Compile(Setting{BlendKnob: p})
		ep, _ := plain.Compile(Setting{BlendKnob: p})
		for _, f := range LogGrid(20, 20000, 10) {
			if d := relDiff(ef.Transfer(f), ee.Transfer(f)); d > 1e-9 {
				t.Errorf("blend %g, %g Hz: fill 0 differs from the blend network (+1 Ω) by %g", p, f, d)
			}
			if d := math.Abs(ef.GainDB(f) - ep.GainDB(f)); d > 1e-3 {
				t.Errorf("blend %g, %g Hz: fill 0 differs from the blend network by %g dB", p, f, d)
			}
		}
	}
}

// ideal returns the design with an ideal source (no impedance, no coupling
// capacitor) and no load, so that the closed forms below hold.
func ideal(d *Design) *Design {
	d = d.Clone()
	d.Source = Source{}
	d.Load = Load{R: math.Inf(1)}
	return d
}

func parts(d *Design) map[string]float64 {
	v := map[string]float64{}
	for _, p := range d.ToneParts() {
		v[p.Name] = p.Value
	}
	return v
}

// The closed forms at the knob ends, each derived beside its case. With an
// ideal source and no load no current leaves the output node. A pot's
// track is a resistor of value + 2 Ω (EndResistance at each end) between
// its ends, and its wiper taps it: at an end stop 1 Ω from that end, so
// V(out) = V(near end) + (V(far end) − V(near end))·1/(value + 2).
// s = j2πf.
func TestTopologyClosedForms(t *testing.T) {
	type check struct {
		name  string
		net   string
		knobs Setting
		freqs []float64
		want  func(v map[string]float64, f float64) complex128
		tol   float64
	}
	// solve2 solves the two-node system [[a, −g], [−g, b]]·[x, y] = [p, q]
	// by Cramer's rule.
	solve2 := func(a, b, g, p, q complex128) (x, y complex128) {
		det := a*b - g*g
		return (p*b + g*q) / det, (a*q + g*p) / det
	}
	cases := []check{
		// Treble cut, knob 0 and 1: the pot as a variable resistor R_v
		// (1 Ω at knob 0, value + 1 Ω at knob 1: the wiper's segment is
		// shorted) in series with series_r, into cut_c to ground. A
		// first-order low-pass: H = 1/(1 + s(series_r + R_v)·C).
		{"treble-cut 0", TrebleCutNetwork, Setting{"cut": 0}, []float64{100, 1000, 10000}, func(v map[string]float64, f float64) complex128 {
			s := complex(0, 2*math.Pi*f)
			return 1 / (1 + s*complex((v["series_r"]+EndResistance)*v["cut_c"], 0))
		}, 1e-9},
		{"treble-cut 1", TrebleCutNetwork, Setting{"cut": 1}, []float64{100, 1000, 10000}, func(v map[string]float64, f float64) complex128 {
			s := complex(0, 2*math.Pi*f)
			return 1 / (1 + s*complex((v["series_r"]+v["cut"]+EndResistance)*v["cut_c"], 0))
		}, 1e-9},
		// Tilt, knob 0 (output tapped 1 Ω from d) and 1 (1 Ω from h). Node d: fed from
		// in by dark_r (G1), to ground through dark_shunt_r + dark_c in
		// series (Ye = 1/(R2 + 1/(sC2))); node h: fed from in by bright_r
		// ∥ bright_c (Ys = 1/R3 + sC3), to ground by bright_shunt_r (G4);
		// the pot's track (value + 2 Ω, Gp) joins d and h. KCL:
		// (G1 + Ye + Gp)·Vd − Gp·Vh = G1, −Gp·Vd + (Ys + G4 + Gp)·Vh = Ys.
		{"tilt 0", TiltNetwork, Setting{"tilt": 0}, []float64{50, 1000, 15000}, func(v map[string]float64, f float64) complex128 {
			vd, vh := tiltNodes(v, f, solve2)
			return vd + (vh-vd)*complex(EndResistance/(v["tilt"]+2*EndResistance), 0)
		}, 1e-9},
		{"tilt 1", TiltNetwork, Setting{"tilt": 1}, []float64{50, 1000, 15000}, func(v map[string]float64, f float64) complex128 {
			vd, vh := tiltNodes(v, f, solve2)
			return vh + (vd-vh)*complex(EndResistance/(v["tilt"]+2*EndResistance), 0)
		}, 1e-9},
		// Bass-treble near DC (1 pHz: every capacitor open). The treble
		// pot hangs between two open capacitors and carries no current,
		// and mix_r none, so out = W: the bass divider top_r, the pot's
		// upper segment, its lower segment, bottom_r; at bass 1 the upper
		// segment is 1 Ω and the lower value + 1 Ω, at bass 0 the reverse.
		// H = (bottom_r + lower)/(top_r + value + 2 + bottom_r).
		{"bass-treble bass 1, DC", BassTrebleNetwork, Setting{"bass": 1, "treble": 0.5}, []float64{1e-12}, func(v map[string]float64, f float64) complex128 {
			return complex((v["bottom_r"]+v["bass"]+EndResistance)/(v["top_r"]+v["bass"]+2*EndResistance+v["bottom_r"]), 0)
		}, 1e-9},
		{"bass-treble bass 0, DC", BassTrebleNetwork, Setting{"bass": 0, "treble": 0.5}, []float64{1e-12}, func(v map[string]float64, f float64) complex128 {
			return complex((v["bottom_r"]+EndResistance)/(v["top_r"]+v["bass"]+2*EndResistance+v["bottom_r"]), 0)
		}, 1e-9},
		// Bass-treble at a very high frequency (10 THz: every capacitor a
		// short, within 1e-4 Ω). A, W and B are one node, W, fed by top_r
		// from in and held by bottom_r to ground; T is in and U ground, so
		// the treble pot divides in to ground by its segments, lower
		// (U–out) a and upper (out–T) b, and mix_r joins W to out. KCL:
		// (1/top_r + 1/bottom_r + 1/mix_r)·VW − VO/mix_r = 1/top_r,
		// −VW/mix_r + (1/a + 1/b + 1/mix_r)·VO = 1/b. At treble 1
		// a = value + 1, b = 1; at treble 0 the reverse.
		{"bass-treble treble 1, HF", BassTrebleNetwork, Setting{"bass": 0.5, "treble": 1}, []float64{1e13}, func(v map[string]float64, f float64) complex128 {
			return bassTrebleHF(v, v["treble"]+EndResistance, EndResistance, solve2)
		}, 1e-4},
		{"bass-treble treble 0, HF", BassTrebleNetwork, Setting{"bass": 0.5, "treble": 0}, []float64{1e13}, func(v map[string]float64, f float64) complex128 {
			return bassTrebleHF(v, EndResistance, v["treble"]+EndResistance, solve2)
		}, 1e-4},
		// Three-band stack, treble 1, bass 0, mid 0: the bass and mid pots
		// are 1 Ω each, so b and m sit within a few ohms of ground, and the
		// output (on t) is treble_c into the treble pot's track (value +
		// 2 Ω) to b ≈ ground: a first-order high-pass,
		// H = sRC/(1 + sRC), R = treble + 2 Ω, C = treble_c. The slope
		// branch's current through those ohms lifts b a little: less than
		// 0.1 % of the output here (most at the lowest frequency).
		{"three-band-stack treble 1, bass 0, mid 0", ThreeBandStackNetwork, Setting{"treble": 1, "bass": 0, "mid": 0}, []float64{100, 2000, 20000}, func(v map[string]float64, f float64) complex128 {
			src := complex(0, 2*math.Pi*f*(v["treble"]+2*EndResistance)*v["treble_c"])
			return src / (1 + src)
		}, 1e-3},
	}
	for _, c := range cases {
		d := ideal(topologies[c.net].DefaultDesign())
		v := parts(d)
		e, err := d.Compile(c.knobs)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range c.freqs {
			if got, want := e.Transfer(f), c.want(v, f); relDiff(got, want) > c.tol {
				t.Errorf("%s at %g Hz: %v, closed form %v", c.name, f, got, want)
			}
		}
	}
	// Blend-fill at blend 0.5, fill 0 and 0.5 (linear: half the track), with the blend pot made huge
	// (1 TΩ, so it neither loads the legs nor is loaded): the ideal blend
	// network's H = ½·[1/(1 + sτ₁) + sτ₂/(1 + sτ₂)] (see
	// TestIdealBlendClosedForm) with τ₁ = lowpass_r·lowpass_c and the
	// high-pass leg's resistance grown by the fill pot's segment (share ×
	// value + 1 Ω end resistance): τ₂ = highpass_c·(highpass_r + fill + 1 Ω). Its notch
	// lies at 1/(2π√(τ₁τ₂)), 20·log10(2/(r + 1)) below the shoulders,
	// r = τ₁/τ₂, shallower than at fill 0.
	bf := ideal(topologies[BlendFillNetwork].DefaultDesign())
	for i := range bf.Tone.Parts {
		if bf.Tone.Parts[i].Name == "blend" {
			bf.Tone.Parts[i].Value = 1e12
		}
	}
	v := parts(bf)
	t1 := v["lowpass_r"] * v["lowpass_c"]
	for _, fill := range []float64{0, 0.5} {
		t2 := v["highpass_c"] * (v["highpass_r"] + EndResistance + fill*v["fill"])
		e, _ := bf.Compile(Setting{BlendKnob: 0.5, "fill": fill})
		f0 := 1 / (2 * math.Pi * math.Sqrt(t1*t2))
		for _, f := range []float64{f0 / 10, f0, 3 * f0} {
			s := complex(0, 2*math.Pi*f)
			want := 0.5 * (1/(1+s*complex(t1, 0)) + s*complex(t2, 0)/(1+s*complex(t2, 0)))
			if d := relDiff(e.Transfer(f), want); d > 1e-6 {
				t.Errorf("blend-fill, fill %g, %g Hz: differs from the closed form by %g", fill, f, d)
			}
		}
		m := NewMeter(Band{From: f0 / 1e4, To: f0 * 1e4})
		sc, ok := m.Scoop(e)
		if want := 20 * math.Log10(2/(t1/t2+1)); !ok || math.Abs(sc.DepthDB-want) > 1e-3 {
			t.Errorf("blend-fill, fill %g: depth %v dB (found %v), closed form %.4f", fill, sc.DepthDB, ok, want)
		}
	}
	// The treble cut's corner, by the README's definition: 3 dB below the
	// largest gain, here at the band's low end f₁. With |H|² = 1/(1 + (f/fp)²),
	// fp = 1/(2πRC): 1 + (f/fp)² = 10^0.3·(1 + (f₁/fp)²), so
	// f = fp·√(10^0.3·(1 + (f₁/fp)²) − 1).
	d := ideal(topologies[TrebleCutNetwork].DefaultDesign())
	v = parts(d)
	m := NewMeter(d.Band)
	for _, k := range []float64{0, 1} {
		e, _ := d.Compile(Setting{"cut": k})
		r := v["series_r"] + EndResistance + k*v["cut"]
		fp := 1 / (2 * math.Pi * r * v["cut_c"])
		want := fp * math.Sqrt(math.Pow(10, 0.3)*(1+math.Pow(d.Band.From/fp, 2))-1)
		if got, ok := m.Corner(e); !ok || math.Abs(got/want-1) > 1e-6 {
			t.Errorf("cut %g: corner %g Hz (found %v), closed form %g", k, got, ok, want)
		}
	}
}

func tiltNodes(v map[string]float64, f float64, solve2 func(a, b, g, p, q complex128) (complex128, complex128)) (vd, vh complex128) {
	s := complex(0, 2*math.Pi*f)
	g1 := complex(1/v["dark_r"], 0)
	ye := 1 / (complex(v["dark_shunt_r"], 0) + 1/(s*complex(v["dark_c"], 0)))
	ys := complex(1/v["bright_r"], 0) + s*complex(v["bright_c"], 0)
	g4 := complex(1/v["bright_shunt_r"], 0)
	gp := complex(1/(v["tilt"]+2*EndResistance), 0)
	return solve2(g1+ye+gp, ys+g4+gp, gp, g1, ys)
}

func bassTrebleHF(v map[string]float64, a, b float64, solve2 func(a, b, g, p, q complex128) (complex128, complex128)) complex128 {
	gt, gb, gm := 1/v["top_r"], 1/v["bottom_r"], 1/v["mix_r"]
	_, vo := solve2(complex(gt+gb+gm, 0), complex(1/a+1/b+gm, 0), complex(gm, 0), complex(gt, 0), complex(1/b, 0))
	return vo
}

// Each built-in in its netlist form, as a SPICE deck, against the ngspice
// simulator (an outside reference) at its knob ends and centre: within
// 0.01 dB and 0.1° over the band, with the starting design's 10 kΩ source
// and 1 MΩ load, plus a coupling capacitor and a load capacitance; the
// built-in form itself is compared, so both forms are held to ngspice.
func TestTopologiesAgainstNgspice(t *testing.T) {
	RequireNgspice(t)
	for _, tp := range Topologies() {
		d := tp.DefaultDesign()
		d.Source.SeriesC, d.Load.C = 47e-9, 470e-12
		nl := d.Clone()
		nl.Tone = Tone{Network: NetlistNetwork, Parts: d.ToneParts()}
		ends := []float64{0, 0.5, 1}
		for j := range ends {
			s := Setting{} // knob i at ends[(i+j) mod 3]: every knob at each end
			for i, k := range d.KnobNames() {
				s[k] = ends[(i+j)%3]
			}
			n := nl.Network(s)
			var deck strings.Builder
			if err := n.WriteSPICE(&deck, tp.Name, d.Band, 10); err != nil {
				t.Fatal(err)
			}
			pts, err := RunNgspice(deck.String(), NodeOut)
			if err != nil {
				t.Fatalf("%s %v: %v\n%s", tp.Name, s, err, deck.String())
			}
			e, _ := d.Compile(s)
			for _, pt := range pts {
				h := e.Transfer(pt.Hz)
				dm := 20*math.Log10(cmplx.Abs(h)) - 20*math.Log10(cmplx.Abs(pt.V))
				dp := math.Remainder(cmplx.Phase(h)-cmplx.Phase(pt.V), 2*math.Pi) * 180 / math.Pi
				if math.Abs(dm) > 0.01 || math.Abs(dp) > 0.1 {
					t.Fatalf("%s %v at %g Hz: %.4f dB off, %.3f° off\n%s", tp.Name, s, pt.Hz, dm, dp, deck.String())
				}
			}
		}
	}
}

// Bad built-in input: an unknown network lists the known ones, an unknown
// key lists the topology's keys, a missing key names it; each with the
// file and line.
func TestTopologyBadInput(t *testing.T) {
	for _, c := range []struct{ file, want string }{
		{"tone:\n  network: treble-slice\n", "x.yaml:2: tone.network: unknown network \"treble-slice\": use blend, netlist, bass-treble, blend-fill, three-band-stack, tilt, treble-cut"},
		{"tone:\n  network: treble-cut\n  cut: 250k\n  c: 1n\n  bass: 1M\n", "x.yaml:5: tone.bass: unknown key \"bass\": accepted keys here are c, cut, network, series_r"},
		{"tone:\n  network: tilt\n  tilt: 250k\n", "x.yaml:2: tone: missing key dark_r"},
		{"tone:\n  network: treble-cut\n  cut: {value: 250k, position: 2}\n  c: 1n\n", "x.yaml:3: tone.cut.position: 2 is outside 0..1"},
		{"tone:\n  network: treble-cut\n  cut: {value: 250k, wiper: out}\n  c: 1n\n", "x.yaml:3: tone.cut.wiper: unknown key \"wiper\": accepted keys here are midpoint, position, taper, value"},
		{"tone:\n  network: treble-cut\n  cut: 250k\n  c: 1k\n", "x.yaml:4: tone.c: 1 kF is outside"},
		{"tone:\n  network: three-band-stack\n  treble: 250k\n  bass: 1M\n  mid: 25k\n  slope_r: 100k\n  treble_c: 220\n  bass_c: 22n\n  mid_c: 22n\n", "x.yaml:7: tone.treble_c: 220 F is outside"},
	} {
		_, err := ParseDesign([]byte(c.file), "x.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q:\n got %v\nwant %s", c.file, err, c.want)
		}
	}
}

// A built-in's knob positions written in the file are the knobs' own.
func TestTopologyPositions(t *testing.T) {
	d, err := ParseDesign([]byte("tone:\n  network: bass-treble\n  bass: {value: 100k, taper: audio, position: 0.3}\n  treble: 100k\n  top_r: 33k\n  bottom_r: 3.3k\n  bass_top_c: 6.8n\n  bass_bottom_c: 68n\n  treble_top_c: 1n\n  treble_bottom_c: 10n\n  mix_r: 33k\n"), "x.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if d.SweptKnob() != "treble" {
		t.Errorf("swept knob %q, want treble", d.SweptKnob())
	}
	s, _ := d.Setting(nil)
	if s["bass"] != 0.3 {
		t.Errorf("bass at %v", s["bass"])
	}
	if !strings.Contains(string(d.YAML()), "bass: {value: 100k, taper: audio, position: 0.3}") {
		t.Errorf("written back as\n%s", d.YAML())
	}
}
