package series

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// TestEveryKind snaps and analyzes one stage of every stage kind with every
// circuit kind that realizes it: Snap succeeds with standard parts and is no
// worse than rounding, the Monte Carlo, worst-case and ranking analyses run,
// and the Monte Carlo median sits on the nominal gain a decade from f0.
func TestEveryKind(t *testing.T) {
	stages := []filter.Stage{
		{Kind: filter.LowpassStage, Order: 1, F0Hz: 2e3, Gain: 1},
		{Kind: filter.HighpassStage, Order: 1, F0Hz: 2e3, Gain: 2},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 2e3, Q: 1.2, Gain: 1},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 2e3, Q: 0.8, Gain: 2.5},
		{Kind: filter.HighpassStage, Order: 2, F0Hz: 2e3, Q: 0.9, Gain: 1},
		{Kind: filter.HighpassStage, Order: 2, F0Hz: 2e3, Q: 0.9, Gain: 3},
		{Kind: filter.BandpassStage, Order: 2, F0Hz: 2e3, Q: 5, Gain: 1},
		{Kind: filter.NotchStage, Order: 2, F0Hz: 2e3, Q: 3, ZeroHz: 2.6e3, Gain: 1},
		{Kind: filter.NotchStage, Order: 2, F0Hz: 2e3, Q: 3, ZeroHz: 1.6e3, Gain: 1},
	}
	kinds := []topology.Kind{topology.SallenKey, topology.SallenKeyEqual, topology.MultipleFeedback,
		topology.StateVariable, topology.TowThomas, topology.RCFollower}
	seen := map[topology.Kind]bool{}
	for _, st := range stages {
		for _, k := range kinds {
			c, err := topology.RealizeStage(st, topology.Options{Kind: k})
			if err != nil {
				continue // this kind does not realize this stage
			}
			name := k.String() + " " + st.Kind.String()
			if _, err := c.Biquad(); err != nil {
				t.Errorf("%s: topology cannot evaluate its own circuit: %v", name, err)
				continue
			}
			seen[k] = true
			ch := topology.Chain{Circuits: []topology.Circuit{c}}
			band := Band{st.F0Hz / 1.5, st.F0Hz * 1.5}
			s, err := Snap(ch, Policy{Passband: []Band{band}})
			if err != nil {
				t.Errorf("%s: Snap: %v", name, err)
				continue
			}
			if s.WorstDB > s.RoundedDB {
				t.Errorf("%s: snapped %g dB, rounded %g dB", name, s.WorstDB, s.RoundedDB)
			}
			for _, it := range s.Items {
				ser := E96
				if it.Kind == Capacitor {
					ser = E12
				}
				if !isMember(ser, it.Value) {
					t.Errorf("%s: %s = %g not of %v", name, it.Ref, it.Value, ser)
				}
			}
			hz := logGrid(st.F0Hz/10, st.F0Hz*10, 41)
			a := Analysis{Trials: 400, Seed: 9, Hz: hz, Percentiles: []float64{50},
				Band: &Deviation{LoHz: band.LoHz, HiHz: band.HiHz, DB: 1}}
			mc, err := a.MonteCarlo(s.Chain)
			if err != nil {
				t.Errorf("%s: MonteCarlo: %v", name, err)
				continue
			}
			for _, j := range []int{0, len(hz) - 1} {
				// A decade from f0 the response is smooth in the parts, and
				// the median with ±1 % (E96) resistors and ±10 % (E12)
				// capacitors stays within 0.5 dB of nominal. (Not near f0:
				// there a peak can only fall and a notch only rise.)
				if d := math.Abs(mc.EnvelopeDB[0][j] - mc.NominalDB[j]); !(d < 0.5) {
					t.Errorf("%s: %.0f Hz: median %g dB, nominal %g dB", name, hz[j], mc.EnvelopeDB[0][j], mc.NominalDB[j])
					break
				}
			}
			if _, err := a.WorstCase(s.Chain); err != nil {
				t.Errorf("%s: WorstCase: %v", name, err)
			}
			if _, err := a.Ranking(s.Chain); err != nil {
				t.Errorf("%s: Ranking: %v", name, err)
			}
		}
	}
	for _, k := range kinds {
		if !seen[k] {
			t.Errorf("no stage realized as %v", k)
		}
	}
}
