package topology

import (
	"math"
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/ngspice"
)

// TestStateVariableLowQNotch: the state-variable notch realizes every Q,
// including the Q below 1/3 of a wide bandstop's sections (a Butterworth
// bandstop stopping 1–1.5 kHz and passing 250 Hz–6 kHz has Q 0.27), with
// its response from the parts equal to the stage, and ngspice agreeing.
func TestStateVariableLowQNotch(t *testing.T) {
	for _, q := range []float64{0.05, 0.1, 0.267, 1.0 / 3, 0.4, 0.7} {
		for _, ratio := range []float64{0.5, 1, 2} {
			st := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: q, ZeroHz: 1e3 * ratio, Gain: 0.8}
			c, err := RealizeStage(st, Options{Kind: StateVariable})
			if err != nil {
				t.Fatalf("Q %g, zero ratio %g: %v", q, ratio, err)
			}
			h := st.Transfer()
			for _, f := range []float64{10, 300, 999, 1e3 * ratio * 1.001, 3e3, 1e5} {
				want, got := h.AtHz(f), c.AtHz(f)
				if c.Inverting() {
					got = -got
				}
				if cmplx.Abs(got-want) > 1e-9*math.Max(cmplx.Abs(want), 1e-3*st.Gain) {
					t.Errorf("Q %g ratio %g at %g Hz: circuit %v, stage %v", q, ratio, f, got, want)
				}
			}
			a, err := c.Achieved()
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(a.Q/q-1) > 1e-9 || math.Abs(a.F0Hz/1e3-1) > 1e-9 || math.Abs(a.Gain/0.8-1) > 1e-9 {
				t.Errorf("Q %g ratio %g: achieved %+v", q, ratio, a)
			}
		}
	}
	// One low-Q case through ngspice, as every kind is checked.
	ngspice.Required(t)
	st := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 0.267, ZeroHz: 1.2e3, Gain: 1}
	c, err := RealizeStage(st, Options{Kind: StateVariable})
	if err != nil {
		t.Fatal(err)
	}
	checkDeck(t, "state-variable notch Q 0.267", Chain{Circuits: []Circuit{c}}, st.F0Hz)
}
