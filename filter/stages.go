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
// cascades: the cascade's magnitude and its slope in log frequency
// (closed forms per stage) on a log grid over the span of the poles and
// zeros (16 points a decade, 6 a decade from a factor 3 to two decades
// beyond) and on steps of half a half-bandwidth around every resonance of
// Q above 1 (Im p + k·|Re p|/2, k = −6 … 6); every interval where the slope falls
// through zero, either side of every notch zero, and every local maximum
// of the grid's values brackets a maximum, which Newton's method on the
// slope refines to about 1e-13 relative. A maximum is missed only if it
// lies within about a grid step of another turning point of the cascade.
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
		var peakBuf [maxStackStages]float64
		peakU := peakBuf[:]
		if n > len(peakBuf) {
			peakU = make([]float64, n)
		}
		peakU = cascadePeaks(stages, h, peakU)
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

// slope returns the stage's |H(jω)|² at ω rad/s (iw = 1/ω) with its first
// and second derivatives in logarithmic frequency: s = d ln|H|²/d ln ω and
// c = ds/d ln ω. With v the variable of the forms (v = (ω/ω0)² below ω0,
// e = +1, or (ω0/ω)² above, e = −1), N and D the numerator and denominator
// of the form, and σ = v·d(ln N − ln D)/dv:
//
//	s = 2e·σ,  c = 4v·dσ/dv  (dv/d ln ω = 2e·v)
//	−v·D'/D has the derivative −(D' + v·D'')/D + v(D'/D)², D'' = 2 (second
//	order) or 0 (first order)
//	N = 1, v², βv, v: σ_N = 0, 2, 1, 1, constant
//	notch N = (a − bv)²: σ_N = −2bv/(a − bv), dσ_N/dv = −2ab/(a − bv)²
//
// (this file's own algebra; TestStagePowerSlope checks |H|² against the
// stage's complex transfer function and s and c against differences). At
// ω = 0 and +Inf the forms give their limits.
func (p *stagePower) slope(w, iw float64) (g, s, c float64) {
	rl, rh := w*p.iw0, p.w0*iw
	low := rl <= 1
	r, e := rh, -2.0
	if low {
		r, e = rl, 2
	}
	v := r * r
	if p.order == 1 {
		id := 1 / (1 + v)
		sn, n := 1.0, v
		if low == (p.kind == LowpassStage) {
			sn, n = 0, 1
		}
		return n * id, e * (sn - v*id), -4 * v * id * id
	}
	d1 := 1 - v
	id := 1 / (d1*d1 + p.beta*v)
	dv := p.beta - 2*d1 // D'
	q := dv * id
	sig := -v * q
	sigv := v*q*q - (dv+2*v)*id
	var n float64
	switch p.kind {
	case LowpassStage, HighpassStage:
		n = v * v
		if low == (p.kind == LowpassStage) {
			n = 1
		} else {
			sig += 2
		}
	case BandpassStage:
		n = p.beta * v
		sig++
	default: // NotchStage
		a, b := 1.0, p.gamma
		if !low {
			a, b = p.gamma, 1
		}
		m := a - b*v
		n = m * m
		im := 1 / m
		sig -= 2 * b * v * im
		sigv -= 2 * a * b * im * im
	}
	return n * id, e * sig, 4 * v * sigv
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
		g, _, _ := p.slope(w, 1/w)
		best = max(best, g)
	}
	return best
}

// accumulate multiplies g[j] by the stage's |H(jω)|² and adds its log
// slope d ln|H|²/d ln ω to s[j], at ω = pts[j] (ipts[j] = 1/ω), for every
// j: slope over a whole grid, with the stage's kind chosen once rather than
// per point (the same forms as at and slope). At a notch's zero itself
// |H|² is 0 and the slope infinite, of either sign (cascadePeaks brackets
// either side of every notch zero apart).
func (p *stagePower) accumulate(g, s, pts, ipts []float64) {
	ipts = ipts[:len(pts)]
	g = g[:len(pts)]
	s = s[:len(pts)]
	iw0, w0, beta := p.iw0, p.w0, p.beta
	// v, e: the variable of the form and dv/d ln ω over v (±2).
	sel := func(w, iw float64) (v, e float64, low bool) {
		rl, rh := w*iw0, w0*iw
		low = rl <= 1
		r := rh
		e = -2
		if low {
			r, e = rl, 2
		}
		return r * r, e, low
	}
	if p.order == 1 {
		lp := p.kind == LowpassStage
		for j, w := range pts {
			v, e, low := sel(w, ipts[j])
			id := 1 / (1 + v)
			n, sn := v, 1.0
			if low == lp {
				n, sn = 1, 0
			}
			g[j] *= n * id
			s[j] += e * (sn - v*id)
		}
		return
	}
	switch p.kind {
	case LowpassStage, HighpassStage:
		lp := p.kind == LowpassStage
		for j, w := range pts {
			v, e, low := sel(w, ipts[j])
			d := 1 - v
			id := 1 / (d*d + beta*v)
			n, sn := v*v, 2.0
			if low == lp {
				n, sn = 1, 0
			}
			g[j] *= n * id
			s[j] += e * (sn - v*(beta-2*d)*id)
		}
	case BandpassStage:
		for j, w := range pts {
			v, e, _ := sel(w, ipts[j])
			d := 1 - v
			id := 1 / (d*d + beta*v)
			g[j] *= beta * v * id
			s[j] += e * (1 - v*(beta-2*d)*id)
		}
	default: // NotchStage
		gm := p.gamma
		for j, w := range pts {
			v, e, low := sel(w, ipts[j])
			a, b := 1.0, gm
			if !low {
				a, b = gm, 1
			}
			d := 1 - v
			id := 1 / (d*d + beta*v)
			m := a - b*v
			im := 1 / m
			g[j] *= m * m * id
			s[j] += e * (-2*b*v*im - v*(beta-2*d)*id)
		}
	}
}

// maxStackStages is the number of stages whose powers cascadePeaks keeps on
// the stack, and maxStackPoints the grid size it keeps there.
const (
	maxStackStages = 16
	maxStackPoints = 160
)

// cascadePeaks sets peaks[k], k = 0 … len(stages)−1, to the peak over
// ω ≥ 0 of |Π_{i≤k} unit stage i (jω)|, h giving the poles and zeros that
// set the search grid (peakSegments), and returns peaks. The cascades'
// squared magnitudes and log slopes on the grid are running products and
// sums, one stage at a time (accumulate). Between two neighbouring points
// of a segment where the slope falls from positive to negative the cascade
// has a local maximum; each such one within a factor 4 of the best grid
// value is refined by refineMax. Every maximum is thus found that lies
// further than the grid's step from the cascade's other turning points.
func cascadePeaks(stages []Stage, h Transfer, peaks []float64) []float64 {
	n := len(stages)
	peaks = peaks[:n]
	var pwBuf [maxStackStages]stagePower
	pw := pwBuf[:0]
	if n > maxStackStages {
		pw = make([]stagePower, 0, n)
	}
	for _, s := range stages {
		pw = append(pw, newStagePower(s))
	}
	peaks[0] = math.Sqrt(pw[0].peak())
	if n == 1 {
		return peaks
	}
	var ptsBuf, iptsBuf, gBuf, sBuf [maxStackPoints]float64
	var segsBuf [64]int
	pts, segs := peakSegments(h, ptsBuf[:0], segsBuf[:0])
	np := len(pts)
	ipts, g, s := iptsBuf[:], gBuf[:], sBuf[:]
	if np > maxStackPoints {
		ipts, g, s = make([]float64, np), make([]float64, np), make([]float64, np)
	}
	ipts, g, s = ipts[:np], g[:np], s[:np]
	for j, w := range pts {
		ipts[j] = 1 / w
		g[j], s[j] = 1, 0
	}
	pw[0].accumulate(g, s, pts, ipts)
	// Where the notch zeros fall in each segment: a zero is a turning
	// point, where the slope goes from −∞ to +∞, which a grid point on or
	// next to it would hide (its slope has the sign of its side).
	var zsBuf [32]zeroSlot
	zs := zeroSlots(zsBuf[:0], pw, pts, segs)
	var fallBuf, peakAtBuf [32]int
	var foundBuf [16]float64
	inf := math.Inf(1)
	for k := 1; k < n; k++ {
		pw[k].accumulate(g, s, pts, ipts)
		// One pass: the best grid value, the intervals of each segment
		// where the slope falls through zero (j for pts[j], pts[j+1]), and
		// the grid's local maxima.
		falls, peaksAt := fallBuf[:0], peakAtBuf[:0]
		bk := 0.0
		lo := 0
		for _, hi := range segs {
			bk = max(bk, g[hi-1])
			for j := lo; j < hi-1; j++ {
				v := g[j]
				if v > bk {
					bk = v
				}
				if s[j] > 0 && s[j+1] < 0 {
					falls = append(falls, j)
				}
				if j > lo && v >= g[j-1] && v >= g[j+1] {
					peaksAt = append(peaksAt, j)
				}
			}
			lo = hi
		}
		found := foundBuf[:0] // where this cascade's refined maxima are
		// refine refines the maximum in (a, b) from x (gb: the larger of
		// the values at the ends), unless gb is below a quarter of the
		// best value or (a, b) holds a maximum already refined (from
		// another segment; refineMax would return it again).
		refine := func(a, b, x, gb float64) {
			if gb < bk/4 {
				return
			}
			for _, x := range found {
				if a <= x && x <= b {
					return
				}
			}
			x, p := refineMax(pw[:k+1], a, b, x, gb)
			found = append(found, x)
			bk = max(bk, p)
		}
		for _, j := range falls {
			a, b := pts[j], pts[j+1]
			refine(a, b, chordZero(a, b, s[j], s[j+1]), max(g[j], g[j+1]))
		}
		// Either side of each notch zero of the cascade's stages.
		for _, z := range zs {
			if z.stage > k {
				continue
			}
			if l := z.l; s[l] > 0 {
				refine(pts[l], z.w, chordZero(pts[l], z.w, s[l], -inf), g[l])
			}
			if r := z.r; s[r] < 0 {
				refine(z.w, pts[r], chordZero(z.w, pts[r], inf, s[r]), g[r])
			}
		}
		// The grid's own local maxima, between their neighbours (a maximum
		// beside a grid point, with a turning point between it and the
		// next, is bracketed so and not by the slope's signs).
		for _, j := range peaksAt {
			refine(pts[j-1], pts[j+1], pts[j], g[j])
		}
		peaks[k] = math.Sqrt(bk)
	}
	return peaks
}

// chordZero returns where the chord of the slope through (a, sa) and
// (b, sb), sa > 0 > sb, crosses zero, kept a twentieth of the interval or
// more from its ends (an end at a notch's zero has a slope of any size):
// Newton's start in refineMax.
func chordZero(a, b, sa, sb float64) float64 {
	t := sa / (sa - sb)
	if !(t >= 0.05) {
		t = 0.05
	} else if !(t <= 0.95) {
		t = 0.95
	}
	return a + t*(b-a)
}

// zeroSlot places the notch zero of stage (w rad/s) in a segment of the
// peak grid: pts[l] < w < pts[r], the neighbours either side more than
// 1e-9 relative from it (a point on the zero, up to rounding, has a slope
// of either sign).
type zeroSlot struct {
	stage, l, r int
	w           float64
}

// zeroSlots appends to dst the slot of every notch stage's zero in every
// segment of pts (segs as from peakSegments) that spans it.
func zeroSlots(dst []zeroSlot, pw []stagePower, pts []float64, segs []int) []zeroSlot {
	for i := range pw {
		if pw[i].kind != NotchStage || pw[i].order != 2 {
			continue
		}
		w := pw[i].w0 / math.Sqrt(pw[i].gamma)
		wl, wr := w*(1-1e-9), w*(1+1e-9)
		lo := 0
		for _, hi := range segs {
			seg := pts[lo:hi]
			// l: the last point below wl, by bisection.
			l, top := -1, len(seg)
			for top-l > 1 {
				if mid := int(uint(l+top) >> 1); seg[mid] < wl {
					l = mid
				} else {
					top = mid
				}
			}
			r := l + 1
			for r < len(seg) && seg[r] <= wr {
				r++
			}
			if l >= 0 && r < len(seg) {
				dst = append(dst, zeroSlot{i, lo + l, lo + r, w})
			}
			lo = hi
		}
	}
	return dst
}

// The grid of peakSegments: peakInner points a decade within a factor
// peakNear of the span of the poles and zeros, peakOuterN points a factor
// peakOuterStep apart (6 a decade) from there to a factor peakFar; around
// every complex pole pair, steps of a pairStep-th of its half-bandwidth,
// pairSteps of them each side.
const (
	peakInner = 16
	peakNear  = 3.0
	peakFar   = 100.0
	pairStep  = 2
	pairSteps = 6
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
//   - for every complex pole pair −α ± jβ of Q above 1, β + c·α/2 for
//     c = −6 … 6 (those above 0): half half-bandwidth steps over three
//     half-bandwidths each side, where a resonance's slope changes
//     fastest (for Q ≤ 1 the log grid is as fine);
//   - 0, a log grid from a hundredth of the lowest to a hundred times the
//     highest pole or zero frequency, 16 points a decade within a factor 3
//     of the span and 6 a decade beyond, and a point far above (the limit
//     at infinity).
//
// The pairs' segments come first, the log grid's last. The segments are
// scanned apart, so no merge or sort is needed and no two points of one
// segment coincide. cascadePeaks finds every maximum of a cascade that
// lies further than about a step of this grid from its other turning
// points. With the grid at half this density the designs' tests still
// pass and random transfer functions miss about one peak in 17,000, by
// 4e-5 (see DEVELOPERS.md).
func peakSegments(h Transfer, pts []float64, segs []int) ([]float64, []int) {
	// One pass over the poles: the span, and the segments of the pole
	// pairs (each magnitude computed once). The log grid follows them.
	pts, segs = pts[:0], segs[:0]
	lo, hi := math.Inf(1), 0.0
	for _, p := range h.Poles {
		re, im := math.Abs(real(p)), imag(p)
		if im < 0 {
			continue // the conjugate of a pole of the list, the same magnitude
		}
		m := math.Hypot(re, im)
		lo, hi = min(lo, m), max(hi, m)
		if !(im > 0) || m <= 2*re {
			// A real pole, or a pair of Q ≤ 1: its half-bandwidth steps
			// are no finer than the log grid's.
			continue
		}
		for c := -pairSteps; c <= pairSteps; c++ {
			if w := im + float64(c)/pairStep*re; w > 0 {
				pts = append(pts, w)
			}
		}
		segs = append(segs, len(pts))
	}
	for _, z := range h.Zeros {
		if z == 0 {
			continue
		}
		if m := cmplx.Abs(z); m > 0 {
			lo, hi = min(lo, m), max(hi, m)
		}
	}
	// The log grid: 16 points a decade over the span and a factor 3 beyond
	// it, 6 a decade over the rest of the two decades' reach, where every
	// pole and zero is a factor 3 or more away, no resonance or notch lies
	// and the cascade is smooth: a maximum there is still bracketed by the
	// coarse points, and is refined.
	lr := math.Log((hi * peakNear) / (lo / peakNear))
	nIn := int(math.Ceil(peakInner*lr/math.Ln10)) + 1
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
	step := math.Exp(lr / float64(nIn-1))
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

// peakRise is where refineMax stops: when the rise of ln|H|² to the
// nearby stationary point that Newton's quadratic model predicts,
// s²/(2|c|), is below it, so that the value found is within about 1e-13
// relative of the local maximum's.
const peakRise = 1e-13

// refineMax refines a local maximum of the cascade |H|² = Π pw[i] in
// (a, b), which holds one, starting from x inside. It returns where the
// maximum is (the point it converged to) and the largest value of |H|²
// evaluated there and on the way, or gb, a value known elsewhere, if that
// is larger. Newton's method on the log slope s = d ln|H|²/d ln ω
// (stagePower.slope) finds the zero of s where it falls through 0: each
// evaluation narrows (a, b) by the sign of s, so that it still holds a
// maximum, and a step that would leave it, or one from a point of convex
// log-magnitude, bisects it instead. A smooth maximum takes three or four
// evaluations.
func refineMax(pw []stagePower, a, b, x, gb float64) (xMax, gBest float64) {
	gBest = gb
	xMax = x
	for range 100 {
		if !(a < x && x < b) {
			return xMax, gBest // (a, b) as narrow as float64 holds
		}
		xMax = x
		iw := 1 / x
		g, s, c := 1.0, 0.0, 0.0
		for i := range pw {
			gi, si, ci := pw[i].slope(x, iw)
			g *= gi
			s += si
			c += ci
		}
		gBest = max(gBest, g)
		switch {
		case s > 0:
			a = x
		case s < 0:
			b = x
		default:
			return xMax, gBest
		}
		if c < 0 && s*s <= -2*peakRise*c {
			return xMax, gBest
		}
		next := x * (1 - s/c)
		if !(c < 0) || !(a < next && next < b) {
			next = a + (b-a)/2
		}
		x = next
	}
	return xMax, gBest
}
