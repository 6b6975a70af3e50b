package ellip

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// TestPropClimbAllIsClimb: ClimbAll gives, element by element, the bits of
// Climb and ClimbReal, for random moduli (k' from 1e-12 to 1) and random
// sets of complex and real arguments.
func TestPropClimbAllIsClimb(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		kc := math.Pow(10, rapid.Float64Range(-12, 0).Draw(t, "log10 kc"))
		k := math.Sqrt((1 - kc) * (1 + kc))
		l := NewLanden(k, kc)
		nw := rapid.IntRange(0, 16).Draw(t, "complex count")
		nx := rapid.IntRange(0, 15).Draw(t, "real count")
		ws := make([]complex128, nw)
		xs := make([]float64, nx)
		for i := range ws {
			u := rapid.Float64Range(0, 1).Draw(t, "u")
			v := rapid.Float64Range(0, 2).Draw(t, "v")
			ws[i] = cmplx.Cos(complex(u, -v) * math.Pi / 2)
		}
		for i := range xs {
			xs[i] = math.Cos(rapid.Float64Range(0, 1).Draw(t, "ur") * math.Pi / 2)
		}
		want := make([]complex128, nw)
		for i, w := range ws {
			want[i] = l.Climb(w)
		}
		wantX := make([]float64, nx)
		for i, x := range xs {
			wantX[i] = l.ClimbReal(x)
		}
		l.ClimbAll(ws, xs)
		for i := range ws {
			if math.Float64bits(real(ws[i])) != math.Float64bits(real(want[i])) ||
				math.Float64bits(imag(ws[i])) != math.Float64bits(imag(want[i])) {
				t.Fatalf("complex %d: ClimbAll %v, Climb %v", i, ws[i], want[i])
			}
		}
		for i := range xs {
			if math.Float64bits(xs[i]) != math.Float64bits(wantX[i]) {
				t.Fatalf("real %d: ClimbAll %.17g, ClimbReal %.17g", i, xs[i], wantX[i])
			}
		}
	})
}
