package mcfloor

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestFloorsAgree: both loops count the same trials inside the same bounds
// (they differ only by dividing or cross-multiplying), for any worker count.
func TestFloorsAgree(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	const trials, stages = 300, 3
	coef := make([]Biquad, trials*stages)
	for i := range coef {
		j := 1 + 0.05*(2*r.Float64()-1)
		coef[i] = Biquad{N0: j, D0: 1, D1: 0.7 * j, D2: 1}
	}
	w2 := []float64{0.01, 0.25, 1, 4}
	// Bounds ±8 % around the nominal (j = 1) chain's power.
	lo, hi := make([]float64, len(w2)), make([]float64, len(w2))
	for i, x := range w2 {
		p := math.Pow(1/((1-x)*(1-x)+0.49*x), stages)
		lo[i], hi[i] = 0.92*p, 1.08*p
	}
	want := Power(coef, stages, w2, lo, hi, 1)
	if want == 0 || want == trials {
		t.Fatalf("%d of %d trials pass: the bounds test nothing", want, trials)
	}
	for _, w := range []int{1, 2, 7} {
		if got := Power(coef, stages, w2, lo, hi, w); got != want {
			t.Errorf("Power with %d workers: %d, want %d", w, got, want)
		}
		if got := Products(coef, stages, w2, lo, hi, w); got != want {
			t.Errorf("Products with %d workers: %d, want %d", w, got, want)
		}
	}
	inf := []float64{math.Inf(1), math.Inf(1), math.Inf(1), math.Inf(1)}
	if got := Products(coef, stages, w2, make([]float64, 4), inf, 2); got != trials {
		t.Errorf("unbounded: %d pass, want all %d", got, trials)
	}
}
