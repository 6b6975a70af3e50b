package fastmath

import (
	"math"
	"math/big"
	"sync"
)

// References in extended precision (math/big, 256 bits), from series whose
// truncation is far below float64's rounding: ln by atanh, atan by its
// Maclaurin series after halving the argument three times. They make the
// tables (tables_test.go) and judge the accuracy tests.

const bigPrec = 256

func bigF(x float64) *big.Float { return new(big.Float).SetPrec(bigPrec).SetFloat64(x) }

func bigInt(n int) *big.Float { return new(big.Float).SetPrec(bigPrec).SetInt64(int64(n)) }

// bigSeries returns Σ_{n≥0} s^n·x^(2n+1)/(2n+1), s = ±1: atanh x for
// s = +1, atan x for s = −1 (|x| ≤ 1/2 here, so the terms fall at least 4×
// per step and stopping below 2^-(bigPrec+8) of the sum is safe).
func bigSeries(x *big.Float, s int) *big.Float {
	sum := new(big.Float).SetPrec(bigPrec).Set(x)
	if x.Sign() == 0 {
		return sum
	}
	x2 := new(big.Float).SetPrec(bigPrec).Mul(x, x)
	pow := new(big.Float).SetPrec(bigPrec).Set(x)
	for n := 3; ; n += 2 {
		pow.Mul(pow, x2)
		t := new(big.Float).SetPrec(bigPrec).Quo(pow, bigInt(n))
		if t.MantExp(nil) < sum.MantExp(nil)-bigPrec-8 {
			return sum
		}
		if s < 0 && (n/2)%2 == 1 {
			sum.Sub(sum, t)
		} else {
			sum.Add(sum, t)
		}
	}
}

var bigConsts = sync.OnceValue(func() [3]*big.Float {
	var ln2, ln10, pi *big.Float
	// ln 2 = 2·atanh(1/3); ln 10 = 3·ln 2 + ln 1.25 = 3·ln 2 + 2·atanh(1/9).
	third := new(big.Float).SetPrec(bigPrec).Quo(bigInt(1), bigInt(3))
	ln2 = bigSeries(third, 1)
	ln2.Mul(ln2, bigInt(2))
	ninth := new(big.Float).SetPrec(bigPrec).Quo(bigInt(1), bigInt(9))
	ln10 = bigSeries(ninth, 1)
	ln10.Mul(ln10, bigInt(2))
	ln10.Add(ln10, new(big.Float).SetPrec(bigPrec).Mul(ln2, bigInt(3)))
	pi = bigAtanSmall(bigInt(1))
	pi.Mul(pi, bigInt(4))
	return [3]*big.Float{ln2, ln10, pi}
})

// bigConst returns ln 2, ln 10 and π.
func bigConst() (ln2, ln10, pi *big.Float) {
	c := bigConsts()
	return c[0], c[1], c[2]
}

// bigLn is the natural logarithm of x > 0.
func bigLn(x *big.Float) *big.Float {
	ln2, _, _ := bigConst()
	m := new(big.Float).SetPrec(bigPrec)
	e := x.MantExp(m) // x = m·2^e, m in [0.5, 1)
	if m.Cmp(bigF(0.75)) < 0 {
		m.SetMantExp(m, 1)
		e--
	}
	num := new(big.Float).SetPrec(bigPrec).Sub(m, bigInt(1))
	den := new(big.Float).SetPrec(bigPrec).Add(m, bigInt(1))
	r := bigSeries(num.Quo(num, den), 1) // |u| ≤ 1/5
	r.Mul(r, bigInt(2))
	return r.Add(r, new(big.Float).SetPrec(bigPrec).Mul(ln2, bigInt(e)))
}

// bigLog10 is the decimal logarithm of x > 0.
func bigLog10(x *big.Float) *big.Float {
	_, ln10, _ := bigConst()
	l := bigLn(x)
	return l.Quo(l, ln10)
}

// bigAtanSmall is atan x for 0 ≤ x ≤ 1: three halvings
// x → x/(1 + √(1 + x²)) bring x below tan(π/32) ≈ 0.099.
func bigAtanSmall(x *big.Float) *big.Float {
	y := new(big.Float).SetPrec(bigPrec).Set(x)
	for range 3 {
		s := new(big.Float).SetPrec(bigPrec).Mul(y, y)
		s.Add(s, bigInt(1))
		s.Sqrt(s)
		s.Add(s, bigInt(1))
		y.Quo(y, s)
	}
	r := bigSeries(y, -1)
	return r.Mul(r, bigInt(8))
}

// bigAtan2 is the exact arc tangent of the float64s y/x on their
// quadrant, for finite y, x not both zero.
func bigAtan2(y, x float64) *big.Float {
	_, _, pi := bigConst()
	ax, ay := math.Abs(x), math.Abs(y)
	n, d := ay, ax
	if ay > ax {
		n, d = ax, ay
	}
	a := bigAtanSmall(new(big.Float).SetPrec(bigPrec).Quo(bigF(n), bigF(d)))
	half := new(big.Float).SetPrec(bigPrec).Quo(pi, bigInt(2))
	switch {
	case ay > ax && !math.Signbit(x):
		a.Sub(half, a)
	case ay > ax:
		a.Add(half, a)
	case math.Signbit(x):
		a.Sub(pi, a)
	}
	if math.Signbit(y) {
		a.Neg(a)
	}
	return a
}

// ulpErr is |got − exact| in units of the last place of exact rounded to
// float64 (2⁻¹⁰⁷⁴ below the normal range).
func ulpErr(got float64, exact *big.Float) float64 {
	if math.IsInf(got, 0) || math.IsNaN(got) {
		return math.Inf(1)
	}
	diff := new(big.Float).SetPrec(bigPrec).Sub(bigF(got), exact)
	diff.Abs(diff)
	e := exact.MantExp(nil) // |exact| in [2^(e−1), 2^e)
	if exact.Sign() == 0 {
		e = -1021
	}
	ulp := math.Ldexp(1, max(e-53, -1074))
	q, _ := diff.Float64()
	return q / ulp
}
