// Package filter computes analog filter transfer functions: normalized lowpass
// prototypes of the classical families (Butterworth, Chebyshev, inverse
// Chebyshev, elliptic, Bessel), the lowpass-to-lowpass, -highpass, -bandpass
// and -bandstop frequency transforms, minimum-order selection from a
// specification mask, and factoring into first- and second-order stages.
//
// A typical use goes from a mask to stages:
//
//	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{4000},
//		RippleDB: 0.5, AttenDB: 60}
//	h, err := filter.Design(filter.Chebyshev{}, spec)
//	if err != nil { ... }
//	stages, err := h.Stages()
//
// Frequencies whose names end in Hz are in hertz; the complex variable s of
// Transfer.At is in rad/s. Results are plain values, safe to share between
// goroutines.
package filter
