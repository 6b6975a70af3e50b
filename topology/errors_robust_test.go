package topology_test

import (
	"errors"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// TestStageErrorPrefixOnce is the regression test for the message of a
// stage that fails filter.Stage.Validate: it used to read "topology:
// topology: bad stage: ..." (the prefix written before a sentinel whose
// text already starts with it).
func TestStageErrorPrefixOnce(t *testing.T) {
	bad := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: -1, Q: 0.7, Gain: 1}
	_, err1 := topology.RealizeStage(bad, topology.Options{})
	_, err2 := topology.Circuit{Kind: topology.SallenKey, Stage: bad}.Achieved()
	for _, err := range []error{err1, err2} {
		if !errors.Is(err, topology.ErrStage) || !errors.Is(err, filter.ErrStage) {
			t.Errorf("error %v does not wrap topology.ErrStage and filter.ErrStage", err)
		}
		if err == nil || strings.Contains(err.Error(), "topology: topology:") || !strings.Contains(err.Error(), "F0Hz") {
			t.Errorf("error %q: want one prefix and the field F0Hz", err)
		}
	}
}
