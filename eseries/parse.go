package eseries

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// acceptedForms is the part of every ParseError message that tells the user
// what to type instead.
const acceptedForms = "use a number with an optional SI prefix and unit " +
	"(4700, 4.7e3, 4.7k, 100n, 2.2uF, 1M, 10mH, 4.7kΩ) " +
	"or an RKM code (4k7, 2n2, R47, 1M0, 100R)"

// ParseError reports a value that Parse could not read.
type ParseError struct {
	Input  string // the text as given
	Reason string // what is wrong with it, e.g. `unexpected "x7"`
}

// Error quotes the input, says what is wrong and lists the accepted forms.
func (e *ParseError) Error() string {
	if e.Reason == "" {
		return "bad value " + strconv.Quote(e.Input) + ": " + acceptedForms
	}
	return "bad value " + strconv.Quote(e.Input) + ": " + e.Reason + "; " + acceptedForms
}

// A prefix is an SI prefix (or the SPICE "meg") and its power of ten.
type prefix struct {
	text string
	exp  int
}

// prefixes are the multipliers accepted after a number. "M" is mega and
// "m" milli (SI Brochure, BIPM); "meg" in any of its usual spellings is mega
// as SPICE netlists write it (SPICE input convention, from memory). "K" for
// kilo is not SI but is common on parts and in RKM codes (common practice,
// no published source). The micro sign U+00B5 and the Greek mu U+03BC are
// both micro; so is "u", its ASCII stand-in.
var prefixes = [...]prefix{
	{"meg", 6}, {"Meg", 6}, {"MEG", 6},
	{"p", -12}, {"n", -9}, {"u", -6}, {"\u00b5", -6}, {"\u03bc", -6}, {"m", -3},
	{"k", 3}, {"K", 3}, {"M", 6}, {"G", 9},
}

// rkmLetter returns the power of ten of an RKM code letter: an SI prefix
// letter, or R (the unit, multiplier one) as in IEC 60062. A lower-case r is
// taken as R (common practice, no published source).
func rkmLetter(r rune) (exp int, ok bool) {
	switch r {
	case 'R', 'r':
		return 0, true
	case 'p':
		return -12, true
	case 'n':
		return -9, true
	case 'u', '\u00b5', '\u03bc':
		return -6, true
	case 'm':
		return -3, true
	case 'k', 'K':
		return 3, true
	case 'M':
		return 6, true
	case 'G':
		return 9, true
	}
	return 0, false
}

// Units accepted after the prefix. Parse does not check that the unit
// suits the part; ParseUnit reports it.
const (
	unitNone = ""
	unitOhm  = "Ω" // U+03A9, the form ParseUnit returns
	unitF    = "F"
	unitH    = "H"
	unitHz   = "Hz"
)

// unitOf returns the canonical unit for a unit suffix, and whether s is one.
func unitOf(s string) (string, bool) {
	switch {
	case s == "":
		return unitNone, true
	case s == "\u2126" || s == "\u03a9": // OHM SIGN, GREEK CAPITAL OMEGA
		return unitOhm, true
	case strings.EqualFold(s, "ohm") || strings.EqualFold(s, "ohms"):
		return unitOhm, true
	case s == "F":
		return unitF, true
	case s == "H":
		return unitH, true
	case s == "Hz":
		return unitHz, true
	}
	return "", false
}

// Parse reads a part value. It accepts
//
//   - a plain number, with an optional sign and exponent:
//     "4700", "4.7e3", "1e-9", ".47", "-2";
//   - a number followed by an SI prefix p n u µ μ m k K M G, or "meg"
//     (any of "meg", "Meg", "MEG") for mega: "4.7k", "2.2n", "1M", "1meg".
//     "M" is mega and "m" milli;
//   - after the prefix or number, an optional unit: Ω (U+2126 or U+03A9),
//     ohm or ohms in any case, F, H, Hz: "4.7kΩ", "100nF", "10mH", "22 ohm",
//     "9kHz".
//     One space may separate the number from prefix and unit: "1 kΩ";
//   - an RKM code as in IEC 60062, where the prefix letter, or R for the
//     unit itself, stands in the place of the decimal point: "4k7" (4700),
//     "2n2", "R47" (0.47), "1M0", "100R", "4u7". A unit may follow a prefix
//     letter ("4k7Ω", "2n2F") but not R.
//
// A prefix cannot follow an exponent ("1e3k"), and an RKM code cannot also
// hold a decimal point ("1.2k3"). Leading and trailing white space is
// ignored. Parse does not reject zero or negative values; callers that need
// a positive part value check for that.
//
// The result is the float64 nearest to the decimal value written, so
// Parse("2n2") == 2.2e-9 and Parse("4k7") == 4700 exactly. Errors are of
// type *ParseError; NaN, infinities and values too large or too small for a
// normal float64 are errors.
func Parse(s string) (float64, error) {
	v, _, err := ParseUnit(s)
	return v, err
}

// ParseUnit is Parse that also returns the unit written after the value:
// "Ω" (for any of the ohm spellings, and for RKM codes with R), "F", "H", "Hz",
// or "" when there is none.
func ParseUnit(s string) (v float64, unit string, err error) {
	fail := func(reason string) (float64, string, error) {
		return 0, "", &ParseError{Input: s, Reason: reason}
	}
	t := strings.TrimSpace(s)
	if t == "" {
		return fail("empty")
	}
	switch strings.ToLower(strings.TrimLeft(t, "+-.")) {
	case "nan", "inf", "infinity":
		return fail("not a finite number")
	}

	// Sign.
	i := 0
	sign := ""
	if t[0] == '+' || t[0] == '-' {
		if t[0] == '-' {
			sign = "-"
		}
		i++
	}

	// Integer digits, optional point and fraction digits.
	intStart := i
	for i < len(t) && isDigit(t[i]) {
		i++
	}
	intDigits := t[intStart:i]
	hasPoint := false
	fracDigits := ""
	if i < len(t) && t[i] == '.' {
		hasPoint = true
		i++
		fracStart := i
		for i < len(t) && isDigit(t[i]) {
			i++
		}
		fracDigits = t[fracStart:i]
	}

	// RKM code: a prefix letter or R where the decimal point would be.
	if !hasPoint {
		if r, size := utf8.DecodeRuneInString(t[i:]); size > 0 {
			if exp, ok := rkmLetter(r); ok {
				j := i + size
				for j < len(t) && isDigit(t[j]) {
					j++
				}
				rkmFrac := t[i+size : j]
				// "100R" is RKM; "100k" is the same value either way and
				// is left to the prefix rules, which also take "100kΩ".
				if rkmFrac != "" || r == 'R' || r == 'r' {
					if intDigits == "" && rkmFrac == "" {
						return fail("no digits")
					}
					u, ok := unitOf(t[j:])
					if !ok || ((r == 'R' || r == 'r') && u != unitNone) {
						return fail("unexpected " + strconv.Quote(t[j:]) + " after the RKM code " + strconv.Quote(t[i-len(intDigits):j]))
					}
					if r == 'R' || r == 'r' {
						u = unitOhm
					}
					return finish(s, sign, intDigits, rkmFrac, exp, u)
				}
			}
		}
	}

	if intDigits == "" && fracDigits == "" {
		if hasPoint {
			return fail("no digits around the decimal point")
		}
		return fail("no digits")
	}

	// Exponent.
	numEnd := i
	hasExp := false
	if i < len(t) && (t[i] == 'e' || t[i] == 'E') {
		j := i + 1
		if j < len(t) && (t[j] == '+' || t[j] == '-') {
			j++
		}
		k := j
		for k < len(t) && isDigit(t[k]) {
			k++
		}
		if k == j {
			return fail("exponent " + strconv.Quote(t[i:]) + " has no digits")
		}
		hasExp = true
		i = k
	}
	number := t[:i]

	// Suffix: one optional space, then an optional prefix, then an
	// optional unit.
	rest := strings.TrimPrefix(t[i:], " ")
	if u, ok := unitOf(rest); ok {
		if hasExp {
			return finishNumber(s, number, u)
		}
		return finish(s, sign, intDigits, fracDigits, 0, u)
	}
	for _, p := range prefixes {
		if !strings.HasPrefix(rest, p.text) {
			continue
		}
		u, ok := unitOf(rest[len(p.text):])
		if !ok {
			continue
		}
		if hasExp {
			return fail("a prefix cannot follow an exponent")
		}
		return finish(s, sign, intDigits, fracDigits, p.exp, u)
	}
	if hasPoint && !hasExp && looksRKM(rest) {
		return fail("an RKM code cannot also hold a decimal point")
	}
	return fail("unexpected " + strconv.Quote(t[i:]) + " after " + strconv.Quote(t[:numEnd]))
}

// looksRKM reports whether s starts like the letter-and-digits of an RKM code.
func looksRKM(s string) bool {
	r, size := utf8.DecodeRuneInString(s)
	if _, ok := rkmLetter(r); !ok || size == 0 {
		return false
	}
	return size < len(s) && isDigit(s[size])
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// finish builds the decimal sign intDigits.fracDigits e exp and converts it
// with one call to strconv.ParseFloat, so the result is correctly rounded.
func finish(input, sign, intDigits, fracDigits string, exp int, unit string) (float64, string, error) {
	var b strings.Builder
	b.Grow(len(sign) + len(intDigits) + len(fracDigits) + 8)
	b.WriteString(sign)
	if intDigits == "" {
		b.WriteByte('0')
	} else {
		b.WriteString(intDigits)
	}
	if fracDigits != "" {
		b.WriteByte('.')
		b.WriteString(fracDigits)
	}
	if exp != 0 {
		b.WriteByte('e')
		b.WriteString(strconv.Itoa(exp))
	}
	return finishNumber(input, b.String(), unit)
}

// finishNumber converts a number already checked to be a decimal floating
// point literal, rejecting results outside the normal float64 range.
func finishNumber(input, number, unit string) (float64, string, error) {
	v, err := strconv.ParseFloat(number, 64)
	if err != nil {
		var ne *strconv.NumError
		switch {
		case errors.As(err, &ne) && ne.Err == strconv.ErrRange && math.IsInf(v, 0):
			return 0, "", &ParseError{Input: input, Reason: "too large"}
		case errors.As(err, &ne) && ne.Err == strconv.ErrRange:
			return 0, "", &ParseError{Input: input, Reason: "too small"}
		}
		return 0, "", &ParseError{Input: input, Reason: "not a number"}
	}
	if (v != 0 && math.Abs(v) < 0x1p-1022) || (v == 0 && hasNonZeroDigit(number)) {
		return 0, "", &ParseError{Input: input, Reason: "too small"}
	}
	return v, unit, nil
}

// hasNonZeroDigit reports whether the mantissa of the decimal literal s has
// a digit other than zero.
func hasNonZeroDigit(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c == 'e' || c == 'E' {
			break
		}
		if '1' <= c && c <= '9' {
			return true
		}
	}
	return false
}
