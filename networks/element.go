package networks

import "fmt"

// Kind is the kind of a two-terminal element.
type Kind int

// The element kinds a Network holds.
const (
	Resistor Kind = iota
	Capacitor
	Inductor
)

func (k Kind) String() string {
	switch k {
	case Resistor:
		return "resistor"
	case Capacitor:
		return "capacitor"
	case Inductor:
		return "inductor"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// unit is the SI unit of the element's value.
func (k Kind) unit() string {
	switch k {
	case Resistor:
		return "Ω"
	case Capacitor:
		return "F"
	}
	return "H"
}

// Element is a resistor, capacitor or inductor between nodes A and B.
type Element struct {
	Name  string
	Kind  Kind
	A, B  string
	Value float64 // Ω, F or H
}

// admittance returns the element's admittance at angular frequency w.
func (e *Element) admittance(w float64) complex128 {
	switch e.Kind {
	case Capacitor:
		return complex(0, w*e.Value)
	case Inductor:
		return complex(0, -1/(w*e.Value))
	}
	return complex(1/e.Value, 0)
}
