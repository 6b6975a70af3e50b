package filter

import (
	"errors"
	"fmt"
	"math"

	"github.com/rolloff/rolloff/internal/ellip"
)

// MaskToleranceDB is the margin, in decibels, by which a Design result may
// miss its mask through floating-point rounding: MinOrder and Design count
// a mask as met when the passband attenuation is at most
// RippleDB + MaskToleranceDB and the stopband attenuation at least
// AttenDB − MaskToleranceDB. It matters only where a mask is met exactly
// by a whole-number order (the slack is zero); 1e-6 dB is a relative
// magnitude error of about 1.2e-7, far below any component tolerance, and
// well above the rounding of the prototypes (about 1e-9 relative).
const MaskToleranceDB = 1e-6

// maxSearchOrder bounds the order search of families without a closed-form
// order estimate (Bessel and families defined outside this package) when
// the family does not say its own range.
const maxSearchOrder = 64

// orderCap bounds the closed-form estimate before a design is attempted.
const orderCap = 1 << 16

// stepDownMargin is how far above n−1 the closed-form estimate must lie for
// minDesign to take order n without also trying n−1: the estimate's
// rounding is about 1e-13 of the order (logarithms, acosh and complete
// elliptic integrals to a few ulps), so 1e-6 leaves a wide margin; within
// it, order n−1 is designed and checked as well.
const stepDownMargin = 1e-6

// dbPowM1 returns 10^(db/10) − 1 without cancellation for small db.
func dbPowM1(db float64) float64 { return math.Expm1(db * (math.Ln10 / 10)) }

// familyKind says how a family is designed to a mask.
type familyKind int

const (
	kindGeneric familyKind = iota
	kindButterworth
	kindChebyshev
	kindInverseChebyshev
	kindElliptic
	kindBessel
)

// resolved is a family with its parameters settled against a spec.
type resolved struct {
	kind familyKind
	fam  Family // the family as given (for messages; Prototype of outside families)
	// The package's parametrized families with their parameters settled,
	// held unboxed (a design does not allocate for them).
	cheb     Chebyshev
	icheb    InverseChebyshev
	ell      Elliptic
	rp, as   float64 // passband ripple and stopband attenuation designed for, dB
	freeAtt  bool    // elliptic: the attenuation was taken from the spec (slack may raise it)
	maxOrder int     // highest order the family supports, 0 if unknown
	// selRatio is K'(k)/K(k) of the elliptic selectivity k = 1/sel, set by
	// estimate (0 when not computed) and reused by the design of each order.
	selRatio float64
}

// familyParam settles one family parameter v against the spec's value sv:
// zero takes sv; otherwise v must be positive, finite and no looser than sv
// (looser means greater for a ripple, smaller for an attenuation).
func familyParam(fam, field string, v, sv float64, isRipple bool) (float64, error) {
	if v == 0 {
		return sv, nil
	}
	if !(v > 0) || math.IsInf(v, 1) {
		return 0, fmt.Errorf("filter: %s %s %g not positive and finite (or zero to take the spec's): %w", fam, field, v, ErrParam)
	}
	if isRipple && v > sv {
		return 0, fmt.Errorf("filter: %s RippleDB %g looser than the spec's %g: %w", fam, v, sv, ErrParam)
	}
	if !isRipple && v < sv {
		return 0, fmt.Errorf("filter: %s AttenDB %g looser than the spec's %g: %w", fam, v, sv, ErrParam)
	}
	return v, nil
}

// resolve settles the parameters of f against the (valid) spec s.
func resolve(f Family, s Spec) (resolved, error) {
	if f == nil {
		return resolved{}, fmt.Errorf("filter: nil Family: %w", ErrParam)
	}
	r := resolved{rp: s.RippleDB, as: s.AttenDB}
	// Pointers to this package's families stand for their values.
	x := any(f)
	switch p := x.(type) {
	case *Butterworth:
		x = derefOrNil(p)
	case *Chebyshev:
		x = derefOrNil(p)
	case *InverseChebyshev:
		x = derefOrNil(p)
	case *Elliptic:
		x = derefOrNil(p)
	case *Bessel:
		x = derefOrNil(p)
	}
	if x == nil {
		return resolved{}, fmt.Errorf("filter: nil %T Family: %w", f, ErrParam)
	}
	if m, ok := x.(interface{ MaxOrder() int }); ok {
		r.maxOrder = m.MaxOrder()
	}
	var err error
	switch v := x.(type) {
	case Butterworth:
		r.kind, r.fam = kindButterworth, f
	case Chebyshev:
		r.kind = kindChebyshev
		if r.rp, err = familyParam("Chebyshev", "RippleDB", v.RippleDB, s.RippleDB, true); err != nil {
			return r, err
		}
		r.fam, r.cheb = f, Chebyshev{RippleDB: r.rp}
	case InverseChebyshev:
		r.kind = kindInverseChebyshev
		if r.as, err = familyParam("InverseChebyshev", "AttenDB", v.AttenDB, s.AttenDB, false); err != nil {
			return r, err
		}
		r.fam, r.icheb = f, InverseChebyshev{AttenDB: r.as}
	case Elliptic:
		r.kind = kindElliptic
		if r.rp, err = familyParam("Elliptic", "RippleDB", v.RippleDB, s.RippleDB, true); err != nil {
			return r, err
		}
		if r.as, err = familyParam("Elliptic", "AttenDB", v.AttenDB, s.AttenDB, false); err != nil {
			return r, err
		}
		if !(r.rp < r.as) {
			return r, fmt.Errorf("filter: Elliptic RippleDB %g not below AttenDB %g: %w", r.rp, r.as, ErrParam)
		}
		r.freeAtt = v.AttenDB == 0
		r.fam, r.ell = f, Elliptic{RippleDB: r.rp, AttenDB: r.as}
	case Bessel:
		if v.Norm < BesselCorner || v.Norm > BesselPhase {
			return r, fmt.Errorf("filter: Bessel Norm %d unknown: %w", int(v.Norm), ErrParam)
		}
		r.kind, r.fam = kindBessel, f
	default:
		r.kind, r.fam = kindGeneric, f
	}
	return r, nil
}

// derefOrNil returns *p, or nil for a nil pointer.
func derefOrNil[T any](p *T) any {
	if p == nil {
		return nil
	}
	return *p
}

// estimate returns the (real) order the family needs for the normalized
// lowpass requirement: passband edge 1 rad/s with rp dB, stopband edge sel
// with as dB. ok is false for families without a closed form.
//
// Sources (from memory of Daniels, "Approximation Methods for Electronic
// Filter Design" (1974), and Zverev, "Handbook of Filter Synthesis" (1967);
// the same expressions in Antoniou, "Digital Filters", ch. 5), with
// D = (10^(as/10) − 1)/(10^(rp/10) − 1):
//
//	Butterworth:            n ≥ log D / (2·log sel)
//	Chebyshev and inverse:  n ≥ acosh √D / acosh sel
//	elliptic:               n ≥ K(k)·K'(k1) / (K'(k)·K(k1)),  k = 1/sel, k1 = 1/√D
//
// For the elliptic family it also keeps the period ratio of k in r.selRatio.
func (r *resolved) estimate(sel float64) (n float64, ok bool) {
	d := dbPowM1(r.as) / dbPowM1(r.rp)
	switch r.kind {
	case kindButterworth:
		return math.Log(d) / (2 * math.Log(sel)), true
	case kindChebyshev, kindInverseChebyshev:
		return math.Acosh(math.Sqrt(d)) / math.Acosh(sel), true
	case kindElliptic:
		k, kc := selModuli(sel)
		k1, k1c := 1/math.Sqrt(d), math.Sqrt((d-1)/d)
		r.selRatio = ellip.PeriodRatio(k, kc)
		return ellip.PeriodRatio(k1, k1c) / r.selRatio, true
	}
	return 0, false
}

// MinOrder returns the least prototype order of f for which Design(f, s)
// meets the mask s (bandpass and bandstop designs have twice that many
// poles). The family's own RippleDB or AttenDB, when non-zero, is used and
// must be no looser than the spec's; zero takes the spec's. The mask then
// met is the spec's with the family's stricter values in their place.
//
// Butterworth, Chebyshev, InverseChebyshev and Elliptic start from the
// classical closed-form order of the mask's lowpass equivalent, rounded
// up: passband edge 1 rad/s and stopband edge at the selectivity sel
// (StopHz/PassHz for a lowpass, PassHz/StopHz for a highpass, the nearer
// stopband edge mapped through the band transform for bandpass and
// bandstop), and with D = (10^(AttenDB/10) − 1)/(10^(RippleDB/10) − 1),
// log D / (2·log sel) for Butterworth, acosh √D / acosh sel for Chebyshev
// and InverseChebyshev, and the degree equation of complete elliptic
// integrals for Elliptic. Bessel and families defined outside this package
// search the orders upward from 1. In every case the order is verified
// by designing the filter and evaluating it over the passband and
// stopband (edges exactly, and a log grid in between):
// the order is raised while the design falls short and lowered while one
// order less also meets the mask (floating-point rounding where the exact
// order is a whole number), with MaskToleranceDB of allowance. For
// bandpass and bandstop masks the transform's centre and width are chosen
// within what the mask allows to need the least order: a bandpass keeps
// the mask's passband edges (that choice is optimal); a bandstop may move
// its passband edges inward, within PassHz, to the centre (and the widest
// width it allows) that maximizes sel, the fixed edges being one of the
// candidates. So MinOrder is never above the classical estimates that keep
// the passband edges fixed.
//
// The error wraps ErrSpec for an invalid spec (see Spec.Validate), ErrParam
// for a bad or looser family parameter (and for a Family defined outside
// this package whose Prototype fails with an error of its own, which is
// wrapped too, or returns a pole that is not finite and strictly in the
// left half-plane, which the message names), and ErrRange when the mask needs an order beyond the
// family's supported range (also wrapping the prototype's ErrOrder).
func MinOrder(f Family, s Spec) (int, error) {
	n, _, err := minDesign(f, s)
	return n, err
}

// Design returns the least-order filter of family f that meets the mask s
// everywhere in its passband and stopband (to within MaskToleranceDB): the
// prototype of order MinOrder(f, s), scaled and transformed to the band.
// Its passband maximum is 0 dB (gain 1), as the prototype's.
//
// Where the slack of a whole-number order goes:
//
//   - Butterworth, Chebyshev, Bessel: the passband edge is exact
//     (attenuation RippleDB at PassHz), the stopband gets the extra
//     attenuation. Chebyshev ripples by the family's RippleDB, or the
//     spec's when the family's is zero.
//   - InverseChebyshev: the stopband edge is exact (attenuation AttenDB, the
//     family's or the spec's, from StopHz on), the passband gets the slack
//     (less than RippleDB of droop at PassHz).
//   - Elliptic: the passband edge is exact with the ripple RippleDB; when
//     the family's AttenDB is zero the stopband edge is exact too and the
//     slack raises the stopband attenuation above the spec's, to what the
//     order reaches at StopHz (capped at 150 dB; past the cap the stopband
//     starts below StopHz); when the family fixes AttenDB that attenuation
//     is used as it is and the slack narrows the transition (the stopband
//     starts below StopHz).
//
// For bandpass and bandstop masks "edge" means the edge of the lowpass
// equivalent: the transform's centre and width are those MinOrder
// chooses, so for a bandstop mask that is not geometrically symmetric one
// passband edge may lie inside the mask's allowance (more than required)
// rather than on it.
//
// Errors are those of MinOrder.
func Design(f Family, s Spec) (Transfer, error) {
	_, h, err := minDesign(f, s)
	return h, err
}

// minDesign finds the least order and its design.
func minDesign(f Family, s Spec) (int, Transfer, error) {
	if err := s.Validate(); err != nil {
		return 0, Transfer{}, err
	}
	r, err := resolve(f, s)
	if err != nil {
		return 0, Transfer{}, err
	}
	pl := s.plan()
	limit := r.maxOrder
	if limit <= 0 {
		limit = maxSearchOrder
		if r.kind != kindGeneric && r.kind != kindBessel {
			limit = orderCap
		}
	}
	// try designs order n and reports whether it meets the mask; a design
	// error ends the search.
	mb := boundsOf(r.rp, r.as)
	try := func(n int) (Transfer, bool, error) {
		h, err := r.design(s, pl, n)
		if err != nil {
			if errors.Is(err, ErrOrder) {
				return Transfer{}, false, fmt.Errorf("filter: %s mask needs order above %d, beyond %v's supported range: %w: %w",
					s.Band, n-1, r.fam, ErrRange, err)
			}
			if !wrapsSentinel(err) {
				// A Family defined outside the package failed in its own
				// words: keep them, under a sentinel callers can match.
				return Transfer{}, false, fmt.Errorf("filter: %v.Prototype(%d): %w: %w", r.fam, n, ErrParam, err)
			}
			return Transfer{}, false, err
		}
		return h, r.meets(h, s, mb), nil
	}
	est, closed := r.estimate(pl.sel)
	if !closed {
		for n := 1; n <= limit; n++ {
			h, ok, err := try(n)
			if err != nil {
				return 0, Transfer{}, err
			}
			if ok {
				return n, h, nil
			}
		}
		return 0, Transfer{}, fmt.Errorf("filter: %s mask not met by %v up to order %d: %w", s.Band, r.fam, limit, ErrRange)
	}
	if math.IsNaN(est) || est > float64(limit)+3 {
		return 0, Transfer{}, fmt.Errorf("filter: %s mask needs %v order about %.4g, beyond the supported range 1..%d: %w",
			s.Band, r.fam, est, limit, ErrRange)
	}
	n := min(max(1, int(math.Ceil(est))), limit)
	h, ok, err := try(n)
	if err != nil {
		return 0, Transfer{}, err
	}
	if ok {
		// Step down while one order less also meets (rounding above a
		// whole number). Where the estimate is clear of n−1 by more than
		// its rounding (stepDownMargin), order n−1 misses the mask in exact
		// arithmetic, so the extra design and check are skipped.
		if est-float64(n-1) > stepDownMargin {
			return n, h, nil
		}
		for n > 1 {
			h1, ok1, err1 := try(n - 1)
			if err1 != nil || !ok1 {
				break
			}
			n, h = n-1, h1
		}
		return n, h, nil
	}
	// Step up while rounding left the estimate short.
	for range 4 {
		n++
		h, ok, err = try(n)
		if err != nil {
			return 0, Transfer{}, err
		}
		if ok {
			return n, h, nil
		}
	}
	return 0, Transfer{}, fmt.Errorf("filter: %s mask not met by %v at orders up to %d (estimate %.6g): %w",
		s.Band, r.fam, n, est, ErrRange)
}

// DesignOrder returns the order-n filter of family f placed on the mask s
// exactly as Design places its own result (the same band plan, edge
// normalization and slack rule), whether or not that order meets the mask.
// It is for callers who fix the order themselves (a board that already
// carries n op-amp sections) and for checking what one order less than
// MinOrder would give. Design(f, s) equals DesignOrder(f, s, MinOrder(f, s)).
//
// The error wraps ErrSpec for an invalid spec, ErrParam for a bad or looser
// family parameter and ErrOrder for an order outside the family's range.
func DesignOrder(f Family, s Spec, n int) (Transfer, error) {
	if err := s.Validate(); err != nil {
		return Transfer{}, err
	}
	r, err := resolve(f, s)
	if err != nil {
		return Transfer{}, err
	}
	if n < 1 {
		return Transfer{}, fmt.Errorf("filter: order %d not positive: %w", n, ErrOrder)
	}
	return r.design(s, s.plan(), n)
}
