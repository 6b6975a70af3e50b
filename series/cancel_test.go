package series

import (
	"context"
	"errors"
	"math"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/filter"
)

// TestMonteCarloContext checks cancellation: a context done before the
// start and one that expires during a long run both give an error
// matching the context's, the long run stopping well before it would have
// finished; a context never done gives MonteCarlo's result bit for bit.
func TestMonteCarloContext(t *testing.T) {
	ch := antiAlias(t)
	a := Analysis{Trials: 500, Seed: 11, Hz: logGrid(1e3, 60e3, 40), Moments: true,
		Percentiles: []float64{5, 95}, Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05},
		Spec: &filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{15e3}, StopHz: [2]float64{48e3}, RippleDB: 0.5, AttenDB: 40}}
	ref, err := a.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	got, err := a.MonteCarloContext(context.Background(), ch)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(ref, got, cmp.Comparer(func(x, y float64) bool {
		return math.Float64bits(x) == math.Float64bits(y)
	})); diff != "" {
		t.Fatalf("with a context (-without +with):\n%s", diff)
	}

	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := a.MonteCarloContext(ctx, ch); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled before the start: error %v", err)
	}

	// A run of about a second at this machine's speed, stopped after 20 ms.
	long := a
	long.Trials, long.Percentiles, long.Moments = 400000, nil, false
	ctx, cancel = context.WithTimeout(context.Background(), 20*time.Millisecond)
	defer cancel()
	start := time.Now()
	_, err = long.MonteCarloContext(ctx, ch)
	took := time.Since(start)
	if !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("expired during the run: error %v (after %v)", err, took)
	}
	// Generous: only a run that ignored the context would take a second.
	if took > 500*time.Millisecond {
		t.Errorf("the cancelled run took %v", took)
	}
}
