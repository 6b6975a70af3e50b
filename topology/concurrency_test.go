package topology

import (
	"sync"
	"testing"
)

// TestConcurrentUse: one Circuit value shared by goroutines (AtHz, Biquad,
// NoiseAt) with an Evaluator each gives the same bits as a serial run
// (run with -race to check for shared state).
func TestConcurrentUse(t *testing.T) {
	c := benchCircuit(t, StateVariable)
	wantH := c.AtHz(1234)
	wantB, _ := c.Biquad()
	nm := Noise{AmpVoltage: 5e-9, AmpCurrent: 1e-12, OpAmp: OpAmp{GBWHz: 1e6}}
	wantN, err := c.NoiseAt(nm, 1234)
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 8)
	for range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ev, _ := c.NewEvaluator()
			v := c.Values()
			for range 200 {
				if c.AtHz(1234) != wantH {
					errs <- "AtHz differs"
					return
				}
				if b, _ := ev.Eval(v); b != wantB {
					errs <- "Eval differs"
					return
				}
				if b, _ := c.Biquad(); b != wantB {
					errs <- "Biquad differs"
					return
				}
				if n, _ := c.NoiseAt(nm, 1234); n != wantN {
					errs <- "NoiseAt differs"
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
