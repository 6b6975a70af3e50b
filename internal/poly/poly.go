package poly

// Eval returns c[0] + c[1]·x + … + c[n]·xⁿ by Horner's rule. Eval of an
// empty slice is 0. It does not allocate.
func Eval(c []float64, x float64) float64 {
	var v float64
	for i := len(c) - 1; i >= 0; i-- {
		v = v*x + c[i]
	}
	return v
}

// EvalComplex returns the value at z of the polynomial with complex
// coefficients c, by Horner's rule. It does not allocate.
func EvalComplex(c []complex128, z complex128) complex128 {
	var v complex128
	for i := len(c) - 1; i >= 0; i-- {
		v = v*z + c[i]
	}
	return v
}

// EvalRealAt returns the value at complex z of the polynomial with real
// coefficients c, and its derivative there, by Horner's rule. It does not
// allocate.
func EvalRealAt(c []float64, z complex128) (v, dv complex128) {
	for i := len(c) - 1; i >= 0; i-- {
		dv = dv*z + v
		v = v*z + complex(c[i], 0)
	}
	return v, dv
}

// Mul returns the product of the polynomials a and b (a new slice of
// length len(a)+len(b)−1, or nil if either is empty).
func Mul(a, b []float64) []float64 {
	if len(a) == 0 || len(b) == 0 {
		return nil
	}
	p := make([]float64, len(a)+len(b)-1)
	for i, x := range a {
		for j, y := range b {
			p[i+j] += x * y
		}
	}
	return p
}

// MulComplex returns the product of the complex polynomials a and b.
func MulComplex(a, b []complex128) []complex128 {
	if len(a) == 0 || len(b) == 0 {
		return nil
	}
	p := make([]complex128, len(a)+len(b)-1)
	for i, x := range a {
		for j, y := range b {
			p[i+j] += x * y
		}
	}
	return p
}

// Derivative returns the coefficients of the derivative of c (nil for a
// constant or empty polynomial).
func Derivative(c []float64) []float64 {
	if len(c) <= 1 {
		return nil
	}
	d := make([]float64, len(c)-1)
	for i := 1; i < len(c); i++ {
		d[i-1] = float64(i) * c[i]
	}
	return d
}

// FromRoots returns the monic polynomial Π(x − r) with complex
// coefficients.
func FromRoots(roots []complex128) []complex128 {
	p := []complex128{1}
	for _, r := range roots {
		p = MulComplex(p, []complex128{-r, 1})
	}
	return p
}

// FromRootsReal returns the real coefficients of the monic polynomial
// Π(x − r) for roots closed under conjugation (complex roots in conjugate
// pairs); the imaginary parts of the product, zero in exact arithmetic,
// are dropped. Each conjugate pair is multiplied in as the real quadratic
// x² − 2·Re r·x + |r|².
func FromRootsReal(roots []complex128) []float64 {
	p := []float64{1}
	used := make([]bool, len(roots))
	for i, r := range roots {
		if used[i] {
			continue
		}
		used[i] = true
		if imag(r) == 0 {
			p = Mul(p, []float64{-real(r), 1})
			continue
		}
		// Find its conjugate partner (the nearest unused root to conj r).
		best := -1
		for j := i + 1; j < len(roots); j++ {
			if used[j] {
				continue
			}
			d := roots[j] - complex(real(r), -imag(r))
			if best < 0 || abs2(d) < abs2(roots[best]-complex(real(r), -imag(r))) {
				best = j
			}
		}
		if best >= 0 {
			used[best] = true
		}
		p = Mul(p, []float64{real(r)*real(r) + imag(r)*imag(r), -2 * real(r), 1})
	}
	return p
}

func abs2(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
