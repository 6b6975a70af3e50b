package response

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// exact compares results that are exact to rounding.
var exact = cmpopts.EquateApprox(0, 1e-12)

func TestSweepKnownValues(t *testing.T) {
	// Second-order lowpass at f0 = 1 kHz, Q = 1/√2: −3.0103 dB and −90° at
	// f0, delay 2Q/ω0·... at f0 the delay of ω0²/(s² + ω0 s/Q + ω0²) is
	// 2Q/ω0 (from d/dω of −atan2(ω0ω/Q, ω0² − ω²), common practice).
	const f0 = 1000.0
	q := 1 / math.Sqrt2
	h := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: f0, Q: q, Gain: 1}.Transfer()
	got := Sweep(h, []float64{f0})[0]
	want := Point{Hz: f0, GainDB: -HalfPowerDB, PhaseDeg: -90, DelayS: 2 * q / (2 * math.Pi * f0)}
	if d := cmp.Diff(want, got, exact); d != "" {
		t.Errorf("(-want +got):\n%s", d)
	}
}

func TestSweepPhaseConventions(t *testing.T) {
	const f0 = 100.0
	lp := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: f0, Q: 0.7, Gain: 1}.Transfer()
	hp := filter.Stage{Kind: filter.HighpassStage, Order: 2, F0Hz: f0, Q: 0.7, Gain: 1}.Transfer()
	neg := lp
	neg.Gain = -neg.Gain
	notch := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: f0, Q: 2, ZeroHz: f0, Gain: 1}.Transfer()
	cases := []struct {
		reason string
		h      filter.Transfer
		hz     []float64
		want   []float64 // degrees
	}{
		{"lowpass starts at 0° and ends near −180°", lp, []float64{1e-6, f0, 1e9}, []float64{0, -90, -180}},
		{"highpass starts near +180° (two origin zeros)", hp, []float64{1e-6, f0, 1e9}, []float64{180, 90, 0}},
		{"negative gain adds 180°", neg, []float64{1e-6}, []float64{180}},
		{"a jω-axis zero jumps by +180°", notch, []float64{f0 * (1 - 1e-9), f0 * (1 + 1e-9)}, []float64{-90, 90}},
	}
	for _, c := range cases {
		pts := Sweep(c.h, c.hz)
		for i, p := range pts {
			if math.Abs(p.PhaseDeg-c.want[i]) > 1e-4 {
				t.Errorf("%s: phase at %g Hz = %.9g°, want %g°", c.reason, p.Hz, p.PhaseDeg, c.want[i])
			}
		}
	}
}

func TestSweepSpecialCases(t *testing.T) {
	notch := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 50, Q: 2, ZeroHz: 50, Gain: 1}.Transfer()
	bp := filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 50, Q: 2, Gain: 1}.Transfer()
	pts := Sweep(notch, []float64{50})
	if !math.IsInf(pts[0].GainDB, -1) {
		t.Errorf("gain on a transmission zero = %g dB, want −Inf", pts[0].GainDB)
	}
	pts = Sweep(bp, []float64{0})
	if !math.IsInf(pts[0].GainDB, -1) {
		t.Errorf("bandpass gain at DC = %g dB, want −Inf", pts[0].GainDB)
	}
	for _, s := range []System{bp, &bp, blackBox{bp}} {
		pts = Sweep(s, []float64{10, math.NaN(), 20})
		if p := pts[1]; !math.IsNaN(p.Hz) || !math.IsNaN(p.GainDB) || !math.IsNaN(p.PhaseDeg) || !math.IsNaN(p.DelayS) {
			t.Errorf("%T: NaN frequency gave %+v, want all NaN", s, p)
		}
		if math.IsNaN(pts[2].PhaseDeg) {
			t.Errorf("%T: a NaN frequency broke the unwrapping after it", s)
		}
	}
	if d := cmp.Diff(Sweep(bp, []float64{10, 20}), Sweep(&bp, []float64{10, 20})); d != "" {
		t.Errorf("pointer and value differ:\n%s", d)
	}
}

// delayed reports a constant delay through Delayer.
type delayed struct{ blackBox }

func (delayed) DelayAtHz(float64) float64 { return 42 }

func TestSweepUsesDelayer(t *testing.T) {
	h := filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 10, Gain: 1}.Transfer()
	for _, p := range Sweep(delayed{blackBox{h}}, []float64{1, 10}) {
		if p.DelayS != 42 {
			t.Errorf("delay %g, want the Delayer's 42", p.DelayS)
		}
	}
}

// TestSweepBlackBoxCoarse: the generic path keeps an 8th-order Butterworth's
// phase continuous on a grid of 3 points a decade, where the phase turns by
// up to 600° between points, and its numeric delay at DC uses the grid gap.
func TestSweepBlackBoxCoarse(t *testing.T) {
	h := butterworth(8, 1000)
	hz := floats.LogSpan(make([]float64, 13), 1, 1e4)
	hz = append([]float64{0}, hz...)
	a, b := Sweep(h, hz), Sweep(blackBox{h}, hz)
	for i := range a {
		if math.Abs(a[i].PhaseDeg-b[i].PhaseDeg) > 1e-9 {
			t.Errorf("at %g Hz: exact %.12g°, black box %.12g°", hz[i], a[i].PhaseDeg, b[i].PhaseDeg)
		}
		if e := math.Abs(a[i].DelayS-b[i].DelayS) / a[0].DelayS; e > 1e-8 {
			t.Errorf("at %g Hz: exact delay %.12g s, numeric %.12g s", hz[i], a[i].DelayS, b[i].DelayS)
		}
	}
	// Eight poles: the phase tends to −720° from above (−690.6° at ten
	// times the corner).
	if got := a[len(a)-1].PhaseDeg; !(got > -720 && got < -680) {
		t.Errorf("phase at 10 kHz = %g°, want in (−720°, −680°)", got)
	}
}

func TestSweepIntoNoAllocs(t *testing.T) {
	var s System = butterworth(8, 1000)
	hz := floats.LogSpan(make([]float64, 1000), 1, 1e5)
	dst := make([]Point, len(hz))
	if n := testing.AllocsPerRun(20, func() { SweepInto(dst, s, hz) }); n != 0 {
		t.Errorf("SweepInto of a filter.Transfer allocates %g times, want 0", n)
	}
	var bb System = blackBox{butterworth(8, 1000)}
	if n := testing.AllocsPerRun(20, func() { SweepInto(dst, bb, hz) }); n != 0 {
		t.Errorf("SweepInto of a black box allocates %g times, want 0", n)
	}
}

// TestNumericDelayAccuracy: the black-box delay (Richardson-extrapolated
// central differences) against the exact delay of a resonant pair whose
// poles lie at a relative distance d from j2πf0, over 0.5·f0 to 2.5·f0:
// the error, relative to |τ| + 1/ω, shrinks like d⁻⁶ (observed 2.2e-9 at
// d = 1 %, 3.4e-11 at 2 %, 5.6e-13 from 5 % on).
func TestNumericDelayAccuracy(t *testing.T) {
	for _, c := range []struct{ d, tol float64 }{{0.01, 5e-9}, {0.02, 1e-10}, {0.05, 2e-12}, {0.3, 2e-12}} {
		const f0 = 1000.0
		h := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: f0, Q: 1 / (2 * c.d), Gain: 1}.Transfer()
		hz := floats.Span(make([]float64, 201), 0.5*f0, 2.5*f0)
		a, b := Sweep(h, hz), Sweep(blackBox{h}, hz)
		for i := range a {
			e := math.Abs(a[i].DelayS-b[i].DelayS) / (math.Abs(a[i].DelayS) + 1/(2*math.Pi*hz[i]))
			if e > c.tol {
				t.Errorf("d = %g at %g Hz: numeric delay %.15g s, exact %.15g s (error %.2g > %g)",
					c.d, hz[i], b[i].DelayS, a[i].DelayS, e, c.tol)
			}
		}
	}
}
