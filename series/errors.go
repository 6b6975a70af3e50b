package series

import "errors"

// Sentinel errors. Every error returned by this package wraps one of them (or
// an error of the filter or topology packages), so callers can match with
// errors.Is; the message names the offending input.
var (
	// ErrValue reports a component value that is not positive and finite
	// (zero, negative, NaN or infinite) where a positive value is needed.
	ErrValue = errors.New("series: bad value")
	// ErrSeries reports the zero Series or an unknown series name.
	ErrSeries = errors.New("series: unknown series")
	// ErrRange reports a range with its ends in the wrong order, a range
	// holding too many values, or a result float64 cannot hold.
	ErrRange = errors.New("series: bad range")
	// ErrSyntax reports text that is not a component value.
	ErrSyntax = errors.New("series: invalid syntax")
	// ErrPolicy reports a bad field of a Policy or of Monte Carlo or worst
	// case options (a negative radius, a tolerance outside [0, 1), ...).
	ErrPolicy = errors.New("series: bad option")
	// ErrChain reports a chain that cannot be snapped or analyzed: no
	// circuits, a part whose designator is neither R nor C, a circuit
	// whose resistors cannot be recomputed for the snapped capacitors.
	ErrChain = errors.New("series: bad chain")
)
