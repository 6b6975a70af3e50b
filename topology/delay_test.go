package topology

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"gonum.org/v1/gonum/floats"
)

// numericOnly hides a system's Delayer, so that response.Sweep takes its
// numeric derivative of the phase.
type numericOnly struct{ response.System }

// TestDelayAtHzMatchesStage: a realized chain's analytic delay, from its
// parts, equals the analytic delay of the design it realizes (the chain's
// sign does not change a delay) and the numeric derivative of its phase.
func TestDelayAtHzMatchesStage(t *testing.T) {
	spec := filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{300, 3000}, StopHz: [2]float64{800, 1100}, RippleDB: 1, AttenDB: 40}
	for _, fam := range []filter.Family{filter.Butterworth{}, filter.Chebyshev{}, filter.Elliptic{}, filter.Bessel{}} {
		h, err := filter.Design(fam, spec)
		if err != nil {
			t.Fatal(err)
		}
		stages, err := h.Stages()
		if err != nil {
			t.Fatal(err)
		}
		for _, k := range []Kind{Auto, TowThomas} {
			ch, err := Realize(stages, Options{Kind: k, FirstOrder: RCFollower})
			if err != nil {
				t.Fatalf("%v %v: %v", fam, k, err)
			}
			hz := floats.LogSpan(make([]float64, 60), 30, 30e3)
			want := response.Sweep(h, hz)
			got := response.Sweep(ch, hz)
			num := response.Sweep(numericOnly{ch}, hz)
			for i, f := range hz {
				near := false
				for _, z := range h.Zeros {
					if math.Abs(imag(z)/(2*math.Pi*f)-1) < 0.02 {
						near = true // the numeric derivative is not asked to hold next to a jω zero
					}
				}
				scale := math.Abs(want[i].DelayS) + 1/(2*math.Pi*f)
				if e := math.Abs(got[i].DelayS-want[i].DelayS) / scale; e > 1e-9 {
					t.Errorf("%v %v at %.5g Hz: chain delay %.12g s, design %.12g s", fam, k, f, got[i].DelayS, want[i].DelayS)
				}
				if !near {
					if e := math.Abs(num[i].DelayS-want[i].DelayS) / scale; e > 1e-7 {
						t.Errorf("%v %v at %.5g Hz: numeric delay %.12g s, design %.12g s", fam, k, f, num[i].DelayS, want[i].DelayS)
					}
				}
			}
		}
	}
}

func TestDelayAtHzAllocs(t *testing.T) {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 2, Gain: 1}
	c, err := RealizeStage(st, Options{})
	if err != nil {
		t.Fatal(err)
	}
	ch := Chain{Circuits: []Circuit{c, c}}
	if n := testing.AllocsPerRun(100, func() { _ = ch.DelayAtHz(800) }); n != 0 {
		t.Errorf("Chain.DelayAtHz allocates %v times", n)
	}
	if d := (Circuit{}).DelayAtHz(1); !math.IsNaN(d) {
		t.Errorf("delay of a malformed circuit: %v, want NaN", d)
	}
}
