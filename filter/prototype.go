package filter

import (
	"fmt"
	"math"
)

// Pole and zero ordering of every prototype in this package: complex
// conjugate pairs first, each pair with its positive-imaginary member
// first and its conjugate second, pairs in descending order of pole Q
// (the pair nearest the jω axis first); a real pole, for odd orders, last.
// Zeros of the elliptic and inverse Chebyshev families are on the jω axis,
// in the same pair order, zero pair i belonging to pole pair i.

// checkOrder reports an order outside 1..maxOrder for the named family.
func checkOrder(family string, n, maxOrder int) error {
	if n < 1 {
		return fmt.Errorf("filter: %s order %d not positive: %w", family, n, ErrOrder)
	}
	if n > maxOrder {
		return fmt.Errorf("filter: %s order %d beyond the supported range 1..%d: %w", family, n, maxOrder, ErrOrder)
	}
	return nil
}

// checkDB reports a decibel parameter that is not positive and finite.
func checkDB(family, field string, v float64) error {
	if !(v > 0) || math.IsInf(v, 1) {
		return fmt.Errorf("filter: %s %s %g not positive and finite: %w", family, field, v, ErrParam)
	}
	return nil
}

// powerRatioM1 returns 10^(db/10) − 1 without cancellation for small db:
// ε² of a ripple or attenuation of db decibels.
func powerRatioM1(db float64) float64 {
	return math.Expm1(db * (math.Ln10 / 10))
}

// coshSinh returns math.Cosh(x) and math.Sinh(x) to the bit, sharing the
// exponential the two compute alike for x > 0.5 (the standard library's
// sinh.go on every architecture but s390x: above 21 both are e^x/2,
// between 0.5 and 21 they are (e^x ± 1/e^x)/2; at or below 0.5 Sinh is a
// rational approximation, called as it is).
func coshSinh(x float64) (ch, sh float64) {
	if !(x > 0.5) || math.IsInf(x, 1) {
		return math.Cosh(x), math.Sinh(x)
	}
	ex := math.Exp(x)
	if x > 21 {
		return ex * 0.5, ex * 0.5
	}
	return (ex + 1/ex) * 0.5, (ex - 1/ex) * 0.5
}

// divByImag returns p/z for z on the imaginary axis, z = j·d, as Go's
// complex division computes it (Smith's method with ratio ±0 and
// denominator d): (Im p)/d − j·(Re p)/d, exactly those bits when both parts
// of p are finite and non-zero (no signed zero or infinity to settle), and
// otherwise p/z itself.
func divByImag(p complex128, d float64) complex128 {
	a, b := real(p), imag(p)
	if a != 0 && b != 0 && math.Abs(a) <= math.MaxFloat64 && math.Abs(b) <= math.MaxFloat64 &&
		d != 0 && math.Abs(d) <= math.MaxFloat64 {
		return complex(b/d, -a/d)
	}
	return p / complex(0, d)
}

// dcGain returns h0·Π(−p)/Π(−z), the gain that makes H(0) = h0 for poles
// and zeros in conjugate pairs (len(zeros) ≤ len(poles)), accumulated a
// pole against a zero at a time so that no partial product overflows
// where the result does not. ok is false when the result is not a finite,
// non-zero float64.
func dcGain(h0 float64, zeros, poles []complex128) (g float64, ok bool) {
	acc := complex(h0, 0)
	for i, p := range poles {
		if i < len(zeros) {
			if z := zeros[i]; real(z) == 0 {
				acc *= divByImag(p, imag(z))
			} else {
				acc *= p / z
			}
		} else {
			acc *= -p
		}
	}
	g = real(acc)
	return g, g != 0 && !math.IsInf(g, 0) && !math.IsNaN(g)
}
