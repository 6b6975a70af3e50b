package filter

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// magAtTol is the relative agreement of magAt with |At|: both are exact to
// rounding, a few ulps per factor, for up to 64 factors.
const magAtTol = 1e-13

// TestPropMagAtIsAbsAt: the real-arithmetic magnitude used by the mask
// checks (magAt) equals |H(jω)| from the complex product At, for designs of
// every family and band at random frequencies (including DC and exact band
// edges), and keeps its range where |At| does.
func TestPropMagAtIsAbsAt(t *testing.T) {
	fams := []Family{Butterworth{}, Chebyshev{}, InverseChebyshev{}, Elliptic{}}
	rapid.Check(t, func(t *rapid.T) {
		s := genSpec(t)
		f := fams[rapid.IntRange(0, len(fams)-1).Draw(t, "family")]
		h, err := Design(f, s)
		if err != nil {
			t.Skip(err)
		}
		hz := []float64{0, s.PassHz[0], s.StopHz[0], math.Exp(rapid.Float64Range(-5, 15).Draw(t, "lnf"))}
		for _, fr := range hz {
			w := 2 * math.Pi * fr
			want := cmplx.Abs(h.At(complex(0, w)))
			got := magAt(h, w)
			if want < 1e-290 && want != 0 {
				continue // subnormal range: both lose precision
			}
			if want == 0 || math.IsInf(want, 0) {
				if got != want {
					t.Fatalf("%v %v at %g Hz: magAt %g, |At| %g", f, s.Band, fr, got, want)
				}
				continue
			}
			if math.Abs(got-want) > magAtTol*want {
				t.Fatalf("%v %v at %g Hz: magAt %.17g, |At| %.17g", f, s.Band, fr, got, want)
			}
		}
	})
}

// TestMagAtSpecial: a pole on the grid gives +Inf, a zero 0, and a
// 64th-order Butterworth far in its stopband stays representable.
func TestMagAtSpecial(t *testing.T) {
	h := Transfer{Zeros: []complex128{complex(0, 2)}, Poles: []complex128{complex(0, 1), -1}, Gain: 1}
	if m := magAt(h, 1); !math.IsInf(m, 1) {
		t.Errorf("at a pole: %g, want +Inf", m)
	}
	if m := magAt(h, 2); m != 0 {
		t.Errorf("at a zero: %g, want 0", m)
	}
	p, err := Butterworth{}.Prototype(64)
	if err != nil {
		t.Fatal(err)
	}
	// |H(j·10)| = 1/√(1 + 10^128) = 1e-64 (Butterworth magnitude, common
	// practice).
	if m := magAt(p, 10); math.Abs(m/1e-64-1) > 1e-12 {
		t.Errorf("order 64 at 10 rad/s: %g, want 1e-64", m)
	}
}
