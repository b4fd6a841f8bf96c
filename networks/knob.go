package networks

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
)

// Knob is a control of a design: the blend knob, the level, or a pot (or
// gang of pots) of a netlist. A knob with no position given is swept by
// default.
type Knob struct {
	Name     string
	Position float64 // where it sits when a command does not set it
	Set      bool    // whether the design file gives its position
}

// UnsetPosition is where a knob with no position sits when another knob is
// the one swept: the centre of its turn.
const UnsetPosition = 0.5

// Setting is a position, 0..1, for every knob of a design, by knob name.
type Setting map[string]float64

// Knobs returns the design's knobs in the order the file first names them,
// the level last.
func (d *Design) Knobs() []Knob {
	var ks []Knob
	if d.Tone.Network == BlendNetwork {
		ks = append(ks, Knob{Name: BlendKnob, Position: UnsetPosition})
	} else {
		seen := map[string]bool{}
		for _, p := range d.Tone.Parts {
			if p.Kind != PartPot || seen[p.knob()] {
				continue
			}
			seen[p.knob()] = true
			k := Knob{Name: p.knob(), Position: UnsetPosition}
			if p.Position != nil {
				k.Position, k.Set = *p.Position, true
			}
			ks = append(ks, k)
		}
	}
	if d.Level != nil {
		ks = append(ks, Knob{Name: LevelKnob, Position: d.Level.Position, Set: true})
	}
	return ks
}

// KnobNames returns the names of the design's knobs.
func (d *Design) KnobNames() []string {
	var names []string
	for _, k := range d.Knobs() {
		names = append(names, k.Name)
	}
	return names
}

// SweptKnob returns the knob swept by default, the first without a
// position, or "" when every knob has one.
func (d *Design) SweptKnob() string {
	for _, k := range d.Knobs() {
		if !k.Set {
			return k.Name
		}
	}
	return ""
}

// Setting returns the design's own setting, every knob at its position (a
// knob without one at UnsetPosition), with the knobs in over moved. A knob
// name the design does not have is an error that lists its knobs.
func (d *Design) Setting(over map[string]float64) (Setting, error) {
	s := Setting{}
	for _, k := range d.Knobs() {
		s[k.Name] = k.Position
	}
	for name, p := range over {
		if err := d.checkKnob(name); err != nil {
			return nil, err
		}
		if !(p >= 0 && p <= 1) {
			return nil, fmt.Errorf("knob %s: position %v is outside 0..1", name, p)
		}
		s[name] = p
	}
	return s, nil
}

func (d *Design) checkKnob(name string) error {
	for _, k := range d.Knobs() {
		if k.Name == name {
			return nil
		}
	}
	names := d.KnobNames()
	if len(names) == 0 {
		return fmt.Errorf("unknown knob %q: this design has no knobs", name)
	}
	return fmt.Errorf("unknown knob %q: this design's knobs are %s", name, strings.Join(names, ", "))
}

// WithPositions returns a copy of d whose knobs that have a position (and
// the level) sit where s puts them; knobs without one stay without.
func (d *Design) WithPositions(s Setting) *Design {
	c := d.Clone()
	for i, p := range c.Tone.Parts {
		if v, ok := s[p.knob()]; ok && p.Kind == PartPot && p.Position != nil {
			c.Tone.Parts[i].Position = &v
		}
	}
	if v, ok := s[LevelKnob]; ok && c.Level != nil {
		c.Level.Position = v
	}
	return c
}

// KnobList is a knob and the positions to put it at.
type KnobList struct {
	Name      string
	Positions []float64
}

// Settings returns every combination of the lists' positions (the first
// list outermost), the other knobs at their positions. With no lists, the
// swept knob (SweptKnob) takes DefaultPositions, or, when every knob has a
// position, the design's own setting is the one setting.
func (d *Design) Settings(lists []KnobList) ([]Setting, error) {
	if len(lists) == 0 {
		if k := d.SweptKnob(); k != "" {
			lists = []KnobList{{k, DefaultPositions}}
		}
	}
	seen := map[string]bool{}
	for _, l := range lists {
		if err := d.checkKnob(l.Name); err != nil {
			return nil, err
		}
		if seen[l.Name] {
			return nil, fmt.Errorf("knob %s is given twice", l.Name)
		}
		seen[l.Name] = true
		if err := CheckPositions(l.Positions); err != nil {
			return nil, fmt.Errorf("knob %s: %w", l.Name, err)
		}
	}
	base, err := d.Setting(nil)
	if err != nil {
		return nil, err
	}
	out := []Setting{base}
	for _, l := range lists {
		var next []Setting
		for _, s := range out {
			for _, p := range l.Positions {
				c := s.clone()
				c[l.Name] = p
				next = append(next, c)
			}
		}
		out = next
	}
	return out, nil
}

func (s Setting) clone() Setting {
	c := make(Setting, len(s))
	for k, v := range s {
		c[k] = v
	}
	return c
}

// With returns a copy of s with knob name at p.
func (s Setting) With(name string, p float64) Setting {
	c := s.clone()
	c[name] = p
	return c
}

// Label names the knobs of s among names with their positions, as tables
// and plot legends show a setting: "treble 0.5, bass 0".
func (s Setting) Label(names []string) string {
	var parts []string
	for _, n := range names {
		if p, ok := s[n]; ok {
			parts = append(parts, n+" "+strconv.FormatFloat(p, 'g', 4, 64))
		}
	}
	return strings.Join(parts, ", ")
}

// Varied returns, in the design's knob order, the knobs a table or legend
// must name for the settings ss: those whose positions differ between the
// settings, those at a position other than the design's, and those the
// design gives no position (swept by default).
func (d *Design) Varied(ss []Setting) []string {
	var names []string
	for _, k := range d.Knobs() {
		named := !k.Set
		for _, s := range ss {
			if p, ok := s[k.Name]; ok && (p != k.Position || p != ss[0][k.Name]) {
				named = true
			}
		}
		if named {
			names = append(names, k.Name)
		}
	}
	return names
}

// ParseKnobFlag reads NAME=LIST, LIST being comma-separated positions
// 0..1, as the --knob flag gives it.
func ParseKnobFlag(s string) (KnobList, error) {
	name, list, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if !ok || name == "" || strings.TrimSpace(list) == "" {
		return KnobList{}, fmt.Errorf("%q: write NAME=POSITIONS, e.g. treble=0,0.5,1", s)
	}
	kl := KnobList{Name: name}
	for _, f := range strings.Split(list, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil {
			return KnobList{}, fmt.Errorf("%q: %q is not a knob position (a number from 0 to 1)", s, strings.TrimSpace(f))
		}
		kl.Positions = append(kl.Positions, v)
	}
	if err := CheckPositions(kl.Positions); err != nil {
		return KnobList{}, fmt.Errorf("%q: %w", s, err)
	}
	return kl, nil
}

// sortedKnobs returns the names of s in order, for stable output.
func (s Setting) sortedKnobs() []string {
	names := make([]string, 0, len(s))
	for n := range s {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}
