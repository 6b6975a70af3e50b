package mcfloor

import "sync"

// Biquad holds one stage's coefficients,
// H(s) = (N0 + N1·s + N2·s²)/(D0 + D1·s + D2·s²), s in rad/s.
type Biquad struct{ N0, N1, N2, D0, D1, D2 float64 }

// Power is the floor as the performance target states it: for every trial
// and frequency the product over stages of
// |H(jω)|² = ((N0 − N2ω²)² + (N1ω)²) / ((D0 − D2ω²)² + (D1ω)²), one
// division per stage and frequency, from coefficients computed beforehand
// (coef holds trials × stages), on workers goroutines, each reusing one row
// of powers as the analysis does. It returns the number of trials whose
// power lies in [lo[j], hi[j]] at every frequency j. w2 holds ω².
func Power(coef []Biquad, stages int, w2, lo, hi []float64, workers int) int {
	return split(len(coef)/stages, workers, func(a, b int) int {
		row := make([]float64, len(w2))
		n := 0
		for i := a; i < b; i++ {
			cs := coef[i*stages : (i+1)*stages]
			for j, x := range w2 {
				p := 1.0
				for _, c := range cs {
					nr := c.N0 - c.N2*x
					dr := c.D0 - c.D2*x
					p *= (nr*nr + c.N1*c.N1*x) / (dr*dr + c.D1*c.D1*x)
				}
				row[j] = p
			}
			pass := true
			for j, x := range row {
				if !(x >= lo[j] && x <= hi[j]) {
					pass = false
					break
				}
			}
			if pass {
				n++
			}
		}
		return n
	})
}

// Products is the division-free form of Power, the tightest plain loop for
// the same job and how the series Monte Carlo evaluates: per trial and
// frequency the products of the stages' numerator and denominator powers,
// and the check lo·den <= num <= hi·den.
func Products(coef []Biquad, stages int, w2, lo, hi []float64, workers int) int {
	return split(len(coef)/stages, workers, func(a, b int) int {
		num, den := make([]float64, len(w2)), make([]float64, len(w2))
		n := 0
		for i := a; i < b; i++ {
			for j := range num {
				num[j], den[j] = 1, 1
			}
			for _, c := range coef[i*stages : (i+1)*stages] {
				n1s, d1s := c.N1*c.N1, c.D1*c.D1
				for j, x := range w2 {
					nr := c.N0 - c.N2*x
					dr := c.D0 - c.D2*x
					num[j] *= nr*nr + n1s*x
					den[j] *= dr*dr + d1s*x
				}
			}
			pass := true
			for j, x := range num {
				if !(x >= lo[j]*den[j] && x <= hi[j]*den[j]) {
					pass = false
					break
				}
			}
			if pass {
				n++
			}
		}
		return n
	})
}

// split runs count over trials [a, b) on workers goroutines and sums.
func split(trials, workers int, count func(a, b int) int) int {
	counts := make([]int, workers)
	var wg sync.WaitGroup
	for k := range workers {
		a, b := k*trials/workers, (k+1)*trials/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			counts[k] = count(a, b)
		}()
	}
	wg.Wait()
	total := 0
	for _, n := range counts {
		total += n
	}
	return total
}
