package response

import (
	"errors"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"pgregory.net/rapid"
)

// bwAtten is the Butterworth attenuation 10·log10(1 + (f/fc)^{2n}) in dB.
func bwAtten(n int, f, fc float64) float64 {
	return 10 * math.Log10(1+math.Pow(f/fc, float64(2*n)))
}

func TestCheckMaskButterworth(t *testing.T) {
	h := butterworth(5, 1000)
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{800}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 40}
	r, err := CheckMask(h, spec)
	if err != nil {
		t.Fatal(err)
	}
	passM := 1 - bwAtten(5, 800, 1000) + MaskTolDB
	stopM := bwAtten(5, 3000, 1000) - 40 + MaskTolDB
	if !r.Pass || math.Abs(r.MarginDB-math.Min(passM, stopM)) > 1e-10 || r.Worst != Passband || r.WorstHz != 800 {
		t.Errorf("got %+v, want pass with margin %.12g dB at 800 Hz in the passband", r, math.Min(passM, stopM))
	}
	if len(r.Regions) != 2 || math.Abs(r.Regions[1].MarginDB-stopM) > 1e-10 || r.Regions[1].WorstHz != 3000 {
		t.Errorf("regions %+v, want stopband margin %.12g at 3000 Hz", r.Regions, stopM)
	}
	// One order short fails in the stopband.
	r, err = CheckMask(butterworth(3, 1000), spec)
	if err != nil {
		t.Fatal(err)
	}
	if want := bwAtten(3, 3000, 1000) - 40 + MaskTolDB; r.Pass || r.Worst != Stopband || math.Abs(r.MarginDB-want) > 1e-10 {
		t.Errorf("order 3: %+v, want failing stopband margin %.12g", r, want)
	}
	// Gain above 0 dB fails the ceiling.
	loud := h
	loud.Gain *= 1.01
	r, err = CheckMask(loud, spec)
	if err != nil {
		t.Fatal(err)
	}
	if want := MaskTolDB - 20*math.Log10(1.01); r.Pass || r.Worst != Passband || math.Abs(r.MarginDB-want) > 1e-9 {
		t.Errorf("1 %% loud: %+v, want failing passband margin %.9g", r, want)
	}
}

// TestCheckMaskNarrowViolation: a design that meets its mask, perturbed by a
// resonance far narrower than the search grid (an unwanted parasitic peak
// in the stopband, centred between two grid points), must fail, with the
// worst margin at the resonance.
func TestCheckMaskNarrowViolation(t *testing.T) {
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{800}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 40}
	base := butterworth(5, 1000)
	step := math.Pow(10, 1.0/400)
	fb := 3000 * math.Pow(step, 37.5) // between grid points 37 and 38 of the stopband scan
	// The bump lifts the gain at fb by 20·log10(31.6) = 30 dB over the
	// Butterworth's −57.1 dB there: the margin is about −12.9 dB.
	lift := 20 * math.Log10(31.6)
	want := -40 + bwAtten(5, fb, 1000) - lift + MaskTolDB
	cases := []struct {
		reason string
		sys    System
		tolHz  float64 // the sloping Butterworth shifts a wider peak a little below fb
	}{
		{"transfer, peak 1/1000 of the grid spacing wide", times(base, bumpTransfer(fb, 1e6/31.6, 1e6)), 1e-8},
		{"black box, peak 1/3 of the grid spacing wide", blackBox{times(base, bumpTransfer(fb, 300/31.6, 300))}, 1e-4},
	}
	for _, c := range cases {
		r, err := CheckMask(c.sys, spec)
		if err != nil {
			t.Fatal(err)
		}
		if r.Pass || r.Worst != Stopband || math.Abs(r.WorstHz-fb) > c.tolHz*fb || math.Abs(r.MarginDB-want) > 0.01 {
			t.Errorf("%s: %+v, want a failure of %.4g dB at %.6g Hz in the stopband", c.reason, r, want, fb)
		}
	}
	if r, _ := CheckMask(base, spec); !r.Pass {
		t.Errorf("unperturbed design fails: %+v", r)
	}
}

func TestCheckMaskBands(t *testing.T) {
	// Butterworth highpass of order 4 at 1 kHz: s⁴/Π(s − pₖ) with the
	// lowpass's poles (the set is closed under p → ωc²/p̄).
	lp := butterworth(4, 1000)
	hp := filter.Transfer{Zeros: make([]complex128, 4), Poles: lp.Poles, Gain: 1}
	// A second-order bandpass at 1 kHz, Q = 2, unity peak; a notch at 1 kHz.
	bp := filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 1000, Q: 2, Gain: 1}.Transfer()
	bs := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1000, Q: 0.5, ZeroHz: 1000, Gain: 1}.Transfer()
	cases := []struct {
		reason string
		sys    System
		spec   filter.Spec
		pass   bool
		worst  Region
	}{
		{"highpass meets", hp, filter.Spec{Band: filter.Highpass, PassHz: [2]float64{1500}, StopHz: [2]float64{250}, RippleDB: 1, AttenDB: 45}, true, Passband},
		{"highpass too steep", hp, filter.Spec{Band: filter.Highpass, PassHz: [2]float64{1500}, StopHz: [2]float64{500}, RippleDB: 1, AttenDB: 45}, false, Stopband},
		{"bandpass meets", bp, filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{100, 10000}, RippleDB: 1, AttenDB: 20}, true, Passband},
		{"bandpass upper stopband fails", bp, filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{100, 3000}, RippleDB: 1, AttenDB: 20}, false, UpperStopband},
		{"bandpass lower stopband fails", bp, filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{300, 10000}, RippleDB: 1, AttenDB: 20}, false, LowerStopband},
		{"bandstop meets", bs, filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{50, 10000}, StopHz: [2]float64{990, 1010}, RippleDB: 1, AttenDB: 30}, true, UpperPassband},
		{"bandstop stopband too wide", bs, filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{50, 10000}, StopHz: [2]float64{900, 1100}, RippleDB: 1, AttenDB: 30}, false, Stopband},
	}
	for _, c := range cases {
		r, err := CheckMask(c.sys, c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.reason, err)
		}
		if r.Pass != c.pass || r.Worst != c.worst || (r.MarginDB >= 0) != r.Pass {
			t.Errorf("%s: %+v, want pass %v, worst in the %v", c.reason, r, c.pass, c.worst)
		}
		if len(r.Regions) != map[filter.Band]int{filter.Highpass: 2, filter.Bandpass: 3, filter.Bandstop: 3}[c.spec.Band] {
			t.Errorf("%s: %d regions", c.reason, len(r.Regions))
		}
	}
}

func TestCheckMaskErrors(t *testing.T) {
	h := butterworth(3, 1000)
	good := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{800}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 40}
	bad := []struct {
		reason string
		mod    func(*filter.Spec)
	}{
		{"unknown band", func(s *filter.Spec) { s.Band = 0 }},
		{"stop edge inside passband", func(s *filter.Spec) { s.StopHz[0] = 500 }},
		{"NaN edge", func(s *filter.Spec) { s.PassHz[0] = math.NaN() }},
		{"ripple not below attenuation", func(s *filter.Spec) { s.RippleDB = 50 }},
		{"zero ripple", func(s *filter.Spec) { s.RippleDB = 0 }},
		{"infinite attenuation", func(s *filter.Spec) { s.AttenDB = math.Inf(1) }},
		{"bandpass with lowpass edges", func(s *filter.Spec) { s.Band = filter.Bandpass }},
	}
	for _, c := range bad {
		s := good
		c.mod(&s)
		if _, err := CheckMask(h, s); !errors.Is(err, filter.ErrSpec) {
			t.Errorf("%s: error %v, want filter.ErrSpec", c.reason, err)
		}
	}
	if _, err := CheckMask(nanSystem{}, good); !errors.Is(err, ErrSystem) {
		t.Errorf("NaN system: %v, want ErrSystem", err)
	}
}

// TestPropCheckMaskButterworth: for a random Butterworth lowpass and a mask
// placed around it with a random slack, CheckMask's margin is the
// analytic one (the Butterworth magnitude at the two edges), and the
// verdict follows its sign.
func TestPropCheckMaskButterworth(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 12).Draw(t, "order")
		fc := math.Pow(10, rapid.Float64Range(0, 6).Draw(t, "fc"))
		u := rapid.Float64Range(0.3, 0.95).Draw(t, "pass/fc")
		v := rapid.Float64Range(1.5, 5).Draw(t, "stop/fc")
		slack := rapid.Float64Range(-0.2, 0.2).Draw(t, "slack")
		ap, as := bwAtten(n, u*fc, fc), bwAtten(n, v*fc, fc)
		ripple, atten := ap+slack, as-slack
		if !(ripple > 0 && ripple < atten) {
			return
		}
		spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{u * fc}, StopHz: [2]float64{v * fc}, RippleDB: ripple, AttenDB: atten}
		r, err := CheckMask(butterworth(n, fc), spec)
		if err != nil {
			t.Fatal(err)
		}
		want := slack + MaskTolDB
		if math.Abs(r.MarginDB-want) > 1e-9 || r.Pass != (want >= 0) {
			t.Fatalf("margin %.12g dB (pass %v), want %.12g dB", r.MarginDB, r.Pass, want)
		}
	})
}

var maskSpecForBench = filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{800}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 60}

// TestCheckMaskDesignPerturbed: an elliptic filter.Design result for an
// invented 48 kHz audio ADC mask passes; multiplied by a parasitic
// resonance of +35 dB, 1/1000 of the grid spacing wide, centred between two
// grid points deep in the stopband, it must fail there.
func TestCheckMaskDesignPerturbed(t *testing.T) {
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{20000}, StopHz: [2]float64{24000}, RippleDB: 0.1, AttenDB: 70}
	h, err := filter.Design(filter.Elliptic{}, spec)
	if err != nil {
		t.Fatal(err)
	}
	r, err := CheckMask(h, spec)
	if err != nil || !r.Pass {
		t.Fatalf("design fails its own mask: %+v, %v", r, err)
	}
	step := math.Pow(10, 1.0/400)
	fb := 24000 * math.Pow(step, 250.5)
	base := gainDB(h.AtHz(fb))
	q2 := 4e6
	bad := times(h, bumpTransfer(fb, q2/math.Pow(10, 35.0/20), q2))
	r, err = CheckMask(bad, spec)
	if err != nil {
		t.Fatal(err)
	}
	want := -70 - (base + 35) + MaskTolDB
	if base+35 < -70 {
		t.Fatalf("test setup: the perturbed gain %g dB does not break the mask", base+35)
	}
	if r.Pass || r.Worst != Stopband || math.Abs(r.WorstHz-fb) > 1e-9*fb || math.Abs(r.MarginDB-want) > 0.01 {
		t.Errorf("perturbed design: %+v, want failure %.4g dB at %.8g Hz", r, want, fb)
	}
}
