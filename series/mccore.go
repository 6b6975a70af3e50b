package series

import (
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
)

// bq holds the coefficients of one stage's transfer function,
// H(s) = (n0 + n1·s + n2·s²) / (d0 + d1·s + d2·s²), s in rad/s.
type bq struct{ n0, n1, n2, d0, d1, d2 float64 }

// power returns |H(jω)|² at ω² = w2, from real arithmetic:
// H(jω) = ((n0 − n2ω²) + j·n1ω) / ((d0 − d2ω²) + j·d1ω).
func (b bq) power(w2 float64) float64 {
	nr := b.n0 - b.n2*w2
	dr := b.d0 - b.d2*w2
	return (nr*nr + b.n1*b.n1*w2) / (dr*dr + b.d1*b.d1*w2)
}

// evalFunc maps a stage's part values (in the circuit's Parts order) to its
// coefficients. Each worker owns its own evalFunc; it must not allocate.
type evalFunc func(values []float64) (bq, error)

// batchFunc evaluates up to lanes sets of part values at once: out[i] and
// ok[i] are what an evalFunc gives for values[i] (ok: no error), bit for
// bit. Each worker owns its own; it must not allocate.
type batchFunc func(values [][]float64, out []bq, ok []bool)

// lanes is the number of trials a worker evaluates side by side.
const lanes = 4

// noBatch makes workers evaluate trials one by one even where a batch
// evaluator exists (a test switch: the results must not change).
var noBatch bool

// mcStage is one stage of a Monte Carlo run: nominal part values, their
// tolerances (fractions) and a factory of worker-owned evaluators: newPair,
// when not nil, gives an evaluator and a batch evaluator sharing one
// workspace; else newEval's evaluates the trials one by one.
type mcStage struct {
	nominal []float64
	tol     []float64
	newEval func() evalFunc
	newPair func() (evalFunc, batchFunc)
}

// mcPlan is everything a run needs, precomputed: stages, ω² per frequency,
// and power bounds per frequency (loP <= |H|² <= hiP; 0 and +Inf where a
// frequency is not constrained). checked lists the constrained frequencies.
type mcPlan struct {
	stages   []mcStage
	w2       []float64
	loP, hiP []float64
	checked  []int
	dist     Distribution
	trials   int
	seed     uint64
	workers  int
	done     <-chan struct{} // closed when the run is to stop early (nil: never)
	stopped  atomic.Bool     // set when a worker stopped for done with blocks left
	keepDB   bool            // keep every trial's gain (for percentiles)
	moments  bool            // mean and standard deviation of the gain in dB
}

// blockSize is the number of consecutive trials a worker takes at a time.
// Moments are reduced per block and the blocks merged in block order, so
// the result does not depend on the number of workers.
const blockSize = 64

type mcOut struct {
	passed, failed int
	mean, std      []float64 // per frequency, dB (moments)
	db             []float64 // trials × len(w2), dB, row-major; NaN rows for failed trials
}

type blockStats struct {
	n        int
	mean, m2 []float64
}

// run executes the plan on plan.workers goroutines.
func (p *mcPlan) run() mcOut {
	nf := len(p.w2)
	nblocks := (p.trials + blockSize - 1) / blockSize
	var out mcOut
	if p.keepDB {
		out.db = make([]float64, p.trials*nf)
	}
	var blocks []blockStats
	if p.moments {
		blocks = make([]blockStats, nblocks)
		for i := range blocks {
			blocks[i] = blockStats{mean: make([]float64, nf), m2: make([]float64, nf)}
		}
	}
	workers := p.workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, nblocks))
	var next atomic.Int64
	var passed, failed atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ps, fs := p.work(&next, nblocks, out.db, blocks)
			passed.Add(int64(ps))
			failed.Add(int64(fs))
		}()
	}
	wg.Wait()
	out.passed, out.failed = int(passed.Load()), int(failed.Load())
	if p.moments {
		out.mean, out.std = mergeBlocks(blocks, nf)
	}
	return out
}

// work runs blocks until none is left and returns its pass and fail
// counts. Everything it allocates, it allocates before the first trial.
//
// Within a block, trials go in groups of lanes: the group's part values are
// drawn (each trial from its own stream, as one trial alone would), every
// stage is evaluated for the whole group at once (batchFunc), then each
// trial's gains are computed and reduced in trial order, so the results are
// those of evaluating the trials one by one.
func (p *mcPlan) work(next *atomic.Int64, nblocks int, db []float64, blocks []blockStats) (passed, failed int) {
	nf := len(p.w2)
	ns := len(p.stages)
	st := newStream()
	evals := make([]evalFunc, ns)
	batches := make([]batchFunc, ns)
	var vals [lanes][][]float64 // vals[l][s]: trial l's values of stage s
	for l := range vals {
		vals[l] = make([][]float64, ns)
	}
	for s, stg := range p.stages {
		if stg.newPair != nil {
			evals[s], batches[s] = stg.newPair()
			if noBatch {
				batches[s] = nil
			}
		} else {
			evals[s] = stg.newEval()
		}
		for l := range vals {
			vals[l][s] = padded(len(stg.nominal))
		}
	}
	coef := make([][lanes]bq, ns)
	var ok [lanes]bool
	var sub [lanes][]float64 // the values of one stage for the lanes to evaluate
	var subOut [lanes]bq
	var subOK [lanes]bool
	var subIdx [lanes]int
	num := padded(nf)
	den := padded(nf)
	row := padded(nf)
	needDB := p.keepDB || p.moments
	for {
		select {
		case <-p.done:
			p.stopped.Store(true) // the caller discards the counts
			return passed, failed
		default:
		}
		b := int(next.Add(1)) - 1
		if b >= nblocks {
			return passed, failed
		}
		var bs *blockStats
		if p.moments {
			bs = &blocks[b]
		}
		end := min((b+1)*blockSize, p.trials)
		for g := b * blockSize; g < end; g += lanes {
			n := min(lanes, end-g)
			for l := range n {
				ok[l] = p.draw(st, uint64(g+l), vals[l])
			}
			for s := range ns {
				k := 0
				for l := range n {
					if ok[l] {
						sub[k], subIdx[k] = vals[l][s], l
						k++
					}
				}
				if k == 0 {
					break
				}
				if batches[s] != nil {
					batches[s](sub[:k], subOut[:k], subOK[:k])
				} else {
					for j := range k {
						c, err := evals[s](sub[j])
						subOut[j], subOK[j] = c, err == nil
					}
				}
				for j := range k {
					l := subIdx[j]
					coef[s][l] = subOut[j]
					ok[l] = subOK[j]
					sub[j] = nil
				}
			}
			for l := range n {
				i := g + l
				if !ok[l] {
					failed++
					if db != nil {
						for j := range nf {
							db[i*nf+j] = math.NaN()
						}
					}
					continue
				}
				p.gains(coef, l, evals, vals[l], num, den)
				pass := true
				for _, j := range p.checked {
					// lo <= num/den <= hi without dividing (den > 0).
					if !(num[j] >= p.loP[j]*den[j] && num[j] <= p.hiP[j]*den[j]) {
						pass = false
						break
					}
				}
				if pass {
					passed++
				}
				if !needDB {
					continue
				}
				for j := range row {
					row[j] = 10 * math.Log10(num[j]/den[j])
				}
				if db != nil {
					copy(db[i*nf:(i+1)*nf], row)
				}
				if bs != nil {
					// Welford's update (Knuth, TAOCP vol. 2, 4.2.2, from memory).
					bs.n++
					inv := 1 / float64(bs.n)
					for j, x := range row {
						d := x - bs.mean[j]
						bs.mean[j] += d * inv
						bs.m2[j] += d * (x - bs.mean[j])
					}
				}
			}
		}
	}
}

// draw draws trial i's part values into vals (per stage) and reports false
// when one is not positive (it stops drawing there).
func (p *mcPlan) draw(st stream, i uint64, vals [][]float64) bool {
	st.reset(p.seed, i)
	for s, stg := range p.stages {
		v := vals[s]
		for k, x := range stg.nominal {
			var d float64
			if p.dist == Normal {
				d = st.r.NormFloat64() / 3
			} else {
				d = 2*st.r.Float64() - 1
			}
			v[k] = x * (1 + d*stg.tol[k])
			if !(v[k] > 0) {
				return false
			}
		}
	}
	return true
}

// gains leaves |H(jω)|² of the chain of lane l's coefficients coef[s][l]
// in num/den (numerator and denominator products over the stages, both
// positive, divided only where needed); vals are the trial's part values.
//
// Each stage's coefficients are scaled by 1/d0 first (the same factor top
// and bottom, so |H|² is unchanged), which keeps the products near 1 at low
// frequencies; where a product still leaves the normal range (many stages
// far from their f0), that frequency is recomputed stage by stage with a
// division each.
func (p *mcPlan) gains(coef [][lanes]bq, l int, evals []evalFunc, vals [][]float64, num, den []float64) {
	// The products are those of starting from 1 and multiplying in each
	// pair of stages, (((1·P01)·P23)·P45)…, with 1·P = P exactly: the first
	// four (or two) stages are set in one pass.
	ns := len(p.stages)
	s := 0
	switch {
	case ns >= 4:
		setQuad(coef[0][l].scaled(), coef[1][l].scaled(), coef[2][l].scaled(), coef[3][l].scaled(), p.w2, num, den)
		s = 4
	case ns >= 2:
		setPair(coef[0][l].scaled(), coef[1][l].scaled(), p.w2, num, den)
		s = 2
	default:
		for j := range num {
			num[j], den[j] = 1, 1
		}
	}
	for ; s+1 < ns; s += 2 {
		mulPair(coef[s][l].scaled(), coef[s+1][l].scaled(), p.w2, num, den)
	}
	if s < ns {
		mulPair(coef[s][l].scaled(), bq{n0: 1, d0: 1}, p.w2, num, den)
	}
	for j := range num {
		if !(den[j] >= minNormal && den[j] <= math.MaxFloat64 && num[j] <= math.MaxFloat64) {
			p.slowPower(evals, vals, j, num, den)
		}
	}
}

// mulPair multiplies num and den by |numerator|² and |denominator|² of two
// stages a and b at every ω² of w2: two stages per pass over the arrays
// halves their loads and stores.
func mulPair(a, b bq, w2, num, den []float64) {
	an1, ad1 := a.n1*a.n1, a.d1*a.d1
	bn1, bd1 := b.n1*b.n1, b.d1*b.d1
	num = num[:len(w2)]
	den = den[:len(w2)]
	for j, x := range w2 {
		ar := a.n0 - a.n2*x
		br := b.n0 - b.n2*x
		as := a.d0 - a.d2*x
		bs := b.d0 - b.d2*x
		num[j] *= (ar*ar + an1*x) * (br*br + bn1*x)
		den[j] *= (as*as + ad1*x) * (bs*bs + bd1*x)
	}
}

// setPair sets num and den to the products of mulPair(a, b) applied to
// ones.
func setPair(a, b bq, w2, num, den []float64) {
	an1, ad1 := a.n1*a.n1, a.d1*a.d1
	bn1, bd1 := b.n1*b.n1, b.d1*b.d1
	num = num[:len(w2)]
	den = den[:len(w2)]
	for j, x := range w2 {
		ar := a.n0 - a.n2*x
		br := b.n0 - b.n2*x
		as := a.d0 - a.d2*x
		bs := b.d0 - b.d2*x
		num[j] = (ar*ar + an1*x) * (br*br + bn1*x)
		den[j] = (as*as + ad1*x) * (bs*bs + bd1*x)
	}
}

// setQuad sets num and den to the products of setPair(a, b) followed by
// mulPair(c, d), in one pass.
func setQuad(a, b, c, d bq, w2, num, den []float64) {
	an1, ad1 := a.n1*a.n1, a.d1*a.d1
	bn1, bd1 := b.n1*b.n1, b.d1*b.d1
	cn1, cd1 := c.n1*c.n1, c.d1*c.d1
	dn1, dd1 := d.n1*d.n1, d.d1*d.d1
	num = num[:len(w2)]
	den = den[:len(w2)]
	for j, x := range w2 {
		ar := a.n0 - a.n2*x
		br := b.n0 - b.n2*x
		cr := c.n0 - c.n2*x
		dr := d.n0 - d.n2*x
		as := a.d0 - a.d2*x
		bs := b.d0 - b.d2*x
		cs := c.d0 - c.d2*x
		ds := d.d0 - d.d2*x
		num[j] = ((ar*ar + an1*x) * (br*br + bn1*x)) * ((cr*cr + cn1*x) * (dr*dr + dn1*x))
		den[j] = ((as*as + ad1*x) * (bs*bs + bd1*x)) * ((cs*cs + cd1*x) * (ds*ds + dd1*x))
	}
}

// scaled returns b with every coefficient divided by d0 (or by d1 when d0
// is 0), which leaves H unchanged.
func (b bq) scaled() bq {
	k := b.d0
	if k == 0 {
		k = b.d1
	}
	if k == 0 {
		return b
	}
	k = 1 / k
	return bq{b.n0 * k, b.n1 * k, b.n2 * k, b.d0 * k, b.d1 * k, b.d2 * k}
}

// slowPower recomputes |H|² at frequency j as a product of per-stage ratios
// (the values in vals are the trial's), leaving it in num[j] with den[j] = 1.
func (p *mcPlan) slowPower(evals []evalFunc, vals [][]float64, j int, num, den []float64) {
	pw := 1.0
	for s := range p.stages {
		c, err := evals[s](vals[s])
		if err != nil {
			pw = math.NaN()
			break
		}
		pw *= c.power(p.w2[j])
	}
	num[j], den[j] = pw, 1
}

// padded returns a slice of n float64s with a cache line (or two) of
// unused space on each side, so that the small buffers of different
// workers never share a cache line (false sharing made two workers slower
// than one).
func padded(n int) []float64 {
	const pad = 16 // 128 bytes
	return make([]float64, n+2*pad)[pad : pad+n : pad+n]
}

// mergeBlocks merges per-block means and sums of squared deviations in
// block order (Chan, Golub and LeVeque's pairwise update, from memory) and
// returns the mean and the sample standard deviation per frequency.
func mergeBlocks(blocks []blockStats, nf int) (mean, std []float64) {
	mean = make([]float64, nf)
	m2 := make([]float64, nf)
	n := 0
	for _, b := range blocks {
		if b.n == 0 {
			continue
		}
		na, nb := float64(n), float64(b.n)
		tot := na + nb
		for j := range nf {
			d := b.mean[j] - mean[j]
			mean[j] += d * nb / tot
			m2[j] += b.m2[j] + d*d*na*nb/tot
		}
		n += b.n
	}
	std = make([]float64, nf)
	for j := range nf {
		if n > 1 {
			std[j] = math.Sqrt(m2[j] / float64(n-1))
		} else {
			std[j] = math.NaN()
		}
		if n == 0 {
			mean[j] = math.NaN()
		}
	}
	return mean, std
}

// percentiles returns, for each percentile q (0 to 100), the q-th
// percentile of each column of db (trials × nf, NaN rows skipped), by
// linear interpolation between order statistics (Hyndman and Fan's
// definition 7, the default of R and NumPy, from memory).
func percentiles(db []float64, trials, nf int, qs []float64) [][]float64 {
	out := make([][]float64, len(qs))
	for i := range out {
		out[i] = make([]float64, nf)
	}
	col := make([]float64, 0, trials)
	for j := range nf {
		col = col[:0]
		for i := range trials {
			if x := db[i*nf+j]; !math.IsNaN(x) {
				col = append(col, x)
			}
		}
		slices.Sort(col)
		for k, q := range qs {
			out[k][j] = quantileSorted(col, q/100)
		}
	}
	return out
}

func quantileSorted(x []float64, q float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	h := q * float64(len(x)-1)
	lo := int(math.Floor(h))
	if lo >= len(x)-1 {
		return x[len(x)-1]
	}
	return x[lo] + (h-float64(lo))*(x[lo+1]-x[lo])
}
