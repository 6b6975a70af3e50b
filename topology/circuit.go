package topology

import (
	"fmt"

	"github.com/rolloff/rolloff/filter"
)

// Kind is a circuit kind. Auto lets Realize choose per stage.
//
// Kind marshals to JSON and text as its String form ("sallen-key", ...).
type Kind int

// The circuit kinds. Each kind's documentation lists the stages it
// realizes; asked for another, Realize returns an error wrapping ErrKind.
const (
	// Auto picks per stage: second-order lowpass and highpass Sallen-Key,
	// bandpass multiple feedback, notch state-variable, first order RC +
	// follower.
	Auto Kind = iota
	// SallenKey is the Sallen-Key circuit (one op-amp; lowpass and highpass,
	// order 2). The amplifier is a unity-gain follower for stage gains up to
	// 1 (an input attenuator sets gains below 1); above 1 it gets a
	// non-inverting gain-setting pair (Sallen and Key's gain-K circuit).
	SallenKey
	// SallenKeyEqual is the equal-component Sallen-Key circuit: equal
	// resistors, equal capacitors, amplifier gain K = 3 − 1/Q set by two
	// feedback resistors (lowpass and highpass, order 2, Q > 1/2). A stage
	// gain below K is set by an input attenuator; above K it is refused.
	SallenKeyEqual
	// MultipleFeedback is the inverting multiple-feedback circuit (one
	// op-amp; lowpass, highpass and bandpass, order 2).
	MultipleFeedback
	// StateVariable is the three-op-amp state-variable circuit (summer and
	// two integrators), with a fourth, summing op-amp for notch stages
	// (lowpass, highpass, bandpass and notch, order 2; every notch type).
	StateVariable
	// TowThomas is the Tow-Thomas two-integrator loop (three op-amps;
	// lowpass, bandpass, and notch by feed-forward of the input, order 2).
	TowThomas
	// RCFollower is a first-order RC section buffered by a non-inverting
	// op-amp (lowpass and highpass, order 1).
	RCFollower
	// InvertingFirstOrder is a first-order inverting op-amp stage (lowpass
	// and highpass, order 1).
	InvertingFirstOrder
)

var kindNames = [...]string{
	Auto:                "auto",
	SallenKey:           "sallen-key",
	SallenKeyEqual:      "sallen-key-equal",
	MultipleFeedback:    "multiple-feedback",
	StateVariable:       "state-variable",
	TowThomas:           "tow-thomas",
	RCFollower:          "rc-follower",
	InvertingFirstOrder: "inverting-first-order",
}

// String returns the kind's name ("sallen-key", ...) or "Kind(n)".
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// ParseKind returns the Kind named s (as String writes it). The error wraps
// ErrKind.
func ParseKind(s string) (Kind, error) {
	for k, n := range kindNames {
		if n == s {
			return Kind(k), nil
		}
	}
	return 0, fmt.Errorf("topology: circuit kind %q unknown: %w", s, ErrKind)
}

// MarshalText implements encoding.TextMarshaler; an unknown kind is an
// error wrapping ErrKind.
func (k Kind) MarshalText() ([]byte, error) {
	if k < 0 || int(k) >= len(kindNames) {
		return nil, fmt.Errorf("topology: circuit kind %d unknown: %w", int(k), ErrKind)
	}
	return []byte(kindNames[k]), nil
}

// UnmarshalText implements encoding.TextUnmarshaler.
func (k *Kind) UnmarshalText(b []byte) error {
	v, err := ParseKind(string(b))
	if err != nil {
		return err
	}
	*k = v
	return nil
}

// Part is one passive component: Ref "R1", "C2"...; Value in ohms for a
// resistor (Ref starting with R), in farads for a capacitor (Ref starting
// with C).
type Part struct {
	Ref   string  `json:"ref"`
	Value float64 `json:"value"`
}

// Circuit is one stage realized as an op-amp circuit of the given Kind. Stage
// is the target the parts were synthesized for; the circuit's behaviour is
// always computed from Parts.
//
// The netlist of a circuit is fixed by Kind and by the Stage's kind, order
// and gain class (whether an input attenuator or a gain-setting pair is
// needed); Parts gives its values in the order of the kind's template. A
// Circuit is a plain value, safe to share between goroutines.
type Circuit struct {
	Kind  Kind         `json:"kind"`
	Stage filter.Stage `json:"stage"`
	Parts []Part       `json:"parts"`
}

// Options controls Realize. The zero value picks circuits automatically at a
// sensible impedance level with the default part ranges.
type Options struct {
	Kind Kind
	// CapF is the reference capacitor in farads: the value of the capacitor
	// (or capacitors) each kind sets first, the others following from it by
	// the kind's ratio (see each kind). 0: chosen per stage from F0Hz so
	// that the resistors come out near 10 kΩ (1/(2π·F0Hz·10 kΩ), rounded to
	// the nearest E6 value; common practice), then scaled (capacitors up,
	// resistors down, or the other way) just enough to bring every part
	// inside the ranges when the kind's ratios allow.
	CapF float64
	// RMinOhm and RMaxOhm bound every resistor; 0 means the defaults
	// DefaultRMinOhm and DefaultRMaxOhm. A synthesized resistor outside is
	// an error wrapping ErrRange.
	RMinOhm, RMaxOhm float64
	// CMinF and CMaxF bound every capacitor; 0 means DefaultCMinF and
	// DefaultCMaxF.
	CMinF, CMaxF float64
	// FirstOrder is the kind used for first-order stages when Kind cannot
	// realize them (Sallen-Key, multiple feedback and the other
	// second-order kinds), so that an odd-order design can ask for one
	// second-order kind throughout: e.g. Kind: MultipleFeedback,
	// FirstOrder: RCFollower. Auto (the zero value) applies no fallback:
	// Kind is used for every stage and refuses the stages it cannot realize
	// with an error wrapping ErrKind.
	FirstOrder Kind
}

// The default part ranges (common practice for precision filters: below
// 100 Ω op-amp outputs load down, above 10 MΩ bias currents and board
// leakage matter; below 10 pF board strays matter, above 10 µF film and C0G
// parts are no longer available).
const (
	DefaultRMinOhm = 100.0
	DefaultRMaxOhm = 10e6
	DefaultCMinF   = 10e-12
	DefaultCMaxF   = 10e-6
)

// Chain is a cascade of circuits, input first.
type Chain struct {
	Circuits []Circuit `json:"circuits"`
}
