package eseries

import (
	"math"
	"strings"
	"testing"
)

// mantissaDigits counts the digits of a formatted value before any exponent.
func mantissaDigits(f string) int {
	if i := strings.IndexByte(f, 'e'); i >= 0 {
		f = f[:i]
	}
	n := 0
	for _, c := range f {
		if '0' <= c && c <= '9' {
			n++
		}
	}
	return n
}

func TestFormat(t *testing.T) {
	for _, test := range []struct {
		v    float64
		want string
	}{
		{4700, "4.7k"},
		{2.2e-9, "2.2n"},
		{470e-12, "470p"},
		{1e6, "1M"},
		{100, "100"},
		{0.47, "470m"},
		{0, "0"},
		{math.Copysign(0, -1), "0"},
		{12345.678, "12.3457k"},
		{1, "1"},
		{999, "999"},
		{1000, "1k"},
		{4.7e-6, "4.7u"},
		{33e-3, "33m"},
		{2.2e9, "2.2G"},
		{999.9999e9, "1e12"}, // rounds past the last prefix
		{1e12, "1e12"},
		{2.5e13, "2.5e13"},
		{1e-12, "1p"},
		{0.99999e-12, "9.9999e-13"},
		{1e-15, "1e-15"},
		{4.7e-15, "4.7e-15"},
		{1.7976931348623157e308, "1.79769e308"},
		{5e-324, "4.94066e-324"},
		{-4700, "-4.7k"},
		{-2.2e-9, "-2.2n"},
		{-1e20, "-1e20"},
		{math.NaN(), "NaN"},
		{math.Inf(1), "+Inf"},
		{math.Inf(-1), "-Inf"},
	} {
		if got := Format(test.v); got != test.want {
			t.Errorf("Format(%v) = %q, want %q", test.v, got, test.want)
		}
	}
}

func TestFormatSig(t *testing.T) {
	for _, test := range []struct {
		v    float64
		sig  int
		want string
	}{
		{999.96, 3, "1k"}, // rounding carries into the next prefix
		{999.94, 4, "999.9"},
		{999.96, 4, "1k"},
		{999.4, 3, "999"},
		{4712, 2, "4.7k"},
		{4750, 2, "4.8k"},
		{470e-12, 1, "500p"},
		{470e-12, 2, "470p"},
		{0.000999999, 3, "1m"},
		{1234.5678, 0, "1k"},  // clamped to 1 digit
		{1234.5678, -5, "1k"}, // clamped to 1 digit
		{1.0 / 3, 17, "333.33333333333331m"},
		{1.0 / 3, 40, "333.33333333333331m"}, // clamped to 17 digits
		{12345.678, 8, "12.345678k"},
		{math.NaN(), 3, "NaN"},
	} {
		if got := FormatSig(test.v, test.sig); got != test.want {
			t.Errorf("FormatSig(%v, %d) = %q, want %q", test.v, test.sig, got, test.want)
		}
	}
}

// TestFormatRoundTrip checks Parse(Format(x)) == x for every member of every
// standard series (E24 among them) in all decades, and that Format writes
// those members cleanly, with no more digits than the table has.
func TestFormatRoundTrip(t *testing.T) {
	for _, s := range standard {
		for _, x := range allMembers(s) {
			f := Format(x)
			got, err := Parse(f)
			if err != nil || got != x {
				t.Errorf("%s: Parse(Format(%v)) = Parse(%q) = %v, %v", s, x, f, got, err)
			}
			if n := mantissaDigits(f); n > 3 {
				t.Errorf("%s: Format(%v) = %q has %d digits, want at most 3", s, x, f, n)
			}
			if g, err := Parse(FormatSig(x, 17)); err != nil || g != x {
				t.Errorf("%s: Parse(FormatSig(%v, 17)) = %v, %v", s, x, g, err)
			}
		}
	}
	for _, test := range []struct {
		v    float64
		want string
	}{
		{member(4.7, 3), "4.7k"},
		{member(2.2, -9), "2.2n"},
		{member(9.1, -12), "9.1p"},
		{member(1.0, 6), "1M"},
		{member(9.2, 2), "920"},
		{member(1.02, -3), "1.02m"},
	} {
		if got := Format(test.v); got != test.want {
			t.Errorf("Format(%v) = %q, want %q", test.v, got, test.want)
		}
	}
}

func TestWithUnit(t *testing.T) {
	for _, test := range []struct {
		v    float64
		sig  int
		unit string
		want string
	}{
		{4700, 3, "Ω", "4.7 kΩ"},
		{1e-6, 3, "F", "1 µF"},
		{100e-9, 3, "F", "100 nF"},
		{9000, 3, "Hz", "9 kHz"},
		{680, 3, "Ω", "680 Ω"},
		{1e-3, 3, "Ω", "1 mΩ"},
		{1e12, 3, "Ω", "1 TΩ"},
		{1e-15, 3, "F", "1 fF"},
		{999.96e-15, 3, "F", "1 pF"},
		{1e30, 3, "Ω", "1e30 Ω"},
		{1e-20, 3, "F", "1e-20 F"},
		{0, 3, "Ω", "0 Ω"},
		{-2200, 2, "Ω", "-2.2 kΩ"},
	} {
		if got := WithUnit(test.v, test.sig, test.unit); got != test.want {
			t.Errorf("WithUnit(%v, %d, %q) = %q, want %q", test.v, test.sig, test.unit, got, test.want)
		}
	}
}
