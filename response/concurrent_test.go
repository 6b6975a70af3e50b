package response

import (
	"sync"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// TestConcurrentDeterministic: the same calls from many goroutines at once
// (sharing one transfer's slices) give bit-identical results (run with
// -race to check there is no shared mutable state).
func TestConcurrentDeterministic(t *testing.T) {
	h := times(chebyshev(6, 0.5, 1000), filter.Transfer{Poles: []complex128{-3000, -3000.001}, Gain: 3000 * 3000.001})
	hz := floats.LogSpan(make([]float64, 300), 10, 1e5)
	ts := floats.Span(make([]float64, 300), 0, 0.02)
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{900}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 30}
	type result struct {
		pts  []Point
		step []float64
		mask MaskResult
	}
	run := func() result {
		y, err := Step(h, ts)
		if err != nil {
			t.Error(err)
		}
		m, err := CheckMask(h, spec)
		if err != nil {
			t.Error(err)
		}
		return result{Sweep(h, hz), y, m}
	}
	want := run()
	var wg sync.WaitGroup
	got := make([]result, 8)
	for i := range got {
		wg.Add(1)
		go func() {
			defer wg.Done()
			got[i] = run()
		}()
	}
	wg.Wait()
	for i, g := range got {
		if d := cmp.Diff(want, g, cmp.AllowUnexported(result{})); d != "" {
			t.Errorf("goroutine %d differs:\n%s", i, d)
		}
	}
}
