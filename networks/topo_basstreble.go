package networks

// BassTrebleNetwork is the passive two-knob bass and treble shelving
// network (the passive form of the textbook bass/treble tone control): a
// bass divider whose pot is bridged by a capacitor on each side of its
// wiper, and a treble divider of two capacitors with a pot between them,
// mixed at the output through an isolating resistor. Each knob at 0 cuts,
// at 1 boosts, and at the centre the two paths give a flat response
// when top_r:bottom_r and bass_bottom_c:bass_top_c and
// treble_bottom_c:treble_top_c are about the same ratio (10:1) and the
// pots are audio taper (10 % of the track at the centre).
//
//	bass:    in ──top_r── A ═══ bass pot ═══ B ──bottom_r── gnd       (track from B, knob 0, to A)
//	                      A ──bass_top_c── W ──bass_bottom_c── B      (W: the bass pot's wiper)
//	                                       W ──mix_r── out
//	treble:  in ──treble_top_c── T ═══ treble pot ═══ U ──treble_bottom_c── gnd
//	                                   (track from U, knob 0, to T; its wiper is out)
const BassTrebleNetwork = "bass-treble"

func init() {
	registerTopology(&Topology{
		Name:    BassTrebleNetwork,
		Summary: "passive bass and treble shelving controls, each cut at 0 and boost at 1 (knobs: bass, treble)",
		Keys: []TopoKey{
			{Key: "bass", Form: FormPot, Parts: []string{"bass"}, Default: []float64{100e3}, Taper: Audio, Role: "bass pot"},
			{Key: "treble", Form: FormPot, Parts: []string{"treble"}, Default: []float64{100e3}, Taper: Audio, Role: "treble pot"},
			{Key: "top_r", Form: FormR, Parts: []string{"top_r"}, Default: []float64{33e3}, Role: "bass divider's upper resistor"},
			{Key: "bottom_r", Form: FormR, Parts: []string{"bottom_r"}, Default: []float64{3.3e3}, Role: "bass divider's lower resistor"},
			{Key: "bass_top_c", Form: FormC, Parts: []string{"bass_top_c"}, Default: []float64{6.8e-9}, Role: "capacitor across the bass pot's upper half"},
			{Key: "bass_bottom_c", Form: FormC, Parts: []string{"bass_bottom_c"}, Default: []float64{68e-9}, Role: "capacitor across the bass pot's lower half"},
			{Key: "treble_top_c", Form: FormC, Parts: []string{"treble_top_c"}, Default: []float64{1e-9}, Role: "treble divider's upper capacitor"},
			{Key: "treble_bottom_c", Form: FormC, Parts: []string{"treble_bottom_c"}, Default: []float64{10e-9}, Role: "treble divider's lower capacitor"},
			{Key: "mix_r", Form: FormR, Parts: []string{"mix_r"}, Default: []float64{33e3}, Role: "resistor from the bass wiper to the output"},
		},
		Expand: func(v TopoValues) []NetPart {
			var ps []NetPart
			ps = append(ps, v.Two("top_r", NetIn, "A")...)
			ps = append(ps, v.Pot("bass", "B", "A", "W")...)
			ps = append(ps, v.Two("bass_top_c", "A", "W")...)
			ps = append(ps, v.Two("bass_bottom_c", "W", "B")...)
			ps = append(ps, v.Two("bottom_r", "B", NetGnd)...)
			ps = append(ps, v.Two("mix_r", "W", NetOut)...)
			ps = append(ps, v.Two("treble_top_c", NetIn, "T")...)
			ps = append(ps, v.Pot("treble", "U", "T", NetOut)...)
			ps = append(ps, v.Two("treble_bottom_c", "U", NetGnd)...)
			return ps
		},
	})
}
