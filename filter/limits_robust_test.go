package filter_test

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestStagesFloat64EdgesNoPanic is the regression test for a panic (index
// −1 in the zero assignment) of Stages on a jω zero pair near 1e308 rad/s:
// the pair's mean frequency overflowed to +Inf, no section was "nearest"
// to it, and the pairing indexed with −1. Found by FuzzStages.
func TestStagesFloat64EdgesNoPanic(t *testing.T) {
	p1, p2 := complex(-1e-300, 1e300), complex(-1e300, 1e-300)
	h := filter.Transfer{
		Zeros: []complex128{complex(0, 1e308), complex(0, -1e308), 0},
		Poles: []complex128{p1, cmplx.Conj(p1), p2, cmplx.Conj(p2), -1e-308},
		Gain:  1e308,
	}
	_, err := h.Stages()
	if !errors.Is(err, filter.ErrStage) && !errors.Is(err, filter.ErrRange) {
		t.Errorf("error %v, want ErrStage or ErrRange", err)
	}
	// The same near the top of the range but representable: a notch pair
	// at 1e308 rad/s with poles there factors without overflow.
	p := complex(-0.5e308, 0.8e308)
	h = filter.Transfer{Zeros: []complex128{complex(0, 1.2e308), complex(0, -1.2e308)}, Poles: []complex128{p, cmplx.Conj(p)}, Gain: 1}
	st, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	if z := st[0].ZeroHz * 2 * math.Pi; math.Abs(z/1.2e308-1) > 1e-15 {
		t.Errorf("notch zero at %g rad/s, want 1.2e308", z)
	}
}

// TestTransformUnderflowIsAnError is the regression test for a silently
// unstable result: ToHighpass with a subnormal corner (5e-324 Hz) moved
// the poles of a stable prototype onto the jω axis (real part −0) and
// returned no error. Found by FuzzTransforms.
func TestTransformUnderflowIsAnError(t *testing.T) {
	h, err := filter.Chebyshev{RippleDB: 3}.Prototype(5)
	if err != nil {
		t.Fatal(err)
	}
	for name, f := range map[string]func() (filter.Transfer, error){
		"ToHighpass": func() (filter.Transfer, error) { return h.ToHighpass(5e-324) },
		"ToLowpass":  func() (filter.Transfer, error) { return h.ToLowpass(5e-324) },
		"ToBandpass": func() (filter.Transfer, error) { return h.ToBandpass(5e-324, 5e-324) },
		"ToBandstop": func() (filter.Transfer, error) { return h.ToBandstop(5e-324, 5e-324) },
	} {
		out, err := f()
		if err == nil {
			for _, p := range out.Poles {
				if !(real(p) < 0) {
					t.Errorf("%s: pole %v not in the left half-plane, and no error", name, p)
				}
			}
			continue
		}
		if !errors.Is(err, filter.ErrRange) {
			t.Errorf("%s: error %v, want ErrRange", name, err)
		}
	}
}

// failingFamily is a Family defined outside the package whose Prototype
// fails in its own words.
type failingFamily struct{}

var errOwn = errors.New("table not loaded")

func (failingFamily) Prototype(int) (filter.Transfer, error) { return filter.Transfer{}, errOwn }
func (failingFamily) String() string                         { return "Tabulated" }

// TestOutsideFamilyErrorWrapped is the regression test for an error that
// matched no sentinel: Design and MinOrder returned the error of an
// outside Family's Prototype as it was ("table not loaded"), against the
// package's promise that every error wraps one of its sentinels.
func TestOutsideFamilyErrorWrapped(t *testing.T) {
	s := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{4e3}, RippleDB: 1, AttenDB: 40}
	_, err1 := filter.Design(failingFamily{}, s)
	_, err2 := filter.MinOrder(failingFamily{}, s)
	for _, err := range []error{err1, err2} {
		if !errors.Is(err, filter.ErrParam) || !errors.Is(err, errOwn) || !strings.Contains(fmt.Sprint(err), "Tabulated.Prototype(1)") {
			t.Errorf("error %v, want ErrParam wrapping the family's own error and naming it", err)
		}
	}
}
