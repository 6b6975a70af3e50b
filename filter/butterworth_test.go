package filter

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// protoDB returns 20·log10|H(jω)|.
func protoDB(h Transfer, w float64) float64 { return 20 * math.Log10(cmplx.Abs(h.At(complex(0, w)))) }

// TestButterworthHandbook checks handbook facts (common practice; from
// memory of any filter handbook, e.g. Zverev): |H(jω)|² = 1/(1+ω²ⁿ), so
// −10·log10 2 = −3.0103 dB at 1 rad/s for every order, and the asymptote
// falls 20·n dB per decade.
func TestButterworthHandbook(t *testing.T) {
	for n := 1; n <= MaxButterworthOrder; n++ {
		h, err := Butterworth{}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := protoDB(h, 1), -10*math.Log10(2); math.Abs(got-want) > 1e-12 {
			t.Errorf("order %d: %.15g dB at 1 rad/s, want %.15g", n, got, want)
		}
		for _, w := range []float64{0.3, 0.9, 1.1, 2} {
			want := -10 * math.Log10(1+math.Pow(w, float64(2*n)))
			if got := protoDB(h, w); math.Abs(got-want) > 1e-11*math.Max(1, math.Abs(want)) {
				t.Errorf("order %d: %.15g dB at %g rad/s, want 1/(1+ω²ⁿ): %.15g", n, got, w, want)
			}
		}
		if n <= 20 {
			// Decade slope far above the corner:
			// −10·log10((1+10^(8n))/(1+10^(6n))), which is −20n to 5e-6 dB.
			slope := protoDB(h, 1e4) - protoDB(h, 1e3)
			exact := -10 * (math.Log10(1+math.Pow(10, float64(-8*n))) + 8*float64(n) -
				math.Log10(1+math.Pow(10, float64(-6*n))) - 6*float64(n))
			if math.Abs(slope-exact) > 1e-11*float64(n) || math.Abs(slope+20*float64(n)) > 5e-6 {
				t.Errorf("order %d: %.12g dB/decade, want −%d", n, slope, 20*n)
			}
		}
	}
}

// TestButterworthTable compares order 3 with the table value: poles
// −½ ± j·√3/2 and −1 (from memory of any filter handbook's Butterworth
// table).
func TestButterworthTable(t *testing.T) {
	h, _ := Butterworth{}.Prototype(3)
	want := []complex128{complex(-0.5, math.Sqrt(3)/2), complex(-0.5, -math.Sqrt(3)/2), -1}
	if e := protoMatch(h.Poles, want); e > 1e-15 || h.Gain != 1 || len(h.Zeros) != 0 {
		t.Errorf("order 3: %v, want poles %v (rel err %g), gain 1", h, want, e)
	}
}

// TestButterworthProperty: for random orders, poles on the unit circle in
// the open left half-plane, H(0) = 1.
func TestButterworthProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxButterworthOrder).Draw(t, "n")
		h, err := Butterworth{}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range h.Poles {
			if !(real(p) < 0) || math.Abs(cmplx.Abs(p)-1) > 1e-15 {
				t.Fatalf("order %d: pole %v", n, p)
			}
		}
		if g := cmplx.Abs(h.At(0)); math.Abs(g-1) > 1e-14 {
			t.Fatalf("order %d: |H(0)| = %v", n, g)
		}
	})
}
