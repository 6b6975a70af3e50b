package main

import (
	"math"
	"testing"
)

// TestPairedRatio checks the paired ratios against figures worked by hand:
// SciPy 100, 200, 300 ns against Go 1, 1, 2 ns in rounds 1 to 3 give the
// ratios 100, 200 and 150, so the median 150 and the range 100-200 (not
// the ratio of the medians, 200/1).
func TestPairedRatio(t *testing.T) {
	rounds := []*scipyResult{
		{NS: map[string]float64{"a": 100}},
		{NS: map[string]float64{"a": 200}},
		{NS: map[string]float64{"a": 300}},
	}
	sp := mergeRounds(rounds)
	if got := sp.NS["a"]; got != 200 {
		t.Errorf("merged median %g, want 200", got)
	}
	mid, lo, hi := pairedRatio(sp, "a", []float64{1, 1, 2})
	if mid != 150 || lo != 100 || hi != 200 {
		t.Errorf("paired ratio %g (%g-%g), want 150 (100-200)", mid, lo, hi)
	}
	if mid, _, _ := pairedRatio(sp, "missing", []float64{1, 1, 2}); !math.IsNaN(mid) {
		t.Errorf("ratio of a case SciPy did not time: %g, want NaN", mid)
	}
}
