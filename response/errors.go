package response

import "errors"

// Sentinel errors. Every error returned by this package wraps one of them
// (or filter.ErrSpec for a bad mask), so callers can match with errors.Is;
// the message names the offending argument.
var (
	// ErrSystem reports a transfer function that the operation cannot use:
	// more zeros than poles, a non-finite gain, pole or zero, complex poles
	// or zeros without their conjugates, an unstable system where a
	// settled response is needed, or a System that returns NaN.
	ErrSystem = errors.New("response: unusable system")
	// ErrGrid reports a bad frequency, time or level argument: NaN,
	// infinite, negative (times) or not positive (frequencies, level
	// drops), a band whose lower edge is not below its upper edge or that
	// reaches above MaxSearchHz.
	ErrGrid = errors.New("response: bad frequency, time or level argument")
	// ErrNoCrossing reports that the gain does not cross the requested
	// level within the band searched.
	ErrNoCrossing = errors.New("response: no crossing of the level")
)
