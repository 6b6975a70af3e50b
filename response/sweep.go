package response

import (
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// System is anything with a frequency response: AtHz returns H(j·2π·f) for f
// in hertz. filter.Transfer and the circuits of package topology are
// Systems.
type System interface {
	AtHz(f float64) complex128
}

// Delayer is an optional interface for a System that knows its own group
// delay: DelayAtHz returns −dφ/dω at f hertz, in seconds, φ the phase in
// radians and ω = 2π·f. Sweep uses it instead of numeric differentiation.
type Delayer interface {
	DelayAtHz(f float64) float64
}

// Compile-time checks: a filter transfer function is a System, by value and
// by pointer.
var (
	_ System = filter.Transfer{}
	_ System = (*filter.Transfer)(nil)
)

// Point is one frequency of a sweep.
type Point struct {
	Hz       float64 // frequency, hertz
	GainDB   float64 // 20·log10|H|; −Inf where |H| is exactly 0
	PhaseDeg float64 // phase of H in degrees, unwrapped along the sweep
	DelayS   float64 // group delay −dφ/dω, seconds
}

// NumericDelayStep is the relative step h/f of the numeric group delay used
// for Systems that are neither a filter.Transfer nor a Delayer (see Sweep).
const NumericDelayStep = 1e-3

// Sweep evaluates s at each frequency of hz (hertz, in the order given; any
// grid, e.g. gonum's floats.LogSpan) and returns a new slice of points. It is
// SweepInto with a nil dst. A nil s (or a nil *filter.Transfer) is a
// programmer's contract breach: Sweep panics with "response: Sweep of a nil
// System".
func Sweep(s System, hz []float64) []Point {
	if isNilSystem(s) {
		panic("response: Sweep of a nil System")
	}
	return SweepInto(nil, s, hz)
}

// SweepInto is Sweep writing into dst, which it returns. A nil dst is
// allocated; otherwise len(dst) must equal len(hz), or SweepInto panics (a
// programmer's contract breach). A nil s (or a nil *filter.Transfer) is
// also a contract breach: SweepInto panics with "response: SweepInto of a
// nil System". With a non-nil dst it does not allocate.
//
// For a filter.Transfer (value or pointer) every field is exact to rounding:
// the phase is Σ arg(jω − zᵢ) − Σ arg(jω − pᵢ) + arg(Gain), each factor on
// its own continuous branch, so it is continuous on any grid however coarse
// (DC phase 0° for a lowpass with positive gain, +90° per origin zero) and
// jumps by +180° only where ω crosses a zero on the jω axis (where |H| = 0
// and the phase is undefined). The delay is the analytic
//
//	τ(ω) = Σₚ −Re p / (Re² p + (ω − Im p)²) − Σ_z −Re z / (Re² z + (ω − Im z)²),
//
// obtained by differentiating each factor's phase atan2(ω − Im r, −Re r).
//
// For any other System the phase starts at the principal value of arg H at
// hz[0]; a step between grid points is taken as measured when it turns less
// than 45° and the delays at its ends predict less than 90°, and is
// otherwise bisected (extra evaluations of AtHz, up to 2²⁰ pieces) until
// every piece turns less than 22.5°. The phase so stays continuous unless a
// feature narrower than the pieces winds it by a full turn. The delay is
// DelayAtHz when s is a Delayer; otherwise it is
// the central difference −arg(H(f+h)/H(f−h)) / (2·2π·h) with h =
// NumericDelayStep·|f| (at f = 0, NumericDelayStep times the distance to the
// nearest other grid frequency, or 1 mHz when there is none), Richardson
// extrapolated over h, h/2, h/4 (truncation error O(h⁶)). Relative to
// |τ| + 1/ω, it agrees with the exact delay to 2e-9 where the nearest pole
// or zero lies 1 % of f away from j2πf, 3e-11 at 2 % and 6e-13 from 5 % on
// (tested).
//
// Special cases are: a NaN frequency gives a point of NaNs (the unwrapping
// continues from the previous point); |H| = 0 gives GainDB = −Inf.
func SweepInto(dst []Point, s System, hz []float64) []Point {
	if isNilSystem(s) {
		panic("response: SweepInto of a nil System")
	}
	if dst == nil {
		dst = make([]Point, len(hz))
	} else if len(dst) != len(hz) {
		panic("response: SweepInto: len(dst) != len(hz)")
	}
	switch h := s.(type) {
	case filter.Transfer:
		sweepTransferFast(dst, h, hz)
	case *filter.Transfer:
		sweepTransferFast(dst, *h, hz)
	default:
		sweepSystem(dst, s, hz)
	}
	return dst
}

func sweepTransfer(dst []Point, h filter.Transfer, hz []float64) {
	for i, f := range hz {
		w := 2 * math.Pi * f
		ph, d := phaseDelay(h, w)
		dst[i] = Point{Hz: f, GainDB: gainDB(h.At(complex(0, w))), PhaseDeg: ph * 180 / math.Pi, DelayS: d}
		if math.IsNaN(f) {
			dst[i] = Point{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
		}
	}
}

// onAxisRel is the relative size |Re r| / |r| below which a root is taken to
// lie on the jω axis: such roots (transmission zeros of elliptic and inverse
// Chebyshev filters) come from formulas that put them there exactly up to
// rounding, and their phase must not depend on the sign of that rounding.
const onAxisRel = 1e-12

// factorParts returns a = Re(jω − r) (0 for a root on the jω axis) and
// b = Im(jω − r).
func factorParts(r complex128, w float64) (a, b float64) {
	a, b = -real(r), w-imag(r)
	if math.Abs(a) <= onAxisRel*(math.Abs(real(r))+math.Abs(imag(r))) {
		a = 0
	}
	return a, b
}

// factorArg is the phase of the factor a + jb on the branch that is
// continuous in b for fixed a: the principal value for a ≥ 0, and
// π − atan2(b, −a) ∈ (π/2, 3π/2) for a < 0 (a root in the right half-plane).
func factorArg(a, b float64) float64 {
	if a >= 0 {
		return math.Atan2(b, a)
	}
	return math.Pi - math.Atan2(b, -a)
}

// factorSlope is d/db of the factor phase, a / (a² + b²), and 0 for a root
// exactly at jω (a = b = 0).
func factorSlope(a, b float64) float64 {
	d := a*a + b*b
	if d == 0 {
		return 0
	}
	return a / d
}

// phaseDelay returns the continuous phase (radians) and the group delay
// (seconds) of h at ω rad/s.
func phaseDelay(h filter.Transfer, w float64) (phase, delay float64) {
	if h.Gain < 0 {
		phase = math.Pi
	}
	for _, z := range h.Zeros {
		a, b := factorParts(z, w)
		phase += factorArg(a, b)
		delay -= factorSlope(a, b)
	}
	for _, p := range h.Poles {
		a, b := factorParts(p, w)
		phase -= factorArg(a, b)
		delay += factorSlope(a, b)
	}
	return phase, delay
}

func gainDB(v complex128) float64 {
	a := cmplx.Abs(v)
	if a > 0 && a < 0x1p-1022 {
		// Go's math.Log10 (math.Log on amd64) is wrong for subnormal
		// arguments (log10(5e-324) gives −307.95, not −323.31): scale into
		// the normal range, exactly, and take the power of two back out.
		return 20 * (math.Log10(a*0x1p64) - 64*math.Log10(2))
	}
	return 20 * math.Log10(a)
}

func sweepSystem(dst []Point, s System, hz []float64) {
	dl, isDelayer := s.(Delayer)
	var prevArg, prevPhase, prevDelay, prevF float64
	have := false
	for i, f := range hz {
		if math.IsNaN(f) {
			dst[i] = Point{math.NaN(), math.NaN(), math.NaN(), math.NaN()}
			continue
		}
		v := s.AtHz(f)
		var d float64
		if isDelayer {
			d = dl.DelayAtHz(f)
		} else {
			d = numericDelay(s, f, delayStepHz(hz, i))
		}
		arg := cmplx.Phase(v)
		phase := arg
		if have {
			phase = prevPhase + phaseStep(s, prevF, prevArg, prevDelay, f, arg, d)
		}
		if !math.IsNaN(phase) {
			prevArg, prevPhase, prevDelay, prevF, have = arg, phase, d, f, true
		}
		dst[i] = Point{Hz: f, GainDB: gainDB(v), PhaseDeg: phase * 180 / math.Pi, DelayS: d}
	}
}

// phaseStep returns the phase change from f0 (phase arg0, delay d0) to f1
// (arg1, d1). A step whose wrapped change is under 45° and whose
// trapezoid-rule prediction from the delays is under 90° is taken as it is;
// otherwise the interval is bisected (geometrically between positive
// frequencies) until every piece turns by less than 22.5°, at most
// maxUnwrapDepth levels deep.
func phaseStep(s System, f0, arg0, d0, f1, arg1, d1 float64) float64 {
	dArg := wrapPi(arg1 - arg0)
	pred := -(d0 + d1) / 2 * 2 * math.Pi * (f1 - f0)
	if math.Abs(dArg) <= math.Pi/4 && (math.IsNaN(pred) || math.Abs(pred) <= math.Pi/2) {
		return dArg
	}
	return bisectPhase(s, f0, arg0, f1, arg1, 0)
}

// maxUnwrapDepth bounds the bisection of phaseStep: 2²⁰ pieces.
const maxUnwrapDepth = 20

func bisectPhase(s System, f0, arg0, f1, arg1 float64, depth int) float64 {
	dArg := wrapPi(arg1 - arg0)
	if depth > 0 && math.Abs(dArg) <= math.Pi/8 || depth >= maxUnwrapDepth {
		return dArg
	}
	fm := (f0 + f1) / 2
	if f0 > 0 && f1 > 0 {
		fm = math.Sqrt(f0 * f1)
	}
	if fm == f0 || fm == f1 {
		return dArg
	}
	am := cmplx.Phase(s.AtHz(fm))
	if math.IsNaN(am) {
		return dArg
	}
	return bisectPhase(s, f0, arg0, fm, am, depth+1) + bisectPhase(s, fm, am, f1, arg1, depth+1)
}

// wrapPi maps x to (−π, π].
func wrapPi(x float64) float64 {
	if x > -math.Pi && x <= math.Pi {
		return x
	}
	x = math.Remainder(x, 2*math.Pi)
	if x <= -math.Pi {
		x += 2 * math.Pi
	}
	return x
}

// delayStepHz is the numeric-delay step for hz[i].
func delayStepHz(hz []float64, i int) float64 {
	f := hz[i]
	if f != 0 {
		return NumericDelayStep * math.Abs(f)
	}
	gap := math.Inf(1)
	if i > 0 && hz[i-1] != f {
		gap = math.Abs(hz[i-1] - f)
	}
	if i+1 < len(hz) && hz[i+1] != f {
		gap = math.Min(gap, math.Abs(hz[i+1]-f))
	}
	if math.IsInf(gap, 1) || math.IsNaN(gap) {
		gap = 1
	}
	return NumericDelayStep * gap
}

// numericDelay is the Richardson-extrapolated central difference of the
// phase of s at f with step h hertz (see SweepInto).
func numericDelay(s System, f, h float64) float64 {
	diff := func(h float64) float64 {
		return -cmplx.Phase(s.AtHz(f+h)/s.AtHz(f-h)) / (4 * math.Pi * h)
	}
	d1, d2, d4 := diff(h), diff(h/2), diff(h/4)
	r1 := (4*d2 - d1) / 3
	r2 := (4*d4 - d2) / 3
	return (16*r2 - r1) / 15
}
