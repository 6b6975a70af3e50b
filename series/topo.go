package series

import (
	"fmt"

	"github.com/rolloff/rolloff/topology"
)

// newStageEval returns an evaluator of circuit c's coefficients from part
// values (in c.Parts order), owned by the caller: topology's non-allocating
// Evaluator, adapted to bq.
func newStageEval(c topology.Circuit) (evalFunc, error) {
	ev, err := c.NewEvaluator()
	if err != nil {
		return nil, fmt.Errorf("series: %w", err)
	}
	return func(values []float64) (bq, error) {
		b, err := ev.Eval(values)
		if err != nil {
			return bq{}, err
		}
		return bq{b.Num[0], b.Num[1], b.Num[2], b.Den[0], b.Den[1], b.Den[2]}, nil
	}, nil
}
