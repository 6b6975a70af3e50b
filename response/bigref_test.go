package response

import (
	"math/big"

	"github.com/rolloff/rolloff/filter"
)

// A small complex arithmetic in big.Float, for references that float64
// cannot compute: the step response of a transfer function with distinct
// poles, Σ residues, evaluated at bigPrec bits so that the cancellation
// among large residues costs nothing.
const bigPrec = 512

type bigC struct{ re, im *big.Float }

func newBig(v float64) *big.Float { return new(big.Float).SetPrec(bigPrec).SetFloat64(v) }

func bc(v complex128) bigC { return bigC{newBig(real(v)), newBig(imag(v))} }

func (a bigC) add(b bigC) bigC {
	return bigC{new(big.Float).SetPrec(bigPrec).Add(a.re, b.re), new(big.Float).SetPrec(bigPrec).Add(a.im, b.im)}
}

func (a bigC) sub(b bigC) bigC {
	return bigC{new(big.Float).SetPrec(bigPrec).Sub(a.re, b.re), new(big.Float).SetPrec(bigPrec).Sub(a.im, b.im)}
}

func (a bigC) mul(b bigC) bigC {
	m := func(x, y *big.Float) *big.Float { return new(big.Float).SetPrec(bigPrec).Mul(x, y) }
	re := new(big.Float).SetPrec(bigPrec).Sub(m(a.re, b.re), m(a.im, b.im))
	im := new(big.Float).SetPrec(bigPrec).Add(m(a.re, b.im), m(a.im, b.re))
	return bigC{re, im}
}

func (a bigC) quo(b bigC) bigC {
	m := func(x, y *big.Float) *big.Float { return new(big.Float).SetPrec(bigPrec).Mul(x, y) }
	d := new(big.Float).SetPrec(bigPrec).Add(m(b.re, b.re), m(b.im, b.im))
	n := a.mul(bigC{b.re, new(big.Float).SetPrec(bigPrec).Neg(b.im)})
	return bigC{n.re.Quo(n.re, d), n.im.Quo(n.im, d)}
}

// bigExpC is e^z by the Taylor series of e^{|Re z|} (inverted for Re z < 0)
// and of cos and sin of Im z (|Im z| ≤ 200 here: the terms reach e^200 ≈
// 1e87, far inside 512 bits).
func bigExpC(z bigC) bigC {
	one := newBig(1)
	re := new(big.Float).SetPrec(bigPrec).Abs(z.re)
	mag := newBig(1)
	term := newBig(1)
	for k := 1; k < 2000; k++ {
		term.Mul(term, re)
		term.Quo(term, newBig(float64(k)))
		mag.Add(mag, term)
		if term.Sign() == 0 || term.MantExp(nil) < mag.MantExp(nil)-bigPrec-8 {
			break
		}
	}
	if z.re.Sign() < 0 {
		mag.Quo(one, mag)
	}
	// cos + j sin by the series of e^{jθ}.
	c, s := newBig(1), newBig(0)
	tr, ti := newBig(1), newBig(0) // (jθ)^k/k!
	for k := 1; k < 2000; k++ {
		nr := new(big.Float).SetPrec(bigPrec).Mul(ti, z.im)
		nr.Neg(nr)
		ni := new(big.Float).SetPrec(bigPrec).Mul(tr, z.im)
		kk := newBig(float64(k))
		tr, ti = nr.Quo(nr, kk), ni.Quo(ni, kk)
		c.Add(c, tr)
		s.Add(s, ti)
		if k > 10 && (tr.Sign() == 0 || tr.MantExp(nil) < -bigPrec-8) && (ti.Sign() == 0 || ti.MantExp(nil) < -bigPrec-8) {
			break
		}
	}
	return bigC{c.Mul(c, mag), s.Mul(s, mag)}
}

// bigStep is the step response of h (distinct poles, none at the origin)
// at t, in bigPrec-bit arithmetic: H(0) + Σᵢ Res_{pᵢ} H(s)e^{st}/s.
func bigStep(h filter.Transfer, t float64) float64 {
	k := bigC{newBig(h.Gain), newBig(0)}
	h0 := k
	for _, z := range h.Zeros {
		h0 = h0.mul(bc(-z))
	}
	for _, p := range h.Poles {
		h0 = h0.quo(bc(-p))
	}
	sum := h0
	tt := bc(complex(t, 0))
	for i, p := range h.Poles {
		pi := bc(p)
		r := k
		for _, z := range h.Zeros {
			r = r.mul(pi.sub(bc(z)))
		}
		for j, q := range h.Poles {
			if j != i {
				r = r.quo(pi.sub(bc(q)))
			}
		}
		r = r.quo(pi).mul(bigExpC(pi.mul(tt)))
		sum = sum.add(r)
	}
	v, _ := sum.re.Float64()
	return v
}
