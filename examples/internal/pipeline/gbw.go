package pipeline

import (
	"github.com/rolloff/rolloff/topology"
)

// GBWMaxErr is the f0 and Q error, relative, that the op-amp gain-bandwidth
// figures of a Document allow (topology.Circuit.RequiredGBWHz).
const GBWMaxErr = 0.01

// opAmpNeeds returns the gain-bandwidth product, in hertz, the circuit's
// op-amps need to keep its f0 and Q within GBWMaxErr (from the nodal
// analysis with single-pole op-amps), and the common rule of thumb beside
// it.
func opAmpNeeds(c topology.Circuit) (gbwHz, ruleHz float64, err error) {
	gbwHz, err = c.RequiredGBWHz(GBWMaxErr)
	if err != nil {
		return 0, 0, err
	}
	return gbwHz, c.RuleOfThumbGBWHz(), nil
}
