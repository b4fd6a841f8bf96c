package live

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"tonewright/networks"
)

// The knobs of a blend design: the blend pot and, when the design has one,
// the level pot. Any other design names its own (networks.Design.Knobs).
const (
	KnobBlend = networks.BlendKnob
	KnobLevel = networks.LevelKnob
)

// BlendStart is where a knob without a position starts: the centre.
const BlendStart = networks.UnsetPosition

// designModel is the Model over a networks.Design: any tone network, its
// filter sections and level pot, every pot a knob.
type designModel struct {
	d    *networks.Design
	name string
}

// NewDesignModel returns the Model of a valid design. name is shown on the
// page when the design has none of its own.
func NewDesignModel(d *networks.Design, name string) (Model, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if d.Name != "" {
		name = d.Name
	}
	return &designModel{d: d.Clone(), name: name}, nil
}

// DesignOf returns the networks.Design behind a Model made by
// NewDesignModel, or nil. A Renderer uses it.
func DesignOf(m Model) *networks.Design {
	if dm, ok := m.(*designModel); ok {
		return dm.d.Clone()
	}
	return nil
}

func (m *designModel) Name() string        { return m.name }
func (m *designModel) Band() networks.Band { return m.d.Band }

func (m *designModel) Knobs() []Knob {
	var ks []Knob
	for _, k := range m.d.Knobs() {
		label := k.Name
		if k.Name == KnobBlend && m.d.Tone.Network == networks.BlendNetwork {
			label = "blend (low-pass ↔ high-pass)"
		}
		ks = append(ks, Knob{Name: k.Name, Label: label, Saved: k.Position})
	}
	return ks
}

// surroundings are the values around the network the page lets the user
// change.
var surroundings = []Part{
	{Name: "source.impedance", Role: "source impedance", Group: "surroundings", Kind: "source", Unit: "Ω", Zero: "ideal source"},
	{Name: "source.series_c", Role: "coupling capacitor", Group: "surroundings", Kind: "source", Unit: "F", Zero: "none"},
	{Name: "load.r", Role: "load resistance", Group: "surroundings", Kind: "load", Unit: "Ω", Open: true},
	{Name: "load.c", Role: "load capacitance", Group: "surroundings", Kind: "load", Unit: "F", Zero: "none"},
}

func (m *designModel) Parts() []Part {
	var ps []Part
	for _, p := range m.d.Parts() {
		q := Part{Name: p.Name, Role: p.Role, Kind: p.Kind.String(), Value: p.Value, Unit: "Ω", Group: "tone"}
		switch p.Kind {
		case networks.PartCapacitor:
			q.Unit = "F"
		case networks.PartInductor:
			q.Unit = "H"
		}
		switch {
		case p.Name == "level":
			q.Group = "level"
		case strings.HasPrefix(p.Name, "filter"):
			q.Group = "filters"
		}
		ps = append(ps, q)
	}
	for _, s := range surroundings {
		s.Value = *m.surrounding(m.d, s.Name)
		ps = append(ps, s)
	}
	return ps
}

func (m *designModel) surrounding(d *networks.Design, name string) *float64 {
	switch name {
	case "source.impedance":
		return &d.Source.Impedance
	case "source.series_c":
		return &d.Source.SeriesC
	case "load.r":
		return &d.Load.R
	case "load.c":
		return &d.Load.C
	}
	return nil
}

func (m *designModel) With(values map[string]float64) (Model, error) {
	d := m.d.Clone()
	for name, v := range values {
		p := m.surrounding(d, name)
		if p == nil {
			p = d.PartRef(name)
		}
		if p == nil {
			return nil, &ValueError{Field: name, Err: fmt.Errorf("this design has no part %q", name)}
		}
		*p = v
	}
	if err := d.Validate(); err != nil {
		var fe *networks.FieldError
		if errors.As(err, &fe) {
			return nil, &ValueError{Field: partOfKey(fe.Key), Err: fe.Err}
		}
		return nil, err
	}
	return &designModel{d: d, name: m.name}, nil
}

var filterKey = regexp.MustCompile(`^filters\[(\d+)\]\.([rc])$`)

// partOfKey maps a design-file key path to the page's part name.
func partOfKey(key string) string {
	switch key {
	case "tone.lowpass.r", "tone.lowpass.c", "tone.highpass.c", "tone.highpass.r":
		return key[len("tone."):]
	case "tone.pot.value":
		return "pot"
	case "level.pot.value":
		return "level"
	}
	if rest, ok := strings.CutPrefix(key, "tone.parts."); ok {
		name, _, _ := strings.Cut(rest, ".")
		return name
	}
	if s := filterKey.FindStringSubmatch(key); s != nil {
		i, _ := strconv.Atoi(s[1])
		return fmt.Sprintf("filter%d.%s", i+1, s[2])
	}
	return key
}

// at returns the design with its knobs' positions set from s, where the
// design gives them (so that a save keeps the page's setting), and the
// whole setting.
func (m *designModel) at(s Setting) (*networks.Design, networks.Setting, error) {
	names := map[string]bool{}
	for _, k := range m.d.Knobs() {
		names[k.Name] = true
	}
	for name, v := range s {
		if !names[name] {
			return nil, nil, &ValueError{Field: name, Err: fmt.Errorf("this design has no knob %q", name)}
		}
		if !(v >= 0 && v <= 1) {
			return nil, nil, &ValueError{Field: name, Err: fmt.Errorf("knob position %v is outside 0..1", v)}
		}
	}
	full, err := m.d.Setting(s)
	if err != nil {
		return nil, nil, err
	}
	return m.d.WithPositions(full), full, nil
}

// Common narrows a setting to the knobs a model has, so that a design
// compared with another follows the knobs they share.
func Common(m Model, s Setting) Setting {
	out := Setting{}
	for _, k := range m.Knobs() {
		if v, ok := s[k.Name]; ok {
			out[k.Name] = v
		}
	}
	return out
}

func (m *designModel) Curve(s Setting, hz, db []float64) error {
	if len(hz) != len(db) {
		return fmt.Errorf("curve: %d frequencies but room for %d gains", len(hz), len(db))
	}
	d, full, err := m.at(s)
	if err != nil {
		return err
	}
	k, err := d.Compile(full)
	if err != nil {
		return err
	}
	for i, f := range hz {
		db[i] = k.GainDB(f)
	}
	return nil
}

func (m *designModel) Figures(s Setting) (Figures, error) {
	d, full, err := m.at(s)
	if err != nil {
		return Figures{}, err
	}
	k, err := d.Compile(full)
	if err != nil {
		return Figures{}, err
	}
	pm := networks.MeasureAt(networks.NewMeter(d.Band), k)
	f := Figures{Gain1kDB: finite(pm.Gain1kDB), Scoop: pm.Scoop, Peak: pm.Peak, CornerHz: pm.CornerHz, LowCornerHz: pm.LowCornerHz}
	if in, out, err := d.Impedances(full, networks.ImpedanceHz); err == nil {
		f.InputImpedanceOhm, f.OutputImpedanceOhm = finite(in), finite(out)
	}
	return f, nil
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func (m *designModel) Encode(s Setting) ([]byte, error) {
	d, _, err := m.at(s)
	if err != nil {
		return nil, err
	}
	return d.YAML(), nil
}
