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
//
// GainDynamic: stage k's gain is chosen so that the cascade up to and
// including stage k peaks exactly at the final output's peak. The peaks are
// found on one frequency grid (peakGrid) on which every unit stage's
// squared magnitude is evaluated once, the cascades' values following as
// running products, then refined around each leading local maximum by
// golden-section search: linear in the order and the grid size.
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
		peakU := cascadePeaks(unit, peakGrid(h))
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

// peakGrid returns the sorted frequencies (rad/s) at which a cascade with
// the poles and zeros of h is searched for its peak: 0, a log grid of 24
// points a decade from a hundredth of the lowest to a hundred times the
// highest pole or zero frequency, points at and around every resonance
// (its pole frequency, the imaginary part plus multiples of a quarter of the
// real part up to three times it each side, the resonance peak of a pole pair of Q above 1/√2), and a point far above
// (the limit at infinity). Near-duplicates are dropped (a pole point equal
// to a grid point up to rounding would make a bracket too narrow to hold
// the maximum beside it).
func peakGrid(h Transfer) []float64 {
	lo, hi := math.Inf(1), 0.0
	pts := []float64{0}
	for _, p := range h.Poles {
		m := cmplx.Abs(p)
		lo, hi = math.Min(lo, m), math.Max(hi, m)
		re, im := math.Abs(real(p)), math.Abs(imag(p))
		pts = append(pts, m)
		if im > 0 {
			// Quarter half-bandwidth steps over three half-bandwidths each
			// side: a partial cascade's peak between two resonances, beside
			// a dip, is then bracketed by grid points (coarser steps let
			// such a peak, 1e-5 above its neighbours, slip between them).
			for c := -12; c <= 12; c++ {
				if w := im + float64(c)/4*re; w > 0 {
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
	step := math.Pow(hi/lo, 1/float64(nGrid-1))
	w := lo
	for range nGrid {
		pts = append(pts, w)
		w *= step
	}
	pts = append(pts, hi*1e6)
	slices.Sort(pts)
	return slices.CompactFunc(pts, func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(a, b) })
}

// mag2At returns |H(jw)|² of a stage's transfer function (at most two
// poles and two zeros, so no scaling is needed).
func mag2At(h Transfer, w float64) float64 {
	v := h.Gain * h.Gain
	for _, z := range h.Zeros {
		v *= sqDist(z, w)
	}
	for _, p := range h.Poles {
		v /= sqDist(p, w)
	}
	return v
}

// cascadePeaks returns, for k = 0 … len(unit)−1, the peak over w ≥ 0 of
// |Π_{i≤k} unit[i](jw)|, searched on the grid pts and refined around every
// local maximum within a factor 2 of the best grid value.
func cascadePeaks(unit []Transfer, pts []float64) []float64 {
	n, np := len(unit), len(pts)
	run := make([]float64, np) // squared magnitude of the cascade so far
	for j := range run {
		run[j] = 1
	}
	peaks := make([]float64, n)
	for k := range n {
		best := 0.0
		for j, w := range pts {
			run[j] *= mag2At(unit[k], w)
			best = math.Max(best, run[j])
		}
		cascade := func(w float64) float64 {
			v := 1.0
			for i := range k + 1 {
				v *= mag2At(unit[i], w)
			}
			return v
		}
		for j := range np {
			v := run[j]
			if v < best/4 || (j > 0 && run[j-1] > v) || (j+1 < np && run[j+1] > v) {
				continue
			}
			a, b := pts[max(j-1, 0)], pts[min(j+1, np-1)]
			best = math.Max(best, goldenMax(cascade, a, b))
		}
		peaks[k] = math.Sqrt(best)
	}
	return peaks
}

// goldenMax returns the largest value of g found on [a, b] (g unimodal
// there) by Brent's method, golden-section steps safeguarding parabolic
// ones (R. P. Brent, Algorithms for Minimization without Derivatives,
// 1973, ch. 5; from memory of its localmin procedure), to 1e-10 relative in
// x: the value of a smooth peak is then exact to far below 1e-12 relative.
// A smooth peak takes some ten evaluations where golden sections alone take
// forty.
func goldenMax(g func(float64) float64, a, b float64) float64 {
	const (
		cgold = 0.3819660112501051 // 2 − φ
		rel   = 1e-10
	)
	f := func(x float64) float64 { return -g(x) } // minimize −g
	x := a + cgold*(b-a)
	w, v := x, x
	fx := f(x)
	fw, fv := fx, fx
	best := fx
	var d, e float64
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
		best = math.Min(best, fu)
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
	// The bracket's ends are grid points already searched; the interior
	// best is what the search adds.
	return -best
}
