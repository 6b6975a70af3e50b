package filter

import (
	"math"
	"math/cmplx"
	"slices"
)

// This file keeps the original, independent peak search as the reference
// the tests check Stages' gain distribution against: its own grid
// construction, complex evaluation of the whole cascade at every point, and
// a golden-section refinement in log frequency to 1e-13.

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
