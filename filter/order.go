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

// skipMarginDB is how far, in dB, the exact-arithmetic stopband
// attenuation of the estimate's order must exceed the mask's for MinOrder
// to take that order without designing it (clearWithoutDesign): a
// thousand times MaskToleranceDB, and far above the closed form's own
// rounding (a few ulps of logarithms of at most a few thousand).
const skipMarginDB = 1e-3

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
// search the orders upward from 1. The order is verified by designing the
// filter and evaluating it over the passband and stopband (edges exactly
// for this package's families, whose shape between the edges is known,
// and a dense log grid for outside families): the order is raised while
// the design falls short and lowered while one order less also meets the
// mask (floating-point rounding where the exact order is a whole number),
// with MaskToleranceDB of allowance. Where the outcome of that check is
// certain beforehand, MinOrder returns the estimate's order without
// designing: for Butterworth and Chebyshev masks of order at most 32, and
// elliptic lowpass and highpass masks of order at most 14 with the
// family's AttenDB zero, whose closed-form stopband attenuation at that
// order, in exact arithmetic, exceeds AttenDB by at least 1e-3 dB, whose
// estimate lies clear of one order less, and whose poles, gain and band
// (pole Q, relative bandwidth, frequency range) bound the design's
// rounding far below MaskToleranceDB and keep every value of it in
// float64 range (see clearWithoutDesign; the elliptic prototype is still
// built, its scaling and check skipped). The order returned is the same
// either way, the one Design uses. For
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
	n, _, err := minDesign(f, s, false)
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
	_, h, err := minDesign(f, s, true)
	return h, err
}

// minDesign finds the least order and, when design is true, its design.
// Without design (MinOrder) the verifying design of the estimate's order
// is skipped where clearWithoutDesign shows its outcome beforehand.
func minDesign(f Family, s Spec, design bool) (int, Transfer, error) {
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
	var mb maskBounds // boundsOf(r.rp, r.as), set before the first try
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
		mb = boundsOf(r.rp, r.as)
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
	if !design && est-float64(n-1) > stepDownMargin && r.clearWithoutDesign(pl, n) {
		return n, Transfer{}, nil
	}
	mb = boundsOf(r.rp, r.as)
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

// ex returns a bound on |log2 v| for positive finite v: |log2 v| < ex(v);
// for zero, infinite or NaN v a bound no range check passes.
func ex(v float64) int {
	if !(v > 0 && v <= math.MaxFloat64) {
		return 1 << 20
	}
	_, e := math.Frexp(v)
	return max(e, -e) + 1
}

// clearWithoutDesign reports whether the order-n design of the plan pl is
// certain both to be built without error and to meet the mask, so that
// MinOrder may return n (the caller has checked that the estimate lies
// clear of n−1) without designing it. It answers for the Butterworth and
// Chebyshev families below and the elliptic one (ellipticClear); the
// others are designed and checked:
//
//   - Stopband: the closed-form attenuation of order n at the normalized
//     stopband edge sel, 10·log10(1 + ε²·sel^2n) (Butterworth, its
//     passband edge placed at RippleDB) or 10·log10(1 + ε²·cosh²(n·acosh
//     sel)) (Chebyshev; Tₙ(x) = cosh(n·acosh x) for x ≥ 1, from memory of
//     any Chebyshev-polynomial text), must exceed the mask's by
//     skipMarginDB. The mask's other stop edge maps beyond sel, where the
//     attenuation is higher (monotone).
//   - Passband: the design's passband edge is exact (attenuation RippleDB)
//     in exact arithmetic, so the check passes if the design's rounding
//     stays below MaskToleranceDB (a relative 1.2e-7 of |H|). Every pole
//     below has |Re p| ≥ rmin and |p| ≤ pmax: Butterworth poles
//     ρ·(−sin θ + j·cos θ), ρ = ε^(−1/n) between 1 and 1/ε, |Re p| ≥ ρ/n
//     (sin(π/2n) ≥ 1/n); Chebyshev −sinh μ·sin θ + j·cosh μ·cos θ with
//     sinh μ ≥ μ = asinh(1/ε)/n ≥ (1/ε)/(n·√(1+1/ε²)) (asinh x ≥
//     x/√(1+x²), its derivative decreasing) and |p| ≤ cosh μ ≤ √(1+1/ε²).
//     Requiring pmax ≤ 2^12·rmin (pole Q at most 2048), n ≤ 32, and for the
//     band transforms a mapped pole with |Re x| ≥ 2^−12·|x| and a relative
//     bandwidth B/ω0 of at least 2^−12, the relative error of |H| at any
//     frequency is at most Σ|δx|/|Re x| ≤ 64 roots × (1e-13 prototype
//     accuracy × 2^12 + a few ulps × 2^12) ≈ 3e-8, and the rounding of the
//     band plan moves the mapped pass edge by under 1e-11/(B/ω0) where the
//     attenuation's slope is at most 17.4·n² dB: below 3e-7 dB together.
//   - Range: the gain (h0·Π|p|, h0 = 1/√(1+ε²), or ρⁿ) lies within
//     2^±G, G from rmin, pmax and h0; the transforms multiply it by ωⁿ
//     (lowpass) or Bⁿ (bandpass) or leave h0 (highpass, bandstop), scale
//     the roots by ω or map them by ω/p, or by the roots of
//     s² − p·B·s + ω0² (p → B/p for bandstop), whose magnitudes lie in
//     [ω0/(|p|·β + 1), |p|·B + ω0] and whose real parts are at least
//     β·|Re p|/(2(|p|·β + 1)) of their magnitudes, β = B/ω0 (from
//     Re x = B·Re p·|x|²/(|x|² + ω0²), the substitution solved for p).
//     The exponent limits below keep every one of these well inside the
//     normal float64 range, so no ErrRange can arise.
func (r resolved) clearWithoutDesign(pl bandPlan, n int) bool {
	if r.kind == kindElliptic {
		return r.ellipticClear(pl, n)
	}
	if n > 32 || (r.kind != kindButterworth && r.kind != kindChebyshev) {
		return false
	}
	e2 := dbPowM1(r.rp)
	if !(e2 >= 0x1p-200 && e2 <= 0x1p200) {
		return false
	}
	nf := float64(n)
	x := 1 / math.Sqrt(e2) // 1/ε
	var rmin, pmax float64
	var have float64 // ln(ε²·Tₙ²(sel)) or ln(ε²·sel^2n)
	if r.kind == kindButterworth {
		rmin, pmax = 0.99*math.Min(1, x)/nf, 1.01*math.Max(1, x)
		have = math.Log(e2) + 2*nf*math.Log(pl.sel)
	} else {
		rmin, pmax = 0.99*x/(math.Sqrt(1+x*x)*nf*nf), 1.01*math.Sqrt(1+x*x)
		y := nf * math.Acosh(pl.sel)
		// ln cosh y = y + ln(1 + e^(−2y)) − ln 2, for y ≥ 0.
		have = math.Log(e2) + 2*(y+math.Log1p(math.Exp(-2*y))-math.Ln2)
	}
	if !(have >= math.Log(dbPowM1(r.as+skipMarginDB))) || !(pmax <= 0x1p12*rmin) {
		return false
	}
	gainEx := n*max(ex(rmin), ex(pmax)) + ex(1+e2)/2 + 1
	switch pl.band {
	case Lowpass, Highpass:
		lw := ex(2 * math.Pi * pl.edgeHz)
		if lw+ex(rmin)+2*ex(pmax) > 900 {
			return false
		}
		return pl.band == Highpass || gainEx+n*lw <= 900
	}
	w0, bw := 2*math.Pi*pl.centerHz, 2*math.Pi*pl.widthHz
	beta := bw / w0
	if !(beta >= 0x1p-12 && beta <= 0x1p12) || ex(w0) > 400 || ex(bw) > 400 {
		return false
	}
	pm, rm := pmax, rmin
	if pl.band == Bandstop {
		pm, rm = 1/rmin, rmin/(pmax*pmax)
	}
	if ex(pm)+ex(bw) > 450 || !(beta*rm/(2*(pm*beta+1)) >= 0x1p-12) {
		return false
	}
	return pl.band == Bandstop || gainEx+n*ex(bw) <= 900
}

// ellipticClear is clearWithoutDesign for the elliptic family, lowpass and
// highpass masks of order at most 14 whose attenuation is the spec's (the
// family's AttenDB zero). The design path then builds the prototype from
// the moduli of the slack (see resolved.lowpass) with the stopband edge at
// sel exact and the attenuation As of order n there (ellipticSlack),
// which must exceed the mask's by skipMarginDB and stay within
// maxSlackAttenDB. The prototype itself is built here (into a scratch
// array: its own errors, pole Q beyond MaxEllipticQ or a gain out of
// range, then reach MinOrder through the verifying path) and only its
// frequency scaling and the check of the mask are skipped, where its
// actual poles and zeros show beforehand that they succeed:
//
//   - Accuracy: the passband edge is exact (attenuation RippleDB), so the
//     check passes if the rounding of |H| stays below MaskToleranceDB.
//     The prototype's roots are accurate to 1e-13 relative for orders to
//     14 and pole Q to 1e4 (Prototype's doc, accuracy_test.go); with
//     |p| ≤ 2^12·|Re p| for every pole and every zero's |z| at least
//     2^−12·|z| from both edges (1 and sel), each root moves |H| at either
//     edge by at most 1e-13·2^13 relative, 28 roots by under 3e-8 (about
//     2.5e-7 dB), and the scaling by ω adds an ulp per root.
//   - Range: the scaled roots ω·r (lowpass) or ω/r (highpass), their real
//     parts ω·Re p or ω·Re p/|p|², and the gain g·ω^(n mod 2) (lowpass)
//     or H(0)-normalized h0 times Π(−z)/Π(−p)·g = h0 (highpass, the zeros
//     at the origin adding no factor) stay inside 2^±1000.
func (r resolved) ellipticClear(pl bandPlan, n int) bool {
	if n > 14 || !r.freeAtt || (pl.band != Lowpass && pl.band != Highpass) || !(pl.sel >= 1+0x1p-12) {
		return false
	}
	k, kc := selModuli(pl.sel)
	ep2 := dbPowM1(r.rp)
	as, k1, k1c := ellipticSlack(n, r.selRatio, ep2)
	if !(as <= maxSlackAttenDB && as >= r.as+skipMarginDB && k1c > 0) {
		return false
	}
	var scratch [2 * 14]complex128 // n poles and n − n mod 2 zeros
	fam := r.ell
	fam.AttenDB = as
	h, err := fam.buildInto(scratch[:], n, ep2, k1, k1c, k, kc)
	if err != nil {
		return false
	}
	lw := ex(2 * math.Pi * pl.edgeHz)
	rmin, pmax, pmin := math.Inf(1), 0.0, math.Inf(1)
	for _, p := range h.Poles {
		re, m := -real(p), math.Hypot(real(p), imag(p))
		if !(re > 0 && m <= 0x1p12*re) {
			return false
		}
		rmin, pmax, pmin = math.Min(rmin, re), math.Max(pmax, m), math.Min(pmin, m)
	}
	for _, z := range h.Zeros {
		m := math.Abs(imag(z))
		if !(math.Abs(m-1) >= 0x1p-12*m && math.Abs(m-pl.sel) >= 0x1p-12*m) || ex(m)+lw > 1000 {
			return false
		}
	}
	g := math.Abs(h.Gain)
	if !(g > 0) || ex(g)+lw > 1000 {
		return false
	}
	// Lowpass: |ω·p| ≤ ω·pmax, |ω·Re p| ≥ ω·rmin. Highpass: |ω/p| ≤ ω/pmin
	// and |Re(ω/p)| = ω·|Re p|/|p|² ≥ ω·rmin/pmax².
	return lw+ex(pmax)+ex(pmin)+ex(rmin)+2*ex(pmax) <= 1000
}
