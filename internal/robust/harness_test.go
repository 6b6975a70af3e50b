package robust_test

import (
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"strings"
	"sync/atomic"
	"testing"
)

// badInput is one row of a bad-input table: a call into a public entry
// point with one bad argument, the sentinels its error must match with
// errors.Is, and a substring of the message that names the bad field.
type badInput struct {
	reason string  // why the input is bad
	want   []error // sentinels the error must wrap (all of them)
	field  string  // substring of the message naming the offending field
	call   func() error
}

// triedBad counts the bad inputs tried over the whole package run, for
// the report (go test -v -run TestBadInputs ./internal/robust).
var triedBad atomic.Int64

// runBad runs every row: the call must not panic, must return an error
// matching every sentinel of the row, and its message must contain the
// row's field substring and start with the package prefix.
func runBad(t *testing.T, prefix string, rows []badInput) {
	t.Helper()
	for _, r := range rows {
		triedBad.Add(1)
		err, panicked := guard(r.call)
		if panicked != "" {
			t.Errorf("%s: panic: %s", r.reason, panicked)
			continue
		}
		if err == nil {
			t.Errorf("%s: no error", r.reason)
			continue
		}
		for _, w := range r.want {
			if !errors.Is(err, w) {
				t.Errorf("%s: error %q does not wrap %q", r.reason, err, w)
			}
		}
		if !strings.Contains(err.Error(), r.field) {
			t.Errorf("%s: error %q does not name %q", r.reason, err, r.field)
		}
		if prefix != "" && !strings.HasPrefix(err.Error(), prefix) {
			t.Errorf("%s: error %q lacks the package prefix %q", r.reason, err, prefix)
		}
		if prefix != "" && strings.Contains(err.Error(), prefix+prefix) {
			t.Errorf("%s: error %q repeats the package prefix", r.reason, err)
		}
	}
}

// guard calls f, turning a panic into its message and stack.
func guard(f func() error) (err error, panicked string) {
	defer func() {
		if p := recover(); p != nil {
			panicked = fmt.Sprintf("%v\n%s", p, debug.Stack())
		}
	}()
	return f(), ""
}

// noPanic calls f and fails the test on a panic (for entry points that
// return no error, such as AtHz on a malformed value).
func noPanic(t *testing.T, reason string, f func()) {
	t.Helper()
	triedBad.Add(1)
	if _, p := guard(func() error { f(); return nil }); p != "" {
		t.Errorf("%s: panic: %s", reason, p)
	}
}

var (
	nan  = math.NaN()
	inf  = math.Inf(1)
	ninf = math.Inf(-1)
)

// badNumbers are the non-positive or non-finite values every frequency,
// ripple, attenuation or part value must refuse.
var badNumbers = []struct {
	name string
	v    float64
}{{"NaN", nan}, {"+Inf", inf}, {"-Inf", ninf}, {"zero", 0}, {"negative", -1}}

// errs is shorthand for a list of sentinels.
func errs(e ...error) []error { return e }
