package topology

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/ngspice"
	"pgregory.net/rapid"
)

// partValue returns the value of part ref of c.
func partValue(t testing.TB, c Circuit, ref string) float64 {
	t.Helper()
	for _, p := range c.Parts {
		if p.Ref == ref {
			return p.Value
		}
	}
	t.Fatalf("%v circuit has no %s: %v", c.Kind, ref, c.Parts)
	return 0
}

// TestNoiseRCClosedForm checks the RC lowpass behind a follower against
// its closed forms: the resistor's thermal noise √(4kTR) shaped by the
// section, |H| = 1/√(1 + (f/fc)²), fc = 1/(2πRC), and its integral
// 4kTR·fc·(atan(hi/fc) − atan(lo/fc)), which over all frequencies is
// kT/C, independent of R (the kT/C noise of any RC section; from memory of
// circuit-noise texts, and the limit of the closed form).
func TestNoiseRCClosedForm(t *testing.T) {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1590, Gain: 1}
	c, err := RealizeStage(st, Options{Kind: RCFollower})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Parts) != 2 {
		t.Fatalf("unity-gain RC follower has parts %v, want R1 and C1", c.Parts)
	}
	r, cf := partValue(t, c, "R1"), partValue(t, c, "C1")
	fc := 1 / (2 * math.Pi * r * cf)
	n := Noise{TempK: 300}
	fourKTR := 4 * Boltzmann * 300 * r
	for _, f := range []float64{1, 100, fc, 3 * fc, 1e6} {
		got, err := c.NoiseAt(n, f)
		if err != nil {
			t.Fatal(err)
		}
		want := math.Sqrt(fourKTR / (1 + (f/fc)*(f/fc)))
		if e := math.Abs(got/want - 1); e > 1e-13 {
			t.Errorf("at %g Hz: %g V/√Hz, want %g (rel err %.2g)", f, got, want, e)
		}
	}
	ch := Chain{Circuits: []Circuit{c}}
	for _, band := range [][2]float64{{10, 20e3}, {1e-3 * fc, 1e6 * fc}, {0.9 * fc, 1.1 * fc}} {
		lo, hi := band[0], band[1]
		got, err := ch.NoiseRMS(n, lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		want := math.Sqrt(fourKTR * fc * (math.Atan(hi/fc) - math.Atan(lo/fc)))
		if e := math.Abs(got/want - 1); e > 1e-8 {
			t.Errorf("RMS over [%g, %g] Hz: %g V, want %g (rel err %.2g)", lo, hi, got, want, e)
		}
	}
	// Over all frequencies: kT/C.
	kTC := math.Sqrt(Boltzmann * 300 / cf)
	got, err := ch.NoiseRMS(n, 1e-9*fc, 1e9*fc)
	if err != nil {
		t.Fatal(err)
	}
	if e := math.Abs(got/kTC - 1); e > 1e-8 {
		t.Errorf("RMS over 18 decades %g V, kT/C gives %g (rel err %.2g)", got, kTC, e)
	}
}

// drawNoise draws a noise model: temperature 200 to 400 K, op-amp voltage
// noise 1 to 30 nV/√Hz and current noise 0.01 to 10 pA/√Hz (each absent
// at times), corners up to 1 kHz.
func drawNoise(t *rapid.T) Noise {
	n := Noise{TempK: rapid.Float64Range(200, 400).Draw(t, "tempK")}
	if rapid.Bool().Draw(t, "ampV") {
		n.AmpVoltage = 1e-9 * math.Pow(30, rapid.Float64Range(0, 1).Draw(t, "en"))
		n.VoltageCornerHz = rapid.Float64Range(0, 1e3).Draw(t, "enCorner")
	}
	if rapid.Bool().Draw(t, "ampI") {
		n.AmpCurrent = 1e-14 * math.Pow(1e3, rapid.Float64Range(0, 1).Draw(t, "in"))
		n.CurrentCornerHz = rapid.Float64Range(0, 1e3).Draw(t, "inCorner")
	}
	return n
}

// TestNoiseSourcesAddUp checks, for random stages of every kind, random
// noise models and frequencies, that the sources' squares sum to NoiseAt's
// square, that there is one source per resistor and three per op-amp, and
// that the sources scale as their physics says: resistor noise as √T,
// op-amp voltage noise as √(1 + fc/f).
func TestNoiseSourcesAddUp(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		st, c := drawCircuit(t)
		n := drawNoise(t)
		f := st.F0Hz * math.Pow(10, rapid.Float64Range(-2, 2).Draw(t, "logF"))
		total, err := c.NoiseAt(n, f)
		if err != nil {
			t.Fatal(err)
		}
		src, err := c.NoiseSources(n, f)
		if err != nil {
			t.Fatal(err)
		}
		res := 0
		for _, p := range c.Parts {
			if strings.HasPrefix(p.Ref, "R") {
				res++
			}
		}
		if want := res + 3*c.OpAmps(); len(src) != want {
			t.Fatalf("%d sources, want %d resistors + 3 × %d op-amps", len(src), res, c.OpAmps())
		}
		sum := 0.0
		for _, s := range src {
			if !(s.Density >= 0) {
				t.Fatalf("source %+v: density not non-negative", s)
			}
			sum += s.Density * s.Density
		}
		if e := math.Abs(math.Sqrt(sum)/total - 1); !(e <= 1e-12) {
			t.Fatalf("root sum of squares %g, NoiseAt %g", math.Sqrt(sum), total)
		}
		// Twice the temperature: resistor sources √2 higher, the others
		// unchanged; white op-amp voltage noise: its sources lower by
		// √(1 + fc/f).
		hot := n
		hot.TempK *= 2
		white := n
		white.VoltageCornerHz = 0
		srcHot, err := c.NoiseSources(hot, f)
		if err != nil {
			t.Fatal(err)
		}
		srcWhite, err := c.NoiseSources(white, f)
		if err != nil {
			t.Fatal(err)
		}
		for i, s := range src {
			wantHot, wantWhite := s.Density, s.Density
			switch s.Kind {
			case ResistorNoise:
				wantHot *= math.Sqrt2
			case AmpVoltageNoise:
				wantWhite /= math.Sqrt(1 + n.VoltageCornerHz/f)
			}
			if e := math.Abs(srcHot[i].Density - wantHot); e > 1e-12*wantHot {
				t.Fatalf("%+v at twice the temperature: %g, want %g", s, srcHot[i].Density, wantHot)
			}
			if e := math.Abs(srcWhite[i].Density - wantWhite); e > 1e-12*wantWhite {
				t.Fatalf("%+v without the 1/f corner: %g, want %g", s, srcWhite[i].Density, wantWhite)
			}
		}
	})
}

// TestNoiseImpedanceScaling checks impedance scaling on random stages of
// every kind: every resistor times a, every capacitor divided by a leaves
// the response as it was, multiplies the resistors' noise by √a and the
// op-amp current noise's by a (its transimpedances scale by a), and leaves
// the op-amp voltage noise's alone (its transfers are ratios).
func TestNoiseImpedanceScaling(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		st, c := drawCircuit(t)
		a := math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "logScale"))
		sc := c
		sc.Parts = append([]Part(nil), c.Parts...)
		for i, p := range sc.Parts {
			if strings.HasPrefix(p.Ref, "R") {
				sc.Parts[i].Value *= a
			} else {
				sc.Parts[i].Value /= a
			}
		}
		f := st.F0Hz * math.Pow(10, rapid.Float64Range(-2, 2).Draw(t, "logF"))
		// Near a notch's zero, against the passband level (passLevel).
		h0, h1 := c.AtHz(f), sc.AtHz(f)
		if e := cmplxAbs(h1 - h0); e > 1e-11*math.Max(cmplxAbs(h0), passLevel(st)) {
			t.Fatalf("scaled response %v, unscaled %v", h1, h0)
		}
		n := Noise{AmpVoltage: 5e-9, AmpCurrent: 1e-12}
		s0, err := c.NoiseSources(n, f)
		if err != nil {
			t.Fatal(err)
		}
		s1, err := sc.NoiseSources(n, f)
		if err != nil {
			t.Fatal(err)
		}
		scale := map[NoiseKind]float64{ResistorNoise: math.Sqrt(a), AmpVoltageNoise: 1, AmpCurrentPlusNoise: a, AmpCurrentMinusNoise: a}
		// Transfers that vanish in exact arithmetic (a current into a node
		// an op-amp output holds) are compared against a level, not
		// relatively: the largest source of the stage.
		level := 0.0
		for _, s := range s0 {
			level = math.Max(level, s.Density)
		}
		for i, s := range s0 {
			want := s.Density * scale[s.Kind]
			if e := math.Abs(s1[i].Density - want); e > 1e-10*want+1e-13*level*scale[s.Kind] {
				t.Fatalf("%+v scaled by %g: %g, want %g", s, a, s1[i].Density, want)
			}
		}
	})
}

// TestNoiseChainCarried checks Chain.NoiseAt and Chain.NoiseSources on a
// four-stage chain against the circuits' own noise carried by hand through
// the stages after them.
func TestNoiseChainCarried(t *testing.T) {
	ch := noiseDemoChain(t)
	n := Noise{AmpVoltage: 7e-9, AmpCurrent: 0.8e-12, VoltageCornerHz: 100}
	for _, f := range []float64{20, 700, 1e3, 3.3e3, 50e3} {
		total, err := ch.NoiseAt(n, f)
		if err != nil {
			t.Fatal(err)
		}
		want := 0.0
		for i, ci := range ch.Circuits {
			own, err := ci.NoiseAt(n, f)
			if err != nil {
				t.Fatal(err)
			}
			g := own
			for _, cj := range ch.Circuits[i+1:] {
				g *= cmplxAbs(cj.AtHz(f))
			}
			want += g * g
		}
		if e := math.Abs(total/math.Sqrt(want) - 1); e > 1e-13 {
			t.Errorf("at %g Hz: chain %g, by hand %g", f, total, math.Sqrt(want))
		}
		src, err := ch.NoiseSources(n, f)
		if err != nil {
			t.Fatal(err)
		}
		sum := 0.0
		for _, s := range src {
			sum += s.Density * s.Density
		}
		if e := math.Abs(math.Sqrt(sum)/total - 1); e > 1e-12 {
			t.Errorf("at %g Hz: sources add up to %g, NoiseAt %g", f, math.Sqrt(sum), total)
		}
		if last := src[len(src)-1]; last.Stage != len(ch.Circuits)-1 {
			t.Errorf("last source's stage %d, want %d", last.Stage, len(ch.Circuits)-1)
		}
	}
}

// TestNoiseRMSDense checks NoiseRMS on the four-stage chain (a resonance
// of Q 4 among them) against a dense trapezoid rule in log frequency
// (200,000 points; its error, below 1e-7 here, bounds the comparison).
func TestNoiseRMSDense(t *testing.T) {
	ch := noiseDemoChain(t)
	n := Noise{AmpVoltage: 7e-9, AmpCurrent: 0.8e-12, CurrentCornerHz: 200}
	lo, hi := 5.0, 200e3
	got, err := ch.NoiseRMS(n, lo, hi)
	if err != nil {
		t.Fatal(err)
	}
	const m = 200000
	ul, uh := math.Log(lo), math.Log(hi)
	sum := 0.0
	for i := 0; i <= m; i++ {
		u := ul + (uh-ul)*float64(i)/m
		d, err := ch.NoiseAt(n, math.Exp(u))
		if err != nil {
			t.Fatal(err)
		}
		w := 1.0
		if i == 0 || i == m {
			w = 0.5
		}
		sum += w * d * d * math.Exp(u)
	}
	want := math.Sqrt(sum * (uh - ul) / m)
	if e := math.Abs(got/want - 1); e > 1e-7 {
		t.Errorf("NoiseRMS %g V, dense trapezoid %g V (rel %.2g)", got, want, e)
	}
}

// noiseDemoChain is an invented geophone front end's chain: a first-order
// highpass, two lowpass sections (one of Q 4) and a notch.
func noiseDemoChain(t testing.TB) Chain {
	t.Helper()
	stages := []filter.Stage{
		{Kind: filter.HighpassStage, Order: 1, F0Hz: 30, Gain: 1},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7, Gain: 2},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 1.1e3, Q: 4, Gain: 1},
		{Kind: filter.NotchStage, Order: 2, F0Hz: 3e3, Q: 1.2, ZeroHz: 4.2e3, Gain: 1},
	}
	ch, err := Realize(stages, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return ch
}

// TestNoiseErrors checks that bad input gets an error errors.Is can match.
func TestNoiseErrors(t *testing.T) {
	ch := noiseDemoChain(t)
	c := ch.Circuits[1]
	for _, n := range []Noise{{TempK: -1}, {TempK: math.NaN()}, {AmpVoltage: math.Inf(1)}, {AmpCurrent: -1e-12},
		{VoltageCornerHz: math.NaN()}, {CurrentCornerHz: -5}} {
		if _, err := c.NoiseAt(n, 1e3); !errors.Is(err, ErrOptions) {
			t.Errorf("%+v: error %v, want ErrOptions", n, err)
		}
		if _, err := ch.NoiseRMS(n, 10, 1e4); !errors.Is(err, ErrOptions) {
			t.Errorf("NoiseRMS %+v: error %v, want ErrOptions", n, err)
		}
	}
	for _, f := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		if _, err := c.NoiseAt(Noise{}, f); !errors.Is(err, ErrOptions) {
			t.Errorf("at %g Hz: error %v, want ErrOptions", f, err)
		}
		if _, err := ch.NoiseSources(Noise{}, f); !errors.Is(err, ErrOptions) {
			t.Errorf("sources at %g Hz: error %v, want ErrOptions", f, err)
		}
	}
	for _, b := range [][2]float64{{0, 1e3}, {1e3, 1e3}, {1e3, 10}, {10, math.Inf(1)}, {math.NaN(), 1e3}} {
		if _, err := ch.NoiseRMS(Noise{}, b[0], b[1]); !errors.Is(err, ErrOptions) {
			t.Errorf("band %v: error %v, want ErrOptions", b, err)
		}
	}
	if _, err := c.NoiseAt(Noise{OpAmp: OpAmp{GBWHz: -1}}, 1e3); !errors.Is(err, ErrOpAmp) {
		t.Errorf("negative GBW: error %v, want ErrOpAmp", err)
	}
	if _, err := (Chain{}).NoiseAt(Noise{}, 1e3); !errors.Is(err, ErrStage) {
		t.Errorf("empty chain: error %v, want ErrStage", err)
	}
	bad := c
	bad.Parts = append([]Part(nil), c.Parts...)
	bad.Parts[0].Value = -1
	if _, err := bad.NoiseAt(Noise{}, 1e3); !errors.Is(err, ErrParts) {
		t.Errorf("negative part: error %v, want ErrParts", err)
	}
	if _, err := (Chain{Circuits: []Circuit{ch.Circuits[0], bad}}).NoiseRMS(Noise{}, 10, 1e4); !errors.Is(err, ErrParts) {
		t.Errorf("chain with a negative part: error %v, want ErrParts", err)
	}
	short := c
	short.Parts = c.Parts[:1]
	if _, err := short.NoiseSources(Noise{}, 1e3); !errors.Is(err, ErrParts) {
		t.Errorf("missing parts: error %v, want ErrParts", err)
	}
}

// TestNoiseAtAllocs checks that NoiseAt allocates nothing, for one circuit
// and for a chain.
func TestNoiseAtAllocs(t *testing.T) {
	ch := noiseDemoChain(t)
	n := Noise{AmpVoltage: 4e-9, AmpCurrent: 1e-12}
	if a := testing.AllocsPerRun(100, func() { _, _ = ch.NoiseAt(n, 1e3) }); a != 0 {
		t.Errorf("Chain.NoiseAt allocates %v times", a)
	}
}

func BenchmarkNoiseAt(b *testing.B) {
	ch := noiseDemoChain(b)
	n := Noise{AmpVoltage: 4e-9, AmpCurrent: 1e-12}
	b.Run("Circuit", func(b *testing.B) {
		b.ReportAllocs()
		c := ch.Circuits[3]
		for b.Loop() {
			if _, err := c.NoiseAt(n, 1e3); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("Chain4", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := ch.NoiseAt(n, 1e3); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("RMS4", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := ch.NoiseRMS(n, 10, 20e3); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// noiseDeck writes ch's SPICE deck (WriteSPICE, or WriteSPICEWith with
// n.OpAmp when that has a finite gain) with the op-amp noise of n added as
// ngspice noise sources (it has no noise source element of its own): a
// resistor of e²/4kT in series with every op-amp's non-inverting input
// (its open-circuit noise voltage √(4kTR) is e), and at each input a
// current-controlled current source copying the noise current of a
// resistor of 4kT/i² held at 0 V by a voltage source (noise current
// √(4kT/R) = i). The deck's own resistors are ngspice's thermal sources;
// the macro model's internal resistors are made noiseless (noisy=0), as
// Noise's op-amp model is.
func noiseDeck(t *testing.T, ch Chain, n Noise, tempK float64) string {
	t.Helper()
	macro := n.OpAmp != (OpAmp{})
	var b strings.Builder
	var err error
	if macro {
		err = ch.WriteSPICEWith(&b, n.OpAmp)
	} else {
		err = ch.WriteSPICE(&b)
	}
	if err != nil {
		t.Fatal(err)
	}
	fourKT := 4 * Boltzmann * tempK
	inputs := "E" // the elements whose control inputs are the op-amp's
	if macro {
		inputs = "G"
	}
	var out []string
	for _, line := range strings.Split(b.String(), "\n") {
		fs := strings.Fields(line)
		if macro && len(fs) == 4 && (strings.HasPrefix(fs[0], "RP") || strings.HasPrefix(fs[0], "RO")) {
			out = append(out, line+" noisy=0")
			continue
		}
		if len(fs) != 6 || !strings.HasPrefix(fs[0], inputs) {
			out = append(out, line)
			continue
		}
		// E<k>_s<n> out 0 plus minus gain, or G<k>_s<n> 0 x plus minus gm
		name, plus, minus := fs[0], fs[3], fs[4]
		if n.AmpVoltage > 0 {
			x := "nv_" + name
			out = append(out, fmt.Sprintf("RNV_%s %s %s %.12g", name, x, plus, n.AmpVoltage*n.AmpVoltage/fourKT))
			fs[3] = x
		}
		out = append(out, strings.Join(fs, " "))
		if n.AmpCurrent > 0 {
			r := fourKT / (n.AmpCurrent * n.AmpCurrent)
			for i, node := range []string{plus, minus} {
				id := fmt.Sprintf("%d_%s", i, name)
				out = append(out,
					fmt.Sprintf("RNI%s ni%s 0 %.12g", id, id, r),
					fmt.Sprintf("VNI%s ni%s 0 0", id, id),
					fmt.Sprintf("FNI%s %s 0 VNI%s 1", id, node, id))
			}
		}
	}
	return strings.Join(out, "\n")
}

// spiceNoise runs ngspice's noise analysis of deck at 25 °C (ngspice's
// temperature option) and returns its output noise densities, V/√Hz, with
// their frequencies.
func spiceNoise(t *testing.T, deck string, perDecade int, f1, f2 float64) (hz, dens []float64) {
	t.Helper()
	ctl := fmt.Sprintf("set temp=25\nnoise v(out) VIN dec %d %.12g %.12g\nsetplot noise1\nprint onoise_spectrum", perDecade, f1, f2)
	stdout, err := ngspice.RunControl(deck, ctl)
	if err != nil {
		t.Fatalf("%v\n%s", err, deck)
	}
	for _, line := range strings.Split(stdout, "\n") {
		fs := strings.Fields(line)
		if len(fs) != 3 {
			continue
		}
		if _, err := strconv.Atoi(fs[0]); err != nil {
			continue
		}
		f, err1 := strconv.ParseFloat(fs[1], 64)
		d, err2 := strconv.ParseFloat(fs[2], 64)
		if err1 != nil || err2 != nil {
			continue
		}
		hz, dens = append(hz, f), append(dens, d)
	}
	if len(hz) == 0 {
		t.Fatalf("no noise spectrum in ngspice's output:\n%s", stdout)
	}
	return hz, dens
}

// spiceNoiseTol is the agreement asked between ngspice's noise analysis
// and NoiseAt: ngspice prints 7 significant digits, its op-amps are VCVS
// of gain 1e7 and its Boltzmann constant (CODATA 2014, 1.38064852e-23,
// from memory of ngspice's constants) is 1.7e-7 below the SI's: a few
// 1e-6 apart in all.
const spiceNoiseTol = 2e-5

// checkNoiseDeck compares ngspice's noise analysis of ch with NoiseAt at
// 25 °C over four decades around f0.
func checkNoiseDeck(t *testing.T, name string, ch Chain, n Noise, f0 float64) {
	t.Helper()
	n.TempK = 298.15
	deck := noiseDeck(t, ch, n, n.TempK)
	hz, dens := spiceNoise(t, deck, 10, f0/100, f0*100)
	worst := 0.0
	for i, f := range hz {
		want, err := ch.NoiseAt(n, f)
		if err != nil {
			t.Fatal(err)
		}
		e := math.Abs(dens[i]/want - 1)
		worst = math.Max(worst, e)
		if !(e <= spiceNoiseTol) {
			t.Errorf("%s at %.6g Hz: ngspice %.7g V/√Hz, NoiseAt %.7g (rel %.2g)\n%s", name, f, dens[i], want, e, deck)
			return
		}
	}
	t.Logf("%s: %d points, worst rel %.2g", name, len(hz), worst)
}

// TestNoiseSPICE simulates the noise of every kind and stage kind it
// realizes (resistor noise alone, then with op-amp voltage and current
// noise) and of a four-stage chain with ngspice's noise analysis, an
// independent simulator, and compares the output noise densities with
// NoiseAt.
func TestNoiseSPICE(t *testing.T) {
	ngspice.Required(t)
	amps := Noise{AmpVoltage: 9e-9, AmpCurrent: 2e-12}
	for _, k := range allKinds {
		for _, st := range spiceCases() {
			if st.Gain != 1 && st.Gain != 3 && st.Kind != filter.NotchStage {
				continue // the gain variants: one attenuating, one amplifying
			}
			if k == SallenKeyEqual && st.Order == 2 {
				st.Gain *= (3 - 1/st.Q) / 3.5 // below K
			}
			c, err := RealizeStage(st, Options{Kind: k})
			if err != nil {
				continue
			}
			name := fmt.Sprintf("%v %v gain %g zero %g", k, st.Kind, st.Gain, st.ZeroHz)
			ch := Chain{Circuits: []Circuit{c}}
			checkNoiseDeck(t, name, ch, Noise{}, st.F0Hz)
			checkNoiseDeck(t, name+" with op-amp noise", ch, amps, st.F0Hz)
		}
	}
	checkNoiseDeck(t, "four-stage chain", noiseDemoChain(t), amps, 1e3)
	// A slow op-amp (TestSPICENonIdeal's): its gain-bandwidth shapes the
	// noise transfers, most of all the op-amp's own voltage noise.
	slow := amps
	slow.OpAmp = OpAmp{GBWHz: 200e3, DCGain: 1e5, ROutOhm: 100}
	for _, k := range allKinds {
		for _, sk := range support[k] {
			st := plainStage(k, sk.kind, sk.order, 5e3, 2, 6e3, 1.2) // TestSPICENonIdeal's
			c, err := RealizeStage(st, Options{Kind: k})
			if err != nil {
				t.Fatalf("%v %v: %v", k, sk.kind, err)
			}
			ch := Chain{Circuits: []Circuit{c}}
			checkNoiseDeck(t, fmt.Sprintf("%v %v, slow op-amp", k, sk.kind), ch, slow, st.F0Hz)
			// The model must visibly matter, or the check proves nothing.
			ideal, err := c.NoiseAt(amps, 20*st.F0Hz)
			if err != nil {
				t.Fatal(err)
			}
			withModel, err := c.NoiseAt(slow, 20*st.F0Hz)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(withModel/ideal-1) < 0.01 {
				t.Errorf("%v %v: the op-amp model moves the noise at 20·f0 by only %.2g", k, sk.kind, withModel/ideal-1)
			}
		}
	}
}

// TestNoiseSourceJSON checks that noise sources marshal to their
// snake_case fields, the kind by name, and read back equal; an unknown
// kind is an error either way.
func TestNoiseSourceJSON(t *testing.T) {
	ch := noiseDemoChain(t)
	src, err := ch.NoiseSources(Noise{AmpVoltage: 4e-9, AmpCurrent: 1e-12}, 1e3)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(src)
	if err != nil {
		t.Fatal(err)
	}
	var back []NoiseSource
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(src, back); diff != "" {
		t.Errorf("round trip (-before +after):\n%s", diff)
	}
	if !strings.Contains(string(b), `"kind":"amp-current+"`) || !strings.Contains(string(b), `"density":`) {
		t.Errorf("JSON %s lacks the named kind or the density field", b)
	}
	for k := ResistorNoise; k <= AmpCurrentMinusNoise; k++ {
		var got NoiseKind
		if err := got.UnmarshalText([]byte(k.String())); err != nil || got != k {
			t.Errorf("%v reads back as %v, %v", k, got, err)
		}
	}
	if _, err := NoiseKind(0).MarshalText(); !errors.Is(err, ErrOptions) {
		t.Errorf("kind 0 marshals: %v", err)
	}
	if err := json.Unmarshal([]byte(`[{"kind":"shot"}]`), &back); !errors.Is(err, ErrOptions) {
		t.Errorf("unknown kind: %v", err)
	}
	if s := NoiseKind(9).String(); s != "NoiseKind(9)" {
		t.Errorf("NoiseKind(9).String() = %q", s)
	}
}
