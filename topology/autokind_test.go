package topology

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestAutoKindInvalidStage pins what AutoKind returns for a stage that
// fails filter.Stage.Validate: it does not validate, it applies its rules
// to Order and Kind alone (order 1: RCFollower; bandpass: MultipleFeedback;
// notch: StateVariable; anything else, the zero Stage included:
// SallenKey). That answer is harmless because Realize and RealizeStage
// validate first and reject such a stage with ErrStage whatever kind Auto
// would pick.
func TestAutoKindInvalidStage(t *testing.T) {
	for _, c := range []struct {
		reason string
		st     filter.Stage
		want   Kind
	}{
		{"zero Stage", filter.Stage{}, SallenKey},
		{"unknown StageKind", filter.Stage{Kind: 9, Order: 2, F0Hz: 1e3, Q: 0.7, Gain: 1}, SallenKey},
		{"order 3", filter.Stage{Kind: filter.LowpassStage, Order: 3, F0Hz: 1e3, Q: 0.7, Gain: 1}, SallenKey},
		{"first order with NaN F0Hz", filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: math.NaN(), Gain: 1}, RCFollower},
		{"bandpass with Q 0", filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 1e3, Gain: 1}, MultipleFeedback},
		{"notch with no ZeroHz", filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, Gain: 1}, StateVariable},
	} {
		if c.st.Validate() == nil {
			t.Fatalf("%s: the stage is valid; the row needs an invalid one", c.reason)
		}
		if got := AutoKind(c.st); got != c.want {
			t.Errorf("%s: AutoKind = %v, want %v", c.reason, got, c.want)
		}
		_, err := RealizeStage(c.st, Options{})
		if !errors.Is(err, ErrStage) || !errors.Is(err, filter.ErrStage) {
			t.Errorf("%s: RealizeStage error %v, want ErrStage", c.reason, err)
		}
		_, err = Realize([]filter.Stage{c.st}, Options{})
		if !errors.Is(err, ErrStage) {
			t.Errorf("%s: Realize error %v, want ErrStage", c.reason, err)
		}
	}
}
