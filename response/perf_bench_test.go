package response

import (
	"fmt"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// perfElliptic is the 6th-order elliptic lowpass of an invented anti-alias
// mask (flat to 20 kHz within 0.5 dB, 50 dB down from 25 kHz): six poles
// and six jω-axis zeros, the filter the sweep comparison with SciPy uses.
func perfElliptic(b *testing.B) filter.Transfer {
	b.Helper()
	h, err := filter.Design(filter.Elliptic{}, filter.Spec{Band: filter.Lowpass,
		PassHz: [2]float64{20e3}, StopHz: [2]float64{25e3}, RippleDB: 0.5, AttenDB: 50})
	if err != nil {
		b.Fatal(err)
	}
	return h
}

// BenchmarkPerfSweepInto sweeps the elliptic lowpass over log grids of
// 100, 1000 and 10000 points from 1 kHz to 100 kHz into a reused dst:
// gain, phase and exact group delay at every point, no allocation.
func BenchmarkPerfSweepInto(b *testing.B) {
	var h System = perfElliptic(b) // boxed once (see BenchmarkPerfSweepIntoArg)
	for _, n := range []int{100, 1000, 10000} {
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			hz := floats.LogSpan(make([]float64, n), 1e3, 1e5)
			dst := make([]Point, n)
			b.ReportAllocs()
			for b.Loop() {
				SweepInto(dst, h, hz)
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/point")
		})
	}
}

// BenchmarkPerfSweepPaths compares, at 1000 points, the fast path SweepInto
// takes for a filter.Transfer with the per-factor reference it is tested
// against (one atan2 and one division per pole and zero).
func BenchmarkPerfSweepPaths(b *testing.B) {
	h := perfElliptic(b)
	hz := floats.LogSpan(make([]float64, 1000), 1e3, 1e5)
	dst := make([]Point, len(hz))
	b.Run("fast", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			sweepTransferFast(dst, h, hz)
		}
	})
	b.Run("perfactor", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			sweepTransfer(dst, h, hz)
		}
	})
}

// BenchmarkPerfSweepIntoArg shows what the System argument costs a caller
// that sweeps in a loop: a filter.Transfer value is boxed into the
// interface on every call (one small allocation: the parameter escapes
// through the generic path's method calls), a pointer or a System held in
// a variable is not.
func BenchmarkPerfSweepIntoArg(b *testing.B) {
	h := perfElliptic(b)
	hz := floats.LogSpan(make([]float64, 1000), 1e3, 1e5)
	dst := make([]Point, len(hz))
	b.Run("value", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			SweepInto(dst, h, hz)
		}
	})
	b.Run("pointer", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			SweepInto(dst, &h, hz)
		}
	})
	var s System = h
	b.Run("system", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			SweepInto(dst, s, hz)
		}
	})
}
