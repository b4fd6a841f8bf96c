package live

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"regexp"
	"strconv"
	"strings"

	"tonewright/networks"
)

// The knobs of today's design: the blend pot and, when the design has
// one, the level pot.
const (
	KnobBlend = "blend"
	KnobLevel = "level"
)

// BlendStart is where the blend knob starts: the design file has no
// position for it, so the centre.
const BlendStart = 0.5

// designModel is the Model over a networks.Design: the blend tone network,
// its filter sections and level pot.
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
	ks := []Knob{{Name: KnobBlend, Label: "blend (low-pass ↔ high-pass)", Saved: BlendStart}}
	if m.d.Level != nil {
		ks = append(ks, Knob{Name: KnobLevel, Label: "level", Saved: m.d.Level.Position})
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
		if p.Kind == networks.PartCapacitor {
			q.Unit = "F"
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
	if s := filterKey.FindStringSubmatch(key); s != nil {
		i, _ := strconv.Atoi(s[1])
		return fmt.Sprintf("filter%d.%s", i+1, s[2])
	}
	return key
}

// at returns the design with its level knob at s, and the blend position.
func (m *designModel) at(s Setting) (*networks.Design, float64, error) {
	blend := BlendStart
	d := m.d
	for name, v := range s {
		if !(v >= 0 && v <= 1) {
			return nil, 0, &ValueError{Field: name, Err: fmt.Errorf("knob position %v is outside 0..1", v)}
		}
		switch {
		case name == KnobBlend:
			blend = v
		case name == KnobLevel && m.d.Level != nil:
			if d == m.d {
				d = m.d.Clone()
			}
			d.Level.Position = v
		default:
			return nil, 0, &ValueError{Field: name, Err: fmt.Errorf("this design has no knob %q", name)}
		}
	}
	return d, blend, nil
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
	d, blend, err := m.at(s)
	if err != nil {
		return err
	}
	c := d.Chain(blend)
	k := c.Compile()
	for i, f := range hz {
		db[i] = k.GainDB(f)
	}
	return nil
}

func (m *designModel) Figures(s Setting) (Figures, error) {
	d, blend, err := m.at(s)
	if err != nil {
		return Figures{}, err
	}
	c := d.Chain(blend)
	k := c.Compile()
	meter := networks.NewMeter(d.Band)
	var f Figures
	f.Gain1kDB = finite(networks.Gain1k(k))
	if sc, ok := meter.Scoop(k); ok && finite(sc.DepthDB) != nil && finite(sc.BalanceDB) != nil {
		f.Scoop = &sc
	}
	if hz, g := meter.Peak(k); finite(g) != nil {
		f.Peak = &Peak{Hz: hz, DB: g}
	}
	if hz, ok := meter.Corner(k); ok {
		f.CornerHz = finite(hz)
	}
	f.InputImpedanceOhm = finite(cmplx.Abs(k.InputImpedance(1000)))
	f.OutputImpedanceOhm = finite(cmplx.Abs(k.OutputImpedance(1000)))
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
