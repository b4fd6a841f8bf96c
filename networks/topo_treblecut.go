package networks

// TrebleCutNetwork is a single-knob treble cut: a pot, wired as a variable
// resistor, feeding a capacitor to ground, the output taken across the
// capacitor; an optional fixed resistor in series with the pot sets the
// brightest setting's corner. Knob 0 is the pot's least resistance
// (brightest), knob 1 its most (darkest).
//
//	in ──series_r── a ──cut (pot as variable resistor, a→out)── out
//	                                                             │
//	                                                           cut_c
//	                                                             │
//	                                                            gnd
//
// Without series_r the pot starts at in.
const TrebleCutNetwork = "treble-cut"

func init() {
	registerTopology(&Topology{
		Name:    TrebleCutNetwork,
		Summary: "a pot as a variable resistor feeding a capacitor to ground, with an optional fixed series resistor (knob: cut, 1 darkest)",
		Keys: []TopoKey{
			{Key: "cut", Form: FormPot, Parts: []string{"cut"}, Default: []float64{250e3}, Taper: Audio, Role: "cut pot (variable resistor)"},
			{Key: "c", Form: FormC, Parts: []string{"cut_c"}, Default: []float64{1e-9}, Role: "capacitor to ground"},
			{Key: "series_r", Form: FormR, Parts: []string{"series_r"}, Default: []float64{1e3}, Optional: true, Role: "fixed series resistor"},
		},
		Expand: func(v TopoValues) []NetPart {
			start := NetIn
			var ps []NetPart
			if v.Has("series_r") {
				ps = append(ps, v.Two("series_r", NetIn, "a")...)
				start = "a"
			}
			ps = append(ps, v.Pot("cut", start, NetOut, NetOut)...)
			ps = append(ps, v.Two("cut_c", NetOut, NetGnd)...)
			return ps
		},
	})
}
