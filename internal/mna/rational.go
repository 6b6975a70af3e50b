package mna

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/internal/poly"
)

// CoefTol is the relative level below which a recovered polynomial
// coefficient is set to exactly zero: a coefficient c_j with
// |c_j|·r^j < CoefTol·max_k |c_k|·r^k, r the sampling radius. It is far
// above the rounding of the LU solves (about 1e-15 of the largest scaled
// coefficient for the small, well-scaled systems of filter stages) and far
// below any coefficient that matters: a structural zero of a highpass
// numerator comes out as exactly 0, not 1e-20.
const CoefTol = 1e-11

// ErrDegree reports coefficient slices of the wrong length, or a
// polynomial without a non-zero coefficient where one is needed.
var ErrDegree = errors.New("mna: bad polynomial degree")

// RadiusOf returns a sampling radius in rad/s for the circuit's values:
// 1/(Rg·Cg), with Rg and Cg the geometric means of its resistor and
// capacitor values, the natural frequency of a circuit whose time constants
// are all alike. It is 1 for a circuit without resistors or capacitors.
func RadiusOf(n *Netlist, values []float64) float64 {
	var lr, lc float64
	var nr, nc int
	for _, e := range n.Elements {
		switch e.Kind {
		case Resistor:
			lr += math.Log(values[e.Value])
			nr++
		case Capacitor:
			lc += math.Log(values[e.Value])
			nc++
		}
	}
	if nr == 0 || nc == 0 {
		return 1
	}
	r := math.Exp(-lr/float64(nr) - lc/float64(nc))
	if !(r > 0) || math.IsInf(r, 0) {
		return 1
	}
	return r
}

// Coefficients writes the numerator and denominator coefficients of n's
// transfer H(s) = N(s)/D(s) into num and den, ascending powers of s (s in
// rad/s), scaled so that the highest non-zero coefficient of den is 1.
// len(num) and len(den) must be equal and at least n.Degree(a)+1; more is
// allowed (the extra coefficients come out zero). radius is the sampling
// radius in rad/s (RadiusOf gives a good one). Coefficients below CoefTol of
// the largest are set to zero. It does not allocate.
//
// The error wraps ErrSingular when the circuit is singular at a sample
// point (a pole in the right half-plane or on the jω axis) and ErrDegree for
// slices of the wrong length or a zero denominator.
func (w *Interpolator) Coefficients(n *Netlist, values []float64, a Amp, radius float64, num, den []float64) error {
	m := len(den)
	if len(num) != m || m < n.Degree(a)+1 || m > MaxDim+1 {
		return ErrDegree
	}
	if err := w.scaled(n, values, a, radius, m); err != nil {
		return err
	}
	var pw powers
	pw.fill(radius, m)
	return finish(&w.rn, &w.rd, m, &pw, num, den)
}

// powers holds math.Pow(r, k) for k = −MaxDim..MaxDim at index k+MaxDim.
type powers [2*MaxDim + 1]float64

// fill sets the powers from −(m−1) to m−1.
func (p *powers) fill(r float64, m int) {
	for k := 1 - m; k < m; k++ {
		p[k+MaxDim] = math.Pow(r, float64(k))
	}
}

// finish turns the scaled coefficients rn, rd (m of each) into num and den:
// it zeroes the rounding-level coefficients, undoes the scaling s = r·z
// and makes den monic.
func finish(rn, rd *[MaxDim + 1]float64, m int, pw *powers, num, den []float64) error {
	clean := func(c []float64) {
		big := 0.0
		for _, x := range c {
			big = math.Max(big, math.Abs(x))
		}
		for j, x := range c {
			if math.Abs(x) < CoefTol*big {
				c[j] = 0
			}
		}
	}
	clean(rn[:m])
	clean(rd[:m])
	lead := -1
	for j := m - 1; j >= 0; j-- {
		if rd[j] != 0 {
			lead = j
			break
		}
	}
	if lead < 0 {
		return fmt.Errorf("mna: denominator is identically zero: %w", ErrDegree)
	}
	// Divide by rd[lead]·r^lead and scale coefficient j by r^(lead−j)
	// without forming large powers: c_j/r^j / (d_lead/r^lead).
	for j := range m {
		sc := pw[lead-j+MaxDim] / rd[lead]
		num[j] = rn[j] * sc
		den[j] = rd[j] * sc
	}
	den[lead] = 1 // exactly, not rd·(1/rd)
	return nil
}

// scaled leaves in w.rn and w.rd the coefficients of the Cramer numerator
// and of det(M) in the scaled variable z = s/radius (c_j·radius^j), from m
// samples on the right half of the circle |s| = radius.
func (w *Interpolator) scaled(n *Netlist, values []float64, a Amp, radius float64, m int) error {
	if !(radius > 0) || math.IsInf(radius, 0) {
		return ErrValue
	}
	// Sample points z_k = exp(iθ_k), θ_k from −π/2 to π/2; evaluate the
	// upper half (θ ≥ 0), the lower half is the conjugate.
	pn, pd, zs := &w.pn, &w.pd, &w.zs
	if w.zsM != m {
		for k := range m {
			theta := 0.0
			if m > 1 {
				theta = math.Pi * (float64(k)/float64(m-1) - 0.5)
			}
			zs[k] = cmplx.Rect(1, theta)
		}
		w.zsM = m
	}
	for k := range m {
		if imag(zs[k]) < 0 {
			continue
		}
		h, det, err := w.Transfer(n, values, a, complex(radius, 0)*zs[k])
		if err != nil {
			return err
		}
		pd[k], pn[k] = det, h*det
	}
	// Real interpolation system V·c = p: one real row per real sample point,
	// two (real and imaginary parts) per sample above the real axis.
	v, rn, rd := &w.v, &w.rn, &w.rd
	interpMatrix(v[:m*m], zs[:], m)
	row := 0
	for k := range m {
		if imag(zs[k]) < 0 || row >= m {
			continue
		}
		rn[row], rd[row] = real(pn[k]), real(pd[k])
		if imag(zs[k]) > 1e-300 && row+1 < m {
			rn[row+1], rd[row+1] = imag(pn[k]), imag(pd[k])
			row++
		}
		row++
	}
	if err := solveReal(v[:m*m], rn[:m], rd[:m], m); err != nil {
		return err
	}
	return nil
}

// interpMatrix fills the m×m real interpolation matrix v (row-major) of
// the sample points zs: for each point with Im z ≥ 0, in order, the row of
// the real parts of 1, z, z², …, followed, for a point above the real axis,
// by the row of their imaginary parts, until m rows are filled.
func interpMatrix(v []float64, zs []complex128, m int) {
	row := 0
	for k := range m {
		if imag(zs[k]) < 0 || row >= m {
			continue
		}
		z := zs[k]
		zp := complex(1, 0)
		two := imag(z) > 1e-300 && row+1 < m
		for j := range m {
			v[row*m+j] = real(zp)
			if two {
				v[(row+1)*m+j] = imag(zp)
			}
			zp *= z
		}
		row++
		if two {
			row++
		}
	}
}

// backSubstitute solves U·x = b1 and U·x = b2 in place for the upper
// triangle U of the m×m row-major v (the last step of solveReal).
func backSubstitute(v, b1, b2 []float64, m int) {
	for r := m - 1; r >= 0; r-- {
		x1, x2 := b1[r], b2[r]
		for j := r + 1; j < m; j++ {
			x1 -= v[r*m+j] * b1[j]
			x2 -= v[r*m+j] * b2[j]
		}
		b1[r] = x1 / v[r*m+r]
		b2[r] = x2 / v[r*m+r]
	}
}

// solveReal solves V·x = b1 and V·x = b2 in place (b1, b2 overwritten by
// the solutions) by Gaussian elimination with partial pivoting.
func solveReal(v, b1, b2 []float64, m int) error {
	for c := range m {
		p, best := c, 0.0
		for r := c; r < m; r++ {
			if a := math.Abs(v[r*m+c]); a > best {
				p, best = r, a
			}
		}
		if best == 0 {
			return ErrSingular
		}
		if p != c {
			for j := range m {
				v[p*m+j], v[c*m+j] = v[c*m+j], v[p*m+j]
			}
			b1[p], b1[c] = b1[c], b1[p]
			b2[p], b2[c] = b2[c], b2[p]
		}
		inv := 1 / v[c*m+c]
		for r := c + 1; r < m; r++ {
			f := v[r*m+c] * inv
			for j := c + 1; j < m; j++ {
				v[r*m+j] -= f * v[c*m+j]
			}
			b1[r] -= f * b1[c]
			b2[r] -= f * b2[c]
		}
	}
	backSubstitute(v, b1, b2, m)
	return nil
}

// Rational is a ratio of real polynomials, coefficients in ascending powers
// of s (s in rad/s): H(s) = Σ Num[j]·s^j / Σ Den[j]·s^j. Trailing zero
// coefficients are trimmed, so len−1 is the degree; Den's last coefficient
// is 1.
type Rational struct {
	Num, Den []float64
}

// RationalOf returns the transfer of n with values and op-amp model a as a
// Rational. Where Coefficients samples one circle, RationalOf samples 13,
// of radii r·10^k for k = −6..6 (r = radius, or RadiusOf when radius is 0),
// and takes each coefficient from the circle on which its term c_j·s^j is
// largest relative to the others, so that coefficients spread over many
// decades (the op-amp poles of a non-ideal circuit lie far above the stage
// poles, the DC-gain pole far below) are all recovered to near rounding
// level, and the rational function is accurate far from r too. A
// coefficient that stands below CoefTol of the largest term on every circle
// is set to zero (structural zeros come out exact).
func RationalOf(n *Netlist, values []float64, a Amp, radius float64) (Rational, error) {
	if err := n.Check(len(values)); err != nil {
		return Rational{}, err
	}
	if err := CheckValues(values); err != nil {
		return Rational{}, err
	}
	if err := a.Check(); err != nil {
		return Rational{}, err
	}
	if radius == 0 {
		radius = RadiusOf(n, values)
	}
	if !(radius > 0) || math.IsInf(radius, 0) {
		return Rational{}, fmt.Errorf("mna: radius %g: %w", radius, ErrValue)
	}
	m := n.Degree(a) + 1
	num, den := make([]float64, m), make([]float64, m)
	qn, qd := make([]float64, m), make([]float64, m)
	var w Interpolator
	ok := false
	for k := -6; k <= 6; k++ {
		r := radius * math.Pow(10, float64(k))
		if err := w.scaled(n, values, a, r, m); err != nil {
			if k == 0 {
				return Rational{}, err
			}
			continue // a circle through a singular point: the others serve
		}
		ok = true
		maxAbs := func(sc []float64) float64 {
			big := 0.0
			for _, x := range sc {
				big = math.Max(big, math.Abs(x))
			}
			return big
		}
		bd := maxAbs(w.rd[:m])
		bn := math.Max(maxAbs(w.rn[:m]), bd)
		pick := func(sc []float64, big float64, c, q []float64) {
			if big == 0 {
				return
			}
			for j, x := range sc {
				if qual := math.Abs(x) / big; qual > q[j] {
					q[j] = qual
					c[j] = x / math.Pow(r, float64(j))
				}
			}
		}
		pick(w.rn[:m], bn, num, qn)
		pick(w.rd[:m], bd, den, qd)
	}
	if !ok {
		return Rational{}, ErrSingular
	}
	for j := range m {
		if qn[j] < CoefTol {
			num[j] = 0
		}
		if qd[j] < CoefTol {
			den[j] = 0
		}
	}
	num, den = trim(num), trim(den)
	lead := den[len(den)-1]
	if lead == 0 {
		return Rational{}, fmt.Errorf("mna: denominator is identically zero: %w", ErrDegree)
	}
	for j := range num {
		num[j] /= lead
	}
	for j := range den {
		den[j] /= lead
	}
	den[len(den)-1] = 1
	return Rational{Num: num, Den: den}, nil
}

func trim(c []float64) []float64 {
	for len(c) > 1 && c[len(c)-1] == 0 {
		c = c[:len(c)-1]
	}
	return c
}

// At evaluates r at s by Horner's rule.
func (r Rational) At(s complex128) complex128 {
	return horner(r.Num, s) / horner(r.Den, s)
}

func horner(c []float64, s complex128) complex128 {
	var v complex128
	for j := len(c) - 1; j >= 0; j-- {
		v = v*s + complex(c[j], 0)
	}
	return v
}

// ZerosPoles returns the roots of Num (zeros), of Den (poles), and the
// gain k = Num's leading coefficient / Den's, so that
// H(s) = k·Π(s − zeros)/Π(s − poles). A zero numerator gives no zeros and
// k = 0.
func (r Rational) ZerosPoles() (zeros, poles []complex128, k float64, err error) {
	poles, err = Roots(r.Den)
	if err != nil {
		return nil, nil, 0, err
	}
	num := trim(append([]float64(nil), r.Num...))
	if len(num) == 1 && num[0] == 0 {
		return nil, poles, 0, nil
	}
	zeros, err = Roots(num)
	if err != nil {
		return nil, nil, 0, err
	}
	return zeros, poles, num[len(num)-1] / r.Den[len(r.Den)-1], nil
}

// Roots returns the roots of the real polynomial Σ c[j]·s^j (ascending
// coefficients; the last must be non-zero). Degrees 1 and 2 use closed forms
// (the quadratic without cancellation); higher degrees internal/poly's
// Aberth–Ehrlich root finder. Complex roots come in conjugate pairs, the
// one with positive imaginary part first. Accuracy: near machine precision
// for well-separated roots.
func Roots(c []float64) ([]complex128, error) {
	c = trim(c)
	n := len(c) - 1
	if n < 0 || c[n] == 0 {
		return nil, fmt.Errorf("mna: polynomial without a non-zero coefficient: %w", ErrDegree)
	}
	for _, x := range c {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, fmt.Errorf("mna: polynomial coefficient %g: %w", x, ErrValue)
		}
	}
	switch n {
	case 0:
		return nil, nil
	case 1:
		return []complex128{complex(-c[0]/c[1], 0)}, nil
	case 2:
		b, q := c[1]/c[2], c[0]/c[2]
		disc := b*b/4 - q
		if disc < 0 {
			im := math.Sqrt(-disc)
			return []complex128{complex(-b/2, im), complex(-b/2, -im)}, nil
		}
		r1 := -b/2 - math.Copysign(math.Sqrt(disc), b)
		if r1 == 0 {
			return []complex128{0, 0}, nil
		}
		return []complex128{complex(r1, 0), complex(q/r1, 0)}, nil
	}
	roots, err := poly.Roots(c)
	if err != nil {
		return nil, fmt.Errorf("mna: roots of a degree-%d polynomial: %v: %w", n, err, ErrDegree)
	}
	return roots, nil
}
