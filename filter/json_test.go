package filter

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"pgregory.net/rapid"
)

// finite draws any finite float64, including subnormals, -0 and extremes.
func finite(t *rapid.T, name string) float64 {
	return rapid.Float64().Filter(func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }).Draw(t, name)
}

func roundTrip[T any](t *rapid.T, v T) T {
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatalf("marshal %+v: %v", v, err)
	}
	var out T
	if err := json.Unmarshal(b, &out); err != nil {
		t.Fatalf("unmarshal %s: %v", b, err)
	}
	return out
}

// sameBits compares float64s bit for bit (so -0 and 0 differ), for exact
// round trips.
var sameBits = cmp.Comparer(func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) })

func TestJSONRoundTripExact(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		var h Transfer
		nz := rapid.IntRange(0, 4).Draw(t, "nz")
		np := rapid.IntRange(0, 5).Draw(t, "np")
		for i := range nz {
			h.Zeros = append(h.Zeros, complex(finite(t, "zr"+itoa(i)), finite(t, "zi"+itoa(i))))
		}
		for i := range np {
			h.Poles = append(h.Poles, complex(finite(t, "pr"+itoa(i)), finite(t, "pi"+itoa(i))))
		}
		h.Gain = finite(t, "gain")
		got := roundTrip(t, h)
		cmpC := cmp.Comparer(func(a, b complex128) bool {
			return math.Float64bits(real(a)) == math.Float64bits(real(b)) && math.Float64bits(imag(a)) == math.Float64bits(imag(b))
		})
		if d := cmp.Diff(h, got, cmpC, sameBits, cmpopts.EquateEmpty()); d != "" {
			t.Fatalf("transfer round trip (-want +got):\n%s", d)
		}
		s := Spec{
			Band:     Band(rapid.IntRange(1, 4).Draw(t, "band")),
			PassHz:   [2]float64{finite(t, "p0"), finite(t, "p1")},
			StopHz:   [2]float64{finite(t, "s0"), finite(t, "s1")},
			RippleDB: finite(t, "rp"), AttenDB: finite(t, "as"),
		}
		if d := cmp.Diff(s, roundTrip(t, s), sameBits); d != "" {
			t.Fatalf("spec round trip (-want +got):\n%s", d)
		}
		st := Stage{
			Kind: StageKind(rapid.IntRange(1, 4).Draw(t, "kind")), Order: rapid.IntRange(-3, 3).Draw(t, "order"),
			F0Hz: finite(t, "f0"), Q: finite(t, "q"), ZeroHz: finite(t, "zhz"), Gain: finite(t, "g"),
		}
		if d := cmp.Diff(st, roundTrip(t, st), sameBits); d != "" {
			t.Fatalf("stage round trip (-want +got):\n%s", d)
		}
	})
}

// TestJSONFieldNames pins the documented encodings (a stable format).
func TestJSONFieldNames(t *testing.T) {
	for _, c := range []struct {
		v    any
		want string
	}{
		{Transfer{Zeros: []complex128{complex(0, 2)}, Poles: []complex128{-1.5, complex(-1, 0.25)}, Gain: 3}, `{"zeros":[[0,2]],"poles":[[-1.5,0],[-1,0.25]],"gain":3}`},
		{Transfer{Gain: 1}, `{"zeros":[],"poles":[],"gain":1}`},
		{Spec{Band: Bandstop, PassHz: [2]float64{100, 900}, StopHz: [2]float64{200, 300}, RippleDB: 0.5, AttenDB: 40}, `{"band":"bandstop","pass_hz":[100,900],"stop_hz":[200,300],"ripple_db":0.5,"atten_db":40}`},
		{Stage{Kind: NotchStage, Order: 2, F0Hz: 1000, Q: 2.5, ZeroHz: 1200, Gain: -1}, `{"kind":"notch","order":2,"f0_hz":1000,"q":2.5,"zero_hz":1200,"gain":-1}`},
		{[]Band{Lowpass, Highpass, Bandpass, Bandstop}, `["lowpass","highpass","bandpass","bandstop"]`},
		{[]StageKind{LowpassStage, HighpassStage, BandpassStage, NotchStage}, `["lowpass","highpass","bandpass","notch"]`},
	} {
		b, err := json.Marshal(c.v)
		if err != nil {
			t.Fatal(err)
		}
		if string(b) != c.want {
			t.Errorf("got %s, want %s", b, c.want)
		}
	}
	// Lowpass specs may give one-element arrays.
	var s Spec
	if err := json.Unmarshal([]byte(`{"band":"lowpass","pass_hz":[1000],"stop_hz":[2000],"ripple_db":1,"atten_db":40}`), &s); err != nil {
		t.Fatal(err)
	}
	if s != (Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{2000}, RippleDB: 1, AttenDB: 40}) {
		t.Errorf("decoded %+v", s)
	}
}

func TestJSONErrors(t *testing.T) {
	for _, c := range []struct {
		reason string
		into   any
		data   string
		want   []error
	}{
		{"syntax", new(Transfer), `{"gain":`, []error{ErrFormat}},
		{"pair of three", new(Transfer), `{"poles":[[1,2,3]],"gain":1}`, []error{ErrFormat}},
		{"missing gain", new(Transfer), `{"poles":[[1,2]]}`, []error{ErrFormat}},
		{"unknown field", new(Transfer), `{"gain":1,"k":2}`, []error{ErrFormat}},
		{"string gain", new(Transfer), `{"gain":"1"}`, []error{ErrFormat}},
		{"unknown band", new(Spec), `{"band":"allpass","pass_hz":[1],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, []error{ErrFormat, ErrSpec}},
		{"band not a string", new(Band), `3`, []error{ErrFormat}},
		{"three edges", new(Spec), `{"band":"bandpass","pass_hz":[1,2,3],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, []error{ErrFormat}},
		{"no edges", new(Spec), `{"band":"lowpass","pass_hz":[],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, []error{ErrFormat}},
		{"missing atten", new(Spec), `{"band":"lowpass","pass_hz":[1],"stop_hz":[2],"ripple_db":1}`, []error{ErrFormat}},
		{"unknown kind", new(Stage), `{"kind":"allpass","order":2,"f0_hz":1,"q":1,"gain":1}`, []error{ErrFormat, ErrStage}},
		{"missing f0", new(Stage), `{"kind":"lowpass","order":2,"q":1,"gain":1}`, []error{ErrFormat}},
		{"trailing data", new(Stage), `{"kind":"lowpass","order":1,"f0_hz":1,"gain":1} {}`, []error{ErrFormat}},
	} {
		// Call the method itself: json.Unmarshal checks the syntax of the
		// whole document before it reaches ours.
		err := c.into.(json.Unmarshaler).UnmarshalJSON([]byte(c.data))
		if err == nil {
			t.Errorf("%s: no error", c.reason)
			continue
		}
		for _, w := range c.want {
			if !errors.Is(err, w) {
				t.Errorf("%s: %v does not wrap %v", c.reason, err, w)
			}
		}
	}
	for _, v := range []any{Band(0), StageKind(9), Transfer{Gain: math.NaN()}, Transfer{Gain: 1, Poles: []complex128{complex(math.Inf(1), 0)}}, Spec{Band: 7}, Spec{Band: Lowpass, RippleDB: math.Inf(1)}} {
		if _, err := json.Marshal(v); err == nil {
			t.Errorf("marshal %+v: no error", v)
		}
	}
}

// FuzzUnmarshalJSON: decoding any text into Spec, Transfer or Stage never
// panics; it fails with ErrFormat (or a json syntax error) or gives a
// value that re-encodes and decodes to itself.
func FuzzUnmarshalJSON(f *testing.F) {
	f.Add([]byte(`{"band":"bandpass","pass_hz":[1000,2000],"stop_hz":[500,4000],"ripple_db":1,"atten_db":40}`))
	f.Add([]byte(`{"zeros":[[0,2],[0,-2]],"poles":[[-1,1],[-1,-1]],"gain":3}`))
	f.Add([]byte(`{"kind":"notch","order":2,"f0_hz":1000,"q":2,"zero_hz":1500,"gain":1}`))
	f.Add([]byte(`{"band":"lowpass","pass_hz":[1e308,2],"stop_hz":[-0],"ripple_db":1e-320,"atten_db":40}`))
	f.Add([]byte(`null`))
	f.Add([]byte(`{"poles":[[1]],"gain":1}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		check := func(v json.Unmarshaler, fresh func() json.Unmarshaler) {
			if err := v.UnmarshalJSON(data); err != nil {
				if !errors.Is(err, ErrFormat) {
					t.Fatalf("%T: error %v does not wrap ErrFormat", v, err)
				}
				return
			}
			b, err := json.Marshal(v)
			if err != nil {
				// A decoded band or kind is always named; only the zero
				// value from "null" may fail to encode.
				return
			}
			w := fresh()
			if err := w.UnmarshalJSON(b); err != nil {
				t.Fatalf("%T: re-decoding %s: %v", v, b, err)
			}
			b2, err := json.Marshal(w)
			if err != nil || string(b2) != string(b) {
				t.Fatalf("%T: %s re-encodes as %s (%v)", v, b, b2, err)
			}
		}
		check(new(Spec), func() json.Unmarshaler { return new(Spec) })
		check(new(Transfer), func() json.Unmarshaler { return new(Transfer) })
		check(new(Stage), func() json.Unmarshaler { return new(Stage) })
	})
}
