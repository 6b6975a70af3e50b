package filter

import "math"

// MaxButterworthOrder is the highest order Butterworth.Prototype accepts;
// poles and gain are accurate to 1e-13 relative up to it (see
// accuracy_test.go).
const MaxButterworthOrder = 64

// String returns "Butterworth".
func (Butterworth) String() string { return "Butterworth" }

// MaxOrder returns MaxButterworthOrder.
func (Butterworth) MaxOrder() int { return MaxButterworthOrder }

// Prototype returns the order-n Butterworth lowpass prototype, |H(jω)|² =
// 1/(1+ω²ⁿ), −3.0103 dB at 1 rad/s. Its poles are on the unit circle,
// p = −sin θₖ + j·cos θₖ with θₖ = (2k+1)π/(2n), k = 0…n−1 (from memory of
// any filter handbook, e.g. Zverev, "Handbook of Filter Synthesis", 1967;
// the cosine is evaluated as sin((n−2k−1)π/(2n)) so that it keeps full
// relative accuracy). Gain is 1. Poles are in conjugate pairs by
// descending Q, positive-imaginary member first, the real pole of an odd
// order last.
//
// Poles are accurate to 1e-14 relative for 1 ≤ n ≤ MaxButterworthOrder;
// other orders return an error wrapping ErrOrder.
func (b Butterworth) Prototype(n int) (Transfer, error) {
	if err := checkOrder(b.String(), n, MaxButterworthOrder); err != nil {
		return Transfer{}, err
	}
	return Transfer{Poles: chebyshevPoles(nil, n, 1, 1), Gain: 1}, nil
}

// chebyshevPoles returns the n poles −sh·sin θₖ + j·ch·cos θₖ,
// θₖ = (2k+1)π/(2n), in the package's pole order. sh = ch = 1 gives the
// Butterworth poles; sh = sinh μ, ch = cosh μ the Chebyshev ones. They are
// written into dst[:0] when it has room for n (a caller's scratch array),
// and into a new slice otherwise.
func chebyshevPoles(dst []complex128, n int, sh, ch float64) []complex128 {
	poles := dst[:0]
	if cap(poles) < n {
		poles = make([]complex128, 0, n)
	}
	for k := 0; k < n/2; k++ {
		s := math.Sin(float64(2*k+1) * math.Pi / float64(2*n))
		c := math.Sin(float64(n-2*k-1) * math.Pi / float64(2*n))
		poles = append(poles, complex(-sh*s, ch*c), complex(-sh*s, -ch*c))
	}
	if n%2 == 1 {
		poles = append(poles, complex(-sh, 0))
	}
	return poles
}
