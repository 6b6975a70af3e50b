package filter

import "errors"

// Sentinel errors. Every error returned by this package wraps one of them, so
// callers can match with errors.Is; the message names the offending field.
var (
	// ErrOrder reports a filter order that is not a positive integer, or one
	// beyond the range in which the family's accuracy is guaranteed.
	ErrOrder = errors.New("filter: bad order")
	// ErrParam reports a bad family parameter (ripple, attenuation, Bessel
	// normalization): zero, negative, NaN, infinite or inconsistent.
	ErrParam = errors.New("filter: bad family parameter")
	// ErrFrequency reports a corner, centre frequency or bandwidth that is
	// not positive and finite.
	ErrFrequency = errors.New("filter: bad frequency")
	// ErrSpec reports a specification mask that cannot be met as stated:
	// edges on the wrong side, ripple not below attenuation, an unknown band.
	ErrSpec = errors.New("filter: bad specification")
	// ErrRange reports a result that float64 cannot represent (a gain that
	// would overflow or underflow) or a required order beyond the supported range.
	ErrRange = errors.New("filter: out of range")
	// ErrStage reports a stage that is not well formed (see Stage.Validate),
	// or a transfer function that cannot be factored into stages.
	ErrStage = errors.New("filter: bad stage")
	// ErrFormat reports JSON that does not decode into this package's
	// types: a syntax error, a wrong type, an unknown or missing field, a
	// pair that is not [re, im], an unknown band or stage kind name.
	ErrFormat = errors.New("filter: malformed encoding")
)

// wrapsSentinel reports whether err wraps one of the package's sentinels.
func wrapsSentinel(err error) bool {
	for _, e := range []error{ErrOrder, ErrParam, ErrFrequency, ErrSpec, ErrRange, ErrStage, ErrFormat} {
		if errors.Is(err, e) {
			return true
		}
	}
	return false
}
