package response

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// chebyshev returns the Chebyshev type I lowpass of order n, ripple rdB and
// ripple edge fp Hz from its pole formula pₖ = ωp(−sinh a·sin θₖ +
// j·cosh a·cos θₖ), a = asinh(1/ε)/n, θₖ = (2k−1)π/(2n), ε² = 10^{r/10} − 1,
// normalized to a 0 dB passband maximum (from memory of Williams and
// Taylor, Electronic Filter Design Handbook, ch. 2).
func chebyshev(n int, rdB, fp float64) filter.Transfer {
	eps := math.Sqrt(math.Pow(10, rdB/10) - 1)
	a := math.Asinh(1/eps) / float64(n)
	wp := 2 * math.Pi * fp
	h := filter.Transfer{Gain: 1}
	for k := 1; k <= n; k++ {
		th := float64(2*k-1) * math.Pi / float64(2*n)
		p := complex(-wp*math.Sinh(a)*math.Sin(th), wp*math.Cosh(a)*math.Cos(th))
		if 2*k-1 == n {
			p = complex(real(p), 0)
		}
		h.Poles = append(h.Poles, p)
		h.Gain *= math.Hypot(real(p), imag(p))
	}
	if n%2 == 0 {
		h.Gain /= math.Sqrt(1 + eps*eps)
	}
	return h
}

func TestBandwidthLowpassAndBandpass(t *testing.T) {
	b := butterworth(4, 1000)
	e, err := Bandwidth(b, HalfPowerDB, 1, 1e5)
	if err != nil {
		t.Fatal(err)
	}
	// Butterworth corner: −10·log10(2) dB exactly at fc (the definition).
	if e.LowerHz != 0 || math.Abs(e.UpperHz-1000) > 1e-9*1000 || math.Abs(e.PeakDB) > 1e-12 {
		t.Errorf("lowpass edges %+v, want lower 0, upper 1000 Hz, peak 0 dB", e)
	}
	if e.WidthHz() != e.UpperHz {
		t.Errorf("width %g, want %g", e.WidthHz(), e.UpperHz)
	}
	// Second-order bandpass: −3 dB edges f0·(√(1 + 1/(4Q²)) ∓ 1/(2Q)), width
	// f0/Q, peak Gain at f0 (common practice).
	const f0, q = 2000.0, 5.0
	bp := filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: f0, Q: q, Gain: 2}.Transfer()
	e, err = Bandwidth(bp, HalfPowerDB, 10, 1e5)
	if err != nil {
		t.Fatal(err)
	}
	r := math.Sqrt(1 + 1/(4*q*q))
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"lower", e.LowerHz, f0 * (r - 1/(2*q)), 1e-9},
		{"upper", e.UpperHz, f0 * (r + 1/(2*q)), 1e-9},
		{"width", e.WidthHz(), f0 / q, 1e-8},
		{"peak Hz", e.PeakHz, f0, 1e-6},
		{"peak dB", e.PeakDB, 20 * math.Log10(2), 1e-12},
	} {
		if math.Abs(c.got-c.want) > c.tol*math.Abs(c.want) {
			t.Errorf("bandpass %s = %.12g, want %.12g", c.name, c.got, c.want)
		}
	}
	// Highpass: no upper edge.
	hp := filter.Stage{Kind: filter.HighpassStage, Order: 2, F0Hz: 300, Q: 1 / math.Sqrt2, Gain: 1}.Transfer()
	e, err = Bandwidth(hp, HalfPowerDB, 1, 1e5)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsInf(e.UpperHz, 1) || math.Abs(e.LowerHz-300) > 1e-9*300 {
		t.Errorf("highpass edges %+v, want lower 300 Hz, upper +Inf", e)
	}
}

func TestRippleAttenPeak(t *testing.T) {
	// Chebyshev passband ripple equals its design ripple.
	for _, n := range []int{3, 4, 7} {
		h := chebyshev(n, 0.5, 1000)
		r, err := PassbandRippleDB(h, 1, 1000)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r-0.5) > 1e-9 {
			t.Errorf("Chebyshev %d ripple %.12g dB, want 0.5 dB", n, r)
		}
	}
	// Butterworth least stopband attenuation is at the stopband edge:
	// 10·log10(1 + (f/fc)^{2n}) (the Butterworth magnitude).
	h := butterworth(5, 1000)
	a, at, err := StopbandAttenDB(h, 3000, 30000)
	if err != nil {
		t.Fatal(err)
	}
	if want := 10 * math.Log10(1+math.Pow(3, 10)); math.Abs(a-want) > 1e-10 || at != 3000 {
		t.Errorf("attenuation %.12g dB at %g Hz, want %.12g dB at 3000 Hz", a, at, want)
	}
	// Resonant second-order lowpass: peak Q/√(1 − 1/(4Q²)) at
	// f0·√(1 − 1/(2Q²)) (from memory of Ogata, Modern Control Engineering,
	// resonant peak of the second-order system).
	const f0, q = 500.0, 10.0
	lp := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: f0, Q: q, Gain: 1}.Transfer()
	for _, s := range []System{lp, blackBox{lp}} {
		g, hz, err := PeakGain(s, 10, 1e4)
		if err != nil {
			t.Fatal(err)
		}
		wantG := 20 * math.Log10(q/math.Sqrt(1-1/(4*q*q)))
		wantHz := f0 * math.Sqrt(1-1/(2*q*q))
		if math.Abs(g-wantG) > 1e-11 || math.Abs(hz-wantHz) > 1e-6*wantHz {
			t.Errorf("%T: peak %.12g dB at %.9g Hz, want %.12g dB at %.9g Hz", s, g, hz, wantG, wantHz)
		}
	}
}

// bumpTransfer is a narrow resonance of peak gain q2/q1 at fb Hz and −3 dB
// width about fb/q2: (s² + (ω/q1)s + ω²)/(s² + (ω/q2)s + ω²), ω = 2π·fb.
func bumpTransfer(fb, q1, q2 float64) filter.Transfer {
	z := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: fb, Q: q1, Gain: 1}.Transfer()
	p := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: fb, Q: q2, Gain: 1}.Transfer()
	return filter.Transfer{Zeros: z.Poles, Poles: p.Poles, Gain: 1}
}

// times returns the product a·b.
func times(a, b filter.Transfer) filter.Transfer {
	return filter.Transfer{
		Zeros: append(append([]complex128{}, a.Zeros...), b.Zeros...),
		Poles: append(append([]complex128{}, a.Poles...), b.Poles...),
		Gain:  a.Gain * b.Gain,
	}
}

func TestNarrowPeakBetweenGridPoints(t *testing.T) {
	// A peak of +20 dB and 1/3 of the grid spacing wide, centred between two
	// grid points of the 400-a-decade scan of [100, 1e4] Hz.
	step := math.Pow(10, 1.0/400)
	fb := 1000 * math.Sqrt(step)
	for _, q2 := range []float64{300, 3e5} {
		h := times(butterworth(2, 1e5), bumpTransfer(fb, q2/10, q2))
		systems := []System{h}
		if q2 < 1e3 {
			systems = append(systems, blackBox{h})
		}
		for _, s := range systems {
			g, hz, err := PeakGain(s, 100, 1e4)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(g-20) > 1e-3 || math.Abs(hz-fb) > 1e-6*fb {
				t.Errorf("Q %g, %T: peak %.6g dB at %.9g Hz, want 20 dB at %.9g Hz", q2, s, g, hz, fb)
			}
		}
	}
}

func TestMeasureErrors(t *testing.T) {
	h := butterworth(2, 1000)
	if _, err := CrossingHz(h, math.NaN(), 1, 10); !errors.Is(err, ErrGrid) {
		t.Errorf("NaN level: %v", err)
	}
	if _, err := CrossingHz(h, -3, 0, 10); !errors.Is(err, ErrGrid) {
		t.Errorf("zero lo: %v", err)
	}
	if _, err := CrossingHz(h, -3, 10, 10); !errors.Is(err, ErrGrid) {
		t.Errorf("lo = hi: %v", err)
	}
	if _, err := CrossingHz(h, -3, 1, math.Inf(1)); !errors.Is(err, ErrGrid) {
		t.Errorf("infinite hi: %v", err)
	}
	if _, err := CrossingHz(h, -300, 1, 10); !errors.Is(err, ErrNoCrossing) {
		t.Errorf("no crossing: %v", err)
	}
	if _, err := Bandwidth(h, -3, 1, 10); !errors.Is(err, ErrGrid) {
		t.Errorf("negative drop: %v", err)
	}
	if _, err := GainExtremes(nanSystem{}, 1, 10); !errors.Is(err, ErrSystem) {
		t.Errorf("NaN system: %v", err)
	}
	if _, err := MeasureStep(h, 0); !errors.Is(err, ErrGrid) {
		t.Errorf("zero band: %v", err)
	}
	unstable := filter.Transfer{Poles: []complex128{1}, Gain: 1}
	if _, err := MeasureStep(unstable, 0.01); !errors.Is(err, ErrSystem) {
		t.Errorf("unstable: %v", err)
	}
	hp := filter.Stage{Kind: filter.HighpassStage, Order: 1, F0Hz: 10, Gain: 1}.Transfer()
	if _, err := MeasureStep(hp, 0.01); !errors.Is(err, ErrSystem) {
		t.Errorf("highpass (final value 0): %v", err)
	}
}

type nanSystem struct{}

func (nanSystem) AtHz(float64) complex128 { return complex(math.NaN(), 0) }

func TestCrossingExact(t *testing.T) {
	// Butterworth corner by CrossingHz, for many orders.
	for n := 1; n <= 12; n++ {
		f, err := CrossingHz(butterworth(n, 1234), -HalfPowerDB, 10, 1e5)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(f-1234) > 1e-12*1234*4 {
			t.Errorf("order %d: corner %.15g Hz, want 1234 Hz", n, f)
		}
	}
}

func TestMeasureStepSettle(t *testing.T) {
	// A resonant second-order lowpass (Q = 5): the settling time into ±2 %
	// is where the last excursion of the decaying oscillation leaves the
	// band: |y − 1| ≤ 0.02 after, and some sample just before is outside.
	h := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 100, Q: 5, Gain: 1}.Transfer()
	st, err := MeasureStep(h, 0.02)
	if err != nil {
		t.Fatal(err)
	}
	y, _ := Step(h, []float64{st.SettleS})
	if math.Abs(math.Abs(y[0]-1)-0.02) > 1e-9 {
		t.Errorf("|y(settle) − 1| = %.12g, want 0.02", math.Abs(y[0]-1))
	}
	ts := make([]float64, 20000)
	for i := range ts {
		ts[i] = st.SettleS * (1 + 1e-9 + 4*float64(i)/float64(len(ts)))
	}
	ys, _ := Step(h, ts)
	for i, v := range ys {
		if math.Abs(v-1) > 0.02 {
			t.Fatalf("outside the band at %g s, after the settling time %g s", ts[i], st.SettleS)
		}
	}
	// Envelope bound: settling happens before the envelope e^{−σt}/√(1−ζ²)
	// enters the band (common practice), and within one half period of it.
	zeta := 1 / (2 * 5.0)
	sigma := zeta * 2 * math.Pi * 100
	env := math.Log(1/(0.02*math.Sqrt(1-zeta*zeta))) / sigma
	half := math.Pi / (2 * math.Pi * 100 * math.Sqrt(1-zeta*zeta))
	if !(st.SettleS <= env && st.SettleS > env-half) {
		t.Errorf("settling %g s, want in (%g, %g]", st.SettleS, env-half, env)
	}
}

// TestCrossingNarrowDip: a dip to −20 dB one third of the grid spacing
// wide, centred between grid points of a flat response, is a crossing of
// −10 dB that CrossingHz finds from the refined extremum, for the exact
// transfer and for the same system as a black box.
func TestCrossingNarrowDip(t *testing.T) {
	step := math.Pow(10, 1.0/400)
	fb := 1000 * math.Sqrt(step)
	// Zeros with Q 3000 over poles with Q 300: gain 300/3000 at fb, width
	// about fb/300.
	dip := bumpTransfer(fb, 3000, 300)
	for _, s := range []System{dip, blackBox{dip}} {
		f, err := CrossingHz(s, -10, 100, 1e4)
		if err != nil {
			t.Fatalf("%T: %v", s, err)
		}
		if g := gainDB(s.AtHz(f)); math.Abs(g+10) > 1e-6 || f > fb || f < fb*(1-1/100.0) {
			t.Errorf("%T: crossing at %.9g Hz (gain %.9g dB), want just below %.9g Hz", s, f, g, fb)
		}
	}
}
