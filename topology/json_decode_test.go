package topology

import (
	"encoding/json"
	"errors"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// TestCircuitJSONChecked: a decoded circuit is either one the analysis can
// use or an error wrapping a topology sentinel that names the problem.
func TestCircuitJSONChecked(t *testing.T) {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.707, Gain: 1}
	c, err := RealizeStage(st, Options{})
	if err != nil {
		t.Fatal(err)
	}
	good, err := json.Marshal(Chain{Circuits: []Circuit{c}})
	if err != nil {
		t.Fatal(err)
	}
	var back Chain
	if err := json.Unmarshal(good, &back); err != nil {
		t.Fatalf("round trip: %v", err)
	}
	if got, want := back.AtHz(500), c.AtHz(500); got != want {
		t.Fatalf("decoded AtHz %v, want %v", got, want)
	}
	tests := []struct {
		reason string
		doc    string
		want   error
	}{
		{"not JSON", `{"circuits": [{"kind": `, nil}, // a syntax error is json's
		{"wrong field type", `{"circuits": [{"kind": "sallen-key", "stage": {"kind": "lowpass", "order": 2, "f0_hz": 1000, "q": 0.7, "gain": 1}, "parts": 7}]}`, ErrParts},
		{"kind that cannot realize the stage", `{"circuits": [{"kind": "multiple-feedback", "stage": {"kind": "notch", "order": 2, "f0_hz": 1000, "q": 2, "zero_hz": 900, "gain": 1}, "parts": []}]}`, ErrKind},
		{"missing parts", `{"circuits": [{"kind": "sallen-key", "stage": {"kind": "lowpass", "order": 2, "f0_hz": 1000, "q": 0.7, "gain": 1}, "parts": []}]}`, ErrParts},
		{"renamed part", `{"circuits": [{"kind": "sallen-key", "stage": {"kind": "lowpass", "order": 2, "f0_hz": 1000, "q": 0.7, "gain": 1}, "parts": [{"ref": "R9", "value": 1000}, {"ref": "R2", "value": 1000}, {"ref": "C1", "value": 1e-8}, {"ref": "C2", "value": 1e-9}]}]}`, ErrParts},
	}
	for _, tc := range tests {
		var ch Chain
		err := json.Unmarshal([]byte(tc.doc), &ch)
		if err == nil {
			t.Errorf("%s: no error", tc.reason)
			continue
		}
		if tc.want != nil && !errors.Is(err, tc.want) {
			t.Errorf("%s: %v, want %v", tc.reason, err, tc.want)
		}
	}
	// A negative part value, in an otherwise good document.
	bad := c
	bad.Parts = append([]Part(nil), c.Parts...)
	bad.Parts[0].Value = -bad.Parts[0].Value
	b, err := json.Marshal(bad)
	if err != nil {
		t.Fatal(err)
	}
	var got Circuit
	if err := json.Unmarshal(b, &got); !errors.Is(err, ErrParts) {
		t.Errorf("negative part: %v, want ErrParts", err)
	}
}

// TestChainJSONStrict: unknown fields are refused at every level.
func TestChainJSONStrict(t *testing.T) {
	for _, doc := range []string{
		`{"kind": "nope"}`,
		`{"circuits": [], "extra": 1}`,
		`{"circuits": [{"kind": "sallen-key", "stage": {"kind": "lowpass", "order": 2, "f0_hz": 1000, "q": 0.7, "gain": 1}, "parts": [], "note": "x"}]}`,
	} {
		var ch Chain
		if err := json.Unmarshal([]byte(doc), &ch); !errors.Is(err, ErrParts) {
			t.Errorf("%s: %v, want ErrParts", doc, err)
		}
	}
}
