package topology

import "github.com/rolloff/rolloff/filter"

// Kind is a circuit kind. Auto lets Realize choose per stage.
type Kind int

// The circuit kinds.
const (
	Auto Kind = iota
	SallenKey
	SallenKeyEqual
	MultipleFeedback
	StateVariable
	TowThomas
	RCFollower
)

// Part is one passive component: Ref "R1", "C2"...; Value in ohms for a
// resistor (Ref starting with R), in farads for a capacitor (Ref starting
// with C).
type Part struct {
	Ref   string
	Value float64
}

// Circuit is one stage realized as an op-amp circuit of the given Kind. Stage
// is the target the parts were synthesized for; the circuit's behaviour is
// always computed from Parts.
type Circuit struct {
	Kind  Kind
	Stage filter.Stage
	Parts []Part
}

// Options controls Realize. The zero value picks circuits automatically at a
// sensible impedance level.
type Options struct {
	Kind Kind
	CapF float64 // 0: a sensible default impedance level
}

// Chain is a cascade of circuits, input first.
type Chain struct{ Circuits []Circuit }
