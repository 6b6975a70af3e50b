package pipeline

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/floats"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// Result is one evaluated design: its Document and the library values
// behind it, for plots, decks and bills of materials. A Result is a plain
// value, safe to share between goroutines once returned.
type Result struct {
	// Doc is the result document.
	Doc Document
	// Design is the transfer function designed (for the tightened mask,
	// its gain lowered by the margin; see Request.MarginDB).
	Design filter.Transfer
	// Ideal is the realized chain before snapping; Snapped after.
	Ideal, Snapped topology.Chain
	// Spread is the Monte Carlo run of the snapped chain, with the gain
	// envelope at EnvelopePercentiles over AnalysisHz.
	Spread series.Spread
	// Lines is the bill of materials of the snapped chain.
	Lines []series.Line
}

// EnvelopePercentiles are the percentiles of the Monte Carlo gain kept in
// Result.Spread.EnvelopeDB: the central 99 % and the median.
var EnvelopePercentiles = []float64{0.5, 50, 99.5}

// analysisPoints is the number of log-spaced analysis frequencies of the
// Monte Carlo run (the mask's edges are added to them).
const analysisPoints = 200

// passbandPoints is the number of extra analysis frequencies across each
// band of the passband.
const passbandPoints = 48

// Run designs req with every family it lists and returns the best result
// by Rule, whose Document lists every candidate. req is resolved first
// (Request.Resolve); a bad request is a *FieldError wrapping ErrRequest,
// and a request no family can build an error wrapping ErrDesign.
func Run(req Request) (Result, error) { return RunContext(context.Background(), req) }

// RunContext is Run stopped early when ctx is done (between families, and
// within a family's Monte Carlo run, series.Analysis.MonteCarloContext):
// the error then wraps ctx.Err(). A run that finishes is Run's.
func RunContext(ctx context.Context, req Request) (Result, error) {
	p, req, err := req.resolve()
	if err != nil {
		return Result{}, err
	}
	results := make([]Result, len(p.families))
	cands := make([]Candidate, len(p.families))
	for i, fam := range p.families {
		if err := ctx.Err(); err != nil {
			return Result{}, fmt.Errorf("pipeline: stopped before %s: %w", fam, err)
		}
		results[i], err = evaluate(ctx, req, p, fam)
		if ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			return Result{}, fmt.Errorf("pipeline: %s: %w", fam, err)
		}
		if err != nil {
			cands[i] = Candidate{Family: fam, Order: results[i].Doc.Order, Error: err.Error()}
			continue
		}
		cands[i] = summary(results[i].Doc)
	}
	order := Rank(cands, req.MinYieldPct)
	best := order[0]
	if cands[best].Error != "" {
		msgs := make([]string, len(cands))
		for i, c := range cands {
			msgs[i] = c.Family + ": " + c.Error
		}
		return Result{}, fmt.Errorf("pipeline: %s: %w", strings.Join(msgs, "; "), ErrDesign)
	}
	r := results[best]
	r.Doc.Candidates = cands
	return r, nil
}

// Evaluate designs req with one family (a name of FamilyNames), whatever
// the request's own Families say, and returns its result; the Document's
// Candidates list just that family.
func Evaluate(req Request, family string) (Result, error) {
	req.Families = []string{family}
	p, req, err := req.resolve()
	if err != nil {
		return Result{}, err
	}
	r, err := evaluate(context.Background(), req, p, p.families[0])
	if err != nil {
		return Result{}, err
	}
	r.Doc.Candidates = []Candidate{summary(r.Doc)}
	return r, nil
}

// summary is the Candidate of a successful document.
func summary(d Document) Candidate {
	c := Candidate{Family: d.Family, Order: d.Order, DeviationDB: d.DeviationDB, YieldPct: d.MonteCarlo.YieldPct, NoiseUV: d.Noise.RMSUV}
	for _, s := range d.Stages {
		c.OpAmps += s.OpAmps
		c.Parts += len(s.Parts)
		c.MaxGBWHz = max(c.MaxGBWHz, s.GBWHz)
	}
	return c
}

// Rank returns the indices of cands, best first, by Rule: candidates
// without an Error first; then those whose YieldPct reaches minYieldPct;
// then fewer OpAmps; then smaller DeviationDB; then lower Order; then the
// index (the request's family order). The order is total, so it is the
// same on every run.
func Rank(cands []Candidate, minYieldPct float64) []int {
	idx := make([]int, len(cands))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		ca, cb := cands[a], cands[b]
		if x := cmp.Compare(boolInt(ca.Error != ""), boolInt(cb.Error != "")); x != 0 {
			return x
		}
		if x := cmp.Compare(boolInt(ca.YieldPct < minYieldPct), boolInt(cb.YieldPct < minYieldPct)); x != 0 {
			return x
		}
		if x := cmp.Compare(ca.OpAmps, cb.OpAmps); x != 0 {
			return x
		}
		if x := cmp.Compare(ca.DeviationDB, cb.DeviationDB); x != 0 {
			return x
		}
		if x := cmp.Compare(ca.Order, cb.Order); x != 0 {
			return x
		}
		return cmp.Compare(a, b)
	})
	return idx
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

// evaluate runs the whole pipeline for one family of a resolved request.
// On error the returned Result's Doc.Order is set when the order was found.
func evaluate(ctx context.Context, req Request, p policy, fam string) (Result, error) {
	var r Result
	f, _ := familyOf(fam)
	order, err := filter.MinOrder(f, p.designMask)
	if err != nil {
		return r, err
	}
	r.Doc.Order = order
	h, err := filter.Design(f, p.designMask)
	if err != nil {
		return r, err
	}
	h.Gain *= p.gainScale
	stages, err := h.StagesWith(filter.StageOptions{Gain: filter.GainLast})
	if err != nil {
		return r, err
	}
	chain := topology.Chain{Circuits: make([]topology.Circuit, len(stages))}
	// The chosen kind for every stage it can realize; first-order stages
	// fall back to an RC + follower when it is a second-order kind.
	opt := topology.Options{Kind: p.kind, FirstOrder: topology.RCFollower, CapF: req.CapF}
	for i, st := range stages {
		c, err := topology.RealizeStage(st, opt)
		if err != nil {
			return r, fmt.Errorf("stage %d (%v, f0 %.4g Hz, Q %.3g): %w", i+1, st.Kind, st.F0Hz, st.Q, err)
		}
		chain.Circuits[i] = c
	}
	pass, err := series.PassbandOf(req.Mask)
	if err != nil {
		return r, err
	}
	snap, err := series.Snap(chain, series.Policy{Resistors: p.res, Capacitors: p.cap, Passband: pass})
	if err != nil {
		return r, err
	}
	designCheck, err := response.CheckMask(h, req.Mask)
	if err != nil {
		return r, err
	}
	snapCheck, err := response.CheckMask(snap.Chain, req.Mask)
	if err != nil {
		return r, err
	}
	// series.Analysis checks a trial's gain relative to the design's
	// passband peak ref (−MarginDB here): [ref − RippleDB − SlackDB, ref +
	// SlackDB] in the passband, at most ref − AttenDB + SlackDB in the
	// stopband. With the design mask's ripple (RippleDB − 2·MarginDB), the
	// mask's attenuation and a slack of MarginDB that is exactly the mask
	// as given, in absolute terms: [−RippleDB, 0] and −AttenDB.
	mcMask := p.designMask
	spread, err := series.Analysis{
		Trials:      req.Trials,
		Seed:        req.Seed,
		Dist:        p.dist,
		Tolerances:  p.tol,
		Resistors:   p.res,
		Capacitors:  p.cap,
		Hz:          AnalysisHz(req.Mask),
		Spec:        &mcMask,
		SlackDB:     *req.MarginDB,
		Percentiles: EnvelopePercentiles,
	}.MonteCarloContext(ctx, snap.Chain)
	if err != nil {
		return r, err
	}
	items, err := series.Items(snap.Chain, p.res, p.cap, p.tol)
	if err != nil {
		return r, err
	}
	lines := series.BOM(items)

	d := Document{
		Version:            Version,
		Request:            req,
		Rule:               Rule,
		Family:             fam,
		Order:              order,
		Design:             h,
		DesignMarginDB:     designCheck.MarginDB,
		SnappedMarginDB:    snapCheck.MarginDB,
		DeviationDB:        snap.WorstDB,
		RoundedDeviationDB: snap.RoundedDB,
		Inverting:          snap.Chain.Inverting(),
		MonteCarlo: MonteCarloDoc{
			Trials: spread.Trials, Passed: spread.Passed, Failed: spread.Failed,
			YieldPct: 100 * spread.Yield, Seed: req.Seed, Distribution: req.Distribution,
			ResistorTolPct: req.ResistorTolPct, CapacitorTolPct: req.CapacitorTolPct,
			Frequencies: len(spread.Hz),
		},
		Caution: Caution,
	}
	for i, sr := range snap.Stages {
		ideal := chain.Circuits[i]
		sd := StageDoc{
			Designator: strings.TrimSuffix(series.Designator(i, ""), "."),
			Target:     sr.Target,
			Achieved:   sr.Achieved,
			F0ErrPct:   100 * sr.F0Err,
			QErrPct:    100 * sr.QErr,
			GainErrPct: 100 * sr.GainErr,
			Circuit:    sr.Circuit.Kind.String(),
			OpAmps:     sr.Circuit.OpAmps(),
			Inverting:  sr.Circuit.Inverting(),
		}
		for k, part := range sr.Circuit.Parts {
			kind, err := series.KindOf(part.Ref)
			if err != nil {
				return r, err
			}
			unit, ser := "Ω", p.res
			if kind == series.Capacitor {
				unit, ser = "F", p.cap
			}
			sd.Parts = append(sd.Parts, PartDoc{
				Ref:        part.Ref,
				Designator: series.Designator(i, part.Ref),
				IdealValue: ideal.Parts[k].Value,
				Value:      part.Value,
				Display:    series.FormatValue(part.Value, unit),
				Series:     seriesName(ser, part.Value),
			})
		}
		if sd.GBWHz, sd.RuleOfThumbGBWHz, err = opAmpNeeds(sr.Circuit); err != nil {
			return r, fmt.Errorf("stage %d: %w", i+1, err)
		}
		d.Stages = append(d.Stages, sd)
	}
	if d.Noise, err = noiseOf(snap.Chain, req); err != nil {
		return r, err
	}
	peaks, err := snap.Chain.AmpPeaks()
	if err != nil {
		return r, err
	}
	for _, pk := range peaks {
		sd := &d.Stages[pk.Stage]
		sd.Swing = append(sd.Swing, SwingDoc{Designator: series.Designator(pk.Stage, pk.Ref), Node: pk.Node, Gain: pk.Gain, Hz: pk.Hz})
	}
	for _, l := range lines {
		d.BOM = append(d.BOM, BOMLine{
			Kind:         l.Kind.String(),
			Value:        l.Value,
			Display:      series.FormatValue(l.Value, unitOf(l.Kind)),
			Code:         series.FormatCode(l.Value),
			Series:       seriesString(l.Series),
			TolerancePct: 100 * l.Tolerance,
			Count:        l.Count,
			Refs:         append([]string(nil), l.Refs...),
		})
	}
	if err := d.check(); err != nil {
		return r, err
	}
	return Result{Doc: d, Design: h, Ideal: chain, Snapped: snap.Chain, Spread: spread, Lines: lines}, nil
}

func unitOf(k series.PartKind) string {
	if k == series.Capacitor {
		return "F"
	}
	return "Ω"
}

// seriesName names the series v belongs to: prefer when v is one of its
// values, else the coarsest IEC 60063 series holding it, else "".
func seriesName(prefer series.Series, v float64) string {
	if isMember(prefer, v) {
		return prefer.String()
	}
	for _, s := range series.All {
		if isMember(s, v) {
			return s.String()
		}
	}
	return ""
}

func isMember(s series.Series, v float64) bool {
	n, err := s.Neighbours(v)
	return err == nil && n.Member
}

func seriesString(s series.Series) string {
	if s == (series.Series{}) {
		return ""
	}
	return s.String()
}

// check refuses a document holding a number JSON cannot carry (NaN, ±Inf),
// naming the field: a sign of a bug upstream, never silently written.
func (d Document) check() error {
	bad := func(field string, v float64) error {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("pipeline: document field %s = %g is not finite", field, v)
		}
		return nil
	}
	errs := []error{
		bad("design_margin_db", d.DesignMarginDB), bad("snapped_margin_db", d.SnappedMarginDB),
		bad("deviation_db", d.DeviationDB), bad("rounded_deviation_db", d.RoundedDeviationDB),
		bad("monte_carlo.yield_pct", d.MonteCarlo.YieldPct),
	}
	errs = append(errs, bad("noise.rms_uv", d.Noise.RMSUV), bad("noise.density_nv", d.Noise.DensityNV))
	for i, s := range d.Noise.Top {
		errs = append(errs, bad(fmt.Sprintf("noise.top[%d].density_nv", i), s.DensityNV))
	}
	for i, s := range d.Stages {
		pre := fmt.Sprintf("stages[%d].", i)
		errs = append(errs, bad(pre+"f0_err_pct", s.F0ErrPct), bad(pre+"q_err_pct", s.QErrPct),
			bad(pre+"gain_err_pct", s.GainErrPct), bad(pre+"gbw_hz", s.GBWHz),
			bad(pre+"rule_of_thumb_gbw_hz", s.RuleOfThumbGBWHz))
		for k, w := range s.Swing {
			errs = append(errs, bad(fmt.Sprintf("%sswing[%d].gain", pre, k), w.Gain), bad(fmt.Sprintf("%sswing[%d].hz", pre, k), w.Hz))
		}
	}
	return errors.Join(errs...)
}

// NoiseTop is the number of sources a NoiseDoc lists.
const NoiseTop = 5

// NoiseRefHz returns the passband frequency where a NoiseDoc gives the
// density: a decade inside a lowpass or highpass passband edge (or the
// lower passband of a bandstop), the geometric centre of a bandpass.
func NoiseRefHz(m filter.Spec) float64 {
	switch m.Band {
	case filter.Highpass:
		return 10 * m.PassHz[0]
	case filter.Bandpass:
		return math.Sqrt(m.PassHz[0] * m.PassHz[1])
	default:
		return m.PassHz[0] / 10
	}
}

// noiseOf returns the noise figures of the snapped chain for the resolved
// request.
func noiseOf(ch topology.Chain, req Request) (NoiseDoc, error) {
	n := topology.Noise{AmpVoltage: req.AmpNoiseNV * 1e-9, AmpCurrent: req.AmpNoisePA * 1e-12}
	lo, hi := PlotRange(req.Mask)
	ref := NoiseRefHz(req.Mask)
	nd := NoiseDoc{TempK: topology.DefaultNoiseTempK, AmpNoiseNV: req.AmpNoiseNV, AmpNoisePA: req.AmpNoisePA,
		BandHz: [2]float64{lo, hi}, RefHz: ref}
	rms, err := ch.NoiseRMS(n, lo, hi)
	if err != nil {
		return nd, err
	}
	dens, err := ch.NoiseAt(n, ref)
	if err != nil {
		return nd, err
	}
	src, err := ch.NoiseSources(n, ref)
	if err != nil {
		return nd, err
	}
	slices.SortStableFunc(src, func(a, b topology.NoiseSource) int { return cmp.Compare(b.Density, a.Density) })
	for _, s := range src[:min(NoiseTop, len(src))] {
		nd.Top = append(nd.Top, NoiseSourceDoc{
			Designator: series.Designator(s.Stage, s.Ref),
			Kind:       s.Kind.String(),
			DensityNV:  s.Density * 1e9,
			SharePct:   100 * (s.Density / dens) * (s.Density / dens),
		})
	}
	nd.RMSUV, nd.DensityNV = rms*1e6, dens*1e9
	return nd, nil
}

// PlotRange returns the frequency span, in hertz, that shows mask m whole:
// a decade beyond its outermost edges, two decades below a lowpass
// passband edge (or above a highpass one).
func PlotRange(m filter.Spec) (loHz, hiHz float64) {
	switch m.Band {
	case filter.Lowpass:
		return m.PassHz[0] / 100, m.StopHz[0] * 10
	case filter.Highpass:
		return m.StopHz[0] / 10, m.PassHz[0] * 100
	case filter.Bandpass:
		return m.StopHz[0] / 10, m.StopHz[1] * 10
	default:
		return m.PassHz[0] / 10, m.PassHz[1] * 10
	}
}

// AnalysisHz returns the Monte Carlo analysis frequencies for mask m:
// analysisPoints log-spaced over PlotRange, passbandPoints more across
// each band of the passband (series.PassbandOf), so that a narrow passband
// is sampled as finely as a wide one, and the mask's edges, ascending and
// without duplicates.
func AnalysisHz(m filter.Spec) []float64 {
	lo, hi := PlotRange(m)
	hz := logSpan(analysisPoints, lo, hi)
	if bands, err := series.PassbandOf(m); err == nil {
		for _, b := range bands {
			if b0, b1 := max(b.LoHz, lo), min(b.HiHz, hi); b0 < b1 {
				hz = append(hz, logSpan(passbandPoints, b0, b1)...)
			}
		}
	}
	edges := []float64{m.PassHz[0], m.StopHz[0]}
	if m.Band == filter.Bandpass || m.Band == filter.Bandstop {
		edges = append(edges, m.PassHz[1], m.StopHz[1])
	}
	hz = append(hz, edges...)
	slices.Sort(hz)
	return slices.Compact(hz)
}

// logSpan is floats.LogSpan with both ends exactly as given.
func logSpan(n int, lo, hi float64) []float64 {
	hz := floats.LogSpan(make([]float64, n), lo, hi)
	hz[0], hz[n-1] = lo, hi
	return hz
}
