package robust_test

import (
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// bits collects the float64s of results as their bit patterns, for
// bit-for-bit comparison (math.Float64bits: −0 and 0 differ, and NaNs
// compare by payload).
type bits []uint64

func (b *bits) f(xs ...float64) {
	for _, x := range xs {
		*b = append(*b, math.Float64bits(x))
	}
}

func (b *bits) c(zs ...complex128) {
	for _, z := range zs {
		b.f(real(z), imag(z))
	}
}

func (b *bits) transfer(h filter.Transfer) { b.c(h.Zeros...); b.c(h.Poles...); b.f(h.Gain) }

func (b *bits) stages(st []filter.Stage) {
	for _, s := range st {
		b.f(float64(s.Kind), float64(s.Order), s.F0Hz, s.Q, s.ZeroHz, s.Gain)
	}
}

func (b *bits) chain(ch topology.Chain) {
	for _, c := range ch.Circuits {
		b.f(float64(c.Kind))
		b.stages([]filter.Stage{c.Stage})
		for _, p := range c.Parts {
			b.f(p.Value)
		}
	}
}

func (b *bits) spread(s series.Spread) {
	b.f(float64(s.Trials), float64(s.Passed), float64(s.Failed), s.Yield)
	b.f(s.Hz...)
	b.f(s.NominalDB...)
	b.f(s.DesignDB...)
	b.f(s.MeanDB...)
	b.f(s.StdDB...)
	for _, e := range s.EnvelopeDB {
		b.f(e...)
	}
}

// job is one whole design path, from a mask to a Monte Carlo run, on
// values shared by every goroutine that runs it.
type job struct {
	name string
	fam  filter.Family
	spec filter.Spec
	opt  topology.Options
}

var jobs = []job{
	{"Chebyshev lowpass, anti-alias", filter.Chebyshev{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{20e3}, StopHz: [2]float64{48e3}, RippleDB: 0.5, AttenDB: 50}, topology.Options{}},
	{"elliptic highpass", filter.Elliptic{}, filter.Spec{Band: filter.Highpass, PassHz: [2]float64{300}, StopHz: [2]float64{100}, RippleDB: 1, AttenDB: 45}, topology.Options{CapF: 10e-9}},
	{"Butterworth bandpass, state-variable", filter.Butterworth{}, filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{500, 2000}, RippleDB: 1, AttenDB: 30}, topology.Options{Kind: topology.StateVariable}},
	{"inverse Chebyshev bandstop", filter.InverseChebyshev{}, filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{40, 75}, StopHz: [2]float64{48, 52}, RippleDB: 1, AttenDB: 30}, topology.Options{}},
	{"Bessel lowpass", filter.Bessel{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{1e4}, RippleDB: 1, AttenDB: 30}, topology.Options{RMinOhm: 1e3, RMaxOhm: 1e5}},
}

// run runs j's path and returns every number it produced, as bits. The
// Monte Carlo run uses workers goroutines of its own.
func (j job) run(t testing.TB, trials, workers int) bits {
	var b bits
	h, err := filter.Design(j.fam, j.spec)
	if err != nil {
		t.Fatalf("%s: Design: %v", j.name, err)
	}
	b.transfer(h)
	n, err := filter.MinOrder(j.fam, j.spec)
	if err != nil {
		t.Fatalf("%s: MinOrder: %v", j.name, err)
	}
	b.f(float64(n))
	st, err := h.Stages()
	if err != nil {
		t.Fatalf("%s: Stages: %v", j.name, err)
	}
	b.stages(st)
	ch, err := topology.Realize(st, j.opt)
	if err != nil {
		t.Fatalf("%s: Realize: %v", j.name, err)
	}
	b.chain(ch)
	pb, err := series.PassbandOf(j.spec)
	if err != nil {
		t.Fatal(err)
	}
	sn, err := series.Snap(ch, series.Policy{Passband: pb})
	if err != nil {
		t.Fatalf("%s: Snap: %v", j.name, err)
	}
	b.chain(sn.Chain)
	b.f(sn.WorstDB, sn.RoundedDB)
	for _, r := range sn.Stages {
		b.f(r.F0Err, r.QErr, r.GainErr, r.ZeroErr)
	}
	m, err := response.CheckMask(h, j.spec)
	if err != nil {
		t.Fatal(err)
	}
	b.f(m.MarginDB, m.WorstHz)
	hz := []float64{j.spec.PassHz[0] / 2, j.spec.PassHz[0], j.spec.StopHz[0], 2 * j.spec.StopHz[0]}
	for _, p := range response.Sweep(ch, hz) {
		b.f(p.Hz, p.GainDB, p.PhaseDeg, p.DelayS)
	}
	spec := j.spec
	mc := series.Analysis{Trials: trials, Seed: 7, Workers: workers, Hz: hz, Spec: &spec, Percentiles: []float64{5, 50, 95}, Moments: true}
	sp, err := mc.MonteCarlo(sn.Chain)
	if err != nil {
		t.Fatalf("%s: MonteCarlo: %v", j.name, err)
	}
	b.spread(sp)
	wc, err := mc.WorstCase(sn.Chain)
	if err != nil {
		t.Fatalf("%s: WorstCase: %v", j.name, err)
	}
	b.f(wc.LowDB...)
	b.f(wc.HighDB...)
	return b
}

// TestConcurrentPaths runs every design path from many goroutines at once
// (each also running its Monte Carlo on workers of its own) and compares
// every number with a sequential run, bit for bit. Under go test -race it
// also proves that no shared value (families, specs, options, the package
// caches such as the Bessel roots) is written during use.
func TestConcurrentPaths(t *testing.T) {
	goroutines, trials, rounds := 8, 200, 2
	if testing.Short() {
		goroutines, trials, rounds = 4, 40, 1
	}
	want := make([]bits, len(jobs))
	for i, j := range jobs {
		want[i] = j.run(t, trials, 1)
	}
	var wg sync.WaitGroup
	fail := make(chan string, goroutines*len(jobs)*rounds)
	for g := range goroutines {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for r := range rounds {
				for k := range jobs {
					i := (k + g + r) % len(jobs) // different goroutines on different jobs at once
					if got := jobs[i].run(t, trials, 1+g%3); !slices.Equal(got, want[i]) {
						fail <- fmt.Sprintf("goroutine %d: %s differs from the sequential run", g, jobs[i].name)
					}
				}
			}
		}()
	}
	wg.Wait()
	close(fail)
	for f := range fail {
		t.Error(f)
	}
}

// TestConcurrentSharedChain shares one realized chain, one stage list and
// one Circuit between goroutines that realize, snap, evaluate and analyze
// it at the same time; each result equals the sequential one bit for bit.
func TestConcurrentSharedChain(t *testing.T) {
	j := jobs[0]
	h, err := filter.Design(j.fam, j.spec)
	if err != nil {
		t.Fatal(err)
	}
	st, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	pb, _ := series.PassbandOf(j.spec)
	policy := series.Policy{Passband: pb, Pairs: true}
	mc := series.Analysis{Trials: 64, Seed: 3, Workers: 2, Hz: []float64{1e3, 20e3, 48e3}, Moments: true, Percentiles: []float64{50},
		Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}
	work := func() bits {
		var b bits
		c, err := topology.Realize(st, topology.Options{})
		if err != nil {
			t.Error(err)
			return nil
		}
		b.chain(c)
		sn, err := series.Snap(ch, policy)
		if err != nil {
			t.Error(err)
			return nil
		}
		b.chain(sn.Chain)
		b.f(sn.WorstDB)
		sp, err := mc.MonteCarlo(ch)
		if err != nil {
			t.Error(err)
			return nil
		}
		b.spread(sp)
		rk, err := mc.Ranking(ch)
		if err != nil {
			t.Error(err)
			return nil
		}
		for _, r := range rk {
			b.f(r.Share, r.PeakStdDB, r.PeakHz)
		}
		for _, c := range ch.Circuits {
			a, err := c.Achieved()
			if err != nil {
				t.Error(err)
				return nil
			}
			b.stages([]filter.Stage{a})
			g, err := c.RequiredGBWHz(0)
			if err != nil {
				t.Error(err)
				return nil
			}
			b.f(g)
			ev, err := c.NewEvaluator()
			if err != nil {
				t.Error(err)
				return nil
			}
			q, err := ev.Eval(c.Values())
			if err != nil {
				t.Error(err)
				return nil
			}
			b.f(q.Num[:]...)
			b.f(q.Den[:]...)
		}
		for f := 10.0; f < 1e6; f *= 3 {
			b.c(ch.AtHz(f), h.AtHz(f))
		}
		return b
	}
	want := work()
	n := 2 * runtime.GOMAXPROCS(0)
	if testing.Short() {
		n = 3
	}
	var wg sync.WaitGroup
	got := make([]bits, n)
	for i := range n {
		wg.Add(1)
		go func() { defer wg.Done(); got[i] = work() }()
	}
	wg.Wait()
	for i, g := range got {
		if !slices.Equal(g, want) {
			t.Errorf("goroutine %d differs from the sequential run", i)
		}
	}
}
