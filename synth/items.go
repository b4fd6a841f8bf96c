package synth

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"gopkg.in/yaml.v3"

	"tonewright/eseries"
	"tonewright/networks"
)

// The list form of targets: each figure at its own knob setting, for any
// network re-voiced with Problem.From.
//
//	targets:
//	  - {knobs: {blend: 0.5}, scoop: {hz: 700, depth_db: -8, balance_db: 0}}
//	  - {knobs: {blend: 1}, corner_hz: 9k}
//	  - {knobs: {treble: 1, bass: 0}, gain_db: {hz: 5k, db: -3}}
//	  - {knobs: {mid: 0.5}, peak: {hz: 500, height_db: 4}}
//	  - {knobs: {treble: 0}, low_corner_hz: 80}
//
// Knobs not named stay at the design's own setting. The figures are
// networks' own (Meter.Scoop, Peak, Corner, LowCorner, and the gain in dB
// at a frequency).

// The kinds of figure a listed target may give.
const (
	ItemScoop     = "scoop"
	ItemCorner    = "corner_hz"
	ItemLowCorner = "low_corner_hz"
	ItemGain      = "gain_db"
	ItemPeak      = "peak"
	ItemCurve     = "curve" // a whole curve (Problem.Curve), its RMS error
)

// Item is one entry of the list form: a figure at a knob setting.
type Item struct {
	Knobs map[string]float64 // knob positions; the others at the design's own
	Kind  string             // ItemScoop, ItemCorner, …

	Hz        float64  // scoop, peak or gain frequency, or the corner
	DepthDB   float64  // scoop depth
	BalanceDB *float64 // scoop balance; nil: not a target
	HeightDB  float64  // peak height
	DB        float64  // gain at Hz

	CurveHz, CurveDB []float64 // a curve's points
	Label            string    // a curve column's setting label
}

// rows is the number of errors an item gives.
func (it *Item) rows() int {
	switch it.Kind {
	case ItemScoop:
		if it.BalanceDB != nil {
			return 3
		}
		return 2
	case ItemPeak:
		return 2
	}
	return 1
}

// label is the knob setting as the report writes it: "blend=0.5".
func (it *Item) label() string {
	var ks []string
	for k := range it.Knobs {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	var parts []string
	for _, k := range ks {
		parts = append(parts, fmt.Sprintf("%s=%s", k, strconv.FormatFloat(it.Knobs[k], 'g', -1, 64)))
	}
	if len(parts) == 0 {
		return "own setting"
	}
	return strings.Join(parts, ";")
}

// row describes one error row of the item list: the item, which figure,
// its unit, name and key, the wanted value and its priority name.
type row struct {
	item     int
	figure   string // "hz", "depth", "balance", "corner", "low corner", "gain", "height"
	unit     string // "Hz" or "dB"
	name     string
	key      string
	wanted   float64
	priority string
}

// itemRows lists the rows of the items in order.
func itemRows(items []Item) []row {
	var out []row
	for i := range items {
		it := &items[i]
		at := " (" + it.label() + ")"
		key := fmt.Sprintf("targets[%d].", i)
		switch it.Kind {
		case ItemScoop:
			out = append(out,
				row{i, "hz", "Hz", "scoop frequency" + at, key + "scoop.hz", it.Hz, TargetHz},
				row{i, "depth", "dB", "scoop depth" + at, key + "scoop.depth_db", it.DepthDB, TargetDepth})
			if it.BalanceDB != nil {
				out = append(out, row{i, "balance", "dB", "scoop balance" + at, key + "scoop.balance_db", *it.BalanceDB, TargetBalance})
			}
		case ItemPeak:
			out = append(out,
				row{i, "hz", "Hz", "peak frequency" + at, key + "peak.hz", it.Hz, TargetHz},
				row{i, "height", "dB", "peak height" + at, key + "peak.height_db", it.HeightDB, TargetDepth})
		case ItemCorner:
			out = append(out, row{i, "corner", "Hz", "corner" + at, key + "corner_hz", it.Hz, TargetCorner})
		case ItemLowCorner:
			out = append(out, row{i, "low corner", "Hz", "low corner" + at, key + "low_corner_hz", it.Hz, TargetCorner})
		case ItemCurve:
			out = append(out, row{i, "rms", "dB", "curve RMS error" + at, "targets.curve", 0, TargetDepth})
		case ItemGain:
			out = append(out, row{i, "gain", "dB", "gain at " + freqText(it.Hz) + at, key + "gain_db.db", it.DB, TargetDepth})
		}
	}
	return out
}

// measureItems fills m.Figures and m.Found with the working design's
// figures for the goal's rows (one compile per item).
func (e *evaluator) measureItems(m *Metrics) {
	g := &e.goal
	m.nfig = len(g.rows)
	k := 0
	for i := range g.items {
		it := &g.items[i]
		var r networks.Response = flat{}
		if s, err := e.d.Setting(it.Knobs); err == nil {
			if ev, err := e.d.Compile(s); err == nil {
				r = ev
			}
		}
		switch it.Kind {
		case ItemScoop:
			s, ok := e.meter.ScoopOrLevelsAt(r, it.Hz)
			m.Figures[k], m.Figures[k+1] = s.Hz, s.DepthDB
			m.Found[k], m.Found[k+1] = ok, ok
			k += 2
			if it.BalanceDB != nil {
				m.Figures[k], m.Found[k] = s.BalanceDB, ok
				k++
			}
		case ItemPeak:
			p, ok := e.meter.Peak(r)
			if !ok {
				// A slope for the search: the level at the wanted
				// frequency above the band's mean of the two ends.
				p = networks.Peak{Hz: it.Hz, HeightDB: r.GainDB(it.Hz) - (r.GainDB(e.d.Band.From)+r.GainDB(e.d.Band.To))/2}
			}
			m.Figures[k], m.Figures[k+1] = p.Hz, p.HeightDB
			m.Found[k], m.Found[k+1] = ok, ok
			k += 2
		case ItemCorner:
			hz, ok := e.meter.Corner(r)
			if !ok {
				hz = 10 * e.d.Band.To
			}
			m.Figures[k], m.Found[k] = hz, ok
			k++
		case ItemLowCorner:
			hz, ok := e.meter.LowCorner(r)
			if !ok {
				hz = e.d.Band.From / 10
			}
			m.Figures[k], m.Found[k] = hz, ok
			k++
		case ItemGain:
			m.Figures[k], m.Found[k] = r.GainDB(it.Hz), true
			k++
		case ItemCurve:
			rms, worst, off := curveResidual(it, r, e.d.Band, g.fitLevel)
			m.Figures[k], m.Found[k] = rms, !math.IsInf(rms, 1)
			m.Worst[k], m.Offset[k] = worst, off
			k++
		}
	}
	// The insertion loss at 1 kHz at the design's own setting.
	if s, err := e.d.Setting(nil); err == nil {
		if ev, err := e.d.Compile(s); err == nil {
			m.Gain1kDB = networks.Gain1k(ev)
		}
	}
}

// itemErrors writes the rows' errors in units of IdealTolerance.
func (e *evaluator) itemErrors(m *Metrics, dst *[maxTargets]float64) int {
	for k, r := range e.goal.rows {
		if r.unit == "Hz" {
			dst[k] = math.Log(m.Figures[k]/r.wanted) / IdealTolerance.Freq
		} else {
			dst[k] = (m.Figures[k] - r.wanted) / IdealTolerance.Level
		}
	}
	return len(e.goal.rows)
}

// itemChecks compares the rows with the ideal and chosen figures.
func itemChecks(g goal, ideal, got *Metrics, tol Tolerance) []Check {
	var cs []Check
	for k, r := range g.rows {
		c := Check{Name: r.name, Key: r.key, Unit: r.unit, Wanted: r.wanted,
			Ideal: ideal.Figures[k], IdealFound: ideal.Found[k], Achieved: got.Figures[k], Found: got.Found[k]}
		if r.unit == "Hz" {
			if c.IdealFound {
				c.IdealError = c.Ideal/r.wanted - 1
				c.IdealMet = math.Abs(math.Log(c.Ideal/r.wanted)) <= math.Log1p(IdealTolerance.Freq)
			}
			if c.Found {
				c.Error = c.Achieved/r.wanted - 1
				c.Met = math.Abs(math.Log(c.Achieved/r.wanted)) <= math.Log1p(tol.Freq)
			}
		} else {
			if c.IdealFound {
				c.IdealError = c.Ideal - r.wanted
				c.IdealMet = math.Abs(c.IdealError) <= IdealTolerance.Level
			}
			if c.Found {
				c.Error = c.Achieved - r.wanted
				c.Met = math.Abs(c.Error) <= tol.Level
			}
		}
		cs = append(cs, c)
	}
	return cs
}

// resolveItems checks the listed targets against the design (knob names
// and positions, frequencies the figures can measure) and returns the
// goal for them.
func (p *Problem) resolveItems(d *networks.Design, items []Item) (goal, error) {
	g := goal{at: DefaultAt, items: items, fitLevel: p.FitLevel}
	if p.From == nil {
		return g, fieldErrorf("targets", "the list form of targets re-voices a design: give it with --from DESIGN.yaml (a fresh synthesis takes the mapping form: targets: {scoop: {...}, corner_hz: ...})")
	}
	b := d.Band
	for i, it := range items {
		key := fmt.Sprintf("targets[%d]", i)
		if it.Kind == ItemCurve {
			key = "targets.curve"
		}
		if _, err := d.Setting(it.Knobs); err != nil {
			return g, fieldErrorf(key+".knobs", "%v", err)
		}
		switch it.Kind {
		case ItemScoop, ItemPeak:
			if !(it.Hz > b.From && it.Hz < b.To) {
				return g, fieldErrorf(key+"."+it.Kind+".hz", "%s lies outside the band %s–%s: the figure must lie inside it",
					freqText(it.Hz), freqText(b.From), freqText(b.To))
			}
		case ItemCorner:
			if !(it.Hz > b.From && it.Hz < 10*b.To) {
				return g, fieldErrorf(key+".corner_hz", "%s lies outside what the corner can measure (%s to 10 × band high = %s)",
					freqText(it.Hz), freqText(b.From), freqText(10*b.To))
			}
		case ItemLowCorner:
			if !(it.Hz > b.From/10 && it.Hz < b.To) {
				return g, fieldErrorf(key+".low_corner_hz", "%s lies outside what the low corner can measure (band low / 10 = %s to %s)",
					freqText(it.Hz), freqText(b.From/10), freqText(b.To))
			}
		case ItemGain:
			if !(it.Hz >= b.From && it.Hz <= b.To) {
				return g, fieldErrorf(key+".gain_db.hz", "%s lies outside the band %s–%s", freqText(it.Hz), freqText(b.From), freqText(b.To))
			}
		}
	}
	g.rows = itemRows(items)
	if len(g.rows) == 0 {
		return g, fieldErrorf("targets", "%v: the list is empty", errNoTargets)
	}
	if len(g.rows) > maxTargets {
		return g, fieldErrorf("targets", "%d figures: the list form takes at most %d (a scoop counts 2 or 3, a peak 2, the others 1)", len(g.rows), maxTargets)
	}
	return g, nil
}

// parseItems reads the list form.
func parseItems(dec *networks.Decoder, n *yaml.Node, path string) ([]Item, error) {
	var items []Item
	err := dec.List(n, path, func(c *yaml.Node, p string) error {
		var it Item
		kinds := 0
		kind := func(k string) { it.Kind = k; kinds++ }
		hz := func(dst *float64) func(*yaml.Node, string) error {
			return func(n *yaml.Node, path string) error {
				v, err := dec.ValueIn(n, path, "Hz")
				if err == nil && !(v > 0) {
					err = dec.Errorf(n, path, "%v Hz must be a positive frequency, such as 800 or 1.2k", v)
				}
				*dst = v
				return err
			}
		}
		num := func(dst *float64) func(*yaml.Node, string) error {
			return func(n *yaml.Node, path string) (err error) { *dst, err = dec.Number(n, path); return }
		}
		err := dec.Map(c, p,
			networks.Key{Name: "knobs", Decode: func(n *yaml.Node, path string) error {
				if n.Kind != yaml.MappingNode {
					return dec.Errorf(n, path, "must be a mapping of knob names to positions, such as {treble: 1, bass: 0}")
				}
				it.Knobs = map[string]float64{}
				for i := 0; i+1 < len(n.Content); i += 2 {
					name := n.Content[i].Value
					v, err := dec.Number(n.Content[i+1], path+"."+name)
					if err != nil {
						return err
					}
					if !(v >= 0 && v <= 1) {
						return dec.Errorf(n.Content[i+1], path+"."+name, "knob position %v is outside 0..1", v)
					}
					it.Knobs[name] = v
				}
				return nil
			}},
			networks.Key{Name: "scoop", Decode: func(n *yaml.Node, path string) error {
				kind(ItemScoop)
				var depthSet bool
				err := dec.Map(n, path,
					networks.Key{Name: "hz", Decode: hz(&it.Hz)},
					networks.Key{Name: "depth_db", Decode: func(n *yaml.Node, path string) error {
						depthSet = true
						v, err := dec.Number(n, path)
						if err == nil && !(v < 0) {
							err = dec.Errorf(n, path, "%v dB: a scoop's depth is negative (a dip below the shoulders), e.g. -10", v)
						}
						it.DepthDB = v
						return err
					}},
					networks.Key{Name: "balance_db", Decode: func(n *yaml.Node, path string) error {
						var v float64
						err := num(&v)(n, path)
						it.BalanceDB = &v
						return err
					}})
				if err == nil && (it.Hz == 0 || !depthSet) {
					err = dec.Errorf(n, path, "a scoop target needs hz and depth_db, e.g. {hz: 700, depth_db: -8}")
				}
				return err
			}},
			networks.Key{Name: "peak", Decode: func(n *yaml.Node, path string) error {
				kind(ItemPeak)
				err := dec.Map(n, path,
					networks.Key{Name: "hz", Decode: hz(&it.Hz)},
					networks.Key{Name: "height_db", Decode: func(n *yaml.Node, path string) error {
						v, err := dec.Number(n, path)
						if err == nil && !(v > 0) {
							err = dec.Errorf(n, path, "%v dB: a peak's height is positive, e.g. 4", v)
						}
						it.HeightDB = v
						return err
					}})
				if err == nil && (it.Hz == 0 || it.HeightDB == 0) {
					err = dec.Errorf(n, path, "a peak target needs hz and height_db, e.g. {hz: 500, height_db: 4}")
				}
				return err
			}},
			networks.Key{Name: "gain_db", Decode: func(n *yaml.Node, path string) error {
				kind(ItemGain)
				set := false
				err := dec.Map(n, path,
					networks.Key{Name: "hz", Decode: hz(&it.Hz)},
					networks.Key{Name: "db", Decode: func(n *yaml.Node, path string) error { set = true; return num(&it.DB)(n, path) }})
				if err == nil && (it.Hz == 0 || !set) {
					err = dec.Errorf(n, path, "a gain target needs hz and db, e.g. {hz: 5k, db: -3}")
				}
				return err
			}},
			networks.Key{Name: "corner_hz", Decode: func(n *yaml.Node, path string) error { kind(ItemCorner); return hz(&it.Hz)(n, path) }},
			networks.Key{Name: "low_corner_hz", Decode: func(n *yaml.Node, path string) error { kind(ItemLowCorner); return hz(&it.Hz)(n, path) }},
		)
		if err != nil {
			return err
		}
		if kinds != 1 {
			return dec.Errorf(c, p, "give exactly one figure per entry (scoop, peak, gain_db, corner_hz or low_corner_hz), with its knobs, e.g. {knobs: {blend: 1}, corner_hz: 9k}")
		}
		items = append(items, it)
		return nil
	})
	if err == nil && len(items) == 0 {
		err = dec.Errorf(n, path, "the list is empty: give at least one figure")
	}
	return items, err
}

// itemPriority is the priority name of each row.
func (g goal) itemPriority() []string {
	out := make([]string, len(g.rows))
	for i, r := range g.rows {
		out[i] = r.priority
	}
	return out
}

// hasCurve reports whether a row is a curve's RMS error.
func (g goal) hasCurve() bool {
	for _, r := range g.rows {
		if r.figure == "rms" {
			return true
		}
	}
	return false
}

// freqText writes a frequency with its unit and prefix: 200 kHz, 1.2 kHz,
// 80 Hz (up to four significant digits, so that a bound reads as given).
func freqText(hz float64) string { return eseries.WithUnit(hz, 4, "Hz") }
