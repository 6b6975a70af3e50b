package filter

import (
	"math"
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
