package series_test

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// fuzzChain is a small realized chain (a 3rd-order Chebyshev lowpass at
// 1 kHz: a Sallen-Key stage and an RC stage) shared by the fuzz runs.
var fuzzChain = func() topology.Chain {
	h, err := filter.Design(filter.Chebyshev{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{3e3}, RippleDB: 1, AttenDB: 30})
	if err != nil {
		panic(err)
	}
	st, err := h.Stages()
	if err != nil {
		panic(err)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		panic(err)
	}
	return ch
}()

// FuzzMonteCarlo runs seeded Monte Carlo analyses with arbitrary options
// (trial count kept small so that one execution stays short): never a
// panic; errors wrap ErrPolicy, ErrChain or filter.ErrSpec; results are
// consistent (Passed + Failed ≤ Trials, Yield = Passed/Trials in [0, 1],
// finite nominal gains, percentiles ordered) and bit-identical with 1 and
// 3 workers.
func FuzzMonteCarlo(f *testing.F) {
	f.Add(uint16(64), uint64(1), uint8(0), 0.01, 0.05, 1e3, 3e3, 50.0, 0.001, true)
	f.Add(uint16(7), uint64(0), uint8(1), 0.0, 0.0, 1.0, 1e9, 99.5, 0.0, false)
	f.Add(uint16(1), uint64(1<<63), uint8(2), 0.99, 0.999, 1e-300, 1e300, 100.0, 1e300, true)
	f.Add(uint16(300), uint64(42), uint8(1), -0.1, math.NaN(), math.Inf(1), 0.0, -1.0, math.NaN(), false)
	f.Fuzz(func(t *testing.T, trials uint16, seed uint64, dist uint8, rtol, ctol, f1, f2, pct, slack float64, withSpec bool) {
		a := series.Analysis{
			Trials: int(trials % 400), Seed: seed, Dist: series.Distribution(dist % 3),
			Tolerances: series.Tolerances{Resistor: rtol, Capacitor: ctol, Override: rtol == 0},
			Hz:         []float64{f1, f2}, Percentiles: []float64{pct, 50}, Moments: true, SlackDB: slack,
		}
		if withSpec {
			a.Spec = &filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{f1}, StopHz: [2]float64{f2}, RippleDB: 1, AttenDB: 30}
		}
		a.Workers = 1
		s1, err := a.MonteCarlo(fuzzChain)
		if err != nil {
			if !errors.Is(err, series.ErrPolicy) && !errors.Is(err, series.ErrChain) && !errors.Is(err, filter.ErrSpec) {
				t.Fatalf("%+v: error %v wraps no documented sentinel", a, err)
			}
			return
		}
		a.Workers = 3
		s3, err := a.MonteCarlo(fuzzChain)
		if err != nil {
			t.Fatalf("3 workers fail where 1 succeeds: %v", err)
		}
		n := a.Trials
		if n == 0 {
			n = 1000
		}
		if s1.Trials != n || s1.Passed+s1.Failed > s1.Trials || !(s1.Yield >= 0 && s1.Yield <= 1) || s1.Yield != float64(s1.Passed)/float64(s1.Trials) {
			t.Fatalf("inconsistent counts: %+v", s1)
		}
		for j, g := range s1.NominalDB {
			if math.IsNaN(g) || math.IsInf(g, 1) {
				t.Fatalf("nominal gain %g at %g Hz", g, s1.Hz[j])
			}
			if s1.Failed < s1.Trials && math.IsNaN(s1.MeanDB[j]) {
				t.Fatalf("mean gain NaN at %g Hz (nominal %g dB)", s1.Hz[j], g)
			}
		}
		if s1.Failed < s1.Trials && len(s1.EnvelopeDB) == 2 {
			for j := range s1.Hz {
				lo, hi := s1.EnvelopeDB[0][j], s1.EnvelopeDB[1][j]
				if pct <= 50 && lo > hi || pct > 50 && lo < hi {
					t.Fatalf("percentiles %v out of order at %g Hz: %g, %g", a.Percentiles, s1.Hz[j], lo, hi)
				}
			}
		}
		same := func(a, b []float64) bool {
			return slices.EqualFunc(a, b, func(x, y float64) bool { return math.Float64bits(x) == math.Float64bits(y) })
		}
		ok := s1.Passed == s3.Passed && s1.Failed == s3.Failed && same(s1.MeanDB, s3.MeanDB) && same(s1.StdDB, s3.StdDB)
		for i := range s1.EnvelopeDB {
			ok = ok && same(s1.EnvelopeDB[i], s3.EnvelopeDB[i])
		}
		if !ok {
			t.Fatalf("%+v: 1 and 3 workers differ", a)
		}
	})
}
