package eseries

import (
	"math"
	"strconv"
	"strings"
)

// engPrefixes are the prefixes Format uses, indexed by (exponent+12)/3.
// Micro is written as the ASCII "u".
var engPrefixes = [...]string{"p", "n", "u", "m", "", "k", "M", "G"}

// Format writes v in the short engineering form parts are marked with: an
// SI prefix chosen so that the number before it lies in [1, 1000), up to 6
// significant digits, trailing zeros dropped. 4700 is "4.7k", 2.2e-9
// "2.2n", 470e-12 "470p", 1e6 "1M", 100 "100", 0.47 "470m" and 12345.678
// "12.3457k". The prefixes are p n u m k M G; values outside their reach
// are written with an exponent, "1e-15" or "2.5e13". Negative values keep
// their "-"; NaN and the infinities are "NaN", "+Inf" and "-Inf".
//
// Parse reads every result back, to the value rounded to 6 significant
// digits.
func Format(v float64) string {
	return FormatSig(v, 6)
}

// FormatSig is Format with sig significant digits (clamped to 1..17).
// Rounding happens before the prefix is chosen, so it may carry into the
// next prefix: FormatSig(999.96, 3) is "1k". With 17 digits Parse reads the
// result back to exactly v.
func FormatSig(v float64, sig int) string {
	switch {
	case math.IsNaN(v):
		return "NaN"
	case math.IsInf(v, 1):
		return "+Inf"
	case math.IsInf(v, -1):
		return "-Inf"
	case v == 0:
		return "0"
	}
	sig = max(1, min(sig, 17))
	sign := ""
	if v < 0 {
		sign = "-"
		v = -v
	}

	// strconv rounds correctly to sig digits: "d.ddde±XX".
	e := strconv.FormatFloat(v, 'e', sig-1, 64)
	ePos := strings.IndexByte(e, 'e')
	digits := e[:1]
	if ePos > 1 {
		digits += e[2:ePos]
	}
	exp, _ := strconv.Atoi(e[ePos+1:]) // always well formed

	if exp < -12 || exp >= 12 {
		return sign + withPoint(digits, 1) + "e" + strconv.Itoa(exp)
	}
	p := exp - mod3(exp) // engineering exponent, a multiple of 3
	return sign + withPoint(digits, exp-p+1) + engPrefixes[(p+12)/3]
}

// mod3 returns x mod 3 in [0, 3).
func mod3(x int) int {
	m := x % 3
	if m < 0 {
		m += 3
	}
	return m
}

// withPoint writes digits with the decimal point after the first n of
// them, padding with zeros and dropping trailing zeros of the fraction.
func withPoint(digits string, n int) string {
	for len(digits) < n {
		digits += "0"
	}
	whole, frac := digits[:n], strings.TrimRight(digits[n:], "0")
	if frac == "" {
		return whole
	}
	return whole + "." + frac
}

// WithUnit writes v as the trade writes a value with its unit: sig
// significant digits, a space, then the SI prefix and the unit, micro as
// µ: "4.7 kΩ", "100 nF", "1 µF", "9 kHz", "680 Ω". It also reaches the
// ends of the ranges part values take, tera and femto: "1 TΩ", "1 fF".
// Values beyond those are written with an exponent: "1e30 Ω".
func WithUnit(v float64, sig int, unit string) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return Format(v) + " " + unit
	}
	a := math.Abs(v)
	s, extra := FormatSig(v, sig), ""
	switch {
	case a >= 1e12 && a < 1e15:
		s, extra = FormatSig(v/1e12, sig), "T"
	case a > 0 && a < 1e-12 && a >= 1e-15:
		s, extra = FormatSig(v*1e15, sig), "f"
	}
	if strings.Contains(s, "e") {
		return s + " " + unit
	}
	k := len(s)
	for k > 0 && !(s[k-1] >= '0' && s[k-1] <= '9') {
		k--
	}
	prefix := s[k:]
	switch {
	case extra == "":
	case prefix == "":
		prefix = extra
	case extra == "f" && prefix == "k":
		prefix = "p" // rounding carried 999.96 fF to 1 pF
	default:
		return FormatSig(v, sig) + " " + unit // carried past tera
	}
	if prefix == "u" {
		prefix = "µ"
	}
	return s[:k] + " " + prefix + unit
}
