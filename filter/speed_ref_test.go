package filter

// The design path as it was before the speed work of issue 7 (MinOrder
// skipping the verifying design, the elliptic climb interleaved, the mask
// bounds converted once), kept as the reference the property tests in
// speed_test.go compare the new path against.

import (
	"errors"
	"fmt"
	"math"

	"github.com/rolloff/rolloff/internal/ellip"
)

// Reference copy (pre issue 7).
func minDesignRef(f Family, s Spec) (int, Transfer, error) {
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
	try := func(n int) (Transfer, bool, error) {
		h, err := r.designRef(s, pl, n)
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
		return h, r.meetsRef(h, s), nil
	}
	est, closed := r.estimateRef(pl.sel)
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

// Reference copy (pre issue 7).
func (r resolved) estimateRef(sel float64) (n float64, ok bool) {
	d := dbPowM1(r.as) / dbPowM1(r.rp)
	switch r.kind {
	case kindButterworth:
		return math.Log(d) / (2 * math.Log(sel)), true
	case kindChebyshev, kindInverseChebyshev:
		return math.Acosh(math.Sqrt(d)) / math.Acosh(sel), true
	case kindElliptic:
		k, kc := 1/sel, math.Sqrt((sel-1)*(sel+1))/sel
		k1, k1c := 1/math.Sqrt(d), math.Sqrt((d-1)/d)
		return ellip.PeriodRatio(k1, k1c) / ellip.PeriodRatio(k, kc), true
	}
	return 0, false
}

// Reference copy (pre issue 7).
func (r resolved) lowpassRef(sel float64, n int) (Transfer, error) {
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
			k, kc := 1/sel, math.Sqrt((sel-1)*(sel+1))/sel
			ep2 := dbPowM1(r.rp)
			as, k1, k1c := ellipticSlackRef(n, k, kc, ep2)
			if as <= maxSlackAttenDB && as >= fam.AttenDB && k1c > 0 && n <= MaxEllipticOrder {
				fam.AttenDB = as
				return fam.buildRef(n, ep2, k1, k1c, k, kc)
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

// Reference copy (pre issue 7).
func (r resolved) designRef(s Spec, pl bandPlan, n int) (Transfer, error) {
	lp, err := r.lowpassRef(pl.sel, n)
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
	case Highpass:
		return lp.ToHighpass(pl.edgeHz)
	case Bandpass:
		return lp.ToBandpass(pl.centerHz, pl.widthHz)
	default:
		return lp.ToBandstop(pl.centerHz, pl.widthHz)
	}
}

// Reference copy (pre issue 7).
func ellipticSlackRef(n int, k, kc, ep2 float64) (as, k1, k1c float64) {
	k1, k1c = ellip.ModulusFromRatio(float64(n) * ellip.PeriodRatio(k, kc))
	if !(k1 > 0) {
		return math.Inf(1), k1, k1c
	}
	return 10 / math.Ln10 * math.Log1p(ep2/(k1*k1)), k1, k1c
}

// Reference copy (pre issue 7).
func (r resolved) meetsRef(h Transfer, s Spec) bool {
	if r.kind == kindGeneric {
		return meetsOnGrid(h, s, r.rp, r.as)
	}
	return meetsAtEdgesRef(h, s, r.rp, r.as)
}

// Reference copy (pre issue 7).
func meetsAtEdgesRef(h Transfer, s Spec, rp, as float64) bool {
	// 10^(−x/20) as an exponential (a fraction of an ulp from math.Pow's,
	// far below MaskToleranceDB).
	passMin := math.Exp(-(rp + MaskToleranceDB) * (math.Ln10 / 20)) // least |H| in the passband
	stopMax := math.Exp(-(as - MaskToleranceDB) * (math.Ln10 / 20)) // greatest |H| in the stopband
	pass := func(f float64) bool { return magAt(h, 2*math.Pi*f) >= passMin }
	stop := func(f float64) bool { return magAt(h, 2*math.Pi*f) <= stopMax }
	p, t := s.PassHz, s.StopHz
	switch s.Band {
	case Lowpass, Highpass:
		return pass(p[0]) && stop(t[0])
	default:
		return pass(p[0]) && pass(p[1]) && stop(t[0]) && stop(t[1])
	}
}

// Reference copy (pre issue 7).
func (e Elliptic) buildRef(n int, ep2, k1, k1c, k, kc float64) (Transfer, error) {
	// sn⁻¹(j/εp, k1) = j·sc⁻¹(1/εp, k1'), normalized by n·K(k1).
	v0 := ellip.ArcSC(1/math.Sqrt(ep2), k1c, k1) / (float64(n) * ellip.KComp(k1c))
	lan := ellip.NewLanden(k, kc)
	ch, sh := math.Cosh(v0*math.Pi/2), math.Sinh(v0*math.Pi/2)
	m := n / 2
	// One backing array: poles first, then zeros (the zeros' capacity ends
	// at their length, so an append to them cannot overwrite the poles).
	buf := make([]complex128, n+2*m)
	poles, zeros := buf[:0:n], buf[n:n:n+2*m]
	for i := 1; i <= m; i++ {
		u := float64(2*i-1) / float64(n)
		s, c := math.Sincos(u * math.Pi / 2)
		w := lan.Climb(complex(c*ch, s*sh))
		p := complex(-math.Abs(imag(w)), math.Abs(real(w))) // j·w, upper member
		poles = append(poles, p, complex(real(p), -imag(p)))
		z := 1 / (k * lan.ClimbReal(c))
		zeros = append(zeros, complex(0, z), complex(0, -z))
	}
	if n%2 == 1 {
		s, c := math.Sincos(math.Pi / 2) // u = 1
		w := lan.Climb(complex(c*ch, s*sh))
		poles = append(poles, complex(-math.Abs(imag(w)), 0))
	}
	if len(poles) > 1 {
		// Pair 0 is nearest the jω axis (highest Q).
		p := poles[0]
		if q := math.Hypot(real(p), imag(p)) / (-2 * real(p)); !(q <= MaxEllipticQ) {
			return Transfer{}, fmt.Errorf("filter: Elliptic order %d with RippleDB %g, AttenDB %g: pole Q %.3g beyond MaxEllipticQ %g: %w",
				n, e.RippleDB, e.AttenDB, q, float64(MaxEllipticQ), ErrRange)
		}
	}
	h0 := 1.0
	if n%2 == 0 {
		h0 = 1 / math.Sqrt(1+ep2)
	}
	g, ok := dcGainRef(h0, zeros, poles)
	if !ok {
		return Transfer{}, fmt.Errorf("filter: Elliptic order %d: gain %g not representable: %w", n, g, ErrRange)
	}
	return Transfer{Zeros: zeros, Poles: poles, Gain: g}, nil
}

// ellipDegree is ellip.Degree (for the reference build's moduli).
func ellipDegree(n int, k1, k1c float64) (k, kc float64) { return ellip.Degree(n, k1, k1c) }

// Reference copy (pre issue 7).
func dcGainRef(h0 float64, zeros, poles []complex128) (g float64, ok bool) {
	acc := complex(h0, 0)
	for i, p := range poles {
		if i < len(zeros) {
			acc *= p / zeros[i]
		} else {
			acc *= -p
		}
	}
	g = real(acc)
	return g, g != 0 && !math.IsInf(g, 0) && !math.IsNaN(g)
}
