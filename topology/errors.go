package topology

import "errors"

// Sentinel errors. Every error returned by this package wraps one of them
// (and, for a malformed stage, filter.ErrStage as well), so callers can match
// with errors.Is; the message names the stage, part or field.
var (
	// ErrKind reports an unknown circuit kind, or a kind that does not
	// realize the stage's kind or order.
	ErrKind = errors.New("topology: circuit kind cannot realize the stage")
	// ErrStage reports a stage that fails filter.Stage.Validate, or an
	// empty stage list.
	ErrStage = errors.New("topology: bad stage")
	// ErrUnrealizable reports a stage that the kind's synthesis equations
	// cannot meet with positive parts: a Sallen-Key capacitor ratio below
	// 4Q², a state-variable Q too low for its damping divider, a gain of 0,
	// a gain above the equal-component Sallen-Key's K.
	ErrUnrealizable = errors.New("topology: stage not realizable with positive parts")
	// ErrRange reports a synthesized part outside the allowed range.
	ErrRange = errors.New("topology: part value out of range")
	// ErrOptions reports bad Options: a negative, NaN or infinite CapF or
	// range bound, or a range whose minimum is above its maximum.
	ErrOptions = errors.New("topology: bad options")
	// ErrParts reports part values that do not fit the circuit: a wrong
	// count, a non-positive or non-finite value, an unknown reference, a
	// fixed part that is not a capacitor.
	ErrParts = errors.New("topology: bad part values")
	// ErrOpAmp reports bad op-amp parameters, or a requirement that no
	// finite gain-bandwidth meets.
	ErrOpAmp = errors.New("topology: bad op-amp parameters")
)
