package synth

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"tonewright/eseries"
	"tonewright/networks"
)

func filterPart(i int, rc string) string { return fmt.Sprintf("filter%d.%s", i+1, rc) }

func fieldErrorf(key, format string, args ...any) error {
	return &networks.FieldError{Key: key, Err: fmt.Errorf(format, args...)}
}

// design returns the design the search writes into: for a fresh synthesis
// a blend network with placeholder values, for re-voicing a copy of From;
// the problem's surroundings override either.
func (p *Problem) design() (*networks.Design, error) {
	var d *networks.Design
	if p.From != nil {
		if err := p.From.Validate(); err != nil {
			return nil, err
		}
		d = p.From.Clone()
		if p.Name != "" {
			d.Name = p.Name
		}
	} else {
		d = &networks.Design{
			Name: p.Name,
			Band: networks.DefaultBand,
			Tone: networks.Tone{Network: networks.BlendNetwork,
				Lowpass: networks.RC{R: 10e3, C: 10e-9}, Highpass: networks.RC{R: 10e3, C: 1e-9},
				Pot: networks.PotPart{Value: 100e3, Taper: networks.Taper{Law: networks.Linear}}},
			Load: networks.DefaultLoad,
		}
		n := DefaultFilters
		if p.Filters != nil {
			n = *p.Filters
		}
		d.Filters = make([]networks.RC, n)
		for i := range d.Filters {
			d.Filters[i] = networks.RC{R: 10e3, C: 1e-9}
		}
	}
	if p.Band != nil {
		d.Band = *p.Band
	}
	if p.Source != nil {
		d.Source = *p.Source
	}
	if p.Load != nil {
		d.Load = *p.Load
	}
	if p.Level != nil {
		l := *p.Level
		d.Level = &l
	}
	if p.From != nil && p.Filters != nil {
		n := *p.Filters
		if n < 0 {
			return nil, fieldErrorf("filters", "%d sections: the number must be zero or more", n)
		}
		for len(d.Filters) < n {
			rc := networks.RC{R: 10e3, C: 1e-9}
			if k := len(d.Filters); k > 0 {
				rc = d.Filters[k-1]
			}
			d.Filters = append(d.Filters, rc)
		}
		d.Filters = d.Filters[:n]
	}
	if len(d.Filters) > networks.MaxFilters {
		return nil, fieldErrorf("filters", "%d sections is more than the %d the tool designs", len(d.Filters), networks.MaxFilters)
	}
	if err := d.Validate(); err != nil {
		return nil, err
	}
	return d, nil
}

// goal resolves the targets against the design: defaults for a fresh
// synthesis, the design's current figures when re-voicing.
func (p *Problem) goal(d *networks.Design) (goal, error) {
	t := p.Targets
	if len(p.Items) > 0 || p.Curve != nil {
		if t.ScoopHz != nil || t.DepthDB != nil || t.BalanceDB != nil || t.CornerHz != nil || t.At != nil {
			return goal{}, fieldErrorf("targets", "the targets are given as a list or a curve: give the scoop and corner there too, not as flags (--scoop-hz, --depth, --balance, --at, --corner)")
		}
		items := slices.Clone(p.Items)
		if p.Curve != nil {
			if p.From == nil {
				return goal{}, fieldErrorf("targets.curve", "a curve target voices a design: give it with --from DESIGN.yaml (its parts named by --free are fitted)")
			}
			for _, s := range p.Curve.Settings {
				if s.Knobs != nil {
					if _, err := d.Setting(s.Knobs); err != nil {
						return goal{}, &networks.FieldError{File: p.Curve.File, Line: 1, Key: "db_at_" + s.Label, Err: err}
					}
				}
			}
			items = append(items, curveItems(p.Curve, d, p.CurveKnobs)...)
		}
		return p.resolveItems(d, items)
	}
	g := goal{at: DefaultAt}
	if t.At != nil {
		g.at = *t.At
	}
	if !(g.at >= 0 && g.at <= 1) {
		return g, fieldErrorf("targets.scoop.at", "knob position %v is outside 0..1", g.at)
	}
	scoopGiven := t.ScoopHz != nil || t.DepthDB != nil || t.BalanceDB != nil
	if p.From != nil {
		// Re-voicing: what is not asked for stays as it is, at the
		// figures of the design as given (its own band, source, load,
		// sections and level), not of the working copy, whose added
		// sections hold placeholder values.
		from := p.From
		m := networks.NewMeter(from.Band)
		fe := newEvaluator(from, g)
		if from.Tone.Network != networks.BlendNetwork && fe.knob == "" && scoopGiven {
			return g, fieldErrorf("targets.scoop.at", "the design %s has no knob to measure the scoop along", designName(d))
		}
		fe.compile(g.at)
		s, found := m.Scoop(fe.resp())
		if found {
			g.scoop, g.hz, g.depth, g.balance = true, s.Hz, s.DepthDB, s.BalanceDB
		} else if scoopGiven && (t.ScoopHz == nil || t.DepthDB == nil) {
			return g, fieldErrorf("targets.scoop", "the design %s has no scoop at knob %v to keep: give both the frequency and the depth",
				designName(d), g.at)
		}
		fe.compile(1)
		if hz, ok := m.Corner(fe.resp()); ok {
			g.corner, g.cornerHz = true, hz
		}
	} else {
		if t.ScoopHz == nil || t.DepthDB == nil {
			return g, fieldErrorf("targets.scoop", "a fresh synthesis needs the scoop's frequency and depth (targets: {scoop: {hz: 800, depth_db: -10}} or --scoop-hz 800 --depth -10)")
		}
		if t.CornerHz == nil && len(d.Filters) > 0 {
			return g, fieldErrorf("targets.corner_hz", "a fresh synthesis with filter sections needs the output corner (corner_hz: 5k or --corner 5k)")
		}
	}
	if t.ScoopHz != nil {
		g.scoop, g.hz = true, *t.ScoopHz
	}
	if t.DepthDB != nil {
		g.scoop, g.depth = true, *t.DepthDB
	}
	if t.BalanceDB != nil {
		g.balance = *t.BalanceDB
	}
	if t.CornerHz != nil {
		// The blend network alone has no corner to set at knob 1: its
		// high-pass leg passes the top of the band there, whatever its
		// values (even at the ends of the part ranges the curve does not
		// fall 3 dB by 10 × band top). A corner target then cannot be
		// met, and aiming at it only drags the scoop away.
		if len(d.Filters) == 0 && d.Load.C == 0 {
			return g, fieldErrorf("targets.corner_hz", "the corner target (%s) needs at least one filter section or a load capacitance, and this synthesis has neither: "+
				"add sections (filters: 1 or --filters 1) or the load's capacitance (load: {c: 470p} or --load-c 470p), or drop the corner target (corner_hz / --corner)",
				eseries.WithUnit(*t.CornerHz, 3, "Hz"))
		}
		g.corner, g.cornerHz = true, *t.CornerHz
	}
	if g.scoop {
		b := d.Band
		if !(g.hz > b.From && g.hz < b.To) {
			return g, fieldErrorf("targets.scoop.hz", "%s lies outside the band %s–%s: the scoop must lie inside it",
				eseries.WithUnit(g.hz, 3, "Hz"), eseries.WithUnit(b.From, 3, "Hz"), eseries.WithUnit(b.To, 3, "Hz"))
		}
		if !(g.depth < 0) || math.IsInf(g.depth, 0) {
			return g, fieldErrorf("targets.scoop.depth_db", "%v dB: a scoop's depth is negative (a dip below the shoulders), e.g. -10", g.depth)
		}
		if math.IsInf(g.balance, 0) || math.IsNaN(g.balance) {
			return g, fieldErrorf("targets.scoop.balance_db", "%v dB must be finite", g.balance)
		}
	}
	if g.corner && (!(g.cornerHz > 0) || math.IsInf(g.cornerHz, 0)) {
		return g, fieldErrorf("targets.corner_hz", "%v Hz must be positive and finite", g.cornerHz)
	}
	// The corner is measured from band low to 10 × band high (see
	// networks.Meter.Corner): a target outside that cannot be measured,
	// so no design can be shown to meet it.
	if b := d.Band; g.corner && !(g.cornerHz > b.From && g.cornerHz < 10*b.To) {
		return g, fieldErrorf("targets.corner_hz", "%s lies outside what the corner can measure (%s to 10 × band high = %s): give a corner inside that range, e.g. 5k, or widen the band",
			freqText(g.cornerHz), freqText(b.From), freqText(10*b.To))
	}
	if !g.scoop && !g.corner {
		return g, fieldErrorf("targets", "%v: give a scoop (frequency and depth) or a corner", errNoTargets)
	}
	return g, nil
}

func designName(d *networks.Design) string {
	if d.Name != "" {
		return fmt.Sprintf("%q", d.Name)
	}
	return "given"
}

// targets returns the goal as Targets, every field set that is a target.
func (g goal) targets() Targets {
	t := Targets{At: ptr(g.at)}
	if g.scoop {
		t.ScoopHz, t.DepthDB, t.BalanceDB = ptr(g.hz), ptr(g.depth), ptr(g.balance)
	}
	if g.corner {
		t.CornerHz = ptr(g.cornerHz)
	}
	return t
}

// variables lists the unknowns: for a fresh synthesis every part of the
// blend network and the tied R and C of the filter sections; when
// re-voicing, the free parts, each on its own.
func (p *Problem) variables(d *networks.Design, s *sets) ([]variable, error) {
	parts := d.Parts()
	role := map[string]networks.Part{}
	for _, pt := range parts {
		role[pt.Name] = pt
	}
	mk := func(name, roleText string, kind networks.PartKind, names []string, original float64) variable {
		set, setName, r := s.of(kind)
		lo, hi := r[0], r[1]
		if original > 0 {
			lo, hi = math.Min(lo, original), math.Max(hi, original)
		}
		return variable{name: name, role: roleText, parts: names, kind: kind, set: listed(set), setName: setName,
			lo: math.Log(lo), hi: math.Log(hi), original: original}
	}
	var vs []variable
	if p.From == nil {
		for _, pt := range parts[:5] {
			vs = append(vs, mk(pt.Name, pt.Role, pt.Kind, []string{pt.Name}, 0))
		}
		if n := len(d.Filters); n > 0 {
			var rs, cs []string
			for i := 0; i < n; i++ {
				rs, cs = append(rs, filterPart(i, "r")), append(cs, filterPart(i, "c"))
			}
			vs = append(vs,
				mk("filters.r", "filter sections' R", networks.PartResistor, rs, 0),
				mk("filters.c", "filter sections' C", networks.PartCapacitor, cs, 0))
		}
		return vs, nil
	}
	free := p.Free
	if free == nil {
		for _, pt := range parts {
			if pt.Name != "level" {
				free = append(free, pt.Name)
			}
		}
	}
	seen := map[string]bool{}
	add := func(name string) error {
		pt, ok := role[name]
		switch {
		case name == "level":
			return fieldErrorf("free", "the level pot is taken as given, not designed: leave %q out", name)
		case !ok:
			names := slices.DeleteFunc(d.PartNames(), func(s string) bool { return s == "level" })
			if len(d.Filters) > 0 {
				names = append(names, "filters.r", "filters.c")
			}
			return fieldErrorf("free", "unknown part %q: this design's parts are %s", name, strings.Join(names, ", "))
		case seen[name]:
			return nil
		}
		seen[name] = true
		original := pt.Value
		if isNewSection(name, len(p.From.Filters)) {
			original = 0
		}
		v := mk(name, pt.Role, pt.Kind, []string{name}, original)
		vs = append(vs, v)
		return nil
	}
	for _, name := range free {
		name = strings.TrimSpace(name)
		switch name {
		case "filters.r", "filters.c":
			if len(d.Filters) == 0 {
				return nil, fieldErrorf("free", "%q: the design has no filter sections", name)
			}
			for i := range d.Filters {
				if err := add(filterPart(i, name[len(name)-1:])); err != nil {
					return nil, err
				}
			}
			continue
		}
		if err := add(name); err != nil {
			return nil, err
		}
	}
	if len(vs) == 0 {
		return nil, fieldErrorf("free", "no part may change: name at least one of %s", strings.Join(d.PartNames(), ", "))
	}
	// Sections added by Problem.Filters beyond From's are new parts: they
	// must be free.
	for i := len(p.From.Filters); i < len(d.Filters); i++ {
		for _, rc := range []string{"r", "c"} {
			if !seen[filterPart(i, rc)] {
				return nil, fieldErrorf("free", "%s is a new part (the design had %d filter sections): it must be free",
					filterPart(i, rc), len(p.From.Filters))
			}
		}
	}
	return vs, nil
}

// bind points the variables at the design's value slots.
func bind(vs []variable, d *networks.Design) []variable {
	out := slices.Clone(vs)
	for i := range out {
		out[i].slots = nil
		for _, name := range out[i].parts {
			out[i].slots = append(out[i].slots, d.PartRef(name))
		}
	}
	return out
}

// isNewSection reports whether name is a part of a filter section beyond
// the first n.
func isNewSection(name string, n int) bool {
	var i int
	var rc string
	if _, err := fmt.Sscanf(name, "filter%d.%s", &i, &rc); err == nil {
		return i > n
	}
	return false
}
