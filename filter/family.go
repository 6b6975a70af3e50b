package filter

// A Family gives normalized lowpass prototypes, passband maximum gain 1
// (0 dB), with every pole finite and strictly in the left half-plane
// (MinOrder and Design reject a prototype of a family defined outside this
// package that is not, with ErrParam). Prototype returns an error wrapping
// ErrOrder for an order outside the family's supported range and ErrParam
// for a bad family parameter.
type Family interface {
	Prototype(order int) (Transfer, error)
	String() string
}

// Butterworth is the maximally flat magnitude family: -3.01 dB at 1 rad/s.
type Butterworth struct{}

// Chebyshev is the equiripple-passband family (Chebyshev type I): the
// passband ripples between 0 and -RippleDB dB up to its ripple edge at
// 1 rad/s.
type Chebyshev struct{ RippleDB float64 }

// InverseChebyshev is the equiripple-stopband family (Chebyshev type II):
// maximally flat at DC, attenuation at least AttenDB from its stopband edge
// at 1 rad/s upward.
type InverseChebyshev struct{ AttenDB float64 }

// Elliptic (Cauer) is equiripple in both bands: passband ripple RippleDB up
// to its passband edge at 1 rad/s, stopband attenuation at least AttenDB.
type Elliptic struct{ RippleDB, AttenDB float64 }

// Bessel (Thomson) has maximally flat group delay; Norm says how its
// frequency scale is normalized.
type Bessel struct{ Norm BesselNorm }

// BesselNorm selects the frequency normalization of a Bessel prototype.
type BesselNorm int

// The Bessel normalizations.
const (
	BesselCorner BesselNorm = iota // -3.01 dB at 1 rad/s (the zero value)
	BesselDelay                    // group delay 1 s at DC
	BesselPhase                    // poles' product is 1: the high-frequency asymptote of the
	// Butterworth of the same order (phase midpoint near 1 rad/s)
)

// Spec is a filter specification mask. For Lowpass and Highpass only
// element 0 of PassHz and StopHz is used; for Bandpass and Bandstop element 0
// is the lower edge and element 1 the upper edge.
type Spec struct {
	Band     Band
	PassHz   [2]float64 // passband edge; Bandpass and Bandstop: lower and upper edge
	StopHz   [2]float64 // stopband edge; Bandpass and Bandstop: lower and upper edge
	RippleDB float64    // most attenuation allowed in the passband
	AttenDB  float64    // least attenuation required in the stopband
}
