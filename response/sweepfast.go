package response

import (
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// This file is the fast path of SweepInto for a filter.Transfer. It
// computes the same quantities as phaseDelay and gainDB (sweep.go), with
// the same branch conventions, but with one atan2 and one logarithm per
// frequency instead of one atan2 per pole and zero and a complex division
// per factor:
//
//   - A conjugate pair r, r̄ = −a ± jβ (a ≥ 0 after the on-axis rounding of
//     factorParts) is one quadratic factor of jω,
//     (jω − r)(jω − r̄) = (a² + (β−ω)(β+ω)) + j·2aω,
//     whose principal argument is exactly the sum of the two factors'
//     arguments (each lies in [−π/2, π/2], the sum in [−π, π] and on the
//     branch atan2 returns), and whose delay term is the derivative of that
//     argument, 2a(a² + β² + ω²)/|f|² (common practice: differentiate
//     atan2(2aω, a² + β² − ω²)). The real part is formed as
//     a² + (β−ω)(β+ω) so that it keeps its relative accuracy near ω = β.
//   - A zero pair on the jω axis (a = 0: the transmission zeros of
//     elliptic and inverse Chebyshev filters) is the real factor
//     (β−ω)(β+ω), whose argument is 0 or ±π (+π for ω > β, as the two
//     factors' ±π/2 sum to).
//   - Every other root (real, unpaired, or in the right half-plane) is its
//     own factor a + jb, b = ω − Im r.
//   - The arguments are summed without evaluating them: the complex product
//     P of the zero factors and of the conjugates of the pole factors (each
//     pole factor as conj(f)/|f|², which keeps P of the size of H) carries
//     the sum modulo 2π, and the number of whole turns is counted as the
//     product is formed. A multiplier in the closed upper half-plane (sign
//     bit of its imaginary part clear) turns P by an angle in [0, π]; P then
//     passes the negative real axis exactly when it goes from the upper to
//     the lower half-plane, classified by the sign bit as atan2 does. A
//     multiplier in the lower half-plane turns it by an angle in [−π, 0],
//     and the mirror rule applies. The sign-bit classification is the one
//     atan2 uses, and where the rule could be misled by rounding (P and the
//     multiplier both within rounding of the real axis) the two terms of
//     the new imaginary part have the same sign, so there is no
//     cancellation: the count is exact. The phase is atan2(Im P, Re P) plus
//     2π times the count.
//   - A right-half-plane root's argument is on the branch (π/2, 3π/2) of
//     factorArg, which differs from the principal one by 2π where b < 0;
//     the count adds that turn.
//   - P is rescaled by exact powers of two when it leaves [2⁻⁴⁰⁰, 2⁴⁰⁰], so
//     the gain of a high-order filter far in its stopband neither
//     underflows nor overflows; the scale enters the gain in dB (where |H|
//     is below the smallest float64, this gives its true gain, where the
//     per-factor product, and At, give 0 and −Inf dB).
//
// A frequency where this cannot be done (a factor exactly zero, a factor
// whose squared size overflows) is computed by the per-factor path of
// sweep.go instead, so the results are those documented on SweepInto.

// prodHi and prodLo bound the running product; rescaling multiplies it by
// 2^∓prodShift, exactly.
const (
	prodHi    = 0x1p400
	prodLo    = 0x1p-400
	prodShift = 800
)

// degPerRad is 180/π: the fast path multiplies by it instead of
// dividing (within an ulp of ph·180/π).
const degPerRad = 180 / math.Pi

// db20Log2 is 20·log10(2), the gain in dB of one binary exponent.
const db20Log2 = 6.020599913279624

// pairFactor is a conjugate pair −a ± jβ (a ≥ 0, β > 0) as a quadratic
// factor: a2 = a², c1 = 2a, c0 = a² + β².
type pairFactor struct{ a2, beta, c1, c0 float64 }

// factorSet is a Transfer's zeros or poles split into conjugate pairs and
// single roots, held in fixed arrays so that a sweep does not allocate.
type factorSet struct {
	pairs      [maxFastPairs]pairFactor
	axis       [maxFastPairs]float64 // β of pairs on the jω axis (a = 0)
	singles    [maxFastSingles]complex128
	np, na, ns int
}

// maxFastPairs and maxFastSingles bound the factors the fast path holds; a
// Transfer with more is swept by the per-factor path.
const (
	maxFastPairs   = 64
	maxFastSingles = 16
)

// split fills s from roots: two adjacent exact conjugates with a ≥ 0 (left
// half-plane, or on the jω axis after the rounding of factorParts) form a
// pair, kept apart in axis when a = 0 and axisOK (zeros); every other
// root is single. It reports false when the arrays are too small.
func (s *factorSet) split(roots []complex128, axisOK bool) bool {
	s.np, s.na, s.ns = 0, 0, 0
	for i := 0; i < len(roots); {
		r := roots[i]
		if i+1 < len(roots) && imag(r) != 0 && roots[i+1] == complex(real(r), -imag(r)) {
			if a, _ := factorParts(r, 0); a >= 0 {
				b := math.Abs(imag(r))
				switch {
				case s.np == maxFastPairs || s.na == maxFastPairs:
					return false
				case a == 0 && axisOK:
					s.axis[s.na] = b
					s.na++
				default:
					s.pairs[s.np] = pairFactor{a2: a * a, beta: b, c1: 2 * a, c0: a*a + b*b}
					s.np++
				}
				i += 2
				continue
			}
		}
		if s.ns == maxFastSingles {
			return false
		}
		s.singles[s.ns] = r
		s.ns++
		i++
	}
	return true
}

// turnStep is the change of the whole-turn count when P = (·, pi) is
// multiplied by a number with imaginary part xi into (·, ni) (see the file
// comment), from the sign bits alone: +1 for a multiplier in the upper
// half-plane taking P from the upper to the lower half-plane, −1 for one
// in the lower half-plane taking it from the lower to the upper.
func turnStep(pi, xi, ni float64) int {
	sp := math.Float64bits(pi) >> 63
	sx := math.Float64bits(xi) >> 63
	sn := math.Float64bits(ni) >> 63
	return int((1^sx)&(1^sp)&sn) - int(sx&sp&(1^sn))
}

// singleAt multiplies (pr, pi) by the factor jω − r of a zero (pole
// false) or by conj(jω − r)/|jω − r|² of a pole, and returns the product,
// the change of the turn count (with the extra turn of a right-half-plane
// root, whose factorArg branch is (π/2, 3π/2)) and the delay term. ok is
// false when the factor is zero or its squared size not finite.
func singleAt(pr, pi float64, r complex128, w float64, pole bool) (nr, ni float64, dk int, slope float64, ok bool) {
	a, b := factorParts(r, w)
	m := a*a + b*b
	if !(m > 0 && m <= math.MaxFloat64) {
		return 0, 0, 0, 0, false
	}
	xr, xi := a, b
	if pole {
		inv := 1 / m
		xr, xi = a*inv, -b*inv
	}
	nr = pr*xr - pi*xi
	ni = pr*xi + pi*xr
	dk = turnStep(pi, xi, ni)
	if a < 0 && math.Signbit(b) {
		if pole {
			dk--
		} else {
			dk++
		}
	}
	return nr, ni, dk, a / m, true
}

// singleStep multiplies (pr, pi) by the factor of single root j of z and
// p (the zeros' first, then the poles') at ω rad/s (see singleAt) and
// returns the product, the change of the turn count and the root's term of
// the delay, with its sign (+ for a pole, − for a zero).
func singleStep(z, p *factorSet, j int, pr, pi, w float64) (nr, ni float64, dk int, delay float64, ok bool) {
	pole := j >= z.ns
	r := z.singles[min(j, maxFastSingles-1)]
	if pole {
		r = p.singles[j-z.ns]
	}
	nr, ni, dk, delay, ok = singleAt(pr, pi, r, w, pole)
	if !pole {
		delay = -delay
	}
	return nr, ni, dk, delay, ok
}

// pointFast returns the gain (dB), phase (radians) and delay (s) at
// ω rad/s of the transfer with gain g0 dB, sign flip neg, zeros z and
// poles p, or ok = false where the per-factor path must be used.
func pointFast(g0 float64, neg bool, z, p *factorSet, w float64) (gdb, phase, delay float64, ok bool) {
	pr, pi := 1.0, 0.0
	k := 0 // whole turns
	e := 0 // binary exponent of the rescaling
	w2 := w * w
	// Zero pairs on the jω axis: a real factor ωz² − ω², which turns P by
	// +π (ω > 0) or −π (ω < 0) where it is negative. Its sign flips that of
	// pi exactly, so the rule of turnStep reduces to the sign of pi before.
	up := 1 - int(math.Float64bits(w)>>63)
	for _, b := range z.axis[:z.na] {
		re := (b - w) * (b + w)
		if math.Signbit(re) {
			if low := int(math.Float64bits(pi) >> 63); up == 1 {
				k += 1 - low
			} else {
				k -= low
			}
		}
		pr, pi = pr*re, pi*re
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for _, f := range z.pairs[:z.np] {
		re := f.a2 + (f.beta-w)*(f.beta+w)
		im := f.c1 * w
		delay -= f.c1 * (f.c0 + w2) / (re*re + im*im)
		nr, ni := pr*re-pi*im, pr*im+pi*re
		k += turnStep(pi, im, ni)
		pr, pi = nr, ni
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for _, f := range p.pairs[:p.np] {
		re := f.a2 + (f.beta-w)*(f.beta+w)
		im := f.c1 * w
		m := re*re + im*im
		if !(m > 0 && m <= math.MaxFloat64) {
			return 0, 0, 0, false
		}
		inv := 1 / m
		delay += f.c1 * (f.c0 + w2) * inv
		xr, xi := re*inv, -im*inv
		nr, ni := pr*xr-pi*xi, pr*xi+pi*xr
		k += turnStep(pi, xi, ni)
		pr, pi = nr, ni
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for i := range z.ns + p.ns {
		nr, ni, dk, d, good := singleStep(z, p, i, pr, pi, w)
		if !good {
			return 0, 0, 0, false
		}
		pr, pi, k, delay = nr, ni, k+dk, delay+d
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	m := pr*pr + pi*pi
	if !(m > 0 && m <= math.MaxFloat64) {
		return 0, 0, 0, false
	}
	phase = math.Atan2(pi, pr) + 2*math.Pi*float64(k)
	if neg {
		phase += math.Pi
	}
	gdb = g0 + 10*math.Log10(m) + db20Log2*float64(e)
	return gdb, phase, delay, true
}

// zeroPairAt multiplies (pr, pi) by a zero pair's quadratic factor at
// ω > 0 (in the upper half-plane: 2aω ≥ 0) and returns the product, the
// change of the turn count (+1 from the upper to the lower half-plane) and
// the pair's delay term (w2 = ω²).
func (f *pairFactor) zeroPairAt(pr, pi, w, w2 float64) (nr, ni, delay float64, dk int) {
	re := f.a2 + (f.beta-w)*(f.beta+w)
	im := f.c1 * w
	nr, ni = pr*re-pi*im, pr*im+pi*re
	return nr, ni, f.c1 * (f.c0 + w2) / (re*re + im*im), int((math.Float64bits(ni) &^ math.Float64bits(pi)) >> 63)
}

// polePairAt multiplies (pr, pi) by a pole pair's multiplier conj(f)/|f|²
// at ω > 0 and returns the product and the pair's delay term. The
// multiplier lies in the lower half-plane: the turn count falls by one
// where the product passes from the lower to the upper half-plane
// (lowerToUpper).
func (f *pairFactor) polePairAt(pr, pi, w, w2 float64) (nr, ni, delay float64) {
	re := f.a2 + (f.beta-w)*(f.beta+w)
	im := f.c1 * w
	inv := 1 / (re*re + im*im)
	return (pr*re + pi*im) * inv, (pi*re - pr*im) * inv, f.c1 * (f.c0 + w2) * inv
}

// lowerToUpper is 1 where a product passed from the lower half-plane (pi,
// sign bit set) to the upper one (ni, sign bit clear), else 0.
func lowerToUpper(pi, ni float64) int {
	return int((math.Float64bits(pi) &^ math.Float64bits(ni)) >> 63)
}

// pointPos is pointFast for ω > 0, where the turn rule takes one form per
// kind of factor: a zero pair's factor (2aω ≥ 0) lies in the upper
// half-plane, a pole pair's multiplier conj(f)/|f|² in the lower one. A
// zero or non-finite factor needs no test of its own here: it makes the
// product 0, infinite or NaN, which the final test sends to pointFast.
func pointPos(g0 float64, neg bool, z, p *factorSet, w float64) (gdb, phase, delay float64, ok bool) {
	pr, pi := 1.0, 0.0
	k := 0 // whole turns
	e := 0 // binary exponent of the rescaling
	w2 := w * w
	for _, b := range z.axis[:z.na] {
		re := (b - w) * (b + w)
		if re < 0 {
			k += 1 - int(math.Float64bits(pi)>>63)
		}
		pr, pi = pr*re, pi*re
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for i := range z.pairs[:z.np] {
		nr, ni, d, dk := z.pairs[i].zeroPairAt(pr, pi, w, w2)
		pr, pi, k, delay = nr, ni, k+dk, delay-d
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for i := range p.pairs[:p.np] {
		nr, ni, d := p.pairs[i].polePairAt(pr, pi, w, w2)
		pr, pi, k, delay = nr, ni, k-lowerToUpper(pi, ni), delay+d
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	for i := range z.ns + p.ns {
		nr, ni, dk, d, good := singleStep(z, p, i, pr, pi, w)
		if !good {
			return 0, 0, 0, false
		}
		pr, pi, k, delay = nr, ni, k+dk, delay+d
		if s := math.Abs(pr) + math.Abs(pi); s > prodHi || s < prodLo {
			pr, pi, e = rescale(pr, pi, s, e)
		}
	}
	m := pr*pr + pi*pi
	if !(m > 0 && m <= math.MaxFloat64) {
		return 0, 0, 0, false
	}
	phase = atan2Finite(pi, pr) + 2*math.Pi*float64(k)
	if neg {
		phase += math.Pi
	}
	gdb = g0 + 10*math.Log10(m) + db20Log2*float64(e)
	return gdb, phase, delay, true
}

// sweepPlain is the loop of sweepTransferFast for a sweep whose running
// product cannot leave the range where pointPos rescales it (plainBound):
// pointPos's arithmetic in the same order, without the tests of the
// product's size, and with the point's computation inside the loop over
// the frequencies (no call per point). The axis zeros' real factors are
// multiplied into one number first; the turns they add follow from the
// count c of negative factors alone (the product's imaginary part is then
// ±0 with the sign of the product, each negative factor having turned it
// by π: atan2 of (R, ±0) plus (c+1)/2 whole turns is cπ). A point with
// ω ≤ 0 or a zero product goes to sweepPointSlow.
func sweepPlain(dst []Point, h filter.Transfer, hz []float64, g0 float64, neg bool, z, p *factorSet) {
	axis, zpairs, ppairs := z.axis[:z.na], z.pairs[:z.np], p.pairs[:p.np]
	singles := z.ns + p.ns
	ph0 := 0.0
	if neg {
		ph0 = math.Pi
	}
	dst = dst[:len(hz)]
points:
	for i, f := range hz {
		w := 2 * math.Pi * f
		if !(w > 0) {
			sweepPointSlow(dst, i, h, g0, neg, z, p, f)
			continue
		}
		w2 := w * w
		pr, c := 1.0, 0
		for _, b := range axis {
			re := (b - w) * (b + w)
			c += int(math.Float64bits(re) >> 63)
			pr *= re
		}
		pi := math.Copysign(0, pr)
		k := (c + 1) >> 1 // whole turns
		delay := 0.0
		for j := range zpairs {
			nr, ni, d, dk := zpairs[j].zeroPairAt(pr, pi, w, w2)
			pr, pi, k, delay = nr, ni, k+dk, delay-d
		}
		for j := range ppairs {
			nr, ni, d := ppairs[j].polePairAt(pr, pi, w, w2)
			pr, pi, k, delay = nr, ni, k-lowerToUpper(pi, ni), delay+d
		}
		for j := range singles {
			nr, ni, dk, d, good := singleStep(z, p, j, pr, pi, w)
			if !good {
				sweepPointSlow(dst, i, h, g0, neg, z, p, f)
				continue points
			}
			pr, pi, k, delay = nr, ni, k+dk, delay+d
		}
		m := pr*pr + pi*pi
		if !(m > 0 && m <= math.MaxFloat64) {
			sweepPointSlow(dst, i, h, g0, neg, z, p, f)
			continue
		}
		phase := atan2Finite(pi, pr) + 2*math.Pi*float64(k) + ph0
		dst[i] = Point{Hz: f, GainDB: g0 + dbPerLn*lnNormal(m), PhaseDeg: phase * degPerRad, DelayS: delay}
	}
}

// plainLimit bounds |log2| of the running product of sweepPlain: 2⁻⁵⁰⁰ to
// 2⁵⁰⁰, so that |P|², the factors' own squared sizes and the delay terms
// stay normal and finite.
const plainLimit = 500

// plainBound reports whether sweepPlain may sweep the factors z (zeros)
// and p (poles) at every frequency ω with wLo ≤ ω ≤ wHi (rad/s, wLo > 0).
// Each factor's size has bounds there: a pair's quadratic lies between a²
// (a = |Re r| > 0; |jω − r| ≥ |Re r|) and (ω + |r|)², a single root's
// factor between |Re r| (or ω for a root at the origin) and ω + |r|; an axis
// zero pair's real factor (β−ω)(β+ω) is at most (ω + β)² and, unless it is
// exactly zero (which makes the whole product zero, a case sweepPlain
// hands back), at least β²·2⁻⁵⁴ in size: two different floats differ by at
// least an ulp of the lesser, more than 2⁻⁵³ of it, so |β − ω| > 2⁻⁵⁴·β
// where ω ≥ β/2 (and β + ω ≥ β), and |β − ω| ≥ β/2 below. The running
// product after any number of factors then lies between the sums of the
// negative parts and of the positive parts of the factors' log bounds,
// which must stay within ±plainLimit. Any root on the jω axis other than those (an unpaired one, a
// pole) makes it report false.
func plainBound(z, p *factorSet, wLo, wHi float64) bool {
	if !(wLo > 0 && wHi <= 0x1p200) {
		return false
	}
	lo, hi := 0, 0 // sums of the negative and the positive log2 bounds
	add := func(l, h int, pole bool) {
		if pole {
			l, h = -h, -l
		}
		lo += min(l, 0)
		hi += max(h, 0)
	}
	// lg returns ⌊log2 v⌋ − 1 and ⌈log2 v⌉ + 1 bounds for positive finite v
	// (a NaN or a zero gives bounds beyond any limit).
	lg := func(v float64) (int, int) {
		if !(v > 0 && v <= math.MaxFloat64) {
			return -1 << 20, 1 << 20
		}
		_, e := math.Frexp(v) // v in [2^(e−1), 2^e)
		return e - 2, e + 1
	}
	for _, b := range z.axis[:z.na] {
		l, _ := lg(b * b * 0x1p-54)
		_, h := lg((wHi + b) * (wHi + b))
		add(l, h, false)
	}
	for i, set := range [2]*factorSet{z, p} {
		for _, f := range set.pairs[:set.np] {
			r := math.Sqrt(f.c0)
			l, _ := lg(f.a2)
			_, h := lg((wHi + r) * (wHi + r))
			add(l, h, i == 1)
		}
		for _, r := range set.singles[:set.ns] {
			a := math.Abs(real(r))
			if a <= onAxisRel*(math.Abs(real(r))+math.Abs(imag(r))) {
				if imag(r) != 0 {
					return false
				}
				a = wLo // a root at the origin: |jω| = ω
			}
			l, _ := lg(a)
			_, h := lg(wHi + cmplx.Abs(r))
			add(l, h, i == 1)
		}
	}
	return lo >= -plainLimit && hi <= plainLimit
}

// lnTableBits is the number of leading mantissa bits that index the
// logarithm's table (256 entries).
const lnTableBits = 8

// lnInv and lnTab are the logarithm's table: for the mantissas m in
// [1 + i/256, 1 + (i+1)/256), lnInv[i] is 1/(1 + (i + 1/2)/256) rounded to
// float64 and lnTab[i] = −ln(lnInv[i]) of that rounded value, so that
// ln m = lnTab[i] + ln(m·lnInv[i]) holds whatever the rounding of lnInv.
var lnInv, lnTab = func() (inv, tab [1 << lnTableBits]float64) {
	for i := range inv {
		inv[i] = 1 / (1 + (float64(i)+0.5)/(1<<lnTableBits))
		tab[i] = -math.Log(inv[i])
	}
	return inv, tab
}()

// lnNormal returns ln x for a positive normal finite x (the sweep's |H|²
// within 2^±1000, by plainBound), without a division: x = 2^e·m with m in
// [1, 2), m·lnInv[i] = 1 + r with |r| < 2⁻⁹, and ln(1 + r) by its Taylor
// series to r⁵ (the first term left out, r⁶/6, is below 1e-17). Its error
// is a few 1e-16 absolute plus an ulp of the result (the rounding of m·lnInv,
// of the table, and of e·ln 2, whose float64 constant is within 2.3e-17 of
// ln 2: 2.3e-14 at e = 1000, a fifth of an ulp of 693), far inside the
// sweep's gain accuracy (TestLnNormal). It is small enough to be inlined in
// the sweep's loop, where a call would spill every live register.
func lnNormal(x float64) float64 {
	b := math.Float64bits(x)
	i := (b >> (52 - lnTableBits)) & (1<<lnTableBits - 1)
	r := math.Float64frombits(b&(1<<52-1)|1023<<52)*lnInv[i] - 1 // exact subtraction: within 2⁻⁹ of 1
	p := r + r*r*(-1.0/2+r*(1.0/3+r*(-1.0/4+r*(1.0/5))))
	return float64(int(b>>52)-1023)*math.Ln2 + (lnTab[i] + p)
}

// dbPerLn is 10/ln 10: 10·log10 x = dbPerLn·ln x.
const dbPerLn = 10 / math.Ln10

// atan2Finite is math.Atan2 for finite y and x, not both zero, to within
// an ulp or two of it (TestAtan2Finite): the same reduction to [0, π/4]
// octant by octant and the same rational approximation (the Cephes one
// that Go's math package uses, S. L. Moshier, Cephes Math Library,
// atan.c; coefficients as Go's math/atan.go gives them), but with the
// reduced argument formed from y and x by one division, where math.Atan2
// divides y by x and then reduces the quotient by a second division, and
// without the tests for NaN and infinities.
func atan2Finite(y, x float64) float64 {
	const (
		morebits = 6.123233995736765886130e-17 // π/2 = math.Pi/2 + morebits
		tan3pio8 = 2.41421356237309504880      // tan(3π/8)
	)
	switch {
	case y == 0:
		if x >= 0 && !math.Signbit(x) {
			return math.Copysign(0, y)
		}
		return math.Copysign(math.Pi, y)
	case x == 0:
		return math.Copysign(math.Pi/2, y)
	}
	ay, ax := math.Abs(y), math.Abs(x)
	var q float64
	switch {
	case ay <= 0.66*ax:
		q = atanKernel(ay / ax)
	case ay > tan3pio8*ax:
		q = math.Pi/2 - atanKernel(ax/ay) + morebits
	default:
		// atan(t) = π/4 + atan((t−1)/(t+1)), t = ay/ax. Here ay and ax are
		// within a factor 2.5 of each other, so scaling both by 1/4 near
		// the top of the range (their sum would overflow) is exact.
		if ay > 0x1p1000 {
			ay, ax = ay/4, ax/4
		}
		q = math.Pi/4 + atanKernel((ay-ax)/(ay+ax)) + 0.5*morebits
	}
	if x < 0 {
		q = math.Pi - q
	}
	return math.Copysign(q, y)
}

// atanKernel is the rational approximation of atan on |t| ≤ 0.66 (Cephes
// atan.c, as Go's math package has it).
func atanKernel(t float64) float64 {
	const (
		p0 = -8.750608600031904122785e-01
		p1 = -1.615753718733365076637e+01
		p2 = -7.500855792314704667340e+01
		p3 = -1.228866684490136173410e+02
		p4 = -6.485021904942025371773e+01
		q0 = +2.485846490142306297962e+01
		q1 = +1.650270098316988542046e+02
		q2 = +4.328810604912902668951e+02
		q3 = +4.853903996359136964868e+02
		q4 = +1.945506571482613964425e+02
	)
	z := t * t
	z = z * ((((p0*z+p1)*z+p2)*z+p3)*z + p4) / (((((z+q0)*z+q1)*z+q2)*z+q3)*z + q4)
	return t*z + t
}

// rescale multiplies (pr, pi), of size s = |pr| + |pi| outside
// [prodLo, prodHi], by 2^∓prodShift and updates the exponent e. A zero or
// non-finite product is returned as it is (the caller falls back).
func rescale(pr, pi, s float64, e int) (float64, float64, int) {
	switch {
	case s > prodHi && s <= math.MaxFloat64:
		return pr * 0x1p-800, pi * 0x1p-800, e + prodShift
	case s < prodLo && s > 0:
		return pr * 0x1p800, pi * 0x1p800, e - prodShift
	}
	return pr, pi, e
}

// sweepTransferFast is sweepTransfer by pointFast, falling back per
// frequency (or, for a Transfer with more factors than the fast path
// holds, entirely) to the per-factor path. It does not allocate.
func sweepTransferFast(dst []Point, h filter.Transfer, hz []float64) {
	var z, p factorSet
	if !z.split(h.Zeros, true) || !p.split(h.Poles, false) {
		sweepTransfer(dst, h, hz)
		return
	}
	g0 := 20 * math.Log10(math.Abs(h.Gain))
	neg := h.Gain < 0
	// The range of the positive frequencies, for plainBound.
	wLo, wHi := math.Inf(1), 0.0
	for _, f := range hz {
		if f > 0 { // plain comparisons: no NaN here, and cheaper than min
			if f < wLo {
				wLo = f
			}
			if f > wHi {
				wHi = f
			}
		}
	}
	if plainBound(&z, &p, 2*math.Pi*wLo, 2*math.Pi*wHi) {
		sweepPlain(dst, h, hz, g0, neg, &z, &p)
		return
	}
	sweepRescaled(dst, h, hz, g0, neg, &z, &p)
}

// sweepRescaled is the loop of sweepTransferFast where plainBound does not
// hold: pointPos for ω > 0, the running product rescaled as it goes, and
// sweepPointSlow where that cannot be done.
func sweepRescaled(dst []Point, h filter.Transfer, hz []float64, g0 float64, neg bool, z, p *factorSet) {
	for i, f := range hz {
		w := 2 * math.Pi * f
		if w > 0 {
			if gdb, ph, d, ok := pointPos(g0, neg, z, p, w); ok {
				dst[i] = Point{Hz: f, GainDB: gdb, PhaseDeg: ph * degPerRad, DelayS: d}
				continue
			}
		}
		sweepPointSlow(dst, i, h, g0, neg, z, p, f)
	}
}

// sweepPointSlow sets dst[i], at f Hz, by pointFast, or where that cannot
// be done by the per-factor path of sweep.go.
func sweepPointSlow(dst []Point, i int, h filter.Transfer, g0 float64, neg bool, z, p *factorSet, f float64) {
	w := 2 * math.Pi * f
	if gdb, ph, d, ok := pointFast(g0, neg, z, p, w); ok {
		dst[i] = Point{Hz: f, GainDB: gdb, PhaseDeg: ph * degPerRad, DelayS: d}
		return
	}
	ph, d := phaseDelay(h, w)
	dst[i] = Point{Hz: f, GainDB: gainDB(h.At(complex(0, w))), PhaseDeg: ph * 180 / math.Pi, DelayS: d}
	if math.IsNaN(f) {
		dst[i] = Point{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
	}
}
