package fastmath

import "math"

// Log10 returns the decimal logarithm of x. For positive normal x the
// result is within 1 ulp of the exact value (the tests measure at most
// 0.70 ulp against math/big); subnormal x is scaled into the normal range
// first and has the same accuracy (math.Log10 on amd64 does not: it gives
// −307.95 for 5e-324, whose logarithm is −323.31).
//
// Special cases are those of math.Log10, which computes them:
//
//	Log10(+Inf) = +Inf
//	Log10(0) = -Inf
//	Log10(x < 0) = NaN
//	Log10(NaN) = NaN
//
// Method: x = 2^k·z with z in [0.75, 1.5); c = j/128 is a grid point
// within 1/256 of z (j = 128, c = 1, for |z − 1| < 3/256, so that no
// result near 0 is a difference of two larger terms); z − c is exact
// (Sterbenz's lemma), r = (z − c)·(1/c) is within 2⁻⁵² relative of
// (z − c)/c, and
//
//	log10 x = k·log10 2 + log10 c + log1p(r)/ln 10,
//
// with log10 c and log10 2 as two-double sums from math/big
// (tables.go) and log1p(r) by its Taylor polynomial of degree 9
// (|r| ≤ 3/256: truncation below 2⁻⁵⁷ relative). The two leading terms
// are summed exactly (Fast2Sum), so the result has one final rounding
// plus the rounding of the smaller part, at most a third of the result.
func Log10(x float64) float64 {
	ix := math.Float64bits(x)
	// Positive, normal and finite: bits in [2⁻¹⁰²² bits, +Inf bits).
	if ix-0x0010000000000000 >= 0x7ff0000000000000-0x0010000000000000 {
		return log10Edge(x)
	}
	return log10Normal(ix, 0)
}

// log10Edge is Log10 outside the positive normal numbers.
func log10Edge(x float64) float64 {
	if x > 0 && x < 0x1p-1022 {
		// Subnormal: x·2⁵⁴ is normal and exact.
		return log10Normal(math.Float64bits(x*0x1p54), -54)
	}
	return math.Log10(x)
}

// log10Normal is log10 of the positive normal float64 whose bits are ix,
// plus k0·log10 2.
func log10Normal(ix uint64, k0 int64) float64 {
	// tmp's exponent field is that of x/0.75; its sign-extended top bits
	// are k, and subtracting k from x's exponent leaves z in [0.75, 1.5).
	tmp := ix - 0x3fe8000000000000
	k := int64(tmp) >> 52
	z := math.Float64frombits(ix - uint64(k)<<52)
	k += k0
	j := int(z*128 + 0.5) // 96 ≤ j ≤ 192
	e := &logTab[j-logTabFirst]
	r := (z - e.c) * e.invc
	// log1p(r) = r − r²/2 + r³/3 − … − r⁸/8 + r⁹/9, in Estrin's scheme.
	r2 := r * r
	r4 := r2 * r2
	p23 := -0.5 + r*(1.0/3)
	p45 := -0.25 + r*0.2
	p67 := -1.0/6 + r*(1.0/7)
	p89 := -0.125 + r*(1.0/9)
	tail := r2 * (p23 + r2*p45 + r4*(p67+r2*p89))
	// Leading terms: k·log10 2 (exact: log10TwoHi has 11 trailing zero
	// bits) and log10 c, summed by Fast2Sum (|k·log10 2| ≥ |log10 c| or
	// k = 0); then the small terms, and r/ln 10 with one rounding (FMA):
	// where k = 0 and c = 1 the result is that FMA alone.
	a := float64(k) * log10TwoHi
	s := a + e.hi
	err := e.hi - (s - a)
	lo := float64(k)*log10TwoLo + e.lo + err + tail*invLn10Hi + r*invLn10Lo
	return s + math.FMA(r, invLn10Hi, lo)
}

// logEntry is one grid point c of Log10: 1/c rounded, and log10 c = hi + lo.
type logEntry struct{ c, invc, hi, lo float64 }
