package networks

import (
	"fmt"
	"math"
)

// Ground is the name of the reference node. "gnd" and "GND" name it too.
const Ground = "0"

func isGround(node string) bool {
	return node == Ground || node == "gnd" || node == "GND"
}

// Network is a linear circuit between named nodes: two-terminal elements,
// potentiometers, one ideal voltage source behind a series output impedance,
// and the node whose voltage is the output. The zero value is an empty
// network ready to use. Build it with the methods below, then Compile it.
type Network struct {
	Elements []Element
	Pots     []PotElement

	source  string  // node the source drives
	sourceZ float64 // series output resistance of the source, Ω
	out     string
}

// PotElement is a potentiometer between three nodes of a Network.
type PotElement struct {
	Name                 string
	Start, Wiper, Finish string // Start is the counter-clockwise end
	Pot                  Pot
}

// Add adds a two-terminal element.
func (n *Network) Add(e Element) { n.Elements = append(n.Elements, e) }

// Resistor adds a resistor of r ohms between a and b.
func (n *Network) Resistor(name, a, b string, r float64) {
	n.Add(Element{Name: name, Kind: Resistor, A: a, B: b, Value: r})
}

// Capacitor adds a capacitor of c farads between a and b.
func (n *Network) Capacitor(name, a, b string, c float64) {
	n.Add(Element{Name: name, Kind: Capacitor, A: a, B: b, Value: c})
}

// Inductor adds an inductor of l henries between a and b.
func (n *Network) Inductor(name, a, b string, l float64) {
	n.Add(Element{Name: name, Kind: Inductor, A: a, B: b, Value: l})
}

// Potentiometer adds a pot whose track runs from start to finish.
func (n *Network) Potentiometer(name, start, wiper, finish string, p Pot) {
	n.Pots = append(n.Pots, PotElement{Name: name, Start: start, Wiper: wiper, Finish: finish, Pot: p})
}

// SetSource places the ideal unit source: it drives node through a series
// resistance of impedance ohms (0 for an ideal voltage at the node).
func (n *Network) SetSource(node string, impedance float64) {
	n.source, n.sourceZ = node, impedance
}

// SetOutput names the output node.
func (n *Network) SetOutput(node string) { n.out = node }

// Output returns the output node's name.
func (n *Network) Output() string { return n.out }

// Source returns the node the source drives and its series resistance.
func (n *Network) Source() (node string, impedance float64) { return n.source, n.sourceZ }

// Flatten returns the network's two-terminal elements with every pot
// expanded into its two segments (named NAME_a from the start to the wiper
// and NAME_b from the wiper to the finish), as the solver and a SPICE deck
// see them.
func (n *Network) Flatten() []Element {
	out := make([]Element, 0, len(n.Elements)+2*len(n.Pots))
	out = append(out, n.Elements...)
	for _, p := range n.Pots {
		a, b := p.Pot.Segments()
		out = append(out,
			Element{Name: p.Name + "_a", Kind: Resistor, A: p.Start, B: p.Wiper, Value: a},
			Element{Name: p.Name + "_b", Kind: Resistor, A: p.Wiper, B: p.Finish, Value: b})
	}
	return out
}

// check validates values and references, naming the element at fault.
func (n *Network) check() error {
	if n.source == "" {
		return fmt.Errorf("network has no source: call SetSource")
	}
	if isGround(n.source) {
		return fmt.Errorf("the source drives the ground node")
	}
	if n.out == "" {
		return fmt.Errorf("network has no output node: call SetOutput")
	}
	if !(n.sourceZ >= 0) || math.IsInf(n.sourceZ, 0) {
		return fmt.Errorf("source impedance %v must be zero or positive and finite", n.sourceZ)
	}
	for _, e := range n.Elements {
		if !(e.Value > 0) || math.IsInf(e.Value, 0) {
			return fmt.Errorf("%s %s: value %v %s must be positive and finite", e.Kind, e.Name, e.Value, e.Kind.unit())
		}
		if e.A == "" || e.B == "" {
			return fmt.Errorf("%s %s: a terminal has no node name", e.Kind, e.Name)
		}
	}
	for _, p := range n.Pots {
		if err := p.Pot.check(); err != nil {
			return fmt.Errorf("pot %s: %v", p.Name, err)
		}
		if p.Start == "" || p.Wiper == "" || p.Finish == "" {
			return fmt.Errorf("pot %s: a terminal has no node name", p.Name)
		}
	}
	return nil
}
