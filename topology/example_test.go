package topology_test

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// A 2 kHz anti-alias lowpass stage (Butterworth Q) for a sensor input, as a
// unity-gain Sallen-Key circuit with a 10 nF reference capacitor.
func ExampleRealizeStage() {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 2e3, Q: 1 / math.Sqrt2, Gain: 1}
	c, err := topology.RealizeStage(st, topology.Options{Kind: topology.SallenKey, CapF: 10e-9})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range c.Parts {
		fmt.Printf("%s %.4g\n", p.Ref, p.Value)
	}
	fmt.Printf("|H(2 kHz)| = %.2f dB\n", 20*math.Log10(cmplx.Abs(c.AtHz(2e3))))
	// Output:
	// R1 2378
	// R2 8876
	// C1 3e-08
	// C2 1e-08
	// |H(2 kHz)| = -3.01 dB
}

// A chain written as a SPICE deck for ngspice.
func ExampleChain_WriteSPICE() {
	ch, err := topology.Realize([]filter.Stage{
		{Kind: filter.HighpassStage, Order: 1, F0Hz: 20, Gain: 1},
	}, topology.Options{CapF: 1e-6})
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := ch.WriteSPICE(os.Stdout); err != nil {
		fmt.Println(err)
	}
	// Output:
	// rolloff filter chain, 1 stage(s)
	// * ideal op-amps are VCVS of gain 1e+07; the input is node in, the output node out
	// VIN in 0 AC 1
	// * stage 1: rc-follower highpass, order 1, f0 = 20 Hz, gain = 1
	// C1_s1 in s1_a 1e-06
	// R1_s1 s1_a 0 7957.74715459
	// E1_s1 out 0 s1_a out 1e+07
	// .end
}

// What the parts really do after snapping the capacitors, and how fast an
// op-amp the stage needs.
func ExampleCircuit_Refit() {
	st := filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 1e3, Q: 8, Gain: 1}
	c, _ := topology.RealizeStage(st, topology.Options{CapF: 22e-9})
	r, err := c.Refit([]topology.Part{{Ref: "C1", Value: 22e-9}, {Ref: "C2", Value: 22e-9}})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, _ := r.Achieved()
	fmt.Printf("%v, inverting %v: f0 %.1f Hz, Q %.2f, gain %.2f\n", r.Kind, r.Inverting(), a.F0Hz, a.Q, a.Gain)
	gbw, _ := r.RequiredGBWHz(0.01)
	fmt.Printf("GBW for 1%%: %.2g Hz (rule of thumb %.2g Hz)\n", gbw, r.RuleOfThumbGBWHz())
	// Output:
	// multiple-feedback, inverting true: f0 1000.0 Hz, Q 8.00, gain 1.00
	// GBW for 1%: 9.1e+05 Hz (rule of thumb 8e+05 Hz)
}

// Monte Carlo style evaluation: one Evaluator per goroutine.
func ExampleEvaluator_Achieved() {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 500, Q: 0.7071, Gain: 1}
	c, _ := topology.RealizeStage(st, topology.Options{})
	ev, _ := c.NewEvaluator()
	v := c.Values()
	v[0] *= 1.01 // R1 one percent high
	a, _ := ev.Achieved(v)
	fmt.Printf("f0 %.2f Hz, Q %.4f\n", a.F0Hz, a.Q)
	// Output:
	// f0 497.52 Hz, Q 0.7091
}

// Sensitivities of a unity-gain Sallen-Key lowpass: f0 moves by half of
// any part's relative change, the gain by none.
func ExampleCircuit_Sensitivities() {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 800, Q: 0.6, Gain: 1}
	c, _ := topology.RealizeStage(st, topology.Options{Kind: topology.SallenKey})
	ss, _ := c.Sensitivities()
	for _, s := range ss {
		fmt.Printf("%s: f0 %+.3f  Q %+.3f  gain %+.3f\n", s.Ref, s.F0, s.Q, math.Abs(s.Gain))
	}
	// Output:
	// R1: f0 -0.500  Q +0.289  gain +0.000
	// R2: f0 -0.500  Q -0.289  gain +0.000
	// C1: f0 -0.500  Q +0.500  gain +0.000
	// C2: f0 -0.500  Q -0.500  gain +0.000
}

// The output noise of an invented hydrophone preamplifier's anti-alias
// section (a 20 kHz Butterworth Sallen-Key stage, 10 nF reference
// capacitor), with an op-amp of 4 nV/√Hz and 0.5 pA/√Hz: the density at
// 1 kHz, the largest source there, and the RMS noise over the audio band.
func ExampleChain_NoiseRMS() {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 20e3, Q: 1 / math.Sqrt2, Gain: 1}
	ch, err := topology.Realize([]filter.Stage{st}, topology.Options{Kind: topology.SallenKey, CapF: 10e-9})
	if err != nil {
		fmt.Println(err)
		return
	}
	n := topology.Noise{AmpVoltage: 4e-9, AmpCurrent: 0.5e-12}
	d, err := ch.NoiseAt(n, 1e3)
	if err != nil {
		fmt.Println(err)
		return
	}
	src, err := ch.NoiseSources(n, 1e3)
	if err != nil {
		fmt.Println(err)
		return
	}
	top := src[0]
	for _, s := range src {
		if s.Density > top.Density {
			top = s
		}
	}
	rms, err := ch.NoiseRMS(n, 20, 20e3)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("at 1 kHz: %.2f nV/√Hz, largest %s %v %.2f nV/√Hz\n", d*1e9, top.Ref, top.Kind, top.Density*1e9)
	fmt.Printf("20 Hz to 20 kHz: %.3f µV RMS\n", rms*1e6)
	// Output:
	// at 1 kHz: 5.92 nV/√Hz, largest U1 amp-voltage 4.02 nV/√Hz
	// 20 Hz to 20 kHz: 0.982 µV RMS
}
