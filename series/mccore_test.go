package series

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"

	"gonum.org/v1/gonum/integrate/quad"
)

// rcStage is a first-order RC lowpass, H = 1/(1 + sRC), values {R, C}:
// an evaluator written independently of topology for testing the core.
func rcStage(r, c, tol float64) mcStage {
	return mcStage{
		nominal: []float64{r, c},
		tol:     []float64{tol, 0},
		newEval: func() evalFunc {
			return func(v []float64) (bq, error) { return bq{n0: 1, d0: 1, d1: v[0] * v[1]}, nil }
		},
	}
}

func rcPlan(workers int, dist Distribution) *mcPlan {
	hz := []float64{100, 1591.55, 5000}
	p := &mcPlan{
		stages:  []mcStage{rcStage(10e3, 10e-9, 0.1), rcStage(4.7e3, 22e-9, 0.05)},
		dist:    dist,
		trials:  3000,
		seed:    42,
		workers: workers,
		keepDB:  true,
		moments: true,
	}
	for _, f := range hz {
		w := 2 * math.Pi * f
		p.w2 = append(p.w2, w*w)
		p.loP = append(p.loP, 0)
		p.hiP = append(p.hiP, math.Inf(1))
	}
	p.checked = []int{0, 1, 2}
	return p
}

func TestCoreDeterministicAcrossWorkers(t *testing.T) {
	for _, dist := range []Distribution{Uniform, Normal} {
		ref := rcPlan(1, dist).run()
		for _, w := range []int{2, 3, 7} {
			got := rcPlan(w, dist).run()
			for j := range ref.mean {
				if math.Float64bits(got.mean[j]) != math.Float64bits(ref.mean[j]) ||
					math.Float64bits(got.std[j]) != math.Float64bits(ref.std[j]) {
					t.Fatalf("%v, %d workers: moments at %d differ: %v±%v vs %v±%v",
						dist, w, j, got.mean[j], got.std[j], ref.mean[j], ref.std[j])
				}
			}
			for i := range ref.db {
				if math.Float64bits(got.db[i]) != math.Float64bits(ref.db[i]) {
					t.Fatalf("%v, %d workers: trial gain %d differs", dist, w, i)
				}
			}
			if got.passed != ref.passed {
				t.Fatalf("passed %d vs %d", got.passed, ref.passed)
			}
		}
	}
}

// TestCoreMeanMatchesIntegral: the mean of |H|² in dB of one RC stage with
// a uniform ±10 % resistor equals the integral over the distribution
// (gonum's Gauss-Legendre quadrature), within 4 standard errors.
func TestCoreMeanMatchesIntegral(t *testing.T) {
	p := rcPlan(2, Uniform)
	p.stages = p.stages[:1]
	p.trials = 20000
	out := p.run()
	rc := 10e3 * 10e-9
	for j, w2 := range p.w2 {
		a2 := w2 * rc * rc
		f := func(u float64) float64 { return -10 * math.Log10(1+a2*(1+0.1*u)*(1+0.1*u)) / 2 }
		want := quad.Fixed(f, -1, 1, 50, quad.Legendre{}, 0)
		se := out.std[j] / math.Sqrt(float64(p.trials))
		if math.Abs(out.mean[j]-want) > 4*se+1e-12 {
			t.Errorf("f[%d]: mean %v dB, integral %v dB, standard error %v", j, out.mean[j], want, se)
		}
	}
}

func TestQuantileSorted(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5}
	// Hyndman-Fan definition 7: h = q(n-1).
	for _, c := range []struct{ q, want float64 }{{0, 1}, {0.5, 3}, {1, 5}, {0.1, 1.4}, {0.99, 4.96}} {
		if got := quantileSorted(x, c.q); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("quantile %v = %v, want %v", c.q, got, c.want)
		}
	}
	if !math.IsNaN(quantileSorted(nil, 0.5)) {
		t.Error("empty quantile not NaN")
	}
}

func TestTrialSeedsDistinct(t *testing.T) {
	seen := map[[2]uint64]bool{}
	for _, seed := range []uint64{0, 1, 2} {
		for i := range uint64(1000) {
			hi, lo := trialSeed(seed, i)
			if seen[[2]uint64{hi, lo}] {
				t.Fatalf("seed %d trial %d repeats a state", seed, i)
			}
			seen[[2]uint64{hi, lo}] = true
		}
	}
}

// TestCoreProductsLeaveRange: 20 first-order highpass stages far above
// their corner make the numerator and denominator products overflow
// (about (ωRC)^40 = 1e320 each) while |H|² stays near 1; the per-stage
// fallback gives the right gain.
func TestCoreProductsLeaveRange(t *testing.T) {
	const rc = 1e-3
	hp := mcStage{nominal: []float64{rc}, tol: []float64{0},
		newEval: func() evalFunc {
			return func(v []float64) (bq, error) { return bq{n1: v[0], d0: 1, d1: v[0]}, nil }
		}}
	p := &mcPlan{trials: 3, workers: 1, moments: true}
	for range 20 {
		p.stages = append(p.stages, hp)
	}
	for _, f := range []float64{1e2, 1e10} {
		w := 2 * math.Pi * f
		p.w2 = append(p.w2, w*w)
		p.loP = append(p.loP, 0)
		p.hiP = append(p.hiP, math.Inf(1))
	}
	out := p.run()
	for j, w2 := range p.w2 {
		a2 := w2 * rc * rc
		want := 20 * 10 * math.Log10(a2/(1+a2))
		if math.Abs(out.mean[j]-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("f[%d]: %v dB, want %v dB", j, out.mean[j], want)
		}
	}
}

// TestBatchedTrialsEqualOneByOne: a Monte Carlo plan whose stages evaluate
// the trials in batches (topology's EvalBatch) gives the same bits as the
// same plan evaluating them one by one.
func TestBatchedTrialsEqualOneByOne(t *testing.T) {
	ch := antiAlias(t)
	// Resistors within ±95 % (3σ): some trials draw a negative value and
	// fail, so groups of trials with gaps are evaluated too.
	a := Analysis{Trials: 1003, Seed: 3, Hz: logGrid(1e3, 60e3, 9), Moments: true, Percentiles: []float64{10, 90},
		Tolerances: Tolerances{Resistor: 0.95, Capacitor: 0.4}, Dist: Normal, Workers: 2}
	batched, err := a.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	// The same plan with newPair removed.
	saved := noBatch
	noBatch = true
	defer func() { noBatch = saved }()
	single, err := a.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	if batched.Failed == 0 || batched.Failed == batched.Trials {
		t.Fatalf("%d of %d trials failed: the test needs some of each", batched.Failed, batched.Trials)
	}
	if diff := cmp.Diff(single, batched, cmp.Comparer(func(x, y float64) bool {
		return math.Float64bits(x) == math.Float64bits(y)
	})); diff != "" {
		t.Fatalf("batched differs from one by one (-single +batched):\n%s", diff)
	}
}
