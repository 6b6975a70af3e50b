package filter_test

import (
	"encoding/json"
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// sameJSON reports whether two values encode to the same JSON (a bit-exact
// comparison of their numbers, since the encoding is the shortest decimal
// that reads back to the same float64).
func sameJSON(t *testing.T, a, b any) bool {
	t.Helper()
	ja, err1 := json.Marshal(a)
	jb, err2 := json.Marshal(b)
	return err1 == nil && err2 == nil && string(ja) == string(jb)
}

// FuzzFilterJSON feeds arbitrary bytes to the JSON decoders of Spec,
// Stage, Transfer, Band and StageKind, both through encoding/json and
// through UnmarshalJSON directly: never a panic; every decoding error
// wraps ErrFormat; a value that decodes and encodes again reads back to
// the same value, bit for bit.
func FuzzFilterJSON(f *testing.F) {
	for _, s := range []string{
		`{"band":"lowpass","pass_hz":[1000],"stop_hz":[2000],"ripple_db":1,"atten_db":40}`,
		`{"band":"bandstop","pass_hz":[100,900],"stop_hz":[200,300],"ripple_db":0.5,"atten_db":40}`,
		`{"kind":"notch","order":2,"f0_hz":1000,"q":2.5,"zero_hz":1200,"gain":-1}`,
		`{"kind":"lowpass","order":1,"f0_hz":1e-300,"gain":5e-324}`,
		`{"zeros":[[0,2],[0,-2]],"poles":[[-1.5,0],[-1,0.25],[-1,-0.25]],"gain":3}`,
		`{"zeros":[],"poles":[],"gain":-0}`,
		`"bandpass"`, `"notch"`, `null`, `{}`, `[]`, `{"gain":1e308,"poles":[[1e308,-1e308]]}`,
		`{"band":"lowpass","pass_hz":[1,2,3]}`, `{"kind":"lowpass","order":1e300}`,
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		type codec struct {
			name string
			new  func() any
		}
		for _, c := range []codec{
			{"Spec", func() any { return new(filter.Spec) }},
			{"Stage", func() any { return new(filter.Stage) }},
			{"Transfer", func() any { return new(filter.Transfer) }},
			{"Band", func() any { return new(filter.Band) }},
			{"StageKind", func() any { return new(filter.StageKind) }},
		} {
			direct := c.new()
			errDirect := direct.(json.Unmarshaler).UnmarshalJSON(data)
			if errDirect != nil && !errors.Is(errDirect, filter.ErrFormat) {
				t.Fatalf("%s.UnmarshalJSON(%q): error %v does not wrap ErrFormat", c.name, data, errDirect)
			}
			v := c.new()
			if err := json.Unmarshal(data, v); err != nil {
				continue // encoding/json's own syntax errors, or ours
			}
			b, err := json.Marshal(v)
			if err != nil {
				// A decoded value the encoder refuses: only the zero band
				// or kind left by JSON null.
				if !errors.Is(err, filter.ErrSpec) && !errors.Is(err, filter.ErrStage) && !errors.Is(err, filter.ErrRange) {
					t.Fatalf("%s: marshal of decoded %+v: %v", c.name, v, err)
				}
				continue
			}
			back := c.new()
			if err := json.Unmarshal(b, back); err != nil {
				t.Fatalf("%s: %s does not decode: %v", c.name, b, err)
			}
			if !sameJSON(t, v, back) {
				t.Fatalf("%s: round trip of %q changed %+v to %+v", c.name, data, v, back)
			}
		}
	})
}

// FuzzStages factors arbitrary transfer functions (up to two complex pole
// pairs, a real pole, a jω zero pair and origin zeros): never a panic;
// errors wrap ErrStage or ErrRange; every returned stage is valid with
// finite figures, and where the numbers are within a sane range (pole and
// zero frequencies from 1e-3 to 1e9 rad/s, Q at most 1e4) the cascade
// equals the transfer function to 1e-8 of its peak at every probe.
func FuzzStages(f *testing.F) {
	f.Add(-0.5, 0.9, -0.2, 1.5, -1.0, 1.2, uint8(0), 1.0, uint8(0))
	f.Add(-1.0, 0.0, -2.0, 0.0, -3.0, 0.0, uint8(3), 2.0, uint8(1))
	f.Add(-1e-3, 1e3, -1e3, 1e-3, -1e9, 0.0, uint8(2), -4.0, uint8(0))
	f.Add(1.0, 1.0, -1.0, 1.0, -1.0, 0.0, uint8(0), 1.0, uint8(0))
	f.Add(math.NaN(), 1.0, -1.0, math.Inf(1), -1.0, 5e-324, uint8(9), 0.0, uint8(7))
	f.Add(-1e-300, 1e300, -1e300, 1e-300, -1e-308, 1e308, uint8(1), 1e308, uint8(0))
	f.Fuzz(func(t *testing.T, ar, ai, br, bi, pr, zi float64, origin uint8, gain float64, plan uint8) {
		h := filter.Transfer{Gain: gain}
		for _, p := range []complex128{complex(ar, ai), complex(br, bi)} {
			if imag(p) == 0 {
				h.Poles = append(h.Poles, p, p)
			} else {
				h.Poles = append(h.Poles, p, cmplx.Conj(p))
			}
		}
		h.Poles = append(h.Poles, complex(pr, 0))
		if zi != 0 {
			h.Zeros = append(h.Zeros, complex(0, zi), complex(0, -zi))
		}
		for range origin % 4 {
			h.Zeros = append(h.Zeros, 0)
		}
		st, err := h.StagesWith(filter.StageOptions{Gain: filter.GainPlan(plan % 3)})
		if err != nil {
			if !errors.Is(err, filter.ErrStage) && !errors.Is(err, filter.ErrRange) {
				t.Fatalf("%+v: error %v wraps neither ErrStage nor ErrRange", h, err)
			}
			return
		}
		orders := 0
		for i, s := range st {
			if err := s.Validate(); err != nil {
				t.Fatalf("%+v: stage %d %+v invalid: %v", h, i, s, err)
			}
			orders += s.Order
		}
		if orders != len(h.Poles) {
			t.Fatalf("%+v: stages of total order %d for %d poles", h, orders, len(h.Poles))
		}
		sane := func(r complex128) bool {
			m := cmplx.Abs(r)
			return r == 0 || (m >= 1e-3 && m <= 1e9 && (imag(r) == 0 || m/(-2*real(r)) <= 1e4))
		}
		for _, r := range append(append([]complex128(nil), h.Poles...), h.Zeros...) {
			if !sane(r) {
				return
			}
		}
		if a := math.Abs(gain); !(a >= 1e-100 && a <= 1e100) {
			return
		}
		probes := []float64{}
		for _, r := range h.Poles {
			w := cmplx.Abs(r) / (2 * math.Pi)
			probes = append(probes, w/3, w, w*1.01, 3*w)
		}
		peak := 0.0
		for _, fz := range probes {
			peak = math.Max(peak, cmplx.Abs(h.AtHz(fz)))
		}
		for _, fz := range probes {
			want := h.AtHz(fz)
			got := complex(1, 0)
			for _, s := range st {
				got *= s.Transfer().AtHz(fz)
			}
			if e := cmplx.Abs(got - want); !(e <= 1e-8*peak) {
				t.Fatalf("%+v at %g Hz: cascade %v, transfer %v (error %.3g of peak %.3g)", h, fz, got, want, e/peak, peak)
			}
		}
	})
}

// FuzzTransforms moves prototypes of every family to arbitrary corners,
// centres and widths: never a panic; errors wrap ErrFrequency or ErrRange;
// results hold finite poles in the left half-plane, finite zeros and gain;
// and where the frequencies are sane (1e-6 to 1e12 Hz) the response at the
// mapped edges equals the prototype's at 1 rad/s to 1e-9.
func FuzzTransforms(f *testing.F) {
	f.Add(uint8(0), uint8(4), 1000.0, 100.0)
	f.Add(uint8(1), uint8(7), 1e-3, 1e9)
	f.Add(uint8(2), uint8(12), 1e9, 1e-3)
	f.Add(uint8(3), uint8(30), 1e300, 1e-300)
	f.Add(uint8(4), uint8(1), math.NaN(), math.Inf(1))
	f.Add(uint8(5), uint8(64), 5e-324, -0.0)
	f.Fuzz(func(t *testing.T, fam, n uint8, a, b float64) {
		fams := []filter.Family{filter.Butterworth{}, filter.Chebyshev{RippleDB: 0.5}, filter.InverseChebyshev{AttenDB: 60},
			filter.Elliptic{RippleDB: 0.5, AttenDB: 60}, filter.Bessel{}, filter.Chebyshev{RippleDB: 3}}
		fy := fams[int(fam)%len(fams)]
		order := 1 + int(n)%20
		if _, ok := fy.(filter.Elliptic); ok {
			order = 1 + int(n)%12
		}
		p, err := fy.Prototype(order)
		if err != nil {
			t.Fatal(err)
		}
		edge := p.At(1i)
		check := func(name string, h filter.Transfer, err error, edges ...float64) {
			if err != nil {
				if !errors.Is(err, filter.ErrFrequency) && !errors.Is(err, filter.ErrRange) {
					t.Fatalf("%v %d %s(%g, %g): error %v", fy, order, name, a, b, err)
				}
				return
			}
			if math.IsNaN(h.Gain) || math.IsInf(h.Gain, 0) {
				t.Fatalf("%v %d %s(%g, %g): gain %g", fy, order, name, a, b, h.Gain)
			}
			for _, r := range h.Poles {
				if !(real(r) < 0) || cmplx.IsInf(r) {
					t.Fatalf("%v %d %s(%g, %g): pole %v", fy, order, name, a, b, r)
				}
			}
			for _, r := range h.Zeros {
				if cmplx.IsNaN(r) || cmplx.IsInf(r) {
					t.Fatalf("%v %d %s(%g, %g): zero %v", fy, order, name, a, b, r)
				}
			}
			for _, e := range edges {
				if !(e >= 1e-6 && e <= 1e12) {
					return
				}
			}
			for _, e := range edges {
				got := cmplx.Abs(h.AtHz(e))
				if d := math.Abs(got - cmplx.Abs(edge)); !(d <= 1e-9*math.Max(1, cmplx.Abs(edge))) {
					t.Fatalf("%v %d %s(%g, %g): |H| at edge %g Hz is %.15g, prototype's at 1 rad/s %.15g", fy, order, name, a, b, e, got, cmplx.Abs(edge))
				}
			}
		}
		h, err := p.ToLowpass(a)
		check("ToLowpass", h, err, a)
		h, err = p.ToHighpass(a)
		check("ToHighpass", h, err, a)
		// Band edges from centre a and width b: f1·f2 = a², f2 − f1 = b.
		f2 := b/2 + math.Sqrt(b*b/4+a*a)
		f1 := a * a / f2
		if !(b/a >= 1e-6 && b/a <= 1e6) {
			f1, f2 = math.NaN(), math.NaN() // edges too close for 1e-9 to be meaningful
		}
		h, err = p.ToBandpass(a, b)
		check("ToBandpass", h, err, f1, f2)
		h, err = p.ToBandstop(a, b)
		check("ToBandstop", h, err, f1, f2)
	})
}
