package fastmath

import "math"

// Atan2 returns the arc tangent of y/x in radians, in [−π, π], on the
// quadrant of (x, y), as math.Atan2 does. For finite x and y, not both
// zero, the result is within 1.5 ulp of the exact value (two roundings,
// of δ and of the sum; the tests measure at most 0.98 ulp against
// math/big, math.Atan2 1.41 ulp on the same points), with
// math.Atan2's signs of zero and exact ±π/2, ±π where y or x is zero.
//
// Special cases (x or y infinite or NaN, or both zero) are those of
// math.Atan2, which computes them.
//
// Method: with n = min(|x|, |y|) and d = max(|x|, |y|), q = n/d in [0, 1]
// picks a grid point c = j/64 within 1/128 of q (c = 0 for q < 3/128, so
// that no result near 0 is a difference of two larger terms), and
//
//	atan(n/d) = atan c + atan δ,  δ = (n − c·d)/(d + c·n),
//
// an identity in n and d themselves, so the rounding of q only chooses c;
// n − c·d is formed with one rounding (FMA) and |δ| ≤ 3/128. atan δ is
// its Taylor polynomial of degree 9 (truncation below 2⁻⁵⁷ relative). The
// table (tables.go, from math/big) holds, for each octant, the constant
// term ±atan c plus 0, π/2 or π as a two-double sum, so the octant costs
// no extra rounding: the result is hi + (lo ± atan δ), then given the
// sign of y.
func Atan2(y, x float64) float64 {
	ax, ay := math.Abs(x), math.Abs(y)
	if s := ax + ay; !(s > 0 && s <= math.MaxFloat64) {
		return math.Atan2(y, x)
	}
	// o: bit 0 set where |y| > |x| (the angle is measured from the y
	// axis), bit 1 where x is negative (or −0).
	n, d, o := ay, ax, 0
	if ay > ax {
		n, d, o = ax, ay, 1
	}
	if math.Signbit(x) {
		o |= 2
	}
	if d < 0x1p-900 || d > 0x1p1000 {
		// Only n/d matters: scale it (exactly) to where n − c·d keeps
		// its relative accuracy and d + c·n cannot overflow.
		n, d = atanScale(n, d)
	}
	j := int(n/d*64 + 0.5) // 0 ≤ j ≤ 64
	c := atanGrid[j]
	t := math.FMA(-d, c, n) / (d + n*c)
	// atan δ = δ − δ³/3 + δ⁵/5 − δ⁷/7 + δ⁹/9.
	t2 := t * t
	t4 := t2 * t2
	p := t * t2 * ((-1.0/3 + t2*0.2) + t4*((-1.0/7)+t2*(1.0/9)))
	e := &atanTab[o&3][j]
	if o == 1 || o == 2 {
		// π/2 − atan(n/d) or π − atan(n/d).
		return math.Copysign(e.hi-(t+(p-e.lo)), y)
	}
	return math.Copysign(e.hi+(t+(p+e.lo)), y)
}

// atanScale multiplies n and d by the same power of two, bringing d into
// [2⁻³⁰⁰, 2⁴⁰⁰]. Where d is large, an n too small to stay normal gives
// n/d < 2⁻¹⁴⁰⁰, whose arc tangent rounds to 0 or the least subnormal
// anyway.
func atanScale(n, d float64) (float64, float64) {
	if d < 0x1p-900 {
		return n * 0x1p600, d * 0x1p600
	}
	return n * 0x1p-600, d * 0x1p-600
}

// atanEntry is a two-double constant hi + lo.
type atanEntry struct{ hi, lo float64 }
