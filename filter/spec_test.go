package filter

import (
	"errors"
	"math"
	"strings"
	"testing"

	"pgregory.net/rapid"
)

func TestSpecValidate(t *testing.T) {
	lp := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{2000}, RippleDB: 1, AttenDB: 40}
	bp := Spec{Band: Bandpass, PassHz: [2]float64{1000, 2000}, StopHz: [2]float64{500, 4000}, RippleDB: 1, AttenDB: 40}
	bs := Spec{Band: Bandstop, PassHz: [2]float64{500, 4000}, StopHz: [2]float64{1000, 2000}, RippleDB: 1, AttenDB: 40}
	hp := Spec{Band: Highpass, PassHz: [2]float64{1000}, StopHz: [2]float64{300}, RippleDB: 1, AttenDB: 40}
	for _, s := range []Spec{lp, bp, bs, hp} {
		if err := s.Validate(); err != nil {
			t.Errorf("%+v: %v", s, err)
		}
	}
	with := func(s Spec, f func(*Spec)) Spec { f(&s); return s }
	for _, c := range []struct {
		reason string
		s      Spec
		field  string
	}{
		{"unknown band", with(lp, func(s *Spec) { s.Band = 0 }), "Band"},
		{"band 5", with(lp, func(s *Spec) { s.Band = 5 }), "Band"},
		{"zero pass edge", with(lp, func(s *Spec) { s.PassHz[0] = 0 }), "PassHz[0]"},
		{"NaN stop edge", with(lp, func(s *Spec) { s.StopHz[0] = math.NaN() }), "StopHz[0]"},
		{"infinite stop edge", with(lp, func(s *Spec) { s.StopHz[0] = math.Inf(1) }), "StopHz[0]"},
		{"lowpass stop below pass", with(lp, func(s *Spec) { s.StopHz[0] = 900 }), "StopHz[0]"},
		{"lowpass stop equal to pass", with(lp, func(s *Spec) { s.StopHz[0] = 1000 }), "StopHz[0]"},
		{"highpass stop above pass", with(hp, func(s *Spec) { s.StopHz[0] = 1100 }), "StopHz[0]"},
		{"zero ripple", with(lp, func(s *Spec) { s.RippleDB = 0 }), "RippleDB"},
		{"negative attenuation", with(lp, func(s *Spec) { s.AttenDB = -3 }), "AttenDB"},
		{"infinite attenuation", with(lp, func(s *Spec) { s.AttenDB = math.Inf(1) }), "AttenDB"},
		{"ripple above attenuation", with(lp, func(s *Spec) { s.RippleDB = 50 }), "RippleDB"},
		{"bandpass lower stop inside", with(bp, func(s *Spec) { s.StopHz[0] = 1200 }), "StopHz[0]"},
		{"bandpass edges swapped", with(bp, func(s *Spec) { s.PassHz = [2]float64{2000, 1000} }), "PassHz[1]"},
		{"bandpass upper stop inside", with(bp, func(s *Spec) { s.StopHz[1] = 1900 }), "StopHz[1]"},
		{"bandpass upper edge missing", with(bp, func(s *Spec) { s.PassHz[1] = 0 }), "PassHz[1]"},
		{"bandstop lower stop outside", with(bs, func(s *Spec) { s.StopHz[0] = 400 }), "StopHz[0]"},
		{"bandstop stop edges swapped", with(bs, func(s *Spec) { s.StopHz = [2]float64{2000, 1000} }), "StopHz[1]"},
		{"bandstop upper pass inside", with(bs, func(s *Spec) { s.PassHz[1] = 1500 }), "PassHz[1]"},
	} {
		err := c.s.Validate()
		if !errors.Is(err, ErrSpec) || !strings.Contains(err.Error(), c.field) {
			t.Errorf("%s: %v, want ErrSpec naming %s", c.reason, err, c.field)
		}
	}
}

// TestPlanNotWorseThanFixedEdges: for random bandstop masks the plan's
// selectivity is never below the classical choice that keeps both passband
// edges (and so never needs a higher order), and for masks far from
// geometric symmetry it is strictly better.
func TestPlanNotWorseThanFixedEdges(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		p0 := math.Exp(rapid.Float64Range(0, 10).Draw(t, "p0"))
		t0 := p0 * math.Exp(rapid.Float64Range(0.01, 2).Draw(t, "t0"))
		t1 := t0 * math.Exp(rapid.Float64Range(0.01, 2).Draw(t, "t1"))
		p1 := t1 * math.Exp(rapid.Float64Range(0.01, 2).Draw(t, "p1"))
		s := Spec{Band: Bandstop, PassHz: [2]float64{p0, p1}, StopHz: [2]float64{t0, t1}, RippleDB: 1, AttenDB: 40}
		P, w := p0*p1, p1-p0
		fixed := math.Min(w*t0/math.Abs(P-t0*t0), w*t1/math.Abs(t1*t1-P))
		pl := s.plan()
		if pl.sel < fixed*(1-1e-12) {
			t.Fatalf("%+v: plan selectivity %g below the fixed-edge %g", s, pl.sel, fixed)
		}
		// The plan's edges lie inside the mask's passband allowance.
		a := math.Sqrt(pl.centerHz*pl.centerHz+pl.widthHz*pl.widthHz/4) - pl.widthHz/2
		b := a + pl.widthHz
		if a < p0*(1-1e-12) || b > p1*(1+1e-12) {
			t.Fatalf("%+v: transform edges %g, %g outside the passband edges", s, a, b)
		}
		// Geometric symmetry about the stopband reachable by moving one
		// passband edge inward: the optimum makes both stop edges map to the
		// same selectivity when the centre √(t0·t1) is feasible.
		r := math.Log(P / (t0 * t1))
		if math.Abs(r) > 0.5 && pl.sel <= fixed*(1+1e-6) {
			t.Fatalf("%+v: asymmetric mask, plan %g not better than fixed %g", s, pl.sel, fixed)
		}
	})
}
