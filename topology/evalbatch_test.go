package topology

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"
)

// TestEvalBatchEqualsEval: EvalBatch gives Eval's coefficients and errors,
// bit for bit, for every kind, batch sizes across the lane count, values
// near and far from the nominal ones, and bad values among good ones.
func TestEvalBatchEqualsEval(t *testing.T) {
	for _, k := range allKinds {
		rapid.Check(t, func(t *rapid.T) {
			c, err := RealizeStage(drawStage(t, k), Options{Kind: k})
			if err != nil {
				t.Fatal(err)
			}
			ev, err := c.NewEvaluator()
			if err != nil {
				t.Fatal(err)
			}
			ref, err := c.NewEvaluator()
			if err != nil {
				t.Fatal(err)
			}
			n := rapid.IntRange(0, 11).Draw(t, "sets")
			values := make([][]float64, n)
			for i := range values {
				spread := rapid.SampledFrom([]float64{0, 0.01, 0.2, 2}).Draw(t, "spread")
				v := c.Values()
				for j := range v {
					v[j] *= math.Exp(spread * rapid.Float64Range(-1, 1).Draw(t, "u"))
				}
				switch rapid.IntRange(0, 9).Draw(t, "bad") {
				case 0:
					v[rapid.IntRange(0, len(v)-1).Draw(t, "which")] = -1
				case 1:
					v = v[1:]
				}
				values[i] = v
			}
			dst := make([]Biquad, n)
			errs := make([]error, n)
			ev.EvalBatch(dst, errs, values)
			for i, v := range values {
				want, werr := ref.Eval(v)
				if !errors.Is(errs[i], werr) || (errs[i] == nil) != (werr == nil) {
					t.Fatalf("set %d: error %v, Eval's %v", i, errs[i], werr)
				}
				for j := range 3 {
					if math.Float64bits(dst[i].Num[j]) != math.Float64bits(want.Num[j]) ||
						math.Float64bits(dst[i].Den[j]) != math.Float64bits(want.Den[j]) {
						t.Fatalf("set %d: %v, Eval's %v", i, dst[i], want)
					}
				}
			}
		})
	}
}

func TestEvalBatchAllocs(t *testing.T) {
	for _, k := range allKinds {
		c := benchCircuit(t, k)
		ev, _ := c.NewEvaluator()
		values := [][]float64{c.Values(), c.Values(), c.Values(), c.Values(), c.Values()}
		dst := make([]Biquad, len(values))
		errs := make([]error, len(values))
		ev.EvalBatch(dst, errs, values) // the first call allocates the lanes' storage
		if n := testing.AllocsPerRun(50, func() { ev.EvalBatch(dst, errs, values) }); n != 0 {
			t.Errorf("%v: %v allocations per EvalBatch, want 0", k, n)
		}
	}
}
