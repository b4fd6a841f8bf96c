package live

import (
	"fmt"
	"math"
	"strings"

	"tonewright/eseries"
)

// parseValue reads a part's value as the trade writes it (4k7, 22n, 100nF,
// 4.7 kΩ): a unit, when written, must be the part's; "open" is accepted for
// an open load and 0 (or "none") where the part may be left out.
func parseValue(p Part, s string) (float64, error) {
	t := strings.TrimSpace(s)
	if t == "" {
		return 0, fmt.Errorf("empty: write a value such as %s", example(p))
	}
	if len(t) > 64 {
		return 0, fmt.Errorf("%.20q… is too long for a value", t)
	}
	if p.Open && strings.EqualFold(t, "open") {
		return math.Inf(1), nil
	}
	if p.Zero != "" && strings.EqualFold(t, "none") {
		return 0, nil
	}
	v, unit, err := eseries.ParseUnit(t)
	if err != nil {
		return 0, err
	}
	if unit != "" && unit != p.Unit {
		return 0, fmt.Errorf("%q is in %s, but the %s is in %s: write it in %s or without a unit", t, unit, p.Role, p.Unit, p.Unit)
	}
	if v == 0 && p.Zero == "" {
		return 0, fmt.Errorf("%q: the %s must be above zero, e.g. %s", t, p.Role, example(p))
	}
	if v < 0 {
		return 0, fmt.Errorf("%q: the %s cannot be negative", t, p.Role)
	}
	return v, nil
}

func example(p Part) string {
	if p.Unit == "F" {
		return "22n, 4n7 or 100nF"
	}
	return "4k7, 100k or 1M"
}

// formatValue writes a part's value back in the short engineering form.
func formatValue(p Part, v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "open"
	case v == 0 && p.Zero != "":
		return "0"
	}
	return eseries.Format(v)
}

// potSteps are the track values pots are commonly sold in, 1–2.5–5 per
// decade from 1 kΩ to 5 MΩ (common practice, no published source).
var potSteps = func() *eseries.List {
	var vs []float64
	for d := 1e3; d < 1e7; d *= 10 {
		vs = append(vs, d, 2.5*d, 5*d)
	}
	l, err := eseries.NewList(vs)
	if err != nil {
		panic(err)
	}
	return l
}()

// stepSeries are the series the page steps through, coarsest first.
var stepSeries = []string{"E12", "E24", "E96"}

// step returns the next value of the series (for a pot, the next common
// pot value) above (dir > 0) or below (dir < 0) v.
func step(p Part, v float64, series string, dir int) (float64, error) {
	var set eseries.Set
	if p.Kind == "pot" {
		set = potSteps
	} else {
		ok := false
		for _, s := range stepSeries {
			ok = ok || s == series
		}
		if !ok {
			return 0, fmt.Errorf("series %q: use one of %s", series, strings.Join(stepSeries, ", "))
		}
		s, err := eseries.SeriesByName(series)
		if err != nil {
			return 0, err
		}
		set = s
	}
	if math.IsInf(v, 1) {
		return 0, fmt.Errorf("an open load has no step: type a value such as 1M")
	}
	var next float64
	var ok bool
	switch {
	case dir > 0 && v == 0:
		return 0, fmt.Errorf("0 (%s) has no next value: type one such as %s", p.Zero, example(p))
	case dir > 0:
		next, ok = eseries.Next(set, v)
	case dir < 0:
		next, ok = eseries.Prev(set, v)
	default:
		return 0, fmt.Errorf("direction must be 1 (up) or -1 (down)")
	}
	if !ok {
		return 0, fmt.Errorf("%s has no value %s %s", set, map[bool]string{true: "above", false: "below"}[dir > 0], eseries.Format(v))
	}
	return next, nil
}
