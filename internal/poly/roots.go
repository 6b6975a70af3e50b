package poly

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
)

// Sentinel errors of the root finders.
var (
	// ErrCoeff reports coefficients that do not define a polynomial of
	// degree at least 1: empty, a zero leading coefficient, NaN or Inf.
	ErrCoeff = errors.New("poly: bad coefficients")
	// ErrConverge reports a root iteration that did not converge.
	ErrConverge = errors.New("poly: root iteration did not converge")
)

// maxIter bounds the Aberth iterations; convergence from the initial
// circle takes a few dozen for degrees up to 100.
const maxIter = 500

// Roots returns the n roots of the real polynomial c (ascending powers,
// degree n = len(c)−1 ≥ 1, c[n] ≠ 0), complex ones in conjugate pairs
// (positive-imaginary member first), real roots with a zero imaginary part.
//
// The method is the Aberth–Ehrlich simultaneous iteration (O. Aberth,
// "Iteration methods for finding all zeros of a polynomial
// simultaneously", Math. Comp. 27 (1973) 339–344; L. W. Ehrlich, "A
// modified Newton method for polynomials", Comm. ACM 10 (1967) 107–108):
// zₖ ← zₖ − wₖ/(1 − wₖ·Σⱼ≠ₖ 1/(zₖ−zⱼ)), wₖ = p(zₖ)/p'(zₖ), from points on a
// circle of radius |c[0]/c[n]|^(1/n), stopped per root when |p(zₖ)| is
// below the Horner rounding-error bound (the root is then exact for a
// polynomial within a few ulps of c), then each root polished by two
// Newton steps that are kept only where they reduce |p|. Roots at 0 (zero
// low-order coefficients) are returned exactly. The result is backward
// stable; the forward error is that bound times the condition number of
// the root (for ill-conditioned polynomials use PolishBig).
//
// Errors wrap ErrCoeff for a bad polynomial and ErrConverge if some root
// does not meet the stopping test.
func Roots(c []float64) ([]complex128, error) {
	n := len(c) - 1
	if n < 1 {
		return nil, fmt.Errorf("poly: %d coefficients, need at least 2: %w", len(c), ErrCoeff)
	}
	for i, v := range c {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("poly: coefficient %d is %g: %w", i, v, ErrCoeff)
		}
	}
	if c[n] == 0 {
		return nil, fmt.Errorf("poly: leading coefficient is zero: %w", ErrCoeff)
	}
	nz := 0
	for nz < n && c[nz] == 0 {
		nz++
	}
	// Monic, deflated of the roots at 0.
	m := make([]float64, n-nz+1)
	for i := range m {
		m[i] = c[i+nz] / c[n]
	}
	roots := make([]complex128, 0, n)
	if len(m) > 1 {
		r, err := aberth(m)
		if err != nil {
			return nil, err
		}
		roots = append(roots, r...)
	}
	for range nz {
		roots = append(roots, 0)
	}
	return pairConjugates(roots), nil
}

// aberth runs the Aberth–Ehrlich iteration on the monic real polynomial m.
func aberth(m []float64) ([]complex128, error) {
	n := len(m) - 1
	if n == 1 {
		return []complex128{complex(-m[0], 0)}, nil
	}
	if n == 2 {
		return quadratic(m[1], m[0]), nil
	}
	// Absolute coefficients for the rounding-error bound of Horner's rule
	// (Higham, "Accuracy and Stability of Numerical Algorithms", §5.1).
	abs := make([]float64, len(m))
	for i, v := range m {
		abs[i] = math.Abs(v)
	}
	r := math.Pow(math.Abs(m[0]), 1/float64(n))
	if r == 0 || math.IsInf(r, 0) {
		r = 1
	}
	z := make([]complex128, n)
	for k := range z {
		// Offset the angles so that no start is on the real axis, where a
		// real-coefficient iteration could not leave it.
		z[k] = cmplx.Rect(r, 2*math.Pi*float64(k)/float64(n)+0.4)
	}
	done := make([]bool, n)
	left := n
	bound := 4 * float64(2*n+1) * 0x1p-53
	for range maxIter {
		for k := range z {
			if done[k] {
				continue
			}
			p, dp := EvalRealAt(m, z[k])
			if cmplx.Abs(p) <= bound*Eval(abs, cmplx.Abs(z[k])) {
				done[k] = true
				left--
				continue
			}
			var s complex128
			for j := range z {
				if j != k {
					s += 1 / (z[k] - z[j])
				}
			}
			w := p / dp
			if dp == 0 {
				w = p
			}
			step := w / (1 - w*s)
			if cmplx.IsNaN(step) || cmplx.IsInf(step) {
				step = complex(r*1e-3, r*1e-3)
			}
			z[k] -= step
		}
		if left == 0 {
			break
		}
	}
	if left > 0 {
		return nil, fmt.Errorf("poly: %d of %d roots not within the rounding bound after %d iterations: %w", left, n, maxIter, ErrConverge)
	}
	for k := range z {
		z[k] = newtonPolish(m, z[k], 2)
		// A real root converges with an imaginary part of rounding size;
		// snap it to the axis when its real part alone is a root to
		// working precision.
		if x := real(z[k]); math.Abs(imag(z[k])) <= 1e-6*cmplx.Abs(z[k]) {
			if math.Abs(Eval(m, x)) <= bound*Eval(abs, math.Abs(x)) {
				z[k] = complex(x, 0)
			}
		}
	}
	return z, nil
}

// newtonPolish applies up to steps Newton steps to z, keeping each only if
// it reduces |p(z)|.
func newtonPolish(c []float64, z complex128, steps int) complex128 {
	p, dp := EvalRealAt(c, z)
	for range steps {
		if p == 0 || dp == 0 {
			break
		}
		zn := z - p/dp
		pn, dpn := EvalRealAt(c, zn)
		if cmplx.Abs(pn) >= cmplx.Abs(p) {
			break
		}
		z, p, dp = zn, pn, dpn
	}
	return z
}

// quadratic returns the roots of x² + b·x + c without cancellation.
func quadratic(b, c float64) []complex128 {
	disc := b*b/4 - c
	if disc < 0 {
		im := math.Sqrt(-disc)
		return []complex128{complex(-b/2, im), complex(-b/2, -im)}
	}
	r1 := -b/2 - math.Copysign(math.Sqrt(disc), b)
	if r1 == 0 {
		return []complex128{0, 0}
	}
	return []complex128{complex(r1, 0), complex(c/r1, 0)}
}

// pairConjugates makes the roots of a real polynomial exactly closed under
// conjugation: each root of positive imaginary part is averaged with the
// conjugate of its nearest partner of negative imaginary part, roots whose
// imaginary part is within rounding of zero (no partner) are made real. It
// orders them: conjugate pairs by ascending real part then imaginary part,
// positive member first, then real roots in ascending order.
func pairConjugates(z []complex128) []complex128 {
	var upper, lower, real_ []complex128
	for _, v := range z {
		switch {
		case imag(v) > 0:
			upper = append(upper, v)
		case imag(v) < 0:
			lower = append(lower, v)
		default:
			real_ = append(real_, v)
		}
	}
	// Unmatched members (a real root perturbed off the axis) become real.
	for len(upper) != len(lower) {
		if len(upper) > len(lower) {
			i := smallestImag(upper)
			real_ = append(real_, complex(real(upper[i]), 0))
			upper = append(upper[:i], upper[i+1:]...)
		} else {
			i := smallestImag(lower)
			real_ = append(real_, complex(real(lower[i]), 0))
			lower = append(lower[:i], lower[i+1:]...)
		}
	}
	used := make([]bool, len(lower))
	out := make([]complex128, 0, len(z))
	pairs := make([]complex128, 0, len(upper))
	for _, u := range upper {
		best := -1
		for j, l := range lower {
			if used[j] {
				continue
			}
			if best < 0 || cmplx.Abs(cmplx.Conj(l)-u) < cmplx.Abs(cmplx.Conj(lower[best])-u) {
				best = j
			}
		}
		used[best] = true
		pairs = append(pairs, (u+cmplx.Conj(lower[best]))/2)
	}
	sort.Slice(pairs, func(i, j int) bool {
		if real(pairs[i]) != real(pairs[j]) {
			return real(pairs[i]) < real(pairs[j])
		}
		return imag(pairs[i]) < imag(pairs[j])
	})
	for _, p := range pairs {
		out = append(out, p, cmplx.Conj(p))
	}
	for i := range real_ {
		real_[i] = complex(real(real_[i]), 0)
	}
	sort.Slice(real_, func(i, j int) bool { return real(real_[i]) < real(real_[j]) })
	return append(out, real_...)
}

func smallestImag(z []complex128) int {
	best := 0
	for i, v := range z {
		if math.Abs(imag(v)) < math.Abs(imag(z[best])) {
			best = i
		}
	}
	return best
}
