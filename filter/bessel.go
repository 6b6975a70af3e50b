package filter

import (
	"fmt"
	"math"
	"math/big"
	"sort"
	"sync"

	"github.com/rolloff/rolloff/internal/poly"
)

// MaxBesselOrder is the highest order Bessel.Prototype accepts; poles and
// gain are accurate to 1e-13 relative up to it (see accuracy_test.go).
const MaxBesselOrder = 40

// besselPrec is the working precision, in bits, of the root polishing.
// The reverse Bessel polynomial of degree 40 loses about 25 decimal
// digits to conditioning; 256 bits leaves over 50.
const besselPrec = 256

// String returns "Bessel(corner)", "Bessel(delay)" or "Bessel(phase)"
// (or "Bessel(BesselNorm(n))" for an unknown normalization).
func (b Bessel) String() string { return "Bessel(" + b.Norm.String() + ")" }

// MaxOrder returns MaxBesselOrder.
func (Bessel) MaxOrder() int { return MaxBesselOrder }

// String returns "corner", "delay" or "phase", or "BesselNorm(n)" for an
// unknown value.
func (n BesselNorm) String() string {
	switch n {
	case BesselCorner:
		return "corner"
	case BesselDelay:
		return "delay"
	case BesselPhase:
		return "phase"
	}
	return "BesselNorm(" + itoa(int(n)) + ")"
}

// Prototype returns the order-n Bessel (Thomson) lowpass prototype,
// H(s) = θₙ(0)/θₙ(s) with θₙ the reverse Bessel polynomial
// θₙ(s) = Σₖ (2n−k)!/(2^(n−k)·k!·(n−k)!)·sᵏ (from memory of Thomson,
// "Delay networks having maximally flat frequency characteristics",
// Proc. IEE 96 (1949), and of Storch, Proc. IRE 42 (1954); DLMF 18.34),
// whose group delay is maximally flat, 1 s at DC. H(0) = 1, the passband
// maximum (the magnitude falls monotonically). Norm scales the frequency:
//
//   - BesselDelay: the poles as they are, group delay 1 s at DC;
//   - BesselCorner: −3.0103 dB (half power) at 1 rad/s, the corner found by
//     bisection of the exact log-magnitude to the last float64 bit;
//   - BesselPhase: poles divided by θₙ(0)^(1/n), so their product has
//     magnitude 1 and the high-frequency asymptote is that of the
//     Butterworth of the same order.
//
// The poles are the roots of θₙ with its exact integer coefficients: a
// float64 Aberth–Ehrlich start polished by the same iteration in 256-bit
// arithmetic (poly.PolishBig), since θₙ is too ill-conditioned above order
// ~15 for float64 polishing. Poles are in conjugate pairs by
// descending Q, positive-imaginary member first, the real pole of an odd
// order last. The polished roots of each order are
// computed once and kept for the life of the program (safe for concurrent
// use).
//
// Accuracy: 1e-13 relative on poles and gain for 1 ≤ n ≤ MaxBesselOrder
// (measured: poles 1e-16, gain 1e-15, |Π p| of the phase normalization
// within 2e-14 of 1).
// Errors: ErrOrder for n outside that range, ErrParam for an unknown Norm.
func (b Bessel) Prototype(n int) (Transfer, error) {
	if err := checkOrder("Bessel", n, MaxBesselOrder); err != nil {
		return Transfer{}, err
	}
	if b.Norm != BesselCorner && b.Norm != BesselDelay && b.Norm != BesselPhase {
		return Transfer{}, fmt.Errorf("filter: Bessel Norm %d unknown (want BesselCorner, BesselDelay or BesselPhase): %w", int(b.Norm), ErrParam)
	}
	r, err := besselRootsOf(n)
	if err != nil {
		return Transfer{}, err
	}
	scale := 1.0
	switch b.Norm {
	case BesselCorner:
		scale = r.corner
	case BesselPhase:
		scale = r.phase
	}
	poles := make([]complex128, n)
	for i, p := range r.poles {
		poles[i] = p / complex(scale, 0)
	}
	g, ok := dcGain(1, nil, poles)
	if !ok {
		return Transfer{}, fmt.Errorf("filter: Bessel order %d: gain %g not representable: %w", n, g, ErrRange)
	}
	return Transfer{Poles: poles, Gain: g}, nil
}

// besselRoots is the cached result for one order: the delay-normalized
// poles and the frequency scales of the other normalizations.
type besselRoots struct {
	poles  []complex128
	corner float64 // half-power frequency of the delay-normalized filter, rad/s
	phase  float64 // θₙ(0)^(1/n)
	err    error
}

var (
	besselOnce  [MaxBesselOrder + 1]sync.Once
	besselCache [MaxBesselOrder + 1]besselRoots
)

func besselRootsOf(n int) (besselRoots, error) {
	besselOnce[n].Do(func() { besselCache[n] = computeBessel(n) })
	r := besselCache[n]
	return r, r.err
}

// besselCoefficients returns the exact coefficients of θₙ, ascending:
// aₖ = (2n−k)!/(2^(n−k)·k!·(n−k)!), via aₖ₋₁ = aₖ·(2n−k+1)·k/(2(n−k+1))
// from aₙ = 1 (each quotient exact).
func besselCoefficients(n int) []*big.Int {
	a := make([]*big.Int, n+1)
	a[n] = big.NewInt(1)
	for k := n; k >= 1; k-- {
		v := new(big.Int).Mul(a[k], big.NewInt(int64((2*n-k+1)*k)))
		a[k-1] = v.Quo(v, big.NewInt(int64(2*(n-k+1))))
	}
	return a
}

func computeBessel(n int) besselRoots {
	a := besselCoefficients(n)
	c64 := make([]float64, n+1)
	cb := make([]*big.Float, n+1)
	for i, v := range a {
		cb[i] = new(big.Float).SetPrec(besselPrec).SetInt(v)
		c64[i], _ = cb[i].Float64()
	}
	start, err := poly.Roots(c64)
	if err != nil {
		return besselRoots{err: fmt.Errorf("filter: Bessel order %d: float64 roots: %v: %w", n, err, ErrRange)}
	}
	roots := start
	if n > 2 {
		roots, err = poly.PolishBig(cb, start, besselPrec)
		if err != nil {
			return besselRoots{err: fmt.Errorf("filter: Bessel order %d: polishing: %v: %w", n, err, ErrRange)}
		}
	}
	poles := orderPoles(roots)
	// θₙ(0)^(1/n) from the exact a₀ = mant·2^exp.
	mant := new(big.Float)
	exp := cb[0].MantExp(mant)
	m, _ := mant.Float64()
	phase := math.Exp((math.Log(m) + float64(exp)*math.Ln2) / float64(n))
	return besselRoots{poles: poles, corner: halfPowerHz(poles), phase: phase}
}

// orderPoles puts left-half-plane poles in the package order: pairs by
// descending Q = |p|/(2|Re p|), positive-imaginary member first, real
// poles last (in descending order of |p|).
func orderPoles(p []complex128) []complex128 {
	var pairs, reals []complex128
	for _, v := range p {
		switch {
		case imag(v) > 0:
			pairs = append(pairs, v)
		case imag(v) == 0:
			reals = append(reals, v)
		}
	}
	q := func(v complex128) float64 { return math.Hypot(real(v), imag(v)) / (-2 * real(v)) }
	sort.Slice(pairs, func(i, j int) bool { return q(pairs[i]) > q(pairs[j]) })
	sort.Slice(reals, func(i, j int) bool { return real(reals[i]) < real(reals[j]) })
	out := make([]complex128, 0, len(p))
	for _, v := range pairs {
		out = append(out, v, complex(real(v), -imag(v)))
	}
	return append(out, reals...)
}

// halfPowerHz returns the frequency ω (rad/s) at which the all-pole H with
// H(0) = 1 and these poles has |H(jω)|² = 1/2, by bisection on
// ln|H(jω)|² = −Σ log1p((ω² − 2ω·Im p)/|p|²), which falls monotonically
// for a Bessel filter, to adjacent float64 values.
func halfPowerHz(poles []complex128) float64 {
	f := func(w float64) float64 {
		s := 0.0
		for _, p := range poles {
			m2 := real(p)*real(p) + imag(p)*imag(p)
			s += math.Log1p((w*w - 2*w*imag(p)) / m2)
		}
		return s - math.Ln2
	}
	lo, hi := 0.0, 1.0
	for f(hi) < 0 {
		lo, hi = hi, 2*hi
	}
	for {
		mid := lo + (hi-lo)/2
		if mid <= lo || mid >= hi {
			break
		}
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	if math.Abs(f(lo)) < math.Abs(f(hi)) {
		return lo
	}
	return hi
}
