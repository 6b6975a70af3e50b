package topology

import (
	"errors"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

func TestBadInput(t *testing.T) {
	lp := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7, Gain: 1}
	with := func(f func(*filter.Stage)) filter.Stage { s := lp; f(&s); return s }
	nan := math.NaN()
	tests := []struct {
		reason string
		st     filter.Stage
		opt    Options
		want   error
	}{
		{"order 3", with(func(s *filter.Stage) { s.Order = 3 }), Options{}, ErrStage},
		{"order 0", with(func(s *filter.Stage) { s.Order = 0 }), Options{}, filter.ErrStage},
		{"NaN F0Hz", with(func(s *filter.Stage) { s.F0Hz = nan }), Options{}, ErrStage},
		{"zero F0Hz", with(func(s *filter.Stage) { s.F0Hz = 0 }), Options{}, ErrStage},
		{"negative F0Hz", with(func(s *filter.Stage) { s.F0Hz = -5 }), Options{}, ErrStage},
		{"infinite F0Hz", with(func(s *filter.Stage) { s.F0Hz = math.Inf(1) }), Options{}, ErrStage},
		{"NaN Q", with(func(s *filter.Stage) { s.Q = nan }), Options{}, ErrStage},
		{"zero Q", with(func(s *filter.Stage) { s.Q = 0 }), Options{}, ErrStage},
		{"negative Q", with(func(s *filter.Stage) { s.Q = -1 }), Options{}, ErrStage},
		{"NaN gain", with(func(s *filter.Stage) { s.Gain = nan }), Options{}, ErrStage},
		{"unknown stage kind", with(func(s *filter.Stage) { s.Kind = 9 }), Options{}, ErrStage},
		{"zero gain", with(func(s *filter.Stage) { s.Gain = 0 }), Options{}, ErrUnrealizable},
		{"Sallen-Key bandpass", with(func(s *filter.Stage) { s.Kind = filter.BandpassStage }), Options{Kind: SallenKey}, ErrKind},
		{"RC follower second order", lp, Options{Kind: RCFollower}, ErrKind},
		{"Sallen-Key first order", filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1}, Options{Kind: SallenKey}, ErrKind},
		{"Tow-Thomas highpass", with(func(s *filter.Stage) { s.Kind = filter.HighpassStage }), Options{Kind: TowThomas}, ErrKind},
		{"MFB notch", filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, ZeroHz: 1e3, Gain: 1}, Options{Kind: MultipleFeedback}, ErrKind},
		{"unknown kind", lp, Options{Kind: 42}, ErrKind},
		{"negative kind", lp, Options{Kind: -1}, ErrKind},
		{"NaN CapF", lp, Options{CapF: nan}, ErrOptions},
		{"negative CapF", lp, Options{CapF: -1e-9}, ErrOptions},
		{"infinite CapF", lp, Options{CapF: math.Inf(1)}, ErrOptions},
		{"empty R range", lp, Options{RMinOhm: 1e5, RMaxOhm: 1e3}, ErrOptions},
		{"NaN C bound", lp, Options{CMaxF: nan}, ErrOptions},
		{"CapF too large for range", lp, Options{CapF: 1}, ErrRange},
		{"resistors out of range", lp, Options{CapF: 1e-12, CMinF: 1e-15}, ErrRange},
		{"equal-component Q 1/2", with(func(s *filter.Stage) { s.Q = 0.5 }), Options{Kind: SallenKeyEqual}, ErrUnrealizable},
		{"equal-component gain above K", with(func(s *filter.Stage) { s.Gain = 2.5 }), Options{Kind: SallenKeyEqual}, ErrUnrealizable},
		{"state-variable lowpass Q too low for its gain", with(func(s *filter.Stage) { s.Q = 0.2 }), Options{Kind: StateVariable}, ErrUnrealizable},
	}
	for _, tc := range tests {
		_, err := RealizeStage(tc.st, tc.opt)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.reason, err, tc.want)
		}
		_, err = Realize([]filter.Stage{lp, tc.st}, tc.opt)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s in a chain: err = %v, want %v", tc.reason, err, tc.want)
		}
	}
	if _, err := Realize(nil, Options{}); !errors.Is(err, ErrStage) {
		t.Errorf("empty list: %v", err)
	}
	if err := (Chain{}).WriteSPICE(io.Discard); !errors.Is(err, ErrStage) {
		t.Errorf("empty chain WriteSPICE: %v", err)
	}
}

// TestMalformedCircuit: a Circuit value built by hand that fits no template
// gives NaN and errors, not a panic.
func TestMalformedCircuit(t *testing.T) {
	good, _ := RealizeStage(filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7, Gain: 1}, Options{})
	bad := []Circuit{
		{},
		{Kind: SallenKey, Stage: good.Stage},
		{Kind: SallenKey, Stage: good.Stage, Parts: good.Parts[:2]},
		{Kind: TowThomas, Stage: good.Stage, Parts: good.Parts},
		{Kind: SallenKey, Stage: good.Stage, Parts: []Part{{"R1", 1}, {"R2", 1}, {"C1", 0}, {"C2", 1}}},
		{Kind: SallenKey, Stage: good.Stage, Parts: []Part{{"X1", 1}, {"R2", 1}, {"C1", 1}, {"C2", 1}}},
	}
	for i, c := range bad {
		if h := c.AtHz(100); !math.IsNaN(real(h)) {
			t.Errorf("%d: AtHz = %v", i, h)
		}
		if _, err := c.Achieved(); err == nil {
			t.Errorf("%d: Achieved without error", i)
		}
		if _, err := c.Biquad(); err == nil {
			t.Errorf("%d: Biquad without error", i)
		}
		if _, err := c.Sensitivities(); err == nil {
			t.Errorf("%d: Sensitivities without error", i)
		}
		if _, err := c.NewEvaluator(); err == nil {
			t.Errorf("%d: NewEvaluator without error", i)
		}
		if _, err := c.RequiredGBWHz(0); err == nil {
			t.Errorf("%d: RequiredGBWHz without error", i)
		}
		if err := (Chain{Circuits: []Circuit{c}}).WriteSPICE(io.Discard); err == nil {
			t.Errorf("%d: WriteSPICE without error", i)
		}
		if i != 4 && (c.OpAmps() != 0 || c.Inverting()) { // 4 fits its template, only a value is bad
			t.Errorf("%d: OpAmps %d Inverting %v", i, c.OpAmps(), c.Inverting())
		}
	}
	ev, _ := good.NewEvaluator()
	if _, err := ev.Eval([]float64{1, 2}); !errors.Is(err, ErrParts) {
		t.Errorf("Eval short: %v", err)
	}
	if _, err := ev.Eval([]float64{1, 2, -3, 4}); !errors.Is(err, ErrParts) {
		t.Errorf("Eval negative: %v", err)
	}
	if _, err := ParseKind("auto-magic"); !errors.Is(err, ErrKind) {
		t.Errorf("ParseKind: %v", err)
	}
	if !strings.HasPrefix(Kind(77).String(), "Kind(") {
		t.Errorf("Kind(77).String() = %q", Kind(77).String())
	}
}

// FuzzRealize feeds random stages and options to Realize: it must return a
// circuit equal to the stage or an error, never panic.
func FuzzRealize(f *testing.F) {
	f.Add(1, 2, 1000.0, 0.7071, 0.0, 1.0, 0, 0.0)
	f.Add(4, 2, 50.0, 10.0, 60.0, 1.0, 4, 0.0)
	f.Add(3, 2, 1e4, 5.0, 0.0, 2.0, 3, 1e-9)
	f.Add(2, 1, 10.0, 0.0, 0.0, 0.3, 7, 0.0)
	f.Add(1, 2, 1e-300, 1e300, 0.0, -1e10, 2, 1e-30)
	f.Fuzz(func(t *testing.T, kind, order int, f0, q, zero, gain float64, ck int, capF float64) {
		st := filter.Stage{Kind: filter.StageKind(kind), Order: order, F0Hz: f0, Q: q, ZeroHz: zero, Gain: gain}
		ch, err := Realize([]filter.Stage{st}, Options{Kind: Kind(ck), CapF: capF})
		if err != nil {
			return
		}
		c := ch.Circuits[0]
		want := st.Transfer().AtHz(f0)
		got := c.AtHz(f0) * sign(c) // Inverting accounts for a negative gain
		if e := cmplxAbs(got-want) / (cmplxAbs(want) + passLevel(st)); !(e < 1e-6) {
			t.Fatalf("%+v %v: circuit %v, stage %v", st, c.Kind, got, want)
		}
		var b strings.Builder
		if err := ch.WriteSPICE(&b); err != nil {
			t.Fatal(err)
		}
	})
}

// FuzzCircuitValues feeds arbitrary part values to a state-variable notch
// circuit (the largest template): the analysis paths must return a value or
// an error, never panic, and agree with each other when they succeed.
func FuzzCircuitValues(f *testing.F) {
	c, err := RealizeStage(filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, ZeroHz: 1.3e3, Gain: 1}, Options{})
	if err != nil {
		f.Fatal(err)
	}
	v := c.Values()
	f.Add(1.0, 1.0, 1.0, 1.0, 0.0)
	f.Add(1e-30, 1e30, 1.0, -1.0, 3.0)
	f.Add(math.Inf(1), 1.0, math.NaN(), 1.0, 1e5)
	f.Fuzz(func(t *testing.T, a, b, cc, d, fHz float64) {
		w := append([]float64(nil), v...)
		w[0] *= a
		w[3] *= b
		w[6] *= cc
		w[len(w)-1] *= d
		x, err := c.WithValues(w)
		if err != nil {
			if _, err2 := c.BiquadOf(w); err2 == nil {
				t.Fatal("BiquadOf accepted values WithValues refused")
			}
			return
		}
		h := x.AtHz(fHz)
		bq, err := x.Biquad()
		if err != nil {
			return
		}
		if _, err := x.Achieved(); err != nil && !errors.Is(err, ErrUnrealizable) {
			t.Fatalf("Achieved: %v", err)
		}
		if !cmplxIsFinite(h) || math.IsNaN(fHz) || math.IsInf(fHz, 0) {
			return
		}
		if math.Abs(a-1)+math.Abs(b-1)+math.Abs(cc-1)+math.Abs(d-1) < 1 && fHz > 10 && fHz < 1e5 {
			if e := cmplxAbs(bq.AtHz(fHz)-h) / (cmplxAbs(h) + 1e-3); e > 1e-6 {
				t.Fatalf("Biquad %v vs AtHz %v", bq.AtHz(fHz), h)
			}
		}
	})
}

func cmplxIsFinite(z complex128) bool {
	return !math.IsNaN(real(z)) && !math.IsNaN(imag(z)) && !math.IsInf(real(z), 0) && !math.IsInf(imag(z), 0)
}
