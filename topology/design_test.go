package topology

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/ngspice"
)

// designCases are whole designs of invented requirements, one per band and
// several families, whose stages Realize must turn into a chain equal to
// the design up to sign.
func designCases(t *testing.T) map[string]filter.Transfer {
	t.Helper()
	type dc struct {
		name string
		fam  filter.Family
		spec filter.Spec
	}
	cases := []dc{
		{"butterworth lowpass (ADC anti-alias)", filter.Butterworth{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{20e3}, StopHz: [2]float64{48e3}, RippleDB: 1, AttenDB: 60}},
		{"chebyshev highpass (rumble)", filter.Chebyshev{}, filter.Spec{Band: filter.Highpass, PassHz: [2]float64{40}, StopHz: [2]float64{15}, RippleDB: 0.5, AttenDB: 40}},
		{"elliptic lowpass (notch stages)", filter.Elliptic{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{3.4e3}, StopHz: [2]float64{4.6e3}, RippleDB: 0.2, AttenDB: 55}},
		{"bessel lowpass", filter.Bessel{}, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{8e3}, RippleDB: 3, AttenDB: 40}},
		{"butterworth bandpass", filter.Butterworth{}, filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{600, 1600}, RippleDB: 1, AttenDB: 30}},
		{"inverse chebyshev bandstop", filter.InverseChebyshev{}, filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{40, 70}, StopHz: [2]float64{48, 52}, RippleDB: 1, AttenDB: 30}},
	}
	out := map[string]filter.Transfer{}
	for _, c := range cases {
		h, err := filter.Design(c.fam, c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		out[c.name] = h
	}
	return out
}

// TestRealizeDesigns: the Auto chain of each design's stages equals the
// design (up to the chain's sign) across four decades.
func TestRealizeDesigns(t *testing.T) {
	for name, h := range designCases(t) {
		stages, err := h.Stages()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		ch, err := Realize(stages, Options{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		sgn := complex(1, 0)
		if ch.Inverting() {
			sgn = -1
		}
		peak := 0.0
		var f0 float64
		for _, st := range stages {
			f0 = math.Max(f0, st.F0Hz)
		}
		for i := range 200 {
			f := f0 * math.Pow(10, -3+4*float64(i)/199)
			peak = math.Max(peak, cmplx.Abs(h.AtHz(f)))
		}
		for i := range 200 {
			f := f0 * math.Pow(10, -3+4*float64(i)/199)
			want := h.AtHz(f)
			if e := cmplx.Abs(ch.AtHz(f)-sgn*want) / (cmplx.Abs(want) + 1e-6*peak); e > 1e-8 {
				t.Errorf("%s at %g Hz: chain %v, design %v (rel %g)", name, f, ch.AtHz(f), sgn*want, e)
				break
			}
		}
		kinds := ""
		for _, c := range ch.Circuits {
			kinds += fmt.Sprintf(" %v/%v", c.Kind, c.Stage.Kind)
		}
		t.Logf("%s: %d stages:%s", name, len(stages), kinds)
	}
}

// TestSPICEDesigns simulates the deck of each design's Auto chain with
// ngspice and compares it with the chain's AtHz to 0.001 dB.
func TestSPICEDesigns(t *testing.T) {
	ngspice.Required(t)
	for name, h := range designCases(t) {
		stages, err := h.Stages()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		ch, err := Realize(stages, Options{})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		f0 := 0.0
		for _, st := range stages {
			f0 = math.Max(f0, st.F0Hz)
		}
		checkDeck(t, name, ch, f0/10)
	}
}
