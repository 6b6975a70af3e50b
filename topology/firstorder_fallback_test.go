package topology

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestFirstOrderFallback: with Options.FirstOrder set, a second-order kind
// asked for throughout realizes an odd-order design, its first-order stage
// by the fallback kind; without it the kind refuses the first-order stage.
func TestFirstOrderFallback(t *testing.T) {
	stages := []filter.Stage{
		{Kind: filter.LowpassStage, Order: 1, F0Hz: 1000, Gain: 1},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 1000, Q: 1, Gain: 1},
	}
	if _, err := Realize(stages, Options{Kind: MultipleFeedback}); !errors.Is(err, ErrKind) {
		t.Fatalf("no fallback: got %v, want ErrKind", err)
	}
	ch, err := Realize(stages, Options{Kind: MultipleFeedback, FirstOrder: RCFollower})
	if err != nil {
		t.Fatal(err)
	}
	if ch.Circuits[0].Kind != RCFollower || ch.Circuits[1].Kind != MultipleFeedback {
		t.Fatalf("kinds %v, %v; want rc-follower, multiple-feedback", ch.Circuits[0].Kind, ch.Circuits[1].Kind)
	}
	for _, f := range []float64{10, 1000, 1e5} {
		want := stages[0].Transfer().AtHz(f) * stages[1].Transfer().AtHz(f)
		if got := ch.AtHz(f); math.Abs(cmplx.Abs(got)-cmplx.Abs(want)) > 1e-12*cmplx.Abs(want) {
			t.Errorf("%g Hz: |chain| %g, |design| %g", f, cmplx.Abs(got), cmplx.Abs(want))
		}
	}
	// The fallback applies to first-order stages only: a kind that cannot
	// realize a second-order stage still refuses it.
	if _, err := Realize(stages, Options{Kind: RCFollower, FirstOrder: RCFollower}); !errors.Is(err, ErrKind) {
		t.Fatalf("second-order stage with RCFollower: got %v, want ErrKind", err)
	}
	if _, err := Realize(stages, Options{Kind: SallenKey, FirstOrder: Kind(99)}); !errors.Is(err, ErrKind) {
		t.Fatalf("unknown FirstOrder: got %v, want ErrKind", err)
	}
}
