package ellip

import "math"

// PeriodRatio returns K'(k)/K(k) = AGM(1, k')/AGM(1, k) (DLMF 19.8.5 for
// both integrals), for modulus k and complementary modulus kc = √(1−k²),
// both in (0, 1]. The nome is q = exp(−π·PeriodRatio) (DLMF 22.2.1).
//
// Special cases are: +Inf for k = 0; 0 for kc = 0; NaN for arguments
// outside [0, 1].
func PeriodRatio(k, kc float64) float64 {
	if !(k >= 0 && k <= 1 && kc >= 0 && kc <= 1) {
		return math.NaN()
	}
	if k == 0 {
		return math.Inf(1)
	}
	return AGM(1, kc) / AGM(1, k)
}

// Nome returns the nome q(k) = exp(−π·K'(k)/K(k)) (DLMF 22.2.1) of modulus
// k with complementary modulus kc. For small k, q ≈ k²/16.
func Nome(k, kc float64) float64 {
	return math.Exp(-math.Pi * PeriodRatio(k, kc))
}

// theta returns the three null theta values
// θ₂(0,q), θ₃(0,q), θ₄(0,q) (DLMF 20.2.2–20.2.4 at z = 0) for 0 ≤ q ≤ e^−π,
// where the series converge after a handful of terms.
func theta(q float64) (t2, t3, t4 float64) {
	// θ₂ = 2q^¼ Σ q^{m(m+1)}, θ₃ = 1 + 2Σ q^{m²}, θ₄ = 1 + 2Σ (−1)^m q^{m²}.
	// The powers follow by products, q^{(m+1)²} = q^{m²}·q^{2m+1} and
	// q^{(m+1)(m+2)} = q^{m(m+1)}·q^{2m+2}, each a rounding from the
	// exact power per term; with q ≤ e^−π the fifth term is below 1e-28
	// of the first, so the loop ends after at most five.
	q2 := q * q
	a, b := q, q2      // q^{m²} and q^{m(m+1)} at m = 1
	ea, eb := q*q2, q2 // q^{2m+1}, and q^{2m} (raised to q^{2m+2} before use)
	s2, s3, s4 := 1.0, 0.0, 0.0
	sign := -1.0
	for range 11 {
		s2 += b
		s3 += a
		s4 += sign * a
		if a < 1e-20 {
			break
		}
		sign = -sign
		a *= ea
		ea *= q2
		eb *= q2
		b *= eb
	}
	return 2 * math.Sqrt(math.Sqrt(q)) * s2, 1 + 2*s3, 1 + 2*s4
}

// ModulusFromRatio returns the modulus k and the complementary modulus
// kc = √(1−k²) whose period ratio K'(k)/K(k) is r > 0: the inverse of
// PeriodRatio. With the nome q = exp(−πr), k = θ₂²(q)/θ₃²(q) and
// k' = θ₄²(q)/θ₃²(q) (DLMF 22.2.2). For r < 1 the nome is close to 1, so
// the complementary nome exp(−π/r) is used instead with the roles of k
// and k' exchanged (Jacobi's imaginary transformation, DLMF 22.6.12
// context, 20.7.30), keeping every series short and both moduli accurate
// to a few units in the last place.
//
// Special cases are: r = +Inf gives (0, 1); r = 0 gives (1, 0); NaN for
// negative or NaN r.
func ModulusFromRatio(r float64) (k, kc float64) {
	switch {
	case math.IsNaN(r) || r < 0:
		return math.NaN(), math.NaN()
	case math.IsInf(r, 1):
		return 0, 1
	case r == 0:
		return 1, 0
	}
	if r >= 1 {
		t2, t3, t4 := theta(math.Exp(-math.Pi * r))
		return (t2 / t3) * (t2 / t3), (t4 / t3) * (t4 / t3)
	}
	t2, t3, t4 := theta(math.Exp(-math.Pi / r))
	return (t4 / t3) * (t4 / t3), (t2 / t3) * (t2 / t3)
}

// Degree solves the elliptic degree equation n·K'(k)/K(k) = K'(k1)/K(k1)
// for the modulus k (DLMF 22.2; from memory of the elliptic-filter
// literature, e.g. Antoniou, "Digital Filters", ch. 5, and Orfanidis
// (2006), where k is the selectivity ωp/ωs and k1 the discrimination
// εp/εs). Equivalently q(k) = q(k1)^(1/n). k1 and k1c = √(1−k1²) must be in
// (0, 1]; n must be at least 1. It returns k and kc = √(1−k²).
func Degree(n int, k1, k1c float64) (k, kc float64) {
	if n < 1 {
		return math.NaN(), math.NaN()
	}
	return ModulusFromRatio(PeriodRatio(k1, k1c) / float64(n))
}
