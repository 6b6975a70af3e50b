package filter

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"pgregory.net/rapid"
)

// stagePeakTol is how far an intermediate output may peak above the final
// output's peak under GainDynamic: the numerical peak search converges to
// about 1e-12 relative; 1e-9 leaves room for the rounding of the cascade.
const stagePeakTol = 1e-9

// genDesign draws a random design of every family and band.
func genDesign(t *rapid.T) (Transfer, Spec, Family) {
	s := genSpec(t)
	f := genFamily(t, s)
	h, err := Design(f, s)
	if errors.Is(err, ErrRange) {
		t.Skip(err)
	}
	if err != nil {
		t.Fatal(err)
	}
	return h, s, f
}

// cascade evaluates the product of the stages' transfer functions.
func cascade(stages []Stage, k int, f float64) complex128 {
	v := complex(1, 0)
	for _, s := range stages[:k] {
		v *= s.Transfer().AtHz(f)
	}
	return v
}

// denseSpan returns a dense log grid over the span of h's poles and zeros
// (two decades beyond), with extra points around every pole's resonance.
func denseSpan(h Transfer) []float64 {
	lo, hi := math.Inf(1), 0.0
	var pts []float64
	for _, p := range h.Poles {
		m := cmplx.Abs(p)
		lo, hi = math.Min(lo, m), math.Max(hi, m)
		if im := math.Abs(imag(p)); im > 0 {
			re := math.Abs(real(p))
			for k := -40; k <= 40; k++ {
				if w := im + float64(k)*re/10; w > 0 {
					pts = append(pts, w/(2*math.Pi))
				}
			}
		}
	}
	pts = append(pts, logGrid(lo/(200*math.Pi), hi*100/(2*math.Pi), 4000)...)
	slices.Sort(pts)
	return pts
}

// TestStagesCascadeEqualsTransfer: for random designs of every family and
// band, under both gain plans, the cascade of Stage.Transfer equals the
// whole transfer at random frequencies (gain and sign included), every
// stage is valid, Q is ascending with first-order stages first, and the
// stage kinds fit the band.
func TestStagesCascadeEqualsTransfer(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h, s, f := genDesign(t)
		plan := GainPlan(rapid.IntRange(0, 1).Draw(t, "plan"))
		stages, err := h.StagesWith(StageOptions{Gain: plan})
		if err != nil {
			t.Fatalf("%v %+v: %v", f, s, err)
		}
		order := 0
		for i, st := range stages {
			if err := st.Validate(); err != nil {
				t.Fatalf("stage %d: %v", i, err)
			}
			order += st.Order
			if i > 0 && stages[i-1].Q > st.Q {
				t.Fatalf("Q not ascending: %v", stages)
			}
			if plan == GainLast && i < len(stages)-1 && st.Gain != 1 {
				t.Fatalf("GainLast: stage %d gain %g", i, st.Gain)
			}
			allowed := map[Band][]StageKind{
				Lowpass:  {LowpassStage, NotchStage},
				Highpass: {HighpassStage, NotchStage},
				Bandpass: {BandpassStage, NotchStage},
				Bandstop: {NotchStage, LowpassStage},
			}[s.Band]
			if !slices.Contains(allowed, st.Kind) {
				t.Fatalf("%v design has a %v stage", s.Band, st.Kind)
			}
		}
		if order != len(h.Poles) {
			t.Fatalf("stage orders sum to %d, %d poles", order, len(h.Poles))
		}
		for i := range 5 {
			fr := math.Exp(rapid.Float64Range(math.Log(1e-3), math.Log(1e3)).Draw(t, "f"+itoa(i))) * s.PassHz[0]
			got, want := cascade(stages, len(stages), fr), h.AtHz(fr)
			if !relClose(got, want, condTol(h, fr)) {
				t.Fatalf("%v %v at %g Hz: cascade %v, transfer %v", f, s.Band, fr, got, want)
			}
		}
		if got, want := cascade(stages, len(stages), 0), h.AtHz(0); !relClose(got, want, identityTol) {
			t.Fatalf("DC: cascade %v, transfer %v", got, want)
		}
	})
}

// TestStagesDynamicRange: under the default plan no intermediate output
// peaks above the final output's peak (dense independent sweep), and each
// reaches it (the package's own peak search), so none sits needlessly low.
func TestStagesDynamicRange(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h, s, f := genDesign(t)
		stages, err := h.Stages()
		if err != nil {
			t.Fatal(err)
		}
		grid := denseSpan(h)
		final := 0.0
		for _, fr := range grid {
			final = math.Max(final, cmplx.Abs(h.AtHz(fr)))
		}
		finalPeak := peakMag(h, func(w float64) float64 { return cmplx.Abs(h.At(complex(0, w))) })
		if finalPeak < final*(1-stagePeakTol) || finalPeak > 1+peakTol {
			t.Fatalf("final peak %.15g, dense sweep %.15g", finalPeak, final)
		}
		for k := 1; k < len(stages); k++ {
			mid := 0.0
			for _, fr := range grid {
				mid = math.Max(mid, cmplx.Abs(cascade(stages, k, fr)))
			}
			if mid > finalPeak*(1+stagePeakTol) {
				t.Fatalf("%v %v: output of stage %d peaks at %.15g, above the final %.15g", f, s.Band, k, mid, finalPeak)
			}
			sub := stages[:k]
			own := peakMag(h, func(w float64) float64 { return cmplx.Abs(cascade(sub, k, w/(2*math.Pi))) })
			if math.Abs(own-finalPeak) > stagePeakTol*finalPeak {
				t.Fatalf("output of stage %d peaks at %.15g, want the final %.15g", k, own, finalPeak)
			}
		}
	})
}

// TestStagesButterworthQ checks the stage Q of Butterworth lowpass designs
// against the handbook values Q = 1/(2·sin((2k−1)π/(2n))) (from memory of
// the Butterworth Q tables in Williams & Taylor, "Electronic Filter Design
// Handbook"; they follow from the pole angles).
func TestStagesButterworthQ(t *testing.T) {
	for _, c := range []struct {
		n    int
		want []float64 // ascending, 0 for the first-order stage
	}{
		{2, []float64{0.7071}},
		{3, []float64{0, 1.0}},
		{4, []float64{0.5412, 1.3066}},
		{5, []float64{0, 0.6180, 1.6180}},
		{6, []float64{0.5176, 0.7071, 1.9319}},
	} {
		h, err := Butterworth{}.Prototype(c.n)
		if err != nil {
			t.Fatal(err)
		}
		h, err = h.ToLowpass(1000)
		if err != nil {
			t.Fatal(err)
		}
		stages, err := h.Stages()
		if err != nil {
			t.Fatal(err)
		}
		var q, f0 []float64
		for _, s := range stages {
			q = append(q, s.Q)
			f0 = append(f0, s.F0Hz)
		}
		if d := cmp.Diff(c.want, q, cmpopts.EquateApprox(0, 5e-5)); d != "" {
			t.Errorf("order %d Q (-want +got):\n%s", c.n, d)
		}
		for _, f := range f0 {
			if math.Abs(f-1000) > 1e-9 {
				t.Errorf("order %d: F0 %g, want 1000 Hz", c.n, f)
			}
		}
	}
}

// TestStagesZeroPairing: jω zero pairs go to the nearest pole pair (by
// frequency ratio) starting from the highest Q: in an elliptic lowpass the
// highest-Q stage, nearest the passband edge, gets the lowest stopband
// zero; origin zeros make highpass and bandpass stages.
func TestStagesZeroPairing(t *testing.T) {
	s := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1300}, RippleDB: 0.5, AttenDB: 60}
	h, err := Design(Elliptic{}, s)
	if err != nil {
		t.Fatal(err)
	}
	stages, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	top := stages[len(stages)-1]
	lowest := math.Inf(1)
	for _, st := range stages {
		if st.Kind == NotchStage {
			lowest = math.Min(lowest, st.ZeroHz)
		}
	}
	if top.Kind != NotchStage || top.ZeroHz != lowest {
		t.Errorf("highest-Q stage %+v does not carry the lowest zero %g Hz", top, lowest)
	}
	// A fourth-order Butterworth highpass: two HighpassStage sections.
	hp, _ := Butterworth{}.Prototype(4)
	hp, _ = hp.ToHighpass(500)
	st, err := hp.Stages()
	if err != nil {
		t.Fatal(err)
	}
	for _, x := range st {
		if x.Kind != HighpassStage || x.Order != 2 {
			t.Errorf("highpass stage %+v", x)
		}
	}
	// Two real poles pair into one Q < 0.5 section; with one origin zero it
	// is a bandpass stage.
	two := Transfer{Zeros: []complex128{0}, Poles: []complex128{-100, -400}, Gain: 300}
	st, err = two.Stages()
	if err != nil {
		t.Fatal(err)
	}
	if len(st) != 1 || st[0].Kind != BandpassStage || math.Abs(st[0].Q-0.4) > 1e-15 || math.Abs(st[0].Gain-0.6) > 1e-15 {
		t.Errorf("real pair: %+v (want one bandpass stage, Q 0.4, gain 300/500)", st)
	}
}

func TestStagesErrors(t *testing.T) {
	for _, c := range []struct {
		reason string
		h      Transfer
		opt    StageOptions
		want   error
	}{
		{"no poles", Transfer{Gain: 1}, StageOptions{}, ErrStage},
		{"zero gain", Transfer{Poles: []complex128{-1}}, StageOptions{}, ErrStage},
		{"right half-plane pole", Transfer{Poles: []complex128{1}, Gain: 1}, StageOptions{}, ErrStage},
		{"pole on the jω axis", Transfer{Poles: []complex128{1i, -1i}, Gain: 1}, StageOptions{}, ErrStage},
		{"unpaired complex pole", Transfer{Poles: []complex128{complex(-1, 1), -2}, Gain: 1}, StageOptions{}, ErrStage},
		{"right half-plane zero", Transfer{Zeros: []complex128{1}, Poles: []complex128{-1}, Gain: 1}, StageOptions{}, ErrStage},
		{"left half-plane zero off the axis", Transfer{Zeros: []complex128{complex(-1, 1), complex(-1, -1)}, Poles: []complex128{complex(-1, 2), complex(-1, -2)}, Gain: 1}, StageOptions{}, ErrStage},
		{"unpaired axis zero", Transfer{Zeros: []complex128{2i, 0}, Poles: []complex128{complex(-1, 2), complex(-1, -2)}, Gain: 1}, StageOptions{}, ErrStage},
		{"more zeros than poles", Transfer{Zeros: []complex128{0, 0}, Poles: []complex128{-1}, Gain: 1}, StageOptions{}, ErrStage},
		{"unknown plan", Transfer{Poles: []complex128{-1}, Gain: 1}, StageOptions{Gain: 9}, ErrStage},
		{"NaN pole", Transfer{Poles: []complex128{complex(math.NaN(), 0)}, Gain: 1}, StageOptions{}, ErrRange},
	} {
		if _, err := c.h.StagesWith(c.opt); !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.reason, err, c.want)
		}
	}
}

func BenchmarkStages(b *testing.B) {
	for _, c := range []struct {
		name string
		f    Family
		s    Spec
	}{
		{"Elliptic6Lowpass", Elliptic{}, benchEllipticMask},
		{"Chebyshev8Bandpass", Chebyshev{}, benchBandpassMask},
	} {
		h, err := Design(c.f, c.s)
		if err != nil {
			b.Fatal(err)
		}
		for _, plan := range []GainPlan{GainDynamic, GainLast} {
			b.Run(fmt.Sprint(c.name, "/plan", int(plan)), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := h.StagesWith(StageOptions{Gain: plan}); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// TestStagesPeakBesideAPolePoint is a regression: a grid point equal (up
// to rounding) to a pole frequency once made the peak search bracket too
// narrow, so the second stage's output peaked 3.5e-5 above the final.
func TestStagesPeakBesideAPolePoint(t *testing.T) {
	f := math.Exp(7)
	s := Spec{Band: Bandpass, RippleDB: math.Exp(-4.125), AttenDB: math.Exp(-4.125) + 27.875}
	s.PassHz = [2]float64{f, f * math.Exp(0.5015759468078613)}
	s.StopHz = [2]float64{f / math.Exp(1.6094379124341003), s.PassHz[1] * math.Exp(0.13976194237515863)}
	h, err := Design(InverseChebyshev{}, s)
	if err != nil {
		t.Fatal(err)
	}
	stages, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	grid := denseSpan(h)
	for k := 1; k < len(stages); k++ {
		for _, fr := range grid {
			if m := cmplx.Abs(cascade(stages, k, fr)); m > 1+stagePeakTol {
				t.Fatalf("output of stage %d reaches %.12g at %g Hz", k, m, fr)
			}
		}
	}
}

// TestStagesChebyshevTable checks the stage pole frequencies (relative to
// the ripple edge) and Q of 0.5 dB Chebyshev lowpass filters against the
// coefficient table, from memory of the 0.5 dB Chebyshev table in Mancini
// (ed.), "Op Amps for Everyone" (Texas Instruments), ch. 16, given to four
// digits.
func TestStagesChebyshevTable(t *testing.T) {
	type fq struct{ F0, Q float64 }
	for _, c := range []struct {
		n    int
		want []fq
	}{
		{2, []fq{{1.2313, 0.8637}}},
		{3, []fq{{0.6265, 0}, {1.0689, 1.7062}}},
		{4, []fq{{0.5970, 0.7051}, {1.0313, 2.9406}}},
		{5, []fq{{0.3623, 0}, {0.6905, 1.1778}, {1.0177, 4.5450}}},
	} {
		h, err := Chebyshev{RippleDB: 0.5}.Prototype(c.n)
		if err != nil {
			t.Fatal(err)
		}
		h, err = h.ToLowpass(1000)
		if err != nil {
			t.Fatal(err)
		}
		stages, err := h.Stages()
		if err != nil {
			t.Fatal(err)
		}
		var got []fq
		for _, s := range stages {
			got = append(got, fq{s.F0Hz / 1000, s.Q})
		}
		if d := cmp.Diff(c.want, got, cmpopts.EquateApprox(0, 5e-5)); d != "" {
			t.Errorf("order %d (-table +got):\n%s", c.n, d)
		}
	}
}

// FuzzStages: Stages never panics on a transfer built from any numbers;
// it fails with a sentinel error or returns a valid cascade whose product
// equals the transfer.
func FuzzStages(f *testing.F) {
	f.Add(-1.0, 2.0, -3.0, 0.0, 5.0, 0.0, 1.0, uint8(1))
	f.Add(-0.1, 10.0, -2.0, 0.0, 0.0, 0.0, -4.0, uint8(2))
	f.Add(1.0, 1.0, -1.0, 0.0, 3.0, 1.0, 1.0, uint8(0))
	f.Add(-1e-300, 1e300, -1e10, 0.0, 1e-5, 0.0, 1e200, uint8(3))
	f.Fuzz(func(t *testing.T, pr, pi, rr, zr, zi, z2, gain float64, shape uint8) {
		h := Transfer{Poles: []complex128{complex(pr, pi), complex(pr, -pi), complex(rr, 0)}, Gain: gain}
		switch shape % 4 {
		case 1:
			h.Zeros = []complex128{complex(zr, zi), complex(zr, -zi)}
		case 2:
			h.Zeros = []complex128{0, complex(z2, 0)}
		case 3:
			h.Zeros = []complex128{complex(zr, zi), complex(zr, -zi), complex(z2, 0)}
		}
		st, err := h.Stages()
		if err != nil {
			for _, e := range []error{ErrStage, ErrRange} {
				if errors.Is(err, e) {
					return
				}
			}
			t.Fatalf("error %v wraps no sentinel", err)
		}
		for _, s := range st {
			if err := s.Validate(); err != nil {
				t.Fatalf("stage %+v: %v", s, err)
			}
		}
		// Compare where the response is representable and well conditioned.
		for _, w := range []float64{1e-3, 1, 1e3} {
			fr := w * cmplx.Abs(h.Poles[2]) / (2 * math.Pi)
			want := h.AtHz(fr)
			got := cascade(st, len(st), fr)
			if cmplx.IsInf(want) || cmplx.IsNaN(want) || cmplx.Abs(want) < 1e-250 || cmplx.Abs(want) > 1e250 {
				continue
			}
			if !relClose(got, want, condTol(h, fr)) {
				t.Fatalf("%+v: cascade %v, transfer %v at %g Hz", h, got, want, fr)
			}
		}
	})
}
