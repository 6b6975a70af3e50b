package topology

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/mna"
)

// Errors of the allocation-free paths, prebuilt so that returning them
// does not allocate.
var (
	errValueCount   = fmt.Errorf("topology: number of values differs from the number of parts: %w", ErrParts)
	errValueBad     = fmt.Errorf("topology: part value not positive and finite: %w", ErrParts)
	errCoefficients = fmt.Errorf("topology: circuit transfer is not of second order with these values: %w", ErrParts)
	errSingular     = fmt.Errorf("topology: circuit matrix singular at a sample frequency (unstable or floating circuit): %w", ErrParts)
)

// valuesOf copies c's part values into buf and checks them.
func valuesOf(d *design, parts []Part, buf *[maxParts]float64) ([]float64, error) {
	v := buf[:len(parts)]
	for i, p := range parts {
		if !(p.Value > 0) || math.IsInf(p.Value, 0) {
			return nil, errValueBad
		}
		v[i] = p.Value
	}
	return v, nil
}

// AtHz returns the circuit's frequency response V(out)/V(in) at f hertz,
// computed by nodal analysis of its template with its part values and
// ideal op-amps (exact nullors, not a large gain). It does not allocate.
//
// Special cases are: a Circuit whose Kind, Stage and Parts do not fit a
// template, or with a non-positive part, gives NaN; f = 0 is DC; a frequency
// so high that the nodal matrix (entries 2π·f·C) overflows float64 in the
// elimination, above about 1e150 Hz for realistic parts, gives NaN rather
// than a value (no circuit is analyzed there: the model stops meaning
// anything many decades lower).
func (c Circuit) AtHz(f float64) complex128 {
	return c.at(mna.Amp{}, f)
}

func (c Circuit) at(a mna.Amp, f float64) complex128 {
	nan := cmplx.NaN()
	d, err := c.design()
	if err != nil {
		return nan
	}
	var buf [maxParts]float64
	v, err := valuesOf(d, c.Parts, &buf)
	if err != nil {
		return nan
	}
	var w mna.Workspace
	h, _, err := w.Transfer(&d.net, v, a, complex(0, 2*math.Pi*f))
	if err != nil {
		return nan
	}
	return h
}

// Inverting reports whether the circuit's AtHz is the negative of its
// Stage's transfer function. For a positive Stage.Gain that is the
// circuit's own inversion: multiple feedback and inverting first-order
// circuits invert; the state-variable lowpass and highpass outputs invert
// (bandpass and notch do not); the Tow-Thomas bandpass and notch outputs
// invert (lowpass does not); the Sallen-Key and RC + follower circuits do
// not. A negative Stage.Gain is realized with |Gain|, so it flips the
// answer: a Sallen-Key stage of gain −2 is Inverting (its output is +2·H,
// the stage asks for −2·H). False for a Circuit that fits no template.
//
// The answer is read off the circuit itself: the sign of AtHz against the
// stage's transfer function at a frequency near F0Hz where the stage is not
// zero (the two agree up to that sign to about 1e-9), so it holds whatever
// way a kind realizes a negative gain.
func (c Circuit) Inverting() bool {
	if _, err := c.design(); err != nil {
		return false
	}
	h := c.Stage.Transfer()
	for _, k := range [...]float64{1, 0.7, 1.3, 0.5, 2} {
		f := k * c.Stage.F0Hz
		want := h.AtHz(f)
		if cmplx.Abs(want) > 1e-6*math.Abs(c.Stage.Gain) {
			return real(c.AtHz(f)/want) < 0
		}
	}
	return false
}

// OpAmps returns the number of op-amps of the circuit (0 for a Circuit that
// fits no template).
func (c Circuit) OpAmps() int {
	d, err := c.design()
	if err != nil {
		return 0
	}
	return len(d.amps)
}

// Values returns the part values in Parts order (a new slice).
func (c Circuit) Values() []float64 {
	v := make([]float64, len(c.Parts))
	for i, p := range c.Parts {
		v[i] = p.Value
	}
	return v
}

// WithValues returns a copy of c with the part values replaced, in Parts
// order. The error wraps ErrParts for a wrong count or a value that is not
// positive and finite (and the template errors of a Circuit that fits no
// template).
func (c Circuit) WithValues(values []float64) (Circuit, error) {
	d, err := c.design()
	if err != nil {
		return Circuit{}, err
	}
	if err := checkValues(d, values); err != nil {
		return Circuit{}, err
	}
	out := Circuit{Kind: c.Kind, Stage: c.Stage, Parts: make([]Part, len(values))}
	for i, x := range values {
		out.Parts[i] = Part{Ref: d.refs[i], Value: x}
	}
	return out, nil
}

// Refit holds the given capacitors at the given values (typically snapped
// to a standard series; capacitors not named keep their values) and
// re-solves the resistors with the kind's own synthesis equations so that
// the circuit realizes c.Stage again. Where a kind's gain is a capacitor
// ratio (multiple-feedback highpass, highpass with a capacitive input
// attenuator) or the amplifier gain itself (equal-component Sallen-Key
// without attenuator: K follows Q and the capacitor ratio) the gain follows
// the capacitors; f0, Q and a notch's zero are exact.
//
// Errors wrap ErrParts (an unknown reference, a resistor, a value not
// positive and finite) or ErrUnrealizable (e.g. a Sallen-Key lowpass whose
// capacitor ratio has fallen below 4Q²). Refit does not check the part
// ranges of Options.
func (c Circuit) Refit(fixed []Part) (Circuit, error) {
	d, err := c.design()
	if err != nil {
		return Circuit{}, err
	}
	v := c.Values()
	if err := checkValues(d, v); err != nil {
		return Circuit{}, err
	}
	for _, p := range fixed {
		i := -1
		for j, r := range d.refs {
			if r == p.Ref {
				i = j
			}
		}
		if i < 0 {
			return Circuit{}, fmt.Errorf("topology: Refit: %v circuit has no part %q: %w", c.Kind, p.Ref, ErrParts)
		}
		if !d.isCap[i] {
			return Circuit{}, fmt.Errorf("topology: Refit: %s is a resistor; only capacitors can be held: %w", p.Ref, ErrParts)
		}
		if !(p.Value > 0) || math.IsInf(p.Value, 0) {
			return Circuit{}, fmt.Errorf("topology: Refit: %s = %g: %w", p.Ref, p.Value, ErrParts)
		}
		v[i] = p.Value
	}
	if err := d.synth(c.Stage, 0, v, true); err != nil {
		return Circuit{}, err
	}
	for i, x := range v {
		if !(x > 0) || math.IsInf(x, 0) {
			return Circuit{}, unrealizable(c.Kind, c.Stage, "Refit gives %s = %g", d.refs[i], x)
		}
	}
	return c.WithValues(v)
}

// Biquad is a first- or second-order transfer function
//
//	H(s) = (Num[0] + Num[1]·s + Num[2]·s²) / (Den[0] + Den[1]·s + Den[2]·s²),
//
// s in rad/s, normalized so that the highest non-zero Den coefficient is 1
// (first order: Num[2] = Den[2] = 0, Den[1] = 1).
type Biquad struct {
	Num, Den [3]float64
}

// At returns H(s). It does not allocate.
func (b Biquad) At(s complex128) complex128 {
	n := complex(b.Num[0], 0) + s*(complex(b.Num[1], 0)+s*complex(b.Num[2], 0))
	d := complex(b.Den[0], 0) + s*(complex(b.Den[1], 0)+s*complex(b.Den[2], 0))
	return n / d
}

// AtHz returns H(j·2π·f). It does not allocate.
func (b Biquad) AtHz(f float64) complex128 { return b.At(complex(0, 2*math.Pi*f)) }

// Biquad returns the circuit's transfer function as polynomial
// coefficients, derived from the nodal analysis of its parts (see
// BiquadOf); the sign is the circuit's (negative for inverting circuits).
func (c Circuit) Biquad() (Biquad, error) {
	var buf [maxParts]float64
	d, err := c.design()
	if err != nil {
		return Biquad{}, err
	}
	v, err := valuesOf(d, c.Parts, &buf)
	if err != nil {
		return Biquad{}, err
	}
	var w mna.Interpolator
	return biquadOf(d, &w, v, mna.RadiusOf(&d.net, v))
}

// BiquadOf returns the transfer function of c's template with the given
// part values (Parts order) instead of c's own. The coefficients come from
// the nodal analysis: the numerator and denominator determinants sampled at
// s = −j·r, r and +j·r (r from the part values, mna.RadiusOf) and
// interpolated exactly; relative accuracy about 1e-14 for well-scaled
// circuits. It does not allocate (use an Evaluator to avoid even the
// workspace set-up per call). Errors wrap ErrParts.
func (c Circuit) BiquadOf(values []float64) (Biquad, error) {
	d, err := c.design()
	if err != nil {
		return Biquad{}, err
	}
	if len(values) != len(d.refs) {
		return Biquad{}, errValueCount
	}
	for _, x := range values {
		if !(x > 0) || math.IsInf(x, 0) {
			return Biquad{}, errValueBad
		}
	}
	var w mna.Interpolator
	return biquadOf(d, &w, values, mna.RadiusOf(&d.net, values))
}

// biquadOf interpolates the template's transfer at as many points as its
// capacitor count needs (three capacitors in the multiple-feedback
// highpass, whose op-amp constraint still leaves it second order) and
// returns the coefficients up to s², checking that higher ones vanish.
func biquadOf(d *design, w *mna.Interpolator, v []float64, radius float64) (Biquad, error) {
	var num, den [mna.MaxDim + 1]float64
	m := d.ncoef
	err := w.Coefficients(&d.net, v, mna.Amp{}, radius, num[:m], den[:m])
	return biquadFrom(err, &num, &den, m)
}

// biquadFrom checks the m coefficients of an interpolation and returns
// them as a Biquad.
func biquadFrom(err error, num, den *[mna.MaxDim + 1]float64, m int) (Biquad, error) {
	if err != nil {
		if errors.Is(err, mna.ErrSingular) {
			return Biquad{}, errSingular
		}
		return Biquad{}, errCoefficients
	}
	for j := 3; j < m; j++ {
		if num[j] != 0 || den[j] != 0 {
			return Biquad{}, errCoefficients
		}
	}
	var b Biquad
	copy(b.Num[:], num[:3])
	copy(b.Den[:], den[:3])
	return b, nil
}

// Evaluator computes the transfer function of one circuit's template for
// many sets of part values (Monte Carlo trials, sweeps of one part) with a
// workspace of its own. It is not safe for concurrent use: each goroutine
// creates its own with Circuit.NewEvaluator. Its methods do not allocate.
type Evaluator struct {
	d     *design
	stage filter.Stage
	w     *mna.FixedInterpolator
	// EvalBatch's storage.
	lv         [mna.Lanes][]float64
	ln, ld     [mna.Lanes][]float64
	lerr       [mna.Lanes]error
	lidx       [mna.Lanes]int
	lnum, lden [mna.Lanes][mna.MaxDim + 1]float64
}

// NewEvaluator returns an Evaluator for c's template. The sampling radius
// is fixed from c's own (nominal) values, which suits values within a few
// tens of percent of them; so is the pivot order of the nodal elimination
// it replays (mna.FixedInterpolator: the results are those of BiquadOf
// with that radius, bit for bit, for any values, only faster near c's).
// Errors wrap ErrParts or the template errors.
func (c Circuit) NewEvaluator() (*Evaluator, error) {
	d, err := c.design()
	if err != nil {
		return nil, err
	}
	var buf [maxParts]float64
	v, err := valuesOf(d, c.Parts, &buf)
	if err != nil {
		return nil, err
	}
	w, err := mna.NewFixedInterpolator(&d.net, v, mna.Amp{}, mna.RadiusOf(&d.net, v), d.ncoef)
	if err != nil {
		return nil, fmt.Errorf("topology: %w", err) // a template passes Check: not reached
	}
	e := &Evaluator{d: d, stage: c.Stage, w: w}
	for l := range mna.Lanes {
		e.ln[l], e.ld[l] = e.lnum[l][:d.ncoef], e.lden[l][:d.ncoef]
	}
	return e, nil
}

// Parts returns the number of part values Eval expects.
func (e *Evaluator) Parts() int { return len(e.d.refs) }

// Eval returns the transfer function with the given part values (Parts
// order), as Circuit.BiquadOf. Errors wrap ErrParts.
func (e *Evaluator) Eval(values []float64) (Biquad, error) {
	if err := e.check(values); err != nil {
		return Biquad{}, err
	}
	var num, den [mna.MaxDim + 1]float64
	m := e.d.ncoef
	err := e.w.Coefficients(values, num[:m], den[:m])
	return biquadFrom(err, &num, &den, m)
}

// EvalBatch sets dst[i], errs[i] = e.Eval(values[i]) for every i, with
// the same results bit for bit, evaluating the sets a few at a time side by
// side (the nodal eliminations of different sets overlap in the processor;
// faster than one Eval after another). dst and errs must be at least as
// long as values; EvalBatch panics otherwise. It allocates its working
// storage on its first call only.
func (e *Evaluator) EvalBatch(dst []Biquad, errs []error, values [][]float64) {
	if len(dst) < len(values) || len(errs) < len(values) {
		panic("topology: EvalBatch: dst or errs shorter than values")
	}
	n := 0
	flush := func() {
		e.w.CoefficientsLanes(e.lv[:n], e.ln[:n], e.ld[:n], e.lerr[:n])
		for l := range n {
			i := e.lidx[l]
			dst[i], errs[i] = biquadFrom(e.lerr[l], &e.lnum[l], &e.lden[l], e.d.ncoef)
			e.lv[l] = nil
		}
		n = 0
	}
	for i, v := range values {
		if err := e.check(v); err != nil {
			dst[i], errs[i] = Biquad{}, err
			continue
		}
		e.lv[n], e.lidx[n] = v, i
		n++
		if n == mna.Lanes {
			flush()
		}
	}
	if n > 0 {
		flush()
	}
}

// check is Eval's check of the values.
func (e *Evaluator) check(values []float64) error {
	if len(values) != len(e.d.refs) {
		return errValueCount
	}
	for _, x := range values {
		if !(x > 0) || math.IsInf(x, 0) {
			return errValueBad
		}
	}
	return nil
}

// Achieved returns the stage realized with the given values, as
// Circuit.Achieved.
func (e *Evaluator) Achieved(values []float64) (filter.Stage, error) {
	b, err := e.Eval(values)
	if err != nil {
		return filter.Stage{}, err
	}
	return stageOf(b, e.stage, e.d.inverting)
}

// Achieved returns the stage the parts actually realize, from the nodal
// analysis (the Biquad), not from the synthesis formulas: F0Hz and Q from
// the denominator, ZeroHz from the numerator (notch), and Gain in the
// stage's convention (DC for lowpass and notch, infinity for highpass, F0Hz
// for bandpass) with the circuit's inversion taken out, so that a perfect
// circuit gives back c.Stage (with Gain = |c.Stage.Gain|). Kind and Order
// are c.Stage's.
//
// Errors wrap ErrParts, or ErrUnrealizable when the parts give an unstable
// or degenerate response (a non-positive denominator coefficient, a notch
// zero that is not on the jω axis).
func (c Circuit) Achieved() (filter.Stage, error) {
	b, err := c.Biquad()
	if err != nil {
		return filter.Stage{}, err
	}
	d, _ := c.design()
	return stageOf(b, c.Stage, d.inverting)
}

var errDegenerate = fmt.Errorf("topology: the parts give an unstable or degenerate response: %w", ErrUnrealizable)

// stageOf reads a stage of kind and order like target from b.
func stageOf(b Biquad, target filter.Stage, inverting bool) (filter.Stage, error) {
	st := filter.Stage{Kind: target.Kind, Order: target.Order}
	sign := 1.0
	if inverting {
		sign = -1
	}
	if target.Order == 1 {
		if b.Den[2] != 0 || !(b.Den[0] > 0) || b.Den[1] != 1 {
			return filter.Stage{}, errDegenerate
		}
		w0 := b.Den[0]
		st.F0Hz = w0 / (2 * math.Pi)
		if target.Kind == filter.LowpassStage {
			st.Gain = sign * b.Num[0] / w0
		} else {
			st.Gain = sign * b.Num[1]
		}
		return st, nil
	}
	if b.Den[2] != 1 || !(b.Den[0] > 0) || !(b.Den[1] > 0) {
		return filter.Stage{}, errDegenerate
	}
	w0 := math.Sqrt(b.Den[0])
	st.F0Hz = w0 / (2 * math.Pi)
	st.Q = w0 / b.Den[1]
	switch target.Kind {
	case filter.LowpassStage:
		st.Gain = sign * b.Num[0] / b.Den[0]
	case filter.HighpassStage:
		st.Gain = sign * b.Num[2]
	case filter.BandpassStage:
		st.Gain = sign * b.Num[1] / b.Den[1]
	case filter.NotchStage:
		if !(b.Num[0]/b.Num[2] > 0) {
			return filter.Stage{}, errDegenerate
		}
		st.ZeroHz = math.Sqrt(b.Num[0]/b.Num[2]) / (2 * math.Pi)
		st.Gain = sign * b.Num[0] / b.Den[0]
	}
	return st, nil
}

// Sensitivity holds the normalized sensitivities S = (x/y)·∂y/∂x of a
// stage's F0Hz, Q, Gain and (notch) ZeroHz to one part x. S = −1/2 means a
// 1 % increase of the part lowers y by about 0.5 %.
type Sensitivity struct {
	Ref                 string
	F0, Q, Gain, ZeroHz float64
}

// sensStep is the relative step of the central differences of
// Sensitivities: truncation error about sensStep² (1e-8) and rounding about
// 1e-14/sensStep (1e-10).
const sensStep = 1e-4

// Sensitivities returns the normalized sensitivities of the achieved stage
// (Achieved) to each part, in Parts order, by central differences in
// log x: S = (ln y(x·e^h) − ln y(x·e^−h))/(2h), h = 1e-4; accurate to about
// 1e-8. Q's sensitivity is 0 for first-order stages, ZeroHz's for all but
// notches. Errors as Achieved.
func (c Circuit) Sensitivities() ([]Sensitivity, error) {
	if _, err := c.Achieved(); err != nil {
		return nil, err
	}
	ev, err := c.NewEvaluator()
	if err != nil {
		return nil, err
	}
	v := c.Values()
	out := make([]Sensitivity, len(v))
	lg := func(x float64) float64 { return math.Log(math.Abs(x)) }
	for i := range v {
		x := v[i]
		v[i] = x * math.Exp(sensStep)
		hi, err1 := ev.Achieved(v)
		v[i] = x * math.Exp(-sensStep)
		lo, err2 := ev.Achieved(v)
		v[i] = x
		if err := errors.Join(err1, err2); err != nil {
			return nil, err
		}
		s := Sensitivity{Ref: c.Parts[i].Ref}
		s.F0 = (lg(hi.F0Hz) - lg(lo.F0Hz)) / (2 * sensStep)
		if c.Stage.Order == 2 {
			s.Q = (lg(hi.Q) - lg(lo.Q)) / (2 * sensStep)
		}
		s.Gain = (lg(hi.Gain) - lg(lo.Gain)) / (2 * sensStep)
		if c.Stage.Kind == filter.NotchStage {
			s.ZeroHz = (lg(hi.ZeroHz) - lg(lo.ZeroHz)) / (2 * sensStep)
		}
		out[i] = s
	}
	return out, nil
}

// AtHz returns the chain's frequency response at f hertz, the product of
// its circuits' (from their parts, ideal op-amps). It does not allocate.
// An empty chain gives 1.
func (c Chain) AtHz(f float64) complex128 {
	h := complex(1, 0)
	for _, ci := range c.Circuits {
		h *= ci.AtHz(f)
	}
	return h
}

// Inverting reports whether the chain's AtHz is the negative of the product
// of its stages' transfer functions: an odd number of Inverting circuits.
func (c Chain) Inverting() bool {
	inv := false
	for _, ci := range c.Circuits {
		if ci.Inverting() {
			inv = !inv
		}
	}
	return inv
}
