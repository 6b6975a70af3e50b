package topology

import (
	"errors"
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
)

// e6 is the E6 series of IEC 60063, one decade.
var e6 = [...]float64{1.0, 1.5, 2.2, 3.3, 4.7, 6.8}

// defaultCapF returns the reference capacitor for a stage at f0Hz:
// 1/(2π·f0·10 kΩ), rounded to the nearest E6 value by ratio and kept inside
// [cmin, cmax] (common practice: resistors near 10 kΩ keep op-amp loading
// and noise low).
func defaultCapF(f0Hz, cmin, cmax float64) float64 {
	c := 1 / (2 * math.Pi * f0Hz * 10e3)
	dec := math.Floor(math.Log10(c))
	m := c / math.Pow(10, dec)
	best, bestErr := 1.0, math.Inf(1)
	for _, v := range append(e6[:], 10) {
		if e := math.Abs(math.Log(m / v)); e < bestErr {
			best, bestErr = v, e
		}
	}
	c = best * math.Pow(10, dec)
	return math.Min(math.Max(c, cmin), cmax)
}

// limits are Options with the defaults filled in.
type limits struct {
	capF             float64
	rmin, rmax       float64
	cmin, cmax       float64
	kind             Kind
	firstOrder       Kind
	capFromFrequency bool
}

func (o Options) limits() (limits, error) {
	bad := func(name string, v float64) error {
		return fmt.Errorf("topology: Options.%s = %g (must be positive and finite, or 0 for the default): %w", name, v, ErrOptions)
	}
	l := limits{kind: o.Kind, firstOrder: o.FirstOrder, capF: o.CapF, rmin: o.RMinOhm, rmax: o.RMaxOhm, cmin: o.CMinF, cmax: o.CMaxF}
	for _, f := range []struct {
		name string
		v    *float64
		def  float64
	}{
		{"CapF", &l.capF, 0}, {"RMinOhm", &l.rmin, DefaultRMinOhm}, {"RMaxOhm", &l.rmax, DefaultRMaxOhm},
		{"CMinF", &l.cmin, DefaultCMinF}, {"CMaxF", &l.cmax, DefaultCMaxF},
	} {
		if math.IsNaN(*f.v) || *f.v < 0 || math.IsInf(*f.v, 0) {
			return l, bad(f.name, *f.v)
		}
		if *f.v == 0 {
			*f.v = f.def
		}
	}
	if l.rmin > l.rmax {
		return l, fmt.Errorf("topology: resistor range [%g, %g] Ω is empty: %w", l.rmin, l.rmax, ErrOptions)
	}
	if l.cmin > l.cmax {
		return l, fmt.Errorf("topology: capacitor range [%g, %g] F is empty: %w", l.cmin, l.cmax, ErrOptions)
	}
	if _, ok := kindSpecs[l.kind]; !ok && l.kind != Auto {
		return l, fmt.Errorf("topology: Options.Kind %v unknown: %w", l.kind, ErrKind)
	}
	if _, ok := kindSpecs[l.firstOrder]; !ok && l.firstOrder != Auto {
		return l, fmt.Errorf("topology: Options.FirstOrder %v unknown: %w", l.firstOrder, ErrKind)
	}
	l.capFromFrequency = l.capF == 0
	return l, nil
}

// AutoKind returns the kind Realize picks for st with Auto: second-order
// lowpass and highpass Sallen-Key, bandpass multiple feedback, notch
// state-variable, first order RC + follower.
// AutoKind does not validate st: it looks only at st.Order and st.Kind, so
// an invalid stage gets the kind these rules give (SallenKey for the zero
// Stage or an unknown Kind); Realize and RealizeStage validate first and
// reject such a stage with ErrStage.
func AutoKind(st filter.Stage) Kind {
	switch {
	case st.Order == 1:
		return RCFollower
	case st.Kind == filter.BandpassStage:
		return MultipleFeedback
	case st.Kind == filter.NotchStage:
		return StateVariable
	}
	return SallenKey
}

// RealizeStage synthesizes one stage as a circuit of kind opt.Kind (Auto:
// AutoKind). The parts are positive and inside the Options' ranges; the
// circuit's AtHz equals st.Transfer().AtHz, negated when the circuit is
// Inverting (a negative st.Gain is realized with |Gain|, which Inverting
// accounts for), to a few 1e-12 relative (worst seen in 21,000
// random stages: 4e-12, relative to the passband level near a notch zero).
//
// Errors wrap ErrStage (st fails Validate; also filter.ErrStage), ErrKind
// (the kind does not realize st), ErrUnrealizable (the kind's equations
// have no positive solution), ErrRange (a part outside the range) or
// ErrOptions.
func RealizeStage(st filter.Stage, opt Options) (Circuit, error) {
	l, err := opt.limits()
	if err != nil {
		return Circuit{}, err
	}
	return realizeStage(st, l)
}

func realizeStage(st filter.Stage, l limits) (Circuit, error) {
	if err := st.Validate(); err != nil {
		return Circuit{}, fmt.Errorf("%w: %w", ErrStage, err)
	}
	k := l.kind
	if k == Auto {
		k = AutoKind(st)
	}
	d, err := designFor(k, st)
	if err != nil && st.Order == 1 && l.firstOrder != Auto && errors.Is(err, ErrKind) {
		k = l.firstOrder
		d, err = designFor(k, st)
	}
	if err != nil {
		return Circuit{}, err
	}
	capF := l.capF
	if l.capFromFrequency {
		capF = defaultCapF(st.F0Hz, l.cmin, l.cmax)
	}
	var buf [maxParts]float64
	v := buf[:len(d.refs)]
	if err := d.synth(st, capF, v, false); err != nil {
		return Circuit{}, err
	}
	if l.capFromFrequency {
		// Impedance scaling (capacitors ×λ, resistors ÷λ leaves the
		// response unchanged): move the default level the least that
		// brings every part inside its range, when some λ does.
		if lam := fitLevel(d, v, l); lam != 1 {
			if err := d.synth(st, capF*lam, v, false); err != nil {
				return Circuit{}, err
			}
		}
	}
	c := Circuit{Kind: k, Stage: st, Parts: make([]Part, len(v))}
	for i, x := range v {
		c.Parts[i] = Part{Ref: d.refs[i], Value: x}
		lo, hi, unit := l.rmin, l.rmax, "Ω"
		if d.isCap[i] {
			lo, hi, unit = l.cmin, l.cmax, "F"
		}
		if !(x > 0) || math.IsInf(x, 0) {
			return Circuit{}, unrealizable(k, st, "%s = %g %s is not positive and finite", d.refs[i], x, unit)
		}
		if x < lo || x > hi {
			return Circuit{}, fmt.Errorf("topology: %v %v stage (f0 %g Hz, Q %g): %s = %.4g %s outside [%g, %g]: %w",
				k, st.Kind, st.F0Hz, st.Q, d.refs[i], x, unit, lo, hi, ErrRange)
		}
	}
	return c, nil
}

// Realize synthesizes each stage with RealizeStage and returns the chain,
// input first. Its AtHz equals the product of the stages' transfer
// functions up to sign (one factor −1 per inverting circuit). An empty list
// is an error wrapping ErrStage; a failing stage's error names its index.
func Realize(stages []filter.Stage, opt Options) (Chain, error) {
	if len(stages) == 0 {
		return Chain{}, fmt.Errorf("topology: no stages to realize: %w", ErrStage)
	}
	l, err := opt.limits()
	if err != nil {
		return Chain{}, err
	}
	ch := Chain{Circuits: make([]Circuit, len(stages))}
	for i, st := range stages {
		c, err := realizeStage(st, l)
		if err != nil {
			return Chain{}, fmt.Errorf("topology: stage %d: %w", i, err)
		}
		ch.Circuits[i] = c
	}
	return ch, nil
}

// fitLevel returns the impedance scale λ closest to 1 that puts every part
// of v inside the ranges (capacitors times λ, resistors divided by λ), or 1
// when no λ does (the range check then reports the part).
func fitLevel(d *design, v []float64, l limits) float64 {
	lo, hi := 0.0, math.Inf(1)
	for i, x := range v {
		if d.isCap[i] {
			lo, hi = math.Max(lo, l.cmin/x), math.Min(hi, l.cmax/x)
		} else {
			lo, hi = math.Max(lo, x/l.rmax), math.Min(hi, x/l.rmin)
		}
	}
	switch {
	case lo > hi:
		return 1
	case lo > 1:
		// Just inside the bound, so that rounding in the re-synthesis
		// cannot put the part a few ulps outside.
		return math.Min(lo*(1+1e-12), math.Sqrt(lo*hi))
	case hi < 1:
		return math.Max(hi*(1-1e-12), math.Sqrt(lo*hi))
	}
	return 1
}
