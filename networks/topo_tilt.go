package networks

// TiltNetwork is a one-knob tilt control: a pot crossfades between a
// darker node, a first-order shelving divider that passes the lows and
// lets the highs down by top_r:shunt_r (a series resistor, then a resistor
// and capacitor in series to ground), and a brighter node, its mirror
// image (a resistor bridged by a capacitor, then a resistor to ground),
// which passes the highs and lets the lows down. With both shelves
// centred on one frequency the curve turns about it: knob 0 darkest,
// 1 brightest, near flat at the centre.
//
//	in ──dark_r── d ──dark_shunt_r── e ──dark_c── gnd
//	              │
//	            tilt (pot, d→h) ── wiper: out
//	              │
//	in ──bright_r (bridged by bright_c)── h ──bright_shunt_r── gnd
const TiltNetwork = "tilt"

func init() {
	registerTopology(&Topology{
		Name:    TiltNetwork,
		Summary: "one knob that tilts the curve about a pivot frequency, darker at 0 and brighter at 1 (knob: tilt)",
		Keys: []TopoKey{
			{Key: "tilt", Form: FormPot, Parts: []string{"tilt"}, Default: []float64{500e3}, Taper: Linear, Role: "tilt pot"},
			{Key: "dark_r", Form: FormR, Parts: []string{"dark_r"}, Default: []float64{180e3}, Role: "dark shelf's series resistor"},
			{Key: "dark_shunt_r", Form: FormR, Parts: []string{"dark_shunt_r"}, Default: []float64{47e3}, Role: "dark shelf's shunt resistor"},
			{Key: "dark_c", Form: FormC, Parts: []string{"dark_c"}, Default: []float64{1.5e-9}, Role: "dark shelf's capacitor"},
			{Key: "bright_r", Form: FormR, Parts: []string{"bright_r"}, Default: []float64{180e3}, Role: "bright shelf's series resistor"},
			{Key: "bright_c", Form: FormC, Parts: []string{"bright_c"}, Default: []float64{2.2e-9}, Role: "bright shelf's bridging capacitor"},
			{Key: "bright_shunt_r", Form: FormR, Parts: []string{"bright_shunt_r"}, Default: []float64{47e3}, Role: "bright shelf's shunt resistor"},
		},
		Expand: func(v TopoValues) []NetPart {
			var ps []NetPart
			ps = append(ps, v.Two("dark_r", NetIn, "d")...)
			ps = append(ps, v.Two("dark_shunt_r", "d", "e")...)
			ps = append(ps, v.Two("dark_c", "e", NetGnd)...)
			ps = append(ps, v.Two("bright_r", NetIn, "h")...)
			ps = append(ps, v.Two("bright_c", NetIn, "h")...)
			ps = append(ps, v.Two("bright_shunt_r", "h", NetGnd)...)
			ps = append(ps, v.Pot("tilt", "d", "h", NetOut)...)
			return ps
		},
	})
}
