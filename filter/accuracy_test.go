package filter

import (
	"errors"
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// This file measures the float64 prototypes against the same formulas
// evaluated in math/big at accPrec bits, with elementary functions (π by
// the Gauss–Legendre AGM, exp by Taylor series with argument halving, log
// by Newton iteration on exp, sin and cos by Taylor series with angle
// halving; from memory of Brent & Zimmermann, "Modern Computer
// Arithmetic", ch. 4) written here so that no float64 rounding enters the
// reference. Bessel roots are checked a posteriori by the size of the
// Newton correction θₙ(p)/θₙ'(p) computed at accPrec bits from the exact
// integer coefficients, a first-order bound on the distance to the true
// root. The guaranteed ranges in the doc comments (MaxButterworthOrder,
// MaxChebyshevOrder, MaxEllipticOrder, MaxBesselOrder) come from these
// measurements.

const accPrec = 200

// accTol is the promised accuracy: 1e-9 relative on poles, zeros and gain.
const accTol = 1e-9

func bf(x float64) *big.Float { return new(big.Float).SetPrec(accPrec).SetFloat64(x) }
func bnew() *big.Float        { return new(big.Float).SetPrec(accPrec) }

func bsqrt(x *big.Float) *big.Float { return bnew().Sqrt(x) }

func bmul(a, b *big.Float) *big.Float { return bnew().Mul(a, b) }
func bquo(a, b *big.Float) *big.Float { return bnew().Quo(a, b) }
func badd(a, b *big.Float) *big.Float { return bnew().Add(a, b) }
func bsub(a, b *big.Float) *big.Float { return bnew().Sub(a, b) }

func bf64(x *big.Float) float64 { v, _ := x.Float64(); return v }

var accPi = func() *big.Float {
	// Gauss–Legendre: a₀=1, b₀=1/√2, t₀=¼, p₀=1.
	a, b, t, p := bf(1), bquo(bf(1), bsqrt(bf(2))), bf(0.25), bf(1)
	for range 10 {
		an := bquo(badd(a, b), bf(2))
		b = bsqrt(bmul(a, b))
		d := bsub(a, an)
		t = bsub(t, bmul(p, bmul(d, d)))
		p = bmul(p, bf(2))
		a = an
	}
	s := badd(a, b)
	return bquo(bmul(s, s), bmul(bf(4), t))
}()

// bexp returns e^x.
func bexp(x *big.Float) *big.Float {
	h := 0
	r := new(big.Float).SetPrec(accPrec + 64).Set(x)
	for r.MantExp(nil) > -30 && r.Sign() != 0 {
		r.SetMantExp(r, -1)
		h++
	}
	sum := new(big.Float).SetPrec(accPrec + 64).SetFloat64(1)
	term := new(big.Float).SetPrec(accPrec + 64).SetFloat64(1)
	for i := 1; i < 200; i++ {
		term.Mul(term, r)
		term.Quo(term, new(big.Float).SetInt64(int64(i)))
		sum.Add(sum, term)
		if term.Sign() == 0 || term.MantExp(nil) < sum.MantExp(nil)-int(accPrec)-70 {
			break
		}
	}
	for range h {
		sum.Mul(sum, sum)
	}
	return bnew().Set(sum)
}

// blog returns ln x for x > 0, by Newton (Halley) iteration
// y ← y + 2(x − eʸ)/(x + eʸ) from the float64 logarithm.
func blog(x *big.Float) *big.Float {
	mant := new(big.Float)
	e := x.MantExp(mant)
	m, _ := mant.Float64()
	y := bf(math.Log(m) + float64(e)*math.Ln2)
	for range 5 {
		ey := bexp(y)
		y = badd(y, bquo(bmul(bf(2), bsub(x, ey)), badd(x, ey)))
	}
	return y
}

// bsincos returns sin x and cos x for moderate |x|.
func bsincos(x *big.Float) (s, c *big.Float) {
	h := 0
	r := new(big.Float).SetPrec(accPrec + 64).Set(x)
	for r.MantExp(nil) > -20 && r.Sign() != 0 {
		r.SetMantExp(r, -1)
		h++
	}
	r2 := new(big.Float).SetPrec(accPrec+64).Mul(r, r)
	s = new(big.Float).SetPrec(accPrec + 64).Set(r)
	c = new(big.Float).SetPrec(accPrec + 64).SetFloat64(1)
	ts := new(big.Float).SetPrec(accPrec + 64).Set(r)
	tc := new(big.Float).SetPrec(accPrec + 64).SetFloat64(1)
	for i := 1; i < 100; i++ {
		ts.Mul(ts, r2)
		ts.Quo(ts, new(big.Float).SetInt64(int64(-(2*i)*(2*i+1))))
		tc.Mul(tc, r2)
		tc.Quo(tc, new(big.Float).SetInt64(int64(-(2*i-1)*(2*i))))
		s.Add(s, ts)
		c.Add(c, tc)
	}
	for range h {
		// sin 2a = 2 sin a cos a, cos 2a = cos²a − sin²a.
		ns := new(big.Float).SetPrec(accPrec+64).Mul(s, c)
		ns.SetMantExp(ns, 1)
		nc := new(big.Float).SetPrec(accPrec+64).Mul(c, c)
		nc.Sub(nc, new(big.Float).SetPrec(accPrec+64).Mul(s, s))
		s, c = ns, nc
	}
	return bnew().Set(s), bnew().Set(c)
}

func bsinpi(num, den int) *big.Float {
	s, _ := bsincos(bquo(bmul(accPi, bf(float64(num))), bf(float64(den))))
	return s
}

// bpowm1 returns 10^(db/10) − 1 in big precision.
func bpowm1(db float64) *big.Float {
	ln10 := blog(bf(10))
	return bsub(bexp(bmul(bf(db/10), ln10)), bf(1))
}

// bc is a big complex number for the references.
type bc struct{ re, im *big.Float }

func bcmul(a, b bc) bc {
	return bc{bsub(bmul(a.re, b.re), bmul(a.im, b.im)), badd(bmul(a.re, b.im), bmul(a.im, b.re))}
}
func bcquo(a, b bc) bc {
	d := badd(bmul(b.re, b.re), bmul(b.im, b.im))
	return bc{bquo(badd(bmul(a.re, b.re), bmul(a.im, b.im)), d), bquo(bsub(bmul(a.im, b.re), bmul(a.re, b.im)), d)}
}
func bcadd(a, b bc) bc      { return bc{badd(a.re, b.re), badd(a.im, b.im)} }
func bc128(a bc) complex128 { return complex(bf64(a.re), bf64(a.im)) }

// accRef is a reference prototype rounded from big precision.
type accRef struct {
	zeros, poles []complex128
	gain         float64
}

// accGain returns h0·Π(−p)/Π(−z) in big precision.
func accGain(h0 *big.Float, zeros, poles []bc) float64 {
	acc := bc{h0, bf(0)}
	for _, p := range poles {
		acc = bcmul(acc, bc{bnew().Neg(p.re), bnew().Neg(p.im)})
	}
	for _, z := range zeros {
		acc = bcquo(acc, bc{bnew().Neg(z.re), bnew().Neg(z.im)})
	}
	return bf64(acc.re)
}

func accRound(zeros, poles []bc, h0 *big.Float) accRef {
	r := accRef{gain: accGain(h0, zeros, poles)}
	for _, z := range zeros {
		r.zeros = append(r.zeros, bc128(z))
	}
	for _, p := range poles {
		r.poles = append(r.poles, bc128(p))
	}
	return r
}

// accChebyshev returns the Butterworth (eps2 = nil) or Chebyshev poles in
// big precision: −sinh μ·sin θₖ ± j·cosh μ·cos θₖ.
func accChebyshevPoles(n int, eps2 *big.Float) []bc {
	sh, ch := bf(1), bf(1)
	if eps2 != nil {
		inv := bquo(bf(1), bsqrt(eps2))
		mu := bquo(blog(badd(inv, bsqrt(badd(bmul(inv, inv), bf(1))))), bf(float64(n)))
		e, ei := bexp(mu), bexp(bnew().Neg(mu))
		sh, ch = bquo(bsub(e, ei), bf(2)), bquo(badd(e, ei), bf(2))
	}
	var poles []bc
	for k := 0; k < n/2; k++ {
		s, c := bsinpi(2*k+1, 2*n), bsinpi(n-2*k-1, 2*n)
		re := bnew().Neg(bmul(sh, s))
		im := bmul(ch, c)
		poles = append(poles, bc{re, im}, bc{re, bnew().Neg(im)})
	}
	if n%2 == 1 {
		poles = append(poles, bc{bnew().Neg(sh), bf(0)})
	}
	return poles
}

func accButterworth(n int) accRef { return accRound(nil, accChebyshevPoles(n, nil), bf(1)) }

func accChebyshev(n int, rip float64) accRef {
	e2 := bpowm1(rip)
	h0 := bf(1)
	if n%2 == 0 {
		h0 = bquo(bf(1), bsqrt(badd(bf(1), e2)))
	}
	return accRound(nil, accChebyshevPoles(n, e2), h0)
}

func accInverseChebyshev(n int, att float64) accRef {
	e2 := bquo(bf(1), bpowm1(att)) // ε² of the Chebyshev whose poles are inverted
	pc := accChebyshevPoles(n, e2)
	var poles, zeros []bc
	for _, p := range pc {
		// 1/conj(p) keeps the upper member first.
		poles = append(poles, bcquo(bc{bf(1), bf(0)}, bc{p.re, bnew().Neg(p.im)}))
	}
	for k := 0; k < n/2; k++ {
		w := bquo(bf(1), bsinpi(n-2*k-1, 2*n))
		zeros = append(zeros, bc{bf(0), w}, bc{bf(0), bnew().Neg(w)})
	}
	return accRound(zeros, poles, bf(1))
}

func bagm(a, b *big.Float) *big.Float {
	for range 40 {
		a, b = bquo(badd(a, b), bf(2)), bsqrt(bmul(a, b))
	}
	return a
}

// brf is Carlson's R_F by duplication (DLMF 19.36.1), iterated until the
// arguments agree to 2^−60 so that the fifth-order series is exact to
// far beyond float64.
func brf(x, y, z *big.Float) *big.Float {
	for range 200 {
		a := bquo(badd(badd(x, y), z), bf(3))
		dx, dy := bquo(bsub(a, x), a), bquo(bsub(a, y), a)
		if dx.Sign() == 0 && dy.Sign() == 0 || max(dx.MantExp(nil), dy.MantExp(nil)) < -45 {
			X, Y := dx, dy
			Z := bnew().Neg(badd(X, Y))
			e2 := bsub(bmul(X, Y), bmul(Z, Z))
			e3 := bmul(bmul(X, Y), Z)
			s := bsub(bf(1), bquo(e2, bf(10)))
			s = badd(s, bquo(e3, bf(14)))
			s = badd(s, bquo(bmul(e2, e2), bf(24)))
			s = bsub(s, bquo(bmul(bf(3), bmul(e2, e3)), bf(44)))
			// Next terms: e2³/… are below 2^−270.
			return bquo(s, bsqrt(a))
		}
		sx, sy, sz := bsqrt(x), bsqrt(y), bsqrt(z)
		lam := badd(badd(bmul(sx, sy), bmul(sx, sz)), bmul(sy, sz))
		x, y, z = bquo(badd(x, lam), bf(4)), bquo(badd(y, lam), bf(4)), bquo(badd(z, lam), bf(4))
	}
	panic("brf did not converge")
}

// btheta returns θ₂, θ₃, θ₄ at z = 0 for nome q (DLMF 20.2.2–20.2.4).
func btheta(q *big.Float) (t2, t3, t4 *big.Float) {
	s2, s3, s4 := bf(1), bf(0), bf(0)
	for m := 1; m < 60; m++ {
		a := bf(1)
		b := bf(1)
		for range m * m {
			a = bmul(a, q)
		}
		for range m * (m + 1) {
			b = bmul(b, q)
		}
		s2, s3 = badd(s2, b), badd(s3, a)
		if m%2 == 1 {
			s4 = bsub(s4, a)
		} else {
			s4 = badd(s4, a)
		}
		if a.Sign() == 0 || a.MantExp(nil) < -int(accPrec)-10 {
			break
		}
	}
	q4 := bsqrt(bsqrt(q))
	return bmul(bmul(bf(2), q4), s2), badd(bf(1), bmul(bf(2), s3)), badd(bf(1), bmul(bf(2), s4))
}

// bcd returns cd(uK, k) for complex u by the descending Landen sequence,
// as ellip.CD does, in big precision.
func bcd(u bc, k, kc *big.Float) bc {
	var ks []*big.Float
	for k.Sign() > 0 && k.MantExp(nil) > -int(accPrec)/2-10 {
		r := bquo(k, badd(bf(1), kc))
		k, kc = bmul(r, r), bquo(bmul(bf(2), bsqrt(kc)), badd(bf(1), kc))
		ks = append(ks, k)
	}
	// cos(α − jβ) = cos α cosh β + j sin α sinh β with α − jβ = uπ/2.
	half := bquo(accPi, bf(2))
	s, c := bsincos(bmul(u.re, half))
	beta := bnew().Neg(bmul(u.im, half))
	e, ei := bexp(beta), bexp(bnew().Neg(beta))
	w := bc{bmul(c, bquo(badd(e, ei), bf(2))), bmul(s, bquo(bsub(e, ei), bf(2)))}
	one := bc{bf(1), bf(0)}
	for i := len(ks) - 1; i >= 0; i-- {
		kn := bc{ks[i], bf(0)}
		w = bcquo(bcmul(bcadd(one, kn), w), bcadd(one, bcmul(kn, bcmul(w, w))))
	}
	return w
}

func accElliptic(n int, rip, att float64) accRef {
	ep2, es2 := bpowm1(rip), bpowm1(att)
	k1 := bsqrt(bquo(ep2, es2))
	k1c := bsqrt(bquo(bsub(es2, ep2), es2))
	r := bquo(bquo(bagm(bf(1), k1c), bagm(bf(1), k1)), bf(float64(n))) // K'/K of k
	var k, kc *big.Float
	if r.Cmp(bf(1)) >= 0 {
		t2, t3, t4 := btheta(bexp(bnew().Neg(bmul(accPi, r))))
		k, kc = bmul(bquo(t2, t3), bquo(t2, t3)), bmul(bquo(t4, t3), bquo(t4, t3))
	} else {
		t2, t3, t4 := btheta(bexp(bnew().Neg(bquo(accPi, r))))
		k, kc = bmul(bquo(t4, t3), bquo(t4, t3)), bmul(bquo(t2, t3), bquo(t2, t3))
	}
	kk1 := bquo(accPi, bmul(bf(2), bagm(bf(1), k1c)))
	v0 := bquo(brf(ep2, badd(ep2, bmul(k1, k1)), badd(ep2, bf(1))), bmul(bf(float64(n)), kk1))
	mv0 := bnew().Neg(v0)
	var poles, zeros []bc
	for i := 1; i <= n/2; i++ {
		u := bquo(bf(float64(2*i-1)), bf(float64(n)))
		w := bcd(bc{u, mv0}, k, kc)
		// p = j·w, upper member.
		re, im := bnew().Neg(bnew().Abs(w.im)), bnew().Abs(w.re)
		poles = append(poles, bc{re, im}, bc{re, bnew().Neg(im)})
		zr := bcd(bc{u, bf(0)}, k, kc)
		z := bquo(bf(1), bmul(k, zr.re))
		zeros = append(zeros, bc{bf(0), z}, bc{bf(0), bnew().Neg(z)})
	}
	if n%2 == 1 {
		w := bcd(bc{bf(1), mv0}, k, kc)
		poles = append(poles, bc{bnew().Neg(bnew().Abs(w.im)), bf(0)})
	}
	h0 := bf(1)
	if n%2 == 0 {
		h0 = bquo(bf(1), bsqrt(badd(bf(1), ep2)))
	}
	return accRound(zeros, poles, h0)
}

// accCheck compares h with ref (element by element: the reference uses the
// same ordering) and returns the largest relative error.
func accCheck(t interface {
	Helper()
	Fatalf(string, ...any)
}, name string, h Transfer, ref accRef) float64 {
	t.Helper()
	if len(h.Poles) != len(ref.poles) || len(h.Zeros) != len(ref.zeros) {
		t.Fatalf("%s: %d/%d poles, %d/%d zeros", name, len(h.Poles), len(ref.poles), len(h.Zeros), len(ref.zeros))
	}
	worst := math.Abs(h.Gain-ref.gain) / ref.gain
	for i, p := range ref.poles {
		worst = math.Max(worst, cmplx.Abs(h.Poles[i]-p)/cmplx.Abs(p))
		// The real part sets Q and the response near the pole: measure it
		// on its own scale too.
		worst = math.Max(worst, math.Abs(real(h.Poles[i])-real(p))/math.Abs(real(p)))
	}
	for i, z := range ref.zeros {
		worst = math.Max(worst, cmplx.Abs(h.Zeros[i]-z)/cmplx.Abs(z))
	}
	return worst
}

func TestAccuracyClosedForms(t *testing.T) {
	worst := map[string]float64{}
	for n := 1; n <= MaxChebyshevOrder; n++ {
		h, _ := Butterworth{}.Prototype(n)
		worst["Butterworth"] = math.Max(worst["Butterworth"], accCheck(t, "Butterworth", h, accButterworth(n)))
		for _, rip := range []float64{0.001, 0.5, 3} {
			h, _ := Chebyshev{RippleDB: rip}.Prototype(n)
			worst["Chebyshev"] = math.Max(worst["Chebyshev"], accCheck(t, "Chebyshev", h, accChebyshev(n, rip)))
		}
		for _, att := range []float64{10, 60, 150} {
			h, _ := InverseChebyshev{AttenDB: att}.Prototype(n)
			worst["InverseChebyshev"] = math.Max(worst["InverseChebyshev"], accCheck(t, "InverseChebyshev", h, accInverseChebyshev(n, att)))
		}
	}
	for name, e := range worst {
		t.Logf("%s orders 1..%d: worst relative error %.2g against %d-bit reference", name, MaxChebyshevOrder, e, accPrec)
		if e > 1e-13 {
			t.Errorf("%s: relative error %.2g above the documented 1e-13", name, e)
		}
	}
}

func TestAccuracyElliptic(t *testing.T) {
	worst, refused := 0.0, 0
	for n := 1; n <= MaxEllipticOrder; n++ {
		for _, p := range [][2]float64{{0.01, 30}, {0.1, 40}, {0.5, 60}, {1, 11}, {3, 120}, {0.001, 200}} {
			h, err := Elliptic{RippleDB: p[0], AttenDB: p[1]}.Prototype(n)
			if errors.Is(err, ErrRange) {
				refused++
				continue
			}
			if err != nil {
				t.Fatal(err)
			}
			e := accCheck(t, "Elliptic", h, accElliptic(n, p[0], p[1]))
			if e > accTol {
				t.Errorf("Elliptic %v order %d: relative error %.2g", p, n, e)
			}
			worst = math.Max(worst, e)
		}
	}
	t.Logf("Elliptic orders 1..%d: worst relative error %.2g against %d-bit reference (%d designs refused for Q > MaxEllipticQ)",
		MaxEllipticOrder, worst, accPrec, refused)
	if refused == 0 {
		t.Error("no design reached MaxEllipticQ: the parameter set no longer tests the limit")
	}
}

// TestAccuracyBessel bounds the error of the Bessel poles a posteriori:
// for each float64 pole p of the delay-normalized prototype, the Newton
// correction δ = θₙ(p)/θₙ'(p), evaluated at accPrec bits with the exact
// integer coefficients of θₙ, estimates the distance to the true root to
// first order (the roots are simple and separated far beyond |δ|). It also
// checks the gain against the exact θₙ(0), the corner normalization by the
// residual of |H(j1)|² = ½ divided by the slope of ln|H|², and the phase
// normalization's |Π p| = 1, all at accPrec bits.
func TestAccuracyBessel(t *testing.T) {
	const accTol = 1e-13 // documented on Bessel.Prototype
	worstPole, worstGain, worstCorner, worstPhase := 0.0, 0.0, 0.0, 0.0
	for n := 1; n <= MaxBesselOrder; n++ {
		coef := besselCoefficients(n)
		c := make([]*big.Float, n+1)
		for i, v := range coef {
			c[i] = bnew().SetInt(v)
		}
		h, err := Bessel{Norm: BesselDelay}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range h.Poles {
			z := bc{bf(real(p)), bf(imag(p))}
			v, dv := bc{bf(0), bf(0)}, bc{bf(0), bf(0)}
			for i := n; i >= 0; i-- {
				dv = bcadd(bcmul(dv, z), v)
				v = bcadd(bcmul(v, z), bc{c[i], bf(0)})
			}
			d := bcquo(v, dv)
			e := cmplx.Abs(bc128(d)) / cmplx.Abs(p)
			worstPole = math.Max(worstPole, e)
			if e > accTol {
				t.Errorf("Bessel order %d: pole %v off by about %.2g relative", n, p, e)
			}
		}
		if e := math.Abs(h.Gain-bf64(c[0])) / bf64(c[0]); e > accTol {
			t.Errorf("Bessel order %d: delay gain %.17g, θₙ(0) = %.17g", n, h.Gain, bf64(c[0]))
		} else {
			worstGain = math.Max(worstGain, e)
		}
		// Corner: r = ln|H(j)|² + ln 2 at accPrec bits, slope from float64.
		hc, _ := Bessel{Norm: BesselCorner}.Prototype(n)
		lnH, slope := bf(0), 0.0
		for _, p := range hc.Poles {
			re, im := bf(real(p)), bf(imag(p))
			m2 := badd(bmul(re, re), bmul(im, im))
			d := badd(bmul(re, re), bmul(bsub(bf(1), im), bsub(bf(1), im))) // |j − p|²
			lnH = badd(lnH, blog(bquo(m2, d)))
			slope += -2 * (1 - imag(p)) / (real(p)*real(p) + (1-imag(p))*(1-imag(p)))
		}
		r := bf64(badd(lnH, blog(bf(2))))
		if e := math.Abs(r / slope); e > accTol {
			t.Errorf("Bessel order %d: corner off by about %.2g relative", n, e)
		} else {
			worstCorner = math.Max(worstCorner, e)
		}
		hp, _ := Bessel{Norm: BesselPhase}.Prototype(n)
		prod := bf(1)
		for _, p := range hp.Poles {
			re, im := bf(real(p)), bf(imag(p))
			prod = bmul(prod, bsqrt(badd(bmul(re, re), bmul(im, im))))
		}
		if e := math.Abs(bf64(prod) - 1); e > accTol {
			t.Errorf("Bessel order %d: phase-normalized |Π p| = %.17g", n, bf64(prod))
		} else {
			worstPhase = math.Max(worstPhase, e)
		}
	}
	t.Logf("Bessel orders 1..%d against %d-bit evaluation: poles %.2g, delay gain %.2g, corner %.2g, |Π p|−1 %.2g",
		MaxBesselOrder, accPrec, worstPole, worstGain, worstCorner, worstPhase)
}

// TestAccuracyEllipticRandom samples the whole accepted parameter domain
// (ripple 1e-4…10 dB, attenuation 1e-6…300 dB above it, any order to
// MaxEllipticOrder) against the 200-bit reference; designs refused with
// ErrRange must really exceed MaxEllipticQ by the reference.
func TestAccuracyEllipticRandom(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxEllipticOrder).Draw(t, "n")
		rip := math.Exp(rapid.Float64Range(math.Log(1e-4), math.Log(10)).Draw(t, "logrip"))
		att := rip + math.Exp(rapid.Float64Range(math.Log(1e-6), math.Log(300)).Draw(t, "logmargin"))
		ref := accElliptic(n, rip, att)
		h, err := Elliptic{RippleDB: rip, AttenDB: att}.Prototype(n)
		if errors.Is(err, ErrRange) {
			p := ref.poles[0]
			if q := cmplx.Abs(p) / (-2 * real(p)); n > 1 && q < MaxEllipticQ/2 {
				t.Fatalf("order %d (%g, %g dB) refused, but the reference Q is %g: %v", n, rip, att, q, err)
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		if e := accCheck(t, "", h, ref); e > accTol {
			t.Fatalf("order %d (%g, %g dB): relative error %.2g", n, rip, att, e)
		}
	})
}

// TestAccuracyChebyshevRandom samples ripple 1e-6…30 dB and attenuation
// 0.1…300 dB at any order to MaxChebyshevOrder against the 200-bit
// reference, to the documented 1e-13.
func TestAccuracyChebyshevRandom(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxChebyshevOrder).Draw(t, "n")
		rip := math.Exp(rapid.Float64Range(math.Log(1e-6), math.Log(30)).Draw(t, "logrip"))
		att := math.Exp(rapid.Float64Range(math.Log(0.1), math.Log(300)).Draw(t, "logatt"))
		h1, err := Chebyshev{RippleDB: rip}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		if e := accCheck(t, "Chebyshev", h1, accChebyshev(n, rip)); e > 1e-13 {
			t.Fatalf("Chebyshev order %d ripple %g: relative error %.2g", n, rip, e)
		}
		h2, err := InverseChebyshev{AttenDB: att}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		if e := accCheck(t, "InverseChebyshev", h2, accInverseChebyshev(n, att)); e > 1e-13 {
			t.Fatalf("InverseChebyshev order %d atten %g: relative error %.2g", n, att, e)
		}
	})
}
