package filter

import (
	"cmp"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
)

// GainPlan says how Stages distributes the overall gain of a transfer
// function over the stages of its cascade.
type GainPlan int

const (
	// GainDynamic (the zero value) is dynamic-range scaling: each stage but
	// the last gets the positive gain that makes the cascade's output after
	// it peak exactly as high as the final output's peak (the largest |H(jω)|
	// over all frequencies, the passband peak for every Design result); the
	// last stage takes what remains, with the overall sign. No intermediate
	// node then clips before the output does, and none sits needlessly low
	// above the noise.
	GainDynamic GainPlan = iota
	// GainLast puts all gain in the last stage: every earlier stage has
	// Gain 1 (unit gain at its reference frequency: DC for lowpass and
	// notch, infinity for highpass, F0Hz for bandpass), and the last stage
	// has the overall gain and sign.
	GainLast
)

// StageOptions are the options of Transfer.StagesWith; the zero value is
// the default of Transfer.Stages.
type StageOptions struct {
	Gain GainPlan // gain distribution; zero is GainDynamic
}

// Tolerances of the root classification in StagesWith, relative to the
// magnitude of the root concerned.
const (
	// stagePairTol is how close a pole (or zero) must be to the conjugate
	// of another to be paired with it, and how small the imaginary part of
	// an unpaired root must be for it to count as real.
	stagePairTol = 1e-9
	// stageAxisTol is how small the real part of a zero must be, relative
	// to its magnitude, for it to count as a jω-axis zero.
	stageAxisTol = 1e-9
	// stageOriginTol is how small a zero must be, relative to the smallest
	// pole magnitude, to count as a zero at the origin.
	stageOriginTol = 1e-12
)

// section is a stage under construction (order and origin are small
// counts, kept narrow so that a section is four words).
type section struct {
	order  int32   // 1 or 2
	origin int32   // zeros at the origin (0, 1 or 2)
	w0, q  float64 // rad/s; q = 0 for first order
	wz     float64 // jω zero pair, rad/s (0 for none)
}

// before reports whether a sorts strictly before b in the cascade order:
// ascending q, then w0, wz and origin (cmp.Compare's order, NaN first).
func (a *section) before(b *section) bool {
	// The usual case, distinct Qs, inline; the rest in tied.
	if a.q < b.q {
		return true
	}
	if a.q > b.q {
		return false
	}
	return a.tied(b)
}

// tied is before for Qs equal or not both numbers.
func (a *section) tied(b *section) bool {
	if c := fcmp(a.q, b.q); c != 0 {
		return c < 0
	}
	if c := fcmp(a.w0, b.w0); c != 0 {
		return c < 0
	}
	if c := fcmp(a.wz, b.wz); c != 0 {
		return c < 0
	}
	return a.origin < b.origin
}

// fcmp is cmp.Compare for float64 with the ordered case first: −1, 0 or
// +1, a NaN before any number and equal to a NaN.
func fcmp(x, y float64) int {
	if x < y {
		return -1
	}
	if x > y {
		return 1
	}
	if x == y {
		return 0
	}
	return cmp.Compare(x, y)
}

// stackRoots is the number of poles (and of zeros) whose working arrays
// StagesWith keeps on the stack; a larger transfer allocates them.
const stackRoots = 32

// Stages factors h into first- and second-order stages with the default
// options (dynamic-range gain scaling); see StagesWith.
func (h Transfer) Stages() ([]Stage, error) { return h.StagesWith(StageOptions{}) }

// StagesWith factors h into a cascade of first- and second-order stages
// whose product equals h (to rounding, at every frequency, with the
// overall gain and sign), returned in ascending Q: first-order stages
// first, ties in ascending F0Hz.
//
// Poles: each conjugate pair becomes a second-order stage (F0Hz = |p|/2π,
// Q = |p|/(−2·Re p)). Real poles are sorted by magnitude and paired
// neighbour with neighbour, smallest first, into second-order stages with
// Q ≤ 0.5 (one op-amp section instead of two), so at most one first-order
// stage remains, the one of the largest real pole.
//
// Zeros: jω-axis zero pairs go to second-order stages as NotchStage: the
// pole pairs are taken in descending Q, each with the remaining zero pair
// nearest to it in frequency ratio, |ln(ωz/ω0)| (the highest-Q poles get
// their neighbouring zeros, which tames their peaking). Zeros at the origin go, in ascending F0Hz, one to each
// second-order stage without a notch (making it a BandpassStage), then one
// to the first-order stage (HighpassStage), then a second one to the
// second-order stages (making them HighpassStage). A bandpass design thus
// gets BandpassStage sections, one origin zero each, and a highpass design
// HighpassStage sections. Zeros at infinity are implicit.
//
// Gains follow opt.Gain (see GainPlan). Peaks for GainDynamic are found
// in closed form for the first stage alone, numerically for the longer
// cascades: a log grid over the span of the poles and zeros (24 points a
// decade, 6 a decade from a factor 3 to two decades beyond), points at
// and around every resonance
// (Im p ± k·|Re p| and the second-order peak frequencies
// ω0·√(1 − 1/(2Q²)) and its inverse for highpass), then a refinement by
// Brent's method of every leading local maximum, to about 1e-12 relative.
// The cost grows about as the square of the order (every stage is
// evaluated on a grid that grows with the number of pole pairs).
//
// The error wraps ErrStage for a transfer that no cascade of these stage
// kinds represents: no poles, a zero gain, a pole not in the open left
// half-plane, an unpaired complex pole, a zero off the jω axis and not at
// the origin, more jω zero pairs than second-order stages, more origin
// zeros than the stages can take, or an unknown GainPlan; and ErrRange for
// a stage gain float64 cannot hold.
func (h Transfer) StagesWith(opt StageOptions) ([]Stage, error) {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("filter: stages: "+format+": %w", append(a, ErrStage)...)
	}
	if opt.Gain != GainDynamic && opt.Gain != GainLast {
		return nil, bad("GainPlan %d unknown", int(opt.Gain))
	}
	if err := h.checkRoots(); err != nil {
		return nil, err
	}
	if len(h.Poles) == 0 {
		return nil, bad("no poles")
	}
	if h.Gain == 0 {
		return nil, bad("Gain 0")
	}
	if len(h.Zeros) > len(h.Poles) {
		return nil, bad("%d zeros, more than the %d poles", len(h.Zeros), len(h.Poles))
	}
	// Every pole pair and the one real pole left over make a section.
	var secBuf [stackRoots / 2]section
	secs := secBuf[:]
	if n := (len(h.Poles) + 1) / 2; n <= len(secBuf) {
		secs = secBuf[:n]
	} else {
		secs = make([]section, n)
	}
	minPole, err := poleSections(secs, h.Poles)
	if err != nil {
		return nil, err
	}
	if err := assignZeros(secs, h.Zeros, minPole); err != nil {
		return nil, err
	}
	var ordBuf [stackRoots / 2]int
	ord := ordBuf[:]
	if len(secs) <= len(ordBuf) {
		ord = ordBuf[:len(secs)]
	} else {
		ord = make([]int, len(secs))
	}
	sortSections(ord, secs)
	stages := make([]Stage, len(secs))
	for i, k := range ord {
		// Field by field into the zeroed stage (a composite literal would
		// be built aside and copied).
		s := &secs[k]
		st := &stages[i]
		st.Order, st.F0Hz, st.Q, st.Gain = int(s.order), s.w0/(2*math.Pi), s.q, 1
		switch {
		case s.wz > 0:
			st.Kind, st.ZeroHz = NotchStage, s.wz/(2*math.Pi)
		case s.origin == s.order:
			st.Kind = HighpassStage
		case s.origin == 1:
			st.Kind = BandpassStage
		default:
			st.Kind = LowpassStage
		}
		// What Validate checks of a stage made here (the kind, orders,
		// first-order Q and Gain are right by construction), Validate
		// itself naming the field when it fails.
		ok := st.F0Hz > 0 && st.F0Hz <= math.MaxFloat64 &&
			(st.Order == 1 || st.Q > 0 && st.Q <= math.MaxFloat64) &&
			(st.Kind != NotchStage || st.ZeroHz > 0 && st.ZeroHz <= math.MaxFloat64)
		if !ok {
			if err := st.Validate(); err != nil {
				return nil, fmt.Errorf("filter: stages: a section out of range: %w", err)
			}
		}
	}
	if err := distributeGain(stages, h, opt.Gain); err != nil {
		return nil, err
	}
	return stages, nil
}

// poleSections pairs the poles into the zeroed sections secs, one for each
// pair and for a real pole left over ((len(poles)+1)/2 in all), without
// zeros, and returns the least pole magnitude |p| (the bits of
// cmplx.Abs).
func poleSections(secs []section, poles []complex128) (float64, error) {
	n := 0 // sections made
	// add sets the next section (field by field: a composite literal
	// would be built aside and copied, a store-forwarding stall).
	add := func(order int32, w0, q float64) {
		s := &secs[n]
		s.order, s.w0, s.q = order, w0, q
		n++
	}
	var usedBuf [stackRoots]bool
	var realBuf [stackRoots]float64
	used, reals := usedBuf[:], realBuf[:0] // reals: magnitudes of real poles
	if len(poles) > len(usedBuf) {
		used, reals = make([]bool, len(poles)), make([]float64, 0, len(poles))
	}
	minPole := math.Inf(1)
	// The layout of every design, exact conjugate pairs side by side, in
	// a loop of its own (what the loop below does with them, without its
	// bookkeeping); the loop below takes over at the first other root. No
	// root before start is looked at again (nearestConj looks ahead).
	start := 0
	for ; start+1 < len(poles); start += 2 {
		p := poles[start]
		if !(real(p) < 0) || imag(p) == 0 || poles[start+1] != cmplx.Conj(p) {
			break
		}
		re := real(p)
		w0 := math.Hypot(re, math.Abs(imag(p)))
		minPole = lesser(minPole, w0)
		add(2, w0, w0/(-2*re))
	}
	for i := start; i < len(poles); i++ {
		p := poles[i]
		if used[i] {
			continue
		}
		if !(real(p) < 0) {
			return 0, fmt.Errorf("filter: stages: pole %v not in the open left half-plane: %w", p, ErrStage)
		}
		used[i] = true
		if imag(p) == 0 {
			// |p| = Hypot(re, 0) = −re exactly.
			reals = append(reals, -real(p))
			minPole = lesser(minPole, -real(p))
			continue
		}
		if i+1 < len(poles) && !used[i+1] && poles[i+1] == cmplx.Conj(p) {
			// The exact conjugate next to it (nearestConj's answer at
			// distance 0, within any tolerance): the pair's mean is the
			// upper member, and w0 = Hypot(re, |im|) is |p| = |p̄|.
			used[i+1] = true
			re := real(p)
			w0 := math.Hypot(re, math.Abs(imag(p)))
			minPole = lesser(minPole, w0)
			add(2, w0, w0/(-2*re))
			continue
		}
		mag := cmplx.Abs(p)
		minPole = lesser(minPole, mag)
		best, bj := nearestConj(poles, used, i)
		if bj >= 0 && best <= stagePairTol*mag {
			used[bj] = true
			q := poles[bj]
			minPole = lesser(minPole, cmplx.Abs(q))
			// The pair's mean, upper member: exact for exact conjugates.
			re := mean(real(p), real(q))
			im := mean(math.Abs(imag(p)), math.Abs(imag(q)))
			w0 := math.Hypot(re, im)
			add(2, w0, w0/(-2*re))
			continue
		}
		if math.Abs(imag(p)) > stagePairTol*mag {
			return 0, fmt.Errorf("filter: stages: complex pole %v has no conjugate: %w", p, ErrStage)
		}
		reals = append(reals, -real(p))
	}
	// Insertion sort for the few real poles of a design (the values, all
	// positive and not NaN, come out the same from any sort).
	if len(reals) <= len(realBuf) {
		for i := 1; i < len(reals); i++ {
			x, j := reals[i], i
			for ; j > 0 && x < reals[j-1]; j-- {
				reals[j] = reals[j-1]
			}
			reals[j] = x
		}
	} else {
		slices.Sort(reals)
	}
	for len(reals) >= 2 {
		a, b := reals[0], reals[1]
		reals = reals[2:]
		w0 := math.Sqrt(a) * math.Sqrt(b)
		add(2, w0, w0/(a+b))
	}
	if len(reals) == 1 {
		add(1, reals[0], 0)
	}
	return minPole, nil
}

// nearestConj returns the index j > i of the unused root of rs nearest to
// the conjugate of rs[i], and that distance (+Inf and −1 for none). An
// exact conjugate next to it, the layout of every prototype and
// transform of this package, is the answer at once (distance 0, the
// least, and the first such j).
func nearestConj(rs []complex128, used []bool, i int) (float64, int) {
	c := cmplx.Conj(rs[i])
	if i+1 < len(rs) && !used[i+1] && rs[i+1] == c {
		return 0, i + 1
	}
	best, bj := math.Inf(1), -1
	for j := i + 1; j < len(rs); j++ {
		if used[j] {
			continue
		}
		if d := cmplx.Abs(rs[j] - c); d < best {
			best, bj = d, j
		}
	}
	return best, bj
}

// mean returns the mean of a and b without overflow near the top of the
// float64 range, exactly a when a == b.
func mean(a, b float64) float64 {
	if a == b {
		return a
	}
	return a/2 + b/2
}

// assignZeros classifies the zeros and assigns them to the sections (see
// StagesWith); minPole is the least pole magnitude.
func assignZeros(secs []section, zeros []complex128, minPole float64) error {
	if len(zeros) == 0 {
		return nil
	}
	var usedBuf [stackRoots]bool
	var pairBuf [stackRoots / 2]float64
	used, pairs := usedBuf[:], pairBuf[:0] // pairs: jω zero pair frequencies, rad/s
	if len(zeros) > len(usedBuf) {
		used, pairs = make([]bool, len(zeros)), make([]float64, 0, len(zeros)/2)
	}
	origin := 0
	originTol := stageOriginTol * minPole
	// The layouts of the designs, zeros at the origin and exact conjugate
	// pairs on the jω axis side by side, in a loop of their own (what the
	// loop below does with them, without its bookkeeping); the loop below
	// takes over at the first other zero. No zero before start is looked
	// at again (nearestConj looks ahead).
	start := 0
	for start < len(zeros) {
		z := zeros[start]
		if z == 0 { // |z| = 0, at most originTol
			origin++
			start++
			continue
		}
		// On the axis, |z| = |im| is above originTol and the pair's mean is
		// |im|.
		if w := math.Abs(imag(z)); real(z) == 0 && w > originTol && start+1 < len(zeros) && zeros[start+1] == cmplx.Conj(z) {
			pairs = append(pairs, w)
			start += 2
			continue
		}
		break
	}
	for i := start; i < len(zeros); i++ {
		z := zeros[i]
		if used[i] {
			continue
		}
		used[i] = true
		mag := math.Abs(imag(z)) // Hypot(0, im) = |im| exactly
		if real(z) != 0 {
			mag = cmplx.Abs(z)
		}
		if mag <= originTol {
			origin++
			continue
		}
		if math.Abs(real(z)) > stageAxisTol*mag {
			return fmt.Errorf("filter: stages: zero %v neither on the jω axis nor at the origin: %w", z, ErrStage)
		}
		bj := i + 1 // the exact conjugate next to it, distance 0
		if !(bj < len(zeros) && !used[bj] && zeros[bj] == cmplx.Conj(z)) {
			var best float64
			best, bj = nearestConj(zeros, used, i)
			if best > stagePairTol*mag {
				bj = -1
			}
		}
		if bj < 0 {
			return fmt.Errorf("filter: stages: jω-axis zero %v has no conjugate: %w", z, ErrStage)
		}
		used[bj] = true
		pairs = append(pairs, mean(math.Abs(imag(z)), math.Abs(imag(zeros[bj]))))
	}
	n2 := 0 // second-order sections
	for i := range secs {
		if secs[i].order == 2 {
			n2++
		}
	}
	if len(pairs) > n2 {
		return fmt.Errorf("filter: stages: %d jω zero pairs but only %d second-order sections: %w", len(pairs), n2, ErrStage)
	}
	var idxBuf [stackRoots / 2]int
	idx := idxBuf[:0]
	if len(secs) > len(idxBuf) {
		idx = make([]int, 0, len(secs))
	}
	if len(pairs) > 0 {
		// Second-order sections in descending Q (ties in ascending w0, then
		// in their order) take the nearest zero pair.
		for i := range secs {
			if secs[i].order == 2 {
				idx = append(idx, i)
			}
		}
		sortIndices(idx, secs, true)
		for _, i := range idx {
			if len(pairs) == 0 {
				break
			}
			bk := nearestRatio(pairs, secs[i].w0)
			secs[i].wz = pairs[bk]
			// Delete pairs[bk], keeping the order (a loop: slices.Delete
			// costs more than the few moves).
			for j := bk + 1; j < len(pairs); j++ {
				pairs[j-1] = pairs[j]
			}
			pairs = pairs[:len(pairs)-1]
		}
	}
	if origin == 0 {
		return nil
	}
	// Origin zeros: one to each free second-order section, then to the
	// first-order one, then a second to the second-order sections, each
	// round in ascending pole frequency.
	free2, free1 := idx[:0], -1
	for i := range secs {
		switch s := &secs[i]; {
		case s.order == 2 && s.wz == 0:
			free2 = append(free2, i)
		case s.order == 1:
			free1 = i // poleSections makes at most one
		}
	}
	n1 := 0
	if free1 >= 0 {
		n1 = 1
	}
	if origin > 2*len(free2)+n1 {
		return fmt.Errorf("filter: stages: %d zeros at the origin, more than the sections can take: %w", origin, ErrStage)
	}
	// The order within a round matters only when the zeros run out inside
	// it (not for a bandpass design, one each, or a highpass one, two).
	second := origin - len(free2) - n1 // zeros left for the second round
	if origin < len(free2) || 0 < second && second < len(free2) {
		sortIndices(free2, secs, false)
	}
	for _, i := range free2 {
		if origin == 0 {
			return nil
		}
		secs[i].origin++
		origin--
	}
	if free1 >= 0 && origin > 0 {
		secs[free1].origin++
		origin--
	}
	for _, i := range free2 {
		if origin == 0 {
			return nil
		}
		secs[i].origin++
		origin--
	}
	return nil
}

// ratioMargin is how far apart, relative, two keys of nearestRatio must be
// for their order to decide that of the logarithms: far above the error of
// a finite key against max(r, 1/r) (its own rounding and r's, below 2^−50
// even for a subnormal r, since a finite key bounds r below by 2^−1024)
// and of math.Log (an ulp, at most 2^−43 for |ln r| ≤ 745).
const ratioMargin = 1e-9

// nearestRatio returns the index k of the pair frequency nearest to w0 by
// frequency ratio, the least |ln(pairs[k]/w0)|, the first of equals: the
// metric that does not depend on the frequency scale. ln is monotonic and
// |ln r| = ln max(r, 1/r), so the key max(wz, w0)/min(wz, w0), one
// division, ranks the pairs the same way; where two keys are within
// ratioMargin of each other, or one is not finite (w0 or a pair frequency
// at the ends of the float64 range), the logarithms decide, with their ties
// and NaNs as they fall (a NaN best is replaced; the first is taken when no
// ratio is finite, so that Validate reports the section instead of an
// index panicking).
func nearestRatio(pairs []float64, w0 float64) int {
	key := func(wz float64) float64 { return max(wz, w0) / min(wz, w0) }
	bk, kb := 0, key(pairs[0])
	for k := 1; k < len(pairs); k++ {
		kk := key(pairs[k])
		if kk <= math.MaxFloat64 && kb <= math.MaxFloat64 {
			if kk < kb*(1-ratioMargin) {
				bk, kb = k, kk
				continue
			}
			if kk > kb*(1+ratioMargin) {
				continue
			}
		}
		best, d := math.Abs(math.Log(pairs[bk]/w0)), math.Abs(math.Log(pairs[k]/w0))
		if d < best || math.IsNaN(best) {
			bk, kb = k, kk
		}
	}
	return bk
}

// sortIndices sorts the indices idx of secs stably: byQ, in descending q
// and then ascending w0; else in ascending w0 (fcmp's order). Insertion for
// the few sections of a design, slices.SortStableFunc beyond (both give
// the one stable order).
func sortIndices(idx []int, secs []section, byQ bool) {
	less := func(a, b int) bool {
		if byQ {
			if c := fcmp(secs[b].q, secs[a].q); c != 0 {
				return c < 0
			}
		}
		return fcmp(secs[a].w0, secs[b].w0) < 0
	}
	if len(idx) > stackRoots/2 {
		slices.SortStableFunc(idx, func(a, b int) int {
			switch {
			case less(a, b):
				return -1
			case less(b, a):
				return 1
			}
			return 0
		})
		return
	}
	for i := 1; i < len(idx); i++ {
		x, j := idx[i], i
		for ; j > 0 && less(x, idx[j-1]); j-- {
			idx[j] = idx[j-1]
		}
		idx[j] = x
	}
}

// lesser returns the lesser of a and b, math.Min for the pole magnitudes
// (never NaN nor −0).
func lesser(a, b float64) float64 {
	if b < a {
		return b
	}
	return a
}

// sortSections sets ord (len(secs) long) to the indices of secs in the
// cascade order (section.before), stably: insertion for the few sections
// of a design, slices.SortStableFunc beyond (both give the one stable
// order). Sorting indices leaves the sections in place, so none is
// reloaded whole just after assignZeros wrote one of its fields.
func sortSections(ord []int, secs []section) {
	for i := range ord {
		ord[i] = i
	}
	if len(secs) > stackRoots/2 {
		slices.SortStableFunc(ord, func(a, b int) int {
			switch {
			case secs[a].before(&secs[b]):
				return -1
			case secs[b].before(&secs[a]):
				return 1
			}
			return 0
		})
		return
	}
	for i := 1; i < len(ord); i++ {
		x, j := ord[i], i
		for ; j > 0 && secs[x].before(&secs[ord[j-1]]); j-- {
			ord[j] = ord[j-1]
		}
		ord[j] = x
	}
}

// distributeGain sets the stage gains so that the cascade's product is h.
//
// GainDynamic: stage k's gain is chosen so that the cascade up to and
// including stage k peaks exactly at the final output's peak. The peaks
// are those of the unit stages' cascades (cascadePeaks), whose squared
// magnitudes are evaluated in real arithmetic (stagePower) once per point
// of the search grid, the cascades' values following as running products:
// linear in the order and the grid size.
func distributeGain(stages []Stage, h Transfer, plan GainPlan) error {
	n := len(stages)
	// rest = Gain / Π c_k, with c_k the leading constant of the unit stage
	// (Stage.Transfer's Gain at stage gain 1).
	rest := newScaled(h.Gain)
	for i := range stages {
		rest = rest.div(complex(unitConst(stages[i]), 0))
	}
	if plan == GainDynamic && n > 1 {
		peakU := cascadePeaks(stages, h)
		// The final output's peak: |rest|·(peak of the unit cascade).
		peak, err := rest.mul(complex(peakU[n-1], 0)).real("peak gain")
		if err != nil {
			return err
		}
		peak = math.Abs(peak)
		if !(peak > 0) || math.IsInf(peak, 0) {
			return fmt.Errorf("filter: stages: peak gain %g not finite and positive: %w", peak, ErrRange)
		}
		g := 1.0 // product of the gains set so far
		for k := range n - 1 {
			pk := g * peakU[k]
			if !(pk > 0) || math.IsInf(pk, 0) {
				return fmt.Errorf("filter: stages: stage %d peak %g not finite and positive: %w", k, pk, ErrRange)
			}
			gk := peak / pk
			stages[k].Gain = gk
			g *= gk
			rest = rest.div(complex(gk, 0))
		}
	}
	last, err := rest.real("last stage gain")
	if err != nil {
		return err
	}
	stages[n-1].Gain = last
	return nil
}

// unitConst returns the gain of Stage.Transfer for s at stage gain 1: the
// constant that gives the unit stage gain 1 at its reference frequency
// (the same expressions, so the same bits).
func unitConst(s Stage) float64 {
	w0 := 2 * math.Pi * s.F0Hz
	if s.Order == 1 {
		if s.Kind == LowpassStage {
			return w0
		}
		return 1
	}
	switch s.Kind {
	case LowpassStage:
		return w0 * w0
	case HighpassStage:
		return 1
	case BandpassStage:
		return w0 / s.Q
	default: // NotchStage
		wz := 2 * math.Pi * s.ZeroHz
		return (w0 / wz) * (w0 / wz)
	}
}

// stagePower is a unit stage's squared magnitude |H(jω)|² (gain 1 at its
// reference frequency) as a function of t = (ω/ω0)² for ω ≤ ω0 and of
// u = 1/t = (ω0/ω)² above, scale-free so that no power of ω over- or
// underflows. With v the one of t and u that is at most 1:
//
//	second order:  D = (1−v)² + v/Q²  (|s² + (ω0/Q)s + ω0²|² at s = jω is
//	               (ω0² − ω²)² + (ω0/Q)²ω², common practice, over ω0⁴, or
//	               over ω⁴ above ω0)
//	  lowpass      1/D below ω0, v²/D above
//	  highpass     v²/D below, 1/D above
//	  bandpass     (v/Q²)/D
//	  notch        (1 − γv)²/D below, (γ − v)²/D above, γ = (ω0/ωz)²
//	first order:   D = 1 + v; lowpass 1/D below, v/D above; highpass the
//	               other way round
//
// At ω = 0 and ω = +Inf each form gives its limit, not NaN. Each value
// costs one division, the caller sharing 1/ω among the stages.
type stagePower struct {
	kind  StageKind
	order int
	w0    float64 // rad/s
	iw0   float64 // 1/ω0, s per rad
	beta  float64 // 1/Q²
	gamma float64 // notch: (ω0/ωz)²
}

func newStagePower(s Stage) stagePower {
	w0 := 2 * math.Pi * s.F0Hz
	p := stagePower{kind: s.Kind, order: s.Order, w0: w0, iw0: 1 / w0}
	if s.Order == 2 {
		p.beta = 1 / (s.Q * s.Q)
		if s.Kind == NotchStage {
			r := w0 / (2 * math.Pi * s.ZeroHz)
			p.gamma = r * r
		}
	}
	return p
}

// at returns the stage's |H(jω)|² at ω rad/s (ω ≥ 0), iw = 1/ω. The
// choices between the forms are selections, not branches (the side of ω0
// changes from stage to stage at one frequency, which a branch would
// mispredict).
func (p *stagePower) at(w, iw float64) float64 {
	rl, rh := w*p.iw0, p.w0*iw
	low := rl <= 1
	r := rh
	if low {
		r = rl
	}
	v := r * r
	if p.order == 1 {
		lowForm := low == (p.kind == LowpassStage)
		n := v
		if lowForm {
			n = 1
		}
		return n / (1 + v)
	}
	d := 1 - v
	d = d*d + p.beta*v
	var n float64
	switch p.kind {
	case LowpassStage, HighpassStage:
		n = v * v
		if low == (p.kind == LowpassStage) {
			n = 1
		}
	case BandpassStage:
		n = p.beta * v
	default: // NotchStage
		a, b := 1.0, p.gamma
		if !low {
			a, b = p.gamma, 1
		}
		n = a - b*v
		n *= n
	}
	return n / d
}

// peak returns the largest value of the unit stage's |H(jω)|² over
// ω ≥ 0, in closed form (setting the derivative in v = (ω/ω0)² to zero;
// the algebra is this file's own):
//
//   - first order, bandpass, and lowpass and highpass of Q ≤ 1/√2: 1 (at
//     DC, at infinity, at ω0);
//   - lowpass and highpass of Q > 1/√2: 1/(β(1 − β/4)), β = 1/Q², at
//     v = 1 − β/2 (lowpass) or its reciprocal (highpass): the familiar
//     resonance peak Q/√(1 − 1/(4Q²));
//   - notch: the largest of 1 (DC), γ² (infinity) and the value at the one
//     other stationary point, v* = (2 − β − 2γ)/(2 + γ(β − 2)), where
//     that is positive.
func (p *stagePower) peak() float64 {
	if p.order == 1 || p.kind == BandpassStage {
		return 1
	}
	b := p.beta
	if p.kind != NotchStage {
		if b >= 2 {
			return 1
		}
		return 1 / (b * (1 - b/4))
	}
	g := p.gamma
	best := max(1, g*g)
	if v := (2 - b - 2*g) / (2 + g*(b-2)); v > 0 && !math.IsInf(v, 0) {
		w := p.w0 * math.Sqrt(v)
		best = max(best, p.at(w, 1/w))
	}
	return best
}

// times sets dst[j] = prev[j]·|H(jω)|² at ω = pts[j] (ipts[j] = 1/ω) for
// every j, prev nil standing for ones: at over a whole grid, with the
// stage's kind chosen once rather than per point (the loops are those of
// at, form for form).
func (p *stagePower) times(dst, prev, pts, ipts []float64) {
	ipts = ipts[:len(pts)]
	dst = dst[:len(pts)]
	if prev != nil {
		prev = prev[:len(pts)]
	}
	one := func(j int) float64 {
		if prev == nil {
			return 1
		}
		return prev[j]
	}
	iw0, w0, beta := p.iw0, p.w0, p.beta
	sel := func(w, iw float64) (v float64, low bool) {
		rl, rh := w*iw0, w0*iw
		low = rl <= 1
		r := rh
		if low {
			r = rl
		}
		return r * r, low
	}
	if p.order == 1 {
		lp := p.kind == LowpassStage
		for j, w := range pts {
			v, low := sel(w, ipts[j])
			n := v
			if low == lp {
				n = 1
			}
			dst[j] = one(j) * (n / (1 + v))
		}
		return
	}
	switch p.kind {
	case LowpassStage, HighpassStage:
		lp := p.kind == LowpassStage
		for j, w := range pts {
			v, low := sel(w, ipts[j])
			d := 1 - v
			n := v * v
			if low == lp {
				n = 1
			}
			dst[j] = one(j) * (n / (d*d + beta*v))
		}
	case BandpassStage:
		for j, w := range pts {
			v, _ := sel(w, ipts[j])
			d := 1 - v
			dst[j] = one(j) * (beta * v / (d*d + beta*v))
		}
	default: // NotchStage
		g := p.gamma
		for j, w := range pts {
			v, low := sel(w, ipts[j])
			a, b := 1.0, g
			if !low {
				a, b = g, 1
			}
			d := 1 - v
			n := a - b*v
			dst[j] = one(j) * (n * n / (d*d + beta*v))
		}
	}
}

// maxStackStages is the number of stages whose powers cascadePeaks keeps on
// the stack.
const maxStackStages = 16

// cascadePeaks returns, for k = 0 … len(stages)−1, the peak over ω ≥ 0 of
// |Π_{i≤k} unit stage i (jω)|, h giving the poles and zeros that set the
// search grid (peakSegments). Every segment of the grid is scanned with
// the cascades' squared magnitudes as running products, and every local
// maximum inside a segment within a factor 4 of the best value found is
// refined by goldenMax between its neighbours.
func cascadePeaks(stages []Stage, h Transfer) []float64 {
	n := len(stages)
	var pwBuf [maxStackStages]stagePower
	pw := pwBuf[:0]
	if n > maxStackStages {
		pw = make([]stagePower, 0, n)
	}
	for _, s := range stages {
		pw = append(pw, newStagePower(s))
	}
	var ptsBuf [512]float64
	var segsBuf [64]int
	pts, segs := peakSegments(h, ptsBuf[:0], segsBuf[:0])
	np := len(pts)
	// run[k*np+j]: squared magnitude of the cascade up to stage k at
	// pts[j]; the last np values hold 1/pts[j].
	var runBuf [2048]float64
	run := runBuf[:]
	if need := (n + 1) * np; need <= len(runBuf) {
		run = runBuf[:need]
	} else {
		run = make([]float64, need)
	}
	ipts := run[n*np:]
	for j, w := range pts {
		ipts[j] = 1 / w
	}
	peaks := make([]float64, n)
	var prev []float64
	for k := range pw {
		row := run[k*np : (k+1)*np]
		pw[k].times(row, prev, pts, ipts)
		prev = row
	}
	var foundBuf [16]float64
	found := foundBuf[:0] // where this cascade's refined maxima are
	peaks[0] = math.Sqrt(pw[0].peak())
	for k := 1; k < n; k++ {
		cascade := func(w float64) float64 {
			iw := 1 / w
			v := 1.0
			for i := range k + 1 {
				v *= pw[i].at(w, iw)
			}
			return v
		}
		row := run[k*np : (k+1)*np]
		// Four running maxima (independent chains, the builtin max keeping a
		// NaN, which the forms do not give, to end in ErrRange).
		var m4 [4]float64
		j := 0
		for ; j+4 <= np; j += 4 {
			m4[0], m4[1] = max(m4[0], row[j]), max(m4[1], row[j+1])
			m4[2], m4[3] = max(m4[2], row[j+2]), max(m4[3], row[j+3])
		}
		for ; j < np; j++ {
			m4[0] = max(m4[0], row[j])
		}
		bk := max(m4[0], m4[1], m4[2], m4[3])
		lo := 0
		found = found[:0]
		for _, hi := range segs {
		next:
			for j := lo + 1; j < hi-1; j++ {
				// A local maximum within a factor 4 of the best: one
				// comparison, rarely true, instead of three branches.
				v := row[j]
				if v < max(bk/4, row[j-1], row[j+1]) {
					continue
				}
				// A bracket holding a maximum already refined (found by
				// another segment) is skipped: goldenMax takes the cascade
				// to be unimodal on its bracket, so it would return that
				// maximum again.
				a, b := pts[j-1], pts[j+1]
				for _, x := range found {
					if a < x && x < b {
						continue next
					}
				}
				x, p := goldenMax(cascade, a, b, pts[j], v, row[j-1], row[j+1])
				found = append(found, x)
				if p > bk {
					bk = p
				}
			}
			lo = hi
		}
		peaks[k] = math.Sqrt(bk)
	}
	return peaks
}

// The log grid of peakSegments: peakInner points a decade within a factor
// peakNear of the span of the poles and zeros, peakOuterN points a factor
// peakOuterStep apart (6 a decade) from there to a factor peakFar.
const (
	peakInner = 24
	peakNear  = 3.0
	peakFar   = 100.0
)

var (
	peakOuterN    = int(math.Ceil(6 * math.Log10(peakFar/peakNear)))
	peakOuterStep = math.Pow(peakFar/peakNear, 1/float64(peakOuterN))
)

// peakSegments returns the frequencies (rad/s) at which a cascade with the
// poles and zeros of h is searched for its peak, as consecutive segments
// each in ascending order (segs holds the end index of each), appended to
// pts[:0] and segs[:0]:
//
//   - 0, a log grid from a hundredth of the lowest to a hundred times the
//     highest pole or zero frequency, 24 points a decade within a factor 3
//     of the span and 6 a decade beyond, and a point far above (the limit
//     at infinity);
//   - for every complex pole pair −α ± jβ, β + c·α/4 for c = −12 … 12 (those
//     above 0): quarter half-bandwidth steps over three half-bandwidths
//     each side, so that a partial cascade's peak between two resonances,
//     beside a dip, is bracketed (coarser steps let such a peak, 1e-5 above
//     its neighbours, slip between them);
//   - for the same pair, for Q above 1/√2, its pole frequency ω0 and the
//     resonance peaks ω0·ρ and ω0/ρ either side, ρ = √(1 − 1/(2Q²)), with
//     ω0·ρ² and ω0/ρ² outside them, so that each is inside its segment.
//
// The pairs' segments come first, the log grid's last. The segments are
// scanned apart, so no merge or sort is needed and no two points of one
// segment coincide.
func peakSegments(h Transfer, pts []float64, segs []int) ([]float64, []int) {
	// One pass over the poles: the span, and the segments of the pole
	// pairs (each magnitude computed once). The log grid follows them.
	pts, segs = pts[:0], segs[:0]
	lo, hi := math.Inf(1), 0.0
	for _, p := range h.Poles {
		m := cmplx.Abs(p)
		lo, hi = min(lo, m), max(hi, m)
		re, im := math.Abs(real(p)), imag(p)
		if !(im > 0) {
			continue
		}
		for c := -12; c <= 12; c++ {
			if w := im + float64(c)/4*re; w > 0 {
				pts = append(pts, w)
			}
		}
		segs = append(segs, len(pts))
		if q := m / (2 * re); q > math.Sqrt2/2 {
			r := math.Sqrt(1 - 1/(2*q*q))
			pts = append(pts, m*r*r, m*r, m, m/r, m/r/r)
			segs = append(segs, len(pts))
		}
	}
	for _, z := range h.Zeros {
		if z == 0 {
			continue
		}
		if m := cmplx.Abs(z); m > 0 {
			lo, hi = min(lo, m), max(hi, m)
		}
	}
	// The log grid: 24 points a decade over the span and a factor 3 beyond
	// it, 6 a decade over the rest of the two decades' reach, where every
	// pole and zero is a factor 3 or more away, no resonance or notch lies
	// and the cascade is smooth: a maximum there is still a local maximum
	// of the coarse points, and is refined.
	nIn := int(math.Ceil(peakInner*math.Log10((hi*peakNear)/(lo/peakNear)))) + 1
	nOut, outStep := peakOuterN, peakOuterStep
	if !(nIn > 1) || nIn > 1<<16 {
		nIn, nOut = 2, 0 // a span float64 cannot grid: its ends only
	}
	pts = slices.Grow(pts, nIn+2*nOut+2)
	pts = append(pts, 0)
	w := lo / peakFar
	for range nOut {
		pts = append(pts, w)
		w *= outStep
	}
	step := math.Pow((hi*peakNear)/(lo/peakNear), 1/float64(nIn-1))
	w = lo / peakNear
	for range nIn {
		pts = append(pts, w)
		w *= step
	}
	w = hi * peakNear
	for range nOut {
		w *= outStep
		pts = append(pts, w)
	}
	hi *= peakFar
	pts = append(pts, hi*1e6)
	segs = append(segs, len(pts))
	return pts, segs
}

// goldenMax returns the largest value of g found on [a, b] (g unimodal
// there, x0 inside with g(x0) = g0 no less than at the ends, ga and gb)
// by Brent's method, golden-section steps safeguarding parabolic ones
// (R. P. Brent, Algorithms for Minimization without Derivatives, 1973,
// ch. 5; from memory of its localmin procedure), started from x0 with the
// ends as its two previous points, so that its first step is already the
// parabola through the three grid points; to 1e-10 relative in x: the
// value of a smooth peak is then exact to far below 1e-12 relative. A
// smooth peak takes some eight evaluations where golden sections alone
// take forty.
func goldenMax(g func(float64) float64, a, b, x0, g0, ga, gb float64) (xBest, gBest float64) {
	const (
		cgold = 0.3819660112501051 // 2 − φ
		rel   = 1e-10
	)
	f := func(x float64) float64 { return -g(x) } // minimize −g
	x := x0
	// w: the better end, v: the other (Brent's second-best and previous
	// points); d and e, the last two steps, the bracket's width, so that
	// the first two steps may be parabolic.
	w, v, fw, fv := a, b, -ga, -gb
	if gb > ga {
		w, v, fw, fv = b, a, -gb, -ga
	}
	fx := -g0
	d, e := b-a, b-a
	for range 100 {
		m := (a + b) / 2
		tol := rel*math.Abs(x) + 1e-300
		if math.Abs(x-m) <= 2*tol-(b-a)/2 {
			break
		}
		parabolic := false
		if math.Abs(e) > tol {
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			p := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				p = -p
			} else {
				q = -q
			}
			if math.Abs(p) < math.Abs(q*e/2) && p > q*(a-x) && p < q*(b-x) {
				e, d = d, p/q
				parabolic = true
				if u := x + d; u-a < 2*tol || b-u < 2*tol {
					d = math.Copysign(tol, m-x)
				}
			}
		}
		if !parabolic {
			if x < m {
				e = b - x
			} else {
				e = a - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol {
			u = x + math.Copysign(tol, d)
		}
		fu := f(u)
		if fu <= fx {
			if u < x {
				b = x
			} else {
				a = x
			}
			v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
		} else {
			if u < x {
				a = u
			} else {
				b = u
			}
			if fu <= fw || w == x {
				v, fv, w, fw = w, fw, u, fu
			} else if fu <= fv || v == x || v == w {
				v, fv = u, fu
			}
		}
	}
	// x is the best point evaluated (the bracket's ends, grid points
	// already searched, are no better than x0).
	return x, -fx
}
