package filter

import "testing"

// TestTransformsGiveNilForNone: a transform with no zeros (or poles) to
// return gives a nil list, never an empty non-nil one, so that a result
// survives a JSON round trip unchanged.
func TestTransformsGiveNilForNone(t *testing.T) {
	p, err := Butterworth{}.Prototype(5)
	if err != nil {
		t.Fatal(err)
	}
	lp, err := p.ToLowpass(1000)
	if err != nil {
		t.Fatal(err)
	}
	if lp.Zeros != nil {
		t.Errorf("ToLowpass of an all-pole prototype: Zeros %#v, want nil", lp.Zeros)
	}
	s := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{4000}, RippleDB: 3, AttenDB: 40}
	for _, f := range []Family{Butterworth{}, Chebyshev{}, Bessel{}} {
		h, err := Design(f, s)
		if err != nil {
			t.Fatal(err)
		}
		if h.Zeros != nil {
			t.Errorf("Design(%v): Zeros %#v, want nil", f, h.Zeros)
		}
	}
}
