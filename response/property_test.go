package response

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats"
	"pgregory.net/rapid"
)

// TestPropPhaseContinuous: on a coarse grid (8 points a decade) the exact
// factor-sum phase of a filter.Transfer and the unwrapped phase of the same
// system seen as a black box (with its bisection between grid points) agree
// up to a constant multiple of 360°: both are the continuous phase. Zeros
// on the jω axis are excluded (the phase jumps there by definition).
func TestPropPhaseContinuous(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 4, false, -1, 4)
		hz := floats.LogSpan(make([]float64, 49), 1e-2, 1e4)
		a, b := Sweep(h, hz), Sweep(blackBox{h}, hz)
		off := 360 * math.Round((a[0].PhaseDeg-b[0].PhaseDeg)/360)
		for i := range a {
			if d := a[i].PhaseDeg - b[i].PhaseDeg - off; math.Abs(d) > 1e-8 {
				t.Fatalf("at %g Hz: exact phase %.12g°, unwrapped black box %.12g° (offset %g°)",
					hz[i], a[i].PhaseDeg, b[i].PhaseDeg, off)
			}
		}
	})
}

// TestPropDelayIsPhaseSlope: the analytic delay of a Sweep equals minus the
// slope of its phase, and the numeric delay of the black-box path agrees
// with the analytic one to 1e-8 where no pole or zero is within 2 % of j2πf
// (the accuracy SweepInto states is 1e-8 from 1 %).
//
// The reference slope is a Richardson-extrapolated central difference with a
// step scaled to the distance r of the nearest root (h = 1e-3·r relative):
// its truncation error is of order (h/r)⁴ = 1e-12 whatever r is, and the
// rounding of the phase (≈ 1e-14 rad) contributes ≈ 1e-14/(h·ω) ≤ 1e-9 of
// the scale |delay| + 1/ω. A fixed step would not do: the truncation error
// of a plain central difference grows as (h·ω/r)², 1e-7 at r = 3 %.
func TestPropDelayIsPhaseSlope(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 4, true, -1, 4)
		f := math.Pow(10, rapid.Float64Range(-1, 4).Draw(t, "f"))
		near := math.Inf(1)
		for _, r := range append(append([]complex128{}, h.Poles...), h.Zeros...) {
			near = math.Min(near, math.Hypot(real(r), imag(r)-2*math.Pi*f)/(2*math.Pi*f))
		}
		if near < 0.02 {
			return // a root next to j2πf: the phase may jump (jω zero) or bend too fast
		}
		d := 1e-3 * math.Min(near, 1)
		central := func(d float64) float64 {
			p := Sweep(h, []float64{f * (1 - d), f * (1 + d)})
			return -(p[1].PhaseDeg - p[0].PhaseDeg) * math.Pi / 180 / (2 * math.Pi * 2 * d * f)
		}
		slope := (4*central(d/2) - central(d)) / 3
		p := Sweep(h, []float64{f})
		scale := math.Abs(p[0].DelayS) + 1/(2*math.Pi*f)
		if e := math.Abs(slope-p[0].DelayS) / scale; e > 1e-8 {
			t.Fatalf("at %g Hz: delay %.12g s, phase slope %.12g s (error %.2g, nearest root %.3g)",
				f, p[0].DelayS, slope, e, near)
		}
		nb := Sweep(blackBox{h}, []float64{f})[0]
		if e := math.Abs(nb.DelayS-p[0].DelayS) / scale; e > 1e-8 {
			t.Fatalf("at %g Hz: numeric delay %.15g s, analytic %.15g s (error %.2g, nearest root %.3g)",
				f, nb.DelayS, p[0].DelayS, e, near)
		}
	})
}

// TestPropStepFinalValue: a stable system's step response settles to H(0).
func TestPropStepFinalValue(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 4, true, -1, 3)
		sigma := math.Inf(1)
		for _, p := range h.Poles {
			sigma = math.Min(sigma, -real(p))
		}
		ts := floats.Span(make([]float64, 400), 0, 80/sigma)
		y, err := Step(h, ts)
		if err != nil {
			t.Fatal(err)
		}
		want := real(h.At(0))
		if e := math.Abs(y[len(y)-1] - want); e > 1e-10*maxAbs(y) {
			t.Fatalf("y(∞) = %.15g, H(0) = %.15g (peak |y| %g)", y[len(y)-1], want, maxAbs(y))
		}
	})
}

// TestPropImpulseIntegratesToStep: the Dirac weight plus the integral of
// the regular impulse response (composite Simpson rule on 4000 intervals
// over a few time constants; error ≈ (ω·dt)⁴/180 ≈ 1e-9 for these pole
// spreads) equals the step response.
func TestPropImpulseIntegratesToStep(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 3, true, 0, 1)
		sigma, wmax := math.Inf(1), 0.0
		for _, p := range h.Poles {
			sigma = math.Min(sigma, -real(p))
			wmax = math.Max(wmax, math.Hypot(real(p), imag(p)))
		}
		const n = 4000
		tEnd := math.Min(5/sigma, 100/wmax)
		ts := floats.Span(make([]float64, n+1), 0, tEnd)
		imp, dirac, err := Impulse(h, ts)
		if err != nil {
			t.Fatal(err)
		}
		y, err := Step(h, []float64{0, tEnd})
		if err != nil {
			t.Fatal(err)
		}
		dt := tEnd / n
		sum := imp[0] + imp[n]
		for i := 1; i < n; i++ {
			sum += float64(2+2*(i%2)) * imp[i]
		}
		got := dirac + sum*dt/3
		peak := maxAbs(imp)*tEnd + math.Abs(dirac)
		if math.Abs(got-y[1]) > 1e-7*peak {
			t.Fatalf("∫h + D = %.12g, step %.12g (scale %g)", got, y[1], peak)
		}
		// nearTol: the accuracy StepInto states, also for poles that
		// nearly coincide (two real poles may be drawn 1e-5 apart, pole
		// pairs at the same frequency with nearby Q).
		const nearTol = 1e-12
		if math.Abs(y[0]-dirac) > nearTol*(math.Abs(dirac)+peak) {
			t.Fatalf("step(0) = %g, want the Dirac weight %g", y[0], dirac)
		}
	})
}

// TestPropCrossing: CrossingHz returns a frequency where the gain equals the
// level (to the 1e-12 relative frequency accuracy times the slope), and a
// dense independent grid shows no earlier crossing.
func TestPropCrossing(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := stableTransfer(t, 3, false, 0, 3)
		const lo, hi = 1.0, 1e4
		e, err := GainExtremes(h, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		if e.RippleDB() < 1e-3 {
			return
		}
		level := e.MinDB + rapid.Float64Range(0.01, 0.99).Draw(t, "level")*e.RippleDB()
		f, err := CrossingHz(h, level, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		below, above := gainDB(h.AtHz(f*(1-1e-12)))-level, gainDB(h.AtHz(f*(1+1e-12)))-level
		if below*above > 0 && math.Abs(gainDB(h.AtHz(f))-level) > 1e-12*math.Abs(level) {
			t.Fatalf("no crossing of %.15g dB within 1e-12 of %.15g Hz: gain − level %g, %g", level, f, below, above)
		}
		dense := floats.LogSpan(make([]float64, 8001), lo, f*(1-1e-9))
		s0 := gainDB(h.AtHz(lo)) > level
		for _, x := range dense {
			if (gainDB(h.AtHz(x)) > level) != s0 {
				t.Fatalf("crossing found at %g Hz, but the gain crosses %g dB already at %g Hz", f, level, x)
			}
		}
	})
}
