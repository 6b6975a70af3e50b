package fastmath

import (
	"math"
	"math/rand/v2"
	"testing"

	"pgregory.net/rapid"
)

// Accuracy levels, against the exact value (math/big, bigref_test.go).
// They are the promises of the docs of Log10 (a final rounding plus the
// rounding of a part at most a third of the result) and Atan2 (where
// c = 0, the rounding of n/d and that of the sum). math.Log10 and
// math.Atan2 are logged beside them for comparison.
const (
	maxULP     = 1.0
	maxAtanULP = 1.5
)

// bitsEqual reports whether a and b are the same float64, NaNs alike.
func bitsEqual(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || math.IsNaN(a) && math.IsNaN(b)
}

// logInputs returns the dense test set of Log10: every binary exponent
// (subnormals included) at a few mantissas, the neighbourhood of 1 in ulps
// and in small powers of two, both sides of every table boundary
// z = (j ± 1/2)/128 and of the Fast2Sum change at 0.75 and 1.5, and
// uniform random mantissas with random exponents (fixed seed).
func logInputs() []float64 {
	var xs []float64
	for e := -1074; e <= 1023; e++ {
		for _, m := range []float64{1, 1.1, 1.3333333333333333, 1.4999999999999998, 1.5, 1.7, 1.9999999999999998} {
			if x := math.Ldexp(m, e); x > 0 && !math.IsInf(x, 0) {
				xs = append(xs, x)
			}
		}
	}
	for i := 1; i <= 200; i++ {
		xs = append(xs, 1+float64(i)*0x1p-52, 1-float64(i)*0x1p-53)
	}
	for e := 1; e <= 60; e++ {
		xs = append(xs, 1+math.Ldexp(1, -e), 1-math.Ldexp(1, -e), 1+3*math.Ldexp(1, -e-2))
	}
	for j := 95; j <= 193; j++ {
		b := (float64(j) + 0.5) / 128
		for _, x := range []float64{b, math.Nextafter(b, 0), math.Nextafter(b, 2), b * 8, b / 1024} {
			xs = append(xs, x, math.Nextafter(x, 0), math.Nextafter(x, math.Inf(1)))
		}
	}
	for _, x := range []float64{0.75, 1.5, 10, 100, 1e-300, 1e300, math.MaxFloat64, math.SmallestNonzeroFloat64, 0x1p-1022} {
		xs = append(xs, x, math.Nextafter(x, 0), math.Nextafter(x, math.Inf(1)))
	}
	r := rand.New(rand.NewPCG(7, 11))
	for range 20000 {
		xs = append(xs, math.Ldexp(1+r.Float64(), r.IntN(2098)-1074))
	}
	for range 20000 {
		xs = append(xs, 0.5+r.Float64()*1.5)
	}
	return xs
}

// TestLog10Dense: Log10 within maxULP of the exact logarithm on the dense
// set.
func TestLog10Dense(t *testing.T) {
	var worst, worstMath, worstX float64
	for _, x := range logInputs() {
		if math.IsInf(x, 0) || x == 0 {
			continue
		}
		exact := bigLog10(bigF(x))
		if e := ulpErr(Log10(x), exact); e > worst {
			worst, worstX = e, x
		}
		worstMath = math.Max(worstMath, ulpErr(math.Log10(x), exact))
	}
	t.Logf("Log10: max %.3f ulp (at %g); math.Log10: max %.3f ulp", worst, worstX, worstMath)
	if worst > maxULP {
		t.Errorf("Log10(%g) is %.3f ulp from the exact value, want ≤ %g", worstX, worst, maxULP)
	}
}

// TestLog10Special: outside the positive finite numbers, and at exact
// cases, Log10 is math.Log10 bit for bit.
func TestLog10Special(t *testing.T) {
	for _, x := range []float64{0, math.Copysign(0, -1), -1, -math.SmallestNonzeroFloat64, -math.MaxFloat64,
		math.Inf(1), math.Inf(-1), math.NaN(), 1} {
		if got, want := Log10(x), math.Log10(x); !bitsEqual(got, want) {
			t.Errorf("Log10(%g) = %g, want %g (math.Log10)", x, got, want)
		}
	}
	// Exact powers of ten to 1e22 are exact in float64 and their
	// logarithms are integers: the nearest float64 is the integer.
	p := 1.0
	for k := 0; k <= 22; k++ {
		if got := Log10(p); got != float64(k) {
			t.Errorf("Log10(1e%d) = %.17g, want %d", k, got, k)
		}
		p *= 10
	}
}

// TestPropLog10: for any float64, Log10 is math.Log10's special case or
// within maxULP of the exact value.
func TestPropLog10(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		x := rapid.Float64().Draw(t, "x")
		got := Log10(x)
		if !(x > 0) || math.IsInf(x, 1) {
			if want := math.Log10(x); !bitsEqual(got, want) {
				t.Fatalf("Log10(%g) = %g, want %g", x, got, want)
			}
			return
		}
		if e := ulpErr(got, bigLog10(bigF(x))); e > maxULP {
			t.Fatalf("Log10(%g) = %.17g is %.3f ulp from the exact value", x, got, e)
		}
	})
}

// atanInputs returns the dense test set of Atan2: points on circles of
// many radii (subnormal to near overflow) at 4096 angles, both sides of
// every table boundary q = (j + 1/2)/64 and of the octant boundaries
// |y| = |x| in every quadrant, near-axis points, and random pairs.
func atanInputs() [][2]float64 {
	var ps [][2]float64
	for _, rad := range []float64{1, 3.7e-310, 1e-200, 1e-30, 0.5, 1e30, 1e300, 1e308} {
		for i := range 4096 {
			th := (float64(i) + 0.25) / 4096 * 2 * math.Pi
			ps = append(ps, [2]float64{rad * math.Sin(th), rad * math.Cos(th)})
		}
	}
	for j := 0; j <= 64; j++ {
		q := (float64(j) + 0.5) / 64
		for _, v := range []float64{q, math.Nextafter(q, 0), math.Nextafter(q, 2), 3.0 / 128, math.Nextafter(3.0/128, 0)} {
			for _, s := range [][2]float64{{1, 1}, {-1, 1}, {1, -1}, {-1, -1}} {
				ps = append(ps, [2]float64{s[0] * v, s[1]}, [2]float64{s[0], s[1] * v})
			}
		}
	}
	for _, s := range [][2]float64{{1, 1}, {-1, 1}, {1, -1}, {-1, -1}} {
		one := 1.0
		for range 4 {
			ps = append(ps, [2]float64{s[0] * one, s[1]}, [2]float64{s[0], s[1] * one})
			one = math.Nextafter(one, 0)
		}
		for e := 0; e <= 1074; e += 7 {
			tiny := math.Ldexp(1, -e)
			ps = append(ps, [2]float64{s[0] * tiny, s[1]}, [2]float64{s[0], s[1] * tiny})
		}
	}
	r := rand.New(rand.NewPCG(3, 5))
	for range 20000 {
		y := math.Ldexp(r.Float64()-0.5, r.IntN(80)-40)
		x := math.Ldexp(r.Float64()-0.5, r.IntN(80)-40)
		ps = append(ps, [2]float64{y, x})
	}
	return ps
}

// TestAtan2Dense: Atan2 within maxAtanULP of the exact value on the dense set.
func TestAtan2Dense(t *testing.T) {
	var worst, worstMath float64
	var at [2]float64
	for _, p := range atanInputs() {
		y, x := p[0], p[1]
		if x == 0 && y == 0 {
			continue
		}
		exact := bigAtan2(y, x)
		if e := ulpErr(Atan2(y, x), exact); e > worst {
			worst, at = e, p
		}
		worstMath = math.Max(worstMath, ulpErr(math.Atan2(y, x), exact))
	}
	t.Logf("Atan2: max %.3f ulp (at y, x = %g); math.Atan2: max %.3f ulp", worst, at, worstMath)
	if worst > maxAtanULP {
		t.Errorf("Atan2(%g, %g) is %.3f ulp from the exact value, want ≤ %g", at[0], at[1], worst, maxAtanULP)
	}
}

// TestAtan2Special: infinities, NaNs, zeros and the axes give exactly
// math.Atan2's result, signs of zero included.
func TestAtan2Special(t *testing.T) {
	nz := math.Copysign(0, -1)
	vals := []float64{0, nz, 1, -1, 2.5, -3e-310, 1e308, math.Inf(1), math.Inf(-1), math.NaN()}
	for _, y := range vals {
		for _, x := range vals {
			if got, want := Atan2(y, x), math.Atan2(y, x); !bitsEqual(got, want) {
				t.Errorf("Atan2(%g, %g) = %g, want %g (math.Atan2)", y, x, got, want)
			}
		}
	}
}

// TestPropAtan2: for any float64 pair, Atan2 is math.Atan2's special case
// (bit for bit) or within maxAtanULP of the exact value.
func TestPropAtan2(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		y := rapid.Float64().Draw(t, "y")
		x := rapid.Float64().Draw(t, "x")
		got := Atan2(y, x)
		if math.IsNaN(x) || math.IsNaN(y) || math.IsInf(x, 0) || math.IsInf(y, 0) || x == 0 && y == 0 {
			if want := math.Atan2(y, x); !bitsEqual(got, want) {
				t.Fatalf("Atan2(%g, %g) = %g, want %g", y, x, got, want)
			}
			return
		}
		if e := ulpErr(got, bigAtan2(y, x)); e > maxAtanULP {
			t.Fatalf("Atan2(%g, %g) = %.17g is %.3f ulp from the exact value", y, x, got, e)
		}
	})
}

// TestBigConstants: the references' constants against their published
// digits (from memory of the standard decimal expansions).
func TestBigConstants(t *testing.T) {
	ln2, ln10, pi := bigConst()
	for _, c := range []struct {
		name, digits string
		v            interface{ Text(byte, int) string }
	}{
		{"ln 2", "0.69314718055994530941723212145817656807550013436026", ln2},
		{"ln 10", "2.3025850929940456840179914546843642076011014886288", ln10},
		{"π", "3.1415926535897932384626433832795028841971693993751", pi},
	} {
		if got := c.v.Text('f', len(c.digits)-2-1); got != c.digits[:len(c.digits)-1] && got[:len(got)-1] != c.digits[:len(c.digits)-2] {
			t.Errorf("%s = %s, want %s", c.name, got, c.digits)
		}
	}
}
