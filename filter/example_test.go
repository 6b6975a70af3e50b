package filter_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// An anti-alias filter for a vibration sensor sampled at 20 kS/s: flat
// within 0.5 dB to 2 kHz, at least 60 dB down from 6 kHz. The elliptic
// family meets it at order 4; Stages gives the op-amp sections in
// ascending Q, with the gain spread for dynamic range.
func ExampleDesign() {
	spec := filter.Spec{
		Band:     filter.Lowpass,
		PassHz:   [2]float64{2000},
		StopHz:   [2]float64{6000},
		RippleDB: 0.5,
		AttenDB:  60,
	}
	n, err := filter.MinOrder(filter.Elliptic{}, spec)
	if err != nil {
		fmt.Println(err)
		return
	}
	h, err := filter.Design(filter.Elliptic{}, spec)
	if err != nil {
		fmt.Println(err)
		return
	}
	stages, err := h.Stages()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("order %d, %d stages\n", n, len(stages))
	for _, s := range stages {
		fmt.Printf("%-8v order %d  f0 %7.1f Hz  Q %6.3f  zero %7.1f Hz  gain %.3f\n",
			s.Kind, s.Order, s.F0Hz, s.Q, s.ZeroHz, s.Gain)
	}
	dB := func(f float64) float64 { return 20 * math.Log10(cmplx.Abs(h.AtHz(f))) }
	fmt.Printf("at 2 kHz %.2f dB, at 6 kHz %.1f dB\n", dB(2000), dB(6000))
	// Output:
	// order 4, 2 stages
	// notch    order 2  f0  1229.4 Hz  Q  0.713  zero 15293.3 Hz  gain 1.000
	// notch    order 2  f0  2062.3 Hz  Q  3.127  zero  6467.0 Hz  gain 0.944
	// at 2 kHz -0.50 dB, at 6 kHz -64.1 dB
}

// A mains-hum notch for a sensor chain: pass up to 40 Hz and from 75 Hz
// within 1 dB, remove 48 to 52 Hz by 40 dB. The mask is not geometrically
// symmetric (40·75 ≠ 48·52); MinOrder moves the transform's upper passband
// edge inward, within what the mask allows, to centre the transform on the
// stopband and need the least order (keeping both passband edges fixed,
// the Butterworth would need order 6).
func ExampleMinOrder_bandstop() {
	spec := filter.Spec{
		Band:     filter.Bandstop,
		PassHz:   [2]float64{40, 75},
		StopHz:   [2]float64{48, 52},
		RippleDB: 1,
		AttenDB:  40,
	}
	for _, f := range []filter.Family{filter.Butterworth{}, filter.Chebyshev{}, filter.Elliptic{}} {
		n, err := filter.MinOrder(f, spec)
		fmt.Println(f, n, err)
	}
	// Output:
	// Butterworth 4 <nil>
	// Chebyshev 3 <nil>
	// Elliptic 3 <nil>
}

// Stages can also put all the gain in the last stage.
func ExampleTransfer_StagesWith() {
	h, _ := filter.Butterworth{}.Prototype(4)
	h, _ = h.ToHighpass(100)
	h.Gain *= 10 // 20 dB of passband gain
	stages, _ := h.StagesWith(filter.StageOptions{Gain: filter.GainLast})
	for _, s := range stages {
		fmt.Printf("%v f0 %.1f Hz Q %.4f gain %.1f\n", s.Kind, s.F0Hz, s.Q, s.Gain)
	}
	// Output:
	// highpass f0 100.0 Hz Q 0.5412 gain 1.0
	// highpass f0 100.0 Hz Q 1.3066 gain 10.0
}

// A Spec and a Transfer in their JSON encodings.
func ExampleSpec_MarshalJSON() {
	spec := filter.Spec{Band: filter.Highpass, PassHz: [2]float64{300}, StopHz: [2]float64{100}, RippleDB: 1, AttenDB: 30}
	b, _ := json.Marshal(spec)
	fmt.Println(string(b))
	h := filter.Transfer{Poles: []complex128{complex(-1, 2), complex(-1, -2)}, Gain: 5}
	b, _ = json.Marshal(h)
	fmt.Println(string(b))
	// Output:
	// {"band":"highpass","pass_hz":[300,0],"stop_hz":[100,0],"ripple_db":1,"atten_db":30}
	// {"zeros":[],"poles":[[-1,2],[-1,-2]],"gain":5}
}
