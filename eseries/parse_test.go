package eseries

import (
	"errors"
	"strconv"
	"strings"
	"testing"
)

func TestParse(t *testing.T) {
	for _, test := range []struct {
		in   string
		want float64 // compared with ==: Parse must give the nearest float64
		unit string
	}{
		// Plain numbers.
		{"4700", 4700, ""},
		{"4.7e3", 4700, ""},
		{"4.7E3", 4700, ""},
		{"1e-9", 1e-9, ""},
		{"1e+6", 1e6, ""},
		{".47", 0.47, ""},
		{"0.47", 0.47, ""},
		{"47.", 47, ""},
		{"+22", 22, ""},
		{"-22", -22, ""},
		{"0", 0, ""},
		{"007", 7, ""},
		{"  4700\t", 4700, ""},

		// SI prefixes (SI Brochure, BIPM). M is mega, m milli.
		{"4.7k", 4700, ""},
		{"4.7K", 4700, ""},
		{"2.2n", 2.2e-9, ""},
		{"100n", 100e-9, ""},
		{"470p", 470e-12, ""},
		{"4.7u", 4.7e-6, ""},
		{"4.7\u00b5", 4.7e-6, ""}, // MICRO SIGN
		{"4.7\u03bc", 4.7e-6, ""}, // GREEK SMALL LETTER MU
		{"10m", 10e-3, ""},
		{"9kHz", 9000, "Hz"},
		{"700 Hz", 700, "Hz"},
		{"1.2kHz", 1200, "Hz"},
		{"1M", 1e6, ""},
		{"2.2G", 2.2e9, ""},
		{"-4.7k", -4700, ""},
		// "meg" for mega (SPICE input convention, from memory).
		{"1meg", 1e6, ""},
		{"4.7Meg", 4.7e6, ""},
		{"2MEG", 2e6, ""},
		{"1megohm", 1e6, "Ω"},

		// Units.
		{"4.7kΩ", 4700, "Ω"},      // U+03A9
		{"4.7k\u2126", 4700, "Ω"}, // OHM SIGN
		{"100nF", 100e-9, "F"},
		{"2.2uF", 2.2e-6, "F"},
		{"2.2µF", 2.2e-6, "F"},
		{"10mH", 10e-3, "H"},
		{"1MΩ", 1e6, "Ω"},
		{"1mΩ", 1e-3, "Ω"},
		{"22ohm", 22, "Ω"},
		{"22ohms", 22, "Ω"},
		{"22 Ohm", 22, "Ω"},
		{"1kOHMS", 1000, "Ω"},
		{"1 kΩ", 1000, "Ω"},
		{"100 nF", 100e-9, "F"},
		{"1 k", 1000, ""},
		{"10 Ω", 10, "Ω"},
		{"1F", 1, "F"},
		{"1e-9F", 1e-9, "F"},
		{"1e3 Ω", 1000, "Ω"},

		// RKM codes (IEC 60062, from memory): the letter stands in the
		// place of the decimal point.
		{"4k7", 4700, ""},
		{"2n2", 2.2e-9, ""},
		{"R47", 0.47, "Ω"},
		{"1M0", 1e6, ""},
		{"100R", 100, "Ω"},
		{"4u7", 4.7e-6, ""},
		{"4µ7", 4.7e-6, ""},
		{"4R7", 4.7, "Ω"},
		{"0R1", 0.1, "Ω"},
		{"1K5", 1500, ""},
		{"p68", 0.68e-12, ""},
		{"6p8", 6.8e-12, ""},
		{"3m3", 3.3e-3, ""},
		{"1G5", 1.5e9, ""},
		{"4r7", 4.7, "Ω"}, // lower-case r (common practice, no published source)
		{"4k7Ω", 4700, "Ω"},
		{"2n2F", 2.2e-9, "F"},
		{"4m7H", 4.7e-3, "H"},
		{"-4k7", -4700, ""},
		{"47k5", 47.5e3, ""},
		{"R001", 0.001, "Ω"},
	} {
		got, unit, err := ParseUnit(test.in)
		if err != nil {
			t.Errorf("ParseUnit(%q): %v", test.in, err)
			continue
		}
		if got != test.want || unit != test.unit {
			t.Errorf("ParseUnit(%q) = %v, %q; want %v, %q", test.in, got, unit, test.want, test.unit)
		}
		if p, err := Parse(test.in); err != nil || p != got {
			t.Errorf("Parse(%q) = %v, %v; want %v", test.in, p, err, got)
		}
	}
}

func TestParseErrors(t *testing.T) {
	for _, test := range []struct {
		in     string
		reason string // in the error
	}{
		{"", "empty"},
		{"   ", "empty"},
		{"4x7", `unexpected "x7"`},
		{"4k7k", `unexpected "k"`},
		{"1.2k3", "decimal point"},
		{"k", "no digits"},
		{"R", "no digits"},
		{"Ω", "no digits"},
		{"meg", "no digits"},
		{"--1", "no digits"},
		{"+-1", "no digits"},
		{"+", "no digits"},
		{".", "no digits"},
		{".k", "no digits"},
		{"NaN", "not a finite number"},
		{"nan", "not a finite number"},
		{"Inf", "not a finite number"},
		{"+Inf", "not a finite number"},
		{"infinity", "not a finite number"},
		{"1e", "exponent"},
		{"1e+", "exponent"},
		{"1ek", "exponent"},
		{"1e3k", "prefix cannot follow an exponent"},
		{"1e400", "too large"},
		{"1000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000000G", "too large"},
		{"1e-400", "too small"},
		{"1e-310", "too small"},
		{"4.7R", `unexpected "R"`},
		{"4R7Ω", "RKM code"},
		{"4k 7", "unexpected"},
		{"4 k7", "unexpected"},
		{"1  k", "unexpected"},
		{"1kΩΩ", "unexpected"},
		{"1kF2", "unexpected"},
		{"0x10", "unexpected"},
		{"1_000", "unexpected"},
		{"1,5k", "unexpected"},
		{"4.7kohmz", "unexpected"},
		{"1mm", "unexpected"},
		{"4700 4700", "unexpected"},
		{"1.2.3", "unexpected"},
		{"\xff", "no digits"},
		{"4\xff", "unexpected"},
	} {
		v, err := Parse(test.in)
		if err == nil {
			t.Errorf("Parse(%q) = %v, want error", test.in, v)
			continue
		}
		var pe *ParseError
		if !errors.As(err, &pe) {
			t.Errorf("Parse(%q) error %T is not a *ParseError", test.in, err)
			continue
		}
		if pe.Input != test.in {
			t.Errorf("Parse(%q): ParseError.Input = %q", test.in, pe.Input)
		}
		if !strings.Contains(pe.Reason, test.reason) {
			t.Errorf("Parse(%q): reason %q should contain %q", test.in, pe.Reason, test.reason)
		}
		msg := err.Error()
		if !strings.HasPrefix(msg, "bad value "+strconv.Quote(test.in)+": ") {
			t.Errorf("Parse(%q): error %q should start by quoting the input", test.in, msg)
		}
		for _, form := range []string{"4.7k", "100n", "2.2uF", "10mH", "4.7kΩ", "4k7", "2n2", "R47", "1M0", "100R"} {
			if !strings.Contains(msg, form) {
				t.Errorf("Parse(%q): error %q should list the form %q", test.in, msg, form)
			}
		}
	}
}

func TestParseErrorMessage(t *testing.T) {
	e := &ParseError{Input: "4x7"}
	want := `bad value "4x7": use a number with an optional SI prefix and unit (4700, 4.7e3, 4.7k, 100n, 2.2uF, 1M, 10mH, 4.7kΩ) or an RKM code (4k7, 2n2, R47, 1M0, 100R)`
	if got := e.Error(); got != want {
		t.Errorf("Error() =\n %s\nwant\n %s", got, want)
	}
	_, err := Parse("4x7")
	want = `bad value "4x7": unexpected "x7" after "4"; use a number with an optional SI prefix and unit (4700, 4.7e3, 4.7k, 100n, 2.2uF, 1M, 10mH, 4.7kΩ) or an RKM code (4k7, 2n2, R47, 1M0, 100R)`
	if err == nil || err.Error() != want {
		t.Errorf("Parse(\"4x7\") error =\n %v\nwant\n %s", err, want)
	}
}

// TestParseSeriesMembers checks that each series member, written as an RKM
// code, with a prefix and with an exponent, parses to exactly that member.
func TestParseSeriesMembers(t *testing.T) {
	for _, s := range standard {
		for _, m := range s.Mantissas {
			mt := strconv.FormatFloat(m, 'f', -1, 64)
			for k := -12; k <= 9; k++ {
				want := member(m, k)
				forms := []string{mt + "e" + strconv.Itoa(k)}
				if k%3 == 0 {
					p := engPrefixes[(k+12)/3]
					forms = append(forms, mt+p)
					if p != "" {
						rkm := mt + p + "0" // "1k0"
						if strings.Contains(mt, ".") {
							rkm = strings.Replace(mt, ".", p, 1) // "4k7"
						}
						forms = append(forms, rkm)
					}
				}
				for _, f := range forms {
					if got, err := Parse(f); err != nil || got != want {
						t.Errorf("Parse(%q) = %v, %v; want %v", f, got, err, want)
					}
				}
			}
		}
	}
}
