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

// section is a stage under construction.
type section struct {
	order  int
	w0, q  float64 // rad/s; q = 0 for first order
	wz     float64 // jω zero pair, rad/s (0 for none)
	origin int     // zeros at the origin (0, 1 or 2)
}

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
// numerically: a log grid over the span of the poles and zeros (24 points
// a decade, two decades beyond), points at and around every resonance
// (Im p ± k·|Re p| and the second-order peak frequencies
// ω0·√(1 − 1/(2Q²)) and its inverse for highpass), then a golden-section
// refinement of every leading local maximum, to about 1e-12 relative.
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
	secs, err := poleSections(h.Poles)
	if err != nil {
		return nil, err
	}
	if err := assignZeros(secs, h.Zeros, h.Poles); err != nil {
		return nil, err
	}
	slices.SortStableFunc(secs, func(a, b section) int {
		return cmp.Or(cmp.Compare(a.q, b.q), cmp.Compare(a.w0, b.w0), cmp.Compare(a.wz, b.wz), cmp.Compare(a.origin, b.origin))
	})
	stages := make([]Stage, len(secs))
	for i, s := range secs {
		st := Stage{Order: s.order, F0Hz: s.w0 / (2 * math.Pi), Q: s.q, Gain: 1}
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
		if err := st.Validate(); err != nil {
			return nil, fmt.Errorf("filter: stages: a section out of range: %w", err)
		}
		stages[i] = st
	}
	if err := distributeGain(stages, h, opt.Gain); err != nil {
		return nil, err
	}
	return stages, nil
}

// poleSections pairs the poles into sections (without zeros).
func poleSections(poles []complex128) ([]section, error) {
	used := make([]bool, len(poles))
	var secs []section
	var reals []float64 // magnitudes of real poles
	for i, p := range poles {
		if used[i] {
			continue
		}
		if !(real(p) < 0) {
			return nil, fmt.Errorf("filter: stages: pole %v not in the open left half-plane: %w", p, ErrStage)
		}
		used[i] = true
		mag := cmplx.Abs(p)
		if imag(p) != 0 {
			best, bj := math.Inf(1), -1
			for j := i + 1; j < len(poles); j++ {
				if d := cmplx.Abs(poles[j] - cmplx.Conj(p)); !used[j] && d < best {
					best, bj = d, j
				}
			}
			if bj >= 0 && best <= stagePairTol*mag {
				used[bj] = true
				q := poles[bj]
				// The pair's mean, upper member: exact for exact conjugates.
				re := mean(real(p), real(q))
				im := mean(math.Abs(imag(p)), math.Abs(imag(q)))
				w0 := math.Hypot(re, im)
				secs = append(secs, section{order: 2, w0: w0, q: w0 / (-2 * re)})
				continue
			}
			if math.Abs(imag(p)) > stagePairTol*mag {
				return nil, fmt.Errorf("filter: stages: complex pole %v has no conjugate: %w", p, ErrStage)
			}
		}
		reals = append(reals, -real(p))
	}
	slices.Sort(reals)
	for len(reals) >= 2 {
		a, b := reals[0], reals[1]
		reals = reals[2:]
		w0 := math.Sqrt(a) * math.Sqrt(b)
		secs = append(secs, section{order: 2, w0: w0, q: w0 / (a + b)})
	}
	if len(reals) == 1 {
		secs = append(secs, section{order: 1, w0: reals[0]})
	}
	return secs, nil
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
// StagesWith).
func assignZeros(secs []section, zeros, poles []complex128) error {
	minPole := math.Inf(1)
	for _, p := range poles {
		minPole = math.Min(minPole, cmplx.Abs(p))
	}
	used := make([]bool, len(zeros))
	var pairs []float64 // jω zero pair frequencies, rad/s
	origin := 0
	for i, z := range zeros {
		if used[i] {
			continue
		}
		used[i] = true
		mag := cmplx.Abs(z)
		if mag <= stageOriginTol*minPole {
			origin++
			continue
		}
		if math.Abs(real(z)) > stageAxisTol*mag {
			return fmt.Errorf("filter: stages: zero %v neither on the jω axis nor at the origin: %w", z, ErrStage)
		}
		best, bj := math.Inf(1), -1
		for j := i + 1; j < len(zeros); j++ {
			if d := cmplx.Abs(zeros[j] - cmplx.Conj(z)); !used[j] && d < best {
				best, bj = d, j
			}
		}
		if bj < 0 || best > stagePairTol*mag {
			return fmt.Errorf("filter: stages: jω-axis zero %v has no conjugate: %w", z, ErrStage)
		}
		used[bj] = true
		pairs = append(pairs, mean(math.Abs(imag(z)), math.Abs(imag(zeros[bj]))))
	}
	// Second-order sections in descending Q take the nearest zero pair.
	var second []int
	for i, s := range secs {
		if s.order == 2 {
			second = append(second, i)
		}
	}
	if len(pairs) > len(second) {
		return fmt.Errorf("filter: stages: %d jω zero pairs but only %d second-order sections: %w", len(pairs), len(second), ErrStage)
	}
	slices.SortStableFunc(second, func(a, b int) int {
		return cmp.Or(cmp.Compare(secs[b].q, secs[a].q), cmp.Compare(secs[a].w0, secs[b].w0))
	})
	for _, i := range second {
		if len(pairs) == 0 {
			break
		}
		// Nearest by frequency ratio: the metric that does not depend on
		// the frequency scale.
		w0 := secs[i].w0
		best, bk := math.Inf(1), -1
		for k, wz := range pairs {
			// bk < 0: take the first when no ratio is finite (w0 or wz
			// at the ends of the float64 range), so that Validate
			// reports the section instead of an index panicking.
			if d := math.Abs(math.Log(wz / w0)); bk < 0 || d < best || math.IsNaN(best) {
				best, bk = d, k
			}
		}
		secs[i].wz = pairs[bk]
		pairs = slices.Delete(pairs, bk, bk+1)
	}
	// Origin zeros: one to each free second-order section, then to the
	// first-order one, then a second to the second-order sections, each
	// round in ascending pole frequency.
	var free2, free1 []int
	for i, s := range secs {
		switch {
		case s.order == 2 && s.wz == 0:
			free2 = append(free2, i)
		case s.order == 1:
			free1 = append(free1, i)
		}
	}
	byW0 := func(a, b int) int { return cmp.Compare(secs[a].w0, secs[b].w0) }
	slices.SortStableFunc(free2, byW0)
	if origin > 2*len(free2)+len(free1) {
		return fmt.Errorf("filter: stages: %d zeros at the origin, more than the sections can take: %w", origin, ErrStage)
	}
	for _, round := range [][]int{free2, free1, free2} {
		for _, i := range round {
			if origin == 0 {
				return nil
			}
			secs[i].origin++
			origin--
		}
	}
	return nil
}

// distributeGain sets the stage gains so that the cascade's product is h.
func distributeGain(stages []Stage, h Transfer, plan GainPlan) error {
	n := len(stages)
	unit := make([]Transfer, n)
	// rest = Gain / Π c_k, with c_k the leading constant of the unit stage.
	rest := newScaled(h.Gain)
	for i := range stages {
		unit[i] = stages[i].Transfer()
		rest = rest.div(complex(unit[i].Gain, 0))
	}
	if plan == GainDynamic && n > 1 {
		peak := peakMag(h, func(w float64) float64 { return magAt(h, w) })
		if !(peak > 0) || math.IsInf(peak, 0) {
			return fmt.Errorf("filter: stages: peak gain %g not finite and positive: %w", peak, ErrRange)
		}
		gains := make([]float64, n)
		for k := range n - 1 {
			gains[k] = 1
			pk := peakMag(h, func(w float64) float64 { return cascadeAt(unit, k+1, gains, w) })
			if !(pk > 0) || math.IsInf(pk, 0) {
				return fmt.Errorf("filter: stages: stage %d peak %g not finite and positive: %w", k, pk, ErrRange)
			}
			gains[k] = peak / pk
			stages[k].Gain = gains[k]
			rest = rest.div(complex(gains[k], 0))
		}
	}
	g, err := rest.real("last stage gain")
	if err != nil {
		return err
	}
	stages[n-1].Gain = g
	return nil
}

// cascadeAt returns |Π gains[i]·unit[i](jw)| over the first k stages.
func cascadeAt(unit []Transfer, k int, gains []float64, w float64) float64 {
	v := 1.0
	for i := range k {
		v *= magAt(unit[i], w) * math.Abs(gains[i])
	}
	return v
}

// peakMag returns the largest value of f(w) = |H(jw)| of a cascade for w in
// [0, ∞], h giving the poles and zeros that set the frequency span: a log
// grid with points at and around every resonance, then a golden-section
// refinement of each leading local maximum.
func peakMag(h Transfer, f func(w float64) float64) float64 {
	lo, hi := math.Inf(1), 0.0
	var pts []float64
	for _, p := range h.Poles {
		m := cmplx.Abs(p)
		lo, hi = math.Min(lo, m), math.Max(hi, m)
		re, im := math.Abs(real(p)), math.Abs(imag(p))
		pts = append(pts, m)
		if im > 0 {
			for _, c := range [...]float64{-2, -1, -0.5, -0.25, 0, 0.25, 0.5, 1, 2} {
				if w := im + c*re; w > 0 {
					pts = append(pts, w)
				}
			}
			if q := m / (2 * re); q > math.Sqrt2/2 {
				r := math.Sqrt(1 - 1/(2*q*q))
				pts = append(pts, m*r, m/r)
			}
		}
	}
	for _, z := range h.Zeros {
		if m := cmplx.Abs(z); m > 0 {
			lo, hi = math.Min(lo, m), math.Max(hi, m)
		}
	}
	lo, hi = lo/100, hi*100
	nGrid := int(math.Ceil(24*math.Log10(hi/lo))) + 1
	for i := range nGrid {
		pts = append(pts, lo*math.Pow(hi/lo, float64(i)/float64(nGrid-1)))
	}
	slices.Sort(pts)
	// Drop near-duplicates (a pole point equal to a grid point up to
	// rounding), which would otherwise make a bracket too narrow to hold
	// the maximum beside them.
	pts = slices.CompactFunc(pts, func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(a, b) })
	vals := make([]float64, len(pts))
	best := f(0)
	// The limit at infinity: the product of the stages' gains at infinity.
	best = math.Max(best, f(hi*1e6))
	for i, w := range pts {
		vals[i] = f(w)
		best = math.Max(best, vals[i])
	}
	// Refine every local maximum within a factor 2 of the best sample.
	for i := range pts {
		if vals[i] < best/2 {
			continue
		}
		if (i > 0 && vals[i-1] > vals[i]) || (i+1 < len(pts) && vals[i+1] > vals[i]) {
			continue
		}
		a := math.Log(pts[max(i-1, 0)])
		b := math.Log(pts[min(i+1, len(pts)-1)])
		best = math.Max(best, goldenMax(func(x float64) float64 { return f(math.Exp(x)) }, a, b))
	}
	return best
}

// goldenMax returns the largest value of g found by golden-section search
// on [a, b] (g unimodal there), to about 1e-12 relative in x.
func goldenMax(g func(float64) float64, a, b float64) float64 {
	const invPhi = 0.6180339887498949
	c := b - invPhi*(b-a)
	d := a + invPhi*(b-a)
	gc, gd := g(c), g(d)
	best := math.Max(gc, gd)
	for range 80 {
		if b-a <= 1e-13*math.Max(1, math.Abs(a)) {
			break
		}
		if gc > gd {
			b, d, gd = d, c, gc
			c = b - invPhi*(b-a)
			gc = g(c)
		} else {
			a, c, gc = c, d, gd
			d = a + invPhi*(b-a)
			gd = g(d)
		}
		best = math.Max(best, math.Max(gc, gd))
	}
	return best
}
