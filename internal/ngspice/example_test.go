package ngspice_test

import (
	"fmt"

	"github.com/rolloff/rolloff/internal/ngspice"
)

// A 10 kΩ / 10 nF lowpass, corner near 1.59 kHz, simulated at 1 kHz and
// 10 kHz. (Not run as a test: it needs the simulator; TestACMatchesClosedForm
// checks the same path.) It prints
//
//	-1.4 dB at 1000 Hz
//	-16.1 dB at 10000 Hz
func ExampleAC() {
	deck := "sensor input lowpass\nVIN in 0 AC 1\nR1 in out 10k\nC1 out 0 10n\n.end\n"
	sw, err := ngspice.AC(deck, "out", 1, 1e3, 1e4)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range sw.Hz {
		fmt.Printf("%.1f dB at %.0f Hz\n", sw.GainDB[i], sw.Hz[i])
	}
}

// Reading the values that print and meas commands wrote.
func ExampleValues() {
	out := "Doing analysis at TEMP = 27.000000\ncorner              =  1.591549e+03\npeak = -2.500000e-01\n"
	for _, v := range ngspice.Values(out) {
		fmt.Printf("%s %.4g\n", v.Name, v.Value)
	}
	// Output:
	// corner 1592
	// peak -0.25
}
