package filter

import (
	"fmt"
	"math"
)

// Validate reports whether s is a mask that a filter can meet. The rules
// are, by band (frequencies in hertz, all positive and finite):
//
//	Lowpass:  PassHz[0] < StopHz[0]
//	Highpass: StopHz[0] < PassHz[0]
//	Bandpass: StopHz[0] < PassHz[0] < PassHz[1] < StopHz[1]
//	Bandstop: PassHz[0] < StopHz[0] < StopHz[1] < PassHz[1]
//
// and for every band 0 < RippleDB < AttenDB, both finite. Lowpass and
// Highpass ignore element 1 of PassHz and StopHz. The error wraps ErrSpec
// and names the first offending field.
func (s Spec) Validate() error {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("filter: spec "+format+": %w", append(a, ErrSpec)...)
	}
	n := 2
	switch s.Band {
	case Lowpass, Highpass:
		n = 1
	case Bandpass, Bandstop:
	default:
		return bad("Band %d unknown", int(s.Band))
	}
	for i := range n {
		if v := s.PassHz[i]; !(v > 0) || math.IsInf(v, 1) {
			return bad("PassHz[%d] %g Hz not positive and finite", i, v)
		}
		if v := s.StopHz[i]; !(v > 0) || math.IsInf(v, 1) {
			return bad("StopHz[%d] %g Hz not positive and finite", i, v)
		}
	}
	if r := s.RippleDB; !(r > 0) || math.IsInf(r, 1) {
		return bad("RippleDB %g not positive and finite", r)
	}
	if a := s.AttenDB; !(a > 0) || math.IsInf(a, 1) {
		return bad("AttenDB %g not positive and finite", a)
	}
	if !(s.RippleDB < s.AttenDB) {
		return bad("RippleDB %g not below AttenDB %g", s.RippleDB, s.AttenDB)
	}
	p, t := s.PassHz, s.StopHz
	switch s.Band {
	case Lowpass:
		if !(p[0] < t[0]) {
			return bad("StopHz[0] %g Hz not above PassHz[0] %g Hz (lowpass)", t[0], p[0])
		}
	case Highpass:
		if !(t[0] < p[0]) {
			return bad("StopHz[0] %g Hz not below PassHz[0] %g Hz (highpass)", t[0], p[0])
		}
	case Bandpass:
		switch {
		case !(t[0] < p[0]):
			return bad("StopHz[0] %g Hz not below PassHz[0] %g Hz (bandpass)", t[0], p[0])
		case !(p[0] < p[1]):
			return bad("PassHz[1] %g Hz not above PassHz[0] %g Hz (bandpass)", p[1], p[0])
		case !(p[1] < t[1]):
			return bad("StopHz[1] %g Hz not above PassHz[1] %g Hz (bandpass)", t[1], p[1])
		}
	case Bandstop:
		switch {
		case !(p[0] < t[0]):
			return bad("StopHz[0] %g Hz not above PassHz[0] %g Hz (bandstop)", t[0], p[0])
		case !(t[0] < t[1]):
			return bad("StopHz[1] %g Hz not above StopHz[0] %g Hz (bandstop)", t[1], t[0])
		case !(t[1] < p[1]):
			return bad("PassHz[1] %g Hz not above StopHz[1] %g Hz (bandstop)", p[1], t[1])
		}
	}
	return nil
}

// bandPlan is how a mask is met by a lowpass prototype: the normalized
// lowpass requirement (passband edge 1 rad/s, stopband edge sel rad/s) and
// the transform that carries it to the mask's band. For Lowpass and
// Highpass edgeHz is the frequency where the prototype's 1 rad/s lands;
// for Bandpass and Bandstop centerHz and widthHz are the transform's
// geometric centre and edge-to-edge width.
type bandPlan struct {
	band              Band
	sel               float64 // stopband edge of the normalized lowpass, > 1
	edgeHz            float64
	centerHz, widthHz float64
}

// plan returns the transform that needs the least order for s (validated).
//
// Lowpass and highpass: the selectivity is StopHz/PassHz or its inverse.
//
// Bandpass and bandstop: the transform's own passband edges a < b (product
// P = a·b, width B = b − a) must cover the mask's passband (bandpass:
// a ≤ PassHz[0], b ≥ PassHz[1]; bandstop: a ≥ PassHz[0], b ≤ PassHz[1]),
// and the normalized stopband edge is the smaller of the two mapped stop
// edges, Ω(f) = |f² − P|/(B·f) for bandpass and B·f/|f² − P| for bandstop
// (the reactance transforms, see transform.go).
//
// For bandpass the mask's own passband edges are optimal (shown in the
// code), so the plan keeps them. For bandstop, moving a passband edge
// inward can make the stop edges geometrically symmetric about the centre
// and so raise the selectivity: for a given P the best B is the greatest
// the passband allows (b = min(PassHz[1], P/PassHz[0])), so the choice is
// one-dimensional in P ∈ (PassHz[0]², PassHz[1]²); plan maximizes the
// selectivity over P by a dense log scan and a golden-section refinement.
// Keeping the mask's passband edges (P = PassHz[0]·PassHz[1]) is one of the
// candidates, so the result is never worse than that classical choice.
func (s Spec) plan() bandPlan {
	pl := bandPlan{band: s.Band}
	switch s.Band {
	case Lowpass:
		pl.sel = s.StopHz[0] / s.PassHz[0]
		pl.edgeHz = s.PassHz[0]
		return pl
	case Highpass:
		pl.sel = s.PassHz[0] / s.StopHz[0]
		pl.edgeHz = s.PassHz[0]
		return pl
	}
	p0, p1 := s.PassHz[0], s.PassHz[1]
	t0, t1 := s.StopHz[0], s.StopHz[1]
	if s.Band == Bandpass {
		// Keeping the mask's passband edges is optimal: with a ≤ p0 and
		// b ≥ p1, both Ω(t0) = (ab − t0²)/((b−a)·t0) and
		// Ω(t1) = (t1² − ab)/((b−a)·t1) increase with a and decrease with
		// b (their partial derivatives have the signs of b² − t0², t0² − a²,
		// t1² − b², a² − t1²), so a = p0 and b = p1.
		w := p1 - p0
		pl.sel = math.Min((p0*p1/t0-t0)/w, (t1-p0*p1/t1)/w)
		pl.centerHz = math.Sqrt(p0) * math.Sqrt(p1)
		pl.widthHz = w
		return pl
	}
	// Bandstop: edges(P) gives the transform's passband edges for centre²
	// P, the widest the mask allows (a ≥ p0, b ≤ p1).
	edges := func(P float64) (float64, float64) {
		b := math.Min(p1, P/p0)
		return P / b, b
	}
	sel := func(P float64) float64 {
		a, b := edges(P)
		w := b - a
		return math.Min(w/math.Abs(P/t0-t0), w/math.Abs(t1-P/t1))
	}
	// The transform's edges must lie inside the mask's passband edges. A
	// centre outside the stopband is allowed: Ω is monotonic on each side
	// of the centre, so the stop edges still bound it.
	lo, hi := p0*p0, p1*p1
	// Dense scan in log P over the open interval (lo, hi), then a
	// golden-section search around the best sample. The classical choice
	// P = p0·p1 is always evaluated.
	const nScan = 400
	bestP := p0 * p1
	best := sel(bestP)
	llo, lhi := math.Log(lo), math.Log(hi)
	step := (lhi - llo) / nScan
	bestI := -1
	for i := 1; i < nScan; i++ {
		P := math.Exp(llo + float64(i)*step)
		if v := sel(P); v > best {
			best, bestP, bestI = v, P, i
		}
	}
	if bestI >= 0 {
		a := llo + float64(bestI-1)*step
		b := llo + float64(bestI+1)*step
		const invPhi = 0.6180339887498949
		c := b - invPhi*(b-a)
		d := a + invPhi*(b-a)
		fc, fd := sel(math.Exp(c)), sel(math.Exp(d))
		for range 100 {
			if b-a <= 1e-15*math.Max(1, math.Abs(a)) {
				break
			}
			if fc > fd {
				b, d, fd = d, c, fc
				c = b - invPhi*(b-a)
				fc = sel(math.Exp(c))
			} else {
				a, c, fc = c, d, fd
				d = a + invPhi*(b-a)
				fd = sel(math.Exp(d))
			}
		}
		if m := math.Exp((a + b) / 2); sel(m) > best {
			best, bestP = sel(m), m
		}
	}
	a, b := edges(bestP)
	pl.sel = best
	pl.centerHz = math.Sqrt(a) * math.Sqrt(b)
	pl.widthHz = b - a
	return pl
}
