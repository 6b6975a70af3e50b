package topology

import (
	"fmt"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// Benchmarks at several sizes for the performance comparison
// (internal/benchcmp): Realize and Chain.AtHz should cost the same per
// stage whatever the number of stages.

// perfStages returns the stages of the Chebyshev lowpass (1 dB ripple,
// corner 10 kHz) of order n: n/2 second-order stages (and a first-order one
// for odd n).
func perfStages(b *testing.B, n int) []filter.Stage {
	b.Helper()
	p, err := filter.Chebyshev{RippleDB: 1}.Prototype(n)
	if err != nil {
		b.Fatal(err)
	}
	h, err := p.ToLowpass(10e3)
	if err != nil {
		b.Fatal(err)
	}
	st, err := h.Stages()
	if err != nil {
		b.Fatal(err)
	}
	return st
}

// perfOrders are the filter orders of the size benchmarks: 1 to 8 stages
// (order 32 has a stage of Q 76, beyond a Sallen-Key with default parts).
var perfOrders = []int{2, 4, 8, 16}

// BenchmarkPerfRealize realizes whole chains with the default kinds.
func BenchmarkPerfRealize(b *testing.B) {
	for _, n := range perfOrders {
		st := perfStages(b, n)
		b.Run(fmt.Sprint(len(st)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Realize(st, Options{}); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(st)), "ns/stage")
		})
	}
}

// BenchmarkPerfChainAtHz evaluates realized chains of 1 to 16 stages at
// one frequency (one nodal analysis per stage; it must not allocate).
func BenchmarkPerfChainAtHz(b *testing.B) {
	for _, n := range perfOrders {
		st := perfStages(b, n)
		ch, err := Realize(st, Options{})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprint(len(st)), func(b *testing.B) {
			var sink complex128
			b.ReportAllocs()
			for b.Loop() {
				sink += ch.AtHz(9.5e3)
			}
			_ = sink
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(st)), "ns/stage")
		})
	}
}

// BenchmarkPerfCircuitSweep evaluates one Sallen-Key lowpass circuit at
// 100, 1000 and 10000 frequencies (Circuit.AtHz per point).
func BenchmarkPerfCircuitSweep(b *testing.B) {
	c, err := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7071, Gain: 1}, Options{Kind: SallenKey})
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int{100, 1000, 10000} {
		hz := make([]float64, n)
		for i := range hz {
			hz[i] = 10 + float64(i)*(1e5/float64(n))
		}
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			var sink complex128
			b.ReportAllocs()
			for b.Loop() {
				for _, f := range hz {
					sink += c.AtHz(f)
				}
			}
			_ = sink
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/point")
		})
	}
}
