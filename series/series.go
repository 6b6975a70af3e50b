package series

import (
	"fmt"
	"math"
	"sort"
	"strconv"
)

// Series is one of the preferred-number series of IEC 60063 (E3, E6, E12,
// E24, E48, E96, E192). The zero value is no series: its String is
// "Series(none)", its Mantissas are empty and its lookups return NaN (the
// error-returning variants wrap ErrSeries). A Series is a small comparable
// value, safe for concurrent use.
type Series struct{ id uint8 }

// The series of IEC 60063.
var (
	E3   = Series{1}
	E6   = Series{2}
	E12  = Series{3}
	E24  = Series{4}
	E48  = Series{5}
	E96  = Series{6}
	E192 = Series{7}
)

// table is one series: its name, the number of significant figures of its
// values, its customary tolerance, and its values for one decade as
// integers (the mantissa times 10^(digits-1)).
type table struct {
	name   string
	digits int
	tol    float64
	values []int
	mant   []float64 // values / 10^(digits-1), in [1, 10)
	lnv    []float64 // ln(values)
}

// The tables below are IEC 60063:2015, typed from memory of the standard's
// tables (not generated from the formula 10^(i/n)); series_test.go compares
// them with the rounded formula and lists exactly the standard's known
// departures from it (E3 to E24: 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2;
// E192: 9.20).
//
// Tolerances: IEC 60063 associates E6 with ±20 %, E12 with ±10 %, E24 with
// ±5 %, E48 with ±2 %, E96 with ±1 % and E192 with ±0.5 % (and tighter),
// from memory of the standard's foreword. For E3 the standard only says
// "wider than ±20 %"; the ±40 % used here is common practice.
var tables = [...]table{
	{name: "Series(none)"},
	{name: "E3", digits: 2, tol: 0.40, values: []int{10, 22, 47}},
	{name: "E6", digits: 2, tol: 0.20, values: []int{10, 15, 22, 33, 47, 68}},
	{name: "E12", digits: 2, tol: 0.10, values: []int{
		10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82}},
	{name: "E24", digits: 2, tol: 0.05, values: []int{
		10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30,
		33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91}},
	{name: "E48", digits: 3, tol: 0.02, values: []int{
		100, 105, 110, 115, 121, 127, 133, 140, 147, 154, 162, 169,
		178, 187, 196, 205, 215, 226, 237, 249, 261, 274, 287, 301,
		316, 332, 348, 365, 383, 402, 422, 442, 464, 487, 511, 536,
		562, 590, 619, 649, 681, 715, 750, 787, 825, 866, 909, 953}},
	{name: "E96", digits: 3, tol: 0.01, values: []int{
		100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130,
		133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174,
		178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232,
		237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
		316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412,
		422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
		562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732,
		750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976}},
	{name: "E192", digits: 3, tol: 0.005, values: []int{
		100, 101, 102, 104, 105, 106, 107, 109, 110, 111, 113, 114,
		115, 117, 118, 120, 121, 123, 124, 126, 127, 129, 130, 132,
		133, 135, 137, 138, 140, 142, 143, 145, 147, 149, 150, 152,
		154, 156, 158, 160, 162, 164, 165, 167, 169, 172, 174, 176,
		178, 180, 182, 184, 187, 189, 191, 193, 196, 198, 200, 203,
		205, 208, 210, 213, 215, 218, 221, 223, 226, 229, 232, 234,
		237, 240, 243, 246, 249, 252, 255, 258, 261, 264, 267, 271,
		274, 277, 280, 284, 287, 291, 294, 298, 301, 305, 309, 312,
		316, 320, 324, 328, 332, 336, 340, 344, 348, 352, 357, 361,
		365, 370, 374, 379, 383, 388, 392, 397, 402, 407, 412, 417,
		422, 427, 432, 437, 442, 448, 453, 459, 464, 470, 475, 481,
		487, 493, 499, 505, 511, 517, 523, 530, 536, 542, 549, 556,
		562, 569, 576, 583, 590, 597, 604, 612, 619, 626, 634, 642,
		649, 657, 665, 673, 681, 690, 698, 706, 715, 723, 732, 741,
		750, 759, 768, 777, 787, 796, 806, 816, 825, 835, 845, 856,
		866, 876, 887, 898, 909, 920, 931, 942, 953, 965, 976, 988}},
}

// All lists the series of IEC 60063, coarsest first. It is for the
// caller's convenience; the package itself does not read it, so changing it
// changes nothing here.
var All = []Series{E3, E6, E12, E24, E48, E96, E192}

var allSeries = [...]Series{E3, E6, E12, E24, E48, E96, E192}

func init() {
	for i := range tables {
		t := &tables[i]
		t.mant = make([]float64, len(t.values))
		t.lnv = make([]float64, len(t.values))
		scale := pow10(t.digits - 1)
		for j, v := range t.values {
			t.mant[j] = float64(v) / scale
			t.lnv[j] = math.Log(float64(v))
		}
	}
}

func (s Series) tab() *table {
	if int(s.id) >= len(tables) {
		return &tables[0]
	}
	return &tables[s.id]
}

func (s Series) valid() bool { return s.id > 0 && int(s.id) < len(tables) }

// String returns the series' name, "E24", or "Series(none)" for the zero
// Series.
func (s Series) String() string { return s.tab().name }

// Len returns the number of values per decade (24 for E24), 0 for the zero
// Series.
func (s Series) Len() int { return len(s.tab().values) }

// Mantissas returns the standard's table for one decade, ascending in
// [1, 10): {1.0, 2.2, 4.7} for E3. Each value is the float64 nearest to the
// decimal number the standard prints. The slice is a fresh copy.
func (s Series) Mantissas() []float64 {
	return append([]float64(nil), s.tab().mant...)
}

// Tolerance returns the series' customary tolerance as a fraction: 0.40 for
// E3 (common practice: IEC 60063 says only "wider than ±20 %"), 0.20 for E6,
// 0.10 for E12, 0.05 for E24, 0.02 for E48, 0.01 for E96 and 0.005 for E192
// (the associations of IEC 60063). The zero Series gives NaN.
func (s Series) Tolerance() float64 {
	if !s.valid() {
		return math.NaN()
	}
	return s.tab().tol
}

// ParseSeries returns the series named name ("E24", case-insensitive "e24"
// too). An unknown name is an error wrapping ErrSeries.
func ParseSeries(name string) (Series, error) {
	for _, s := range allSeries {
		if len(name) == len(s.String()) && (name[0] == 'E' || name[0] == 'e') && name[1:] == s.String()[1:] {
			return s, nil
		}
	}
	return Series{}, fmt.Errorf("series: series name %q (want E3, E6, E12, E24, E48, E96 or E192): %w", name, ErrSeries)
}

// pow10 returns 10^e, exact for |e| <= 22.
func pow10(e int) float64 { return math.Pow10(e) }

// value returns the standard value at position k: k = decade·n + j is the
// j-th value of decade 10^decade. The result is the float64 nearest to the
// decimal value (one correctly rounded product or quotient of exact
// operands when |exponent| <= 22), so E24's 4.7 kΩ is exactly 4.7e3.
func (t *table) value(k int) float64 {
	n := len(t.values)
	dec, j := floorDiv(k, n)
	e := dec - (t.digits - 1)
	m := float64(t.values[j])
	switch {
	case e >= 0 && e <= 22:
		return m * pow10(e)
	case e < 0 && e >= -22:
		return m / pow10(-e)
	}
	// 10^e is not exact: let strconv round the decimal once.
	x, _ := strconv.ParseFloat(strconv.Itoa(t.values[j])+"e"+strconv.Itoa(e), 64)
	return x
}

// logValue returns ln(value(k)), finite even where value(k) is beyond
// float64.
func (t *table) logValue(k int) float64 {
	dec, j := floorDiv(k, len(t.values))
	return t.lnv[j] + float64(dec-(t.digits-1))*math.Ln10
}

func floorDiv(k, n int) (q, r int) {
	q, r = k/n, k%n
	if r < 0 {
		q, r = q-1, r+n
	}
	return q, r
}

// bracket returns the position k of the largest standard value <= v (by
// the value's own mantissa arithmetic) for v positive and finite; the next
// value up is at k+1.
func (t *table) bracket(v float64) int {
	n := len(t.values)
	dec := int(math.Floor(math.Log10(v)))
	// Correct log10's rounding at decade boundaries.
	for v < t.value(dec*n) {
		dec--
	}
	for v >= t.value((dec+1)*n) {
		dec++
	}
	base := dec * n
	// Largest j in [0, n) with value(base+j) <= v: a first guess from the
	// mantissa (v/10^dec, off by an ulp or so), corrected with the exact
	// values.
	m := v / t.decade(dec)
	j := sort.SearchFloat64s(t.mant, m)
	if j == n || t.mant[j] > m {
		j--
	}
	j = max(j, 0)
	for j > 0 && t.value(base+j) > v {
		j--
	}
	for j+1 < n && t.value(base+j+1) <= v {
		j++
	}
	return base + j
}

// decade returns 10^dec, approximately for |dec| > 22.
func (t *table) decade(dec int) float64 {
	if dec >= 0 {
		return pow10(dec)
	}
	return 1 / pow10(-dec)
}

// memberTol is the relative distance within which an input is taken to be
// the standard value itself (for Below, Above, Floor, Ceil and Range): a
// value computed as 4.7·1e-9 differs from 4.7e-9 by an ulp, and must still
// count as 4.7 nF. Adjacent E192 values differ by more than 0.9 %, so 1e-9
// cannot merge two of them.
const memberTol = 1e-9

// position returns the bracket of v, and whether v is (within memberTol) a
// standard value, in which case k is its position.
func (t *table) position(v float64) (k int, member bool) {
	k = t.bracket(v)
	if math.Abs(v/t.value(k)-1) <= memberTol {
		return k, true
	}
	if math.Abs(v/t.value(k+1)-1) <= memberTol {
		return k + 1, true
	}
	return k, false
}

func (s Series) check(v float64, what string) error {
	if !s.valid() {
		return fmt.Errorf("series: %s of the zero Series: %w", what, ErrSeries)
	}
	if !(v > 0) || math.IsInf(v, 0) {
		return fmt.Errorf("series: %s of %g (want a positive finite value): %w", what, v, ErrValue)
	}
	if v < minNormal {
		return fmt.Errorf("series: %s of %g: below the normal float64 range: %w", what, v, ErrRange)
	}
	return nil
}

// minNormal is the smallest normal float64. Below it (subnormal numbers)
// the standard values cannot be told apart, so inputs and results there are
// out of range.
const minNormal = 0x1p-1022

func finite(v float64, what string, in float64) (float64, error) {
	if v < minNormal || math.IsInf(v, 0) || math.IsNaN(v) {
		return math.NaN(), fmt.Errorf("series: %s of %g is beyond float64: %w", what, in, ErrRange)
	}
	return v, nil
}

// Nearest returns the standard value nearest to v by ratio (geometrically:
// the member x minimizing |ln(x/v)|), so the result is within the series'
// half-step of v (except at the ends of the float64 range, below). A tie
// (v exactly at the geometric mean of two neighbours) goes to the larger
// value.
//
// Special cases are: Nearest of zero, a negative value, NaN or ±Inf, of a
// subnormal value (below 2.2e-308), or Nearest of the zero Series, returns
// NaN (NearestValue says why). At the ends of the float64 range, where the
// nearest standard value is beyond it (above math.MaxFloat64, or below the
// smallest normal float64) but v is not, the result is the neighbour on
// the other side, the nearest standard value that float64 holds:
// E24.Nearest(math.MaxFloat64) is 1.6e308 (1.8e308 overflows).
func (s Series) Nearest(v float64) float64 {
	x, _ := s.NearestValue(v)
	return x
}

// NearestValue is Nearest with an error for bad input: ErrSeries for the
// zero Series, ErrValue for v not positive and finite, ErrRange for a
// subnormal v or where no standard value next to v is inside the normal
// float64 range.
func (s Series) NearestValue(v float64) (float64, error) {
	if err := s.check(v, "nearest value"); err != nil {
		return math.NaN(), err
	}
	t := s.tab()
	k := t.bracket(v)
	// Compare v/lo with hi/v in logarithms, finite even where hi is
	// beyond float64.
	lv := math.Log(v)
	near, other := t.value(k+1), t.value(k)
	if lv-t.logValue(k) < t.logValue(k+1)-lv {
		near, other = other, near
	}
	if !inNormalRange(near) && inNormalRange(other) {
		// At an end of the float64 range: the nearest value it holds.
		near = other
	}
	return finite(near, "nearest value", v)
}

// inNormalRange reports whether v is a positive normal finite float64.
func inNormalRange(v float64) bool { return v >= minNormal && !math.IsInf(v, 0) }

// Below returns the largest standard value strictly below v; a v that is
// itself a standard value (within a relative 1e-9) gives the next value down.
// Above returns the smallest standard value strictly above v. Floor and Ceil
// are the non-strict versions: a standard value gives itself.
//
// Special cases are as for Nearest: bad input or the zero Series give NaN
// (Neighbours says why).
func (s Series) Below(v float64) float64 { n, _ := s.Neighbours(v); return n.Below }

// Above returns the smallest standard value strictly above v; see Below.
func (s Series) Above(v float64) float64 { n, _ := s.Neighbours(v); return n.Above }

// Floor returns the largest standard value at or below v; see Below.
func (s Series) Floor(v float64) float64 { n, _ := s.Neighbours(v); return n.Floor }

// Ceil returns the smallest standard value at or above v; see Below.
func (s Series) Ceil(v float64) float64 { n, _ := s.Neighbours(v); return n.Ceil }

// Neighbourhood holds the standard values around an input v: Below < v <
// Above strictly, Floor <= v <= Ceil (equal to v when v is a standard
// value), and Nearest by ratio. Member says whether v is a standard value
// (within a relative 1e-9).
type Neighbourhood struct {
	Below, Floor, Nearest, Ceil, Above float64
	Member                             bool
}

// Neighbours returns the standard values around v. Bad input gives all-NaN
// fields and an error wrapping ErrSeries (the zero Series), ErrValue (v not
// positive and finite) or ErrRange (a neighbour beyond float64).
func (s Series) Neighbours(v float64) (Neighbourhood, error) {
	nan := math.NaN()
	bad := Neighbourhood{nan, nan, nan, nan, nan, false}
	if err := s.check(v, "neighbours"); err != nil {
		return bad, err
	}
	t := s.tab()
	k, member := t.position(v)
	var n Neighbourhood
	n.Member = member
	if member {
		n.Floor, n.Ceil = t.value(k), t.value(k)
		n.Below, n.Above = t.value(k-1), t.value(k+1)
	} else {
		n.Floor, n.Ceil = t.value(k), t.value(k+1)
		n.Below, n.Above = n.Floor, n.Ceil
	}
	var err error
	n.Nearest, err = s.NearestValue(v)
	for _, x := range []float64{n.Below, n.Floor, n.Ceil, n.Above} {
		if x < minNormal || math.IsInf(x, 0) {
			err = fmt.Errorf("series: neighbours of %g are beyond float64: %w", v, ErrRange)
		}
	}
	if err != nil {
		return bad, err
	}
	return n, nil
}

// step returns the standard value k positions from Nearest(v) (k may be
// negative); NaN where that is beyond float64.
func (s Series) step(v float64, k int) float64 {
	x := s.Nearest(v)
	if math.IsNaN(x) {
		return x
	}
	t := s.tab()
	p, _ := t.position(x)
	y := t.value(p + k)
	if y < minNormal || math.IsInf(y, 0) {
		return math.NaN()
	}
	return y
}

// maxRange bounds the number of values Range returns.
const maxRange = 1 << 16

// Range returns the standard values x with lo <= x <= hi, ascending (ends
// that are standard values within a relative 1e-9 are included). It returns
// nil for bad input; Values says why.
func (s Series) Range(lo, hi float64) []float64 {
	r, _ := s.Values(lo, hi)
	return r
}

// Values is Range with an error: ErrSeries for the zero Series, ErrValue for
// an end not positive and finite, ErrRange for lo > hi or a range holding
// more than 2^16 values. An empty range (lo <= hi with no standard value in
// it) gives an empty, non-nil slice and no error.
func (s Series) Values(lo, hi float64) ([]float64, error) {
	if err := s.check(lo, "range start"); err != nil {
		return nil, err
	}
	if err := s.check(hi, "range end"); err != nil {
		return nil, err
	}
	if lo > hi {
		return nil, fmt.Errorf("series: range [%g, %g] has its ends in the wrong order: %w", lo, hi, ErrRange)
	}
	t := s.tab()
	a, am := t.position(lo)
	if !am {
		a++
	}
	b, _ := t.position(hi)
	if b-a+1 > maxRange {
		return nil, fmt.Errorf("series: range [%g, %g] holds %d values of %v (at most %d): %w",
			lo, hi, b-a+1, s, maxRange, ErrRange)
	}
	out := make([]float64, 0, max(b-a+1, 0))
	for k := a; k <= b; k++ {
		out = append(out, t.value(k))
	}
	return out, nil
}
