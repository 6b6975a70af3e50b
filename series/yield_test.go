package series

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"testing"
)

// scipyWilson is series/testdata/wilson_scipy.json, written by
// internal/scipyref/yield.py with SciPy (version in the file, 1.10.1 when
// committed): scipy.stats.binomtest(passed, trials).proportion_ci(
// confidence, method="wilson") for each case.
type scipyWilson struct {
	Source       string `json:"source"`
	ScipyVersion string `json:"scipy_version"`
	Cases        []struct {
		Passed     int     `json:"passed"`
		Trials     int     `json:"trials"`
		Confidence float64 `json:"confidence"`
		Lo         float64 `json:"lo"`
		Hi         float64 `json:"hi"`
	} `json:"cases"`
}

func TestYieldInterval(t *testing.T) {
	// Reference values: SciPy 1.10.1 golden file from
	// internal/scipyref/yield.py (Wilson score interval).
	b, err := os.ReadFile("testdata/wilson_scipy.json")
	if err != nil {
		t.Fatal(err)
	}
	var g scipyWilson
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if g.ScipyVersion == "" || len(g.Cases) < 5 {
		t.Fatalf("golden file incomplete: version %q, %d cases", g.ScipyVersion, len(g.Cases))
	}
	for _, tc := range g.Cases {
		lo, hi, err := Spread{Trials: tc.Trials, Passed: tc.Passed}.YieldInterval(tc.Confidence)
		if err != nil {
			t.Fatal(err)
		}
		// 1e-12: the same closed form, evaluated in a different order,
		// with z from two normal quantile implementations.
		if math.Abs(lo-tc.Lo) > 1e-12 || math.Abs(hi-tc.Hi) > 1e-12 {
			t.Errorf("%d/%d at %g: [%.17g, %.17g], want [%.17g, %.17g] (SciPy %s)",
				tc.Passed, tc.Trials, tc.Confidence, lo, hi, tc.Lo, tc.Hi, g.ScipyVersion)
		}
	}
	if _, _, err := (Spread{Trials: 10}).YieldInterval(1); !errors.Is(err, ErrPolicy) {
		t.Errorf("confidence 1: %v", err)
	}
	if _, _, err := (Spread{}).YieldInterval(0.95); !errors.Is(err, ErrPolicy) {
		t.Errorf("no trials: %v", err)
	}
}
