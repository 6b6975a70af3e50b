package topology

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestFollowerGBW: an RC lowpass with a unity-gain follower whose op-amp is
// an integrator A = ωt/s has H = 1/(1 + sRC)·ωt/(s + ωt) (closed-loop
// follower pole at GBW, by hand); the RC pole does not move, so f0 is
// unchanged for any GBW, and DominantWith must find exactly the RC pole.
func TestFollowerGBW(t *testing.T) {
	c, err := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	op := OpAmp{GBWHz: 20e3}
	f0, _, err := c.DominantWith(op)
	if err != nil || math.Abs(f0/1e3-1) > 1e-9 {
		t.Fatalf("f0 %g err %v", f0, err)
	}
	for _, f := range []float64{100, 1e3, 2e4, 1e5} {
		s := complex(0, 2*math.Pi*f)
		wt := complex(2*math.Pi*op.GBWHz, 0)
		want := 1 / (1 + s/complex(2*math.Pi*1e3, 0)) * wt / (s + wt)
		if e := relDiff(c.AtHzWith(op, f), want); e > 1e-12 {
			t.Errorf("%g Hz: %v, want %v", f, c.AtHzWith(op, f), want)
		}
	}
}

// TestRequiredGBW: the search meets its own criterion at the result and
// fails just below it; and for the unity-gain Sallen-Key the needed GBW is
// of the order of the rule of thumb (within a factor 30 either way; the
// rule is common practice, not a bound).
func TestRequiredGBW(t *testing.T) {
	for _, k := range []Kind{SallenKey, MultipleFeedback, StateVariable, TowThomas} {
		st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 10e3, Q: 2, Gain: 1}
		testRequired(t, k, st)
	}
	// Every stage kind of every circuit kind, notches of all three types
	// (a symmetric notch has no gain at f0 to compare).
	for _, k := range allKinds {
		for _, sk := range support[k] {
			for _, z := range []float64{0.7, 1, 1.4} {
				st := filter.Stage{Kind: sk.kind, Order: sk.order, F0Hz: 2e3, Gain: 1}
				if sk.order == 2 {
					st.Q = 3
				}
				if k == SallenKeyEqual {
					st.Gain = 2
				}
				if sk.kind == filter.NotchStage {
					st.ZeroHz = z * st.F0Hz
				} else if z != 1 {
					continue
				}
				testRequired(t, k, st)
			}
		}
	}
	// A follower's pole at GBW costs |1/(1 + j·f0/GBW)| at f0: 1 % needs
	// GBW = f0/√(1/0.99² − 1) = 6.96·f0 (by hand).
	c1, _ := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1}, Options{})
	if g, err := c1.RequiredGBWHz(0); err != nil || math.Abs(g/(1e3/math.Sqrt(1/0.9801-1))-1) > 1e-5 {
		t.Errorf("RC follower: GBW %g (err %v), want %g", g, err, 1e3/math.Sqrt(1/0.9801-1))
	}
	c, _ := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 10e3, Q: 2, Gain: 1}, Options{})
	if _, err := c.RequiredGBWHz(-1); !errors.Is(err, ErrOpAmp) {
		t.Errorf("negative maxErr: %v", err)
	}
	// A DC gain of 10 cannot keep the error within 0.1 %.
	if _, err := c.RequiredGBWHzWith(OpAmp{DCGain: 10}, 1e-3); !errors.Is(err, ErrOpAmp) {
		t.Errorf("low DC gain: %v", err)
	}
}

// testRequired checks that RequiredGBWHz meets its criterion at its result
// and fails just below it, and that it is of the order of the rule of thumb
// (within a factor 100 either way; the rule is common practice, not a
// bound).
func testRequired(t *testing.T, k Kind, st filter.Stage) {
	t.Helper()
	c, err := RealizeStage(st, Options{Kind: k})
	if err != nil {
		t.Fatal(err)
	}
	gbw, err := c.RequiredGBWHz(0)
	if err != nil {
		t.Fatalf("%v %+v: %v", k, st, err)
	}
	ach, _ := c.Achieved()
	ft := c.gainTestHz(ach.F0Hz)
	at, _ := c.deviation(OpAmp{GBWHz: gbw}, ach.F0Hz, ach.Q, ft)
	below, _ := c.deviation(OpAmp{GBWHz: gbw * 0.999}, ach.F0Hz, ach.Q, ft)
	if at > DefaultMaxErr || below <= DefaultMaxErr {
		t.Errorf("%v: GBW %g: error %g at, %g just below", k, gbw, at, below)
	}
	rule := c.RuleOfThumbGBWHz()
	if gbw < rule/30 || gbw > rule*30 {
		t.Errorf("%v: GBW %g Hz far from the rule of thumb %g Hz", k, gbw, rule)
	}
	t.Logf("%v %v Q=%g f0=%g Hz zero=%g Hz: required GBW %.4g Hz, rule of thumb %.4g Hz", k, st.Kind, st.Q, st.F0Hz, st.ZeroHz, gbw, rule)
}

func TestPredistort(t *testing.T) {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 20e3, Q: 3, Gain: 1}
	op := OpAmp{GBWHz: 2e6, DCGain: 1e5, ROutOhm: 50}
	for _, k := range []Kind{SallenKey, MultipleFeedback, StateVariable, TowThomas} {
		c, err := RealizeStage(st, Options{Kind: k})
		if err != nil {
			t.Fatal(err)
		}
		f0, q, _ := c.DominantWith(op)
		p, err := c.Predistort(op)
		if err != nil {
			t.Fatalf("%v: %v", k, err)
		}
		pf, pq, err := p.DominantWith(op)
		if err != nil || math.Abs(pf/st.F0Hz-1) > 1e-9 || math.Abs(pq/st.Q-1) > 1e-9 {
			t.Errorf("%v: predistorted f0 %g Q %g (err %v); before %g, %g", k, pf, pq, err, f0, q)
		}
	}
}

func TestSlewRate(t *testing.T) {
	// 10 V peak at 20 kHz: 2π·20e3·10 = 1.2566 V/µs (arithmetic).
	if got := SlewRateVPerUs(10, 20e3); math.Abs(got-1.2566370614359172) > 1e-12 {
		t.Errorf("got %g", got)
	}
	// No rate for an amplitude or frequency that is not positive and
	// finite (a negative frequency gave a negative rate, a negative peak a
	// positive one).
	for _, x := range []float64{0, -1, -20e3, math.NaN(), math.Inf(1), math.Inf(-1)} {
		if got := SlewRateVPerUs(10, x); !math.IsNaN(got) {
			t.Errorf("SlewRateVPerUs(10, %g) = %g, want NaN", x, got)
		}
		if got := SlewRateVPerUs(x, 20e3); !math.IsNaN(got) {
			t.Errorf("SlewRateVPerUs(%g, 20e3) = %g, want NaN", x, got)
		}
	}
}

func TestAtHzWithBadOpAmp(t *testing.T) {
	c, _ := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1}, Options{})
	if h := c.AtHzWith(OpAmp{GBWHz: math.NaN()}, 10); !math.IsNaN(real(h)) {
		t.Errorf("NaN GBW: %v", h)
	}
	if _, err := c.Predistort(OpAmp{GBWHz: -1}); !errors.Is(err, ErrOpAmp) {
		t.Errorf("negative GBW: %v", err)
	}
}

// TestPolesZerosWithMatchesAtHzWith: the factored non-ideal transfer
// (interpolated rational function of degree up to caps + op-amps, roots by
// internal/poly) equals the direct non-ideal nodal analysis, for every kind.
func TestPolesZerosWithMatchesAtHzWith(t *testing.T) {
	op := OpAmp{GBWHz: 1e6, DCGain: 2e5, ROutOhm: 40}
	for _, k := range allKinds {
		for _, sk := range support[k] {
			st := plainStage(k, sk.kind, sk.order, 3e3, 1.5, 2e3, 1.5)
			c, err := RealizeStage(st, Options{Kind: k})
			if err != nil {
				t.Fatal(err)
			}
			z, p, g, err := c.PolesZerosWith(op)
			if err != nil {
				t.Fatalf("%v %v: %v", k, sk.kind, err)
			}
			if len(p) <= sk.order {
				t.Errorf("%v %v: %d poles, the op-amp poles are missing", k, sk.kind, len(p))
			}
			h := filter.Transfer{Zeros: z, Poles: p, Gain: g}
			for _, f := range []float64{30, 1e3, 3e3, 1e4, 3e5} {
				want := c.AtHzWith(op, f)
				if e := relDiff(h.AtHz(f), want); e > exact {
					t.Errorf("%v %v at %g Hz: factored %v, direct %v (rel %g)", k, sk.kind, f, h.AtHz(f), want, e)
				}
			}
		}
	}
}
