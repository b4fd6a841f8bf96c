package networks

// ThreeBandStackNetwork is the three-knob passive tone stack of valve
// amplifiers: a treble capacitor from the input to the top of the treble
// pot, whose wiper is the output; below the treble pot the bass pot and
// then the mid pot, each wired as a variable resistor, down to ground; and
// the slope resistor from the input to a node that feeds the bottom of the
// treble pot through the bass capacitor and the top of the mid pot through
// the mid capacitor. Every knob at 0 is its least (treble: wiper at the
// bottom; bass and mid: no resistance), at 1 its most.
//
//	in ──treble_c── t ──treble (pot, b→t)── wiper: out
//	                                 b
//	in ──slope_r── n ──bass_c─────── b
//	               │                 bass (pot as variable resistor, b→m)
//	               └──mid_c───────── m
//	                                 mid (pot as variable resistor, m→gnd)
//	                                 gnd
const ThreeBandStackNetwork = "three-band-stack"

func init() {
	registerTopology(&Topology{
		Name:    ThreeBandStackNetwork,
		Summary: "the passive treble, bass and mid stack of valve amplifiers, with its slope resistor and three capacitors (knobs: treble, bass, mid)",
		Keys: []TopoKey{
			{Key: "treble", Form: FormPot, Parts: []string{"treble"}, Default: []float64{250e3}, Taper: Audio, Role: "treble pot"},
			{Key: "bass", Form: FormPot, Parts: []string{"bass"}, Default: []float64{1e6}, Taper: Audio, Role: "bass pot (variable resistor)"},
			{Key: "mid", Form: FormPot, Parts: []string{"mid"}, Default: []float64{25e3}, Taper: Linear, Role: "mid pot (variable resistor)"},
			{Key: "slope_r", Form: FormR, Parts: []string{"slope_r"}, Default: []float64{100e3}, Role: "slope resistor"},
			{Key: "treble_c", Form: FormC, Parts: []string{"treble_c"}, Default: []float64{220e-12}, Role: "treble capacitor"},
			{Key: "bass_c", Form: FormC, Parts: []string{"bass_c"}, Default: []float64{22e-9}, Role: "bass capacitor"},
			{Key: "mid_c", Form: FormC, Parts: []string{"mid_c"}, Default: []float64{22e-9}, Role: "mid capacitor"},
		},
		Expand: func(v TopoValues) []NetPart {
			var ps []NetPart
			ps = append(ps, v.Two("treble_c", NetIn, "t")...)
			ps = append(ps, v.Pot("treble", "b", "t", NetOut)...)
			ps = append(ps, v.Two("slope_r", NetIn, "n")...)
			ps = append(ps, v.Two("bass_c", "n", "b")...)
			ps = append(ps, v.Pot("bass", "b", "m", "m")...)
			ps = append(ps, v.Two("mid_c", "n", "m")...)
			ps = append(ps, v.Pot("mid", "m", NetGnd, NetGnd)...)
			return ps
		},
	})
}
