package networks

import (
	"fmt"
	"strings"
)

// PartKind says what kind of component a part is.
type PartKind int

// The kinds of part a design has.
const (
	PartResistor PartKind = iota
	PartCapacitor
	PartPot
	PartInductor
)

// Unit returns the SI unit of the kind's value: Ω for resistors and pots,
// F for capacitors, H for inductors.
func (k PartKind) Unit() string {
	switch k {
	case PartCapacitor:
		return "F"
	case PartInductor:
		return "H"
	}
	return "Ω"
}

func (k PartKind) String() string {
	switch k {
	case PartResistor:
		return "resistor"
	case PartCapacitor:
		return "capacitor"
	case PartInductor:
		return "inductor"
	}
	return "pot"
}

// Part is one component of a design, by the name the tool uses for it in
// reports and on the command line: lowpass.r, lowpass.c, highpass.c,
// highpass.r, pot (the blend pot's track), filter1.r, filter1.c, filter2.r,
// …, level (the level pot's track).
type Part struct {
	Name  string
	Role  string // what it does, for tables: "low-pass leg R"
	Kind  PartKind
	Value float64
}

// Parts returns the design's parts in signal order.
func (d *Design) Parts() []Part {
	var ps []Part
	if d.Tone.Network == BlendNetwork {
		ps = []Part{
			{"lowpass.r", "blend low-pass leg R", PartResistor, d.Tone.Lowpass.R},
			{"lowpass.c", "blend low-pass leg C", PartCapacitor, d.Tone.Lowpass.C},
			{"highpass.c", "blend high-pass leg C", PartCapacitor, d.Tone.Highpass.C},
			{"highpass.r", "blend high-pass leg R", PartResistor, d.Tone.Highpass.R},
			{"pot", "blend pot", PartPot, d.Tone.Pot.Value},
		}
	} else {
		for _, p := range d.Tone.Parts {
			role := d.Tone.partRole(p.Name)
			if role == "" {
				role = netPartRole(p)
			}
			ps = append(ps, Part{p.Name, role, p.Kind, p.Value})
		}
	}
	for i, f := range d.Filters {
		ps = append(ps,
			Part{fmt.Sprintf("filter%d.r", i+1), fmt.Sprintf("filter section %d R", i+1), PartResistor, f.R},
			Part{fmt.Sprintf("filter%d.c", i+1), fmt.Sprintf("filter section %d C", i+1), PartCapacitor, f.C})
	}
	if d.Level != nil {
		ps = append(ps, Part{"level", "level pot", PartPot, d.Level.Pot.Value})
	}
	return ps
}

// PartNames returns the names Parts uses for this design.
func (d *Design) PartNames() []string {
	var names []string
	for _, p := range d.Parts() {
		names = append(names, p.Name)
	}
	return names
}

// SetPart sets the value of the named part.
func (d *Design) SetPart(name string, v float64) error {
	p := d.PartRef(name)
	if p == nil {
		return fmt.Errorf("unknown part %q: this design's parts are %s", name, strings.Join(d.PartNames(), ", "))
	}
	*p = v
	return nil
}

// PartValue returns the value of the named part.
func (d *Design) PartValue(name string) (float64, error) {
	p := d.PartRef(name)
	if p == nil {
		return 0, fmt.Errorf("unknown part %q: this design's parts are %s", name, strings.Join(d.PartNames(), ", "))
	}
	return *p, nil
}

// PartRef returns where the design keeps the named part's value, or nil for
// a name it has no part by: a part of Parts, or of StudyParts (the source's
// coupling capacitor and the load's capacitance). The search writes
// candidate values through it, for the parts Parts names.
func (d *Design) PartRef(name string) *float64 {
	if p := d.chainPartRef(name); p != nil {
		return p
	}
	if d.Tone.Network != BlendNetwork {
		for i := range d.Tone.Parts {
			if d.Tone.Parts[i].Name == name {
				return &d.Tone.Parts[i].Value
			}
		}
		if name != "level" && !strings.HasPrefix(name, "filter") {
			return nil
		}
	}
	switch name {
	case "lowpass.r":
		return &d.Tone.Lowpass.R
	case "lowpass.c":
		return &d.Tone.Lowpass.C
	case "highpass.c":
		return &d.Tone.Highpass.C
	case "highpass.r":
		return &d.Tone.Highpass.R
	case "pot":
		return &d.Tone.Pot.Value
	case "level":
		if d.Level != nil {
			return &d.Level.Pot.Value
		}
		return nil
	}
	var i int
	var rc string
	if _, err := fmt.Sscanf(name, "filter%d.%s", &i, &rc); err == nil && i >= 1 && i <= len(d.Filters) &&
		name == fmt.Sprintf("filter%d.%s", i, rc) {
		switch rc {
		case "r":
			return &d.Filters[i-1].R
		case "c":
			return &d.Filters[i-1].C
		}
	}
	return nil
}

// Clone returns a deep copy of the design.
func (d *Design) Clone() *Design {
	c := *d
	c.Filters = append([]RC(nil), d.Filters...)
	c.Tone.Parts = append([]NetPart(nil), d.Tone.Parts...)
	for i, p := range c.Tone.Parts {
		if p.Position != nil {
			v := *p.Position
			c.Tone.Parts[i].Position = &v
		}
	}
	if d.Level != nil {
		l := *d.Level
		c.Level = &l
	}
	return &c
}
