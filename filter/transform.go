package filter

import (
	"fmt"
	"math"
	"math/cmplx"
)

// The frequency transforms below map a normalized lowpass prototype, whose
// band edge is at 1 rad/s, to a lowpass, highpass, bandpass or bandstop
// filter in hertz. The substitutions are the classical reactance
// transformations (from memory of Zverev, "Handbook of Filter Synthesis"
// (1967), ch. 2, and Daniels, "Approximation Methods for Electronic Filter
// Design" (1974), ch. 9), with ω = 2π·f:
//
//	lowpass:  s → s/ω
//	highpass: s → ω/s
//	bandpass: s → (s² + ω0²)/(B·s)
//	bandstop: s → B·s/(s² + ω0²)
//
// Each transform works on the factored form directly: every pole and zero
// is mapped by the stable root formulas, and the gain is accumulated as a
// mantissa and a binary exponent, so that no intermediate overflows. A
// resulting gain outside the normal float64 range is reported as ErrRange.
//
// Ordering: each conjugate pair of the result is adjacent, in the order of
// the input pair it comes from (a pair whose input pair was adjacent and
// listed positive imaginary part first is listed so too); real roots keep
// their relative order. Zeros that the transform creates (at the origin or
// at ±jω0) follow the mapped zeros.

// checkFreq reports whether v is a positive finite frequency; name is the
// argument's name for the error message.
func checkFreq(name string, v float64) error {
	if !(v > 0) || math.IsInf(v, 1) {
		return fmt.Errorf("filter: %s %g Hz not positive and finite: %w", name, v, ErrFrequency)
	}
	return nil
}

// scaled is a real or complex number held as a mantissa and a binary
// exponent, m·2^e, for products of many factors whose partial results may
// leave the float64 range although the final one does not.
type scaled struct {
	m complex128
	e int
}

func newScaled(g float64) scaled { return scaled{m: complex(g, 0)}.norm() }

func (x scaled) norm() scaled {
	a := math.Max(math.Abs(real(x.m)), math.Abs(imag(x.m)))
	if a == 0 || math.IsInf(a, 0) || math.IsNaN(a) {
		return x
	}
	_, e := math.Frexp(a)
	x.m = complex(math.Ldexp(real(x.m), -e), math.Ldexp(imag(x.m), -e))
	x.e += e
	return x
}

// midRange reports whether both parts of z are at most 2^400 in magnitude
// and the larger at least 2^-400: a product or quotient of two such
// numbers is a normal float64, and equals, up to an exact power of two,
// the one of their normalized forms.
func midRange(z complex128) bool {
	a := max(math.Abs(real(z)), math.Abs(imag(z)))
	return a >= 0x1p-400 && a <= 0x1p400
}

func (x scaled) mul(c complex128) scaled {
	if midRange(x.m) && midRange(c) {
		x.m *= c // the bits of the normalizing path below, without its cost
		return x
	}
	// Normalize the factor first, so that neither it nor the product leaves
	// the range.
	a := math.Max(math.Abs(real(c)), math.Abs(imag(c)))
	if a == 0 {
		return scaled{}
	}
	_, e := math.Frexp(a)
	c = complex(math.Ldexp(real(c), -e), math.Ldexp(imag(c), -e))
	x.m *= c
	x.e += e
	return x.norm()
}

func (x scaled) div(c complex128) scaled {
	if midRange(x.m) && midRange(c) {
		x.m /= c
		return x
	}
	a := math.Max(math.Abs(real(c)), math.Abs(imag(c)))
	_, e := math.Frexp(a)
	c = complex(math.Ldexp(real(c), -e), math.Ldexp(imag(c), -e))
	x.m /= c
	x.e -= e
	return x.norm()
}

// real returns the real part of x as a float64, or ErrRange when it is
// non-zero but outside the normal float64 range (or not finite). what
// names the quantity in the message.
func (x scaled) real(what string) (float64, error) { return x.realOf(what, "") }

// realOf is real with the quantity named what+suffix, the two joined only
// for an error message (a transform's result calls it on every design).
func (x scaled) realOf(what, suffix string) (float64, error) {
	r := real(x.m)
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return 0, fmt.Errorf("filter: %s%s not finite: %w", what, suffix, ErrRange)
	}
	if r == 0 {
		return 0, nil
	}
	v := math.Ldexp(r, x.e)
	if math.IsInf(v, 0) {
		return 0, fmt.Errorf("filter: %s%s overflows float64 (about 2^%d): %w", what, suffix, x.e, ErrRange)
	}
	if math.Abs(v) < 0x1p-1022 {
		return 0, fmt.Errorf("filter: %s%s underflows float64 (about 2^%d): %w", what, suffix, x.e, ErrRange)
	}
	return v, nil
}

// finiteC reports whether both parts of z are finite (NaN fails both
// comparisons).
func finiteC(z complex128) bool {
	return math.Abs(real(z)) <= math.MaxFloat64 && math.Abs(imag(z)) <= math.MaxFloat64
}

// checkRoots reports a non-finite pole or zero of h.
func (h Transfer) checkRoots() error {
	if math.IsNaN(h.Gain) || math.IsInf(h.Gain, 0) {
		return fmt.Errorf("filter: transfer Gain %g not finite: %w", h.Gain, ErrRange)
	}
	for i, z := range h.Zeros {
		if !finiteC(z) {
			return fmt.Errorf("filter: transfer Zeros[%d] = %v not finite: %w", i, z, ErrRange)
		}
	}
	for i, p := range h.Poles {
		if !finiteC(p) {
			return fmt.Errorf("filter: transfer Poles[%d] = %v not finite: %w", i, p, ErrRange)
		}
	}
	return nil
}

// inLHP reports whether the poles in (non-nil) lie wholly in the open left
// half-plane: then a transform's mapped pole whose real part underflowed
// is an error (see checkMapped).
func inLHP(in []complex128) bool {
	if in == nil {
		return false
	}
	for _, p := range in {
		if !(real(p) < 0) {
			return false
		}
	}
	return true
}

// checkMapped reports a mapped root that overflowed. When lhp (the poles
// before the transform lay wholly in the open left half-plane, inLHP), it
// also reports a mapped root whose real part underflowed below the
// normal float64 range (a corner near 5e-324 Hz leaves a pole at −0 + jω,
// on the axis: a silently unstable result).
func checkMapped(what string, rs []complex128, lhp bool) error {
	for i, r := range rs {
		if !finiteC(r) {
			return fmt.Errorf("filter: transformed %s[%d] not finite: %w", what, i, ErrRange)
		}
	}
	if !lhp {
		return nil
	}
	for i, r := range rs {
		if !(real(r) <= -0x1p-1022) {
			return fmt.Errorf("filter: transformed %s[%d] = %v: real part underflows float64: %w", what, i, r, ErrRange)
		}
	}
	return nil
}

// ToLowpass returns the lowpass filter whose response at cornerHz equals
// the prototype's at 1 rad/s: H(s/ω) with ω = 2π·cornerHz. Poles and zeros
// are multiplied by ω and the gain by ω^(len(Poles)−len(Zeros)).
//
// The error wraps ErrFrequency for a cornerHz that is not positive and
// finite, and ErrRange when the new gain (or a pole) leaves the normal
// float64 range, or h holds a non-finite value.
func (h Transfer) ToLowpass(cornerHz float64) (Transfer, error) {
	if err := checkFreq("cornerHz", cornerHz); err != nil {
		return Transfer{}, err
	}
	return h.scale(2 * math.Pi * cornerHz)
}

// scale returns H(s/w) for w in rad/s.
func (h Transfer) scale(w float64) (Transfer, error) {
	if err := h.checkRoots(); err != nil {
		return Transfer{}, err
	}
	return h.scaleInto(w, Transfer{Zeros: make([]complex128, len(h.Zeros)), Poles: make([]complex128, len(h.Poles))}, inLHP(h.Poles))
}

// scaleOwned is scale writing over h's own pole and zero slices, for a
// transfer function nobody else holds (a prototype just built).
func (h Transfer) scaleOwned(w float64) (Transfer, error) {
	if err := h.checkRoots(); err != nil {
		return Transfer{}, err
	}
	// Whether the poles were in the left half-plane is read before they
	// are overwritten (an underflowed real part is reported against it).
	return h.scaleInto(w, Transfer{Zeros: h.Zeros, Poles: h.Poles}, inLHP(h.Poles))
}

// scaleInto is scale with out's slices (of h's lengths) for the result;
// lhp is inLHP(h.Poles).
func (h Transfer) scaleInto(w float64, out Transfer, lhp bool) (Transfer, error) {
	cw := complex(w, 0)
	for i, z := range h.Zeros {
		out.Zeros[i] = z * cw
	}
	for i, p := range h.Poles {
		out.Poles[i] = p * cw
	}
	g := newScaled(h.Gain)
	d := len(h.Poles) - len(h.Zeros)
	for ; d > 0; d-- {
		g = g.mul(cw)
	}
	for ; d < 0; d++ {
		g = g.div(cw)
	}
	return finish(out, g, lhp, "lowpass")
}

// ToHighpass returns the highpass filter whose response at cornerHz equals
// the prototype's at 1 rad/s: H(ω/s) with ω = 2π·cornerHz, so that
// |H_hp(f)| = |H_lp(cornerHz²/f)| for the lowpass H_lp = h.ToLowpass(cornerHz).
// Each pole p becomes ω/p and each non-zero zero z becomes ω/z; the zeros
// at infinity (len(Poles)−len(Zeros) of them) become zeros at the origin,
// and the gain becomes Gain·Re(Π(−z)/Π(−p)), a zero at the origin counting
// as ω (it moves to infinity). A pole at the origin moves to infinity in
// the same way.
//
// The error wraps ErrFrequency for a cornerHz that is not positive and
// finite, and ErrRange when the new gain leaves the normal float64 range,
// or h holds a non-finite value.
func (h Transfer) ToHighpass(cornerHz float64) (Transfer, error) {
	if err := checkFreq("cornerHz", cornerHz); err != nil {
		return Transfer{}, err
	}
	if err := h.checkRoots(); err != nil {
		return Transfer{}, err
	}
	w := 2 * math.Pi * cornerHz
	cw := complex(w, 0)
	g := newScaled(h.Gain)
	var zeros, poles []complex128
	// Powers of s: every zero factor (ω/s − z) contributes 1/s, every pole
	// factor s; finite non-zero roots keep a factor (s − ω/r).
	sPow := len(h.Poles) - len(h.Zeros)
	for _, z := range h.Zeros {
		if z == 0 {
			g = g.mul(cw)
			continue
		}
		g = g.mul(-z)
		zeros = append(zeros, cw/z)
	}
	for _, p := range h.Poles {
		if p == 0 {
			g = g.div(cw)
			continue
		}
		g = g.div(-p)
		poles = append(poles, cw/p)
	}
	for ; sPow > 0; sPow-- {
		zeros = append(zeros, 0)
	}
	for ; sPow < 0; sPow++ {
		poles = append(poles, 0)
	}
	out := Transfer{Zeros: keepPairOrder(zeros), Poles: keepPairOrder(poles)}
	return finish(out, g, inLHP(h.Poles), "highpass")
}

// keepPairOrder swaps the members of each adjacent exact conjugate pair of
// rs, so that a reciprocal map (which flips the sign of the imaginary part)
// keeps the input's order of signs within each pair. It works in place and
// returns rs.
func keepPairOrder(rs []complex128) []complex128 {
	for i := 0; i+1 < len(rs); i++ {
		if imag(rs[i]) != 0 && rs[i+1] == cmplx.Conj(rs[i]) {
			rs[i], rs[i+1] = rs[i+1], rs[i]
			i++
		}
	}
	return rs
}

// quadPair returns the two roots of s² − b·s + c for complex b and c, the
// larger in magnitude by the formula and the other from the product c, so
// that neither suffers cancellation.
func quadPair(b, c complex128) (complex128, complex128) {
	d := cmplx.Sqrt(b*b - 4*c)
	// Choose the sign of d that adds to b without cancellation.
	if real(b)*real(d)+imag(b)*imag(d) < 0 {
		d = -d
	}
	r1 := (b + d) / 2
	if r1 == 0 {
		return 0, 0
	}
	return r1, c / r1
}

// bandRoots maps each root r of the set rs by a quadratic s² − b(r)·s + c,
// where each r gives two roots. It keeps conjugate symmetry exact: for an
// adjacent exact conjugate pair (r, r̄) it maps r alone and emits
// (x1, x̄1, x2, x̄2), each pair with the sign order of (r, r̄); a real r
// whose two roots are complex emits them positive imaginary part first.
// The result has room for extra more roots (the caller's zeros or poles at
// the origin).
func bandRoots(rs []complex128, b func(complex128) complex128, c complex128, extra int) []complex128 {
	return bandRootsInto(make([]complex128, 0, 2*len(rs)+max(extra, 0)), rs, b, c)
}

// bandRootsInto is bandRoots appending the 2·len(rs) roots to out.
func bandRootsInto(out, rs []complex128, b func(complex128) complex128, c complex128) []complex128 {
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		x1, x2 := quadPair(b(r), c)
		if imag(r) != 0 && i+1 < len(rs) && rs[i+1] == cmplx.Conj(r) {
			// Order each output pair like the input pair: the member with
			// the imaginary sign of r first.
			s := math.Copysign(1, imag(r))
			p1, p2 := x1, x2
			if math.Copysign(1, imag(p1)) != s {
				p1 = cmplx.Conj(p1)
			}
			if math.Copysign(1, imag(p2)) != s {
				p2 = cmplx.Conj(p2)
			}
			out = append(out, p1, cmplx.Conj(p1), p2, cmplx.Conj(p2))
			i++
			continue
		}
		if imag(r) == 0 && imag(c) == 0 {
			// Real coefficients: the roots are real or an exact conjugate pair.
			if imag(x1) != 0 || imag(x2) != 0 {
				re := (real(x1) + real(x2)) / 2
				im := math.Abs(imag(x1))
				x1, x2 = complex(re, im), complex(re, -im)
			} else {
				x1, x2 = complex(real(x1), 0), complex(real(x2), 0)
			}
		}
		out = append(out, x1, x2)
	}
	return out
}

// ToBandpass returns the bandpass filter whose passband edges are where the
// prototype's 1 rad/s edge lands: f1·f2 = centerHz² (geometric centre) and
// f2 − f1 = widthHz (edge-to-edge width). It substitutes
// s → (s² + ω0²)/(B·s) with ω0 = 2π·centerHz, B = 2π·widthHz: each pole p
// becomes the two roots of s² − p·B·s + ω0², each finite zero likewise, the
// zeros at infinity become zeros at the origin, and the gain is multiplied
// by B^(len(Poles)−len(Zeros)).
//
// The error wraps ErrFrequency for a centerHz or widthHz that is not
// positive and finite, and ErrRange when the new gain leaves the normal
// float64 range, or h holds a non-finite value.
func (h Transfer) ToBandpass(centerHz, widthHz float64) (Transfer, error) {
	w0, bw, err := h.bandArgs(centerHz, widthHz)
	if err != nil {
		return Transfer{}, err
	}
	c := complex(w0*w0, 0)
	if math.IsInf(w0*w0, 0) {
		return Transfer{}, fmt.Errorf("filter: centerHz %g Hz too high for float64: %w", centerHz, ErrRange)
	}
	cb := complex(bw, 0)
	mapB := func(r complex128) complex128 { return r * cb }
	// One backing array for both, poles first; each slice's capacity ends
	// at its final length (the zeros at the origin included), so neither
	// an append here nor a caller's later one can overwrite the other.
	nz := 2*len(h.Zeros) + max(len(h.Poles)-len(h.Zeros), 0)
	np := 2*len(h.Poles) + max(len(h.Zeros)-len(h.Poles), 0)
	buf := make([]complex128, np+nz)
	poles := bandRootsInto(buf[:0:np], h.Poles, mapB, c)
	zeros := bandRootsInto(buf[np:np:np+nz], h.Zeros, mapB, c)
	g := newScaled(h.Gain)
	d := len(h.Poles) - len(h.Zeros)
	for ; d > 0; d-- {
		g = g.mul(cb)
		zeros = append(zeros, 0)
	}
	for ; d < 0; d++ {
		g = g.div(cb)
		poles = append(poles, 0)
	}
	out := Transfer{Zeros: zeros, Poles: poles}
	return finish(out, g, inLHP(h.Poles), "bandpass")
}

// ToBandstop returns the bandstop filter whose passband edges are where the
// prototype's 1 rad/s edge lands: f1·f2 = centerHz² and f2 − f1 = widthHz,
// the stopband lying between them. It substitutes s → B·s/(s² + ω0²) with
// ω0 = 2π·centerHz, B = 2π·widthHz: each pole p becomes the two roots of
// s² − (B/p)·s + ω0², each non-zero finite zero likewise, the zeros at
// infinity become zero pairs at ±jω0, and the gain becomes
// Gain·Re(Π(−z)/Π(−p)), a zero at the origin counting as B (it becomes a
// zero at the origin and one at infinity). |H_bs| at f equals |H_bp| of
// the same centre and width at the frequency where the two substitutions
// are reciprocal.
//
// The error wraps ErrFrequency for a centerHz or widthHz that is not
// positive and finite, and ErrRange when the new gain leaves the normal
// float64 range, or h holds a non-finite value.
func (h Transfer) ToBandstop(centerHz, widthHz float64) (Transfer, error) {
	w0, bw, err := h.bandArgs(centerHz, widthHz)
	if err != nil {
		return Transfer{}, err
	}
	if math.IsInf(w0*w0, 0) {
		return Transfer{}, fmt.Errorf("filter: centerHz %g Hz too high for float64: %w", centerHz, ErrRange)
	}
	c := complex(w0*w0, 0)
	cb := complex(bw, 0)
	g := newScaled(h.Gain)
	var nzFinite, npFinite []complex128
	var zeros, poles []complex128
	originZeros, originPoles := 0, 0
	for _, z := range h.Zeros {
		if z == 0 {
			g = g.mul(cb)
			originZeros++
			continue
		}
		g = g.mul(-z)
		nzFinite = append(nzFinite, z)
	}
	for _, p := range h.Poles {
		if p == 0 {
			g = g.div(cb)
			originPoles++
			continue
		}
		g = g.div(-p)
		npFinite = append(npFinite, p)
	}
	mapB := func(r complex128) complex128 { return cb / r }
	zeros = bandRoots(nzFinite, mapB, c, 0)
	poles = bandRoots(npFinite, mapB, c, 0)
	for range originZeros {
		zeros = append(zeros, 0)
	}
	for range originPoles {
		poles = append(poles, 0)
	}
	jw := complex(0, w0)
	for d := len(h.Poles) - len(h.Zeros); d > 0; d-- {
		zeros = append(zeros, jw, -jw)
	}
	for d := len(h.Poles) - len(h.Zeros); d < 0; d++ {
		poles = append(poles, jw, -jw)
	}
	out := Transfer{Zeros: zeros, Poles: poles}
	return finish(out, g, inLHP(h.Poles), "bandstop")
}

// finish gives out its gain g (what names the transform in an error) and
// checks that the mapped poles and zeros stayed finite and, when the
// input's poles lay in the open left half-plane (lhp, inLHP), that the
// mapped poles did too, then compacts out.
func finish(out Transfer, g scaled, lhp bool, what string) (Transfer, error) {
	var err error
	if out.Gain, err = g.realOf(what, " gain"); err != nil {
		return Transfer{}, err
	}
	if err := checkMapped("poles", out.Poles, lhp); err != nil {
		return Transfer{}, err
	}
	if err := checkMapped("zeros", out.Zeros, false); err != nil {
		return Transfer{}, err
	}
	return out.compact(), nil
}

// compact returns h with empty pole and zero lists as nil, so that every
// transform gives one representation of "none" (the one JSON decoding
// gives back).
func (h Transfer) compact() Transfer {
	if len(h.Zeros) == 0 {
		h.Zeros = nil
	}
	if len(h.Poles) == 0 {
		h.Poles = nil
	}
	return h
}

// bandArgs checks the arguments of the band transforms and h's roots, and
// returns the centre and width in rad/s.
func (h Transfer) bandArgs(centerHz, widthHz float64) (w0, bw float64, err error) {
	if err := checkFreq("centerHz", centerHz); err != nil {
		return 0, 0, err
	}
	if err := checkFreq("widthHz", widthHz); err != nil {
		return 0, 0, err
	}
	if err := h.checkRoots(); err != nil {
		return 0, 0, err
	}
	return 2 * math.Pi * centerHz, 2 * math.Pi * widthHz, nil
}
