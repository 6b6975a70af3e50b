package series

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// Policy controls Snap. The zero value snaps resistors to E96 and
// capacitors to E12 with a search radius of 2, no pairs, and needs only
// Passband to be set.
type Policy struct {
	// Resistors and Capacitors are the series to snap to; zero: E96 and
	// E12.
	Resistors, Capacitors Series
	// Radius is the number of standard values tried on each side of a
	// resistor's recomputed value (so 2·Radius candidates); 0 means 2.
	Radius int
	// CapRadius, when positive, lets the capacitors move too: every
	// combination of capacitors within CapRadius standard values of the
	// snapped ones (at most 81 per stage, fewest steps first) is refitted
	// with Circuit.Refit and searched like the first. 0 holds the
	// capacitors at their nearest values.
	CapRadius int
	// MaxCombos bounds the combinations tried, per stage and across
	// stages; beyond it the search descends one part (or stage) at a time.
	// 0 means 4096.
	MaxCombos int
	// Weights weighs f0, Q and gain errors in the per-stage objective.
	Weights Weights
	// Pairs allows a resistor to be built from two standard values in
	// series or parallel where the nearest single value is more than
	// PairAbove off (relative); PairAbove 0 means half the resistor
	// series' tolerance.
	Pairs     bool
	PairAbove float64
	// Passband is where the whole chain's deviation from the design is
	// minimized and reported (see PassbandOf for a filter.Spec's). At
	// least one band is needed.
	Passband []Band
}

func (p Policy) withDefaults() Policy {
	if !p.Resistors.valid() {
		p.Resistors = E96
	}
	if !p.Capacitors.valid() {
		p.Capacitors = E12
	}
	if p.Radius == 0 {
		p.Radius = 2
	}
	if p.MaxCombos == 0 {
		p.MaxCombos = 4096
	}
	p.Weights = p.Weights.orDefault()
	if p.PairAbove == 0 {
		p.PairAbove = p.Resistors.Tolerance() / 2
	}
	return p
}

func (p Policy) validate() error {
	bad := func(f string, a ...any) error {
		return fmt.Errorf("series: policy "+f+": %w", append(a, ErrPolicy)...)
	}
	if p.Resistors.id >= uint8(len(tables)) || p.Capacitors.id >= uint8(len(tables)) {
		return bad("series unknown")
	}
	if p.Radius < 0 || p.Radius > 8 {
		return bad("Radius %d (want 0 to 8)", p.Radius)
	}
	if p.CapRadius < 0 || p.CapRadius > 8 {
		return bad("CapRadius %d (want 0 to 8)", p.CapRadius)
	}
	if p.MaxCombos < 0 {
		return bad("MaxCombos %d negative", p.MaxCombos)
	}
	if !(p.PairAbove >= 0) || math.IsInf(p.PairAbove, 0) {
		return bad("PairAbove %g (want non-negative and finite)", p.PairAbove)
	}
	if err := p.Weights.validate(); err != nil {
		return err
	}
	if len(p.Passband) == 0 {
		return bad("Passband empty (want at least one band; see PassbandOf)")
	}
	for _, b := range p.Passband {
		if err := b.validate(); err != nil {
			return err
		}
	}
	return nil
}

// StageResult reports one snapped stage.
type StageResult struct {
	// Circuit is the stage with its snapped values (a pair's resistance in
	// the place of its part).
	Circuit topology.Circuit
	// Target is the stage the circuit was designed for; Achieved the stage
	// its snapped parts realize (from the circuit model).
	Target, Achieved filter.Stage
	// F0Err, QErr, GainErr and ZeroErr are relative errors, achieved/target
	// − 1 (gain by magnitude; ZeroErr for notches only, else 0).
	F0Err, QErr, GainErr, ZeroErr float64
	// Pairs maps a part's designator (its Ref within the stage) to the pair
	// built for it, for parts built as pairs.
	Pairs map[string]Pair
}

// Snapped is the result of Snap.
type Snapped struct {
	// Chain is the snapped chain: the input's circuits with standard values.
	Chain  topology.Chain
	Stages []StageResult
	// Items are the parts to buy and place, with chain-unique designators
	// (see Designator); a pair is two items, "U1.R2a" and "U1.R2b". BOM
	// groups them.
	Items []Item
	// WorstDB is the largest |deviation| in dB of the snapped chain's gain
	// from the design's over the policy's passband (see DeviationDB);
	// RoundedDB is the same for every part rounded to its nearest standard
	// value on its own, for comparison (+Inf when that rounding gives an
	// unstable circuit). WorstDB <= RoundedDB always.
	WorstDB, RoundedDB float64
}

// keep is the number of candidates per stage carried to the cross-stage
// choice, for each of the two rankings (full objective, shape only).
const keep = 4

// Snap replaces the parts of chain by standard values and returns the
// snapped chain with a report. Per stage it snaps the capacitors to
// p.Capacitors first (Nearest; if the circuit cannot be solved with those,
// the nearest combination of neighbouring values that can), recomputes the
// resistors for those capacitors with the circuit's own synthesis equations
// (Circuit.Refit), and then searches the standard values around each part
// jointly (p.Radius values each side of each resistor, pairs if allowed):
// every combination while there are at most p.MaxCombos, else coordinate
// descent. Each stage's best few candidates by its f0, Q and gain errors
// (and by f0 and Q alone, whose gain error another stage may make up for),
// and the independently rounded parts, go to a choice across stages that
// minimizes the worst deviation of the whole chain's gain from the design
// over p.Passband. The result is therefore never worse there than
// independent rounding.
//
// Errors wrap ErrPolicy (a bad policy), ErrChain (no circuits, a part that
// is neither R nor C, a circuit that cannot be solved with standard
// capacitors) or the topology's errors.
func Snap(chain topology.Chain, p Policy) (Snapped, error) {
	if err := p.validate(); err != nil {
		return Snapped{}, err
	}
	p = p.withDefaults()
	if len(chain.Circuits) == 0 {
		return Snapped{}, fmt.Errorf("series: snap a chain of no circuits: %w", ErrChain)
	}
	grid := bandGrid(p.Passband)
	ns := len(chain.Circuits)
	cands := make([][]candidate, ns)
	devs := make([][][]float64, ns)
	objs := make([][]float64, ns)
	must := make([]int, ns)
	for i, c := range chain.Circuits {
		cs, naive, err := stageCandidates(i, c, p, grid)
		if err != nil {
			return Snapped{}, err
		}
		cands[i] = cs
		must[i] = naive
		for _, cd := range cs {
			devs[i] = append(devs[i], cd.dev)
			objs[i] = append(objs[i], cd.shape+cd.gain)
		}
	}
	choice := chooseAcross(devs, objs, p.MaxCombos, [][]int{must})
	out, err := buildSnapped(chain, p, cands, choice)
	if err != nil {
		return Snapped{}, err
	}
	rounded := topology.Chain{Circuits: make([]topology.Circuit, ns)}
	for i, c := range chain.Circuits {
		if rounded.Circuits[i], err = c.WithValues(cands[i][must[i]].values); err != nil {
			return Snapped{}, fmt.Errorf("series: snap stage %d: %w", i+1, err)
		}
	}
	if out.RoundedDB, err = DeviationDB(rounded, p.Passband); errors.Is(err, errUnstable) {
		out.RoundedDB = math.Inf(1)
	} else if err != nil {
		return Snapped{}, err
	}
	if out.RoundedDB < out.WorstDB {
		// The search scored with the coefficients; on topology's AtHz a
		// tie with independent rounding can come out the other way by an
		// ulp or so. Keep the promise on the reported figures.
		rd := out.RoundedDB
		if out, err = buildSnapped(chain, p, cands, must); err != nil {
			return Snapped{}, err
		}
		out.RoundedDB = rd
	}
	return out, nil
}

// buildSnapped makes the result for one choice of a candidate per stage,
// WorstDB included.
func buildSnapped(chain topology.Chain, p Policy, cands [][]candidate, choice []int) (Snapped, error) {
	var out Snapped
	for i, c := range chain.Circuits {
		cd := cands[i][choice[i]]
		sc, err := c.WithValues(cd.values)
		if err != nil {
			return Snapped{}, fmt.Errorf("series: snap stage %d: %w", i+1, err)
		}
		ach, err := sc.Achieved()
		if err != nil {
			return Snapped{}, fmt.Errorf("series: snap stage %d: %w", i+1, err)
		}
		r := StageResult{Circuit: sc, Target: c.Stage, Achieved: ach}
		r.F0Err = ach.F0Hz/c.Stage.F0Hz - 1
		if c.Stage.Order == 2 {
			r.QErr = ach.Q/c.Stage.Q - 1
		}
		if c.Stage.Gain != 0 {
			r.GainErr = math.Abs(ach.Gain/c.Stage.Gain) - 1
		}
		if c.Stage.Kind == filter.NotchStage {
			r.ZeroErr = ach.ZeroHz/c.Stage.ZeroHz - 1
		}
		for k, part := range c.Parts {
			kind, _ := KindOf(part.Ref)
			ref := Designator(i, part.Ref)
			ser := p.Resistors
			if kind == Capacitor {
				ser = p.Capacitors
			}
			if pr, ok := cd.pairs[k]; ok {
				if r.Pairs == nil {
					r.Pairs = map[string]Pair{}
				}
				r.Pairs[part.Ref] = pr
				out.Items = append(out.Items,
					Item{Ref: ref + "a", Kind: kind, Value: pr.A, Series: ser, Tolerance: ser.Tolerance()},
					Item{Ref: ref + "b", Kind: kind, Value: pr.B, Series: ser, Tolerance: ser.Tolerance()})
				continue
			}
			out.Items = append(out.Items, Item{Ref: ref, Kind: kind, Value: cd.values[k],
				Series: ser, Tolerance: ser.Tolerance()})
		}
		out.Chain.Circuits = append(out.Chain.Circuits, sc)
		out.Stages = append(out.Stages, r)
	}
	var err error
	if out.WorstDB, err = DeviationDB(out.Chain, p.Passband); err != nil {
		return Snapped{}, err
	}
	return out, nil
}

// Tolerances returns the tolerances of the snapped parts keyed by
// designator, for Analysis: each part's series' customary tolerance, and for
// a resistor built as a pair the tolerance of its two parts (the pair's
// worst case; a random pair spreads less). Snapped.Chain holds a pair's
// resistance, which is on no series, so an Analysis of it needs these.
func (s Snapped) Tolerances() Tolerances {
	t := Tolerances{Part: map[string]float64{}}
	for _, it := range s.Items {
		ref := it.Ref
		if n := len(ref); n > 0 && (ref[n-1] == 'a' || ref[n-1] == 'b') {
			if _, isPair := s.pairOf(ref[:n-1]); isPair {
				ref = ref[:n-1] // "U1.R2a" is half of U1.R2
			}
		}
		t.Part[ref] = max(t.Part[ref], it.Tolerance)
	}
	return t
}

// pairOf returns the pair built for the part with designator ref.
func (s Snapped) pairOf(ref string) (Pair, bool) {
	for i, r := range s.Stages {
		for pref, p := range r.Pairs {
			if Designator(i, pref) == ref {
				return p, true
			}
		}
	}
	return Pair{}, false
}

// Round returns chain with every part rounded on its own to the nearest
// value of its series (resistors to res, capacitors to cap): what is done
// by hand, and what Snap is compared with.
func Round(chain topology.Chain, res, cap Series) (topology.Chain, error) {
	out := topology.Chain{Circuits: make([]topology.Circuit, len(chain.Circuits))}
	for i, c := range chain.Circuits {
		vals, err := roundParts(i, c, res, cap)
		if err != nil {
			return topology.Chain{}, err
		}
		if out.Circuits[i], err = c.WithValues(vals); err != nil {
			return topology.Chain{}, fmt.Errorf("series: round stage %d: %w", i+1, err)
		}
	}
	return out, nil
}

func roundParts(stage int, c topology.Circuit, res, cap Series) ([]float64, error) {
	vals := make([]float64, len(c.Parts))
	for k, part := range c.Parts {
		kind, err := KindOf(part.Ref)
		if err != nil {
			return nil, err
		}
		s := res
		if kind == Capacitor {
			s = cap
		}
		v, err := s.NearestValue(part.Value)
		if err != nil {
			return nil, fmt.Errorf("series: part %s: %w", Designator(stage, part.Ref), err)
		}
		vals[k] = v
	}
	return vals, nil
}

// DeviationDB returns the largest |20·log10(|H(f)|/|D(f)|)| over bands,
// where H is the chain's response from its parts (Chain.AtHz) and D the
// design, the product of its circuits' target stages (Circuit.Stage). It is
// evaluated at GridPoints log-spaced frequencies per band, ends included.
// A circuit whose parts give an unstable or degenerate stage has no
// steady-state response: that is an error wrapping ErrChain, as is a chain
// of no circuits (there is nothing to compare; Snap rejects it too). Bad
// or missing bands wrap ErrPolicy.
func DeviationDB(chain topology.Chain, bands []Band) (float64, error) {
	if len(chain.Circuits) == 0 {
		return math.NaN(), fmt.Errorf("series: deviation of a chain of no circuits: %w", ErrChain)
	}
	if len(bands) == 0 {
		return math.NaN(), fmt.Errorf("series: deviation over no band: %w", ErrPolicy)
	}
	for _, b := range bands {
		if err := b.validate(); err != nil {
			return math.NaN(), err
		}
	}
	for i, c := range chain.Circuits {
		if _, err := c.Achieved(); errors.Is(err, topology.ErrUnrealizable) {
			return math.NaN(), fmt.Errorf("series: stage %d: %v: %w", i+1, err, errUnstable)
		} else if err != nil {
			return math.NaN(), fmt.Errorf("series: stage %d: %w", i+1, err)
		}
	}
	worst := 0.0
	for _, f := range bandGrid(bands) {
		d := 0.0
		for _, c := range chain.Circuits {
			d -= stageDB(c.Stage, f)
		}
		d += 20 * math.Log10(cmplxAbs(chain.AtHz(f)))
		if math.IsNaN(d) {
			return math.NaN(), fmt.Errorf("series: deviation at %g Hz is not a number: %w", f, ErrChain)
		}
		worst = max(worst, math.Abs(d))
	}
	return worst, nil
}

var errUnstable = fmt.Errorf("series: the parts give an unstable or degenerate stage: %w", ErrChain)

// candidate is one choice of values for a stage.
type candidate struct {
	values      []float64
	pairs       map[int]Pair
	shape, gain float64
	dev         []float64 // dB deviation from the target stage per grid point
}

// partChoices is the list of values tried for one part, with the pairs
// some of them stand for.
type partChoices struct {
	vals  []float64
	pairs map[int]Pair // index in vals → pair
}

// stageCandidates searches stage i and returns its candidates for the
// cross-stage choice; naive is the index of the independently rounded one.
func stageCandidates(i int, c topology.Circuit, p Policy, grid []float64) ([]candidate, int, error) {
	if err := c.Stage.Validate(); err != nil {
		return nil, 0, fmt.Errorf("series: stage %d target: %w", i+1, err)
	}
	naiveVals, err := roundParts(i, c, p.Resistors, p.Capacitors)
	if err != nil {
		return nil, 0, err
	}
	variants, err := capVariants(i, c, p)
	if err != nil {
		return nil, 0, err
	}
	ev, err := newStageEval(c)
	if err != nil {
		return nil, 0, err
	}
	target := c.Stage
	score := func(vals []float64) (shape, gain float64, ok bool) {
		b, err := ev(vals)
		if err != nil {
			return 0, 0, false
		}
		a, ok := stageOf(target, b)
		if !ok {
			return 0, 0, false
		}
		shape, gain = stageError(p.Weights, target, a)
		return shape, gain, !math.IsNaN(shape + gain)
	}
	full := newTopList(keep)
	shapeOnly := newTopList(keep)
	for _, rc := range variants {
		searchStage(rc, p, score, full, shapeOnly)
	}
	var out []candidate
	seen := func(vals []float64) int {
		for n, cd := range out {
			if slices.Equal(cd.values, vals) {
				return n
			}
		}
		return -1
	}
	add := func(e topEntry) {
		if seen(e.vals) >= 0 {
			return
		}
		cd := candidate{values: e.vals, shape: e.shape, gain: e.gain}
		for k, j := range e.idx {
			if pr, ok := e.choices[k].pairs[j]; ok {
				if cd.pairs == nil {
					cd.pairs = map[int]Pair{}
				}
				cd.pairs[k] = pr
			}
		}
		out = append(out, cd)
	}
	for _, e := range full.entries {
		add(e)
	}
	for _, e := range shapeOnly.entries {
		add(e)
	}
	naive := seen(naiveVals)
	if naive < 0 {
		shape, gain, ok := score(naiveVals)
		if !ok {
			shape, gain = math.Inf(1), math.Inf(1)
		}
		out = append(out, candidate{values: naiveVals, shape: shape, gain: gain})
		naive = len(out) - 1
	}
	targetDB := make([]float64, len(grid))
	for j, f := range grid {
		targetDB[j] = stageDB(target, f)
	}
	for n := range out {
		b, err := ev(out[n].values)
		if err != nil {
			return nil, 0, fmt.Errorf("series: stage %d: %w", i+1, err)
		}
		out[n].dev = make([]float64, len(grid))
		_, stable := stageOf(target, b)
		for j, f := range grid {
			w := 2 * math.Pi * f
			out[n].dev[j] = 10*math.Log10(b.power(w*w)) - targetDB[j]
			if !stable {
				// An unstable circuit has no steady-state response: never
				// choose it.
				out[n].dev[j] = math.Inf(1)
			}
		}
	}
	return out, naive, nil
}

// searchStage searches the standard values around the parts of rc (a
// stage with its capacitors held and resistors refitted) and offers what it
// scores to the two top lists.
func searchStage(rc topology.Circuit, p Policy, score func([]float64) (float64, float64, bool), full, shapeOnly *topList) {
	choices := make([]partChoices, len(rc.Parts))
	for k, part := range rc.Parts {
		kind, _ := KindOf(part.Ref)
		s, radius := p.Resistors, p.Radius
		if kind == Capacitor {
			// Held: the variants move the capacitors, with the resistors
			// refitted for each.
			s, radius = p.Capacitors, 0
		}
		choices[k] = neighbourChoices(s, part.Value, radius)
		if p.Pairs && kind == Resistor {
			near := s.Nearest(part.Value)
			if math.Abs(near/part.Value-1) > p.PairAbove {
				if pr, _, err := s.BestPair(part.Value); err == nil {
					if choices[k].pairs == nil {
						choices[k].pairs = map[int]Pair{}
					}
					choices[k].pairs[len(choices[k].vals)] = pr
					choices[k].vals = append(choices[k].vals, pr.Value())
				}
			}
		}
	}
	vals := make([]float64, len(choices)) // reused: the top lists keep copies
	visit := func(idx []int) {
		for k, j := range idx {
			vals[k] = choices[k].vals[j]
		}
		shape, gain, ok := score(vals)
		if !ok {
			return
		}
		full.offer(vals, idx, choices, shape+gain, shape, gain)
		shapeOnly.offer(vals, idx, choices, shape, shape, gain)
	}
	total := 1
	for _, ch := range choices {
		total *= len(ch.vals)
		if total > p.MaxCombos {
			break
		}
	}
	idx := make([]int, len(choices))
	if total <= p.MaxCombos {
		var rec func(k int)
		rec = func(k int) {
			if k == len(choices) {
				visit(idx)
				return
			}
			for j := range choices[k].vals {
				idx[k] = j
				rec(k + 1)
			}
		}
		rec(0)
	} else {
		// Coordinate descent from the nearest value of each part (index 0
		// of its choices), on the full objective.
		visit(idx)
		for range 64 {
			improved := false
			for k := range choices {
				bestJ, bestObj := idx[k], math.Inf(1)
				for j := range choices[k].vals {
					idx[k] = j
					for m, jj := range idx {
						vals[m] = choices[m].vals[jj]
					}
					shape, gain, ok := score(vals)
					if !ok {
						continue
					}
					full.offer(vals, idx, choices, shape+gain, shape, gain)
					shapeOnly.offer(vals, idx, choices, shape, shape, gain)
					if shape+gain < bestObj {
						bestJ, bestObj = j, shape+gain
					}
				}
				if bestJ != idx[k] {
					improved = true
				}
				idx[k] = bestJ
			}
			if !improved {
				break
			}
		}
	}
}

// neighbourChoices returns the values tried for a part whose ideal value is
// x: the nearest value first, then the radius values on each side of x, by
// closeness (a standard value x is its own first choice, with radius values
// on each side of it).
func neighbourChoices(s Series, x float64, radius int) partChoices {
	vals := []float64{s.Nearest(x)}
	var cand []float64
	n, _ := s.Neighbours(x)
	for k := range radius {
		if n.Member {
			cand = append(cand, s.step(n.Floor, -k-1), s.step(n.Floor, k+1))
		} else {
			cand = append(cand, s.step(n.Floor, -k), s.step(n.Ceil, k))
		}
	}
	slices.SortStableFunc(cand, func(a, b float64) int {
		da, db := math.Abs(math.Log(a/x)), math.Abs(math.Log(b/x))
		switch {
		case da < db:
			return -1
		case da > db:
			return 1
		}
		return 0
	})
	for _, v := range cand {
		if !math.IsNaN(v) && !slices.Contains(vals, v) {
			vals = append(vals, v)
		}
	}
	return partChoices{vals: vals}
}

// maxCapVariants bounds the capacitor combinations Snap refits per stage
// when CapRadius > 0.
const maxCapVariants = 81

// capVariants returns the circuits to search for stage i: c with its
// capacitors snapped and its resistors refitted (refitSnapped), and with
// p.CapRadius > 0 also every combination of capacitors within CapRadius
// steps of those that Refit can solve (at most maxCapVariants, nearest
// first).
func capVariants(i int, c topology.Circuit, p Policy) ([]topology.Circuit, error) {
	rc, err := refitSnapped(i, c, p.Capacitors)
	if err != nil {
		return nil, err
	}
	out := []topology.Circuit{rc}
	if p.CapRadius == 0 {
		return out, nil
	}
	var capIdx []int
	for k, part := range rc.Parts {
		if kind, _ := KindOf(part.Ref); kind == Capacitor {
			capIdx = append(capIdx, k)
		}
	}
	width := 2*p.CapRadius + 1
	n := 1
	for range capIdx {
		n *= width
		if n > maxCapVariants {
			n = maxCapVariants
			break
		}
	}
	type variant struct {
		fixed []topology.Part
		dist  int
	}
	var vs []variant
	for code := 1; code < pow(width, len(capIdx)); code++ {
		fixed := make([]topology.Part, len(capIdx))
		dist, ok := 0, true
		x := code
		for m, k := range capIdx {
			st := x%width - p.CapRadius
			x /= width
			v := p.Capacitors.step(rc.Parts[k].Value, st)
			if math.IsNaN(v) {
				ok = false
				break
			}
			fixed[m] = topology.Part{Ref: rc.Parts[k].Ref, Value: v}
			dist += max(st, -st)
		}
		if ok {
			vs = append(vs, variant{fixed, dist})
		}
	}
	slices.SortStableFunc(vs, func(a, b variant) int { return a.dist - b.dist })
	for _, v := range vs {
		if len(out) >= n {
			break
		}
		if moved, err := c.Refit(v.fixed); err == nil {
			out = append(out, moved)
		}
	}
	return out, nil
}

func pow(b, e int) int {
	r := 1
	for range e {
		r *= b
	}
	return r
}

// refitSnapped snaps c's capacitors to cs and recomputes its resistors
// with Circuit.Refit. If the circuit cannot be solved with the nearest
// capacitors, the combinations of their neighbours (one step each way) are
// tried, nearest to the ideal capacitors first.
func refitSnapped(i int, c topology.Circuit, cs Series) (topology.Circuit, error) {
	var capIdx []int
	for k, part := range c.Parts {
		kind, err := KindOf(part.Ref)
		if err != nil {
			return topology.Circuit{}, err
		}
		if kind == Capacitor {
			capIdx = append(capIdx, k)
		}
	}
	type opt struct {
		fixed []topology.Part
		dist  float64
	}
	var opts []opt
	n := 1
	for range capIdx {
		n *= 3
	}
	// Code 0 is every capacitor at its nearest value; digit m of code in
	// base 3 moves capacitor m by 0, −1 or +1 steps.
	for code := range n {
		fixed := make([]topology.Part, len(capIdx))
		dist := 0.0
		ok := true
		for m, k := range capIdx {
			st := []int{0, -1, 1}[(code/pow3(m))%3]
			v := cs.step(c.Parts[k].Value, st)
			if math.IsNaN(v) {
				ok = false
				break
			}
			fixed[m] = topology.Part{Ref: c.Parts[k].Ref, Value: v}
			dist += math.Abs(math.Log(v / c.Parts[k].Value))
		}
		if ok {
			opts = append(opts, opt{fixed, dist})
		}
	}
	// Nearest first: each capacitor's nearest value minimizes its own term,
	// so code 0 has the least distance and the stable sort keeps it first.
	slices.SortStableFunc(opts, func(a, b opt) int {
		switch {
		case a.dist < b.dist:
			return -1
		case a.dist > b.dist:
			return 1
		}
		return 0
	})
	var first error
	for _, o := range opts {
		rc, err := c.Refit(o.fixed)
		if err == nil {
			return rc, nil
		}
		if first == nil {
			first = err
		}
	}
	if first == nil {
		first = errors.New("no capacitor values")
	}
	return topology.Circuit{}, fmt.Errorf("series: stage %d cannot be solved with %v capacitors: %v: %w",
		i+1, cs, first, ErrChain)
}

func pow3(m int) int {
	p := 1
	for range m {
		p *= 3
	}
	return p
}

// topEntry is one candidate in a topList.
type topEntry struct {
	vals        []float64
	idx         []int
	choices     []partChoices // what idx indexes
	obj         float64
	shape, gain float64
}

// topList keeps the n entries of least objective, ties to the first seen.
type topList struct {
	n       int
	entries []topEntry
}

func newTopList(n int) *topList { return &topList{n: n} }

func (t *topList) offer(vals []float64, idx []int, choices []partChoices, obj, shape, gain float64) {
	if len(t.entries) == t.n && !(obj < t.entries[t.n-1].obj) {
		return
	}
	for _, e := range t.entries {
		if slices.Equal(e.vals, vals) {
			return
		}
	}
	e := topEntry{vals: slices.Clone(vals), idx: slices.Clone(idx), choices: choices, obj: obj, shape: shape, gain: gain}
	pos := len(t.entries)
	for pos > 0 && obj < t.entries[pos-1].obj {
		pos--
	}
	t.entries = slices.Insert(t.entries, pos, e)
	if len(t.entries) > t.n {
		t.entries = t.entries[:t.n]
	}
}
