package topology

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// TestRealizedEqualsStage: for random stages of every kind, the nodal
// analysis of the synthesized parts equals the stage's transfer function
// (negated for inverting circuits) at frequencies around f0, and every part
// is positive and inside the default ranges.
func TestRealizedEqualsStage(t *testing.T) {
	for _, k := range allKinds {
		t.Run(k.String(), func(t *testing.T) {
			rapid.Check(t, func(t *rapid.T) {
				st := drawStage(t, k)
				c, err := RealizeStage(st, Options{Kind: k})
				if err != nil {
					t.Fatalf("%+v: %v", st, err)
				}
				for _, p := range c.Parts {
					lo, hi := DefaultRMinOhm, DefaultRMaxOhm
					if p.Ref[0] == 'C' {
						lo, hi = DefaultCMinF, DefaultCMaxF
					}
					if !(p.Value >= lo && p.Value <= hi) {
						t.Fatalf("%s = %g outside [%g, %g]", p.Ref, p.Value, lo, hi)
					}
				}
				h := st.Transfer()
				for _, r := range []float64{0.01, 0.3, 0.9, 1, 1.1, 3, 100} {
					f := st.F0Hz * r
					got, want := c.AtHz(f), sign(c)*h.AtHz(f)
					if e := cmplx.Abs(got-want) / (cmplx.Abs(want) + passLevel(st)); e > exact {
						t.Fatalf("%+v at %g Hz: circuit %v, stage %v, rel diff %g; parts %v", st, f, got, want, e, c.Parts)
					}
				}
				if st.Kind == 4 && st.ZeroHz != st.F0Hz { // notch: the zero itself
					if a := math.Abs(real(c.AtHz(st.ZeroHz))) + math.Abs(imag(c.AtHz(st.ZeroHz))); a > 1e-9*math.Abs(st.Gain) {
						t.Fatalf("notch depth at the zero: |H| = %g", a)
					}
				}
			})
		})
	}
}
