package filter

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/internal/ellip"
)

// maxSlackAttenDB caps the stopband attenuation an elliptic design raises
// its attenuation to when the order has slack (see Design).
const maxSlackAttenDB = 150

// ellipticSlack returns the stopband attenuation in dB that an elliptic
// filter of order n reaches with ripple εp² = ep2 and stopband edge sel
// (selectivity k = 1/sel, period ratio ratio = K'(k)/K(k), which the
// caller has from the order estimate): the degree equation
// n·K'(k)/K(k) = K'(k1)/K(k1) (DLMF 22.2, the equation of MinOrder's
// Elliptic order estimate) solved for the discrimination k1 = εp/εs, then
// As = 10·log10(1 + εp²/k1²). It also returns k1 and k1c = √(1−k1²); As is
// +Inf where k1 underflows.
func ellipticSlack(n int, ratio, ep2 float64) (as, k1, k1c float64) {
	k1, k1c = ellip.ModulusFromRatio(float64(n) * ratio)
	if !(k1 > 0) {
		return math.Inf(1), k1, k1c
	}
	return 10 / math.Ln10 * math.Log1p(ep2/(k1*k1)), k1, k1c
}

// selModuli returns the selectivity k = 1/sel of the normalized stopband
// edge sel > 1 and its complement kc = √(1−k²) = √((sel−1)(sel+1))/sel
// (without cancellation).
func selModuli(sel float64) (k, kc float64) {
	return 1 / sel, math.Sqrt((sel-1)*(sel+1)) / sel
}

// magAt returns |H(jw)| from real arithmetic: |Gain| times the square
// roots of the ratios |jw − z|²/|jw − p|², interleaved a zero and a pole
// at a time as in Transfer.At so that high orders neither overflow nor
// underflow. +Inf at a pole, 0 at a zero.
func magAt(h Transfer, w float64) float64 {
	v := math.Abs(h.Gain)
	nz, np := len(h.Zeros), len(h.Poles)
	for i := range max(nz, np) {
		switch {
		case i < nz && i < np:
			v *= math.Sqrt(sqDist(h.Zeros[i], w) / sqDist(h.Poles[i], w))
		case i < np:
			v /= math.Sqrt(sqDist(h.Poles[i], w))
		default:
			v *= math.Sqrt(sqDist(h.Zeros[i], w))
		}
	}
	return v
}

// sqDist returns |jw − r|².
func sqDist(r complex128, w float64) float64 {
	a, b := real(r), w-imag(r)
	return a*a + b*b
}

// attenDB returns the attenuation of h at w rad/s, −20·log10|H(jw)|
// (+Inf at a transmission zero).
func attenDB(h Transfer, w float64) float64 {
	return -20 * math.Log10(cmplx.Abs(h.At(complex(0, w))))
}

// passEdge returns the frequency in rad/s at which the monotonic lowpass h
// (|H| falling from its DC value 1) is attenuated by rp dB, by bisection in
// log frequency to full precision. ok is false when no such frequency is
// found between 1e-12 and 1e12 rad/s.
func passEdge(h Transfer, rp float64) (w float64, ok bool) {
	lo, hi := 1.0, 1.0
	for attenDB(h, lo) > rp {
		lo /= 8
		if lo < 1e-12 {
			return 0, false
		}
	}
	for attenDB(h, hi) < rp {
		hi *= 8
		if hi > 1e12 {
			return 0, false
		}
	}
	for range 200 {
		mid := math.Sqrt(lo) * math.Sqrt(hi)
		if mid <= lo || mid >= hi {
			break
		}
		if attenDB(h, mid) < rp {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Sqrt(lo) * math.Sqrt(hi), true
}

// lowpass returns the normalized lowpass of order n for the family, placed
// so that the mask's normalized requirement (passband edge 1 rad/s, stopband
// edge sel rad/s) is met where the order allows, with the slack placed as
// Design documents.
func (r resolved) lowpass(sel float64, n int) (Transfer, error) {
	switch r.kind {
	case kindButterworth:
		h, err := r.fam.Prototype(n)
		if err != nil {
			return Transfer{}, err
		}
		// |H|² = 1/(1 + Ω^2n): attenuation rp at Ω = ε^(1/n), ε² = 10^(rp/10) − 1.
		eps := math.Sqrt(dbPowM1(r.rp))
		return h.scale(math.Pow(eps, -1/float64(n)))
	case kindInverseChebyshev:
		h, err := r.icheb.Prototype(n)
		if err != nil {
			return Transfer{}, err
		}
		return h.scale(sel)
	case kindElliptic:
		fam := r.ell
		if r.freeAtt {
			// The slack raises the attenuation to what order n reaches at
			// the stopband edge sel: the degree equation solved for the
			// discrimination k1 with the selectivity k = 1/sel known. Within
			// the cap the prototype is built from these moduli directly
			// (Prototype would solve the equation back for k).
			k, kc := selModuli(sel)
			ratio := r.selRatio
			if ratio == 0 { // not carried from the estimate (DesignOrder)
				ratio = ellip.PeriodRatio(k, kc)
			}
			ep2 := dbPowM1(r.rp)
			as, k1, k1c := ellipticSlack(n, ratio, ep2)
			if as <= maxSlackAttenDB && as >= fam.AttenDB && k1c > 0 && n <= MaxEllipticOrder {
				fam.AttenDB = as
				return fam.build(n, ep2, k1, k1c, k, kc)
			}
			fam.AttenDB = math.Max(fam.AttenDB, math.Min(as, maxSlackAttenDB))
		}
		return fam.Prototype(n)
	case kindBessel:
		h, err := r.fam.Prototype(n)
		if err != nil {
			return Transfer{}, err
		}
		w, ok := passEdge(h, r.rp)
		if !ok {
			return Transfer{}, fmt.Errorf("filter: %v order %d has no %g dB point: %w", r.fam, n, r.rp, ErrRange)
		}
		return h.scale(1 / w)
	case kindGeneric: // a family from outside: edge at 1 rad/s as given
		return outsidePrototype(r.fam, n)
	default: // Chebyshev: edge at 1 rad/s as given
		return r.cheb.Prototype(n)
	}
}

// design returns the order-n design of the plan.
func (r resolved) design(s Spec, pl bandPlan, n int) (Transfer, error) {
	if r.kind == kindChebyshev && pl.band != Lowpass {
		return r.chebyshevBand(pl, n)
	}
	lp, err := r.lowpass(pl.sel, n)
	if err != nil {
		return Transfer{}, err
	}
	switch pl.band {
	case Lowpass:
		if r.kind != kindGeneric {
			// This package's prototypes are built afresh for each call (an
			// outside family's may be shared): scale them where they lie.
			if err := checkFreq("cornerHz", pl.edgeHz); err != nil {
				return Transfer{}, err
			}
			return lp.scaleOwned(2 * math.Pi * pl.edgeHz)
		}
		return lp.ToLowpass(pl.edgeHz)
	}
	return pl.transform(lp)
}

// transform maps the normalized lowpass lp to the plan's highpass,
// bandpass or bandstop (new slices: lp may live in scratch storage).
func (pl bandPlan) transform(lp Transfer) (Transfer, error) {
	switch pl.band {
	case Highpass:
		return lp.ToHighpass(pl.edgeHz)
	case Bandpass:
		return lp.ToBandpass(pl.centerHz, pl.widthHz)
	default:
		return lp.ToBandstop(pl.centerHz, pl.widthHz)
	}
}

// chebyshevBand is design for the Chebyshev family and the bands whose
// transform maps the prototype into new slices (all but lowpass): the
// prototype's poles live in a scratch array on the stack (up to 16 of
// them) instead of a slice of their own.
func (r resolved) chebyshevBand(pl bandPlan, n int) (Transfer, error) {
	var scratch [16]complex128
	lp, err := r.cheb.prototypeInto(scratch[:0], n)
	if err != nil {
		return Transfer{}, err
	}
	return pl.transform(lp)
}

// maskBounds are a mask's verdict thresholds as magnitudes: the least |H|
// in the passband, 10^(−(rp + MaskToleranceDB)/20), and the greatest in
// the stopband, 10^(−(as − MaskToleranceDB)/20). They depend on the ripple
// and attenuation alone, so a search converts them once for all its tries.
type maskBounds struct{ passMin, stopMax float64 }

// boundsOf returns the maskBounds of ripple rp and attenuation as, in dB,
// 10^(−x/20) as an exponential (a fraction of an ulp from math.Pow's, far
// below MaskToleranceDB).
func boundsOf(rp, as float64) maskBounds {
	return maskBounds{
		passMin: math.Exp(-(rp + MaskToleranceDB) * (math.Ln10 / 20)),
		stopMax: math.Exp(-(as - MaskToleranceDB) * (math.Ln10 / 20)),
	}
}

// meets reports whether the design h of the plan r meets the mask s, whose
// bounds mb are boundsOf(r.rp, r.as). For the families of this package the
// shape of the response between the edges is known, so the mask's own
// edges decide (meetsAtEdges); a family from outside the package is
// checked on a dense grid (meetsOnGrid).
func (r resolved) meets(h Transfer, s Spec, mb maskBounds) bool {
	if r.kind == kindGeneric {
		return meetsOnGrid(h, s, r.rp, r.as)
	}
	return meetsWithin(h, s, mb)
}

// meetsAtEdges reports whether h meets the mask s from its magnitude at the
// mask's edges alone, which decides for the prototypes of this package
// placed by the frequency transforms:
//
//   - The lowpass-to-band transforms map frequency monotonically onto the
//     prototype's (each side of the centre, for bandpass and bandstop), and
//     the prototype's |H(jΩ)| is even in Ω, so each passband and stopband
//     segment of the mask is the image of an interval [0, Ωp] or [Ωs, ∞)
//     with Ωp and Ωs the images of the mask's edges.
//   - On [0, Ωp] the prototype's attenuation is at most its value at Ωp
//     (Butterworth, inverse Chebyshev and Bessel are monotone there) or at
//     most the family's ripple where it ripples (Chebyshev, elliptic: the
//     ripple designed for is r.rp, no looser than the spec's), so the pass
//     edges decide.
//   - On [Ωs, ∞) the attenuation is at least its value at Ωs (Butterworth,
//     Chebyshev and Bessel rise monotonically), or, where the stopband is
//     equiripple (inverse Chebyshev, elliptic), at least the smaller of its
//     value at Ωs (in the transition band) and the lobe level, which is the
//     attenuation designed for, r.as, no looser than the spec's.
//
// The dense grid of meetsOnGrid is kept for outside families and, in the
// tests, as the check of this rule.
func meetsAtEdges(h Transfer, s Spec, rp, as float64) bool {
	return meetsWithin(h, s, boundsOf(rp, as))
}

// meetsWithin is meetsAtEdges with the bounds converted (boundsOf).
func meetsWithin(h Transfer, s Spec, mb maskBounds) bool {
	pass := func(f float64) bool { return magAt(h, 2*math.Pi*f) >= mb.passMin }
	stop := func(f float64) bool { return magAt(h, 2*math.Pi*f) <= mb.stopMax }
	p, t := s.PassHz, s.StopHz
	switch s.Band {
	case Lowpass, Highpass:
		return pass(p[0]) && stop(t[0])
	default:
		return pass(p[0]) && pass(p[1]) && stop(t[0]) && stop(t[1])
	}
}

// meetGrid is the number of points of each band segment of meetsOnGrid
// (edges included).
const meetGrid = 97

// meetsOnGrid reports whether h meets the mask s with ripple rp and attenuation
// as (the spec's values, or the family's stricter ones), to within
// MaskToleranceDB: the band edges exactly, DC and infinity, and a log grid
// over each band segment (three decades beyond the outer edges).
//
// The grid is evaluated as magnitudes against the bounds converted once
// (attenuation a <= passMax  <=>  |H| >= 10^(−passMax/20), and likewise
// for the stopband), |H| from real arithmetic (magAt): no logarithm, no
// complex division per point. The verdicts are those of comparing
// attenuations in dB, up to rounding far below MaskToleranceDB.
func meetsOnGrid(h Transfer, s Spec, rp, as float64) bool {
	passMax := rp + MaskToleranceDB
	stopMin := as - MaskToleranceDB
	passMin := math.Pow(10, -passMax/20) // least |H| in the passband
	stopMax := math.Pow(10, -stopMin/20) // greatest |H| in the stopband
	mag := func(f float64) float64 { return magAt(h, 2*math.Pi*f) }
	inf := math.Inf(1)
	if len(h.Zeros) == len(h.Poles) {
		inf = -20 * math.Log10(math.Abs(h.Gain))
	} else if len(h.Zeros) > len(h.Poles) {
		inf = math.Inf(-1)
	}
	seg := func(lo, hi float64, ok func(float64) bool) bool {
		q := math.Exp(math.Log(hi/lo) / (meetGrid - 1))
		f := lo
		for i := range meetGrid {
			if i == meetGrid-1 {
				f = hi
			}
			if !ok(mag(f)) {
				return false
			}
			f *= q
		}
		return true
	}
	inPass := func(m float64) bool { return m >= passMin }
	inStop := func(m float64) bool { return m <= stopMax }
	infPass, infStop := inf <= passMax, inf >= stopMin
	const span = 1000
	p, t := s.PassHz, s.StopHz
	switch s.Band {
	case Lowpass:
		return inPass(mag(0)) && seg(p[0]/span, p[0], inPass) &&
			seg(t[0], t[0]*span, inStop) && infStop
	case Highpass:
		return inStop(mag(0)) && seg(t[0]/span, t[0], inStop) &&
			seg(p[0], p[0]*span, inPass) && infPass
	case Bandpass:
		return inStop(mag(0)) && seg(t[0]/span, t[0], inStop) &&
			seg(p[0], p[1], inPass) &&
			seg(t[1], t[1]*span, inStop) && infStop
	default:
		return inPass(mag(0)) && seg(p[0]/span, p[0], inPass) &&
			seg(t[0], t[1], inStop) &&
			seg(p[1], p[1]*span, inPass) && infPass
	}
}
