package filter

import (
	"cmp"
	"fmt"
	"math"
	"math/cmplx"
	"slices"
)

// This file keeps a frozen copy of StagesWith's factoring (pole pairing,
// zero assignment, ordering) as it was before it was rewritten to run
// without allocating, as the reference the property tests check the
// current code against bit for bit. The gains come from the package's
// distributeGain in both, so only the factoring is compared.

// sectionRef is the reference's stage under construction.
type sectionRef struct {
	order  int
	w0, q  float64
	wz     float64
	origin int
}

// stagesWithRef is the reference copy of Transfer.StagesWith.
func stagesWithRef(h Transfer, opt StageOptions) ([]Stage, error) {
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
	secs, err := poleSectionsRef(h.Poles)
	if err != nil {
		return nil, err
	}
	if err := assignZerosRef(secs, h.Zeros, h.Poles); err != nil {
		return nil, err
	}
	slices.SortStableFunc(secs, func(a, b sectionRef) int {
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

func poleSectionsRef(poles []complex128) ([]sectionRef, error) {
	used := make([]bool, len(poles))
	secs := make([]sectionRef, 0, (len(poles)+1)/2)
	var reals []float64
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
			best, bj := nearestConjRef(poles, used, i)
			if bj >= 0 && best <= stagePairTol*mag {
				used[bj] = true
				q := poles[bj]
				re := meanRef(real(p), real(q))
				im := meanRef(math.Abs(imag(p)), math.Abs(imag(q)))
				w0 := math.Hypot(re, im)
				secs = append(secs, sectionRef{order: 2, w0: w0, q: w0 / (-2 * re)})
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
		secs = append(secs, sectionRef{order: 2, w0: w0, q: w0 / (a + b)})
	}
	if len(reals) == 1 {
		secs = append(secs, sectionRef{order: 1, w0: reals[0]})
	}
	return secs, nil
}

func nearestConjRef(rs []complex128, used []bool, i int) (float64, int) {
	c := cmplx.Conj(rs[i])
	if i+1 < len(rs) && !used[i+1] && rs[i+1] == c {
		return 0, i + 1
	}
	best, bj := math.Inf(1), -1
	for j := i + 1; j < len(rs); j++ {
		if d := cmplx.Abs(rs[j] - c); !used[j] && d < best {
			best, bj = d, j
		}
	}
	return best, bj
}

func meanRef(a, b float64) float64 {
	if a == b {
		return a
	}
	return a/2 + b/2
}

func assignZerosRef(secs []sectionRef, zeros, poles []complex128) error {
	minPole := math.Inf(1)
	for _, p := range poles {
		minPole = math.Min(minPole, cmplx.Abs(p))
	}
	used := make([]bool, len(zeros))
	var pairs []float64
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
		best, bj := nearestConjRef(zeros, used, i)
		if bj < 0 || best > stagePairTol*mag {
			return fmt.Errorf("filter: stages: jω-axis zero %v has no conjugate: %w", z, ErrStage)
		}
		used[bj] = true
		pairs = append(pairs, meanRef(math.Abs(imag(z)), math.Abs(imag(zeros[bj]))))
	}
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
		w0 := secs[i].w0
		best, bk := math.Inf(1), -1
		for k, wz := range pairs {
			if d := math.Abs(math.Log(wz / w0)); bk < 0 || d < best || math.IsNaN(best) {
				best, bk = d, k
			}
		}
		secs[i].wz = pairs[bk]
		pairs = slices.Delete(pairs, bk, bk+1)
	}
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
