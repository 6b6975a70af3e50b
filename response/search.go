package response

import (
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"sort"

	"github.com/rolloff/rolloff/filter"

	"gonum.org/v1/gonum/floats"
)

// Search grids. A band is scanned on a logarithmic grid of gridPerDecade
// points per decade (at least gridMin, at most gridMax points in all), and
// every bracket found on it is refined: crossings by bisection in log f to
// crossRelTol, extrema by golden-section search in log f. 400 points a
// decade put about 5 points inside the −3 dB width of a Q = 30 resonance,
// enough for the refinement to find it; gridMax bounds the work on absurdly
// wide bands (1e-300 to 1e300 Hz gets 33 points a decade).
const (
	gridPerDecade = 400
	gridMin       = 64
	gridMax       = 20000
	crossRelTol   = 1e-12
	goldenIters   = 60 // 0.618⁶⁰ ≈ 3e-13 of the bracket
	goldenSeeds   = 9
	maxRefine     = 2000
)

// MaxSearchHz is the highest frequency a search band may reach: 2π·f must
// stay far inside the float64 range for AtHz.
const MaxSearchHz = 1e300

// checkBand validates a frequency band [lo, hi] (hertz).
func checkBand(loName string, lo float64, hiName string, hi float64) error {
	switch {
	case !(lo > 0) || math.IsInf(lo, 0):
		return fmt.Errorf("response: %s %g Hz is not positive and finite: %w", loName, lo, ErrGrid)
	case math.IsNaN(hi) || math.IsInf(hi, 0):
		return fmt.Errorf("response: %s %g Hz is not finite: %w", hiName, hi, ErrGrid)
	case hi > MaxSearchHz:
		return fmt.Errorf("response: %s %g Hz is above %g Hz: %w", hiName, hi, MaxSearchHz, ErrGrid)
	case !(hi > lo):
		return fmt.Errorf("response: %s %g Hz is not above %s %g Hz: %w", hiName, hi, loName, lo, ErrGrid)
	}
	return nil
}

// checkSystem reports a nil System, or a nil *filter.Transfer in one,
// wrapping ErrSystem: an error-returning measurement cannot evaluate it.
func checkSystem(s System) error {
	if isNilSystem(s) {
		return fmt.Errorf("response: nil System: %w", ErrSystem)
	}
	return nil
}

// isNilSystem reports whether s is a nil interface or holds a nil
// *filter.Transfer (other typed nil pointers are the caller's own type and
// cannot be told apart without reflection).
func isNilSystem(s System) bool {
	if s == nil {
		return true
	}
	h, ok := s.(*filter.Transfer)
	return ok && h == nil
}

// scan is a band sampled on a log grid: x = ln f, g = gain in dB.
type scan struct {
	s       System
	f, x, g []float64 // frequency, its logarithm, gain in dB
}

// gainAtLog is the gain in dB at f = e^x, with NaN reported as an error.
func gainAtLog(s System, x float64) (float64, error) {
	f := math.Exp(x)
	g := gainDB(s.AtHz(f))
	if math.IsNaN(g) {
		return g, fmt.Errorf("response: system gain is NaN at %g Hz: %w", f, ErrSystem)
	}
	return g, nil
}

// newScan samples s on a log grid over [lo, hi] made with floats.LogSpan.
// For a filter.Transfer the grid also gets the frequencies where narrow
// features can sit: |Im r|/2π and |r|/2π of every pole and zero r inside
// the band, so a resonance or notch far narrower than the grid spacing is
// still bracketed.
func newScan(s System, lo, hi float64) (scan, error) {
	n := int(math.Ceil(math.Log10(hi/lo)*gridPerDecade)) + 1
	n = min(max(n, gridMin), gridMax)
	f := floats.LogSpan(make([]float64, n), lo, hi)
	f[0], f[n-1] = lo, hi
	var h *filter.Transfer
	switch v := s.(type) {
	case filter.Transfer:
		h = &v
	case *filter.Transfer:
		h = v
	}
	if h != nil {
		add := func(r complex128) {
			for _, w := range [2]float64{math.Abs(imag(r)), cmplx.Abs(r)} {
				if fr := w / (2 * math.Pi); fr > lo && fr < hi {
					f = append(f, fr)
				}
			}
		}
		for _, r := range h.Poles {
			add(r)
		}
		for _, r := range h.Zeros {
			add(r)
		}
		if len(f) > n {
			sort.Float64s(f)
			f = slices.Compact(f)
		}
	}
	sc := scan{s: s, f: f, x: make([]float64, len(f)), g: make([]float64, len(f))}
	for i, fi := range f {
		sc.x[i] = math.Log(fi)
		g, err := gainAtLog(s, sc.x[i])
		if err != nil {
			return scan{}, err
		}
		sc.g[i] = g
	}
	return sc, nil
}

// bisectLevel refines a crossing of level between xa and xb, where
// g(xa) − level and g(xb) − level have opposite signs (or one is 0), to
// crossRelTol in f.
func bisectLevel(s System, level, xa, ga, xb float64) (float64, error) {
	sa := ga - level
	for range 200 {
		if math.Abs(xb-xa) <= crossRelTol/4 {
			break
		}
		xm := (xa + xb) / 2
		gm, err := gainAtLog(s, xm)
		if err != nil {
			return 0, err
		}
		sm := gm - level
		if sm == 0 {
			return math.Exp(xm), nil
		}
		if (sm > 0) == (sa > 0) {
			xa, sa = xm, sm
		} else {
			xb = xm
		}
	}
	return math.Exp((xa + xb) / 2), nil
}

// golden maximizes sign·g over [xa, xb] and returns the best abscissa and
// its gain (not multiplied by sign). The bracket is first sampled at
// goldenSeeds interior points, so that a peak standing on a sloping
// background (not unimodal over the whole bracket) is still found, and the
// search then runs by golden sections between the best seed's neighbours.
func golden(s System, sign, xa, xb float64) (float64, float64, error) {
	const r = 0.6180339887498949 // (√5 − 1)/2
	bi, bg := 0, math.Inf(-1)
	step := (xb - xa) / (goldenSeeds + 1)
	for i := 1; i <= goldenSeeds; i++ {
		g, err := gainAtLog(s, xa+float64(i)*step)
		if err != nil {
			return 0, 0, err
		}
		if sign*g > bg {
			bi, bg = i, sign*g
		}
	}
	xa, xb = xa+float64(bi-1)*step, xa+float64(bi+1)*step
	c, d := xb-r*(xb-xa), xa+r*(xb-xa)
	gc, err := gainAtLog(s, c)
	if err != nil {
		return 0, 0, err
	}
	gd, err := gainAtLog(s, d)
	if err != nil {
		return 0, 0, err
	}
	for range goldenIters {
		if sign*gc >= sign*gd {
			xb, d, gd = d, c, gc
			c = xb - r*(xb-xa)
			if gc, err = gainAtLog(s, c); err != nil {
				return 0, 0, err
			}
		} else {
			xa, c, gc = c, d, gd
			d = xa + r*(xb-xa)
			if gd, err = gainAtLog(s, d); err != nil {
				return 0, 0, err
			}
		}
	}
	if sign*gc >= sign*gd {
		return c, gc, nil
	}
	return d, gd, nil
}

// isLocalExt reports whether grid point i is a local extremum of sign·g
// that stands out of rounding noise (a step of more than 1e-12 dB
// relative on one side), or an end point sloping the right way.
func (sc scan) isLocalExt(i int, sign float64) bool {
	n := len(sc.g)
	v := sign * sc.g[i]
	noise := 1e-12 * (1 + math.Abs(sc.g[i]))
	lowOK := i == 0 || v >= sign*sc.g[i-1]
	highOK := i == n-1 || v >= sign*sc.g[i+1]
	if !lowOK || !highOK {
		return false
	}
	step := 0.0
	if i > 0 {
		step = math.Max(step, v-sign*sc.g[i-1])
	}
	if i < n-1 {
		step = math.Max(step, v-sign*sc.g[i+1])
	}
	return step > noise
}

// extreme returns the refined global extremum of sign·g over the scan:
// the largest (sign = +1) or smallest (sign = −1) gain and its frequency.
// Every local extremum of the grid standing out of the noise is refined by
// golden-section search over its two neighbouring intervals, so a narrow
// peak between grid points is found; the global grid extremum always is.
func (sc scan) extreme(sign float64) (hz, db float64, err error) {
	n := len(sc.g)
	best := 0
	for i := range n {
		if sign*sc.g[i] > sign*sc.g[best] {
			best = i
		}
	}
	bx, bg, grid := sc.x[best], sc.g[best], true
	refined := 0
	try := func(i int) error {
		a, b := sc.x[max(i-1, 0)], sc.x[min(i+1, n-1)]
		x, g, err := golden(sc.s, sign, a, b)
		if err != nil {
			return err
		}
		if sign*g > sign*bg {
			bx, bg, grid = x, g, false
		}
		refined++
		return nil
	}
	if err := try(best); err != nil {
		return 0, 0, err
	}
	for i := 0; i < n && refined < maxRefine; i++ {
		if i != best && sc.isLocalExt(i, sign) {
			if err := try(i); err != nil {
				return 0, 0, err
			}
		}
	}
	if grid {
		return sc.f[best], bg, nil
	}
	return math.Exp(bx), bg, nil
}

// crossing returns the first crossing of level in the scan, scanning up in
// frequency (or down, when down is true); ok is false when there is none.
// A crossing is a sign change of g − level between grid points, or a grid
// point on the level, or a local extremum refined between grid points that
// reaches the level (so a narrow excursion is not missed).
func (sc scan) crossing(level float64, down bool) (hz float64, ok bool, err error) {
	n := len(sc.g)
	for k := range n {
		i, j := k, k+1 // i: current point, j: next point in scan order
		if down {
			i, j = n-1-k, n-2-k
		}
		si := sc.g[i] - level
		if si == 0 {
			return sc.f[i], true, nil
		}
		if j < 0 || j >= n {
			break
		}
		sj := sc.g[j] - level
		if sj == 0 || (si > 0) != (sj > 0) {
			f, err := bisectLevel(sc.s, level, sc.x[i], sc.g[i], sc.x[j])
			return f, err == nil, err
		}
		// j is an interior local extremum pointing towards the level?
		l := j + (j - i) // the point after j
		if l < 0 || l >= n {
			continue
		}
		sign := 1.0
		if si > 0 {
			sign = -1 // look for a dip down to the level
		}
		if !sc.isLocalExt(j, sign) {
			continue
		}
		a, b := sc.x[i], sc.x[l]
		if a > b {
			a, b = b, a
		}
		xm, gm, err := golden(sc.s, sign, a, b)
		if err != nil {
			return 0, false, err
		}
		if (gm-level > 0) != (si > 0) || gm == level {
			f, err := bisectLevel(sc.s, level, sc.x[i], sc.g[i], xm)
			return f, err == nil, err
		}
	}
	return 0, false, nil
}

// CrossingHz returns the first frequency in [loHz, hiHz], going up, at which
// the gain of s crosses levelDB, to 1e-12 relative. The band is scanned on a
// log grid of 400 points a decade (64 to 20000 points in all); a sign change
// of gain − level between grid points is refined by bisection in log f, and
// a local gain extremum between grid points that reaches the level is
// refined first, so a narrow dip or peak through the level is found; for a
// filter.Transfer the frequencies of its poles and zeros join the grid, so
// that even a resonance far narrower than the spacing is. A gain that
// touches the level only tangentially between grid points may be missed.
//
// Errors wrap ErrGrid for loHz not positive and finite, hiHz not finite, not
// above loHz or above MaxSearchHz, or levelDB NaN or infinite; ErrSystem for a nil s or when the gain
// of s is NaN in the band; ErrNoCrossing when the gain does not reach the level.
func CrossingHz(s System, levelDB, loHz, hiHz float64) (float64, error) {
	if err := checkSystem(s); err != nil {
		return 0, err
	}
	if math.IsNaN(levelDB) || math.IsInf(levelDB, 0) {
		return 0, fmt.Errorf("response: levelDB %g is not finite: %w", levelDB, ErrGrid)
	}
	if err := checkBand("loHz", loHz, "hiHz", hiHz); err != nil {
		return 0, err
	}
	sc, err := newScan(s, loHz, hiHz)
	if err != nil {
		return 0, err
	}
	f, ok, err := sc.crossing(levelDB, false)
	if err != nil {
		return 0, err
	}
	if !ok {
		return 0, fmt.Errorf("response: gain does not cross %g dB between %g and %g Hz: %w",
			levelDB, loHz, hiHz, ErrNoCrossing)
	}
	return f, nil
}
