package series_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/series"
)

// TestAnalysisFrequencyBeyondFloat64 is the regression test for silent
// NaN results: MonteCarlo and WorstCase accepted any positive finite
// analysis frequency, and where the chain's gain leaves the float64 range
// of |H|² (this 3rd-order lowpass at 1 kHz: below −3000 dB from about
// 1e54 Hz; NaN from the nodal analysis from about 1e160 Hz) they returned
// −Inf or NaN gains, NaN moments and a yield computed from NaN
// comparisons. Found by FuzzMonteCarlo. Up to 1e40 Hz the figures are
// finite.
func TestAnalysisFrequencyBeyondFloat64(t *testing.T) {
	for _, f := range []float64{1e60, 1e80, 1e200, 1e300, math.MaxFloat64} {
		a := series.Analysis{Trials: 8, Hz: []float64{1e3, f}, Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}
		_, err := a.MonteCarlo(fuzzChain)
		if !errors.Is(err, series.ErrChain) || !strings.Contains(err.Error(), "Hz[1]") {
			t.Errorf("MonteCarlo at %g Hz: error %v, want ErrChain naming Hz[1]", f, err)
		}
		_, err = a.WorstCase(fuzzChain)
		if f >= 1e200 && (!errors.Is(err, series.ErrChain) || !strings.Contains(err.Error(), "Hz[1]")) {
			t.Errorf("WorstCase at %g Hz: error %v, want ErrChain naming Hz[1]", f, err)
		}
	}
	for _, f := range []float64{1e-300, 1e12, 1e40} {
		a := series.Analysis{Trials: 8, Hz: []float64{f}, Moments: true, Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}
		s, err := a.MonteCarlo(fuzzChain)
		if err != nil {
			t.Errorf("MonteCarlo at %g Hz: %v", f, err)
			continue
		}
		if math.IsNaN(s.NominalDB[0]) || math.IsNaN(s.MeanDB[0]) {
			t.Errorf("MonteCarlo at %g Hz: nominal %g dB, mean %g dB", f, s.NominalDB[0], s.MeanDB[0])
		}
	}
}
