package filter

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"strings"
	"testing"

	"pgregory.net/rapid"
)

// Tolerance levels of the prototype tests, relative.
const (
	// protoSciPyTol: agreement with SciPy 1.10.1's prototypes. The
	// closed forms agree to rounding (1e-14); SciPy's elliptic
	// construction (special.ellipj with a Landen inverse) and its float64
	// Bessel roots differ from ours by up to 2e-13 at orders 14 and 20
	// (measured; logged by TestSciPyGolden), while ours are within 3e-14
	// of 200-bit references (accuracy_test.go). 1e-11 leaves margin and is
	// far inside the promised 1e-9.
	protoSciPyTol = 1e-11
	// protoFlat: identities evaluated in float64 on the prototype
	// (|H| at a known frequency); a few hundred ulps for order-64 products.
	protoFlat = 1e-11
)

// protoCond returns Σ|p|/|jω−p| + Σ|z|/|jω−z|: a relative error δ in
// every pole and zero changes |H(jω)| by at most about δ·protoCond
// relative (first order). Near a high-Q pole this is large; the
// prototypes' poles are accurate to about 3e-14 relative (accuracy_test.go),
// so a check of |H(jω)| may ask for protoPoleErr·protoCond and no less.
func protoCond(h Transfer, w float64) float64 {
	s := complex(0, w)
	c := 0.0
	for _, p := range h.Poles {
		c += cmplx.Abs(p) / cmplx.Abs(s-p)
	}
	for _, z := range h.Zeros {
		c += cmplx.Abs(z) / cmplx.Abs(s-z)
	}
	return c
}

// protoPoleErr: relative accuracy of the prototypes' poles, zeros and
// gain, measured against 200-bit references in accuracy_test.go (worst
// 3e-14), with margin.
const protoPoleErr = 1e-13

// protoFamilies lists a family of each kind for loops over all of them.
func protoFamilies() []Family {
	return []Family{
		Butterworth{}, Chebyshev{RippleDB: 0.5}, InverseChebyshev{AttenDB: 50},
		Elliptic{RippleDB: 0.5, AttenDB: 50},
		Bessel{Norm: BesselCorner}, Bessel{Norm: BesselDelay}, Bessel{Norm: BesselPhase},
	}
}

// protoMaxOrder returns the family's highest supported order.
func protoMaxOrder(f Family) int {
	return f.(interface{ MaxOrder() int }).MaxOrder()
}

// protoMatch returns the largest relative distance between the multisets
// got and want, matched greedily nearest-first, or +Inf if their sizes
// differ.
func protoMatch(got, want []complex128) float64 {
	if len(got) != len(want) {
		return math.Inf(1)
	}
	used := make([]bool, len(got))
	worst := 0.0
	for _, w := range want {
		best := -1
		for i, g := range got {
			if !used[i] && (best < 0 || cmplx.Abs(g-w) < cmplx.Abs(got[best]-w)) {
				best = i
			}
		}
		used[best] = true
		worst = math.Max(worst, cmplx.Abs(got[best]-w)/cmplx.Abs(w))
	}
	return worst
}

type protoGolden struct {
	Scipy string `json:"scipy"`
	Cases []struct {
		Family string             `json:"family"`
		Order  int                `json:"order"`
		Params map[string]any     `json:"params"`
		Zeros  [][2]float64       `json:"zeros"`
		Poles  [][2]float64       `json:"poles"`
		Gain   float64            `json:"gain"`
		_      map[string]float64 // keep struct comparable to nothing
	} `json:"cases"`
}

func protoComplex(v [][2]float64) []complex128 {
	out := make([]complex128, len(v))
	for i, p := range v {
		out[i] = complex(p[0], p[1])
	}
	return out
}

// TestSciPyGolden compares every prototype with scipy.signal's analog
// prototypes (buttap, cheb1ap, cheb2ap, ellipap, besselap of SciPy 1.10.1,
// made by internal/scipyref/prototypes.py): poles and zeros as multisets
// and the gain, to protoSciPyTol relative.
func TestSciPyGolden(t *testing.T) {
	b, err := os.ReadFile("testdata/prototypes.json")
	if err != nil {
		t.Fatal(err)
	}
	var g protoGolden
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if g.Scipy != "1.10.1" || len(g.Cases) < 256 {
		t.Fatalf("golden file: SciPy %q, %d cases", g.Scipy, len(g.Cases))
	}
	worst := map[string]float64{}
	for _, c := range g.Cases {
		var f Family
		num := func(k string) float64 { return c.Params[k].(float64) }
		switch c.Family {
		case "butterworth":
			f = Butterworth{}
		case "chebyshev":
			f = Chebyshev{RippleDB: num("RippleDB")}
		case "inversechebyshev":
			f = InverseChebyshev{AttenDB: num("AttenDB")}
		case "elliptic":
			f = Elliptic{RippleDB: num("RippleDB"), AttenDB: num("AttenDB")}
		case "bessel":
			norm := map[string]BesselNorm{"corner": BesselCorner, "delay": BesselDelay, "phase": BesselPhase}[c.Params["Norm"].(string)]
			f = Bessel{Norm: norm}
		default:
			t.Fatalf("unknown family %q", c.Family)
		}
		h, err := f.Prototype(c.Order)
		if err != nil {
			t.Errorf("%v order %d: %v", f, c.Order, err)
			continue
		}
		ep := protoMatch(h.Poles, protoComplex(c.Poles))
		ez := 0.0
		if len(c.Zeros) > 0 || len(h.Zeros) > 0 {
			ez = protoMatch(h.Zeros, protoComplex(c.Zeros))
		}
		eg := math.Abs(h.Gain-c.Gain) / math.Abs(c.Gain)
		e := max(ep, ez, eg)
		worst[c.Family] = max(worst[c.Family], e)
		if e > protoSciPyTol {
			t.Errorf("%v order %d: poles %.2g, zeros %.2g, gain %.2g relative from SciPy %s", f, c.Order, ep, ez, eg, g.Scipy)
		}
	}
	for fam, e := range worst {
		t.Logf("%s: worst relative difference from SciPy %s: %.2g", fam, g.Scipy, e)
	}
}

// TestPrototypeErrors checks that bad orders and parameters give errors
// matching ErrOrder and ErrParam, naming the field.
func TestPrototypeErrors(t *testing.T) {
	bad := []float64{0, -1, math.NaN(), math.Inf(1), math.Inf(-1)}
	for _, f := range protoFamilies() {
		for _, n := range []int{0, -3, protoMaxOrder(f) + 1, math.MaxInt} {
			_, err := f.Prototype(n)
			if !errors.Is(err, ErrOrder) {
				t.Errorf("%v.Prototype(%d) error %v, want ErrOrder", f, n, err)
			}
			if n > 0 && !strings.Contains(fmt.Sprint(err), fmt.Sprintf("1..%d", protoMaxOrder(f))) {
				t.Errorf("%v.Prototype(%d) error %q does not state the range", f, n, err)
			}
		}
	}
	type tc struct {
		f     Family
		field string
	}
	var cases []tc
	for _, v := range bad {
		cases = append(cases,
			tc{Chebyshev{RippleDB: v}, "RippleDB"},
			tc{InverseChebyshev{AttenDB: v}, "AttenDB"},
			tc{Elliptic{RippleDB: v, AttenDB: 40}, "RippleDB"},
			tc{Elliptic{RippleDB: 1, AttenDB: v}, "AttenDB"},
		)
	}
	cases = append(cases,
		tc{Elliptic{RippleDB: 3, AttenDB: 3}, "AttenDB"},
		tc{Elliptic{RippleDB: 3, AttenDB: 1}, "AttenDB"},
		tc{Bessel{Norm: 3}, "Norm"},
		tc{Bessel{Norm: -1}, "Norm"},
	)
	for _, c := range cases {
		_, err := c.f.Prototype(4)
		if !errors.Is(err, ErrParam) || !strings.Contains(err.Error(), c.field) || !strings.HasPrefix(err.Error(), "filter: ") {
			t.Errorf("%#v.Prototype(4) error %v, want ErrParam naming %s", c.f, err, c.field)
		}
	}
	// The message format of the brief: field, value, reason.
	_, err := Chebyshev{RippleDB: -1}.Prototype(3)
	if want := "filter: Chebyshev RippleDB -1 not positive and finite"; err == nil || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("error %q, want prefix %q", err, want)
	}
}

// TestPoleOrdering checks the documented order: conjugate pairs with the
// positive-imaginary member first, in descending Q, then the real pole;
// zeros in pairs the same way, on the jω axis.
func TestPoleOrdering(t *testing.T) {
	for _, f := range protoFamilies() {
		for n := 1; n <= min(20, protoMaxOrder(f)); n++ {
			h, err := f.Prototype(n)
			if err != nil {
				t.Fatal(err)
			}
			if len(h.Poles) != n {
				t.Fatalf("%v order %d: %d poles", f, n, len(h.Poles))
			}
			prevQ := math.Inf(1)
			for i := 0; i+1 < n; i += 2 {
				p, c := h.Poles[i], h.Poles[i+1]
				if !(imag(p) > 0) || c != cmplx.Conj(p) {
					t.Fatalf("%v order %d: pair %d is %v, %v", f, n, i/2, p, c)
				}
				q := cmplx.Abs(p) / (-2 * real(p))
				if q > prevQ*(1+1e-12) {
					t.Fatalf("%v order %d: Q rises at pair %d (%g after %g)", f, n, i/2, q, prevQ)
				}
				prevQ = q
			}
			if n%2 == 1 && (imag(h.Poles[n-1]) != 0 || !(real(h.Poles[n-1]) < 0)) {
				t.Fatalf("%v order %d: last pole %v not real negative", f, n, h.Poles[n-1])
			}
			for i := 0; i < len(h.Zeros); i += 2 {
				z := h.Zeros[i]
				if real(z) != 0 || !(imag(z) > 0) || h.Zeros[i+1] != cmplx.Conj(z) {
					t.Fatalf("%v order %d: zero pair %d is %v, %v", f, n, i/2, z, h.Zeros[i+1])
				}
			}
		}
	}
}

// TestStableFarBeyond checks that every supported order, up to the
// family's maximum, has all poles strictly in the left half-plane and a
// finite positive gain.
func TestStableFarBeyond(t *testing.T) {
	for _, f := range protoFamilies() {
		for n := 1; n <= protoMaxOrder(f); n++ {
			h, err := f.Prototype(n)
			if err != nil {
				t.Fatalf("%v order %d: %v", f, n, err)
			}
			for _, p := range h.Poles {
				if !(real(p) < 0) || cmplx.IsNaN(p) || cmplx.IsInf(p) {
					t.Fatalf("%v order %d: pole %v not in the open left half-plane", f, n, p)
				}
			}
			if !(h.Gain > 0) || math.IsInf(h.Gain, 0) {
				t.Fatalf("%v order %d: gain %g", f, n, h.Gain)
			}
		}
	}
}

// TestPassbandMaximumProperty checks, for random orders and parameters,
// that the passband maximum of |H| is 1 (0 dB) and that the edge
// attenuation is as documented: Butterworth and Bessel-corner −3.0103 dB
// at 1 rad/s, Chebyshev and elliptic −RippleDB at 1 rad/s, inverse
// Chebyshev −AttenDB at 1 rad/s.
func TestPassbandMaximumProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		kind := rapid.IntRange(0, 4).Draw(t, "kind")
		rip := rapid.Float64Range(0.01, 3).Draw(t, "ripple")
		att := rapid.Float64Range(rip+10, 120).Draw(t, "atten")
		var f Family
		var edgeDB float64
		switch kind {
		case 0:
			f, edgeDB = Butterworth{}, -10*math.Log10(2)
		case 1:
			f, edgeDB = Chebyshev{RippleDB: rip}, -rip
		case 2:
			f, edgeDB = InverseChebyshev{AttenDB: att}, -att
		case 3:
			f, edgeDB = Elliptic{RippleDB: rip, AttenDB: att}, -rip
		case 4:
			f, edgeDB = Bessel{}, -10*math.Log10(2)
		}
		n := rapid.IntRange(1, min(20, protoMaxOrder(f))).Draw(t, "n")
		h, err := f.Prototype(n)
		if _, ok := f.(Elliptic); ok && errors.Is(err, ErrRange) {
			return // pole Q beyond MaxEllipticQ: refused by design
		}
		if err != nil {
			t.Fatal(err)
		}
		// Largest |H| over [0, 1] rad/s, refined around the best grid point.
		best, bw := 0.0, 0.0
		for i := 0; i <= 4000; i++ {
			w := float64(i) / 4000
			if m := cmplx.Abs(h.At(complex(0, w))); m > best {
				best, bw = m, w
			}
		}
		lo, hi := math.Max(0, bw-1.0/4000), math.Min(1, bw+1.0/4000)
		for range 60 { // golden-section-like shrink on a unimodal peak
			a, b := lo+(hi-lo)/3, hi-(hi-lo)/3
			if cmplx.Abs(h.At(complex(0, a))) > cmplx.Abs(h.At(complex(0, b))) {
				hi = b
			} else {
				lo = a
			}
		}
		best = math.Max(best, cmplx.Abs(h.At(complex(0, (lo+hi)/2))))
		if math.Abs(best-1) > protoPoleErr*(1+protoCond(h, bw)) {
			t.Fatalf("%v order %d: passband maximum |H| = %.15g, want 1", f, n, best)
		}
		edge := 20 * math.Log10(cmplx.Abs(h.At(1i)))
		// dB error = 8.69·(relative |H| error).
		if math.Abs(edge-edgeDB) > 8.7*protoPoleErr*(1+protoCond(h, 1)) {
			t.Fatalf("%v order %d: %.12g dB at 1 rad/s, want %.12g", f, n, edge, edgeDB)
		}
	})
}

func BenchmarkPrototype(b *testing.B) {
	for _, f := range protoFamilies() {
		for _, n := range []int{4, 8, 16} {
			b.Run(fmt.Sprintf("%v/%d", f, n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					if _, err := f.Prototype(n); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// FuzzPrototype feeds arbitrary orders and parameters to every family:
// never a panic; either an error matching ErrOrder, ErrParam or ErrRange,
// or a stable prototype with a finite gain.
func FuzzPrototype(f *testing.F) {
	f.Add(4, 0.5, 60.0, 0)
	f.Add(1, 3.0, 3.0001, 1)
	f.Add(0, -1.0, math.NaN(), 2)
	f.Add(64, 1e-12, 400.0, 3)
	f.Add(14, 0.0001, 300.0, 4)
	f.Add(40, 1e-300, 1e300, 5)
	f.Fuzz(func(t *testing.T, n int, rip, att float64, norm int) {
		n %= 80 // mostly inside the supported ranges, some beyond and below
		fams := []Family{Butterworth{}, Chebyshev{RippleDB: rip}, InverseChebyshev{AttenDB: att},
			Elliptic{RippleDB: rip, AttenDB: att}, Bessel{Norm: BesselNorm(norm)}}
		for _, fam := range fams {
			h, err := fam.Prototype(n)
			if err != nil {
				if !errors.Is(err, ErrOrder) && !errors.Is(err, ErrParam) && !errors.Is(err, ErrRange) {
					t.Fatalf("%v.Prototype(%d): unexpected error %v", fam, n, err)
				}
				continue
			}
			for _, p := range h.Poles {
				if !(real(p) < 0) {
					t.Fatalf("%#v.Prototype(%d): pole %v", fam, n, p)
				}
			}
			if !(h.Gain > 0) || math.IsInf(h.Gain, 0) {
				t.Fatalf("%#v.Prototype(%d): gain %g", fam, n, h.Gain)
			}
		}
	})
}
