package networks

import "math"

// A pot's taper is itself a tolerance: at a given rotation the share of the
// track on each side of the wiper differs from pot to pot. The tolerance
// study draws it for every knob of the setting: the share F on the shorter
// side of the wiper (F below one half, else 1 − F) moves by up to ± the
// taper tolerance of itself, so an end stop stays an end stop and the share
// stays within 0..1. The knob is then put at the rotation that gives the
// drawn share; the gangs of one knob move together.

// DefaultTaperTolerance is the taper tolerance the tolerance study uses
// unless told otherwise: ± 20 % of the track share (common practice, no
// published source).
const DefaultTaperTolerance = 0.20

// Rotation returns the rotation x in [0, 1] at which the taper's share is
// y (clamped to [0, 1]): the inverse of Fraction. For the exponential laws
// F(x) = (a^x − 1)/(a − 1), so x = ln(1 + y·(a − 1))/ln a.
func (t Taper) Rotation(y float64) float64 {
	y = math.Max(0, math.Min(1, y))
	m := t.Mid()
	if m == 0.5 {
		return y
	}
	u := 1/m - 1
	a := u * u
	return math.Max(0, math.Min(1, math.Log1p(y*(a-1))/math.Log(a)))
}

// shiftShare returns the rotation that moves the share at rotation x by
// dev (in −1..1, in units of the tolerance tol) of its shorter side.
func (t Taper) shiftShare(x, tol, dev float64) float64 {
	f := t.Fraction(x)
	return t.Rotation(f + tol*dev*math.Min(f, 1-f))
}

// knobTaper returns the taper of the knob's pot (of its first gang).
func (d *Design) knobTaper(name string) Taper {
	switch {
	case name == LevelKnob && d.Level != nil:
		return d.Level.Pot.Taper
	case name == BlendKnob && d.Tone.Network == BlendNetwork:
		return d.Tone.Pot.Taper
	}
	for _, p := range d.Tone.Parts {
		if p.Kind == PartPot && p.knob() == name {
			return p.Taper
		}
	}
	return Taper{Law: Linear}
}
