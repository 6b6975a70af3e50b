package series

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// SI prefixes understood by ParseValue: f p n u µ (U+00B5) μ (U+03BC) m
// k K M G T. "K" for kilo is common practice in component marking; "E"
// (exa) is not accepted, since "e"/"E" start an exponent.
var prefixExp = map[string]int{
	"f": -15, "p": -12, "n": -9, "u": -6, "\u00b5": -6, "\u03bc": -6, "m": -3,
	"k": 3, "K": 3, "M": 6, "G": 9, "T": 12,
}

// units accepted after a value (and ignored): ohms (Ω as U+03A9 or the ohm
// sign U+2126, "ohm", "ohms", "Ohm", "R"), farads "F", henries "H", hertz
// "Hz".
var units = []string{"\u03a9", "\u2126", "ohms", "ohm", "Ohms", "Ohm", "Hz", "F", "H"}

// ParseValue parses a component value, in ohms, farads or any unit the
// caller has in mind, and returns it as a float64 (the nearest to the
// decimal value written: "4.7k" gives exactly 4.7e3).
//
// Two forms are accepted, with an optional sign and surrounding spaces:
//
//   - Engineering notation: a decimal number with an optional exponent, an
//     optional SI prefix (f p n u µ m k K M G T; space allowed before it)
//     and an optional unit (Ω, ohm, F, H, Hz; after a prefix also "f" for
//     farads, as in the common "100nf"; alone "f" is femto): "15.8k",
//     "100n", "4.7 µF", "4.7uF", "1M", "2.2 kΩ", "1e-9", "0.1u", "100R"
//     ("R" alone as the unit: ohms).
//   - The IEC 60062 letter-and-digit code (from memory of IEC 60062), where
//     the letter of the multiplier stands in place of the decimal point: R
//     (×1), p n u µ m k K M G T; "4k7" = 4.7e3, "2R2" = 2.2, "R47" = 0.47,
//     "p68" = 0.68e-12, "1M0" = 1e6, "4n7" = 4.7e-9, optionally followed by a
//     unit ("4n7F").
//
// Text in neither form is an error wrapping ErrSyntax, its message quoting
// the input; a value beyond float64 ("1e400", "1e-400") wraps ErrRange.
// NaN and infinities are not component values and are rejected.
func ParseValue(s string) (float64, error) {
	v, err := parseValue(s)
	if err != nil {
		return 0, err
	}
	return v, nil
}

func syntaxErr(s, why string) error {
	return fmt.Errorf("series: parse value %q: %s: %w", s, why, ErrSyntax)
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

func parseValue(in string) (float64, error) {
	s := strings.TrimSpace(in)
	if s == "" {
		return 0, syntaxErr(in, "empty")
	}
	neg := false
	if s[0] == '+' || s[0] == '-' {
		neg = s[0] == '-'
		s = s[1:]
	}
	i := 0
	for i < len(s) && isDigit(s[i]) {
		i++
	}
	intPart := s[:i]
	rest := s[i:]
	var frac string
	exp := 0
	hasExp := false
	afterPrefix := false // an SI prefix was read: a lowercase "f" is then farads
	if mult, n := codeLetter(rest); n > 0 && len(rest) > n && isDigit(rest[n]) {
		// Letter-and-digit code: the letter is the decimal point.
		j := n
		for j < len(rest) && isDigit(rest[j]) {
			j++
		}
		frac = rest[n:j]
		exp = mult
		afterPrefix = rest[0] != 'R' && rest[0] != 'r'
		rest = rest[j:]
	} else {
		if strings.HasPrefix(rest, ".") {
			j := 1
			for j < len(rest) && isDigit(rest[j]) {
				j++
			}
			frac = rest[1:j]
			rest = rest[j:]
		}
		if intPart == "" && frac == "" {
			if len(rest) > 0 && isCodeStart(rest) {
				return 0, syntaxErr(in, "a multiplier letter needs digits after it")
			}
			return 0, syntaxErr(in, "no digits")
		}
		if len(rest) > 0 && (rest[0] == 'e' || rest[0] == 'E') {
			j := 1
			if j < len(rest) && (rest[j] == '+' || rest[j] == '-') {
				j++
			}
			k := j
			for k < len(rest) && isDigit(rest[k]) {
				k++
			}
			if k == j {
				return 0, syntaxErr(in, "exponent without digits")
			}
			if k-j > 6 {
				return 0, fmt.Errorf("series: parse value %q: exponent too large: %w", in, ErrRange)
			}
			e, _ := strconv.Atoi(rest[1:k])
			exp = e
			hasExp = true
			rest = rest[k:]
		}
		rest = strings.TrimLeft(rest, " ")
		if rest == "R" || rest == "r" {
			rest = ""
		} else if p, n := prefix(rest); n > 0 && !isUnit(rest) {
			if hasExp {
				return 0, syntaxErr(in, "both an exponent and a prefix")
			}
			exp += p
			rest = rest[n:]
			afterPrefix = true
		}
	}
	if rest != "" && !isUnit(rest) && !(afterPrefix && rest == "f") {
		return 0, syntaxErr(in, fmt.Sprintf("unexpected %q", rest))
	}
	if intPart == "" {
		intPart = "0"
	}
	if frac == "" {
		frac = "0"
	}
	var buf [64]byte
	num := append(buf[:0], intPart...)
	num = append(num, '.')
	num = append(num, frac...)
	num = append(num, 'e')
	num = strconv.AppendInt(num, int64(exp), 10)
	v, err := strconv.ParseFloat(string(num), 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, fmt.Errorf("series: parse value %q: beyond float64: %w", in, ErrRange)
	}
	if v == 0 && strings.Trim(intPart+frac, "0") != "" {
		return 0, fmt.Errorf("series: parse value %q: too small for float64: %w", in, ErrRange)
	}
	if neg {
		v = -v
	}
	return v, nil
}

// codeLetter returns the exponent of the multiplier letter at the start of
// s in the letter-and-digit code, and its length in bytes (0 if none).
func codeLetter(s string) (exp, n int) {
	if s == "" {
		return 0, 0
	}
	if s[0] == 'R' || s[0] == 'r' {
		return 0, 1
	}
	return prefix(s)
}

func isCodeStart(s string) bool { _, n := codeLetter(s); return n > 0 }

// prefix returns the exponent of the SI prefix at the start of s and its
// length in bytes (0 if none).
func prefix(s string) (exp, n int) {
	if s == "" {
		return 0, 0
	}
	r, size := utf8.DecodeRuneInString(s)
	if e, ok := prefixExp[string(r)]; ok {
		return e, size
	}
	return 0, 0
}

func isUnit(s string) bool {
	for _, u := range units {
		if s == u {
			return true
		}
	}
	return false
}

// Format sets how values are printed. The zero value prints 3 significant
// figures with the micro sign µ.
type Format struct {
	// Digits is the number of significant figures, 1 to 17; 0 means 3.
	Digits int
	// ASCII prints "u" for micro instead of "µ".
	ASCII bool
}

func (f Format) digits() int {
	switch {
	case f.Digits <= 0:
		return 3
	case f.Digits > 17:
		return 17
	}
	return f.Digits
}

// decimal rounds |v| (positive, finite) to n significant figures and
// returns its digits (no leading zero, length n) and the decimal exponent of
// the first digit: v ≈ 0.d1d2... × 10^(exp+1).
func decimal(v float64, n int) (digits string, exp int) {
	s := strconv.FormatFloat(math.Abs(v), 'e', n-1, 64) // "1.58e+04"
	mant, e, _ := strings.Cut(s, "e")
	exp, _ = strconv.Atoi(e)
	return strings.Replace(mant, ".", "", 1), exp
}

// place splits digits into an integer and a fraction part with lead digits
// before the point (lead may exceed len(digits), padding zeros, or be <= 0,
// giving leading zeros in the fraction); trailing zeros of the fraction are
// dropped.
func place(digits string, lead int) (intPart, frac string) {
	switch {
	case lead <= 0:
		intPart, frac = "", strings.Repeat("0", -lead)+digits
	case lead >= len(digits):
		intPart = digits + strings.Repeat("0", lead-len(digits))
	default:
		intPart, frac = digits[:lead], digits[lead:]
	}
	return intPart, strings.TrimRight(frac, "0")
}

var engPrefix = map[int]string{-15: "f", -12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T"}

// Value formats v in engineering notation: a number in [1, 1000) (rounded
// to f's significant figures, trailing zeros of the fraction dropped), an SI
// prefix from f to T, and the unit after a space when unit is not empty:
// Value(15.8e3, "Ω") is "15.8 kΩ", Value(1e-7, "") is "100n". ParseValue
// reads the result back to v rounded to the printed figures, exactly.
//
// Special cases are: 0 gives "0" (with the unit), NaN gives "NaN", ±Inf
// give "+Inf" and "-Inf"; beyond the prefixes' range (|v| rounded below
// 1e-15 or from 1e15 up, where the number would leave [1, 1000)) the value
// is written in exponent notation, rounded to f's significant figures (and no
// more digits than that needs), and the
// unit after a space: Value(1e-30, "Ω") is "1e-30 Ω", Value(2.2e15, "")
// is "2.2e+15". ParseValue reads these back too.
func (f Format) Value(v float64, unit string) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	sep := ""
	if unit != "" {
		sep = " "
	}
	if v == 0 {
		return "0" + sep + unit
	}
	digits, exp := decimal(v, f.digits())
	if exp < -15 || exp >= 15 {
		return expForm(v, f.digits()) + sep + unit
	}
	g := int(math.Floor(float64(exp)/3)) * 3
	intPart, frac := place(digits, exp-g+1)
	if intPart == "" {
		intPart = "0"
	}
	num := intPart
	if frac != "" {
		num += "." + frac
	}
	if v < 0 {
		num = "-" + num
	}
	p := engPrefix[g]
	if f.ASCII && p == "µ" {
		p = "u"
	}
	return num + sep + p + unit
}

// FormatValue formats v in engineering notation with 3 significant figures:
// Format{}.Value(v, unit).
func FormatValue(v float64, unit string) string { return Format{}.Value(v, unit) }

var codePrefix = map[int]string{-15: "f", -12: "p", -9: "n", -6: "µ", -3: "m", 0: "R", 3: "K", 6: "M", 9: "G", 12: "T"}

// Code formats v in the IEC 60062 letter-and-digit code (from memory of
// IEC 60062): the multiplier letter stands in place of the decimal point,
// "4K7" (4.7e3), "2R2" (2.2), "R47" (0.47), "100n" (1e-7), "1M0" (1e6),
// "4n7" (4.7e-9). Values of 1 and above take the resistance letters R, K,
// M, G, T (capital K, as the standard writes it); values in [0.1, 1) are
// written with a leading R ("R47"); smaller values take the capacitance
// letters m, µ (or u with ASCII), n, p, f. A single digit before the letter
// with nothing after it gets a 0 ("1K0"), as the standard writes it.
// ParseValue reads the result back to v rounded to the printed figures.
//
// Special cases are: 0 gives "0R", NaN "NaN", ±Inf "+Inf"/"-Inf"; values
// beyond the letters' range (below 1e-15 or from 1e15) are written in
// exponent notation ("1e-18").
func (f Format) Code(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	if v == 0 {
		return "0R"
	}
	digits, exp := decimal(v, f.digits())
	var g int
	switch {
	case exp >= 0:
		g = exp / 3 * 3
	case exp == -1:
		g = 0 // R47
	default:
		g = int(math.Floor(float64(exp)/3)) * 3
	}
	if g < -15 || g > 12 {
		return expForm(v, f.digits())
	}
	intPart, frac := place(digits, exp-g+1)
	if frac == "" && len(intPart) == 1 {
		frac = "0"
	}
	if frac == "" && intPart == "" {
		frac = "0"
	}
	p := codePrefix[g]
	if f.ASCII && p == "µ" {
		p = "u"
	}
	sign := ""
	if v < 0 {
		sign = "-"
	}
	return sign + intPart + p + frac
}

// FormatCode formats v in the IEC 60062 letter-and-digit code with 3
// significant figures: Format{}.Code(v).
func FormatCode(v float64) string { return Format{}.Code(v) }

// expForm writes v rounded to digits significant figures in exponent
// notation, trailing zeros of the mantissa dropped ("1e+15", not
// "1000000000000000" nor "1.000e+15").
func expForm(v float64, digits int) string {
	t := strconv.FormatFloat(v, 'e', digits-1, 64)
	mant, exp, _ := strings.Cut(t, "e")
	if strings.Contains(mant, ".") {
		mant = strings.TrimRight(strings.TrimRight(mant, "0"), ".")
	}
	return mant + "e" + exp
}
