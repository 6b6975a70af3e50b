package mna

import (
	"fmt"
	"testing"
)

func BenchmarkTransfer(b *testing.B) {
	for _, n := range []int{1, 2, 4, 8} {
		b.Run(fmt.Sprint("sections=", n), func(b *testing.B) {
			net := ladder(n)
			vals := make([]float64, 2*n)
			for i := range vals {
				vals[i] = 1e3
				if i%2 == 1 {
					vals[i] = 1e-8
				}
			}
			var w Workspace
			b.ReportAllocs()
			for b.Loop() {
				_, _, _ = w.Transfer(&net, vals, Amp{}, complex(0, 1e4))
			}
		})
	}
}

func BenchmarkCoefficients(b *testing.B) {
	for _, n := range []int{1, 2} {
		b.Run(fmt.Sprint("sections=", n), func(b *testing.B) {
			net := ladder(n)
			vals := []float64{1e3, 1e-8, 2e3, 1e-8}[:2*n]
			num, den := make([]float64, n+1), make([]float64, n+1)
			var w Interpolator
			b.ReportAllocs()
			for b.Loop() {
				_ = w.Coefficients(&net, vals, Amp{}, 1e5, num, den)
			}
		})
	}
}

// BenchmarkFixedInterpolator compares Interpolator.Coefficients with the
// replayed FixedInterpolator.Coefficients on a multiple-feedback bandpass.
func BenchmarkFixedInterpolator(b *testing.B) {
	vals := []float64{10e3, 2e3, 1e-8, 1e-8, 100e3}
	r := RadiusOf(&mfbBandpass, vals)
	num, den := make([]float64, 3), make([]float64, 3)
	b.Run("general", func(b *testing.B) {
		var w Interpolator
		b.ReportAllocs()
		for b.Loop() {
			_ = w.Coefficients(&mfbBandpass, vals, Amp{}, r, num, den)
		}
	})
	b.Run("fixed", func(b *testing.B) {
		f, err := NewFixedInterpolator(&mfbBandpass, vals, Amp{}, r, 3)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportAllocs()
		for b.Loop() {
			_ = f.Coefficients(vals, num, den)
		}
	})
	b.Run("lanes", func(b *testing.B) {
		f, err := NewFixedInterpolator(&mfbBandpass, vals, Amp{}, r, 3)
		if err != nil {
			b.Fatal(err)
		}
		lv := make([][]float64, Lanes)
		for l := range lv {
			lv[l] = vals
		}
		var ln, ld [Lanes][]float64
		for l := range ln {
			ln[l], ld[l] = make([]float64, 3), make([]float64, 3)
		}
		var lerr [Lanes]error
		b.ReportAllocs()
		for b.Loop() {
			f.CoefficientsLanes(lv, ln[:], ld[:], lerr[:])
		}
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/Lanes, "ns/set")
	})
}
