package synth

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"

	"tonewright/networks"
)

// Curve is a whole-curve target: the gain in dB against frequency at one
// or more knob settings, as `analyze --csv` writes it (a column hz, then
// db_at_LABEL per setting, LABEL a position of the swept knob such as 0.5,
// or knobs such as treble=0.5;bass=0; deg_at_ columns are ignored), or a
// measured curve with the columns hz and db, one setting (Problem.CurveKnobs).
type Curve struct {
	File     string
	Hz       []float64
	Settings []CurveSetting
}

// CurveSetting is one setting's column.
type CurveSetting struct {
	Label string             // the column's label: "0.5", "treble=0.5;bass=0", "" for a db column
	Swept *float64           // the swept knob's position, for a numeric label
	Knobs map[string]float64 // the knobs, for a NAME=P label
	DB    []float64
}

// LoadCurve reads a curve CSV file (see Curve).
func LoadCurve(path string) (*Curve, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read curve file: %w", err)
	}
	return ParseCurve(data, path)
}

// ParseCurve reads a curve CSV's contents; name names the file in errors.
func ParseCurve(data []byte, name string) (*Curve, error) {
	r := csv.NewReader(bytes.NewReader(data))
	r.FieldsPerRecord = -1
	rows, err := r.ReadAll()
	if err != nil {
		return nil, &networks.FieldError{File: name, Err: fmt.Errorf("not a CSV file: %v", err)}
	}
	bad := func(line int, format string, args ...any) error {
		return &networks.FieldError{File: name, Line: line, Err: fmt.Errorf(format, args...)}
	}
	if len(rows) < 3 {
		return nil, bad(1, "a curve needs a header and at least two rows of hz and dB values")
	}
	c := &Curve{File: name}
	hzCol := -1
	var cols []int
	for i, h := range rows[0] {
		h = strings.TrimSpace(h)
		switch {
		case h == "hz":
			hzCol = i
		case h == "db":
			c.Settings = append(c.Settings, CurveSetting{})
			cols = append(cols, i)
		case strings.HasPrefix(h, "db_at_"):
			s, err := parseLabel(strings.TrimPrefix(h, "db_at_"))
			if err != nil {
				return nil, bad(1, "column %q: %v", h, err)
			}
			c.Settings = append(c.Settings, s)
			cols = append(cols, i)
		case strings.HasPrefix(h, "deg_at_") || h == "deg":
		default:
			return nil, bad(1, "unknown column %q: a curve has hz, then db (one measured setting) or db_at_SETTING columns as analyze --csv writes them", h)
		}
	}
	if hzCol < 0 || len(cols) == 0 {
		return nil, bad(1, "a curve needs the columns hz and db (or db_at_SETTING, as analyze --csv writes them)")
	}
	for k, row := range rows[1:] {
		line := k + 2
		num := func(i int, what string) (float64, error) {
			if i >= len(row) {
				return 0, bad(line, "missing %s value", what)
			}
			v, err := strconv.ParseFloat(strings.TrimSpace(row[i]), 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return 0, bad(line, "%s %q is not a number", what, row[i])
			}
			return v, nil
		}
		hz, err := num(hzCol, "hz")
		if err != nil {
			return nil, err
		}
		if !(hz > 0) || len(c.Hz) > 0 && !(hz > c.Hz[len(c.Hz)-1]) {
			return nil, bad(line, "hz %v: the frequencies must be positive and rising", hz)
		}
		c.Hz = append(c.Hz, hz)
		for j, col := range cols {
			v, err := num(col, rows[0][col])
			if err != nil {
				return nil, err
			}
			c.Settings[j].DB = append(c.Settings[j].DB, v)
		}
	}
	return c, nil
}

// parseLabel reads an analyze --csv setting label.
func parseLabel(s string) (CurveSetting, error) {
	cs := CurveSetting{Label: s}
	if s == "design" {
		return cs, nil
	}
	if v, err := strconv.ParseFloat(s, 64); err == nil {
		if !(v >= 0 && v <= 1) {
			return cs, fmt.Errorf("knob position %v is outside 0..1", v)
		}
		cs.Swept = &v
		return cs, nil
	}
	cs.Knobs = map[string]float64{}
	for _, kv := range strings.Split(s, ";") {
		name, val, ok := strings.Cut(kv, "=")
		v, err := strconv.ParseFloat(val, 64)
		if !ok || err != nil || !(v >= 0 && v <= 1) {
			return cs, fmt.Errorf("%q is not a knob setting such as treble=0.5;bass=0", s)
		}
		cs.Knobs[name] = v
	}
	return cs, nil
}

// curveItems turns the curve into list-form items at the design's knobs:
// a numeric label moves the swept knob, a db column takes knobs (the
// --knob flags; nil: the design's own setting).
func curveItems(c *Curve, d *networks.Design, knobs map[string]float64) []Item {
	var items []Item
	for _, s := range c.Settings {
		it := Item{Kind: ItemCurve, CurveHz: c.Hz, CurveDB: s.DB, Label: s.Label}
		switch {
		case s.Swept != nil:
			it.Knobs = map[string]float64{sweptKnob(d): *s.Swept}
		case s.Knobs != nil:
			it.Knobs = s.Knobs
		case s.Label == "":
			it.Knobs = knobs
		}
		items = append(items, it)
	}
	return items
}

// curveResidual measures a curve item on r: the RMS and the largest
// difference (dB) over the item's points within the band, after taking
// out the mean difference when fitLevel is set (the offset returned).
func curveResidual(it *Item, r networks.Response, band networks.Band, fitLevel bool) (rms, worst, offset float64) {
	n := 0
	sum := 0.0
	for i, f := range it.CurveHz {
		if f < band.From || f > band.To {
			continue
		}
		sum += r.GainDB(f) - it.CurveDB[i]
		n++
	}
	if n == 0 {
		return math.Inf(1), math.Inf(1), 0
	}
	if fitLevel {
		offset = sum / float64(n)
	}
	ss := 0.0
	for i, f := range it.CurveHz {
		if f < band.From || f > band.To {
			continue
		}
		d := r.GainDB(f) - it.CurveDB[i] - offset
		ss += d * d
		worst = math.Max(worst, math.Abs(d))
	}
	return math.Sqrt(ss / float64(n)), worst, offset
}
