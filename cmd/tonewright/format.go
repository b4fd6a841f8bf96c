package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"tonewright/eseries"
	"tonewright/networks"
)

// withUnit prints v in the short engineering form with a space before the
// prefixed unit: 4.98 kHz, 6.8 kΩ, 470 pF.
func withUnit(v float64, sig int, unit string) string { return eseries.WithUnit(v, sig, unit) }

func hz(v float64) string  { return withUnit(v, 3, "Hz") }
func ohm(v float64) string { return withUnit(v, 3, "Ω") }

// db prints a level in dB with a sign and one decimal; -0.0 prints as 0.0.
func db(v float64) string {
	if math.Abs(v) < 0.05 {
		v = 0
	}
	return fmt.Sprintf("%+.1f dB", v)
}

// flagValue reads one value given with --flag. A unit, if written, must be
// want: "Ω", "F" or "Hz".
func flagValue(flag, s, want string) (float64, error) {
	v, unit, err := eseries.ParseUnit(strings.TrimSpace(s))
	if err != nil {
		return 0, usageErrorf("--%s: %v", flag, err)
	}
	if unit != "" && unit != want {
		return 0, usageErrorf("--%s %q is in %s: this flag takes a value in %s (or no unit)", flag, s, unit, want)
	}
	return v, nil
}

// checkFlagRange refuses a resistance or capacitance given with --flag
// (as s) outside the range the design file accepts for a part.
func checkFlagRange(flag, s string, v float64, unit string) error {
	if err := networks.CheckRange(v, unit); err != nil {
		return usageErrorf("--%s %s: %v", flag, s, err)
	}
	return nil
}

// unitOfFlag is the unit the list flags' values are in.
var unitOfFlag = map[string]string{"resistors": "Ω", "capacitors": "F", "pots": "Ω", "source": "Ω", "load": "Ω"}

// parseList reads a comma-separated list of part values (4.7k, 1M, 100),
// in the unit unitOfFlag gives the flag.
func parseList(flag, s string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			return nil, usageErrorf("--%s %q: an empty item: give values separated by single commas, e.g. 100,1k,4.7k", flag, s)
		}
		v, err := flagValue(flag, f, unitOfFlag[flag])
		if err != nil {
			return nil, err
		}
		if !(v > 0) {
			return nil, usageErrorf("--%s %s: values are positive, e.g. 100,1k,4.7k", flag, f)
		}
		if err := checkFlagRange(flag, f, v, unitOfFlag[flag]); err != nil {
			return nil, err
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		return nil, usageErrorf("--%s: the list is empty: give values separated by commas, e.g. 100,1k,4.7k", flag)
	}
	return out, nil
}

// parsePositions reads knob positions: numbers from 0 to 1 separated by
// commas.
func parsePositions(flag, s string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			return nil, usageErrorf("--%s %q: an empty item: use numbers from 0 to 1 separated by single commas, e.g. 0,0.25,0.5,0.75,1", flag, s)
		}
		v, err := strconv.ParseFloat(f, 64)
		if err != nil || !(v >= 0 && v <= 1) {
			return nil, usageErrorf("--%s: bad knob position %q: use numbers from 0 to 1 separated by commas, e.g. 0,0.25,0.5,0.75,1", flag, f)
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		return nil, usageErrorf("--%s: no knob positions: use numbers from 0 to 1 separated by commas, e.g. 0,0.5,1", flag)
	}
	return out, nil
}

// parsePosition reads one knob position.
func parsePosition(flag string, v float64) error {
	if !(v >= 0 && v <= 1) {
		return usageErrorf("--%s: knob position %v is outside 0..1", flag, v)
	}
	return nil
}

// posLabel names a knob position in legends and headers: 0, 0.25, 1.
func posLabel(p float64) string { return strconv.FormatFloat(p, 'f', -1, 64) }
