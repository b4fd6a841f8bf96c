package synth

import (
	"errors"
	"fmt"
	"math"

	"tonewright/eseries"
	"tonewright/networks"
)

// DefaultFilters is the number of identical RC low-pass sections a fresh
// synthesis designs unless told otherwise.
const DefaultFilters = 2

// DefaultAt is the blend knob position at which the scoop targets are
// measured unless told otherwise: the centre.
const DefaultAt = 0.5

// DefaultPots are the blend pot values a synthesis chooses from unless told
// otherwise: the values commonly stocked (common practice, no published
// source).
var DefaultPots = []float64{10e3, 20e3, 25e3, 50e3, 100e3, 250e3, 500e3, 1e6}

// DefaultResistorRange and DefaultCapacitorRange bound the resistors and
// capacitors a synthesis chooses, in ohms and farads.
var (
	DefaultResistorRange  = [2]float64{1e3, 1e6}
	DefaultCapacitorRange = [2]float64{100e-12, 1e-6}
)

// Problem is one synthesis: the targets, what surrounds the network, and the
// parts that may be used. The optional fields are pointers; nil takes the
// default for a fresh synthesis or, when re-voicing, the From design's
// value.
type Problem struct {
	Name string         // the design's name; "" for none
	Band *networks.Band // nil: networks.DefaultBand, or From's

	Targets Targets
	// Items is the list form of targets (each figure at its own knob
	// setting), for a re-voicing; nil: Targets.
	Items []Item
	// Curve is a whole-curve target, for a re-voicing: the RMS dB error
	// over the band at each of its settings is minimised. CurveKnobs set
	// the knobs of a measured curve's single db column (nil: the design's
	// own setting); FitLevel lets an overall level offset go free.
	Curve      *Curve
	CurveKnobs map[string]float64
	FitLevel   bool

	Source  *networks.Source       // nil: an ideal source (0 Ω), or From's
	Load    *networks.Load         // nil: networks.DefaultLoad, or From's
	Filters *int                   // identical RC sections; nil: DefaultFilters, or From's
	Level   *networks.LevelSetting // taken as given; nil: none, or From's

	Parts Parts

	// From is the design to re-voice; nil for a fresh synthesis.
	From *networks.Design
	// Free names the parts that may change (networks.Design.Parts names;
	// "filters.r" and "filters.c" stand for every section's R or C). Nil:
	// all of them. The level pot is never designed.
	Free []string
	// MaxChanges is the largest number of parts a re-voicing may change;
	// 0 means no limit.
	MaxChanges int
	// Limits are practical limits the design must keep.
	Limits Limits

	// Prefer, when set (the targets file's prefer: closest|loss, or the
	// command's --prefer), chooses among the designs within tolerance in
	// place of Options.Prefer.
	Prefer *Prefer
	// Priority orders the targets for when they cannot all be met
	// (ParsePriority); nil: DefaultPriority.
	Priority [][]string

	dec *networks.Decoder // the targets file's, to place errors; nil if built in code
}

// Targets is the voice wanted. Nil fields are not targets of a fresh
// synthesis (which needs the scoop frequency and depth and, with filter
// sections, the corner) and keep the From design's current value when
// re-voicing.
type Targets struct {
	ScoopHz   *float64 // frequency of the scoop, Hz
	DepthDB   *float64 // depth below the shoulders, dB (negative)
	BalanceDB *float64 // upper shoulder minus lower shoulder, dB; nil: 0 for a fresh synthesis
	At        *float64 // knob position the scoop is measured at; nil: DefaultAt
	CornerHz  *float64 // output corner at knob 1, Hz
}

// Limits are practical limits on the design (targets file: limits:). A
// design that breaks one is not offered as meeting the targets.
type Limits struct {
	// MaxOutputImpedance bounds |Z| looking back into the output at
	// 1 kHz, the knob at the scoop's position, in ohms; 0: no limit.
	MaxOutputImpedance float64
	// MinCapacitor is the smallest capacitor chosen, in farads; nil:
	// DefaultMinCapacitor. It raises the capacitor range's low end.
	MinCapacitor *float64
	// MaxLossDB bounds the insertion loss at 1 kHz (knob 0.5), in dB;
	// 0: no limit.
	MaxLossDB float64
}

// DefaultMinCapacitor is the smallest capacitor a synthesis chooses unless
// told otherwise: below about 100 pF the strays of the wiring and the
// cable matter (common practice, no published source).
const DefaultMinCapacitor = 100e-12

// Parts says which values the parts may take.
type Parts struct {
	Resistors  eseries.Set // nil: E24
	Capacitors eseries.Set // nil: E12
	Pots       []float64   // blend pot values; nil: DefaultPots

	// Ranges bound the resistors and capacitors chosen; a zero range is
	// the default.
	ResistorRange  [2]float64
	CapacitorRange [2]float64

	// Stock, when set, restricts each kind of part it lists to the values
	// listed there (within the ranges). A kind it does not list keeps the
	// series or list above.
	Stock *Stock
}

// Stock is what is on hand: the values of each kind of part.
type Stock struct {
	File       string // where it was read from; "" if built in code
	Resistors  []float64
	Capacitors []float64
	Pots       []float64
}

// Tolerance is how close an achieved figure must come to its target to
// count as met: Freq relative (0.05 is 5 %), Level in dB.
type Tolerance struct {
	Freq  float64
	Level float64
}

// The tolerances of the two stages: the continuous optimum must meet
// feasible targets within IdealTolerance; the chosen parts, within
// PartsTolerance (the figures the tool promises for E24 resistors with E12
// capacitors).
var (
	IdealTolerance = Tolerance{Freq: 0.005, Level: 0.1}
	PartsTolerance = Tolerance{Freq: 0.05, Level: 1}
)

// Options tune a Solve; the zero value is the default.
type Options struct {
	// Seed seeds the randomised parts of the search; the same seed gives
	// the same result.
	Seed uint64
	// Tolerance is what the chosen design must meet to count as met;
	// zero: PartsTolerance.
	Tolerance Tolerance
	// Prefer chooses among the designs of allowed values that meet the
	// tolerance: Closest (the default) or LeastLoss.
	Prefer Prefer
	// Effort widens the walk over allowed values: 1 (or 0) the default,
	// 2 and 3 sweep more levels of each free part and more pots, at a
	// cost in time (README).
	Effort int
	// Progress, if set, is called from time to time with the work done
	// and the (estimated) work in all, in objective evaluations.
	Progress func(done, total int)
}

// sets are the resolved part sets.
type sets struct {
	res, caps, pots           eseries.Set
	resName, capName, potName string
	resRange, capRange        [2]float64
	potRange                  [2]float64
}

// resolve checks the part rules and builds the sets the search draws from.
func (p *Parts) resolve() (*sets, error) {
	s := &sets{resRange: p.ResistorRange, capRange: p.CapacitorRange}
	if s.resRange == [2]float64{} {
		s.resRange = DefaultResistorRange
	}
	if s.capRange == [2]float64{} {
		s.capRange = DefaultCapacitorRange
	}
	for _, r := range []struct {
		what string
		v    [2]float64
	}{{"resistor_range", s.resRange}, {"capacitor_range", s.capRange}} {
		if !(r.v[0] > 0 && r.v[1] >= r.v[0] && !math.IsInf(r.v[1], 0)) {
			return nil, &networks.FieldError{Key: "parts." + r.what, Err: fmt.Errorf("[%s, %s] must be two positive values, low first",
				eseries.Format(r.v[0]), eseries.Format(r.v[1]))}
		}
	}
	res, caps := p.Resistors, p.Capacitors
	if res == nil {
		res = eseries.E24
	}
	if caps == nil {
		caps = eseries.E12
	}
	pots := p.Pots
	if pots == nil {
		pots = DefaultPots
	}
	s.resName, s.capName, s.potName = setName(res), setName(caps), "pots list"
	if p.Pots == nil {
		s.potName = "common pots"
	}
	if st := p.Stock; st != nil {
		var err error
		if len(st.Resistors) > 0 {
			if res, err = eseries.NewList(st.Resistors); err != nil {
				return nil, stockError(st, "resistors", err)
			}
			s.resName = "stock"
		}
		if len(st.Capacitors) > 0 {
			if caps, err = eseries.NewList(st.Capacitors); err != nil {
				return nil, stockError(st, "capacitors", err)
			}
			s.capName = "stock"
		}
		if len(st.Pots) > 0 {
			pots = st.Pots
			s.potName = "stock"
		}
	}
	pl, err := eseries.NewList(pots)
	if err != nil {
		return nil, &networks.FieldError{Key: "parts.pots", Err: err}
	}
	vs := pl.Values()
	s.potRange = [2]float64{vs[0], vs[len(vs)-1]}
	s.res = eseries.Range(res, s.resRange[0], s.resRange[1])
	s.caps = eseries.Range(caps, s.capRange[0], s.capRange[1])
	s.pots = pl
	if _, err := eseries.SnapTo(s.res, s.resRange[0]); err != nil {
		return nil, &networks.FieldError{Key: "parts.resistors", Err: fmt.Errorf("no resistor of %s lies in the range %s to %s", s.resName,
			eseries.WithUnit(s.resRange[0], 3, "Ω"), eseries.WithUnit(s.resRange[1], 3, "Ω"))}
	}
	if _, err := eseries.SnapTo(s.caps, s.capRange[0]); err != nil {
		return nil, &networks.FieldError{Key: "parts.capacitors", Err: fmt.Errorf("no capacitor of %s lies in the range %s to %s", s.capName,
			eseries.WithUnit(s.capRange[0], 3, "F"), eseries.WithUnit(s.capRange[1], 3, "F"))}
	}
	return s, nil
}

func setName(s eseries.Set) string {
	if se, ok := s.(*eseries.Series); ok {
		return se.Name
	}
	return "list"
}

func stockError(st *Stock, key string, err error) error {
	return &networks.FieldError{File: st.File, Key: key, Err: err}
}

// set returns the set, its name and the continuous bounds for a kind of part.
func (s *sets) of(k networks.PartKind) (eseries.Set, string, [2]float64) {
	switch k {
	case networks.PartResistor:
		return s.res, s.resName, s.resRange
	case networks.PartCapacitor:
		return s.caps, s.capName, s.capRange
	}
	return s.pots, s.potName, s.potRange
}

var errNoTargets = errors.New("nothing to aim at")

func ptr[T any](v T) *T { return &v }
