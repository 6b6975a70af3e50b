package response

import (
	"fmt"
	"testing"

	"gonum.org/v1/gonum/floats"
)

// BenchmarkSweepInto sweeps an 8th-order Butterworth into a caller's slice
// (no allocations), exact path and black-box (numeric delay) path, at
// 100, 1000 and 10000 points: the time per point is constant.
func BenchmarkSweepInto(b *testing.B) {
	for _, kind := range []string{"transfer", "blackbox"} {
		var s System = butterworth(8, 1000)
		if kind == "blackbox" {
			s = blackBox{butterworth(8, 1000)}
		}
		for _, n := range []int{100, 1000, 10000} {
			hz := floats.LogSpan(make([]float64, n), 1, 1e5)
			dst := make([]Point, n)
			b.Run(fmt.Sprintf("%s/%d", kind, n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					SweepInto(dst, s, hz)
				}
			})
		}
	}
}

// BenchmarkStepInto computes 1000 samples of the exact step response of
// Butterworth filters of order 4, 8 and 16 into a caller's slice.
func BenchmarkStepInto(b *testing.B) {
	ts := floats.Span(make([]float64, 1000), 0, 0.01)
	dst := make([]float64, len(ts))
	for _, n := range []int{4, 8, 16} {
		h := butterworth(n, 1000)
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := StepInto(dst, h, ts); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkCheckMask(b *testing.B) {
	h := butterworth(8, 1000)
	spec := maskSpecForBench
	b.ReportAllocs()
	for b.Loop() {
		if _, err := CheckMask(h, spec); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCrossingHz(b *testing.B) {
	h := butterworth(8, 1000)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := CrossingHz(h, -HalfPowerDB, 1, 1e5); err != nil {
			b.Fatal(err)
		}
	}
}
