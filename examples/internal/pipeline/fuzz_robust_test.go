package pipeline_test

import (
	"bytes"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

// checkRequestErr fails unless err is a *FieldError wrapping ErrRequest
// whose message names its field.
func checkRequestErr(t *testing.T, what string, err error) {
	t.Helper()
	var fe *pipeline.FieldError
	if !errors.As(err, &fe) || !errors.Is(err, pipeline.ErrRequest) {
		t.Fatalf("%s: error %v is not a *FieldError wrapping ErrRequest", what, err)
	}
	if fe.Field != "" && !bytes.Contains([]byte(err.Error()), []byte("field "+fe.Field)) {
		t.Fatalf("%s: message %q does not name field %q", what, err, fe.Field)
	}
}

// FuzzDecodeRequest feeds arbitrary bytes to the request decoder and
// resolves what decodes: never a panic; every error a *FieldError wrapping
// ErrRequest and naming its field; a resolved request resolves to itself
// and survives its own JSON encoding unchanged. (Run is not called: one
// design takes far longer than a fuzz execution should.)
func FuzzDecodeRequest(f *testing.F) {
	for _, s := range []string{
		`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}}`,
		`{"name": "ch", "mask": {"band": "bandpass", "pass_hz": [900, 1100], "stop_hz": [500, 2000], "ripple_db": 1, "atten_db": 40},
		  "families": ["elliptic", "Chebyshev "], "kind": "multiple-feedback", "resistor_series": "e24", "capacitor_series": "E6",
		  "resistor_tol_pct": 1, "capacitor_tol_pct": 5, "distribution": "normal", "cap_f": 1e-9, "trials": 50, "seed": 9,
		  "margin_db": 0.1, "min_yield_pct": 95}`,
		`{"mask": {"band": "bandstop", "pass_hz": [40, 75], "stop_hz": [48, 52], "ripple_db": 1, "atten_db": 40}, "margin_db": 0}`,
		`{"mask": {"band": "highpass", "pass_hz": [1e9], "stop_hz": [1e-3], "ripple_db": 1e-9, "atten_db": 200}}`,
		`{"mask": null}`, `{}`, `[]`, `null`, ``, `{"mask": {"band": "lowpass"}}`, `{"trials": 1e400}`,
		`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}, "margin_db": null} {}`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		req, err := pipeline.DecodeRequestBytes(data)
		if err != nil {
			checkRequestErr(t, "decode", err)
			return
		}
		res, err := req.Resolve()
		if err != nil {
			checkRequestErr(t, "resolve", err)
			return
		}
		again, err := res.Resolve()
		if err != nil {
			t.Fatalf("a resolved request fails to resolve: %v", err)
		}
		if d := cmp.Diff(res, again); d != "" {
			t.Fatalf("Resolve is not idempotent (-first +second):\n%s", d)
		}
		// The resolved request written as JSON reads back equal.
		var b bytes.Buffer
		if err := jsonEncode(&b, res); err != nil {
			t.Fatalf("encode resolved request: %v", err)
		}
		back, err := pipeline.DecodeRequestBytes(b.Bytes())
		if err != nil {
			t.Fatalf("decode %s: %v", b.Bytes(), err)
		}
		if d := cmp.Diff(res, back); d != "" {
			t.Fatalf("resolved request JSON round trip (-want +got):\n%s", d)
		}
	})
}

// FuzzUnmarshalDocument feeds arbitrary bytes to the result-document
// decoder: never a panic; a document that decodes is written by
// MarshalDocument to bytes that decode to the same document and are
// written again identically.
func FuzzUnmarshalDocument(f *testing.F) {
	for _, s := range []string{
		`{"version": "rolloff.design/v1"}`,
		`{"version": "rolloff.design/v0"}`,
		`{"version": "rolloff.design/v1", "design": {"zeros": [], "poles": [[-1, 0]], "gain": 1}, "stages": [{"target": {"kind": "lowpass", "order": 1, "f0_hz": 1, "gain": 1}}]}`,
		`{"version": "rolloff.design/v1", "design": {"poles": [[-1]], "gain": 1}}`,
		`{"version": "rolloff.design/v1", "request": {"mask": {"band": "bandpass", "pass_hz": [1, 2], "stop_hz": [0.5, 4], "ripple_db": 1, "atten_db": 40}}}`,
		`{"version": "rolloff.design/v1", "extra": 1}`, `{`, ``, `null`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		d, err := pipeline.UnmarshalDocument(data)
		if err != nil {
			if !bytes.HasPrefix([]byte(err.Error()), []byte("pipeline: ")) {
				t.Fatalf("error %q lacks the package prefix", err)
			}
			return
		}
		b1, err := pipeline.MarshalDocument(d)
		if err != nil {
			// UnmarshalDocument refuses what MarshalDocument cannot write
			// (a request without a mask, ...): what it accepts, it writes.
			t.Fatalf("write an accepted document: %v", err)
		}
		d2, err := pipeline.UnmarshalDocument(b1)
		if err != nil {
			t.Fatalf("decode a written document: %v\n%s", err, b1)
		}
		if diff := cmp.Diff(d, d2); diff != "" {
			t.Fatalf("document round trip (-want +got):\n%s", diff)
		}
		b2, err := pipeline.MarshalDocument(d2)
		if err != nil || !bytes.Equal(b1, b2) {
			t.Fatalf("second write differs (%v)", err)
		}
	})
}
