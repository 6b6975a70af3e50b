package series

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

func TestPassbandOf(t *testing.T) {
	tests := []struct {
		spec filter.Spec
		want []Band
	}{
		{filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{3e3}, RippleDB: 1, AttenDB: 40},
			[]Band{{10, 1e3}}},
		{filter.Spec{Band: filter.Highpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{300}, RippleDB: 1, AttenDB: 40},
			[]Band{{1e3, 1e5}}},
		{filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{500, 2000}, RippleDB: 1, AttenDB: 40},
			[]Band{{900, 1100}}},
		{filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{500, 2000}, StopHz: [2]float64{900, 1100}, RippleDB: 1, AttenDB: 40},
			[]Band{{5, 500}, {2000, 2e5}}},
	}
	for _, tc := range tests {
		got, err := PassbandOf(tc.spec)
		if err != nil {
			t.Errorf("%v: %v", tc.spec.Band, err)
			continue
		}
		if diff := cmp.Diff(tc.want, got); diff != "" {
			t.Errorf("%v (-want +got):\n%s", tc.spec.Band, diff)
		}
	}
	if _, err := PassbandOf(filter.Spec{}); !errors.Is(err, filter.ErrSpec) {
		t.Errorf("zero spec: %v", err)
	}
}

func TestBandGrid(t *testing.T) {
	g := bandGrid([]Band{{10, 1000}, {5, 5}})
	if len(g) != GridPoints+1 || g[0] != 10 || g[GridPoints-1] != 1000 || g[GridPoints] != 5 {
		t.Fatalf("grid %v", g)
	}
	for i := 1; i < GridPoints; i++ {
		if r := g[i] / g[i-1]; math.Abs(r-math.Pow(100, 1.0/(GridPoints-1))) > 1e-12 {
			t.Fatalf("grid not log-spaced at %d: ratio %g", i, r)
		}
	}
}

// TestDesignToBoard runs the whole path on a design of package filter: a
// Chebyshev lowpass for a vibration sensor of our own invention (0.5 dB to
// 1 kHz, 40 dB from 3 kHz), realized, snapped to E96/E12 over the spec's
// passband, then the yield with exact parts (1: the design meets its mask)
// and with 1 % resistors and 5 % capacitors.
func TestDesignToBoard(t *testing.T) {
	spec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3}, StopHz: [2]float64{3e3}, RippleDB: 0.5, AttenDB: 40}
	h, err := filter.Design(filter.Chebyshev{}, spec)
	if err != nil {
		t.Fatal(err)
	}
	st, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	pass, err := PassbandOf(spec)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Snap(ch, Policy{Passband: pass})
	if err != nil {
		t.Fatal(err)
	}
	if s.WorstDB > s.RoundedDB {
		t.Errorf("snapped %g dB, rounded %g dB", s.WorstDB, s.RoundedDB)
	}
	hz := logGrid(10, 30e3, 120)
	exact := Analysis{Trials: 64, Hz: hz, Spec: &spec, Tolerances: Tolerances{Override: true}}
	r, err := exact.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	if r.Yield != 1 {
		t.Errorf("exact parts of a design that meets its mask: yield %g", r.Yield)
	}
	loose := Analysis{Trials: 2000, Hz: hz, Spec: &spec, SlackDB: 0.1,
		Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
	r, err = loose.MonteCarlo(s.Chain)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("Chebyshev order %d: snapped %.3f dB (rounded %.3f dB), yield with 1 %%/5 %% parts %.3f",
		len(h.Poles), s.WorstDB, s.RoundedDB, r.Yield)
	if !(r.Yield > 0 && r.Yield < 1) {
		t.Errorf("yield %g with 1 %%/5 %% parts on a 0.5 dB Chebyshev mask", r.Yield)
	}
}
