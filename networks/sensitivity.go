package networks

import (
	"math"
	"slices"
)

// This file is the sensitivity study: how far each metric moves for a small
// change of each part, by central differences in log space.

// SensitivityStep is the step h in ln(part value) of the central
// differences: each part is measured at value·e^−h and value·e^+h.
const SensitivityStep = 1e-3

// PartSensitivity is how the metrics move with one part. For the
// frequencies it is the elasticity d ln(metric)/d ln(part), percent change
// of the metric per percent change of the part; for the levels in dB it is
// d(metric)/d ln(part)/100, dB per percent change of the part. A field is
// nil when the metric is missing at either step (no scoop, no corner).
type PartSensitivity struct {
	Name  string  `json:"name"`
	Role  string  `json:"role"`
	Kind  string  `json:"kind"`
	Value float64 `json:"value"`

	ScoopHz   *float64 `json:"scoop_hz_pct_per_pct"`
	DepthDB   *float64 `json:"depth_db_per_pct"`
	BalanceDB *float64 `json:"balance_db_per_pct"`
	CornerHz  *float64 `json:"corner_pct_per_pct"`
	Gain1kDB  float64  `json:"gain_1k_db_per_pct"`
}

// SensitivityMetric describes one metric of a sensitivity study: its JSON
// key, a title and unit for tables, and how to read it from a
// PartSensitivity.
type SensitivityMetric struct {
	Key   string // the JSON key, e.g. scoop_hz_pct_per_pct
	Title string // "scoop frequency"
	Unit  string // "%/%" or "dB/%"
	Get   func(p *PartSensitivity) (float64, bool)
}

// SensitivityMetrics lists the metrics in the order reports show them.
var SensitivityMetrics = []SensitivityMetric{
	{"scoop_hz_pct_per_pct", "scoop frequency", "%/%", func(p *PartSensitivity) (float64, bool) { return deref(p.ScoopHz) }},
	{"depth_db_per_pct", "scoop depth", "dB/%", func(p *PartSensitivity) (float64, bool) { return deref(p.DepthDB) }},
	{"balance_db_per_pct", "scoop balance", "dB/%", func(p *PartSensitivity) (float64, bool) { return deref(p.BalanceDB) }},
	{"corner_pct_per_pct", "output corner", "%/%", func(p *PartSensitivity) (float64, bool) { return deref(p.CornerHz) }},
	{"gain_1k_db_per_pct", "gain at 1 kHz", "dB/%", func(p *PartSensitivity) (float64, bool) { return p.Gain1kDB, true }},
}

func deref(v *float64) (float64, bool) {
	if v == nil {
		return 0, false
	}
	return *v, true
}

// SensitivityReport is the result of a sensitivity study.
type SensitivityReport struct {
	Blend   *float64          `json:"blend,omitempty"` // the blend knob, for a blend design
	Knobs   Setting           `json:"knobs"`           // the setting for the gain and the scoop
	Step    float64           `json:"step"`            // h, in ln(part value)
	Nominal StudyMetrics      `json:"nominal"`
	Parts   []PartSensitivity `json:"parts"` // in signal order

	// Ranking lists, for each metric key, the parts that move it, by
	// decreasing magnitude of their sensitivity.
	Ranking map[string][]string `json:"ranking"`
}

// Ranked returns the parts by decreasing magnitude of their sensitivity for
// metric m, leaving out those for which it is missing; ties keep signal
// order.
func (r *SensitivityReport) Ranked(m SensitivityMetric) []PartSensitivity {
	var out []PartSensitivity
	for _, p := range r.Parts {
		if _, ok := m.Get(&p); ok {
			out = append(out, p)
		}
	}
	slices.SortStableFunc(out, func(a, b PartSensitivity) int {
		va, _ := m.Get(&a)
		vb, _ := m.Get(&b)
		switch x, y := math.Abs(va), math.Abs(vb); {
		case x > y:
			return -1
		case x < y:
			return 1
		}
		return 0
	})
	return out
}

// Sensitivities measures, for every part of d that the studies vary
// (StudyParts), the sensitivity of each
// metric (the gain at 1 kHz and the scoop at the setting at, the output
// corner at blend knob 1 for a blend design, else at at) by central differences with step
// SensitivityStep in ln(part value).
func Sensitivities(d *Design, at Setting) (*SensitivityReport, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	at, err := d.Setting(at)
	if err != nil {
		return nil, err
	}
	pr := newProbe(d, at)
	rep := &SensitivityReport{Blend: blendOf(at), Knobs: at, Step: SensitivityStep, Nominal: pr.measure(d).metrics(), Ranking: map[string][]string{}}
	w := d.Clone()
	for _, p := range d.StudyParts() {
		x := w.PartRef(p.Name)
		*x = p.Value * math.Exp(SensitivityStep)
		up := pr.measure(w)
		*x = p.Value * math.Exp(-SensitivityStep)
		down := pr.measure(w)
		*x = p.Value
		rep.Parts = append(rep.Parts, sensitivityOf(p, up, down, SensitivityStep))
	}
	for _, m := range SensitivityMetrics {
		names := []string{}
		for _, p := range rep.Ranked(m) {
			names = append(names, p.Name)
		}
		rep.Ranking[m.Key] = names
	}
	return rep, nil
}

// sensitivityOf forms the central differences from the measurements at
// e^+h and e^−h times the part's value.
func sensitivityOf(p Part, up, down sample, h float64) PartSensitivity {
	ps := PartSensitivity{Name: p.Name, Role: p.Role, Kind: p.Kind.String(), Value: p.Value}
	logSlope := func(a, b float64) *float64 { return ptr((math.Log(a) - math.Log(b)) / (2 * h)) }
	dbSlope := func(a, b float64) *float64 { return ptr((a - b) / (2 * h) / 100) }
	ps.Gain1kDB = *dbSlope(up.gain, down.gain)
	if up.hasScoop && down.hasScoop {
		ps.ScoopHz = logSlope(up.scoop.Hz, down.scoop.Hz)
		ps.DepthDB = dbSlope(up.scoop.DepthDB, down.scoop.DepthDB)
		ps.BalanceDB = dbSlope(up.scoop.BalanceDB, down.scoop.BalanceDB)
	}
	if up.hasCorner && down.hasCorner {
		ps.CornerHz = logSlope(up.corner, down.corner)
	}
	return ps
}
