package filter

import (
	"fmt"
	"math"
)

// MaxChebyshevOrder is the highest order Chebyshev.Prototype and
// InverseChebyshev.Prototype accept; poles, zeros and gain are accurate to
// 1e-12 relative up to it (see accuracy_test.go).
const MaxChebyshevOrder = 64

// String returns "Chebyshev".
func (Chebyshev) String() string { return "Chebyshev" }

// MaxOrder returns MaxChebyshevOrder.
func (Chebyshev) MaxOrder() int { return MaxChebyshevOrder }

// Prototype returns the order-n Chebyshev (type I) lowpass prototype,
// |H(jω)|² = g²/(1+ε²Tₙ²(ω)) with ε² = 10^(RippleDB/10) − 1: the passband
// ripples between 0 dB and −RippleDB dB on [0, 1] rad/s with n extrema
// there, and is −RippleDB dB at its ripple edge 1 rad/s. The passband
// maximum is 0 dB: for even n, H(0) = 10^(−RippleDB/20); for odd n,
// H(0) = 1.
//
// With μ = asinh(1/ε)/n and θₖ = (2k+1)π/(2n) the poles are
// −sinh μ·sin θₖ + j·cosh μ·cos θₖ (from memory of Zverev, "Handbook of
// Filter Synthesis", and of Williams & Taylor, "Electronic Filter Design
// Handbook"), in conjugate pairs by descending Q, positive-imaginary member
// first, the real pole of an odd order last; the gain is
// H(0)·Π(−p).
//
// Accuracy: 1e-13 relative for 1 ≤ n ≤ MaxChebyshevOrder. Errors: ErrOrder
// for n outside that range, ErrParam for a RippleDB that is not positive
// and finite, ErrRange for one so large (above about 3000 dB) or so small
// (subnormal) that ε² is not a normal float64, or a gain float64 cannot
// hold.
func (c Chebyshev) Prototype(n int) (Transfer, error) {
	return c.prototypeInto(nil, n)
}

// prototypeInto is Prototype with the poles written into dst's array when
// it has room for n (see chebyshevPoles): the design path passes a scratch
// array for a prototype that a band transform maps into new slices.
func (c Chebyshev) prototypeInto(dst []complex128, n int) (Transfer, error) {
	if err := checkOrder(c.String(), n, MaxChebyshevOrder); err != nil {
		return Transfer{}, err
	}
	if err := checkDB(c.String(), "RippleDB", c.RippleDB); err != nil {
		return Transfer{}, err
	}
	eps2 := powerRatioM1(c.RippleDB)
	if math.IsInf(eps2, 1) || eps2 == 0 {
		return Transfer{}, fmt.Errorf("filter: Chebyshev RippleDB %g: ripple factor beyond float64 range: %w", c.RippleDB, ErrRange)
	}
	mu := math.Asinh(1/math.Sqrt(eps2)) / float64(n)
	ch, sh := coshSinh(mu)
	poles := chebyshevPoles(dst, n, sh, ch)
	h0 := 1.0
	if n%2 == 0 {
		h0 = 1 / math.Sqrt(1+eps2)
	}
	g, ok := dcGain(h0, nil, poles)
	if !ok {
		return Transfer{}, fmt.Errorf("filter: Chebyshev order %d with RippleDB %g: gain %g not representable: %w", n, c.RippleDB, g, ErrRange)
	}
	return Transfer{Poles: poles, Gain: g}, nil
}

// String returns "InverseChebyshev".
func (InverseChebyshev) String() string { return "InverseChebyshev" }

// MaxOrder returns MaxChebyshevOrder.
func (InverseChebyshev) MaxOrder() int { return MaxChebyshevOrder }

// Prototype returns the order-n inverse Chebyshev (type II) lowpass
// prototype, |H(jω)|² = ε²Tₙ²(1/ω)/(1+ε²Tₙ²(1/ω)) with
// 1/ε² = 10^(AttenDB/10) − 1: maximally flat with H(0) = 1 (0 dB, the
// passband maximum), attenuation exactly AttenDB at the stopband edge
// 1 rad/s and at least AttenDB above it, with equal-height stopband lobes.
//
// The poles are the reciprocals of the Chebyshev poles of ripple factor ε
// (μ = asinh(1/ε)/n), the zeros ±j/cos θₖ, θₖ = (2k+1)π/(2n), with the
// infinite zero of odd orders omitted (from memory of Daniels,
// "Approximation Methods for Electronic Filter Design", 1974, and of
// Williams & Taylor). Poles and zeros are in conjugate pairs,
// positive-imaginary member first, pole pairs by descending Q with the
// real pole of an odd order last, zero pair k belonging to pole pair k
// (zeros in ascending frequency). The gain is Π(−p)/Π(−z), so H(0) = 1.
//
// Accuracy: 1e-13 relative for 1 ≤ n ≤ MaxChebyshevOrder. Errors: ErrOrder
// for n outside that range, ErrParam for an AttenDB that is not positive
// and finite, ErrRange for one whose 10^(AttenDB/10) − 1 float64 cannot
// hold (above about 3000 dB, or subnormal) or a gain it cannot hold.
func (c InverseChebyshev) Prototype(n int) (Transfer, error) {
	if err := checkOrder(c.String(), n, MaxChebyshevOrder); err != nil {
		return Transfer{}, err
	}
	if err := checkDB(c.String(), "AttenDB", c.AttenDB); err != nil {
		return Transfer{}, err
	}
	// 1/ε = √(10^(AttenDB/10) − 1).
	ie2 := powerRatioM1(c.AttenDB)
	if math.IsInf(ie2, 1) || ie2 == 0 {
		return Transfer{}, fmt.Errorf("filter: InverseChebyshev AttenDB %g: ripple factor beyond float64 range: %w", c.AttenDB, ErrRange)
	}
	mu := math.Asinh(math.Sqrt(ie2)) / float64(n)
	ch, sh := coshSinh(mu)
	poles := chebyshevPoles(nil, n, sh, ch)
	zeros := make([]complex128, 0, n-n%2)
	for i, p := range poles {
		// 1/p for the lower-half member maps to the upper half; keep the
		// positive-imaginary member first by inverting the conjugate.
		poles[i] = 1 / complex(real(p), -imag(p))
		if imag(p) == 0 {
			poles[i] = complex(1/real(p), 0)
		}
	}
	for k := 0; k < n/2; k++ {
		w := 1 / math.Sin(float64(n-2*k-1)*math.Pi/float64(2*n)) // 1/cos θₖ
		zeros = append(zeros, complex(0, w), complex(0, -w))
	}
	g, ok := dcGain(1, zeros, poles)
	if !ok {
		return Transfer{}, fmt.Errorf("filter: InverseChebyshev order %d with AttenDB %g: gain %g not representable: %w", n, c.AttenDB, g, ErrRange)
	}
	return Transfer{Zeros: zeros, Poles: poles, Gain: g}, nil
}
