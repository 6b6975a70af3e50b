package series

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
	"pgregory.net/rapid"
)

// An anti-alias filter of our own invention: 8th-order Butterworth lowpass
// at 20 kHz in front of a 96 kS/s converter.
func antiAlias(t testing.TB) topology.Chain {
	ch, err := topology.Realize(butterworthStages(filter.LowpassStage, 8, 20e3), topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return ch
}

var antiAliasBand = []Band{{200, 20e3}}

func TestSnapAntiAlias(t *testing.T) {
	ch := antiAlias(t)
	res, err := Snap(ch, Policy{Resistors: E96, Capacitors: E12, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	if res.WorstDB > res.RoundedDB {
		t.Errorf("snapped %g dB worse than rounded %g dB", res.WorstDB, res.RoundedDB)
	}
	t.Logf("anti-alias 8th-order: snapped worst %.4f dB, independent rounding %.4f dB", res.WorstDB, res.RoundedDB)
	for _, it := range res.Items {
		s := E96
		if it.Kind == Capacitor {
			s = E12
		}
		if !isMember(s, it.Value) || it.Series != s {
			t.Errorf("%s = %g is not an %v value", it.Ref, it.Value, s)
		}
	}
	nparts := 0
	for i, c := range ch.Circuits {
		nparts += len(c.Parts)
		r := res.Stages[i]
		// The report's errors agree with the achieved stage.
		if got := r.Achieved.F0Hz/r.Target.F0Hz - 1; got != r.F0Err {
			t.Errorf("stage %d F0Err %g, achieved says %g", i+1, r.F0Err, got)
		}
		// 1 % resistors with the capacitors held: f0 and Q within 1 %.
		if math.Abs(r.F0Err) > 0.01 || math.Abs(r.QErr) > 0.01 || math.Abs(r.GainErr) > 0.01 {
			t.Errorf("stage %d errors f0 %.3g, Q %.3g, gain %.3g", i+1, r.F0Err, r.QErr, r.GainErr)
		}
	}
	if len(res.Items) != nparts {
		t.Errorf("%d items for %d parts (no pairs asked)", len(res.Items), nparts)
	}
	// The snapped chain's deviation, from topology's own AtHz, is reported.
	if d, _ := DeviationDB(res.Chain, antiAliasBand); d != res.WorstDB {
		t.Errorf("DeviationDB %g, report %g", d, res.WorstDB)
	}
}

// TestStageOfMatchesAchieved: the coefficient-to-stage conversion the
// search uses agrees with topology's Achieved for every circuit kind.
func TestStageOfMatchesAchieved(t *testing.T) {
	stages := []filter.Stage{
		{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1},
		{Kind: filter.HighpassStage, Order: 1, F0Hz: 1e3, Gain: 2},
		{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.707, Gain: 1},
		{Kind: filter.HighpassStage, Order: 2, F0Hz: 3e3, Q: 1.3, Gain: 1},
		{Kind: filter.BandpassStage, Order: 2, F0Hz: 5e3, Q: 4, Gain: 2},
		{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, ZeroHz: 1.5e3, Gain: 1},
	}
	kinds := []topology.Kind{topology.Auto, topology.SallenKey, topology.SallenKeyEqual,
		topology.MultipleFeedback, topology.StateVariable, topology.TowThomas, topology.RCFollower}
	n := 0
	for _, st := range stages {
		for _, k := range kinds {
			c, err := topology.RealizeStage(st, topology.Options{Kind: k})
			if err != nil {
				continue // the kind does not realize this stage
			}
			n++
			ach, err := c.Achieved()
			if err != nil {
				t.Fatalf("%v %v: topology's Achieved: %v", c.Kind, st.Kind, err)
			}
			ev, err := newStageEval(c)
			if err != nil {
				t.Fatal(err)
			}
			got, err := achieved(c, ev, partValues(c))
			if err != nil {
				t.Fatalf("%v %v: %v", k, st.Kind, err)
			}
			rel := func(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }
			if rel(got.F0Hz, ach.F0Hz) > 1e-12 || rel(got.Q, ach.Q) > 1e-12 ||
				rel(got.Gain, ach.Gain) > 1e-12 || rel(got.ZeroHz, ach.ZeroHz) > 1e-12 {
				t.Errorf("%v %v: stageOf %+v, Achieved %+v", c.Kind, st.Kind, got, ach)
			}
		}
	}
	if n < 10 {
		t.Errorf("only %d circuits realized", n)
	}
}

func partValues(c topology.Circuit) []float64 {
	v := make([]float64, len(c.Parts))
	for i, p := range c.Parts {
		v[i] = p.Value
	}
	return v
}

func TestSnapPairs(t *testing.T) {
	ch := antiAlias(t)
	res, err := Snap(ch, Policy{Resistors: E24, Capacitors: E6, Pairs: true, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	plain, err := Snap(ch, Policy{Resistors: E24, Capacitors: E6, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("E24/E6: with pairs %.4f dB, without %.4f dB, rounded %.4f dB", res.WorstDB, plain.WorstDB, plain.RoundedDB)
	npairs := 0
	for i, r := range res.Stages {
		for ref, p := range r.Pairs {
			npairs++
			if !isMember(E24, p.A) || !isMember(E24, p.B) {
				t.Errorf("pair %v not of E24", p)
			}
			found := 0
			for _, it := range res.Items {
				if it.Ref == Designator(i, ref)+"a" && it.Value == p.A || it.Ref == Designator(i, ref)+"b" && it.Value == p.B {
					found++
				}
			}
			if found != 2 {
				t.Errorf("pair %s %v: %d items", ref, p, found)
			}
		}
	}
	if npairs == 0 {
		t.Error("no pair chosen with E24 resistors and E6 capacitors")
	}
	// A pair's resistance is on no series: the analysis needs the snapped
	// parts' tolerances, and gets them from Snapped.Tolerances.
	a := Analysis{Trials: 100, Hz: []float64{1e3, 20e3}}
	if _, err := a.MonteCarlo(res.Chain); !errors.Is(err, ErrChain) {
		t.Errorf("pairs without tolerances: %v, want ErrChain", err)
	}
	a.Tolerances = res.Tolerances()
	if _, err := a.MonteCarlo(res.Chain); err != nil {
		t.Errorf("pairs with Snapped.Tolerances: %v", err)
	}
	nparts := 0
	for _, c := range res.Chain.Circuits {
		nparts += len(c.Parts)
	}
	if len(a.Tolerances.Part) != nparts {
		t.Errorf("%d tolerances for %d parts", len(a.Tolerances.Part), nparts)
	}
	for ref, tol := range a.Tolerances.Part {
		if k, _ := KindOf(ref); (k == Resistor && tol != 0.05) || (k == Capacitor && tol != 0.2) {
			t.Errorf("%s tolerance %g", ref, tol)
		}
	}
}

func TestSnapErrors(t *testing.T) {
	ch := antiAlias(t)
	if _, err := Snap(ch, Policy{}); !errors.Is(err, ErrPolicy) {
		t.Errorf("no passband: %v", err)
	}
	if _, err := Snap(ch, Policy{Radius: -1, Passband: antiAliasBand}); !errors.Is(err, ErrPolicy) {
		t.Errorf("negative radius: %v", err)
	}
	if _, err := Snap(ch, Policy{Passband: []Band{{10, 1}}}); !errors.Is(err, ErrPolicy) {
		t.Errorf("backwards band: %v", err)
	}
	if _, err := Snap(topology.Chain{}, Policy{Passband: antiAliasBand}); !errors.Is(err, ErrChain) {
		t.Errorf("empty chain: %v", err)
	}
	// DeviationDB of an empty chain gave 0, nil: an error like Snap's.
	if d, err := DeviationDB(topology.Chain{}, antiAliasBand); !errors.Is(err, ErrChain) || !math.IsNaN(d) {
		t.Errorf("DeviationDB of an empty chain: %g, %v; want NaN and ErrChain", d, err)
	}
}

// randomChain draws a chain of 1 to 4 stages of random kinds, pole
// frequencies, Q and gains, realized by Auto.
func randomChain(t *rapid.T) (topology.Chain, []Band) {
	n := rapid.IntRange(1, 4).Draw(t, "stages")
	f0 := math.Pow(10, rapid.Float64Range(1, 5).Draw(t, "log10 f0"))
	var st []filter.Stage
	kind := rapid.SampledFrom([]filter.StageKind{filter.LowpassStage, filter.HighpassStage}).Draw(t, "kind")
	for i := range n {
		s := filter.Stage{Kind: kind, Order: 2,
			F0Hz: f0 * rapid.Float64Range(0.7, 1.4).Draw(t, "f0 ratio"),
			Q:    rapid.Float64Range(0.5, 3).Draw(t, "Q"),
			Gain: rapid.SampledFrom([]float64{1, 1, 2, 0.5, 3.3}).Draw(t, "gain")}
		if i == 0 && rapid.Bool().Draw(t, "first order") {
			s.Order, s.Q = 1, 0
		}
		st = append(st, s)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatalf("realize %+v: %v", st, err)
	}
	for _, c := range ch.Circuits {
		// A precondition on topology: the realized circuit's own
		// coefficients can be computed. (Draws that fail it are discarded,
		// and rapid fails the test if too many are.)
		if _, err := c.Biquad(); err != nil {
			t.Skipf("topology cannot evaluate its own %v %v circuit: %v", c.Kind, c.Stage.Kind, err)
		}
	}
	band := Band{f0 / 30, f0 / 1.5}
	if kind == filter.HighpassStage {
		band = Band{f0 * 1.5, f0 * 30}
	}
	return ch, []Band{band}
}

// TestSnapNeverWorseThanRounding is the property the issue asks for:
// snapping never makes the worst passband deviation larger than rounding
// every part on its own (Round, evaluated by DeviationDB from topology's
// AtHz, independently of the search's own arithmetic).
func TestSnapNeverWorseThanRounding(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		ch, bands := randomChain(t)
		res := rapid.SampledFrom([]Series{E12, E24, E96}).Draw(t, "resistors")
		cap := rapid.SampledFrom([]Series{E6, E12}).Draw(t, "capacitors")
		s, err := Snap(ch, Policy{Resistors: res, Capacitors: cap, Passband: bands,
			Pairs: rapid.Bool().Draw(t, "pairs")})
		if err != nil {
			t.Fatal(err)
		}
		rc, err := Round(ch, res, cap)
		if err != nil {
			t.Fatal(err)
		}
		naive, err := DeviationDB(rc, bands)
		if errors.Is(err, ErrChain) {
			// Rounding gave an unstable circuit; the snapped one is not.
			if !math.IsInf(s.RoundedDB, 1) {
				t.Fatalf("rounding unstable (%v) but RoundedDB %g", err, s.RoundedDB)
			}
			if _, err := DeviationDB(s.Chain, bands); err != nil {
				t.Fatalf("snapped chain: %v", err)
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		// 1e-9 dB: the search scores with the coefficients, DeviationDB with
		// AtHz; they differ by rounding only.
		if s.WorstDB > naive+1e-9 {
			t.Fatalf("snapped %g dB > rounded %g dB", s.WorstDB, naive)
		}
		if math.Abs(s.RoundedDB-naive) > 1e-9 {
			t.Fatalf("report's rounded %g dB, Round gives %g dB", s.RoundedDB, naive)
		}
	})
}

func FuzzSnap(f *testing.F) {
	f.Add(uint8(0), 1e3, 0.707, 1.0, uint8(1))
	f.Add(uint8(1), 50.0, 2.5, 2.0, uint8(3))
	f.Add(uint8(2), 12e3, 8.0, 1.0, uint8(2))
	f.Add(uint8(3), 400.0, 1.2, 1.0, uint8(2))
	f.Fuzz(func(t *testing.T, kind uint8, f0, q, gain float64, n uint8) {
		sk := filter.StageKind(kind%4 + 1)
		st := filter.Stage{Kind: sk, Order: 2, F0Hz: f0, Q: q, Gain: gain}
		if sk == filter.NotchStage {
			st.ZeroHz = 1.3 * f0
		}
		stages := make([]filter.Stage, int(n%4)+1)
		for i := range stages {
			stages[i] = st
		}
		ch, err := topology.Realize(stages, topology.Options{})
		if err != nil {
			return // not realizable: topology's business
		}
		lo, hi := f0/3, f0*3
		if !(lo > 0) || math.IsInf(hi, 0) {
			return
		}
		s, err := Snap(ch, Policy{Passband: []Band{{lo, hi}}})
		if err != nil {
			if !errors.Is(err, ErrChain) && !errors.Is(err, ErrPolicy) && !errors.Is(err, topology.ErrUnrealizable) {
				t.Fatalf("Snap error %v matches no sentinel", err)
			}
			return
		}
		if s.WorstDB > s.RoundedDB || math.IsNaN(s.WorstDB) {
			t.Fatalf("worst %g dB, rounded %g dB", s.WorstDB, s.RoundedDB)
		}
	})
}

// achieved returns the stage circuit c realizes with the given values, from
// its coefficients by the search's own conversion (stageOf), with the circuit's inversion taken out of the
// gain as topology's Achieved does. It accepts coefficients however the
// evaluator scales them.
func achieved(c topology.Circuit, ev evalFunc, values []float64) (filter.Stage, error) {
	b, err := ev(values)
	if err != nil {
		return filter.Stage{}, fmt.Errorf("series: %w", err)
	}
	st, ok := stageOf(c.Stage, b)
	if !ok {
		return filter.Stage{}, fmt.Errorf("series: %v circuit's parts give an unstable or degenerate %v stage: %w",
			c.Kind, c.Stage.Kind, ErrChain)
	}
	if c.Inverting() {
		st.Gain = -st.Gain
	}
	return st, nil
}

// TestSnapBoundedSearch forces both searches past MaxCombos (coordinate
// descent per stage and across stages): the promise holds.
func TestSnapBoundedSearch(t *testing.T) {
	ch := antiAlias(t)
	small, err := Snap(ch, Policy{MaxCombos: 8, Radius: 3, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	full, err := Snap(ch, Policy{Radius: 3, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("MaxCombos 8: %.4f dB, 4096: %.4f dB, rounded %.4f dB", small.WorstDB, full.WorstDB, full.RoundedDB)
	if small.WorstDB > small.RoundedDB || full.WorstDB > full.RoundedDB {
		t.Errorf("worse than rounding: %g, %g vs %g", small.WorstDB, full.WorstDB, full.RoundedDB)
	}
}

// TestSnapCapRadius lets the search move the capacitors too: they stay
// E12 values, and the promise holds.
func TestSnapCapRadius(t *testing.T) {
	ch := antiAlias(t)
	s, err := Snap(ch, Policy{CapRadius: 1, Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	held, err := Snap(ch, Policy{Passband: antiAliasBand})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("capacitors searched: %.4f dB; held: %.4f dB; rounded %.4f dB", s.WorstDB, held.WorstDB, s.RoundedDB)
	if s.WorstDB > s.RoundedDB {
		t.Errorf("worse than rounding: %g > %g", s.WorstDB, s.RoundedDB)
	}
	for _, it := range s.Items {
		if it.Kind == Capacitor && !isMember(E12, it.Value) {
			t.Errorf("%s = %g not an E12 value", it.Ref, it.Value)
		}
	}
}

// TestSnapCoarseCapacitors: with E3 capacitors the nearest values can
// break a Sallen-Key stage's capacitor-ratio condition (C1/C2 >= 4Q² at
// unity gain); Snap then takes the nearest neighbouring combination that
// Refit can solve, and still never does worse than rounding.
func TestSnapCoarseCapacitors(t *testing.T) {
	for _, q := range []float64{0.55, 0.8, 1.3, 2.2, 3.1, 4.4} {
		st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: q, Gain: 1}
		c, err := topology.RealizeStage(st, topology.Options{Kind: topology.SallenKey})
		if err != nil {
			t.Fatal(err)
		}
		ch := topology.Chain{Circuits: []topology.Circuit{c}}
		s, err := Snap(ch, Policy{Capacitors: E3, Resistors: E96, Passband: []Band{{100, 1e3}}})
		if err != nil {
			t.Errorf("Q %g: %v", q, err)
			continue
		}
		if s.WorstDB > s.RoundedDB {
			t.Errorf("Q %g: %g dB > rounded %g dB", q, s.WorstDB, s.RoundedDB)
		}
		if math.Abs(s.Stages[0].QErr) > 0.05 {
			t.Errorf("Q %g: Q error %.3g", q, s.Stages[0].QErr)
		}
	}
}
