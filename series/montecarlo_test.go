package series

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
	"gonum.org/v1/gonum/floats"
	"pgregory.net/rapid"
)

func logGrid(lo, hi float64, n int) []float64 {
	return floats.LogSpan(make([]float64, n), lo, hi)
}

func TestMonteCarloDeterministicAcrossWorkers(t *testing.T) {
	ch := antiAlias(t)
	a := Analysis{Trials: 700, Seed: 7, Hz: logGrid(1e3, 60e3, 25), Moments: true,
		Percentiles: []float64{1, 50, 99}, Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05},
		Spec: &filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{15e3}, StopHz: [2]float64{48e3}, RippleDB: 0.5, AttenDB: 40}}
	for _, dist := range []Distribution{Uniform, Normal} {
		a.Dist = dist
		a.Workers = 1
		ref, err := a.MonteCarlo(ch)
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range []int{2, 5} {
			a.Workers = w
			got, err := a.MonteCarlo(ch)
			if err != nil {
				t.Fatal(err)
			}
			// Bit for bit: compare the float64 bit patterns.
			if diff := cmp.Diff(ref, got, cmp.Comparer(func(x, y float64) bool {
				return math.Float64bits(x) == math.Float64bits(y)
			})); diff != "" {
				t.Fatalf("%v, %d workers differ from 1 (-1 +%d):\n%s", dist, w, w, diff)
			}
		}
		if ref.Yield <= 0 || ref.Yield > 1 {
			t.Errorf("%v yield %g", dist, ref.Yield)
		}
		t.Logf("%v: yield %.3f", dist, ref.Yield)
	}
}

// TestMonteCarloDeterminismProperty: any seed, trial count (across block
// boundaries) and worker count give the same bits as one worker, and the
// percentile envelopes are ordered.
func TestMonteCarloDeterminismProperty(t *testing.T) {
	ch := antiAlias(t)
	rapid.Check(t, func(t *rapid.T) {
		a := Analysis{Trials: rapid.IntRange(1, 300).Draw(t, "trials"), Seed: rapid.Uint64().Draw(t, "seed"),
			Dist: rapid.SampledFrom([]Distribution{Uniform, Normal}).Draw(t, "dist"),
			Hz:   logGrid(1e3, 60e3, 7), Moments: true, Percentiles: []float64{5, 50, 95},
			Band: &Deviation{LoHz: 1e3, HiHz: 20e3, DB: 0.3}, Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
		a.Workers = 1
		ref, err := a.MonteCarlo(ch)
		if err != nil {
			t.Fatal(err)
		}
		a.Workers = rapid.IntRange(2, 8).Draw(t, "workers")
		got, err := a.MonteCarlo(ch)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(ref, got, cmp.Comparer(func(x, y float64) bool {
			return math.Float64bits(x) == math.Float64bits(y)
		})); diff != "" {
			t.Fatalf("%d workers differ from 1:\n%s", a.Workers, diff)
		}
		for j := range a.Hz {
			e := ref.EnvelopeDB
			if !(e[0][j] <= e[1][j] && e[1][j] <= e[2][j]) {
				t.Fatalf("envelope at %g Hz not ordered: %g %g %g", a.Hz[j], e[0][j], e[1][j], e[2][j])
			}
		}
	})
}

// butterworthSpec returns a lowpass mask that n-th order Butterworth stages
// at fc meet with room to spare: the ripple and attenuation are the
// closed-form Butterworth gain at the edges, 10·log10(1 + (f/fc)^(2n)), with
// 0.05 dB of margin.
func butterworthSpec(n int, fc, passRatio, stopRatio float64) filter.Spec {
	a := func(r float64) float64 { return 10 * math.Log10(1+math.Pow(r, float64(2*n))) }
	return filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{fc * passRatio}, StopHz: [2]float64{fc * stopRatio},
		RippleDB: a(passRatio) + 0.05, AttenDB: a(stopRatio) - 0.05}
}

// TestYieldOneForExactParts: zero tolerances and a design that meets its
// mask give a yield of exactly 1.
func TestYieldOneForExactParts(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 8).Draw(t, "order")
		fc := math.Pow(10, rapid.Float64Range(1, 5).Draw(t, "log10 fc"))
		spec := butterworthSpec(n, fc, rapid.Float64Range(0.3, 0.95).Draw(t, "pass"), rapid.Float64Range(1.5, 5).Draw(t, "stop"))
		ch, err := topology.Realize(butterworthStages(filter.LowpassStage, n, fc), topology.Options{})
		if err != nil {
			t.Fatal(err)
		}
		a := Analysis{Trials: 50, Seed: rapid.Uint64().Draw(t, "seed"), Hz: logGrid(fc/100, fc*20, 60),
			Spec: &spec, Band: &Deviation{LoHz: fc / 100, HiHz: fc * 20, DB: 1e-6},
			Tolerances: Tolerances{Override: true}}
		s, err := a.MonteCarlo(ch)
		if err != nil {
			t.Fatal(err)
		}
		if s.Yield != 1 || s.Passed != 50 || s.Failed != 0 {
			t.Fatalf("yield %g (%d passed, %d failed) for exact parts", s.Yield, s.Passed, s.Failed)
		}
	})
}

// TestYieldDropsWithTolerance: the same mask with loose parts loses boards,
// and looser parts lose more (on the same seed the draws are the same
// multiples of the tolerance, so the deviations scale).
func TestYieldDropsWithTolerance(t *testing.T) {
	ch := antiAlias(t)
	spec := butterworthSpec(8, 20e3, 0.8, 2.2) // 0.12 dB down at the pass edge, 54.8 dB at the stop edge
	spec.RippleDB, spec.AttenDB = 0.6, 50
	a := Analysis{Trials: 2000, Seed: 3, Hz: logGrid(1e3, 80e3, 80), Spec: &spec}
	prev := 1.0
	for _, tol := range []float64{0.01, 0.02, 0.05, 0.1} {
		a.Tolerances = Tolerances{Resistor: tol, Capacitor: tol}
		s, err := a.MonteCarlo(ch)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("±%g %%: yield %.4f", tol*100, s.Yield)
		if s.Yield > prev {
			t.Errorf("yield %g at ±%g %% above %g at a tighter tolerance", s.Yield, tol*100, prev)
		}
		prev = s.Yield
	}
	if prev > 0.5 {
		t.Errorf("±10 %% parts keep a yield of %g on a 0.6 dB ripple mask", prev)
	}
}

// TestLinearAnalysisAgreesWithMonteCarlo: for small tolerances the
// first-order variance (Ranking's contributions, summed) matches the Monte
// Carlo variance, and the Monte Carlo extremes lie within the linear
// worst-case bounds.
func TestLinearAnalysisAgreesWithMonteCarlo(t *testing.T) {
	ch := antiAlias(t)
	hz := logGrid(2e3, 40e3, 12)
	a := Analysis{Trials: 8000, Seed: 11, Hz: hz, Moments: true, Percentiles: []float64{0, 100},
		Tolerances: Tolerances{Resistor: 0.002, Capacitor: 0.002}}
	s, err := a.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	items, err := a.prepare(ch)
	if err != nil {
		t.Fatal(err)
	}
	slopes, err := gainSlopes(ch, hz)
	if err != nil {
		t.Fatal(err)
	}
	wc, err := a.WorstCase(ch)
	if err != nil {
		t.Fatal(err)
	}
	for j := range hz {
		v := 0.0
		for k, g := range slopes {
			sd := items[k].Tolerance / math.Sqrt(3)
			v += g[j] * g[j] * sd * sd
		}
		// The sample variance of n draws has a relative standard error of
		// about √(2/(n−1)) ≈ 1.6 % here (for a near-normal sum); 5 standard
		// errors, plus 1 % for second-order terms at ±0.2 %.
		if r := s.StdDB[j] * s.StdDB[j] / v; math.Abs(r-1) > 5*math.Sqrt(2.0/float64(a.Trials-1))+0.01 {
			t.Errorf("%.0f Hz: Monte Carlo variance / linear variance = %.4f", hz[j], r)
		}
		lo, hi := s.EnvelopeDB[0][j], s.EnvelopeDB[1][j]
		span := wc.HighDB[j] - wc.NominalDB[j]
		if lo < wc.LowDB[j]-0.01*span || hi > wc.HighDB[j]+0.01*span {
			t.Errorf("%.0f Hz: Monte Carlo [%g, %g] dB outside worst case [%g, %g] dB", hz[j], lo, hi, wc.LowDB[j], wc.HighDB[j])
		}
	}
	rank, err := a.Ranking(ch)
	if err != nil {
		t.Fatal(err)
	}
	sum := 0.0
	for i, r := range rank {
		sum += r.Share
		if i > 0 && r.Share > rank[i-1].Share {
			t.Errorf("ranking not sorted at %d", i)
		}
	}
	if math.Abs(sum-1) > 1e-12 {
		t.Errorf("shares sum to %g", sum)
	}
	t.Logf("most influential parts: %+v %+v %+v", rank[0], rank[1], rank[2])
}

// TestWorstCaseStagesAgreeWithNumeric: the sensitivity-based worst case of
// f0 and Q per stage equals Σ|∂ln y/∂ln x|·tol computed by central
// differences of the stage's coefficients (an independent path).
func TestWorstCaseStagesAgreeWithNumeric(t *testing.T) {
	ch := antiAlias(t)
	a := Analysis{Hz: []float64{1e3}, Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
	wc, err := a.WorstCase(ch)
	if err != nil {
		t.Fatal(err)
	}
	items, _ := a.prepare(ch)
	n := 0
	for i, c := range ch.Circuits {
		ev, err := newStageEval(c)
		if err != nil {
			t.Fatal(err)
		}
		vals := partValues(c)
		var f0, q float64
		for k := range vals {
			x := vals[k]
			const h = 1e-6
			vals[k] = x * math.Exp(h)
			bu, _ := ev(vals)
			vals[k] = x * math.Exp(-h)
			bd, _ := ev(vals)
			vals[k] = x
			su, _ := stageOf(c.Stage, bu)
			sd, _ := stageOf(c.Stage, bd)
			f0 += math.Abs(math.Log(su.F0Hz/sd.F0Hz)/(2*h)) * items[n].Tolerance
			q += math.Abs(math.Log(su.Q/sd.Q)/(2*h)) * items[n].Tolerance
			n++
		}
		if math.Abs(f0-wc.Stages[i].F0) > 1e-6 || math.Abs(q-wc.Stages[i].Q) > 1e-6 {
			t.Errorf("stage %d: worst f0 %g (numeric %g), Q %g (numeric %g)", i+1, wc.Stages[i].F0, f0, wc.Stages[i].Q, q)
		}
	}
}

func TestAnalysisErrors(t *testing.T) {
	ch := antiAlias(t)
	bad := []Analysis{
		{},
		{Hz: []float64{-1}},
		{Hz: []float64{1}, Trials: -1},
		{Hz: []float64{1}, Dist: 7},
		{Hz: []float64{1}, Percentiles: []float64{101}},
		{Hz: []float64{1}, Tolerances: Tolerances{Resistor: -0.1}},
		{Hz: []float64{1}, Band: &Deviation{LoHz: 10, HiHz: 1, DB: 1}},
		{Hz: []float64{1}, Spec: &filter.Spec{}},
	}
	for i, a := range bad {
		if _, err := a.MonteCarlo(ch); err == nil {
			t.Errorf("case %d: no error", i)
		} else if !errors.Is(err, ErrPolicy) && !errors.Is(err, filter.ErrSpec) {
			t.Errorf("case %d: %v", i, err)
		}
	}
	lp := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{5e3}, RippleDB: 1, AttenDB: 20}
	if _, err := (Analysis{Hz: []float64{1e4}, Spec: &lp, Tolerances: Tolerances{Override: true}}).MonteCarlo(ch); !errors.Is(err, ErrPolicy) {
		t.Errorf("no passband frequency: %v", err)
	}
	if _, err := (Analysis{Hz: []float64{1}}).MonteCarlo(topology.Chain{}); !errors.Is(err, ErrChain) {
		t.Errorf("empty chain: %v", err)
	}
}

// TestMonteCarloNoAllocPerTrial: the trial loop allocates nothing: the
// allocations of a run do not grow with the number of trials.
func TestMonteCarloNoAllocPerTrial(t *testing.T) {
	ch := antiAlias(t)
	allocs := func(n int) float64 {
		a := Analysis{Trials: n, Workers: 1, Hz: logGrid(1e3, 60e3, 50), Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
		return testing.AllocsPerRun(3, func() {
			if _, err := a.MonteCarlo(ch); err != nil {
				t.Fatal(err)
			}
		})
	}
	small, large := allocs(64), allocs(64*40)
	if large > small {
		t.Errorf("%v allocations for 64 trials, %v for 2560", small, large)
	}
}
