package series

import (
	"errors"
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
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

// achieved returns the stage circuit c realizes with the given values, from
// its coefficients (stageOf), with the circuit's inversion taken out of the
// gain as topology's Achieved does. It accepts coefficients however the
// evaluator scales them.
func achieved(c topology.Circuit, ev evalFunc, values []float64) (filter.Stage, error) {
	b, err := ev(values)
	if err != nil {
		return filter.Stage{}, fmt.Errorf("series: %w", err)
	}
	st, ok := stageOf(c.Stage, b)
	if !ok {
		return filter.Stage{}, fmt.Errorf("series: %v circuit's parts give an unstable or degenerate %v stage: %w",
			c.Kind, c.Stage.Kind, ErrChain)
	}
	if c.Inverting() {
		st.Gain = -st.Gain
	}
	return st, nil
}

// sensStep is the step in ln x of the central differences of
// sensitivities: truncation error about sensStep² (1e-8), rounding about
// 1e-14/sensStep (1e-10) for coefficients accurate to 1e-14.
const sensStep = 1e-4

// sensitivities returns the normalized sensitivities (x/y)·∂y/∂x of the
// achieved f0, Q, gain and (notch) zero frequency to each part of c, in
// Parts order, by central differences in ln x on the coefficients; the same
// definition as topology's Circuit.Sensitivities.
func sensitivities(c topology.Circuit) ([]topology.Sensitivity, error) {
	ev, err := newStageEval(c)
	if err != nil {
		return nil, err
	}
	v := c.Values()
	out := make([]topology.Sensitivity, len(v))
	lg := func(x float64) float64 { return math.Log(math.Abs(x)) }
	for i := range v {
		x := v[i]
		v[i] = x * math.Exp(sensStep)
		hi, err1 := achieved(c, ev, v)
		v[i] = x * math.Exp(-sensStep)
		lo, err2 := achieved(c, ev, v)
		v[i] = x
		if err := errors.Join(err1, err2); err != nil {
			return nil, err
		}
		s := topology.Sensitivity{Ref: c.Parts[i].Ref}
		s.F0 = (lg(hi.F0Hz) - lg(lo.F0Hz)) / (2 * sensStep)
		if c.Stage.Order == 2 {
			s.Q = (lg(hi.Q) - lg(lo.Q)) / (2 * sensStep)
		}
		s.Gain = (lg(hi.Gain) - lg(lo.Gain)) / (2 * sensStep)
		if c.Stage.Kind == filter.NotchStage {
			s.ZeroHz = (lg(hi.ZeroHz) - lg(lo.ZeroHz)) / (2 * sensStep)
		}
		out[i] = s
	}
	return out, nil
}
