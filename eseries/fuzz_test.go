package eseries

import (
	"errors"
	"math"
	"testing"
)

// formatRelErr is the largest relative error of Format: it keeps 6
// significant digits, so rounding moves a value by at most half a unit in
// the 6th digit, 5e-6 of it when the leading digit is 1.
const formatRelErr = 5e-6

// FuzzParse checks that Parse never panics, that what it accepts is finite,
// and that Format writes it back in a form Parse reads to the same value
// (within Format's rounding; exactly with 17 digits).
func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"4700", "4.7e3", "1e-9", ".47", "-22", "+1", "4.7k", "2.2n", "100nF",
		"2.2uF", "4.7µF", "4.7μ", "1M", "1meg", "10mH", "4.7kΩ", "4.7k\u2126",
		"1 kΩ", "22 ohms", "4k7", "2n2", "R47", "1M0", "100R", "4u7", "0R1",
		"1K5", "p68", "4k7k", "1.2k3", "k", "--1", "", "NaN", "Inf", "1e400",
		"1e-400", "4x7", "1e3k", "\xff",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, unit, err := ParseUnit(s)
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) || pe.Input != s {
				t.Fatalf("ParseUnit(%q) error %v (%T) is not a *ParseError on the input", s, err, err)
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("Parse(%q) = %v, want a finite value", s, v)
		}
		switch unit {
		case "", "Ω", "F", "H":
		default:
			t.Fatalf("ParseUnit(%q) unit = %q", s, unit)
		}
		out := Format(v)
		back, err := Parse(out)
		if err != nil {
			t.Fatalf("Parse(%q) = %v, but Parse(Format) = Parse(%q) fails: %v", s, v, out, err)
		}
		if math.Abs(back-v) > formatRelErr*math.Abs(v) {
			t.Fatalf("Parse(%q) = %v; Format gives %q, which parses to %v", s, v, out, back)
		}
		out = FormatSig(v, 17)
		if back, err := Parse(out); err != nil || back != v {
			t.Fatalf("Parse(%q) = %v; FormatSig(17) gives %q, which parses to %v, %v", s, v, out, back, err)
		}
	})
}
