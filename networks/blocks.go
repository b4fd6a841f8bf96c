package networks

import (
	"fmt"
	"math"
)

// RC is a resistor and a capacitor, the two parts of a filter leg or
// section.
type RC struct {
	R float64 // Ω
	C float64 // F
}

// Source is the stage that drives the tone section: an ideal voltage behind
// an output impedance, optionally through a series coupling capacitor.
type Source struct {
	Impedance float64 // Ω; 0 is an ideal voltage source
	SeriesC   float64 // F; 0 means DC-coupled (no capacitor)
}

// Blend is the blend tone network: from one input node a low-pass leg
// (series R, then shunt C to ground) and a high-pass leg (series C, then
// shunt R to ground); a pot's track runs from the low-pass leg's output to
// the high-pass leg's output and its wiper is the network's output. Knob 0
// puts the wiper at the low-pass end, knob 1 at the high-pass end.
type Blend struct {
	Lowpass  RC
	Highpass RC
	Pot      Pot // Position is the blend knob
}

// Level is a level (volume) pot: the track from the previous stage's output
// to ground, the wiper drives what follows. Position 1 is full level.
type Level struct {
	Pot Pot
}

// Load is what the output drives: a resistance in parallel with an optional
// capacitance (a cable, say). R = +Inf is an open circuit.
type Load struct {
	R float64 // Ω
	C float64 // F; 0 for none
}

// build adds the source's coupling capacitor, if any, ahead of node in and
// returns the node the ideal source and its impedance drive.
func (s Source) build(n *Network, in string) (drive string) {
	if s.SeriesC > 0 {
		n.Capacitor("Csrc", "drive", in, s.SeriesC)
		return "drive"
	}
	return in
}

// Build adds the blend network from node in to the wiper node out: its
// netlist parts (Parts) at the pot's position.
func (b Blend) Build(n *Network, in, out string) {
	buildParts(n, b.Parts(), Setting{BlendKnob: b.Pot.Position}, func(node string) string {
		switch node {
		case NetIn:
			return in
		case NetOut:
			return out
		case NetGnd:
			return Ground
		}
		return node
	})
}

// Parts returns the blend network in the netlist form, the one circuit its
// short keys stand for: the low-pass leg Rlp (in–lp) and Clp (lp–gnd), the
// high-pass leg Chp (in–hp) and Rhp (hp–gnd), and the pot Ptone from lp
// (knob 0) to hp with its wiper at out, on the knob "blend".
func (b Blend) Parts() []NetPart {
	return []NetPart{
		{Name: "Rlp", Kind: PartResistor, Value: b.Lowpass.R, From: NetIn, To: "lp"},
		{Name: "Clp", Kind: PartCapacitor, Value: b.Lowpass.C, From: "lp", To: NetGnd},
		{Name: "Chp", Kind: PartCapacitor, Value: b.Highpass.C, From: NetIn, To: "hp"},
		{Name: "Rhp", Kind: PartResistor, Value: b.Highpass.R, From: "hp", To: NetGnd},
		{Name: "Ptone", Kind: PartPot, Value: b.Pot.Value, From: "lp", To: "hp", Wiper: NetOut, Taper: b.Pot.Taper, Knob: BlendKnob},
	}
}

// admittances returns the blend network's short-circuit admittance
// parameters between its input and its wiper at angular frequency w (the
// network is reciprocal, so y21 = y12), by Kron reduction of the two legs'
// output nodes; ra and rb are the pot's segments. Reciprocals of the two
// node admittances are taken in real arithmetic, the one hot spot of the
// fast path.
func (b *Blend) admittances(w, ra, rb float64) (y11, y12, y22 complex128) {
	g1, g2 := 1/b.Lowpass.R, 1/b.Highpass.R
	ga, gb := 1/ra, 1/rb
	ia := recip(g1+ga, w*b.Lowpass.C)  // low-pass leg output node
	ib := recip(g2+gb, w*b.Highpass.C) // high-pass leg output node
	y2 := complex(0, w*b.Highpass.C)
	cg1, cga, cgb := complex(g1, 0), complex(ga, 0), complex(gb, 0)
	y11 = cg1 + y2 - cg1*cg1*ia - y2*y2*ib
	y12 = -cg1*cga*ia - y2*cgb*ib
	y22 = cga + cgb - cga*cga*ia - cgb*cgb*ib
	return y11, y12, y22
}

// abcd returns the blend network's transmission matrix at angular
// frequency w: from the Y parameters, A = −y22/y12, B = −1/y12,
// C = −det(Y)/y12, D = −y11/y12.
func (b *Blend) abcd(w, ra, rb float64) abcd {
	y11, y12, y22 := b.admittances(w, ra, rb)
	inv := -1 / y12
	return abcd{y22 * inv, inv, (y11*y22 - y12*y12) * inv, y11 * inv}
}

// recip returns 1/(re + j·im).
func recip(re, im float64) complex128 {
	d := re*re + im*im
	return complex(re/d, -im/d)
}

// BuildLadder adds RC low-pass sections (series R, shunt C) from in to out,
// naming the inner nodes f1, f2, ….
func BuildLadder(n *Network, sections []RC, in, out string) {
	prev := in
	for i, sec := range sections {
		next := fmt.Sprintf("f%d", i+1)
		if i == len(sections)-1 {
			next = out
		}
		n.Resistor(fmt.Sprintf("Rf%d", i+1), prev, next, sec.R)
		n.Capacitor(fmt.Sprintf("Cf%d", i+1), next, Ground, sec.C)
		prev = next
	}
}

// Build adds the level pot: its start to ground, its finish at in, the wiper
// at out.
func (l Level) Build(n *Network, in, out string) {
	n.Potentiometer("Plevel", Ground, out, in, l.Pot)
}

// Build adds the load at node out.
func (l Load) Build(n *Network, out string) {
	if !math.IsInf(l.R, 1) {
		n.Resistor("Rload", out, Ground, l.R)
	}
	if l.C > 0 {
		n.Capacitor("Cload", out, Ground, l.C)
	}
}
