package mna_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/internal/mna"
)

// An inverting amplifier with gain −10 and an op-amp of 1 MHz gain-bandwidth:
// the closed-loop bandwidth is near GBW/(1 + 10).
func ExampleWorkspace_Transfer() {
	net := mna.Netlist{Nodes: 3, In: 1, Out: 3, Elements: []mna.Element{
		{Kind: mna.Resistor, A: 1, B: 2, Value: 0}, // Rin
		{Kind: mna.Resistor, A: 2, B: 3, Value: 1}, // Rf
		{Kind: mna.OpAmp, A: 0, B: 2, Out: 3},      // + at ground, − at node 2
	}}
	vals := []float64{1e3, 10e3}
	var w mna.Workspace
	ideal, _, _ := w.Transfer(&net, vals, mna.Amp{}, complex(0, 2*math.Pi*1e3))
	fmt.Printf("ideal: %.4f\n", real(ideal))
	r, _ := mna.RationalOf(&net, vals, mna.Amp{GBWHz: 1e6}, 0)
	_, poles, _, _ := r.ZerosPoles()
	fmt.Printf("pole: %.1f kHz\n", -real(poles[0])/(2*math.Pi)/1e3)
	h := r.At(complex(0, 2*math.Pi*1e3))
	fmt.Printf("|H(1 kHz)| = %.4f\n", cmplx.Abs(h))
	// Output:
	// ideal: -10.0000
	// pole: 90.9 kHz
	// |H(1 kHz)| = 9.9994
}
