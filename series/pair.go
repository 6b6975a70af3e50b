package series

import (
	"fmt"
	"math"
)

// Pair is a resistor built from two standard values A and B, in series
// (A + B) or in parallel (A·B/(A + B)).
type Pair struct {
	A, B     float64
	Parallel bool
}

// Value returns the pair's resistance.
func (p Pair) Value() float64 {
	if p.Parallel {
		return p.A * p.B / (p.A + p.B)
	}
	return p.A + p.B
}

// String returns "A + B" or "A ‖ B" in engineering notation.
func (p Pair) String() string {
	op := " + "
	if p.Parallel {
		op = " ‖ "
	}
	return FormatValue(p.A, "") + op + FormatValue(p.B, "")
}

// BestPair returns the pair of values of s, in series or in parallel,
// whose resistance is nearest to x by ratio, and its relative error
// (Value/x − 1). The larger part of a series pair is in [x/2, x], of a
// parallel pair in [x, 2x] (the other part is the nearest standard value to
// what remains), which covers every pair worth building. Bad input gives
// an error wrapping ErrSeries or ErrValue.
func (s Series) BestPair(x float64) (Pair, float64, error) {
	if err := s.check(x, "pair"); err != nil {
		return Pair{}, math.NaN(), err
	}
	best, bestErr := Pair{}, math.Inf(1)
	try := func(p Pair) {
		if !(p.A > 0 && p.B > 0) {
			return
		}
		if e := math.Abs(math.Log(p.Value() / x)); e < bestErr {
			best, bestErr = p, e
		}
	}
	for _, a := range s.Range(x/2, x) {
		if r := x - a; r > 0 {
			try(Pair{A: a, B: s.Nearest(r)})
		}
	}
	for _, a := range s.Range(x, 2*x) {
		if r := 1 / (1/x - 1/a); r > 0 && !math.IsInf(r, 0) {
			try(Pair{A: a, B: s.Nearest(r), Parallel: true})
		}
	}
	if math.IsInf(bestErr, 1) {
		return Pair{}, math.NaN(), fmt.Errorf("series: no pair of %v values for %g: %w", s, x, ErrRange)
	}
	return best, best.Value()/x - 1, nil
}
