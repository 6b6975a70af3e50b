package filter

import (
	"errors"
	"math"
	"math/cmplx"
	"slices"
	"testing"

	"pgregory.net/rapid"
)

// TestStagePowerPeak checks the closed-form peak of a unit stage against
// a dense log sweep of its complex transfer function refined by golden
// sections (the reference search of peakref_test.go): equal to 1e-12
// relative, for every kind, Q from 0.05 to 500 and notch zeros either
// side of ω0.
func TestStagePowerPeak(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		f0 := math.Exp(rapid.Float64Range(math.Log(1e-3), math.Log(1e8)).Draw(t, "lnF0"))
		s := Stage{Order: 2, F0Hz: f0, Gain: 1}
		if rapid.IntRange(0, 5).Draw(t, "order") == 0 {
			s.Order = 1
			s.Kind = rapid.SampledFrom([]StageKind{LowpassStage, HighpassStage}).Draw(t, "kind1")
		} else {
			s.Kind = rapid.SampledFrom([]StageKind{LowpassStage, HighpassStage, BandpassStage, NotchStage}).Draw(t, "kind")
			s.Q = math.Exp(rapid.Float64Range(math.Log(0.05), math.Log(500)).Draw(t, "lnQ"))
			if s.Kind == NotchStage {
				s.ZeroHz = f0 * math.Exp(rapid.Float64Range(-3, 3).Draw(t, "lnZ"))
			}
		}
		p := newStagePower(s)
		got := math.Sqrt(p.peak())
		h := s.Transfer()
		want := peakMag(h, func(w float64) float64 { return cmplxAbs(h.At(complex(0, w))) })
		// The limit at infinity, which the reference's grid reaches only
		// approximately.
		if s.Kind == NotchStage {
			want = math.Max(want, (s.F0Hz/s.ZeroHz)*(s.F0Hz/s.ZeroHz))
		}
		if s.Kind == HighpassStage {
			want = math.Max(want, 1)
		}
		if math.Abs(got-want) > 1e-12*want {
			t.Fatalf("%+v: closed-form peak %.17g, search %.17g", s, got, want)
		}
	})
}

func cmplxAbs(v complex128) float64 { return math.Hypot(real(v), imag(v)) }

// genUnitStage draws a unit stage of every kind: Q from 0.05 to 500, notch
// zeros up to a factor e³ either side of ω0, F0Hz from 1 mHz to 100 MHz.
func genUnitStage(t *rapid.T) Stage {
	f0 := math.Exp(rapid.Float64Range(math.Log(1e-3), math.Log(1e8)).Draw(t, "lnF0"))
	s := Stage{Order: 2, F0Hz: f0, Gain: 1}
	if rapid.IntRange(0, 5).Draw(t, "order") == 0 {
		s.Order = 1
		s.Kind = rapid.SampledFrom([]StageKind{LowpassStage, HighpassStage}).Draw(t, "kind1")
		return s
	}
	s.Kind = rapid.SampledFrom([]StageKind{LowpassStage, HighpassStage, BandpassStage, NotchStage}).Draw(t, "kind")
	s.Q = math.Exp(rapid.Float64Range(math.Log(0.05), math.Log(500)).Draw(t, "lnQ"))
	if s.Kind == NotchStage {
		s.ZeroHz = f0 * math.Exp(rapid.Float64Range(-3, 3).Draw(t, "lnZ"))
	}
	return s
}

// TestStagePowerSlope checks stagePower.slope: its |H|² against the
// stage's complex transfer function (to 1e-14 times 4 plus the slope), its
// log slope against Richardson-extrapolated central differences
// of ln at in ln ω, and its curvature against the same differences of its
// slope, on both sides of ω0 and away from a notch's zero by at least 1%.
func TestStagePowerSlope(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		st := genUnitStage(t)
		p := newStagePower(st)
		y := math.Log(p.w0) + rapid.Float64Range(-6, 6).Draw(t, "lnW")
		// The scale on which the slope changes: 1/Q near a resonance, the
		// distance to a notch's zero near one.
		width := 1.0
		if st.Order == 2 {
			width = min(width, st.Q, 1/st.Q)
		}
		if st.Kind == NotchStage {
			dz := math.Abs(y - math.Log(2*math.Pi*st.ZeroHz))
			if dz < 1e-2 {
				t.Skip("at a notch's zero")
			}
			width = min(width, dz)
		}
		at := func(y float64) (g, s, c float64) {
			w := math.Exp(y)
			return p.slope(w, 1/w)
		}
		// d/dy of f by central differences at steps h and h/2, extrapolated.
		diff := func(f func(float64) float64, h float64) float64 {
			d1 := (f(y+h) - f(y-h)) / (2 * h)
			d2 := (f(y+h/2) - f(y-h/2)) / h
			return (4*d2 - d1) / 3
		}
		h := 1e-3 * width
		w := math.Exp(y)
		g, s, c := p.slope(w, 1/w)
		hw := cmplxAbs(st.Transfer().At(complex(0, w)))
		// Both round ω/ω0 to a few ulps, which moves |H|² by the log slope
		// times that (about Q near a resonance).
		if want := hw * hw; math.Abs(g-want) > 1e-14*(4+math.Abs(s))*want {
			t.Fatalf("%+v at %g rad/s: |H|² %.17g, transfer function %.17g", st, w, g, want)
		}
		ds := diff(func(y float64) float64 { g, _, _ := at(y); return math.Log(g) }, h)
		if math.Abs(ds-s) > 1e-7*(math.Abs(s)+1/width) {
			t.Fatalf("%+v at %g rad/s: slope %.12g, differences %.12g", st, w, s, ds)
		}
		dc := diff(func(y float64) float64 { _, s, _ := at(y); return s }, h)
		if math.Abs(dc-c) > 1e-7*(math.Abs(c)+1/(width*width)) {
			t.Fatalf("%+v at %g rad/s: curvature %.12g, differences %.12g", st, w, c, dc)
		}
	})
}

// TestCascadePeaksReference checks the peaks of the unit stages' partial
// cascades, cascadePeaks, against the original search (peakref_test.go:
// complex evaluation of the whole cascade on the original, denser grid,
// golden sections to 1e-13) for designs of every family and band: equal to
// 1e-11 relative, so the coarser grid misses no maximum the original finds.
// The first stage's peak, in closed form, is TestStagePowerPeak's (the
// reference's grid, from a hundredth of the lowest pole, can miss a notch's
// stationary point far below, 3e-11 above its DC gain in one case found).
func TestCascadePeaksReference(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h, _, _ := genDesign(t)
		stages, err := h.StagesWith(StageOptions{Gain: GainLast})
		if err != nil {
			t.Fatal(err)
		}
		checkCascadePeaks(t, h, stages)
	})
}

// genTransfer draws a transfer function no family designs: one to four
// pole pairs of Q 0.3 to 30 over two decades, maybe a real pole, jω zero
// pairs for up to all the pairs and up to two zeros at the origin, for
// peaks the families' designs do not make (resonances close together,
// notches between them, lowpass and highpass sections mixed).
func genTransfer(t *rapid.T) Transfer {
	var h Transfer
	pairs := rapid.IntRange(1, 4).Draw(t, "pairs")
	for i := range pairs {
		w0 := math.Exp(rapid.Float64Range(0, math.Log(100)).Draw(t, "lnW0"+itoa(i)))
		q := math.Exp(rapid.Float64Range(math.Log(0.3), math.Log(30)).Draw(t, "lnQ"+itoa(i)))
		re := -w0 / (2 * q)
		im := math.Sqrt(w0*w0 - re*re)
		if !(im > 0) {
			t.Skip("a real pair")
		}
		h.Poles = append(h.Poles, complex(re, im), complex(re, -im))
	}
	if rapid.Bool().Draw(t, "real") {
		h.Poles = append(h.Poles, complex(-math.Exp(rapid.Float64Range(0, math.Log(100)).Draw(t, "lnReal")), 0))
	}
	for i := range rapid.IntRange(0, pairs).Draw(t, "notches") {
		wz := math.Exp(rapid.Float64Range(-1, math.Log(100)+1).Draw(t, "lnWz"+itoa(i)))
		h.Zeros = append(h.Zeros, complex(0, wz), complex(0, -wz))
	}
	for range rapid.IntRange(0, 2).Draw(t, "origin") {
		h.Zeros = append(h.Zeros, 0)
	}
	h.Gain = 1
	return h
}

// TestCascadePeaksOutside is TestCascadePeaksReference for the transfer
// functions of genTransfer.
func TestCascadePeaksOutside(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := genTransfer(t)
		stages, err := h.StagesWith(StageOptions{Gain: GainLast})
		if errors.Is(err, ErrStage) {
			t.Skip(err) // more zeros than the stages can take
		}
		if err != nil {
			t.Fatal(err)
		}
		checkCascadePeaks(t, h, stages)
	})
}

// checkCascadePeaks checks cascadePeaks for the unit stages of stages (from
// h) against the original search, from the second stage's cascade on (the
// first's peak is in closed form, TestStagePowerPeak's): equal to 1e-11
// relative.
func checkCascadePeaks(t *rapid.T, h Transfer, stages []Stage) {
	unit := slices.Clone(stages)
	for i := range unit {
		unit[i].Gain = 1
	}
	got := cascadePeaks(unit, h, make([]float64, len(unit)))
	for k := 1; k < len(unit); k++ {
		want := peakMag(h, func(w float64) float64 { return cmplx.Abs(cascade(unit, k+1, w/(2*math.Pi))) })
		if math.Abs(got[k]-want) > 1e-11*want {
			t.Fatalf("%v: cascade of %d peaks at %.15g, reference %.15g (%.3g relative)", unit, k+1, got[k], want, got[k]/want-1)
		}
	}
}
