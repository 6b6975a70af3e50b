package series

import (
	"fmt"
	"github.com/rolloff/rolloff/internal/mcfloor"
	"math"
	"runtime"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
	"gonum.org/v1/gonum/floats"
)

// perfChain realizes the 8-pole Chebyshev bandpass of an invented 40 kHz
// ultrasonic receiver mask (36 to 44 kHz within 1 dB, 40 dB down below
// 28 kHz and above 56 kHz): four multiple-feedback bandpass stages, the
// chain the Monte Carlo figures are measured on.
func perfChain(tb testing.TB) topology.Chain {
	tb.Helper()
	h, err := filter.Design(filter.Chebyshev{}, filter.Spec{Band: filter.Bandpass,
		PassHz: [2]float64{36e3, 44e3}, StopHz: [2]float64{28e3, 56e3}, RippleDB: 1, AttenDB: 40})
	if err != nil {
		tb.Fatal(err)
	}
	st, err := h.Stages()
	if err != nil {
		tb.Fatal(err)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	if len(ch.Circuits) != 4 {
		tb.Fatalf("chain of %d circuits, want 4", len(ch.Circuits))
	}
	return ch
}

// perfHz is n log-spaced analysis frequencies from 10 kHz to 160 kHz.
func perfHz(n int) []float64 { return floats.LogSpan(make([]float64, n), 10e3, 160e3) }

// perfCoefficients draws trials sets of part values for every stage of
// chain (uniform within the customary tolerances: 1 % resistors, 5 %
// capacitors) and returns their coefficients, trials × stages.
func perfCoefficients(tb testing.TB, chain topology.Chain, trials int) []mcfloor.Biquad {
	tb.Helper()
	var coef []mcfloor.Biquad
	st := newStream()
	for i := range trials {
		st.reset(1, uint64(i))
		for _, c := range chain.Circuits {
			ev, err := newStageEval(c)
			if err != nil {
				tb.Fatal(err)
			}
			v := make([]float64, len(c.Parts))
			for k, p := range c.Parts {
				tol := 0.01
				if p.Ref[0] == 'C' {
					tol = 0.05
				}
				v[k] = p.Value * (1 + tol*(2*st.r.Float64()-1))
			}
			b, err := ev(v)
			if err != nil {
				tb.Fatal(err)
			}
			coef = append(coef, mcfloor.Biquad{N0: b.n0, N1: b.n1, N2: b.n2, D0: b.d0, D1: b.d1, D2: b.d2})
		}
	}
	return coef
}

// BenchmarkPerfMonteCarlo measures Analysis.MonteCarlo (gain only, with
// the yield against the chain's mask) of the 4-stage chain on all cores,
// at 10,000 trials and 50, 200 and 800 frequencies, beside the arithmetic
// floors of the same size (mcfloor.Power, one division per cell as the
// target states it, and mcfloor.Products, division-free). All report ns per
// (trial × frequency × stage); the Monte Carlo's also its ratio to the
// first floor measured just before it.
func BenchmarkPerfMonteCarlo(b *testing.B) {
	chain := perfChain(b)
	const trials = 10000
	spec := filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{36e3, 44e3}, StopHz: [2]float64{28e3, 56e3}, RippleDB: 1, AttenDB: 40}
	coef := perfCoefficients(b, chain, trials)
	ns := len(chain.Circuits)
	for _, nf := range []int{50, 200, 800} {
		hz := perfHz(nf)
		w2 := make([]float64, nf)
		for j, f := range hz {
			w2[j] = (2 * math.Pi * f) * (2 * math.Pi * f)
		}
		lo, hi := make([]float64, nf), make([]float64, nf)
		for j := range hi {
			hi[j] = math.Inf(1)
		}
		cells := float64(trials * nf * ns)
		var floorNs float64
		b.Run(fmt.Sprintf("floor/%d", nf), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if mcfloor.Power(coef, ns, w2, lo, hi, runtime.GOMAXPROCS(0)) != trials {
					b.Fatal("floor: a trial outside [0, +Inf)")
				}
			}
			floorNs = float64(b.Elapsed().Nanoseconds()) / float64(b.N) / cells
			b.ReportMetric(floorNs, "ns/cell")
		})
		b.Run(fmt.Sprintf("floor-products/%d", nf), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if mcfloor.Products(coef, ns, w2, lo, hi, runtime.GOMAXPROCS(0)) != trials {
					b.Fatal("floor: a trial outside [0, +Inf)")
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/cells, "ns/cell")
		})
		b.Run(fmt.Sprintf("montecarlo/%d", nf), func(b *testing.B) {
			a := Analysis{Trials: trials, Seed: 7, Hz: hz, Spec: &spec,
				Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
			b.ReportAllocs()
			for b.Loop() {
				if _, err := a.MonteCarlo(chain); err != nil {
					b.Fatal(err)
				}
			}
			per := float64(b.Elapsed().Nanoseconds()) / float64(b.N) / cells
			b.ReportMetric(per, "ns/cell")
			b.ReportMetric(float64(trials)/(float64(b.Elapsed().Seconds())/float64(b.N)), "trials/s")
			if floorNs > 0 {
				b.ReportMetric(per/floorNs, "x-floor")
			}
		})
	}
}

// BenchmarkPerfSnap snaps Chebyshev lowpass chains (1 dB, corner 10 kHz)
// of 1, 2, 4 and 8 stages to E96 resistors and E12 capacitors: the search
// is bounded per stage and across stages, so the cost per stage should stay
// near flat.
func BenchmarkPerfSnap(b *testing.B) {
	for _, n := range []int{2, 4, 8, 16} {
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
		ch, err := topology.Realize(st, topology.Options{})
		if err != nil {
			b.Fatal(err)
		}
		pol := Policy{Resistors: E96, Capacitors: E12, Passband: []Band{{100, 10e3}}}
		b.Run(fmt.Sprint(len(st)), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Snap(ch, pol); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(st)), "ns/stage")
		})
	}
}
