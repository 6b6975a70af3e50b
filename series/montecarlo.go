package series

import (
	"context"
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// Deviation is a yield criterion: the gain within ±DB of the design's over
// [LoHz, HiHz] (at the analysis frequencies in that band).
type Deviation struct {
	LoHz, HiHz float64
	DB         float64
}

// Analysis sets up the tolerance analyses of a chain: MonteCarlo, WorstCase
// and Ranking. The zero value (with Hz set) runs 1000 trials of uniform
// tolerances from each part's series, seed 0, on all cores, with no yield
// criterion (every trial that can be evaluated passes).
type Analysis struct {
	// Trials is the number of boards simulated; 0 means 1000.
	Trials int
	// Seed selects the random draws. The same seed gives the same results,
	// bit for bit, for any Workers.
	Seed uint64
	// Workers is the number of goroutines; 0 means runtime.GOMAXPROCS(0).
	Workers int
	// Dist is the distribution of each part around its nominal value.
	Dist Distribution
	// Tolerances are the parts' tolerances; zero fields take the
	// customary tolerance of the series each value belongs to (Resistors
	// or Capacitors when it is one of theirs, else the coarsest IEC 60063
	// series holding it; a value on no series then needs a tolerance).
	Tolerances            Tolerances
	Resistors, Capacitors Series
	// Hz are the analysis frequencies (at least one).
	Hz []float64
	// Spec, if not nil, is the mask each trial must meet at the analysis
	// frequencies: in its passband a gain within [ref − RippleDB − SlackDB,
	// ref + SlackDB], in its stopband at most ref − AttenDB + SlackDB,
	// where ref is the design's largest gain at the passband frequencies of
	// Hz (the design: the product of the circuits' target stages).
	Spec *filter.Spec
	// Band, if not nil, is a deviation criterion each trial must meet too.
	Band *Deviation
	// SlackDB loosens every bound of the criteria, so a design that meets
	// its mask exactly at an edge still passes; 0 means 0.001 dB.
	SlackDB float64
	// Percentiles (0 to 100), if any, are computed per frequency from the
	// gains of all trials (which are then kept: Trials·len(Hz) values).
	Percentiles []float64
	// Moments asks for the mean and standard deviation of the gain per
	// frequency.
	Moments bool
}

// Spread is the result of Analysis.MonteCarlo.
type Spread struct {
	// Trials run, Passed the criteria, Failed could not be evaluated (a
	// drawn value not positive); Yield = Passed/Trials.
	Trials, Passed, Failed int
	Yield                  float64
	// Hz are the analysis frequencies; NominalDB the chain's gain there
	// with its parts as given, DesignDB the design's.
	Hz, NominalDB, DesignDB []float64
	// MeanDB and StdDB (sample standard deviation) of the gain per
	// frequency, over the trials that could be evaluated; nil unless
	// Moments was asked for.
	MeanDB, StdDB []float64
	// EnvelopeDB[i][j] is the Percentiles[i]-th percentile of the gain at
	// Hz[j] over the trials that could be evaluated (linear interpolation
	// between order statistics); nil without Percentiles.
	Percentiles []float64
	EnvelopeDB  [][]float64
}

const maxTrials = 1 << 26

func (m Analysis) validate() error {
	bad := func(f string, a ...any) error {
		return fmt.Errorf("series: Monte Carlo "+f+": %w", append(a, ErrPolicy)...)
	}
	if m.Trials < 0 || m.Trials > maxTrials {
		return bad("Trials %d (want 0 to %d)", m.Trials, maxTrials)
	}
	if m.Workers < 0 {
		return bad("Workers %d negative", m.Workers)
	}
	if m.Dist != Uniform && m.Dist != Normal {
		return bad("Dist %v unknown", m.Dist)
	}
	if len(m.Hz) == 0 {
		return bad("Hz empty")
	}
	for _, f := range m.Hz {
		if !(f > 0) || math.IsInf(f, 0) {
			return bad("frequency %g Hz (want positive and finite)", f)
		}
	}
	if !(m.SlackDB >= 0) || math.IsInf(m.SlackDB, 0) {
		return bad("SlackDB %g (want non-negative and finite)", m.SlackDB)
	}
	if m.Spec != nil {
		if err := m.Spec.Validate(); err != nil {
			return fmt.Errorf("series: Monte Carlo Spec: %w", err)
		}
	}
	if b := m.Band; b != nil {
		if err := (Band{b.LoHz, b.HiHz}).validate(); err != nil {
			return err
		}
		if !(b.DB >= 0) || math.IsInf(b.DB, 0) {
			return bad("Band.DB %g (want non-negative and finite)", b.DB)
		}
	}
	if m.Trials*len(m.Hz) > maxTrials && len(m.Percentiles) > 0 {
		return bad("percentiles of %d trials × %d frequencies (at most %d values)", m.Trials, len(m.Hz), maxTrials)
	}
	for _, q := range m.Percentiles {
		if !(q >= 0 && q <= 100) {
			return bad("percentile %g (want 0 to 100)", q)
		}
	}
	return m.Tolerances.validate()
}

// MonteCarlo simulates m.Trials boards built from chain's parts, each part drawn
// around its nominal value within its tolerance (see Distribution), and
// returns the yield against the criteria and the spread of the gain. Trial
// i draws from its own random stream seeded from (Seed, i), so results do
// not depend on Workers; moments are reduced in a fixed order, so they are
// bit-identical too. Per trial it evaluates each stage's transfer function
// coefficients from the drawn values (topology's Evaluator) and |H(jω)|²
// from real arithmetic at precomputed ω², without allocating.
//
// Errors wrap ErrPolicy (bad options), ErrChain (no circuits, a part that is
// neither R nor C, a part with no tolerance to take, or an analysis
// frequency where the gain leaves the float64 range of |H|²: below about
// −3000 dB, or so far above any circuit's range that the analysis gives
// NaN) or topology's.
func (m Analysis) MonteCarlo(chain topology.Chain) (Spread, error) {
	return m.MonteCarloContext(context.Background(), chain)
}

// MonteCarloContext is MonteCarlo stopped early when ctx is done: the
// workers check ctx between blocks of 64 trials, and a cancelled run
// returns no Spread and an error wrapping ctx.Err() (errors.Is matches
// context.Canceled or context.DeadlineExceeded). A run that finishes
// every trial is MonteCarlo's, bit for bit: ctx does not enter the
// results.
func (m Analysis) MonteCarloContext(ctx context.Context, chain topology.Chain) (Spread, error) {
	if err := ctx.Err(); err != nil {
		return Spread{}, fmt.Errorf("series: Monte Carlo not started: %w", err)
	}
	if err := m.validate(); err != nil {
		return Spread{}, err
	}
	if len(chain.Circuits) == 0 {
		return Spread{}, fmt.Errorf("series: Monte Carlo of a chain of no circuits: %w", ErrChain)
	}
	if m.Trials == 0 {
		m.Trials = 1000
	}
	slack := m.SlackDB
	if slack == 0 {
		slack = 0.001
	}
	items, err := Items(chain, m.Resistors, m.Capacitors, m.Tolerances)
	if err != nil {
		return Spread{}, err
	}
	plan := &mcPlan{dist: m.Dist, trials: m.Trials, seed: m.Seed, workers: m.Workers,
		keepDB: len(m.Percentiles) > 0, moments: m.Moments}
	n := 0
	var nominal []bq // each stage's coefficients at its nominal values
	for _, c := range chain.Circuits {
		check, err := newStageEval(c)
		if err != nil {
			return Spread{}, err
		}
		st := mcStage{newPair: func() (evalFunc, batchFunc) {
			one, batch, err := newStageEvals(c) // succeeded once above, so it does again
			if err != nil {
				return func([]float64) (bq, error) { return bq{}, err },
					func(_ [][]float64, _ []bq, ok []bool) { clear(ok) }
			}
			return one, batch
		}}
		for _, part := range c.Parts {
			it := items[n]
			n++
			if it.Tolerance == 0 && !it.Series.valid() && !hasTol(m.Tolerances, it) {
				return Spread{}, fmt.Errorf("series: part %s = %g is on no series and has no tolerance given: %w",
					it.Ref, part.Value, ErrChain)
			}
			st.nominal = append(st.nominal, part.Value)
			st.tol = append(st.tol, it.Tolerance)
		}
		// Check once that the circuit evaluates at its nominal values.
		b, err := check(st.nominal)
		if err != nil {
			return Spread{}, fmt.Errorf("series: Monte Carlo: %w", err)
		}
		nominal = append(nominal, b)
		plan.stages = append(plan.stages, st)
	}
	out := Spread{Trials: m.Trials, Hz: append([]float64(nil), m.Hz...)}
	nf := len(m.Hz)
	out.NominalDB = make([]float64, nf)
	out.DesignDB = make([]float64, nf)
	plan.w2 = make([]float64, nf)
	plan.loP = make([]float64, nf)
	plan.hiP = make([]float64, nf)
	for j, f := range m.Hz {
		w := 2 * math.Pi * f
		plan.w2[j] = w * w
		out.NominalDB[j] = 20 * math.Log10(cmplxAbs(chain.AtHz(f)))
		pw := 1.0
		for _, b := range nominal {
			pw *= b.power(plan.w2[j])
		}
		if g := out.NominalDB[j]; math.IsNaN(g) || math.IsNaN(pw) || math.IsInf(pw, 0) || (pw == 0) != math.IsInf(g, -1) {
			// Trials work with |H|², which leaves float64 where the
			// gain is below about −3000 dB (|H| < 1e-154), and far
			// above any circuit's range ω² and the nodal analysis do
			// too: every trial would be −Inf or NaN. (An exact zero of
			// the nominal chain, a notch at its zero, is fine.)
			return Spread{}, fmt.Errorf("series: Monte Carlo: gain at Hz[%d] = %g Hz (%g dB) is beyond float64 in |H|²: %w", j, f, g, ErrChain)
		}
		for _, c := range chain.Circuits {
			out.DesignDB[j] += stageDB(c.Stage, f)
		}
		plan.loP[j], plan.hiP[j] = 0, math.Inf(1)
	}
	constrained := make([]bool, nf)
	tighten := func(j int, loDB, hiDB float64) {
		plan.loP[j] = max(plan.loP[j], math.Pow(10, (loDB-slack)/10))
		plan.hiP[j] = min(plan.hiP[j], math.Pow(10, (hiDB+slack)/10))
		constrained[j] = true
	}
	if s := m.Spec; s != nil {
		ref := math.Inf(-1)
		for j, f := range m.Hz {
			if inPass(*s, f) {
				ref = max(ref, out.DesignDB[j])
			}
		}
		if math.IsInf(ref, -1) {
			return Spread{}, fmt.Errorf("series: Monte Carlo: no analysis frequency in the Spec's passband (PassHz %v): %w", s.PassHz, ErrPolicy)
		}
		for j, f := range m.Hz {
			switch {
			case inPass(*s, f):
				tighten(j, ref-s.RippleDB, ref)
			case inStop(*s, f):
				tighten(j, math.Inf(-1), ref-s.AttenDB)
			}
		}
	}
	if b := m.Band; b != nil {
		for j, f := range m.Hz {
			if f >= b.LoHz && f <= b.HiHz {
				tighten(j, out.DesignDB[j]-b.DB, out.DesignDB[j]+b.DB)
			}
		}
	}
	for j, c := range constrained {
		if c {
			plan.checked = append(plan.checked, j)
		}
	}
	plan.done = ctx.Done()
	res := plan.run()
	if plan.stopped.Load() {
		return Spread{}, fmt.Errorf("series: Monte Carlo stopped: %w", ctx.Err())
	}
	out.Passed, out.Failed = res.passed, res.failed
	out.Yield = float64(res.passed) / float64(m.Trials)
	out.MeanDB, out.StdDB = res.mean, res.std
	if len(m.Percentiles) > 0 {
		out.Percentiles = append([]float64(nil), m.Percentiles...)
		out.EnvelopeDB = percentiles(res.db, m.Trials, nf, m.Percentiles)
	}
	return out, nil
}

func hasTol(t Tolerances, it Item) bool {
	_, ok := t.Part[it.Ref]
	return ok || t.Override || (it.Kind == Resistor && t.Resistor > 0) || (it.Kind == Capacitor && t.Capacitor > 0)
}

// inPass and inStop say where f lies in spec's mask (edges included).
func inPass(s filter.Spec, f float64) bool {
	switch s.Band {
	case filter.Lowpass:
		return f <= s.PassHz[0]
	case filter.Highpass:
		return f >= s.PassHz[0]
	case filter.Bandpass:
		return f >= s.PassHz[0] && f <= s.PassHz[1]
	case filter.Bandstop:
		return f <= s.PassHz[0] || f >= s.PassHz[1]
	}
	return false
}

func inStop(s filter.Spec, f float64) bool {
	switch s.Band {
	case filter.Lowpass:
		return f >= s.StopHz[0]
	case filter.Highpass:
		return f <= s.StopHz[0]
	case filter.Bandpass:
		return f <= s.StopHz[0] || f >= s.StopHz[1]
	case filter.Bandstop:
		return f >= s.StopHz[0] && f <= s.StopHz[1]
	}
	return false
}
