package networks

// BoardParts returns every component a builder fits for the design, in
// signal order: the coupling capacitor (when the source has one), then
// the parts of Parts, the level pot among them. The source's output
// impedance and the load belong to the stages before and after, so they
// are not listed.
func (d *Design) BoardParts() []Part {
	ps := d.StudyParts()
	if d.Load.C > 0 {
		ps = ps[:len(ps)-1] // the load's capacitance is the cable and the next stage's
	}
	return ps
}

// PotTaper returns the taper of the pot part of that name (see Parts), and
// false for a name that is not one of the design's pots.
func (d *Design) PotTaper(name string) (Taper, bool) {
	for _, p := range d.Tone.Parts {
		if p.Name == name && p.Kind == PartPot && d.Tone.Network != BlendNetwork {
			return p.Taper, true
		}
	}
	switch {
	case name == "pot" && d.Tone.Network == BlendNetwork:
		return d.Tone.Pot.Taper, true
	case name == "level" && d.Level != nil:
		return d.Level.Pot.Taper, true
	}
	return Taper{}, false
}
