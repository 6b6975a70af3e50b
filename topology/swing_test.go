package topology

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/ngspice"
	"pgregory.net/rapid"
)

// resonancePeak is the peak of |H| of a second-order lowpass or highpass
// of gain g and pole Q: g·Q/√(1 − 1/(4Q²)) above Q = 1/√2, g below (the
// familiar resonance peak; from memory of any active-filter handbook).
func resonancePeak(g, q float64) float64 {
	if q <= 1/math.Sqrt2 {
		return g
	}
	return g * q / math.Sqrt(1-1/(4*q*q))
}

// TestAmpPeaksStateVariable checks a state-variable lowpass against its
// closed forms: the lowpass output (the stage's) and the highpass summer
// peak at the resonance peak, and the bandpass integrator at exactly Q
// times the lowpass passband level, at f0 (its transfer (a/τ)s/D is a·Q
// there; the circuit's equations in kind_statevariable.go, common
// practice of state-variable design: the bandpass node is the one to
// watch).
func TestAmpPeaksStateVariable(t *testing.T) {
	for _, q := range []float64{0.6, 2, 8} {
		st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: q, Gain: 1.5}
		c, err := RealizeStage(st, Options{Kind: StateVariable})
		if err != nil {
			t.Fatal(err)
		}
		pk, err := c.AmpPeaks()
		if err != nil {
			t.Fatal(err)
		}
		want := map[string]float64{"hp": resonancePeak(1.5, q), "bp": 1.5 * q, "out": resonancePeak(1.5, q)}
		if len(pk) != 3 {
			t.Fatalf("Q %g: %d peaks %+v, want three op-amps", q, len(pk), pk)
		}
		for _, p := range pk {
			if e := math.Abs(p.Gain/want[p.Node] - 1); !(e <= 1e-9) {
				t.Errorf("Q %g: %s (%s) peaks at %.12g, want %.12g (rel %.2g)", q, p.Ref, p.Node, p.Gain, want[p.Node], e)
			}
			if p.Node == "bp" && math.Abs(p.Hz/1e3-1) > 1e-6 {
				t.Errorf("Q %g: bandpass node peaks at %g Hz, want f0", q, p.Hz)
			}
		}
	}
}

// TestAmpPeaksOutputs checks, for random stages of every kind, that the
// op-amp driving the stage's output peaks where |AtHz| does, at the value
// the stage's closed form gives (gain·resonance peak for lowpass and
// highpass, the gain for bandpass and first order), that |AtHz| there is
// that value, and that no op-amp output is below its value at f0.
func TestAmpPeaksOutputs(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		st, c := drawCircuit(t)
		pk, err := c.AmpPeaks()
		if err != nil {
			t.Fatal(err)
		}
		if len(pk) != c.OpAmps() {
			t.Fatalf("%d peaks for %d op-amps", len(pk), c.OpAmps())
		}
		var outPeak *AmpPeak
		for i := range pk {
			if pk[i].Node == "out" {
				outPeak = &pk[i]
			}
		}
		if outPeak == nil {
			t.Fatalf("no op-amp drives the output: %+v", pk)
		}
		g := math.Abs(st.Gain)
		var want float64
		switch {
		case st.Kind == filter.NotchStage:
			// DC gain, the high-frequency gain, or a peak between: at least
			// the larger of the two ends, and |AtHz| at the peak.
			r := st.F0Hz / st.ZeroHz
			want = math.NaN()
			if lim := g * math.Max(1, r*r); outPeak.Gain < lim*(1-1e-9) {
				t.Fatalf("notch output peak %g below its passband level %g", outPeak.Gain, lim)
			}
		case st.Order == 1 || st.Kind == filter.BandpassStage:
			want = g
		default:
			want = resonancePeak(g, st.Q)
		}
		if !math.IsNaN(want) && !(math.Abs(outPeak.Gain/want-1) <= 1e-9) {
			t.Fatalf("%v %v: output peak %.12g, want %.12g", c.Kind, st.Kind, outPeak.Gain, want)
		}
		if outPeak.Hz > 0 {
			if e := math.Abs(cmplxAbs(c.AtHz(outPeak.Hz))/outPeak.Gain - 1); e > 1e-12 {
				t.Fatalf("|AtHz| at the peak's frequency differs by %g", e)
			}
		}
	})
}

// TestAmpPeaksErrors checks the errors of bad input.
func TestAmpPeaksErrors(t *testing.T) {
	if _, err := (Chain{}).AmpPeaks(); !errors.Is(err, ErrStage) {
		t.Errorf("empty chain: %v", err)
	}
	wide := noiseDemoChain(t)
	wide.Circuits = append([]Circuit(nil), wide.Circuits...)
	far := filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e70, Gain: 1}
	fc, err := RealizeStage(far, Options{Kind: RCFollower, RMaxOhm: 1e100, CMinF: 1e-300})
	if err != nil {
		t.Fatal(err)
	}
	wide.Circuits = append(wide.Circuits, fc)
	if _, err := wide.AmpPeaks(); !errors.Is(err, ErrStage) {
		t.Errorf("stages 68 decades apart: %v", err)
	}
	c := noiseDemoChain(t).Circuits[1]
	bad := c
	bad.Parts = append([]Part(nil), c.Parts...)
	bad.Parts[1].Value = math.NaN()
	if _, err := bad.AmpPeaks(); !errors.Is(err, ErrParts) {
		t.Errorf("NaN part: %v", err)
	}
}

// TestAmpPeaksSPICE checks every op-amp output's peak against ngspice's AC
// analysis of the same deck, for every kind × stage kind and for a
// four-stage chain: ngspice's gain at the peak's frequency equals Gain
// (1e-5 relative, the VCVS op-amps of gain 1e7 and 12 printed digits),
// and nothing on a sweep of 100 points a decade over two decades either
// side of the f0s exceeds it (no higher peak was missed).
func TestAmpPeaksSPICE(t *testing.T) {
	ngspice.Required(t)
	// f1, f2: the span of the sweeps, two decades around the chains' f0s.
	check := func(name string, ch Chain, f1, f2 float64) {
		t.Helper()
		pk, err := ch.AmpPeaks()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		var b strings.Builder
		if err := ch.WriteSPICE(&b); err != nil {
			t.Fatal(err)
		}
		for _, p := range pk {
			node := fmt.Sprintf("s%d_%s", p.Stage+1, p.Node)
			if p.Node == "out" {
				node = "out"
				if p.Stage < len(ch.Circuits)-1 {
					node = fmt.Sprintf("s%d_out", p.Stage+1)
				}
			}
			// At the peak's frequency, when it is one ngspice sweeps (not DC,
			// not the top of the search grid where a highpass output rises to
			// its limit).
			if p.Hz > f1 && p.Hz < f2 {
				got := spiceMagAt(t, b.String(), node, p.Hz)
				if e := math.Abs(got/p.Gain - 1); e > 1e-5 {
					t.Errorf("%s %s (%s): ngspice %.9g at %.6g Hz, AmpPeaks %.9g", name, p.Ref, node, got, p.Hz, p.Gain)
				}
			}
			sw, err := ngspice.AC(b.String(), node, 100, f1, f2)
			if err != nil {
				t.Fatalf("%s %s: %v", name, node, err)
			}
			top := 0.0
			for _, db := range sw.GainDB {
				top = math.Max(top, math.Pow(10, db/20))
			}
			if top > p.Gain*(1+1e-5) {
				t.Errorf("%s %s (%s): ngspice sweep reaches %.9g, above the peak %.9g at %.6g Hz", name, p.Ref, node, top, p.Gain, p.Hz)
			}
		}
	}
	for _, k := range allKinds {
		for _, sk := range support[k] {
			st := plainStage(k, sk.kind, sk.order, 2e3, 3, 2.6e3, 1.4)
			c, err := RealizeStage(st, Options{Kind: k})
			if err != nil {
				t.Fatalf("%v %v: %v", k, sk.kind, err)
			}
			check(fmt.Sprintf("%v %v", k, sk.kind), Chain{Circuits: []Circuit{c}}, 20, 200e3)
		}
	}
	check("four-stage chain", noiseDemoChain(t), 0.3, 300e3)
}

// spiceMagAt returns ngspice's |V(node)| of deck (a unit AC input) at f
// hertz, from a one-point linear AC analysis printed with 12 digits.
func spiceMagAt(t *testing.T, deck, node string, f float64) float64 {
	t.Helper()
	out, err := ngspice.RunControl(deck, fmt.Sprintf("option numdgt=12\nac lin 1 %.12g %.12g\nprint vm(%s)", f, f, node))
	if err != nil {
		t.Fatalf("%s at %g Hz: %v", node, f, err)
	}
	for _, v := range ngspice.Values(out) {
		if v.Name == "vm("+node+")" {
			return v.Value
		}
	}
	t.Fatalf("no vm(%s) in ngspice's output:\n%s", node, out)
	return 0
}
