package filter

import (
	"math"
	"math/cmplx"
	"slices"
)

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

// peakGrid (the grid of the original search, kept as the reference's)
// returns the sorted frequencies (rad/s) at which a cascade with
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
