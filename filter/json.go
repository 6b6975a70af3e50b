package filter

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/cmplx"
)

// JSON encodings. Every type encodes to an object with fixed snake_case
// field names (below); numbers are written in the shortest form that reads
// back to the same float64, so a value round-trips exactly (empty pole and
// zero lists decode as nil slices). Decoding is strict: unknown fields,
// missing required fields, wrong types and unknown names are errors wrapping
// ErrFormat (and ErrSpec or ErrStage for an unknown band or stage kind
// name). Decoding checks form, not meaning: call Spec.Validate or
// Stage.Validate on decoded values that come from outside the program.
//
//	Band, StageKind: "lowpass", "highpass", "bandpass", "bandstop" / "notch"
//	Transfer: {"zeros": [[re, im], ...], "poles": [[re, im], ...], "gain": g}
//	          (zeros and poles may be omitted for none; gain is required)
//	Spec:     {"band": "lowpass", "pass_hz": [f0, f1], "stop_hz": [f0, f1],
//	           "ripple_db": r, "atten_db": a}
//	          (all required; the arrays have one or two elements, a missing
//	          second element is 0)
//	Stage:    {"kind": "lowpass", "order": 2, "f0_hz": f, "q": q,
//	           "zero_hz": z, "gain": g}
//	          (q and zero_hz may be omitted for 0)

// strictDecode decodes data into v, rejecting unknown fields and trailing
// data; what names the type for messages.
func strictDecode(data []byte, v any, what string) error {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return fmt.Errorf("filter: %s JSON: %w: %w", what, ErrFormat, err)
	}
	if dec.More() {
		return fmt.Errorf("filter: %s JSON: trailing data: %w", what, ErrFormat)
	}
	return nil
}

func isNull(data []byte) bool { return string(bytes.TrimSpace(data)) == "null" }

var bandNames = map[Band]string{Lowpass: "lowpass", Highpass: "highpass", Bandpass: "bandpass", Bandstop: "bandstop"}

// MarshalJSON encodes b as its name ("lowpass", "highpass", "bandpass",
// "bandstop"). An unknown band is an error wrapping ErrSpec.
func (b Band) MarshalJSON() ([]byte, error) {
	name, ok := bandNames[b]
	if !ok {
		return nil, fmt.Errorf("filter: Band %d has no name: %w", int(b), ErrSpec)
	}
	return json.Marshal(name)
}

// UnmarshalJSON decodes a band name. An unknown name is an error wrapping
// ErrFormat and ErrSpec; JSON null leaves b unchanged.
func (b *Band) UnmarshalJSON(data []byte) error {
	if isNull(data) {
		return nil
	}
	var s string
	if err := json.Unmarshal(data, &s); err != nil {
		return fmt.Errorf("filter: band JSON: %w: %w", ErrFormat, err)
	}
	for k, v := range bandNames {
		if v == s {
			*b = k
			return nil
		}
	}
	return fmt.Errorf("filter: band %q unknown: %w: %w", s, ErrFormat, ErrSpec)
}

var stageKindNames = map[StageKind]string{LowpassStage: "lowpass", HighpassStage: "highpass", BandpassStage: "bandpass", NotchStage: "notch"}

// MarshalJSON encodes k as its name ("lowpass", "highpass", "bandpass",
// "notch"). An unknown kind is an error wrapping ErrStage.
func (k StageKind) MarshalJSON() ([]byte, error) {
	name, ok := stageKindNames[k]
	if !ok {
		return nil, fmt.Errorf("filter: StageKind %d has no name: %w", int(k), ErrStage)
	}
	return json.Marshal(name)
}

// UnmarshalJSON decodes a stage kind name. An unknown name is an error
// wrapping ErrFormat and ErrStage; JSON null leaves k unchanged.
func (k *StageKind) UnmarshalJSON(data []byte) error {
	if isNull(data) {
		return nil
	}
	var s string
	if err := json.Unmarshal(data, &s); err != nil {
		return fmt.Errorf("filter: stage kind JSON: %w: %w", ErrFormat, err)
	}
	for kk, v := range stageKindNames {
		if v == s {
			*k = kk
			return nil
		}
	}
	return fmt.Errorf("filter: stage kind %q unknown: %w: %w", s, ErrFormat, ErrStage)
}

type transferJSON struct {
	Zeros [][]float64 `json:"zeros"`
	Poles [][]float64 `json:"poles"`
	Gain  *float64    `json:"gain"`
}

func pairsOf(rs []complex128, what string) ([][]float64, error) {
	out := make([][]float64, len(rs))
	for i, r := range rs {
		if cmplx.IsNaN(r) || cmplx.IsInf(r) {
			return nil, fmt.Errorf("filter: transfer %s[%d] = %v not finite, no JSON for it: %w", what, i, r, ErrRange)
		}
		out[i] = []float64{real(r), imag(r)}
	}
	return out, nil
}

func rootsOf(ps [][]float64, what string) ([]complex128, error) {
	if len(ps) == 0 {
		return nil, nil
	}
	out := make([]complex128, len(ps))
	for i, p := range ps {
		if len(p) != 2 {
			return nil, fmt.Errorf("filter: transfer JSON %s[%d] has %d numbers, want [re, im]: %w", what, i, len(p), ErrFormat)
		}
		out[i] = complex(p[0], p[1])
	}
	return out, nil
}

// MarshalJSON encodes h as {"zeros": [[re, im], ...], "poles": [...],
// "gain": g} (see the package's JSON encodings). A non-finite value is an
// error wrapping ErrRange.
func (h Transfer) MarshalJSON() ([]byte, error) {
	if math.IsNaN(h.Gain) || math.IsInf(h.Gain, 0) {
		return nil, fmt.Errorf("filter: transfer Gain %g not finite, no JSON for it: %w", h.Gain, ErrRange)
	}
	z, err := pairsOf(h.Zeros, "Zeros")
	if err != nil {
		return nil, err
	}
	p, err := pairsOf(h.Poles, "Poles")
	if err != nil {
		return nil, err
	}
	return json.Marshal(transferJSON{Zeros: z, Poles: p, Gain: &h.Gain})
}

// UnmarshalJSON decodes the encoding of MarshalJSON; errors wrap ErrFormat.
// JSON null leaves h unchanged.
func (h *Transfer) UnmarshalJSON(data []byte) error {
	if isNull(data) {
		return nil
	}
	var v transferJSON
	if err := strictDecode(data, &v, "transfer"); err != nil {
		return err
	}
	if v.Gain == nil {
		return fmt.Errorf("filter: transfer JSON without \"gain\": %w", ErrFormat)
	}
	z, err := rootsOf(v.Zeros, "zeros")
	if err != nil {
		return err
	}
	p, err := rootsOf(v.Poles, "poles")
	if err != nil {
		return err
	}
	*h = Transfer{Zeros: z, Poles: p, Gain: *v.Gain}
	return nil
}

type specJSON struct {
	Band     *Band     `json:"band"`
	PassHz   []float64 `json:"pass_hz"`
	StopHz   []float64 `json:"stop_hz"`
	RippleDB *float64  `json:"ripple_db"`
	AttenDB  *float64  `json:"atten_db"`
}

// MarshalJSON encodes s as {"band": ..., "pass_hz": [f0, f1], "stop_hz":
// [f0, f1], "ripple_db": r, "atten_db": a}, always with both array
// elements. It does not validate the mask; an unknown Band or a non-finite
// number is an error (wrapping ErrSpec).
func (s Spec) MarshalJSON() ([]byte, error) {
	if _, err := s.Band.MarshalJSON(); err != nil {
		return nil, err
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"PassHz[0]", s.PassHz[0]}, {"PassHz[1]", s.PassHz[1]}, {"StopHz[0]", s.StopHz[0]}, {"StopHz[1]", s.StopHz[1]},
		{"RippleDB", s.RippleDB}, {"AttenDB", s.AttenDB}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return nil, fmt.Errorf("filter: spec %s %g not finite, no JSON for it: %w", f.name, f.v, ErrSpec)
		}
	}
	b := s.Band
	return json.Marshal(specJSON{Band: &b, PassHz: s.PassHz[:], StopHz: s.StopHz[:], RippleDB: &s.RippleDB, AttenDB: &s.AttenDB})
}

// UnmarshalJSON decodes the encoding of MarshalJSON; errors wrap ErrFormat
// (and ErrSpec for an unknown band). It checks form only: call Validate.
// JSON null leaves s unchanged.
func (s *Spec) UnmarshalJSON(data []byte) error {
	if isNull(data) {
		return nil
	}
	var v specJSON
	if err := strictDecode(data, &v, "spec"); err != nil {
		return err
	}
	missing := func(name string) error {
		return fmt.Errorf("filter: spec JSON without %q: %w", name, ErrFormat)
	}
	switch {
	case v.Band == nil:
		return missing("band")
	case v.PassHz == nil:
		return missing("pass_hz")
	case v.StopHz == nil:
		return missing("stop_hz")
	case v.RippleDB == nil:
		return missing("ripple_db")
	case v.AttenDB == nil:
		return missing("atten_db")
	}
	var out Spec
	for _, a := range []struct {
		name string
		src  []float64
		dst  *[2]float64
	}{{"pass_hz", v.PassHz, &out.PassHz}, {"stop_hz", v.StopHz, &out.StopHz}} {
		if len(a.src) < 1 || len(a.src) > 2 {
			return fmt.Errorf("filter: spec JSON %q has %d numbers, want 1 or 2: %w", a.name, len(a.src), ErrFormat)
		}
		copy(a.dst[:], a.src)
	}
	out.Band, out.RippleDB, out.AttenDB = *v.Band, *v.RippleDB, *v.AttenDB
	*s = out
	return nil
}

type stageJSON struct {
	Kind   *StageKind `json:"kind"`
	Order  *int       `json:"order"`
	F0Hz   *float64   `json:"f0_hz"`
	Q      float64    `json:"q"`
	ZeroHz float64    `json:"zero_hz"`
	Gain   *float64   `json:"gain"`
}

// MarshalJSON encodes s as {"kind": ..., "order": n, "f0_hz": f, "q": q,
// "zero_hz": z, "gain": g}. It does not validate the stage; an unknown kind
// or a non-finite number is an error (wrapping ErrStage).
func (s Stage) MarshalJSON() ([]byte, error) {
	if _, err := s.Kind.MarshalJSON(); err != nil {
		return nil, err
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"F0Hz", s.F0Hz}, {"Q", s.Q}, {"ZeroHz", s.ZeroHz}, {"Gain", s.Gain}} {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) {
			return nil, fmt.Errorf("filter: stage %s %g not finite, no JSON for it: %w", f.name, f.v, ErrStage)
		}
	}
	k := s.Kind
	return json.Marshal(stageJSON{Kind: &k, Order: &s.Order, F0Hz: &s.F0Hz, Q: s.Q, ZeroHz: s.ZeroHz, Gain: &s.Gain})
}

// UnmarshalJSON decodes the encoding of MarshalJSON; errors wrap ErrFormat
// (and ErrStage for an unknown kind). "kind", "order", "f0_hz" and "gain"
// are required. It checks form only: call Validate. JSON null leaves s
// unchanged.
func (s *Stage) UnmarshalJSON(data []byte) error {
	if isNull(data) {
		return nil
	}
	var v stageJSON
	if err := strictDecode(data, &v, "stage"); err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		ok   bool
	}{{"kind", v.Kind != nil}, {"order", v.Order != nil}, {"f0_hz", v.F0Hz != nil}, {"gain", v.Gain != nil}} {
		if !f.ok {
			return fmt.Errorf("filter: stage JSON without %q: %w", f.name, ErrFormat)
		}
	}
	*s = Stage{Kind: *v.Kind, Order: *v.Order, F0Hz: *v.F0Hz, Q: v.Q, ZeroHz: v.ZeroHz, Gain: *v.Gain}
	return nil
}
