package networks

import (
	"fmt"
	"math"
	"strings"

	"tonewright/eseries"
)

// Design is a tone-and-level section as the design file describes it.
type Design struct {
	Name    string
	Band    Band
	Source  Source
	Tone    Tone
	Filters []RC
	Level   *LevelSetting // nil: no level pot
	Load    Load
}

// Tone is the tone network of a design. Network names its form: "blend"
// (Lowpass, Highpass and Pot) or "netlist" (Parts).
type Tone struct {
	Network  string
	Lowpass  RC
	Highpass RC
	Pot      PotPart
	Parts    []NetPart // the netlist form, in file order
}

// PotPart is a pot as a part: track value and taper, without a position.
type PotPart struct {
	Value float64
	Taper Taper
}

// LevelSetting is a level pot and where its knob sits.
type LevelSetting struct {
	Pot      PotPart
	Position float64
}

// MaxFilters is the largest number of RC low-pass sections a design may
// have.
const MaxFilters = 20

// BlendNetwork is the name of the blend tone network in the design file.
const BlendNetwork = "blend"

// DefaultLoad is what a design drives unless it says otherwise: 1 MΩ, no
// capacitance.
var DefaultLoad = Load{R: 1e6}

// Chain returns the blend design's chain with the blend knob at position
// blend and the level at its position.
func (d *Design) Chain(blend float64) Chain {
	s := Setting{BlendKnob: blend}
	if d.Level != nil {
		s[LevelKnob] = d.Level.Position
	}
	return d.ChainAt(s)
}

// ChainAt returns the blend design's chain at the knob setting s.
func (d *Design) ChainAt(s Setting) Chain {
	blend := s[BlendKnob]
	c := Chain{
		Source:  d.Source,
		Blend:   Blend{Lowpass: d.Tone.Lowpass, Highpass: d.Tone.Highpass, Pot: Pot{Value: d.Tone.Pot.Value, Taper: d.Tone.Pot.Taper, Position: blend}},
		Filters: d.Filters,
		Load:    d.Load,
	}
	if d.Level != nil {
		lv, ok := s[LevelKnob]
		if !ok {
			lv = d.Level.Position
		}
		c.Level = &Level{Pot: Pot{Value: d.Level.Pot.Value, Taper: d.Level.Pot.Taper, Position: lv}}
	}
	return c
}

// Validate checks every value of the design and names the key of the first
// that is wrong.
func (d *Design) Validate() error {
	if err := d.Band.Check(); err != nil {
		return fieldError("band", err)
	}
	if !nonNegative(d.Source.Impedance) {
		return fieldError("source.impedance", fmt.Errorf("%s must be zero or positive and finite", eseries.WithUnit(d.Source.Impedance, 3, "Ω")))
	}
	if !nonNegative(d.Source.SeriesC) {
		return fieldError("source.series_c", fmt.Errorf("%s must be zero (none) or positive and finite", eseries.WithUnit(d.Source.SeriesC, 3, "F")))
	}
	if d.Tone.Network != BlendNetwork && d.Tone.Network != NetlistNetwork && d.Tone.topology() == nil {
		return fieldError("tone.network", fmt.Errorf("unknown network %q: use %s", d.Tone.Network, strings.Join(ToneNetworks(), ", ")))
	}
	if len(d.Filters) > MaxFilters {
		return fieldError("filters", fmt.Errorf("%d sections: at most %d are supported", len(d.Filters), MaxFilters))
	}
	var checks []keyed
	if d.Tone.Network == BlendNetwork {
		checks = []keyed{
			{"tone.lowpass.r", d.Tone.Lowpass.R}, {"tone.lowpass.c", d.Tone.Lowpass.C},
			{"tone.highpass.c", d.Tone.Highpass.C}, {"tone.highpass.r", d.Tone.Highpass.R},
			{"tone.pot.value", d.Tone.Pot.Value},
		}
	} else {
		if err := checkNetlist(d.Tone.Parts, d.Level != nil); err != nil {
			return err
		}
		for _, p := range d.Tone.Parts {
			key := d.Tone.partKey(p)
			checks = append(checks, keyed{key, p.Value})
			if err := p.Taper.check(); err != nil {
				return fieldError(strings.TrimSuffix(strings.TrimSuffix(key, ".value"), ".pot")+".midpoint", err)
			}
		}
	}
	for i, f := range d.Filters {
		checks = append(checks, keyed{fmt.Sprintf("filters[%d].r", i), f.R}, keyed{fmt.Sprintf("filters[%d].c", i), f.C})
	}
	if d.Level != nil {
		checks = append(checks, keyed{"level.pot.value", d.Level.Pot.Value})
	}
	for _, c := range checks {
		if !positive(c.v) {
			return fieldError(c.key, fmt.Errorf("%s must be positive and finite", eseries.WithUnit(c.v, 3, unitOfKey(c.key))))
		}
		if err := plausible(c.key, c.v); err != nil {
			return fieldError(c.key, err)
		}
	}
	for _, c := range []keyed{{"source.impedance", d.Source.Impedance}, {"source.series_c", d.Source.SeriesC}, {"load.c", d.Load.C}} {
		if c.v > 0 {
			if err := plausible(c.key, c.v); err != nil {
				return fieldError(c.key, err)
			}
		}
	}
	if !math.IsInf(d.Load.R, 1) {
		if err := plausible("load.r", d.Load.R); err != nil {
			return fieldError("load.r", err)
		}
	}
	if d.Tone.Network == BlendNetwork {
		if err := d.Tone.Pot.Taper.check(); err != nil {
			return fieldError("tone.pot.midpoint", err)
		}
	}
	if d.Level != nil {
		if err := d.Level.Pot.Taper.check(); err != nil {
			return fieldError("level.pot.midpoint", err)
		}
		if !(d.Level.Position >= 0 && d.Level.Position <= 1) {
			return fieldError("level.position", fmt.Errorf("%v is outside 0..1", d.Level.Position))
		}
	}
	if !(d.Load.R > 0) {
		return fieldError("load.r", fmt.Errorf("%s must be positive (or open)", eseries.WithUnit(d.Load.R, 3, "Ω")))
	}
	if !nonNegative(d.Load.C) {
		return fieldError("load.c", fmt.Errorf("%s must be zero (none) or positive and finite", eseries.WithUnit(d.Load.C, 3, "F")))
	}
	if d.Tone.Network != BlendNetwork {
		if _, err := d.Network(nil).Compile(); err != nil {
			return fieldError("tone.parts", err)
		}
	}
	return nil
}

// keyed is a value with the key path it came from.
type keyed struct {
	key string
	v   float64
}

// The range of values a part may have: far wider than any tone section
// uses, narrow enough that the arithmetic stays finite.
const (
	MinOhms    = 1e-3
	MaxOhms    = 1e12
	MinFarads  = 1e-15
	MaxFarads  = 1
	MinHenries = 1e-9
	MaxHenries = 1e3
)

// plausible checks a value against the range for its kind, told by the
// key's last letter (.c and series_c are capacitances).
func plausible(key string, v float64) error { return CheckRange(v, unitOfKey(key)) }

// unitOfKey is the unit of a part value's key: H for .l, F for .c and
// series_c, else Ω.
func unitOfKey(key string) string {
	if strings.HasSuffix(key, ".l") {
		return "H"
	}
	if strings.HasSuffix(key, ".c") || strings.HasSuffix(key, "_c") {
		return "F"
	}
	return "Ω"
}

// CheckRange reports a resistance (unit "Ω"), capacitance ("F") or
// inductance ("H") outside the range a part may have, in the trade's
// notation.
func CheckRange(v float64, unit string) error {
	lo, hi, hint := MinOhms, MaxOhms, "k, M"
	switch unit {
	case "F":
		lo, hi, hint = MinFarads, MaxFarads, "p, n, µ"
	case "H":
		lo, hi, hint = MinHenries, MaxHenries, "µ, m"
	}
	if !(v > 0) {
		return fmt.Errorf("%s must be positive", eseries.WithUnit(v, 3, unit))
	}
	if v < lo || v > hi {
		return fmt.Errorf("%s is outside %s to %s, the range a part may have: is the prefix right (%s)?",
			eseries.WithUnit(v, 3, unit), eseries.WithUnit(lo, 3, unit), eseries.WithUnit(hi, 3, unit), hint)
	}
	return nil
}

func positive(v float64) bool    { return v > 0 && !math.IsInf(v, 0) }
func nonNegative(v float64) bool { return v >= 0 && !math.IsInf(v, 0) }

// FieldError is a problem with one key of a design or targets file.
type FieldError struct {
	File string // may be empty
	Line int    // 0 when unknown
	Key  string // dotted key path, e.g. tone.lowpass.r
	Err  error
}

func (e *FieldError) Error() string {
	loc := e.File
	if e.Line > 0 {
		if loc != "" {
			loc += ":"
		}
		loc += fmt.Sprint(e.Line)
	}
	if loc != "" {
		loc += ": "
	}
	if e.Key != "" {
		return fmt.Sprintf("%s%s: %v", loc, e.Key, e.Err)
	}
	return fmt.Sprintf("%s%v", loc, e.Err)
}

func (e *FieldError) Unwrap() error { return e.Err }

func fieldError(key string, err error) error { return &FieldError{Key: key, Err: err} }
