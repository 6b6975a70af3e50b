package series

import (
	"math"

	"github.com/rolloff/rolloff/filter"
)

// butterworthStages returns the stages of an n-th order Butterworth lowpass
// (or highpass) with its -3.01 dB corner at fc: second-order stages of
// Q = 1/(2·sin((2k−1)π/(2n))), k = 1..n/2, and a first-order stage for odd
// n (the pole angles of the Butterworth circle, from memory of any filter
// handbook, e.g. Williams and Taylor's tables), in ascending Q.
func butterworthStages(kind filter.StageKind, n int, fc float64) []filter.Stage {
	var st []filter.Stage
	if n%2 == 1 {
		st = append(st, filter.Stage{Kind: kind, Order: 1, F0Hz: fc, Gain: 1})
	}
	for k := n / 2; k >= 1; k-- {
		q := 1 / (2 * math.Sin(float64(2*k-1)*math.Pi/float64(2*n)))
		st = append(st, filter.Stage{Kind: kind, Order: 2, F0Hz: fc, Q: q, Gain: 1})
	}
	return st
}
