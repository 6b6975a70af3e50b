package ellip

import "math"

// AGM returns the arithmetic-geometric mean of a and b (DLMF 19.8.1):
// a₀ = a, b₀ = b, aₙ₊₁ = (aₙ+bₙ)/2, bₙ₊₁ = √(aₙbₙ), which converges
// quadratically to a common limit.
//
// Special cases are: AGM(a, 0) = 0; a negative or NaN argument gives NaN;
// AGM(a, +Inf) = +Inf for a > 0.
func AGM(a, b float64) float64 {
	if a < 0 || b < 0 || math.IsNaN(a) || math.IsNaN(b) {
		return math.NaN()
	}
	if a == 0 || b == 0 {
		return 0
	}
	if math.IsInf(a, 1) || math.IsInf(b, 1) {
		return math.Inf(1)
	}
	for range 64 {
		an := (a + b) / 2
		bn := math.Sqrt(a * b)
		if an == a && bn == b || math.Abs(an-bn) <= 0x1p-53*an {
			return (an + bn) / 2
		}
		a, b = an, bn
	}
	return (a + b) / 2
}

// K returns the complete elliptic integral of the first kind K(k) of
// modulus k (not the parameter m = k²), by the AGM, DLMF 19.8.5:
// K(k) = π / (2·AGM(1, k')), k' = √(1−k²). The relative error is a few
// units in the last place for 0 ≤ k < 1; for k within 1e-8 of 1 prefer
// KComp with an accurately known complementary modulus.
//
// Special cases are: K(0) = π/2; K(±1) = +Inf; K(k) is NaN for |k| > 1
// and for NaN. K is even in k.
func K(k float64) float64 {
	k = math.Abs(k)
	if !(k <= 1) {
		return math.NaN()
	}
	return KComp(math.Sqrt((1 - k) * (1 + k)))
}

// KComp returns K(k) given the complementary modulus kc = k' = √(1−k²)
// (DLMF 19.8.5: K(k) = π / (2·AGM(1, k'))). Since K'(k) = K(k'),
// KComp(k) is the complementary integral K'(k); it is accurate for every
// kc in [0, 1], including kc near 0 where k is too close to 1 to be
// represented.
//
// Special cases are: KComp(0) = +Inf; KComp(1) = π/2; NaN for |kc| > 1
// and for NaN. KComp is even in kc.
func KComp(kc float64) float64 {
	kc = math.Abs(kc)
	if !(kc <= 1) {
		return math.NaN()
	}
	if kc == 0 {
		return math.Inf(1)
	}
	return math.Pi / (2 * AGM(1, kc))
}

// rfStopFactor is (3r)^(−1/6) of Carlson's stopping rule in RF, for the
// relative error r = 1e-16 (math.Pow's value, computed once).
var rfStopFactor = math.Pow(3*1e-16, -1.0/6)

// RF returns Carlson's symmetric elliptic integral of the first kind
// R_F(x, y, z) = ½∫₀^∞ dt / √((t+x)(t+y)(t+z)) for x, y, z ≥ 0, at most
// one of them zero, by Carlson's duplication algorithm (B. C. Carlson,
// "Numerical computation of real or complex elliptic integrals",
// Numerical Algorithms 10 (1995) 13–26; DLMF 19.36.1), to a relative error
// near 1e-16.
//
// Special cases are: NaN for a negative or NaN argument, or for two or
// more zero arguments.
func RF(x, y, z float64) float64 {
	if x < 0 || y < 0 || z < 0 || math.IsNaN(x+y+z) {
		return math.NaN()
	}
	zeros := 0
	for _, v := range [3]float64{x, y, z} {
		if v == 0 {
			zeros++
		}
	}
	if zeros > 1 {
		return math.NaN()
	}
	// Scale to avoid overflow and underflow of the products; R_F is
	// homogeneous of degree −1/2 (DLMF 19.20.1 context, 19.16.1).
	mx := max(x, y, z)
	if math.IsInf(mx, 1) {
		return 0
	}
	scale := 1.0
	if mx > 1e100 || mx < 1e-100 {
		e := math.Ilogb(mx)
		e -= e % 2
		x, y, z = math.Ldexp(x, -e), math.Ldexp(y, -e), math.Ldexp(z, -e)
		scale = math.Ldexp(1, -e/2)
	}
	// Carlson's (1995) stopping rule: with r the wanted relative error,
	// iterate until (3r)^(-1/6)·max|A₀−x₀, …| · 4⁻ⁿ < |Aₙ|.
	x0, y0 := x, y
	a0 := (x + y + z) / 3
	a := a0
	q := rfStopFactor * max(math.Abs(a0-x), math.Abs(a0-y), math.Abs(a0-z))
	pow4 := 1.0
	for range 100 {
		if q*pow4 < math.Abs(a) {
			break
		}
		sx, sy, sz := math.Sqrt(x), math.Sqrt(y), math.Sqrt(z)
		lam := sx*sy + sx*sz + sy*sz
		x, y, z = (x+lam)/4, (y+lam)/4, (z+lam)/4
		a = (a + lam) / 4
		pow4 /= 4
	}
	// DLMF 19.36.1 series in the elementary symmetric functions.
	X := (a0 - x0) * pow4 / a
	Y := (a0 - y0) * pow4 / a
	Z := -X - Y
	e2 := X*Y - Z*Z
	e3 := X * Y * Z
	s := 1 - e2/10 + e3/14 + e2*e2/24 - 3*e2*e3/44
	return scale * s / math.Sqrt(a)
}
