package response

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// StepStats are the figures of a step response: its final value, overshoot,
// rise time and settling time.
type StepStats struct {
	FinalValue   float64 // y(∞) = H(0)
	OvershootPct float64 // 100·(peak − final)/|final|; 0 when the response never passes its final value
	PeakS        float64 // time of the largest value, seconds; 0 when there is no overshoot
	RiseS        float64 // 10 % to 90 % rise time: between the first times y/final reaches 0.1 and 0.9, seconds
	SettleS      float64 // time after which |y/final − 1| stays within the band, seconds
}

// Limits of the sampling of MeasureStep.
const (
	stepHorizon    = 40 // the horizon is (stepHorizon + 10·(m−1))/σ_min: e^{−40} ≈ 4e-18
	stepPerCycle   = 64 // samples per cycle of the fastest pole
	stepMinSamples = 4096
	stepMaxSamples = 1 << 18
)

// MeasureStep returns the overshoot, rise time and settling time into
// ±band (a fraction of the final value, in [1e-9, 1), e.g. 0.01 for 1 %)
// of the exact step response of h (see StepInto). The response is sampled
// uniformly up to a horizon where every mode has decayed by e^{−40}, at 64
// samples per cycle of the fastest pole (4096 to 2¹⁸ samples), and every
// figure is refined between samples on the exact response: crossings by
// bisection to 1e-12 relative, the peak by golden-section search. A systems
// whose poles spread over more than about three decades is sampled more
// coarsely than that rule asks for its fastest modes (which have died out
// long before the slow ones settle).
//
// Errors wrap ErrGrid for a bad band, and ErrSystem for a transfer that
// StepInto rejects, one with a pole on or right of the jω axis (no final
// value) or one whose final value H(0) is zero (a highpass or bandpass, for
// which the percentages are undefined).
func MeasureStep(h filter.Transfer, band float64) (StepStats, error) {
	if !(band >= 1e-9 && band < 1) {
		return StepStats{}, fmt.Errorf("response: settling band %g is not in [1e-9, 1): %w", band, ErrGrid)
	}
	m, err := newModal(h, true)
	if err != nil {
		return StepStats{}, err
	}
	sigma, wmax := math.Inf(1), 0.0
	for i, p := range h.Poles {
		if !(real(p) < 0) {
			return StepStats{}, fmt.Errorf("response: pole Poles[%d] = %v is not in the left half-plane: %w", i, p, ErrSystem)
		}
		sigma = math.Min(sigma, -real(p))
		wmax = math.Max(wmax, cmplx.Abs(p))
	}
	final := h.At(0)
	fv := real(final)
	if fv == 0 || math.IsNaN(fv) || math.IsInf(fv, 0) {
		return StepStats{}, fmt.Errorf("response: step final value H(0) = %g has no percentages: %w", fv, ErrSystem)
	}
	mmax := 1
	for _, md := range m.modes {
		mmax = max(mmax, len(md.c))
	}
	tEnd := (stepHorizon + 10*float64(mmax-1)) / sigma
	n := int(math.Ceil(tEnd * wmax / (2 * math.Pi) * stepPerCycle))
	n = min(max(n, stepMinSamples), stepMaxSamples)
	dt := tEnd / float64(n-1)
	v := func(t float64) float64 { return m.at(t) / fv }
	st := StepStats{FinalValue: fv}
	ts := func(i int) float64 { return float64(i) * dt }
	vs := make([]float64, n)
	for i := range vs {
		vs[i] = v(ts(i))
	}
	// Rise time.
	first := func(level float64) float64 {
		for i := range vs {
			if vs[i] >= level {
				if i == 0 {
					return 0
				}
				return bisectTime(func(t float64) float64 { return v(t) - level }, ts(i-1), ts(i))
			}
		}
		return math.NaN()
	}
	st.RiseS = first(0.9) - first(0.1)
	// Overshoot.
	imax := 0
	for i := range vs {
		if vs[i] > vs[imax] {
			imax = i
		}
	}
	if vs[imax] > 1 {
		tp, vp := goldenTime(v, ts(max(imax-1, 0)), ts(min(imax+1, n-1)))
		if vp < vs[imax] {
			tp, vp = ts(imax), vs[imax]
		}
		st.PeakS, st.OvershootPct = tp, 100*(vp-1)
	}
	// Settling time.
	last := -1
	for i := range vs {
		if math.Abs(vs[i]-1) > band {
			last = i
		}
	}
	switch {
	case last == n-1:
		return StepStats{}, fmt.Errorf("response: step response not settled to %g by %g s: %w", band, tEnd, ErrSystem)
	case last >= 0:
		st.SettleS = bisectTime(func(t float64) float64 { return math.Abs(v(t)-1) - band }, ts(last), ts(last+1))
	}
	return st, nil
}

// bisectTime refines a sign change of g between a (g > 0 or g < 0) and b,
// to 1e-12 relative.
func bisectTime(g func(float64) float64, a, b float64) float64 {
	ga := g(a)
	for range 200 {
		if b-a <= 1e-12*math.Abs(b) {
			break
		}
		m := (a + b) / 2
		gm := g(m)
		if gm == 0 {
			return m
		}
		if (gm > 0) == (ga > 0) {
			a, ga = m, gm
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

// goldenTime maximizes g over [a, b].
func goldenTime(g func(float64) float64, a, b float64) (float64, float64) {
	const r = 0.6180339887498949
	c, d := b-r*(b-a), a+r*(b-a)
	gc, gd := g(c), g(d)
	for range goldenIters {
		if gc >= gd {
			b, d, gd = d, c, gc
			c = b - r*(b-a)
			gc = g(c)
		} else {
			a, c, gc = c, d, gd
			d = a + r*(b-a)
			gd = g(d)
		}
	}
	if gc >= gd {
		return c, gc
	}
	return d, gd
}
