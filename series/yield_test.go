package series

import (
	"errors"
	"math"
	"testing"
)

func TestYieldInterval(t *testing.T) {
	// Reference values: SciPy 1.10.1,
	// scipy.stats.binomtest(passed, trials).proportion_ci(confidence, method="wilson"),
	// printed with repr and typed here.
	tests := []struct {
		passed, trials int
		conf, lo, hi   float64
	}{
		{50, 100, 0.95, 0.4038315303659956, 0.5961684696340044},
		{20, 20, 0.95, 0.8388748419471808, 1.0},
		{0, 20, 0.95, 0.0, 0.16112515805281935},
		{37, 400, 0.95, 0.06785393449857381, 0.12489858538387784},
		{37, 400, 0.99, 0.06154734372165992, 0.13675068056261075},
	}
	for _, tc := range tests {
		lo, hi, err := Spread{Trials: tc.trials, Passed: tc.passed}.YieldInterval(tc.conf)
		if err != nil {
			t.Fatal(err)
		}
		// 1e-12: the same closed form, evaluated in a different order,
		// with z from two normal quantile implementations.
		if math.Abs(lo-tc.lo) > 1e-12 || math.Abs(hi-tc.hi) > 1e-12 {
			t.Errorf("%d/%d at %g: [%.17g, %.17g], want [%.17g, %.17g]", tc.passed, tc.trials, tc.conf, lo, hi, tc.lo, tc.hi)
		}
	}
	if _, _, err := (Spread{Trials: 10}).YieldInterval(1); !errors.Is(err, ErrPolicy) {
		t.Errorf("confidence 1: %v", err)
	}
	if _, _, err := (Spread{}).YieldInterval(0.95); !errors.Is(err, ErrPolicy) {
		t.Errorf("no trials: %v", err)
	}
}
