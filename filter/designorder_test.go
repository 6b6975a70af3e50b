package filter

import (
	"errors"
	"math"
	"testing"
)

// TestDesignOrderMatchesDesign checks that DesignOrder at MinOrder is Design,
// bit for bit, for every band.
func TestDesignOrderMatchesDesign(t *testing.T) {
	specs := []Spec{
		{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{3000}, RippleDB: 0.5, AttenDB: 50},
		{Band: Highpass, PassHz: [2]float64{300}, StopHz: [2]float64{100}, RippleDB: 1, AttenDB: 40},
		{Band: Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{700, 1500}, RippleDB: 0.5, AttenDB: 40},
		{Band: Bandstop, PassHz: [2]float64{40, 75}, StopHz: [2]float64{48, 52}, RippleDB: 1, AttenDB: 30},
	}
	fams := []Family{Butterworth{}, Chebyshev{}, InverseChebyshev{}, Elliptic{}, Bessel{}}
	for _, s := range specs {
		for _, f := range fams {
			n, err := MinOrder(f, s)
			if err != nil {
				if errors.Is(err, ErrRange) {
					continue // Bessel cannot reach every mask
				}
				t.Fatalf("%v %v: %v", f, s.Band, err)
			}
			want, err := Design(f, s)
			if err != nil {
				t.Fatal(err)
			}
			got, err := DesignOrder(f, s, n)
			if err != nil {
				t.Fatal(err)
			}
			if got.Gain != want.Gain || len(got.Poles) != len(want.Poles) || len(got.Zeros) != len(want.Zeros) {
				t.Fatalf("%v %v: DesignOrder(%d) differs from Design", f, s.Band, n)
			}
			for i := range got.Poles {
				if math.Float64bits(real(got.Poles[i])) != math.Float64bits(real(want.Poles[i])) ||
					math.Float64bits(imag(got.Poles[i])) != math.Float64bits(imag(want.Poles[i])) {
					t.Fatalf("%v %v: pole %d differs", f, s.Band, i)
				}
			}
		}
	}
}

func TestDesignOrderErrors(t *testing.T) {
	s := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{3000}, RippleDB: 0.5, AttenDB: 50}
	for _, n := range []int{0, -3} {
		if _, err := DesignOrder(Butterworth{}, s, n); !errors.Is(err, ErrOrder) {
			t.Errorf("order %d: got %v, want ErrOrder", n, err)
		}
	}
	if _, err := DesignOrder(Butterworth{}, s, MaxButterworthOrder+1); !errors.Is(err, ErrOrder) {
		t.Errorf("order above range: got %v, want ErrOrder", err)
	}
	bad := s
	bad.StopHz[0] = 500
	if _, err := DesignOrder(Butterworth{}, bad, 4); !errors.Is(err, ErrSpec) {
		t.Errorf("bad spec: got %v, want ErrSpec", err)
	}
}
