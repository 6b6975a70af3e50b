package response

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// TestStepHighOrderBig: the step response of prototypes of every family up
// to order 30 against the residue sum evaluated in 512-bit arithmetic
// (bigStep), over the first 20 s (the rise and ringing, where the modal sum
// of high orders cancels most). The tolerances, relative to the peak, are
// the accuracy StepInto states: rounding up to order 20; the Bessel and
// Butterworth residues grow so fast with order that at 25–30 the crossover
// between the series at t = 0 and the modal sum keeps ≈ 1e-11 to 1e-9
// (observed: Bessel 25 1.1e-11, Bessel 30 5.8e-10, Butterworth 30 2.5e-13).
func TestStepHighOrderBig(t *testing.T) {
	ts := floats.Span(make([]float64, 21), 0, 20)
	fams := []filter.Family{filter.Butterworth{}, filter.Chebyshev{RippleDB: 0.1}, filter.Bessel{},
		filter.Elliptic{RippleDB: 0.1, AttenDB: 80}, filter.InverseChebyshev{AttenDB: 60}}
	for _, f := range fams {
		for _, n := range []int{4, 12, 20, 30} {
			p, err := f.Prototype(n)
			if err != nil {
				t.Fatalf("%v %d: %v", f, n, err)
			}
			y, err := Step(p, ts)
			if err != nil {
				t.Fatal(err)
			}
			var worst, peak float64
			for i, x := range ts {
				r := bigStep(p, x)
				worst = math.Max(worst, math.Abs(y[i]-r))
				peak = math.Max(peak, math.Abs(r))
			}
			tol := 3e-13
			switch {
			case n > 20 && f.String() == (filter.Bessel{}).String():
				tol = 2e-9
			case n > 20:
				tol = 3e-12
			}
			if worst/peak > tol {
				t.Errorf("%v order %d: error %.2g of the peak %.3g, want ≤ %g", f, n, worst/peak, peak, tol)
			}
		}
	}
}
