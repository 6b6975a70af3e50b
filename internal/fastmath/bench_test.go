package fastmath

import (
	"math"
	"testing"
)

// Benchmarks of each function beside the math package's, over 1024
// arguments of the kind the sweep passes (|P|² of a few decades, points
// all round the circle), so that branches are not all predicted from one
// value.

var sink float64

func benchArgs() (xs []float64, ys []float64) {
	for i := range 1024 {
		th := float64(i) * 2 * math.Pi / 1024 * 7
		r := math.Pow(10, float64(i%97)/10-5)
		xs = append(xs, r*math.Cos(th))
		ys = append(ys, r*math.Sin(th))
	}
	return xs, ys
}

func BenchmarkLog10(b *testing.B) {
	xs, ys := benchArgs()
	for i := range xs {
		xs[i] = xs[i]*xs[i] + ys[i]*ys[i]
	}
	b.Run("fastmath", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for _, x := range xs {
				s += Log10(x)
			}
		}
		sink = s
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(xs)), "ns/call")
	})
	b.Run("math", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for _, x := range xs {
				s += math.Log10(x)
			}
		}
		sink = s
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(xs)), "ns/call")
	})
}

func BenchmarkAtan2(b *testing.B) {
	xs, ys := benchArgs()
	b.Run("fastmath", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for i, x := range xs {
				s += Atan2(ys[i], x)
			}
		}
		sink = s
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(xs)), "ns/call")
	})
	b.Run("math", func(b *testing.B) {
		s := 0.0
		for b.Loop() {
			for i, x := range xs {
				s += math.Atan2(ys[i], x)
			}
		}
		sink = s
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(xs)), "ns/call")
	})
}
