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

// newStageEvals returns an evaluator and a batch evaluator of circuit c's
// coefficients sharing one topology Evaluator (owned by the caller): the
// batch one gives the same coefficients as the other, bit for bit
// (Evaluator.EvalBatch).
func newStageEvals(c topology.Circuit) (evalFunc, batchFunc, error) {
	ev, err := c.NewEvaluator()
	if err != nil {
		return nil, nil, fmt.Errorf("series: %w", err)
	}
	one := func(values []float64) (bq, error) {
		b, err := ev.Eval(values)
		if err != nil {
			return bq{}, err
		}
		return bq{b.Num[0], b.Num[1], b.Num[2], b.Den[0], b.Den[1], b.Den[2]}, nil
	}
	var bs [lanes]topology.Biquad
	var errs [lanes]error
	batch := func(values [][]float64, out []bq, ok []bool) {
		n := len(values)
		ev.EvalBatch(bs[:n], errs[:n], values)
		for i := range n {
			b := bs[i]
			out[i] = bq{b.Num[0], b.Num[1], b.Num[2], b.Den[0], b.Den[1], b.Den[2]}
			ok[i] = errs[i] == nil
			errs[i] = nil
		}
	}
	return one, batch, nil
}
