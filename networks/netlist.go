package networks

import (
	"fmt"
	"regexp"
	"strings"
)

// NetlistNetwork is the name of the netlist form of the tone network in the
// design file: the designer's own circuit, part by part.
const NetlistNetwork = "netlist"

// NetPart is one part of a tone network in the netlist form: a resistor,
// capacitor or inductor between two nodes, or a pot whose track runs from
// From (its start of rotation: knob 0 puts the wiper there) to To, with its
// wiper at Wiper. A pot turns with its knob, named Knob; pots that share a
// knob name are the gangs of one multi-gang pot.
type NetPart struct {
	Name     string
	Kind     PartKind
	Value    float64 // Ω, F, H, or the pot's track in Ω
	From, To string
	Wiper    string   // pots only
	Taper    Taper    // pots only
	Knob     string   // pots only: the knob's name, by default the part's
	Position *float64 // pots only: where the knob sits, nil when it is swept
}

// The nodes a netlist names: in is fed by the source, out is the tone
// network's output, gnd (or 0) is ground.
const (
	NetIn  = "in"
	NetOut = "out"
	NetGnd = "gnd"
)

// reservedNodes are the chain's own nodes around the tone network: a
// netlist's inner nodes may not take these names.
var reservedNodes = regexp.MustCompile(`^(drive|src|tone|filtered|f[0-9]+)$`)

var nodeName = regexp.MustCompile(`^[A-Za-z0-9_]+$`)

// LevelKnob is the name of the level pot's knob, and BlendKnob that of the
// blend network's pot.
const (
	LevelKnob = "level"
	BlendKnob = "blend"
)

// ToneParts returns the design's tone network as netlist parts, whatever
// form the file gives it in.
func (d *Design) ToneParts() []NetPart {
	if d.Tone.Network == BlendNetwork {
		b := Blend{Lowpass: d.Tone.Lowpass, Highpass: d.Tone.Highpass, Pot: Pot{Value: d.Tone.Pot.Value, Taper: d.Tone.Pot.Taper}}
		return b.Parts()
	}
	return d.Tone.Parts
}

// buildParts adds netlist parts to n at the knob setting s, renaming the
// netlist's nodes by node (in, out, gnd and the inner ones).
func buildParts(n *Network, parts []NetPart, s Setting, node func(string) string) {
	for _, p := range parts {
		a, b := node(p.From), node(p.To)
		switch p.Kind {
		case PartResistor:
			n.Resistor(p.Name, a, b, p.Value)
		case PartCapacitor:
			n.Capacitor(p.Name, a, b, p.Value)
		case PartInductor:
			n.Inductor(p.Name, a, b, p.Value)
		case PartPot:
			n.Potentiometer(p.Name, a, node(p.Wiper), b, Pot{Value: p.Value, Taper: p.Taper, Position: s[p.knob()]})
		}
	}
}

func (p *NetPart) knob() string {
	if p.Knob != "" {
		return p.Knob
	}
	return p.Name
}

// checkNetlist validates the netlist's names, nodes and knobs; the values
// are checked with the rest of the design. Keys name the part at fault.
func checkNetlist(parts []NetPart, hasLevel bool) error {
	if len(parts) == 0 {
		return fieldError("tone.parts", fmt.Errorf("the netlist has no parts: give at least one, e.g. R1: {r: 10k, from: in, to: out}"))
	}
	usedIn, usedOut := false, false
	knobPos := map[string]*NetPart{}
	for i := range parts {
		p := &parts[i]
		key := "tone.parts." + p.Name
		if !nodeName.MatchString(p.Name) {
			return fieldError(key, fmt.Errorf("part name %q: use letters, digits and _", p.Name))
		}
		if p.Name == LevelKnob && hasLevel {
			return fieldError(key, fmt.Errorf("the name %q is the level pot's: choose another", p.Name))
		}
		nodes := []struct{ key, node string }{{"from", p.From}, {"to", p.To}}
		if p.Kind == PartPot {
			nodes = append(nodes, struct{ key, node string }{"wiper", p.Wiper})
		}
		for _, nd := range nodes {
			if nd.node == "" {
				return fieldError(key+"."+nd.key, fmt.Errorf("missing: name the node (in, out, gnd or an inner node such as a)"))
			}
			if !nodeName.MatchString(nd.node) {
				return fieldError(key+"."+nd.key, fmt.Errorf("node name %q: use letters, digits and _ (in, out, gnd or 0 for ground)", nd.node))
			}
			if reservedNodes.MatchString(nd.node) {
				return fieldError(key+"."+nd.key, fmt.Errorf("node name %q is used by the chain around the tone network (drive, src, tone, filtered, f1, f2, …): choose another", nd.node))
			}
			usedIn = usedIn || nd.node == NetIn
			usedOut = usedOut || nd.node == NetOut
		}
		if p.Kind != PartPot {
			if p.From == p.To || (isGround(p.From) || p.From == NetGnd) && (isGround(p.To) || p.To == NetGnd) {
				return fieldError(key, fmt.Errorf("both ends on node %q: a part must join two nodes", p.From))
			}
			continue
		}
		k := p.knob()
		if !nodeName.MatchString(k) {
			return fieldError(key+".knob", fmt.Errorf("knob name %q: use letters, digits and _", k))
		}
		if k == LevelKnob && hasLevel {
			return fieldError(key+".knob", fmt.Errorf("the knob name %q is the level pot's: choose another", k))
		}
		if p.Position != nil && !(*p.Position >= 0 && *p.Position <= 1) {
			return fieldError(key+".position", fmt.Errorf("%v is outside 0..1", *p.Position))
		}
		if q, ok := knobPos[k]; ok {
			if (q.Position == nil) != (p.Position == nil) || q.Position != nil && *q.Position != *p.Position {
				return fieldError(key+".position", fmt.Errorf("the pots %s and %s turn on one knob, %s, but give it different positions (%s and %s): give one position, or the same", q.Name, p.Name, k, posText(q.Position), posText(p.Position)))
			}
		} else {
			knobPos[k] = p
		}
	}
	if !usedIn {
		return fieldError("tone.parts", fmt.Errorf("no part touches node in, where the source feeds the network"))
	}
	if !usedOut {
		return fieldError("tone.parts", fmt.Errorf("no part touches node out, the network's output"))
	}
	return nil
}

func posText(p *float64) string {
	if p == nil {
		return "none"
	}
	return fmt.Sprint(*p)
}

// kindKey is the design-file key of each kind of netlist part.
func (k PartKind) key() string {
	return [...]string{"r", "c", "pot", "l"}[k]
}

func netPartRole(p NetPart) string {
	ends := p.From + "–" + p.To
	switch p.Kind {
	case PartPot:
		role := fmt.Sprintf("pot %s, wiper %s", ends, p.Wiper)
		if k := p.knob(); k != p.Name {
			role += ", knob " + k
		}
		return role
	}
	return strings.TrimSpace(p.Kind.String() + " " + ends)
}
