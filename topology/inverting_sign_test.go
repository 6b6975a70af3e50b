package topology

import (
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestInvertingIsTheSign: for every kind and stage kind, with positive and
// negative stage gains, AtHz equals the stage's transfer function times −1
// exactly when Inverting says so, and a chain's sign is the product.
func TestInvertingIsTheSign(t *testing.T) {
	var all []Circuit
	for _, k := range allKinds {
		for _, sk := range support[k] {
			for _, g := range []float64{1.5, -1.5, 0.4, -0.4, -56.7} {
				st := filter.Stage{Kind: sk.kind, Order: sk.order, F0Hz: 1e3, Gain: g}
				if sk.order == 2 {
					st.Q = 1.2
				}
				if sk.kind == filter.NotchStage {
					st.ZeroHz = 1.4e3
				}
				c, err := RealizeStage(st, Options{Kind: k})
				if err != nil {
					continue // e.g. a gain above the equal-component K
				}
				all = append(all, c)
				f := 700.0
				want := st.Transfer().AtHz(f)
				if c.Inverting() {
					want = -want
				}
				if got := c.AtHz(f); cmplx.Abs(got-want) > 1e-9*cmplx.Abs(want) {
					t.Errorf("%v %v gain %g: AtHz %v, Inverting %v, stage %v", k, sk.kind, g, got, c.Inverting(), st.Transfer().AtHz(f))
				}
			}
		}
	}
	if len(all) < 20 {
		t.Fatalf("only %d circuits realized", len(all))
	}
	ch := Chain{Circuits: all[:7]}
	want := complex(1, 0)
	for _, c := range ch.Circuits {
		want *= c.Stage.Transfer().AtHz(700)
	}
	if ch.Inverting() {
		want = -want
	}
	if got := ch.AtHz(700); cmplx.Abs(got-want) > 1e-9*cmplx.Abs(want) {
		t.Errorf("chain: AtHz %v, want %v (Inverting %v)", got, want, ch.Inverting())
	}
}
