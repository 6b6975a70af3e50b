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
