package series

import (
	"sync"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// TestConcurrentUse runs Snap and MonteCarlo on one chain from several
// goroutines at once (run with -race): every result equals the sequential
// one.
func TestConcurrentUse(t *testing.T) {
	ch := antiAlias(t)
	p := Policy{Passband: antiAliasBand}
	a := Analysis{Trials: 200, Seed: 4, Hz: logGrid(1e3, 40e3, 9), Moments: true,
		Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
	wantS, err := Snap(ch, p)
	if err != nil {
		t.Fatal(err)
	}
	wantM, err := a.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 16)
	for range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			s, err := Snap(ch, p)
			if err != nil {
				errs <- err.Error()
				return
			}
			m, err := a.MonteCarlo(ch)
			if err != nil {
				errs <- err.Error()
				return
			}
			if d := cmp.Diff(wantS.Items, s.Items, cmp.AllowUnexported(Series{})); d != "" {
				errs <- "Snap differs: " + d
			}
			if d := cmp.Diff(wantM, m); d != "" {
				errs <- "MonteCarlo differs: " + d
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
