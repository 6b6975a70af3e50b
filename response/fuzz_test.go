package response

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// FuzzCrossingHz: any level and band give a crossing inside the band or a
// matchable error, never a panic.
func FuzzCrossingHz(f *testing.F) {
	f.Add(-3.0103, 1.0, 1e5, uint8(4))
	f.Add(0.0, 1e-3, 1e3, uint8(1))
	f.Add(-200.0, 1e-300, 1e300, uint8(16))
	f.Add(math.NaN(), -1.0, math.Inf(1), uint8(0))
	f.Add(-60.0, 999.0, 1001.0, uint8(9))
	f.Fuzz(func(t *testing.T, level, lo, hi float64, order uint8) {
		h := butterworth(int(order%16)+1, 1000)
		got, err := CrossingHz(h, level, lo, hi)
		if err != nil {
			if !errors.Is(err, ErrGrid) && !errors.Is(err, ErrNoCrossing) && !errors.Is(err, ErrSystem) {
				t.Fatalf("unmatchable error %v", err)
			}
			return
		}
		if !(got >= lo*(1-1e-12) && got <= hi*(1+1e-12)) {
			t.Fatalf("crossing %g Hz outside [%g, %g]", got, lo, hi)
		}
	})
}

// FuzzCheckMask: any mask gives a verdict consistent with its margin or a
// matchable error, never a panic.
func FuzzCheckMask(f *testing.F) {
	f.Add(1, 800.0, 0.0, 3000.0, 0.0, 1.0, 40.0)
	f.Add(2, 1500.0, 0.0, 250.0, 0.0, 1.0, 45.0)
	f.Add(3, 900.0, 1100.0, 100.0, 10000.0, 1.0, 20.0)
	f.Add(4, 50.0, 20000.0, 990.0, 1010.0, 1.0, 30.0)
	f.Add(1, 1e-310, 0.0, 1e308, 0.0, 1e-300, 1e300)
	f.Add(0, math.NaN(), math.Inf(1), -1.0, 0.0, 3.0, 2.0)
	f.Fuzz(func(t *testing.T, band int, p0, p1, s0, s1, ripple, atten float64) {
		spec := filter.Spec{Band: filter.Band(band), PassHz: [2]float64{p0, p1}, StopHz: [2]float64{s0, s1},
			RippleDB: ripple, AttenDB: atten}
		r, err := CheckMask(butterworth(5, 1000), spec)
		if err != nil {
			if !errors.Is(err, filter.ErrSpec) && !errors.Is(err, ErrGrid) && !errors.Is(err, ErrSystem) {
				t.Fatalf("unmatchable error %v", err)
			}
			return
		}
		if math.IsNaN(r.MarginDB) || r.Pass != (r.MarginDB >= 0) || len(r.Regions) < 2 {
			t.Fatalf("inconsistent result %+v", r)
		}
	})
}

// FuzzStep: any times give a response or a matchable error.
func FuzzStep(f *testing.F) {
	f.Add(0.0, 1e-3, 1e300)
	f.Add(-1.0, math.NaN(), math.Inf(1))
	f.Fuzz(func(t *testing.T, a, b, c float64) {
		h := butterworth(6, 1000)
		y, err := Step(h, []float64{a, b, c})
		if err != nil {
			if !errors.Is(err, ErrGrid) {
				t.Fatalf("unmatchable error %v", err)
			}
			return
		}
		for i, v := range y {
			if math.IsNaN(v) {
				t.Fatalf("NaN step at t = %g", []float64{a, b, c}[i])
			}
		}
	})
}

// FuzzStepTransfer: any poles, zero, gain and time give a step and an
// impulse response or a matchable error, never a panic; a stable system's
// values are finite.
func FuzzStepTransfer(f *testing.F) {
	f.Add(-1.0, 2.0, -1.0, -3.0, 1.0, 0.5)
	f.Add(-1.0, 0.0, -1.0, -1.0, 1.0, 0.0)            // triple real pole
	f.Add(-1e-300, 1e-300, 0.0, 1e300, 1e-300, 1e300) // extremes
	f.Add(math.NaN(), 1.0, -1.0, 0.0, 1.0, 1.0)
	f.Add(1.0, 1.0, 2.0, 0.0, 1.0, 3.0) // unstable
	f.Fuzz(func(t *testing.T, re, im, real2, zero, gain, at float64) {
		h := filter.Transfer{
			Poles: []complex128{complex(re, im), complex(re, -im), complex(real2, 0)},
			Zeros: []complex128{complex(zero, 0)},
			Gain:  gain,
		}
		y, err := Step(h, []float64{0, at})
		if err != nil {
			if !errors.Is(err, ErrGrid) && !errors.Is(err, ErrSystem) {
				t.Fatalf("unmatchable error %v", err)
			}
			return
		}
		if _, _, err := Impulse(h, []float64{0, at}); err != nil {
			t.Fatalf("Step accepted what Impulse rejects: %v", err)
		}
		stable := re < 0 && real2 < 0
		if stable && math.Abs(gain) < 1e100 && math.Abs(re) > 1e-100 && math.Abs(real2) > 1e-100 &&
			math.Abs(re) < 1e100 && math.Abs(im) < 1e100 && math.Abs(real2) < 1e100 && math.Abs(zero) < 1e100 {
			for _, v := range y {
				if math.IsNaN(v) {
					t.Fatalf("NaN step response of a stable system %v at %v", h, []float64{0, at})
				}
			}
		}
	})
}

// FuzzSweepTransfer: any transfer of a pole pair, a real pole, a jω-axis
// zero pair and a zero at the origin, swept at any three frequencies,
// gives points without a panic that equal the per-factor reference
// (sweep.go) wherever that reference is finite, whichever of the fast
// paths (sweepPlain where plainBound holds, pointPos and pointFast
// otherwise) the grid takes: to the fast path's tolerances, the phase's
// and the gain's taken relative to 1 + their size (the fuzzer reaches
// gains of thousands of dB and phases of many turns, where each path's
// rounding grows with the value it sums).
func FuzzSweepTransfer(f *testing.F) {
	f.Add(-1.0, 5.0, -2.0, 3.0, 1.0, 0.1, 1.0, 10.0)
	f.Add(-1e-3, 1e3, -1e3, 1e3, -2.0, 159.0, 159.15, 1e6)
	f.Add(-1e-150, 1e150, -1e150, 1e-150, 1e300, 1e-300, 1e150, 1e200)
	f.Add(-1.0, 1.0, -1.0, 0.0, 1.0, math.NaN(), math.Inf(1), -1.0)
	f.Fuzz(func(t *testing.T, re, im, real2, zw, gain, f1, f2, f3 float64) {
		if !(re < 0) || !(real2 < 0) || math.IsInf(re, 0) || math.IsInf(im, 0) || math.IsInf(real2, 0) || math.IsInf(zw, 0) ||
			math.IsNaN(im) || math.IsNaN(zw) || math.IsNaN(gain) || math.IsInf(gain, 0) {
			t.Skip("not a stable transfer of finite roots")
		}
		h := filter.Transfer{
			Poles: []complex128{complex(re, im), complex(re, -im), complex(real2, 0)},
			Zeros: []complex128{complex(0, zw), complex(0, -zw), 0},
			Gain:  gain,
		}
		hz := []float64{f1, f2, f3}
		got := SweepInto(make([]Point, 3), h, hz)
		want := make([]Point, 3)
		sweepTransfer(want, h, hz)
		for i := range hz {
			g, w := got[i], want[i]
			if math.IsNaN(hz[i]) {
				if !math.IsNaN(g.GainDB) || !math.IsNaN(g.PhaseDeg) || !math.IsNaN(g.DelayS) {
					t.Fatalf("NaN frequency: %+v", g)
				}
				continue
			}
			finite := !math.IsInf(w.GainDB, 0) && !math.IsNaN(w.GainDB) && !math.IsNaN(w.PhaseDeg) &&
				!math.IsInf(w.DelayS, 0) && !math.IsNaN(w.DelayS) && !math.IsInf(hz[i], 0)
			if !finite {
				continue
			}
			ds := delayScale(h, 2*math.Pi*hz[i])
			if math.Abs(g.PhaseDeg-w.PhaseDeg) > fastPhaseTolDeg*(1+math.Abs(w.PhaseDeg)) ||
				!(math.Abs(g.GainDB-w.GainDB) <= fastGainTolDB*(1+math.Abs(w.GainDB))) ||
				!(math.Abs(g.DelayS-w.DelayS) <= fastDelayTolRel*ds) {
				t.Fatalf("at %g Hz: fast %+v, reference %+v (delay scale %g)", hz[i], g, w, ds)
			}
		}
	})
}
