package response

import (
	"errors"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// nilSystems are the nil Systems the package detects: a nil interface and
// a nil *filter.Transfer in one.
var nilSystems = []struct {
	name string
	s    System
}{
	{"nil interface", nil},
	{"nil *filter.Transfer", (*filter.Transfer)(nil)},
}

// TestSweepNilSystemPanics checks that Sweep and SweepInto of a nil System
// panic with their documented message (a contract breach), not a nil
// pointer dereference.
func TestSweepNilSystemPanics(t *testing.T) {
	hz := []float64{1, 10}
	for _, n := range nilSystems {
		for _, c := range []struct {
			name, want string
			call       func()
		}{
			{"Sweep", "response: Sweep of a nil System", func() { Sweep(n.s, hz) }},
			{"SweepInto nil dst", "response: SweepInto of a nil System", func() { SweepInto(nil, n.s, hz) }},
			{"SweepInto dst", "response: SweepInto of a nil System", func() { SweepInto(make([]Point, len(hz)), n.s, hz) }},
		} {
			got := func() (msg any) {
				defer func() { msg = recover() }()
				c.call()
				return nil
			}()
			if s, ok := got.(string); !ok || s != c.want {
				t.Errorf("%s of a %s: panic %v, want %q", c.name, n.name, got, c.want)
			}
		}
	}
}

// TestMeasureNilSystem checks that every error-returning measurement
// reports a nil System with ErrSystem instead of panicking.
func TestMeasureNilSystem(t *testing.T) {
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{4000}, RippleDB: 1, AttenDB: 40}
	for _, n := range nilSystems {
		for _, c := range []struct {
			name string
			call func() error
		}{
			{"CrossingHz", func() error { _, err := CrossingHz(n.s, -3, 1, 1e4); return err }},
			{"CheckMask", func() error { _, err := CheckMask(n.s, spec); return err }},
			{"GainExtremes", func() error { _, err := GainExtremes(n.s, 1, 1e4); return err }},
			{"PassbandRippleDB", func() error { _, err := PassbandRippleDB(n.s, 1, 1e4); return err }},
			{"StopbandAttenDB", func() error { _, _, err := StopbandAttenDB(n.s, 1, 1e4); return err }},
			{"PeakGain", func() error { _, _, err := PeakGain(n.s, 1, 1e4); return err }},
			{"Bandwidth", func() error { _, err := Bandwidth(n.s, HalfPowerDB, 1, 1e4); return err }},
		} {
			var err error
			func() {
				defer func() {
					if p := recover(); p != nil {
						t.Errorf("%s of a %s panicked: %v", c.name, n.name, p)
					}
				}()
				err = c.call()
			}()
			if !errors.Is(err, ErrSystem) || !strings.Contains(err.Error(), "response: nil System") {
				t.Errorf("%s of a %s: error %v, want \"response: nil System\" wrapping ErrSystem", c.name, n.name, err)
			}
		}
	}
}
