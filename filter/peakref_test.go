package filter

import "math"

// This file keeps the original peak search as the reference the tests
// check Stages' gain distribution against: on the same grid (peakGrid), but
// with complex evaluation of the whole cascade at every point and a
// golden-section refinement in log frequency to 1e-13.

// peakMag returns the largest value of f(w) = |H(jw)| of a cascade for w in
// [0, ∞], h giving the poles and zeros that set the frequency span: a log
// grid with points at and around every resonance, then a golden-section
// refinement of each leading local maximum.
func peakMag(h Transfer, f func(w float64) float64) float64 {
	pts := peakGrid(h)
	vals := make([]float64, len(pts))
	best := 0.0
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
		if pts[i] == 0 {
			continue // the maximum at DC is a grid point
		}
		lo := pts[max(i-1, 0)]
		if lo == 0 {
			lo = pts[i] / 2
		}
		a := math.Log(lo)
		b := math.Log(pts[min(i+1, len(pts)-1)])
		best = math.Max(best, refGoldenMax(func(x float64) float64 { return f(math.Exp(x)) }, a, b))
	}
	return best
}

// refGoldenMax returns the largest value of g found by golden-section search
// on [a, b] (g unimodal there), to about 1e-12 relative in x.
func refGoldenMax(g func(float64) float64, a, b float64) float64 {
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
