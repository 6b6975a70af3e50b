package poly

import (
	"fmt"
	"math/big"
)

// bigc is a complex number with big.Float parts.
type bigc struct{ re, im big.Float }

// bigWork holds scratch values for complex big arithmetic at one precision.
type bigWork struct {
	prec       uint
	t1, t2, t3 big.Float
	d, a, b, c big.Float
}

func (w *bigWork) newc() *bigc {
	z := new(bigc)
	z.re.SetPrec(w.prec)
	z.im.SetPrec(w.prec)
	return z
}

func (w *bigWork) setc(z *bigc, v complex128) {
	z.re.SetPrec(w.prec).SetFloat64(real(v))
	z.im.SetPrec(w.prec).SetFloat64(imag(v))
}

// mul sets z = x·y (z may alias x or y).
func (w *bigWork) mul(z, x, y *bigc) {
	w.t1.Mul(&x.re, &y.re)
	w.t2.Mul(&x.im, &y.im)
	w.t3.Mul(&x.re, &y.im)
	z.im.Mul(&x.im, &y.re)
	z.im.Add(&z.im, &w.t3)
	z.re.Sub(&w.t1, &w.t2)
}

// quo sets z = x/y (z may alias x or y; y ≠ 0).
func (w *bigWork) quo(z, x, y *bigc) {
	d, a, b, c, e := &w.d, &w.a, &w.b, &w.c, &w.t1
	d.Mul(&y.re, &y.re)
	a.Mul(&y.im, &y.im)
	d.Add(d, a)
	// (x.re + i x.im)(y.re − i y.im)/d
	a.Mul(&x.re, &y.re)
	b.Mul(&x.im, &y.im)
	c.Mul(&x.im, &y.re)
	e.Mul(&x.re, &y.im)
	z.re.Add(a, b)
	z.re.Quo(&z.re, d)
	z.im.Sub(c, e)
	z.im.Quo(&z.im, d)
}

// abs2 returns |z|² rounded to float64 (enough for step-size tests).
func abs2big(z *bigc) float64 {
	r, _ := z.re.Float64()
	i, _ := z.im.Float64()
	return r*r + i*i
}

// PolishBig refines approximations start of all the roots of the
// polynomial with coefficients c (ascending powers, exact or rounded to at
// least prec bits; len(start) = len(c)−1, c[len(c)−1] ≠ 0) by the
// Aberth–Ehrlich iteration (see Roots for the citations) carried out in
// math/big complex arithmetic at prec bits, until every correction is
// below 2^(−prec/2) relative (the iteration converges cubically, so the
// roots are then good to nearly prec bits), and returns them rounded to
// complex128 and paired as Roots pairs them. It is meant for
// ill-conditioned polynomials whose float64 roots are only a few digits
// correct (the reverse Bessel polynomial of degree 25 has float64 roots
// good to about 1e-7; these are good to 1e-16).
//
// Errors wrap ErrCoeff for mismatched lengths or a zero leading
// coefficient and ErrConverge if 100 iterations do not converge.
func PolishBig(c []*big.Float, start []complex128, prec uint) ([]complex128, error) {
	n := len(c) - 1
	if n < 1 || len(start) != n {
		return nil, fmt.Errorf("poly: %d coefficients with %d starting roots: %w", len(c), len(start), ErrCoeff)
	}
	if c[n].Sign() == 0 {
		return nil, fmt.Errorf("poly: leading coefficient is zero: %w", ErrCoeff)
	}
	w := &bigWork{prec: prec}
	w.t1.SetPrec(prec)
	w.t2.SetPrec(prec)
	w.t3.SetPrec(prec)
	w.d.SetPrec(prec)
	w.a.SetPrec(prec)
	w.b.SetPrec(prec)
	w.c.SetPrec(prec)
	coef := make([]big.Float, n+1)
	for i := range coef {
		coef[i].SetPrec(prec).Quo(c[i], c[n]) // monic
	}
	z := make([]*bigc, n)
	for k := range z {
		z[k] = w.newc()
		w.setc(z[k], start[k])
	}
	p, dp, s, t, one := w.newc(), w.newc(), w.newc(), w.newc(), w.newc()
	one.re.SetFloat64(1)
	tol := new(big.Float).SetMantExp(big.NewFloat(1), -int(prec/2)).SetPrec(64)
	tol2, _ := tol.Float64()
	tol2 *= tol2
	for range 100 {
		maxRel := 0.0
		for k := range z {
			// Horner for p and p'.
			p.re.SetInt64(0)
			p.im.SetInt64(0)
			dp.re.SetInt64(0)
			dp.im.SetInt64(0)
			for i := n; i >= 0; i-- {
				w.mul(dp, dp, z[k])
				dp.re.Add(&dp.re, &p.re)
				dp.im.Add(&dp.im, &p.im)
				w.mul(p, p, z[k])
				p.re.Add(&p.re, &coef[i])
			}
			if p.re.Sign() == 0 && p.im.Sign() == 0 {
				continue
			}
			// s = Σ 1/(z_k − z_j)
			s.re.SetInt64(0)
			s.im.SetInt64(0)
			for j := range z {
				if j == k {
					continue
				}
				t.re.Sub(&z[k].re, &z[j].re)
				t.im.Sub(&z[k].im, &z[j].im)
				w.quo(t, one, t)
				s.re.Add(&s.re, &t.re)
				s.im.Add(&s.im, &t.im)
			}
			w.quo(p, p, dp) // Newton correction N
			w.mul(t, p, s)  // N·s
			t.re.Sub(&one.re, &t.re)
			t.im.Neg(&t.im)
			w.quo(p, p, t) // N/(1 − N·s)
			z[k].re.Sub(&z[k].re, &p.re)
			z[k].im.Sub(&z[k].im, &p.im)
			if r := abs2big(p) / abs2big(z[k]); r > maxRel {
				maxRel = r
			}
		}
		if maxRel <= tol2 {
			out := make([]complex128, n)
			for k := range z {
				re, _ := z[k].re.Float64()
				im, _ := z[k].im.Float64()
				out[k] = complex(re, im)
			}
			return pairConjugates(out), nil
		}
	}
	return nil, fmt.Errorf("poly: extended-precision Aberth iteration did not converge in 100 steps: %w", ErrConverge)
}
