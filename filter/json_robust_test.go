package filter_test

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestMarshalErrorsNameField is the regression test for Spec.MarshalJSON
// and Stage.MarshalJSON: an unknown band or kind used to come back as
// encoding/json's "json: error calling MarshalJSON ..." without the
// package prefix, and a non-finite number as "spec value NaN" without
// the field it was in.
func TestMarshalErrorsNameField(t *testing.T) {
	for _, c := range []struct {
		reason, field string
		v             json.Marshaler
		want          error
	}{
		{"spec band 7", "Band 7", filter.Spec{Band: 7}, filter.ErrSpec},
		{"spec NaN StopHz[1]", "StopHz[1]", filter.Spec{Band: filter.Bandpass, StopHz: [2]float64{1, math.NaN()}}, filter.ErrSpec},
		{"spec +Inf AttenDB", "AttenDB", filter.Spec{Band: filter.Lowpass, AttenDB: math.Inf(1)}, filter.ErrSpec},
		{"stage kind 0", "StageKind 0", filter.Stage{Order: 2, F0Hz: 1, Q: 1, Gain: 1}, filter.ErrStage},
		{"stage NaN ZeroHz", "ZeroHz", filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1, Q: 1, ZeroHz: math.NaN(), Gain: 1}, filter.ErrStage},
	} {
		_, err := c.v.MarshalJSON()
		if !errors.Is(err, c.want) || !strings.HasPrefix(err.Error(), "filter: ") || !strings.Contains(err.Error(), c.field) {
			t.Errorf("%s: error %v, want %v with prefix \"filter: \" naming %q", c.reason, err, c.want, c.field)
		}
	}
}
