package filter_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// poleFamily is a Family defined outside the package: Butterworth
// prototypes, except that from order from on, pole Poles[at] is replaced
// by bad.
type poleFamily struct {
	from, at int
	bad      complex128
}

func (f poleFamily) String() string { return "PoleFamily" }
func (f poleFamily) Prototype(n int) (filter.Transfer, error) {
	h, err := filter.Butterworth{}.Prototype(n)
	if err != nil || n < f.from {
		return h, err
	}
	h.Poles = append([]complex128(nil), h.Poles...)
	h.Poles[f.at] = f.bad
	return h, nil
}

// TestOutsideFamilyBadPoles is the regression test for an outside
// family whose prototype has a pole off the open left half-plane (or not
// finite): MinOrder and Design searched to order 64 and reported "mask not
// met" (ErrRange); they now stop at the first such prototype with ErrParam
// naming the pole and the order.
func TestOutsideFamilyBadPoles(t *testing.T) {
	specs := []filter.Spec{
		{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{4e3}, RippleDB: 1, AttenDB: 40},
		{Band: filter.Highpass, PassHz: [2]float64{4e3}, StopHz: [2]float64{1e3}, RippleDB: 1, AttenDB: 40},
		{Band: filter.Bandpass, PassHz: [2]float64{1e3, 2e3}, StopHz: [2]float64{400, 5e3}, RippleDB: 1, AttenDB: 40},
		{Band: filter.Bandstop, PassHz: [2]float64{400, 5e3}, StopHz: [2]float64{1e3, 2e3}, RippleDB: 1, AttenDB: 40},
	}
	for _, c := range []struct {
		reason string
		f      poleFamily
		want   string // substring of the message
	}{
		{"right half-plane real pole", poleFamily{from: 1, at: 0, bad: 1}, "Prototype(1): pole Poles[0] = (1+0i)"},
		{"right half-plane complex pole", poleFamily{from: 2, at: 1, bad: complex(0.3, -0.9)}, "Prototype(2): pole Poles[1] = (0.3-0.9i)"},
		{"pole on the jω axis", poleFamily{from: 2, at: 0, bad: complex(0, 1)}, "Prototype(2): pole Poles[0] = (0+1i)"},
		{"NaN pole", poleFamily{from: 1, at: 0, bad: complex(math.NaN(), 0)}, "Poles[0] = (NaN+0i)"},
		{"infinite pole", poleFamily{from: 1, at: 0, bad: complex(math.Inf(-1), 0)}, "Poles[0] = (-Inf+0i)"},
		{"pole of infinite imaginary part", poleFamily{from: 1, at: 0, bad: complex(-1, math.Inf(1))}, "Poles[0] = (-1+Infi)"},
	} {
		for _, s := range specs {
			_, errMin := filter.MinOrder(c.f, s)
			_, errDesign := filter.Design(c.f, s)
			for i, err := range []error{errMin, errDesign} {
				name := fmt.Sprintf("%s, %v, %s", []string{"MinOrder", "Design"}[i], s.Band, c.reason)
				if !errors.Is(err, filter.ErrParam) || errors.Is(err, filter.ErrRange) {
					t.Errorf("%s: error %v, want ErrParam (not ErrRange)", name, err)
					continue
				}
				if msg := err.Error(); !strings.Contains(msg, c.want) || !strings.HasPrefix(msg, "filter: PoleFamily.") {
					t.Errorf("%s: error %q does not name %q", name, msg, c.want)
				}
			}
		}
	}
	// The same family with every pole in the left half-plane still designs
	// (its passband edge, 1 rad/s, is 3.01 dB down: a 3.02 dB ripple mask).
	good := poleFamily{from: 1000}
	for _, s := range specs {
		s.RippleDB = 3.02
		if _, err := filter.Design(good, s); err != nil {
			t.Errorf("%v: good outside family: %v", s.Band, err)
		}
	}
}
