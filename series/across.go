package series

import "math"

// comboScore is the objective of one choice of a candidate per stage: the
// worst |deviation| over the grid in dB, then the sum of the per-stage
// objectives as a tie-break.
type comboScore struct{ worst, sum float64 }

func (a comboScore) less(b comboScore) bool {
	if a.worst != b.worst {
		return a.worst < b.worst
	}
	return a.sum < b.sum
}

// scoreOf returns the score of choice idx over devs[s][c] (dB per grid
// point) and objs[s][c], using buf (len = grid points) as scratch.
func scoreOf(devs [][][]float64, objs [][]float64, idx []int, buf []float64) comboScore {
	for j := range buf {
		buf[j] = 0
	}
	var sc comboScore
	for s, c := range idx {
		for j, d := range devs[s][c] {
			buf[j] += d
		}
		sc.sum += objs[s][c]
	}
	for _, x := range buf {
		sc.worst = max(sc.worst, math.Abs(x))
	}
	if math.IsNaN(sc.worst) || math.IsNaN(sc.sum) {
		sc = comboScore{math.Inf(1), math.Inf(1)}
	}
	return sc
}

// chooseAcross picks one candidate per stage minimizing the worst
// deviation of the whole chain (the sum of the stages' dB deviations) over
// the grid. It tries every combination when there are at most maxCombos,
// else it descends stage by stage (coordinate descent from the best
// candidate of each stage, at most 64 sweeps); in both cases every choice in
// must (such as the independently rounded parts) is scored too, and the best
// of everything scored is returned, so the result is never worse than any
// choice in must.
func chooseAcross(devs [][][]float64, objs [][]float64, maxCombos int, must [][]int) []int {
	ns := len(devs)
	ng := 0
	if ns > 0 && len(devs[0]) > 0 {
		ng = len(devs[0][0])
	}
	buf := make([]float64, ng)
	best := make([]int, ns)
	bestScore := scoreOf(devs, objs, best, buf)
	consider := func(idx []int) {
		if sc := scoreOf(devs, objs, idx, buf); sc.less(bestScore) {
			bestScore = sc
			copy(best, idx)
		}
	}
	for _, m := range must {
		consider(m)
	}
	total := 1
	for _, d := range devs {
		total *= len(d)
		if total > maxCombos {
			break
		}
	}
	idx := make([]int, ns)
	if total <= maxCombos {
		// Depth-first over all combinations with running sums per depth.
		sums := make([][]float64, ns+1)
		for i := range sums {
			sums[i] = make([]float64, ng)
		}
		objSum := make([]float64, ns+1)
		var rec func(s int)
		rec = func(s int) {
			if s == ns {
				var sc comboScore
				sc.sum = objSum[ns]
				for _, x := range sums[ns] {
					sc.worst = max(sc.worst, math.Abs(x))
				}
				if !math.IsNaN(sc.worst) && !math.IsNaN(sc.sum) && sc.less(bestScore) {
					bestScore = sc
					copy(best, idx)
				}
				return
			}
			for c := range devs[s] {
				idx[s] = c
				for j, d := range devs[s][c] {
					sums[s+1][j] = sums[s][j] + d
				}
				objSum[s+1] = objSum[s] + objs[s][c]
				rec(s + 1)
			}
		}
		rec(0)
		return best
	}
	copy(idx, best)
	for range 64 {
		improved := false
		for s := range ns {
			keep := idx[s]
			for c := range devs[s] {
				idx[s] = c
				if sc := scoreOf(devs, objs, idx, buf); sc.less(bestScore) {
					bestScore = sc
					copy(best, idx)
					keep = c
					improved = true
				}
			}
			idx[s] = keep
		}
		if !improved {
			break
		}
	}
	return best
}
