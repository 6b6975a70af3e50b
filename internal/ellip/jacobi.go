package ellip

import (
	"math"
	"math/cmplx"
)

// Jacobi returns the Jacobi elliptic functions sn(u, k), cn(u, k) and
// dn(u, k) for real argument u and modulus k (0 ≤ k ≤ 1; the parameter is
// m = k²), with kc = √(1−k²) its complementary modulus, passed separately
// so that dn keeps full accuracy when k is close to 1.
//
// The method is the AGM scale of Abramowitz & Stegun 16.4 (DLMF 22.20.1):
// a₀ = 1, b₀ = k', c₀ = k, run to c_N ≈ 0, φ_N = 2^N·a_N·u, then
// φₙ₋₁ = (φₙ + asin(cₙ·sin φₙ / aₙ)) / 2, sn = sin φ₀, cn = cos φ₀. dn is
// formed as √(cn² + k'²·sn²) (DLMF 22.6.1), which has no cancellation. The
// absolute error is near 1e-15·(1+|u|); near a zero of cn the relative
// error of cn is correspondingly larger.
//
// Special cases are: k = 0 gives sin, cos, 1; k = 1 gives tanh, sech,
// sech (DLMF 22.5.2 limits); NaN for NaN input or k outside [0, 1].
func Jacobi(u, k, kc float64) (sn, cn, dn float64) {
	if math.IsNaN(u) || math.IsNaN(k) || math.IsNaN(kc) || k < 0 || k > 1 || kc < 0 || kc > 1 {
		nan := math.NaN()
		return nan, nan, nan
	}
	if k == 0 {
		s, c := math.Sincos(u)
		return s, c, 1
	}
	if kc == 0 {
		t := math.Tanh(u)
		sech := 1 / math.Cosh(u)
		return t, sech, sech
	}
	var a, c [16]float64
	a[0], c[0] = 1, k
	b := kc
	n := 0
	for n < len(a)-1 && math.Abs(c[n]) > 0x1p-54*a[n] {
		an := (a[n] + b) / 2
		// cₙ₊₁ = (aₙ − bₙ)/2 = cₙ² / (4aₙ₊₁), without cancellation.
		c[n+1] = c[n] * c[n] / (4 * an)
		b = math.Sqrt(a[n] * b)
		a[n+1] = an
		n++
	}
	phi := math.Ldexp(a[n]*u, n)
	for i := n; i > 0; i-- {
		phi = (phi + math.Asin(c[i]*math.Sin(phi)/a[i])) / 2
	}
	sn, cn = math.Sincos(phi)
	dn = math.Sqrt(cn*cn + kc*kc*sn*sn)
	return sn, cn, dn
}

// CD returns cd(u·K(k), k) = cn/dn for complex u, with the argument in
// units of the quarter period K(k), modulus k and complementary modulus
// kc = √(1−k²). It runs the descending Landen sequence of k down to a
// negligible modulus, starts from w = cos(uπ/2) there, and climbs back with
// wₙ₋₁ = (1+kₙ)·wₙ / (1 + kₙ·wₙ²) (the Landen transformation of cd, DLMF
// 22.7.2–22.7.3; from memory of its use in elliptic filter design by
// S. J. Orfanidis, 2006). The error is near 1e-15·|cd| for |Im u| below
// K'/K; a real or imaginary part much smaller than |cd| has a
// correspondingly larger relative error (a part 1e-10 of the whole keeps
// about 1e-9 relative when k' is near 1e-5).
//
// SN(u) = CD(1−u) gives sn(u·K, k) (DLMF 22.4.3 quarter-period shift).
func CD(u complex128, k, kc float64) complex128 {
	var ks [16]float64
	n := landenSeq(&ks, k, kc)
	w := cmplx.Cos(u * math.Pi / 2)
	for i := n - 1; i >= 0; i-- {
		w = complex(1+ks[i], 0) * w / (1 + complex(ks[i], 0)*w*w)
	}
	return w
}

// landenSeq fills ks with k₁, k₂, … of the descending Landen sequence
// (DLMF 22.7.1: kₙ₊₁ = (kₙ/(1+k'ₙ))², k'ₙ₊₁ = 2√k'ₙ/(1+k'ₙ), both free of
// cancellation) until a modulus falls below 1e-30, and returns the count.
func landenSeq(ks *[16]float64, k, kc float64) int {
	n := 0
	for n < len(ks) && k > 1e-30 {
		r := k / (1 + kc)
		k, kc = r*r, 2*math.Sqrt(kc)/(1+kc)
		ks[n] = k
		n++
	}
	return n
}

// SN returns sn(u·K(k), k) for complex u in units of K(k), by
// sn(x) = cd(K − x) (DLMF 22.4.3) and CD.
func SN(u complex128, k, kc float64) complex128 {
	return CD(1-u, k, kc)
}

// ArcSC returns the u ≥ 0 with sc(u, k) = sn/cn = x for x ≥ 0, modulus k
// and complementary modulus kc = √(1−k²): the incomplete integral
// F(arctan x, k) (DLMF 22.15.13 context: sc⁻¹(x, k) = F(arctan x, k)),
// evaluated as x·R_F(1, 1 + kc²x², 1 + x²) (DLMF 19.25.5 with
// 1 − k²sin²φ = (1 + kc²x²)/(1 + x²), no cancellation for k near 1), and
// for x > 1 as R_F(1/x², kc² + 1/x², 1 + 1/x²) by the homogeneity of R_F
// (DLMF 19.16.1 context), so that no square overflows. It is accurate to a
// few ulps. ArcSC(x, k, kc) lies in [0, K(k)).
//
// Special cases are: ArcSC(+Inf, k, kc) = K(k); NaN for negative or NaN x.
// The elliptic filter needs sn⁻¹(j·x, k1) = j·ArcSC(x, k1', k1) (Jacobi's
// imaginary transformation, DLMF 22.6.12 … sn(ju, k) = j·sc(u, k')).
func ArcSC(x, k, kc float64) float64 {
	switch {
	case math.IsNaN(x) || x < 0:
		return math.NaN()
	case math.IsInf(x, 1):
		return KComp(kc)
	case x <= 1:
		return x * RF(1, 1+kc*kc*x*x, 1+x*x)
	}
	r := 1 / x
	r2 := r * r
	return RF(r2, kc*kc+r2, 1+r2)
}

// Landen is the descending Landen sequence of one modulus (see CD), for
// evaluating cd at many arguments of that modulus with the sequence
// computed once. The zero value is the sequence of k = 0 (cd = cos).
type Landen struct {
	ks [16]float64
	n  int
}

// NewLanden returns the descending Landen sequence of modulus k with
// complementary modulus kc = √(1−k²).
func NewLanden(k, kc float64) Landen {
	var l Landen
	l.n = landenSeq(&l.ks, k, kc)
	return l
}

// Climb returns cd(u·K(k), k) given w = cos(uπ/2), climbing the sequence as
// CD does: CD(u, k, kc) is NewLanden(k, kc).Climb(cmplx.Cos(u·π/2)), to the
// last bit. The caller forms the cosine, which lets it share the parts of
// cos((x − jy)π/2) = cos(xπ/2)·cosh(yπ/2) + j·sin(xπ/2)·sinh(yπ/2) that
// many arguments have in common.
func (l *Landen) Climb(w complex128) complex128 {
	re, im := real(w), imag(w)
	for i := l.n - 1; i >= 0; i-- {
		k := l.ks[i]
		// (1+k)·w / (1 + k·w²), the operations of complex128 arithmetic
		// written out (so the bits are those of CD) and the quotient by
		// Smith's method as Go's runtime divides (R. L. Smith, "Algorithm
		// 116: Complex division", CACM 5(8), 1962; from memory).
		// (CD's k·w·w multiplies k·w by w.)
		nr, ni := (1+k)*re, (1+k)*im
		kr, ki := k*re, k*im
		dr, di := 1+(kr*re-ki*im), kr*im+ki*re
		re, im = smithDiv(nr, ni, dr, di)
	}
	return complex(re, im)
}

// ClimbAll climbs every element of ws as Climb does and every element of
// xs as ClimbReal does, in place, to the same bits. The arguments are
// climbed together, one Landen step for all of them at a time, so that
// their independent divisions overlap in the processor instead of waiting
// on each other (the climb of one argument is a chain of dependent
// divisions).
func (l *Landen) ClimbAll(ws []complex128, xs []float64) {
	for i := l.n - 1; i >= 0; i-- {
		k := l.ks[i]
		for j, w := range ws {
			re, im := real(w), imag(w)
			nr, ni := (1+k)*re, (1+k)*im
			kr, ki := k*re, k*im
			dr, di := 1+(kr*re-ki*im), kr*im+ki*re
			re, im = smithDiv(nr, ni, dr, di)
			ws[j] = complex(re, im)
		}
		for j, x := range xs {
			xs[j] = (1 + k) * x / (1 + k*x*x)
		}
	}
}

// ClimbReal is Climb for a real argument: cd(u·K(k), k) given
// w = cos(uπ/2), equal to real(Climb(complex(w, 0))) to the last bit.
func (l *Landen) ClimbReal(w float64) float64 {
	for i := l.n - 1; i >= 0; i-- {
		k := l.ks[i]
		w = (1 + k) * w / (1 + k*w*w)
	}
	return w
}

// smithDiv returns (a + jb)/(c + jd) by Smith's method, as Go's runtime
// complex division computes it for finite operands.
func smithDiv(a, b, c, d float64) (e, f float64) {
	if math.Abs(c) >= math.Abs(d) {
		r := d / c
		den := c + r*d
		return (a + b*r) / den, (b - a*r) / den
	}
	r := c / d
	den := d + r*c
	return (a*r + b) / den, (b*r - a) / den
}
