package networks

import (
	"fmt"
	"math"
)

// EndResistance is the contact resistance, in ohms, that the model puts in
// series with each of a pot's two segments (end to wiper). With it a pot at
// an end stop still has a small resistance on the short side, as a real one
// does, and the nodal matrix never becomes singular. The figure, 1 Ω, is of
// the order real carbon tracks show (common practice, no published source).
const EndResistance = 1.0

// Pot is a potentiometer: its track value, taper and knob position.
type Pot struct {
	Value    float64 // track resistance, Ω
	Taper    Taper
	Position float64 // knob rotation, 0 (counter-clockwise) to 1
}

// Segments returns the resistances from the start (counter-clockwise end) to
// the wiper and from the wiper to the finish, each including EndResistance.
func (p Pot) Segments() (start, finish float64) {
	f := p.Taper.Fraction(p.Position)
	return p.Value*f + EndResistance, p.Value*(1-f) + EndResistance
}

func (p Pot) check() error {
	if !(p.Value > 0) || math.IsInf(p.Value, 0) {
		return fmt.Errorf("track value %v must be positive and finite", p.Value)
	}
	if !(p.Position >= 0 && p.Position <= 1) {
		return fmt.Errorf("position %v is outside 0..1", p.Position)
	}
	return p.Taper.check()
}
