package networks

// BlendFillNetwork is the blend network with a fill control: a second pot,
// wired as a variable resistor in series with the high-pass leg's resistor
// to ground. Turned up, it lengthens the high-pass leg's time constant
// towards the low-pass leg's, so the high-pass leg passes more of the mids
// and the scoop fills in. At fill 0 only the pot's end resistance (1 Ω) is
// left in series with the leg's resistor: the blend network as it is.
//
//	in ──lowpass_r──┬── lp ──────┐
//	                lowpass_c    blend (pot, lp→hp) ── wiper: out
//	                gnd          │
//	in ──highpass_c─┬── hp ──────┘
//	                highpass_r
//	                fl
//	                fill (pot as variable resistor, fl→gnd)
//	                gnd
const BlendFillNetwork = "blend-fill"

func init() {
	registerTopology(&Topology{
		Name:    BlendFillNetwork,
		Summary: "the blend network with a fill pot in its high-pass leg that brings the scooped mids back (knobs: blend, fill)",
		Keys: []TopoKey{
			{Key: "lowpass", Form: FormRC, Parts: []string{"lowpass_r", "lowpass_c"}, Default: []float64{47e3, 10e-9}, Role: "low-pass leg"},
			{Key: "highpass", Form: FormCR, Parts: []string{"highpass_r", "highpass_c"}, Default: []float64{27e3, 2.2e-9}, Role: "high-pass leg"},
			{Key: "pot", Form: FormPot, Parts: []string{"blend"}, Default: []float64{100e3}, Taper: Linear, Role: "blend pot"},
			{Key: "fill", Form: FormPot, Parts: []string{"fill"}, Default: []float64{250e3}, Taper: Linear, Role: "fill pot (variable resistor under the high-pass leg)"},
		},
		Expand: func(v TopoValues) []NetPart {
			var ps []NetPart
			ps = append(ps, v.Two("lowpass_r", NetIn, "lp")...)
			ps = append(ps, v.Two("lowpass_c", "lp", NetGnd)...)
			ps = append(ps, v.Two("highpass_c", NetIn, "hp")...)
			ps = append(ps, v.Two("highpass_r", "hp", "fl")...)
			ps = append(ps, v.Pot("blend", "lp", "hp", NetOut)...)
			ps = append(ps, v.Pot("fill", "fl", NetGnd, NetGnd)...)
			return ps
		},
	})
}
