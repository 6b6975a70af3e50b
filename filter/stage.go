package filter

import (
	"fmt"
	"math"
)

// StageKind is the kind of a first- or second-order section.
type StageKind int

// The stage kinds. The zero value is not a valid kind.
const (
	LowpassStage StageKind = iota + 1
	HighpassStage
	BandpassStage
	NotchStage
)

// String returns "lowpass", "highpass", "bandpass" or "notch", or
// "StageKind(n)" for an invalid value.
func (k StageKind) String() string {
	switch k {
	case LowpassStage:
		return "lowpass"
	case HighpassStage:
		return "highpass"
	case BandpassStage:
		return "bandpass"
	case NotchStage:
		return "notch"
	}
	return "StageKind(" + itoa(int(k)) + ")"
}

// Stage is one first- or second-order section of a cascade. With ω0 = 2π·F0Hz
// and ωz = 2π·ZeroHz its transfer function is
//
//	LowpassStage,  order 1: Gain · ω0 / (s + ω0)
//	HighpassStage, order 1: Gain · s / (s + ω0)
//	LowpassStage,  order 2: Gain · ω0² / D(s)
//	HighpassStage, order 2: Gain · s² / D(s)
//	BandpassStage, order 2: Gain · (ω0/Q)·s / D(s)
//	NotchStage,    order 2: Gain · (ω0²/ωz²) · (s² + ωz²) / D(s)
//
// where D(s) = s² + (ω0/Q)·s + ω0². A notch with ZeroHz above F0Hz is a
// lowpass notch, below F0Hz a highpass notch, equal a symmetric notch.
type Stage struct {
	Kind   StageKind
	Order  int     // 1 or 2
	F0Hz   float64 // pole frequency
	Q      float64 // pole quality factor; 0 for first-order stages
	ZeroHz float64 // NotchStage: frequency of its jω-axis zero pair
	Gain   float64 // gain at DC (Lowpass, Notch), at infinity (Highpass), at F0Hz (Bandpass)
}

// Validate reports whether s is a well-formed stage: a known kind, order 1
// (lowpass or highpass only) or 2, F0Hz positive and finite, Q positive and
// finite for order 2 (and 0 for order 1), ZeroHz positive and finite for a
// notch, Gain finite. The error wraps ErrStage and names the bad field.
func (s Stage) Validate() error {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("filter: stage "+format+": %w", append(a, ErrStage)...)
	}
	switch s.Kind {
	case LowpassStage, HighpassStage, BandpassStage, NotchStage:
	default:
		return bad("Kind %d unknown", int(s.Kind))
	}
	switch s.Order {
	case 1:
		if s.Kind != LowpassStage && s.Kind != HighpassStage {
			return bad("Order 1 with Kind %v (only lowpass and highpass are first order)", s.Kind)
		}
		if s.Q != 0 {
			return bad("Q %g on a first-order stage (must be 0)", s.Q)
		}
	case 2:
		if !(s.Q > 0) || math.IsInf(s.Q, 0) {
			return bad("Q %g not positive and finite", s.Q)
		}
	default:
		return bad("Order %d (must be 1 or 2)", s.Order)
	}
	if !(s.F0Hz > 0) || math.IsInf(s.F0Hz, 0) {
		return bad("F0Hz %g not positive and finite", s.F0Hz)
	}
	if s.Kind == NotchStage && (!(s.ZeroHz > 0) || math.IsInf(s.ZeroHz, 0)) {
		return bad("ZeroHz %g not positive and finite", s.ZeroHz)
	}
	if math.IsNaN(s.Gain) || math.IsInf(s.Gain, 0) {
		return bad("Gain %g not finite", s.Gain)
	}
	return nil
}

// Transfer returns the stage's transfer function (see Stage for the
// formulas), with poles and zeros in rad/s. A stage that fails Validate
// gives the zero Transfer (H = 0); call Validate first where the stage comes
// from outside the program.
func (s Stage) Transfer() Transfer {
	if s.Validate() != nil {
		return Transfer{}
	}
	w0 := 2 * math.Pi * s.F0Hz
	if s.Order == 1 {
		p := []complex128{complex(-w0, 0)}
		if s.Kind == LowpassStage {
			return Transfer{Poles: p, Gain: s.Gain * w0}
		}
		return Transfer{Zeros: []complex128{0}, Poles: p, Gain: s.Gain}
	}
	poles := quadRoots(w0/s.Q, w0*w0)
	switch s.Kind {
	case LowpassStage:
		return Transfer{Poles: poles, Gain: s.Gain * w0 * w0}
	case HighpassStage:
		return Transfer{Zeros: []complex128{0, 0}, Poles: poles, Gain: s.Gain}
	case BandpassStage:
		return Transfer{Zeros: []complex128{0}, Poles: poles, Gain: s.Gain * w0 / s.Q}
	default: // NotchStage
		wz := 2 * math.Pi * s.ZeroHz
		return Transfer{
			Zeros: []complex128{complex(0, wz), complex(0, -wz)},
			Poles: poles,
			Gain:  s.Gain * (w0 / wz) * (w0 / wz),
		}
	}
}

// quadRoots returns the roots of s² + b·s + c (b, c > 0), the complex pair
// with positive imaginary part first, computed without cancellation.
func quadRoots(b, c float64) []complex128 {
	disc := b*b/4 - c
	if disc < 0 {
		im := math.Sqrt(-disc)
		return []complex128{complex(-b/2, im), complex(-b/2, -im)}
	}
	// Real roots: the larger in magnitude first by the stable formula,
	// the other from the product of the roots.
	r1 := -b/2 - math.Sqrt(disc)
	return []complex128{complex(r1, 0), complex(c/r1, 0)}
}
