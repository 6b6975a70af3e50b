package response_test

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"gonum.org/v1/gonum/floats"
)

// A 4th-order Butterworth anti-alias filter with a 2 kHz corner in front of
// a vibration sensor's ADC: gain, phase and group delay at a few
// frequencies.
func ExampleSweep() {
	p, _ := filter.Butterworth{}.Prototype(4)
	h, _ := p.ToLowpass(2000)
	for _, pt := range response.Sweep(h, []float64{200, 2000, 20000}) {
		fmt.Printf("%6.0f Hz %8.3f dB %8.2f° %6.1f µs\n", pt.Hz, pt.GainDB, pt.PhaseDeg, pt.DelayS*1e6)
	}
	// Output:
	//    200 Hz   -0.000 dB   -14.99°  208.8 µs
	//   2000 Hz   -3.010 dB  -180.00°  294.1 µs
	//  20000 Hz  -80.000 dB  -345.01°    2.1 µs
}

// Sweeping the same grid many times (a front end redrawing a plot) reuses
// one slice: SweepInto does not allocate.
func ExampleSweepInto() {
	p, _ := filter.Butterworth{}.Prototype(2)
	hz := floats.LogSpan(make([]float64, 101), 10, 1e5)
	dst := make([]response.Point, len(hz))
	for _, fc := range []float64{500, 1000, 2000} {
		h, _ := p.ToLowpass(fc)
		response.SweepInto(dst, h, hz)
		fmt.Printf("corner %4.0f Hz: %.2f dB at 10 kHz\n", fc, dst[75].GainDB)
	}
	// Output:
	// corner  500 Hz: -52.04 dB at 10 kHz
	// corner 1000 Hz: -40.00 dB at 10 kHz
	// corner 2000 Hz: -27.97 dB at 10 kHz
}

// The settling of a 2nd-order Butterworth lowpass (1 kHz) after a step at
// the input of a data logger channel.
func ExampleMeasureStep() {
	p, _ := filter.Butterworth{}.Prototype(2)
	h, _ := p.ToLowpass(1000)
	st, _ := response.MeasureStep(h, 0.01)
	fmt.Printf("overshoot %.2f %% at %.1f µs\n", st.OvershootPct, st.PeakS*1e6)
	fmt.Printf("rise 10-90 %% %.1f µs, settled to 1 %% after %.1f µs\n", st.RiseS*1e6, st.SettleS*1e6)
	// Output:
	// overshoot 4.32 % at 707.1 µs
	// rise 10-90 % 341.9 µs, settled to 1 % after 1048.3 µs
}

// The step response of a first-order lowpass with τ = 1 ms, sampled.
func ExampleStep() {
	h := filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1 / (2 * math.Pi * 1e-3), Gain: 1}.Transfer()
	y, _ := response.Step(h, []float64{0, 1e-3, 3e-3})
	fmt.Printf("%.4f %.4f %.4f\n", y[0], y[1], y[2])
	// Output:
	// 0.0000 0.6321 0.9502
}

// A 50 Hz mains notch is biproper (as many zeros as poles): its impulse
// response has a Dirac term, returned separately.
func ExampleImpulse() {
	h := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 50, Q: 5, ZeroHz: 50, Gain: 1}.Transfer()
	y, dirac, _ := response.Impulse(h, []float64{0, 0.01})
	fmt.Printf("Dirac weight %.0f, regular part %.2f, %.2f /s\n", dirac, y[0], y[1])
	// Output:
	// Dirac weight 1, regular part -62.83, 45.96 /s
}

// Where does a 6th-order Chebyshev lowpass (1 dB ripple to 10 kHz) fall
// through −20 dB?
func ExampleCrossingHz() {
	p, _ := filter.Chebyshev{RippleDB: 1}.Prototype(6)
	h, _ := p.ToLowpass(10000)
	f, _ := response.CrossingHz(h, -20, 100, 1e6)
	fmt.Printf("%.1f Hz\n", f)
	// Output:
	// 11925.0 Hz
}

// The −3 dB edges of a bandpass stage centred at 1 kHz with Q = 4.
func ExampleBandwidth() {
	h := filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 1000, Q: 4, Gain: 1}.Transfer()
	e, _ := response.Bandwidth(h, response.HalfPowerDB, 10, 1e5)
	fmt.Printf("%.1f Hz to %.1f Hz, width %.1f Hz, peak gain %.3f at %.0f Hz\n",
		e.LowerHz, e.UpperHz, e.WidthHz(), math.Pow(10, e.PeakDB/20), e.PeakHz)
	// Output:
	// 882.8 Hz to 1132.8 Hz, width 250.0 Hz, peak gain 1.000 at 1000 Hz
}

// An audio interface's anti-alias mask: flat within 0.5 dB to 20 kHz, 60 dB
// down from 28 kHz. The least elliptic design meets it; the worst margin
// and where it is tell how much room the design leaves.
func ExampleCheckMask() {
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{20000}, StopHz: [2]float64{28000},
		RippleDB: 0.5, AttenDB: 60}
	h, _ := filter.Design(filter.Elliptic{}, spec)
	r, _ := response.CheckMask(h, spec)
	fmt.Printf("order %d: pass %v\n", len(h.Poles), r.Pass)
	for _, g := range r.Regions {
		fmt.Printf("%s: margin %.1f dB\n", g.Region, g.MarginDB)
	}
	// Output:
	// order 7: pass true
	// passband: margin 0.0 dB
	// stopband: margin 13.4 dB
}

// Passband ripple and the least stopband attenuation of a 5th-order
// Chebyshev (0.25 dB to 3.4 kHz, telephone band).
func ExamplePassbandRippleDB() {
	p, _ := filter.Chebyshev{RippleDB: 0.25}.Prototype(5)
	h, _ := p.ToLowpass(3400)
	r, _ := response.PassbandRippleDB(h, 300, 3400)
	a, at, _ := response.StopbandAttenDB(h, 4600, 50000)
	fmt.Printf("ripple %.3f dB, least attenuation %.1f dB at %.0f Hz\n", r, a, at)
	// Output:
	// ripple 0.250 dB, least attenuation 17.3 dB at 4600 Hz
}
