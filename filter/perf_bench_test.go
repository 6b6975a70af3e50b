package filter

import (
	"fmt"
	"math"
	"testing"
)

// Benchmarks of the design path at several sizes, for the performance
// comparison (internal/benchcmp): the cost per pole should stay flat as the
// order grows.

// perfLowpass is an invented anti-alias mask in front of a converter: flat
// to 20 kHz within 0.5 dB, 50 dB down from 25 kHz. The elliptic family
// meets it at order 6.
var perfLowpass = Spec{Band: Lowpass, PassHz: [2]float64{20e3}, StopHz: [2]float64{25e3}, RippleDB: 0.5, AttenDB: 50}

// perfBandpass is an invented 40 kHz ultrasonic receiver mask: 36 to
// 44 kHz within 1 dB, 40 dB down below 28 kHz and above 56 kHz. The
// Chebyshev family meets it at prototype order 4 (8 poles).
var perfBandpass = Spec{Band: Bandpass, PassHz: [2]float64{36e3, 44e3}, StopHz: [2]float64{28e3, 56e3}, RippleDB: 1, AttenDB: 40}

// perfOrders are the sizes of the order benchmarks.
var perfOrders = []int{2, 4, 8, 16, 32}

// butterworthMask returns a lowpass mask (1 dB to 1 kHz, 60 dB above)
// whose least Butterworth order is n: the stopband edge puts the
// closed-form estimate at n − 1/2.
func butterworthMask(n int) Spec {
	d := dbPowM1(60) / dbPowM1(1)
	sel := math.Pow(d, 1/(2*(float64(n)-0.5)))
	return Spec{Band: Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{1e3 * sel}, RippleDB: 1, AttenDB: 60}
}

// BenchmarkPerfDesignPath times the design path of the comparison with
// SciPy, MinOrder + Design + Stages, and each of its steps, for the two
// masks; StagesGainLast is Stages without the dynamic-range peak searches
// (all gain in the last stage), to show what those cost.
func BenchmarkPerfDesignPath(b *testing.B) {
	cases := []struct {
		name string
		fam  Family
		spec Spec
	}{
		{"EllipticLowpass", Elliptic{}, perfLowpass},
		{"ChebyshevBandpass", Chebyshev{}, perfBandpass},
	}
	for _, c := range cases {
		h, err := Design(c.fam, c.spec)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(c.name+"/MinOrder", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := MinOrder(c.fam, c.spec); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/Design", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Design(c.fam, c.spec); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/Stages", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := h.Stages(); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/StagesGainLast", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := h.StagesWith(StageOptions{Gain: GainLast}); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/All", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := MinOrder(c.fam, c.spec); err != nil {
					b.Fatal(err)
				}
				h, err := Design(c.fam, c.spec)
				if err != nil {
					b.Fatal(err)
				}
				if _, err := h.Stages(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkPerfPrototypeOrders times every family's prototype at orders 2
// to 32 (the elliptic family up to its MaxEllipticOrder).
func BenchmarkPerfPrototypeOrders(b *testing.B) {
	fams := []Family{Butterworth{}, Chebyshev{RippleDB: 1}, InverseChebyshev{AttenDB: 60},
		Elliptic{RippleDB: 0.5, AttenDB: 60}, Bessel{}}
	for _, f := range fams {
		for _, n := range perfOrders {
			if m, ok := f.(interface{ MaxOrder() int }); ok {
				n = min(n, m.MaxOrder())
			}
			b.Run(fmt.Sprintf("%v/%d", f, n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := f.Prototype(n); err != nil {
						b.Fatal(err)
					}
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/pole")
			})
		}
	}
}

// BenchmarkPerfDesignOrders times Design and MinOrder of Butterworth
// masks whose least order is 2 to 32.
func BenchmarkPerfDesignOrders(b *testing.B) {
	for _, n := range perfOrders {
		s := butterworthMask(n)
		if got, err := MinOrder(Butterworth{}, s); err != nil || got != n {
			b.Fatalf("mask for order %d: MinOrder %d, %v", n, got, err)
		}
		b.Run(fmt.Sprintf("Design/%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Design(Butterworth{}, s); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/pole")
		})
	}
}

// BenchmarkPerfAtHz times Transfer.AtHz of Butterworth lowpass filters of
// orders 2 to 32 (it must not allocate).
func BenchmarkPerfAtHz(b *testing.B) {
	for _, n := range perfOrders {
		p, err := Butterworth{}.Prototype(n)
		if err != nil {
			b.Fatal(err)
		}
		h, err := p.ToLowpass(1e3)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			var sink complex128
			b.ReportAllocs()
			for b.Loop() {
				sink += h.AtHz(1234.5)
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n), "ns/pole")
			_ = sink
		})
	}
}

// BenchmarkPerfStagesOrders times Stages of Chebyshev bandpass filters
// of 4 to 64 poles (prototype orders 2 to 32).
func BenchmarkPerfStagesOrders(b *testing.B) {
	for _, n := range perfOrders {
		p, err := Chebyshev{RippleDB: 1}.Prototype(n)
		if err != nil {
			b.Fatal(err)
		}
		h, err := p.ToBandpass(40e3, 8e3)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprint(2*n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := h.Stages(); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(2*n), "ns/pole")
		})
	}
}

// BenchmarkPerfTransforms times the four band transforms of the order-n
// Chebyshev prototype, n = 2 to 32.
func BenchmarkPerfTransforms(b *testing.B) {
	for _, n := range perfOrders {
		p, err := Chebyshev{RippleDB: 1}.Prototype(n)
		if err != nil {
			b.Fatal(err)
		}
		tr := []struct {
			name string
			f    func() (Transfer, error)
		}{
			{"Lowpass", func() (Transfer, error) { return p.ToLowpass(1e3) }},
			{"Highpass", func() (Transfer, error) { return p.ToHighpass(1e3) }},
			{"Bandpass", func() (Transfer, error) { return p.ToBandpass(1e3, 200) }},
			{"Bandstop", func() (Transfer, error) { return p.ToBandstop(1e3, 200) }},
		}
		for _, t := range tr {
			b.Run(fmt.Sprintf("%s/%d", t.name, n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := t.f(); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
