package filter_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// A fourth-order Butterworth prototype: poles on the unit circle,
// −3.01 dB at 1 rad/s.
func ExampleButterworth_Prototype() {
	h, err := filter.Butterworth{}.Prototype(4)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range h.Poles {
		fmt.Printf("%.4f\n", p)
	}
	fmt.Printf("%.2f dB at 1 rad/s\n", 20*math.Log10(cmplx.Abs(h.At(1i))))
	// Output:
	// (-0.3827+0.9239i)
	// (-0.3827-0.9239i)
	// (-0.9239+0.3827i)
	// (-0.9239-0.3827i)
	// -3.01 dB at 1 rad/s
}

// An even-order Chebyshev prototype has its passband maximum at 0 dB, so
// its DC gain is −RippleDB.
func ExampleChebyshev_Prototype() {
	h, err := filter.Chebyshev{RippleDB: 1}.Prototype(4)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("DC %.2f dB, edge %.2f dB\n", 20*math.Log10(cmplx.Abs(h.At(0))), 20*math.Log10(cmplx.Abs(h.At(1i))))
	// Output:
	// DC -1.00 dB, edge -1.00 dB
}

// A fifth-order elliptic prototype for a sensor front end that tolerates
// 0.2 dB of ripple and wants 55 dB of rejection: two notch pairs in the
// stopband.
func ExampleElliptic_Prototype() {
	h, err := filter.Elliptic{RippleDB: 0.2, AttenDB: 55}.Prototype(5)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := 0; i < len(h.Zeros); i += 2 {
		fmt.Printf("notch at %.4f rad/s\n", imag(h.Zeros[i]))
	}
	fmt.Printf("edge %.2f dB\n", 20*math.Log10(cmplx.Abs(h.At(1i))))
	// Output:
	// notch at 1.8216 rad/s
	// notch at 2.7943 rad/s
	// edge -0.20 dB
}

// The three Bessel normalizations are frequency scalings of one another.
func ExampleBessel_Prototype() {
	for _, norm := range []filter.BesselNorm{filter.BesselDelay, filter.BesselCorner, filter.BesselPhase} {
		h, err := filter.Bessel{Norm: norm}.Prototype(3)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%-6v real pole %.4f, %.2f dB at 1 rad/s\n", norm, real(h.Poles[2]), 20*math.Log10(cmplx.Abs(h.At(1i))))
	}
	// Output:
	// delay  real pole -2.3222, -0.90 dB at 1 rad/s
	// corner real pole -1.3227, -3.01 dB at 1 rad/s
	// phase  real pole -0.9416, -6.24 dB at 1 rad/s
}
