package topology

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/mna"
)

// OpAmp is a non-ideal op-amp model used for every op-amp of a circuit:
// open-loop gain A(s) = A0/(1 + s·A0/(2π·GBWHz)) (one dominant pole; the
// unity-gain frequency is GBWHz) and open-loop output resistance ROutOhm.
//
// Zero values mean "this imperfection absent": DCGain 0 is an infinite DC
// gain (the integrator model A(s) = 2π·GBWHz/s), GBWHz 0 an infinite
// gain-bandwidth, ROutOhm 0 no output resistance; OpAmp{} is the ideal
// op-amp. +Inf is accepted for DCGain and GBWHz with the same meaning.
type OpAmp struct {
	GBWHz, DCGain, ROutOhm float64
}

func (op OpAmp) amp() (mna.Amp, error) {
	a := mna.Amp{DCGain: op.DCGain, GBWHz: op.GBWHz, ROutOhm: op.ROutOhm}
	if err := a.Check(); err != nil {
		return a, fmt.Errorf("topology: op-amp %+v: %v: %w", op, err, ErrOpAmp)
	}
	return a, nil
}

// AtHzWith returns the circuit's response at f hertz with every op-amp
// replaced by op, from the nodal analysis of its parts. It does not
// allocate. Special cases as AtHz; bad op-amp parameters (negative, NaN,
// infinite output resistance) give NaN.
func (c Circuit) AtHzWith(op OpAmp, f float64) complex128 {
	a, err := op.amp()
	if err != nil {
		return cmplx.NaN()
	}
	return c.at(a, f)
}

// rationalWith returns the circuit's transfer with op-amp model a as a
// rational function (degree up to capacitors + op-amps).
func (c Circuit) rationalWith(a mna.Amp) (mna.Rational, error) {
	d, err := c.design()
	if err != nil {
		return mna.Rational{}, err
	}
	v := c.Values()
	if err := checkValues(d, v); err != nil {
		return mna.Rational{}, err
	}
	r, err := mna.RationalOf(&d.net, v, a, 0)
	if err != nil {
		return mna.Rational{}, fmt.Errorf("topology: %v: %w", err, ErrParts)
	}
	return r, nil
}

// PolesZerosWith returns the poles and zeros (rad/s) and the gain factor of
// the circuit's transfer function with op-amp model op, H(s) =
// k·Π(s − zeros)/Π(s − poles), from the nodal analysis: the op-amps' own
// poles appear beside the stage's. With OpAmp{} these are the ideal
// circuit's.
func (c Circuit) PolesZerosWith(op OpAmp) (zeros, poles []complex128, k float64, err error) {
	a, err := op.amp()
	if err != nil {
		return nil, nil, 0, err
	}
	r, err := c.rationalWith(a)
	if err != nil {
		return nil, nil, 0, err
	}
	zeros, poles, k, err = r.ZerosPoles()
	if err != nil {
		return nil, nil, 0, fmt.Errorf("topology: %v: %w", err, ErrParts)
	}
	return zeros, poles, k, nil
}

// Transfer returns the circuit's transfer function (ideal op-amps) in
// factored form, from the nodal analysis of its parts.
func (c Circuit) Transfer() (filter.Transfer, error) {
	z, p, k, err := c.PolesZerosWith(OpAmp{})
	if err != nil {
		return filter.Transfer{}, err
	}
	return filter.Transfer{Zeros: z, Poles: p, Gain: k}, nil
}

// DominantWith returns the pole frequency and Q of the circuit's stage
// poles with op-amp model op: the pole (pair) of the non-ideal circuit
// nearest to the ideal circuit's, whose frequency is |p|/2π and whose Q is
// √(p1·p2)/(−(p1+p2)) (0 for first-order stages).
func (c Circuit) DominantWith(op OpAmp) (f0Hz, q float64, err error) {
	_, ideal, _, err := c.PolesZerosWith(OpAmp{})
	if err != nil {
		return 0, 0, err
	}
	_, poles, _, err := c.PolesZerosWith(op)
	if err != nil {
		return 0, 0, err
	}
	if len(poles) < len(ideal) || len(ideal) == 0 {
		return 0, 0, fmt.Errorf("topology: non-ideal circuit has %d poles, ideal %d: %w", len(poles), len(ideal), ErrOpAmp)
	}
	used := make([]bool, len(poles))
	match := make([]complex128, len(ideal))
	for i, pi := range ideal {
		best, bi := math.Inf(1), -1
		for j, pj := range poles {
			if used[j] {
				continue
			}
			if d := cmplx.Abs(pj - pi); d < best {
				best, bi = d, j
			}
		}
		used[bi] = true
		match[i] = poles[bi]
	}
	if len(match) == 1 {
		return cmplx.Abs(match[0]) / (2 * math.Pi), 0, nil
	}
	prod := real(match[0] * match[1])
	sum := real(match[0] + match[1])
	if !(prod > 0) || !(sum < 0) {
		return 0, 0, fmt.Errorf("topology: dominant poles %v are unstable: %w", match, ErrOpAmp)
	}
	w0 := math.Sqrt(prod)
	return w0 / (2 * math.Pi), w0 / -sum, nil
}

// deviation returns the largest relative error, with op against the ideal
// circuit, of f0, of Q, and of the gain magnitude |H| at fTest (which
// catches what the stage's poles alone do not show: a follower's own pole,
// a gain error from a finite DC gain).
func (c Circuit) deviation(op OpAmp, f0, q, fTest float64) (float64, error) {
	f, qq, err := c.DominantWith(op)
	if err != nil {
		return math.Inf(1), err
	}
	e := math.Abs(f/f0 - 1)
	if q > 0 {
		e = math.Max(e, math.Abs(qq/q-1))
	}
	e = math.Max(e, math.Abs(cmplx.Abs(c.AtHzWith(op, fTest))/cmplx.Abs(c.AtHz(fTest))-1))
	return e, nil
}

// gainTestHz is where deviation compares gains: f0, or for a notch the one
// of f0/3, f0 and 3·f0 where the ideal gain is largest (a symmetric notch
// has no gain at f0).
func (c Circuit) gainTestHz(f0 float64) float64 {
	if c.Stage.Kind != filter.NotchStage {
		return f0
	}
	best, fb := -1.0, f0
	for _, f := range []float64{f0 / 3, f0, 3 * f0} {
		if g := cmplx.Abs(c.AtHz(f)); g > best {
			best, fb = g, f
		}
	}
	return fb
}

// DefaultMaxErr is the f0 and Q error RequiredGBWHz allows when given 0.
const DefaultMaxErr = 0.01

// RequiredGBWHz returns the least gain-bandwidth product, in hertz, of an
// op-amp with infinite DC gain (A(s) = 2π·GBW/s) and no output resistance
// that keeps the circuit's f0 and Q, and its gain magnitude at f0 (for a
// notch at f0/3, f0 or 3·f0, wherever its ideal gain is largest), within
// maxErr (relative; 0 means DefaultMaxErr, 1 %) of the ideal circuit's,
// found with the non-ideal op-amps in the nodal analysis (DominantWith,
// AtHzWith), not by a rule of thumb. The gain at f0 is part of the test
// because the poles alone miss a buffer's own pole (an RC + follower keeps
// its RC pole exactly, whatever the op-amp). See RequiredGBWHzWith.
func (c Circuit) RequiredGBWHz(maxErr float64) (float64, error) {
	return c.RequiredGBWHzWith(OpAmp{}, maxErr)
}

// RequiredGBWHzWith is RequiredGBWHz for an op-amp with op's DCGain and
// ROutOhm (op.GBWHz is ignored). The search steps up from F0Hz/10 by
// factors of 2 to the first GBW that meets maxErr, then bisects in log GBW
// to 1e-6 relative. Errors wrap ErrOpAmp when maxErr is negative or NaN or
// when no GBW up to 1e9·F0Hz meets it (a DC gain too low for maxErr).
func (c Circuit) RequiredGBWHzWith(op OpAmp, maxErr float64) (float64, error) {
	if maxErr == 0 {
		maxErr = DefaultMaxErr
	}
	if !(maxErr > 0) || math.IsInf(maxErr, 0) {
		return 0, fmt.Errorf("topology: maxErr %g must be positive and finite: %w", maxErr, ErrOpAmp)
	}
	ach, err := c.Achieved()
	if err != nil {
		return 0, err
	}
	fTest := c.gainTestHz(ach.F0Hz)
	test := func(gbw float64) bool {
		o := op
		o.GBWHz = gbw
		e, err := c.deviation(o, ach.F0Hz, ach.Q, fTest)
		return err == nil && e <= maxErr
	}
	lo := ach.F0Hz / 10
	hi := lo
	for !test(hi) {
		lo = hi
		hi *= 2
		if hi > 1e9*ach.F0Hz {
			return 0, fmt.Errorf("topology: no gain-bandwidth up to %g Hz keeps f0 and Q within %g: %w", hi, maxErr, ErrOpAmp)
		}
	}
	if hi == lo {
		return hi, nil
	}
	for hi/lo > 1+1e-6 {
		mid := math.Sqrt(lo * hi)
		if test(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, nil
}

// RuleOfThumbGBWHz returns the common rule of thumb for the op-amp
// gain-bandwidth a stage needs, 100·max(1, |Gain|)·max(1, Q)·F0Hz (common
// practice; it ignores the circuit's noise gain and topology), for
// comparison with RequiredGBWHz.
func (c Circuit) RuleOfThumbGBWHz() float64 {
	return 100 * math.Max(1, math.Abs(c.Stage.Gain)) * math.Max(1, c.Stage.Q) * c.Stage.F0Hz
}

// SlewRateVPerUs returns the least slew rate, in volts per microsecond,
// for a sine of peak amplitude peakV volts at freqHz hertz: the sine's
// largest slope 2π·f·Vpeak (common practice: choose an op-amp with some
// margin above it).
//
// Special cases are:
//
//	SlewRateVPerUs(peakV, f) = NaN for peakV ≤ 0, NaN or ±Inf
//	SlewRateVPerUs(v, freqHz) = NaN for freqHz ≤ 0, NaN or ±Inf
func SlewRateVPerUs(peakV, freqHz float64) float64 {
	if !(peakV > 0) || math.IsInf(peakV, 1) || !(freqHz > 0) || math.IsInf(freqHz, 1) {
		return math.NaN()
	}
	return 2 * math.Pi * freqHz * peakV / 1e6
}

// Predistort returns a copy of c whose parts are synthesized (with c's
// capacitors kept) for a predistorted stage, so that with every op-amp
// replaced by op the circuit's dominant f0 and Q (DominantWith) equal
// c.Stage's to 1e-9 relative. The returned circuit's Stage is the
// predistorted target the parts were synthesized for (its ideal response is
// off by design); the gain is not predistorted. Errors wrap ErrOpAmp when
// the iteration does not converge in 60 steps (an op-amp far too slow for
// the stage) and the synthesis errors.
func (c Circuit) Predistort(op OpAmp) (Circuit, error) {
	if _, err := op.amp(); err != nil {
		return Circuit{}, err
	}
	target := c.Stage
	st := target
	cur := c
	for range 60 {
		f, q, err := cur.DominantWith(op)
		if err != nil {
			return Circuit{}, err
		}
		ef := target.F0Hz / f
		eq := 1.0
		if target.Order == 2 {
			eq = target.Q / q
		}
		if math.Abs(ef-1) <= 1e-10 && math.Abs(eq-1) <= 1e-10 {
			return cur, nil
		}
		st.F0Hz *= ef
		if target.Order == 2 {
			st.Q *= eq
		}
		d, err := designFor(c.Kind, st)
		if err != nil {
			return Circuit{}, err
		}
		v := cur.Values()
		if len(v) != len(d.refs) {
			return Circuit{}, fmt.Errorf("topology: predistortion changes the %v template: %w", c.Kind, ErrUnrealizable)
		}
		if err := d.synth(st, 0, v, true); err != nil {
			return Circuit{}, err
		}
		cur = Circuit{Kind: c.Kind, Stage: st, Parts: make([]Part, len(v))}
		for i, x := range v {
			if !(x > 0) || math.IsInf(x, 0) {
				return Circuit{}, unrealizable(c.Kind, st, "predistortion gives %s = %g", d.refs[i], x)
			}
			cur.Parts[i] = Part{Ref: d.refs[i], Value: x}
		}
	}
	return Circuit{}, fmt.Errorf("topology: predistortion for %+v did not converge: %w", op, ErrOpAmp)
}
