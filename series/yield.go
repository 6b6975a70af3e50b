package series

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// YieldInterval returns the Wilson score interval of the yield at the given
// two-sided confidence (0.95 for 95 %): the range of true yields consistent
// with Passed of Trials boards passing (E. B. Wilson, "Probable inference,
// the law of succession, and statistical inference", JASA 1927; formula
// from memory). Unlike the plain p ± z·√(p(1−p)/n) it stays inside [0, 1]
// and is not empty at a yield of 0 or 1. A confidence outside (0, 1) or a
// Spread of no trials is an error wrapping ErrPolicy.
func (s Spread) YieldInterval(confidence float64) (lo, hi float64, err error) {
	if !(confidence > 0 && confidence < 1) {
		return math.NaN(), math.NaN(), fmt.Errorf("series: yield interval confidence %g (want in (0, 1)): %w", confidence, ErrPolicy)
	}
	if s.Trials <= 0 {
		return math.NaN(), math.NaN(), fmt.Errorf("series: yield interval of %d trials: %w", s.Trials, ErrPolicy)
	}
	n := float64(s.Trials)
	p := float64(s.Passed) / n
	z := distuv.UnitNormal.Quantile(1 - (1-confidence)/2)
	z2 := z * z
	centre := (p + z2/(2*n)) / (1 + z2/n)
	half := z / (1 + z2/n) * math.Sqrt(p*(1-p)/n+z2/(4*n*n))
	return max(0, centre-half), min(1, centre+half), nil
}
