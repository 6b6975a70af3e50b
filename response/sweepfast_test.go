package response

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"pgregory.net/rapid"
)

// Tolerances of the fast sweep against the per-factor reference
// (sweepTransfer): both are exact to rounding, but they round differently
// (a quadratic factor per conjugate pair, one atan2 of the product instead
// of a sum of atan2s, |P|² instead of a hypot). The phase is a sum of up to
// a few dozen terms of size up to π, each with an error of a few ulps:
// 1e-9° absolute is a thousand times above that. The gain agrees to
// 1e-9 dB (relative magnitude 1e-10) and the delay to 1e-9 relative of
// the largest delay term, for the pole Qs the generator draws (up to 20),
// where the conditioning near ω = Im p costs at most about 2Q ulps.
const (
	fastPhaseTolDeg = 1e-9
	fastGainTolDB   = 1e-9
	fastDelayTolRel = 1e-9
)

// belowFloat64DB is 20·log10 of the smallest positive float64 (4.9e-324).
var belowFloat64DB = 20 * math.Log10(math.SmallestNonzeroFloat64)

// checkFastAgainstReference compares the fast path with the per-factor
// reference at every frequency of hz.
func checkFastAgainstReference(t interface {
	Helper()
	Fatalf(string, ...any)
}, h filter.Transfer, hz []float64) {
	t.Helper()
	got := make([]Point, len(hz))
	want := make([]Point, len(hz))
	sweepTransferFast(got, h, hz)
	sweepTransfer(want, h, hz)
	// Scale of the delay: the sum of the magnitudes of the terms.
	for i := range hz {
		g, w := got[i], want[i]
		if math.IsNaN(w.Hz) {
			if !math.IsNaN(g.Hz) || !math.IsNaN(g.GainDB) || !math.IsNaN(g.PhaseDeg) || !math.IsNaN(g.DelayS) {
				t.Fatalf("NaN frequency: fast %+v, want NaNs", g)
			}
			continue
		}
		ds := delayScale(h, 2*math.Pi*hz[i])
		switch {
		case math.Abs(g.PhaseDeg-w.PhaseDeg) > fastPhaseTolDeg:
			t.Fatalf("at %g Hz: phase %.15g°, reference %.15g°", hz[i], g.PhaseDeg, w.PhaseDeg)
		case math.IsInf(w.GainDB, -1) && g.GainDB < belowFloat64DB:
			// |H| is below the smallest float64: the reference's product
			// underflowed to 0, the rescaled product did not.
		case !(math.Abs(g.GainDB-w.GainDB) <= fastGainTolDB) && g.GainDB != w.GainDB &&
			!(math.IsNaN(g.GainDB) && math.IsNaN(w.GainDB)):
			t.Fatalf("at %g Hz: gain %.15g dB, reference %.15g dB", hz[i], g.GainDB, w.GainDB)
		case math.Abs(g.DelayS-w.DelayS) > fastDelayTolRel*ds:
			t.Fatalf("at %g Hz: delay %.15g s, reference %.15g s (scale %g s)", hz[i], g.DelayS, w.DelayS, ds)
		case g.Hz != w.Hz:
			t.Fatalf("frequency %g, want %g", g.Hz, w.Hz)
		}
	}
}

// delayScale is Σ |a|/(a² + b²) over all factors: the size of the terms
// the delay is summed from.
func delayScale(h filter.Transfer, w float64) float64 {
	s := 0.0
	for _, r := range append(append([]complex128(nil), h.Zeros...), h.Poles...) {
		a, b := factorParts(r, w)
		if d := a*a + b*b; d > 0 {
			s += math.Abs(a) / d
		}
	}
	return s
}

// TestPropSweepFastMatchesFactorSum: for random stable transfers (complex
// and real poles, zeros at the origin, on the jω axis, and in either
// half-plane), on random grids including negative frequencies and DC, the
// fast path equals the per-factor sum of sweep.go to rounding.
func TestPropSweepFastMatchesFactorSum(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 5, true, -1, 4)
		n := rapid.IntRange(1, 40).Draw(t, "points")
		hz := make([]float64, n)
		for i := range hz {
			f := math.Pow(10, rapid.Float64Range(-3, 6).Draw(t, "f"))
			switch rapid.IntRange(0, 9).Draw(t, "kind") {
			case 0:
				f = -f
			case 1:
				f = 0
			}
			hz[i] = f
		}
		checkFastAgainstReference(t, h, hz)
	})
}

// TestSweepFastEdges: designs of every family and band, a high order far
// into its stopband (the running product is rescaled), unpaired complex
// roots, a zero gain, exact zeros and poles on the grid, NaN frequencies.
func TestSweepFastEdges(t *testing.T) {
	var hs []filter.Transfer
	specs := []filter.Spec{
		{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{1.3e3}, RippleDB: 0.5, AttenDB: 60},
		{Band: filter.Highpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{600}, RippleDB: 1, AttenDB: 40},
		{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{700, 1400}, RippleDB: 1, AttenDB: 40},
		{Band: filter.Bandstop, PassHz: [2]float64{700, 1400}, StopHz: [2]float64{900, 1100}, RippleDB: 1, AttenDB: 40},
	}
	fams := []filter.Family{filter.Butterworth{}, filter.Chebyshev{}, filter.InverseChebyshev{}, filter.Elliptic{}}
	for _, s := range specs {
		for _, f := range fams {
			h, err := filter.Design(f, s)
			if errors.Is(err, filter.ErrRange) {
				continue
			}
			if err != nil {
				t.Fatalf("%v %v: %v", f, s.Band, err)
			}
			hs = append(hs, h)
		}
	}
	hs = append(hs, butterworth(32, 10), butterworth(64, 1e3))
	hs = append(hs, filter.Transfer{Poles: []complex128{complex(-1, 5), complex(-2, -3)}, Zeros: []complex128{complex(1, 2)}, Gain: 2})
	hs = append(hs, filter.Transfer{Poles: []complex128{-1, -2}})
	notch := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 50, Q: 2, ZeroHz: 50, Gain: 1}.Transfer()
	hs = append(hs, notch)
	hz := []float64{0, 1e-3, 1, 10, 49.99, 50, 50.01, 100, 999, 1e3, 1.1e3, 1e4, 1e5, 1e7, 1e9, -3, -1e4, math.NaN(), 1 / (2 * math.Pi)}
	for _, h := range hs {
		checkFastAgainstReference(t, h, hz)
	}
}

// TestSweepFastAxisPoles: poles on the jω axis (an undamped resonator) and
// a Transfer with more factors than the fast path holds.
func TestSweepFastAxisPoles(t *testing.T) {
	w0 := 2 * math.Pi * 100
	res := filter.Transfer{Zeros: []complex128{0}, Poles: []complex128{complex(0, w0), complex(0, -w0)}, Gain: 1}
	hz := []float64{1, 50, 99.9, 100, 100.1, 200, -150, 0}
	checkFastAgainstReference(t, res, hz)
	big := butterworth(maxFastPairs*2+4, 10)
	big.Zeros = make([]complex128, maxFastSingles+1)
	checkFastAgainstReference(t, big, hz)
}

// TestLnNormal checks the sweep's logarithm against math.Log (rapid, over
// the whole range of normal numbers, and densely across every table
// interval of the mantissa): within 4e-16 absolute (its own roundings; 2.4e-16
// seen near 1) plus two ulps of the result (its own last rounding and
// math.Log's error), which keeps the gain within 2e-15 dB of 10·log10
// near 0 dB.
func TestLnNormal(t *testing.T) {
	check := func(t interface{ Fatalf(string, ...any) }, x float64) {
		got, want := lnNormal(x), math.Log(x)
		ulp := math.Abs(math.Nextafter(want, math.Inf(1)) - want)
		if !(math.Abs(got-want) <= 4e-16+2*ulp) {
			t.Fatalf("lnNormal(%.17g) = %.17g, math.Log %.17g (diff %g)", x, got, want, got-want)
		}
	}
	rapid.Check(t, func(t *rapid.T) {
		e := rapid.IntRange(-1022, 1023).Draw(t, "exp")
		m := rapid.Float64Range(1, math.Nextafter(2, 0)).Draw(t, "mantissa")
		check(t, math.Ldexp(m, e))
	})
	for i := range 1 << 16 {
		m := 1 + float64(i)/(1<<16)
		for _, x := range []float64{m, math.Nextafter(m, 0), math.Nextafter(m, 3), m / 2, m * 0x1p-1000, m * 0x1p1000} {
			check(t, x)
		}
	}
	for _, x := range []float64{1, 2, 0.5, math.E, 10, 0x1p-1022, math.MaxFloat64} {
		check(t, x)
	}
}

// TestAtan2Finite checks the sweep's arctangent against math.Atan2 (rapid):
// within 2 ulps of it for finite arguments over the whole exponent range
// (with the sign of y where math.Atan2's quotient underflows), and equal at
// the signed zeros and on the axes.
func TestAtan2Finite(t *testing.T) {
	ulp := func(v float64) float64 { return math.Abs(math.Nextafter(v, math.Inf(1)) - v) }
	rapid.Check(t, func(t *rapid.T) {
		y := rapid.Float64().Draw(t, "y")
		x := rapid.Float64().Draw(t, "x")
		if math.IsInf(x, 0) || math.IsInf(y, 0) || math.IsNaN(x) || math.IsNaN(y) || (x == 0 && y == 0) {
			t.Skip("outside the domain")
		}
		got, want := atan2Finite(y, x), math.Atan2(y, x)
		if r := math.Abs(y / x); r < 0x1p-1022 {
			// math.Atan2 divides first: the quotient underflows to +0 and it
			// returns +π for x < 0 whatever the sign of y. The sweep needs
			// the sign of y (the turn count follows it), which atan2Finite
			// keeps: the angle is ±π or ±0 to within 1e-308.
			want = math.Copysign(math.Abs(want), y)
		}
		if math.Abs(got-want) > 2*ulp(want) {
			t.Fatalf("atan2Finite(%g, %g) = %.17g, math.Atan2 %.17g (%.1f ulp)", y, x, got, want, math.Abs(got-want)/ulp(want))
		}
	})
	// Dense angles around the circle, the octant boundaries included.
	for i := range 200001 {
		a := -math.Pi + 2*math.Pi*float64(i)/200000
		y, x := math.Sincos(a)
		for _, s := range []float64{1, 1e-300, 1e300} {
			got, want := atan2Finite(y*s, x*s), math.Atan2(y*s, x*s)
			if math.Abs(got-want) > 2*ulp(want) {
				t.Fatalf("atan2Finite(%g, %g) = %.17g, math.Atan2 %.17g", y*s, x*s, got, want)
			}
		}
	}
	for _, c := range [][2]float64{{0, 1}, {math.Copysign(0, -1), 1}, {0, -1}, {math.Copysign(0, -1), -1}, {1, 0}, {-1, 0}, {0, math.Copysign(0, -1)}} {
		if got, want := atan2Finite(c[0], c[1]), math.Atan2(c[0], c[1]); got != want || math.Signbit(got) != math.Signbit(want) {
			t.Errorf("atan2Finite(%g, %g) = %g, want %g", c[0], c[1], got, want)
		}
	}
}

// TestGainDBSubnormal: a gain below the normal float64 range has its true
// level in dB (math.Log10 alone is wrong there on amd64).
func TestGainDBSubnormal(t *testing.T) {
	for _, c := range []struct{ a, want float64 }{
		{5e-324, 20 * (-323.3062153431158)}, // log10 of the least subnormal, by Python 3.11 math.log10
		{0x1p-1030, 20 * -1030 * 0.30102999566398120},
		{1e-310, -6200},
	} {
		if got := gainDB(complex(c.a, 0)); math.Abs(got-c.want) > 1e-9*math.Abs(c.want) {
			t.Errorf("gainDB(%g) = %.12g dB, want %.12g", c.a, got, c.want)
		}
	}
}

// TestPropPlainBoundSound: wherever plainBound lets sweepPlain sweep a
// transfer (random roots and grids over up to 240 decades, so that it
// refuses some), the running product of sweepPlain, followed factor by
// factor in its order (axis zeros, zero pairs, pole pairs, single roots)
// with each factor's size summed in log2, stays within 2^±plainLimit at
// every frequency, and the sweep equals the rescaling path (pointPos or
// pointFast) to the fast path's tolerances.
func TestPropPlainBoundSound(t *testing.T) {
	refused, taken := 0, 0
	rapid.Check(t, func(t *rapid.T) {
		lo := rapid.Float64Range(-120, 100).Draw(t, "decade lo")
		hi := lo + rapid.Float64Range(0, 20).Draw(t, "decades")
		h := stableTransfer(t, 8, true, lo, hi)
		n := rapid.IntRange(1, 30).Draw(t, "points")
		hz := make([]float64, n)
		wLo, wHi := math.Inf(1), 0.0
		for i := range hz {
			hz[i] = math.Pow(10, rapid.Float64Range(lo-20, hi+20).Draw(t, "f"))
			wLo, wHi = min(wLo, 2*math.Pi*hz[i]), max(wHi, 2*math.Pi*hz[i])
		}
		var z, p factorSet
		if !z.split(h.Zeros, true) || !p.split(h.Poles, false) {
			t.Skip("more factors than the fast path holds")
		}
		if !plainBound(&z, &p, wLo, wHi) {
			refused++
			return
		}
		taken++
		for _, f := range hz {
			w := 2 * math.Pi * f
			l2 := 0.0 // log2 of the running product's size
			step := func(size float64, pole bool) {
				if size == 0 {
					return // a zero factor: the point goes to sweepPointSlow
				}
				if pole {
					l2 -= math.Log2(size)
				} else {
					l2 += math.Log2(size)
				}
				if math.Abs(l2) > plainLimit {
					t.Fatalf("at %g Hz the running product reaches 2^%.1f", f, l2)
				}
			}
			for _, b := range z.axis[:z.na] {
				step(math.Abs((b-w)*(b+w)), false)
			}
			for i, set := range [2]*factorSet{&z, &p} {
				for _, q := range set.pairs[:set.np] {
					re := q.a2 + (q.beta-w)*(q.beta+w)
					step(math.Hypot(re, q.c1*w), i == 1)
				}
			}
			for i, set := range [2]*factorSet{&z, &p} {
				for _, r := range set.singles[:set.ns] {
					a, b := factorParts(r, w)
					step(math.Hypot(a, b), i == 1)
				}
			}
		}
		// The same points by the rescaling path.
		got := make([]Point, n)
		want := make([]Point, n)
		g0 := 20 * math.Log10(math.Abs(h.Gain))
		sweepPlain(got, h, hz, g0, h.Gain < 0, &z, &p)
		sweepRescaled(want, h, hz, g0, h.Gain < 0, &z, &p)
		for i := range hz {
			g, w := got[i], want[i]
			ds := delayScale(h, 2*math.Pi*hz[i])
			if math.Abs(g.PhaseDeg-w.PhaseDeg) > fastPhaseTolDeg || !(math.Abs(g.GainDB-w.GainDB) <= fastGainTolDB || g.GainDB == w.GainDB) ||
				math.Abs(g.DelayS-w.DelayS) > fastDelayTolRel*ds {
				t.Fatalf("at %g Hz: plain %+v, rescaling %+v", hz[i], g, w)
			}
		}
	})
	if refused == 0 || taken == 0 {
		t.Errorf("plainBound took %d and refused %d transfers: the test should see both", taken, refused)
	}
}

// TestPropAxisFactorFloor checks the floor plainBound takes for an axis
// zero's real factor: (β−ω)(β+ω), as the sweep computes it, is zero or at
// least β²·2⁻⁵⁴ in size, for ω the floats next to β and any ω drawn near
// it or anywhere (rapid).
func TestPropAxisFactorFloor(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		b := math.Ldexp(rapid.Float64Range(1, 2).Draw(t, "beta mantissa"), rapid.IntRange(-400, 400).Draw(t, "beta exp"))
		ws := []float64{math.Nextafter(b, 0), math.Nextafter(b, math.Inf(1)), b,
			b * (1 + rapid.Float64Range(-1e-12, 1e-12).Draw(t, "near")),
			b * math.Pow(2, rapid.Float64Range(-3, 3).Draw(t, "far"))}
		for _, w := range ws {
			re := (b - w) * (b + w)
			if re != 0 && !(math.Abs(re) >= b*b*0x1p-54) {
				t.Fatalf("β %g, ω %g: factor %g below β²·2⁻⁵⁴ = %g", b, w, re, b*b*0x1p-54)
			}
		}
	})
}
