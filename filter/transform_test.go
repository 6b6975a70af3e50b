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

// Tolerance levels of the transform checks.
const (
	// identityTol is the relative agreement of a transformed response with
	// the prototype evaluated at the substituted frequency: both are
	// products of up to ~40 factors each rounded to a few ulp, and the
	// root formulas lose at most a factor Q near a resonance.
	identityTol = 1e-9
	// goldenTol is the relative agreement with SciPy's transformed roots
	// and gains (both sides accurate to ~1e-14; printing keeps 17 digits).
	goldenTol = 1e-10
)

// condTol returns the tolerance for comparing x at f hertz with a
// reference computed from the same frequency by another formula:
// identityTol plus the rounding of the frequency itself (a few ulp)
// amplified by the response's condition number κ = |f·H'(f)/H(f)|, which
// reaches 1e7 at the band edges of narrow high-order elliptic bands.
//
// κ is estimated by central differences at two steps, the smaller one
// resolving resonances of Q up to ~1e9 that the larger one steps over.
func condTol(x Transfer, f float64) float64 {
	h0 := cmplx.Abs(x.AtHz(f))
	kappa := 0.0
	for _, d := range []float64{1e-7, 1e-10} {
		hp, hm := x.AtHz(f*(1+d)), x.AtHz(f*(1-d))
		kappa = math.Max(kappa, cmplx.Abs(hp-hm)/(2*d*h0))
	}
	return identityTol + 16*0x1p-52*kappa
}

// relClose reports |a − b| ≤ tol·max(|a|, |b|) (or both tiny).
func relClose(a, b complex128, tol float64) bool {
	d := cmplx.Abs(a - b)
	return d <= tol*math.Max(cmplx.Abs(a), cmplx.Abs(b)) || d < 1e-300
}

// genPrototype draws a normalized prototype of a random family and order.
func genPrototype(t *rapid.T) Transfer {
	n := rapid.IntRange(1, 12).Draw(t, "order")
	var f Family
	switch rapid.IntRange(0, 4).Draw(t, "family") {
	case 0:
		f = Butterworth{}
	case 1:
		f = Chebyshev{RippleDB: rapid.Float64Range(0.01, 3).Draw(t, "rp")}
	case 2:
		f = InverseChebyshev{AttenDB: rapid.Float64Range(10, 100).Draw(t, "as")}
	case 3:
		f = Elliptic{RippleDB: rapid.Float64Range(0.01, 3).Draw(t, "rp"), AttenDB: rapid.Float64Range(20, 100).Draw(t, "as")}
	default:
		f = Bessel{Norm: BesselNorm(rapid.IntRange(0, 2).Draw(t, "norm"))}
	}
	h, err := f.Prototype(n)
	if err != nil {
		t.Fatalf("%v order %d: %v", f, n, err)
	}
	return h
}

func logFreq(t *rapid.T, name string, lo, hi float64) float64 {
	return math.Exp(rapid.Float64Range(math.Log(lo), math.Log(hi)).Draw(t, name))
}

func checkLHP(t *rapid.T, what string, h Transfer) {
	for _, p := range h.Poles {
		if !(real(p) < 0) {
			t.Fatalf("%s: pole %v not in the left half-plane", what, p)
		}
	}
}

// checkPairs checks that every complex root has its exact conjugate next
// to it, positive imaginary part first (the prototypes' order).
func checkPairs(t *rapid.T, what string, rs []complex128) {
	for i := 0; i < len(rs); i++ {
		if imag(rs[i]) == 0 {
			continue
		}
		if i+1 >= len(rs) || rs[i+1] != cmplx.Conj(rs[i]) || imag(rs[i]) < 0 {
			t.Fatalf("%s: root %d = %v not followed by its conjugate (positive first): %v", what, i, rs[i], rs)
		}
		i++
	}
}

// TestTransformsMapFrequency: each transform equals the prototype at the
// substituted frequency (the defining identity), poles stay in the left
// half-plane, conjugate pairs stay adjacent.
func TestTransformsMapFrequency(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := genPrototype(t)
		fc := logFreq(t, "fc", 1e-2, 1e6)
		bwRatio := logFreq(t, "bw", 1e-3, 10)
		f := logFreq(t, "f", 1e-3, 1e3) * fc
		if math.Abs(f/fc-1) < 1e-6 {
			// The reference substitution is singular at the centre.
			f *= 1.01
		}
		w, w0, bw := 2*math.Pi*f, 2*math.Pi*fc, 2*math.Pi*fc*bwRatio
		jw := complex(0, w)
		lp, err := h.ToLowpass(fc)
		if err != nil {
			t.Fatal(err)
		}
		hp, err := h.ToHighpass(fc)
		if err != nil {
			t.Fatal(err)
		}
		bp, err := h.ToBandpass(fc, fc*bwRatio)
		if err != nil {
			t.Fatal(err)
		}
		bs, err := h.ToBandstop(fc, fc*bwRatio)
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			name string
			x    Transfer
			got  complex128
			s    complex128 // prototype's s
		}{
			{"lowpass", lp, lp.AtHz(f), jw / complex(w0, 0)},
			{"highpass", hp, hp.AtHz(f), complex(w0, 0) / jw},
			// ω0² − ω² as (ω0 − ω)(ω0 + ω): no cancellation near the centre.
			{"bandpass", bp, bp.AtHz(f), complex((w0-w)*(w0+w), 0) / (complex(bw, 0) * jw)},
			{"bandstop", bs, bs.AtHz(f), complex(bw, 0) * jw / complex((w0-w)*(w0+w), 0)},
		} {
			if want := h.At(c.s); !relClose(c.got, want, condTol(c.x, f)) {
				t.Fatalf("%s at %g Hz: %v, prototype at %v gives %v", c.name, f, c.got, c.s, want)
			}
		}
		for name, x := range map[string]Transfer{"lowpass": lp, "highpass": hp, "bandpass": bp, "bandstop": bs} {
			checkLHP(t, name, x)
			checkPairs(t, name+" poles", x.Poles)
			checkPairs(t, name+" zeros", x.Zeros)
		}
		if len(bp.Poles) != 2*len(h.Poles) || len(bs.Poles) != 2*len(h.Poles) ||
			len(bp.Zeros) != len(h.Zeros)+len(h.Poles) || len(bs.Zeros) != 2*len(h.Poles) {
			t.Fatalf("band degrees: bp %d/%d bs %d/%d from %d/%d", len(bp.Zeros), len(bp.Poles), len(bs.Zeros), len(bs.Poles), len(h.Zeros), len(h.Poles))
		}
	})
}

// TestTransformEdges: the corner lands where asked (the same attenuation at
// cornerHz as the prototype at 1 rad/s), bandpass edges at the geometric
// centre ± width (f1·f2 = centre², f2 − f1 = width), |H_hp(f)| =
// |H_lp(fc²/f)|, and bandstop mirrors bandpass: the bandstop of H is the
// bandpass of H(1/s).
func TestTransformEdges(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		h := genPrototype(t)
		fc := logFreq(t, "fc", 1e-2, 1e6)
		width := fc * logFreq(t, "bw", 1e-3, 10)
		edge := cmplx.Abs(h.At(1i))
		lp, _ := h.ToLowpass(fc)
		hp, _ := h.ToHighpass(fc)
		bp, _ := h.ToBandpass(fc, width)
		bs, _ := h.ToBandstop(fc, width)
		for name, x := range map[string]Transfer{"lowpass": lp, "highpass": hp} {
			if got := cmplx.Abs(x.AtHz(fc)); !relClose(complex(got, 0), complex(edge, 0), identityTol) {
				t.Fatalf("%s: |H(fc)| = %g, prototype |H(j)| = %g", name, got, edge)
			}
		}
		f1 := math.Sqrt(fc*fc+width*width/4) - width/2
		f2 := f1 + width
		if math.Abs(f1*f2-fc*fc) > 1e-12*fc*fc {
			t.Fatalf("edge arithmetic: %g·%g ≠ %g²", f1, f2, fc)
		}
		for _, e := range []float64{f1, f2} {
			if got := cmplx.Abs(bp.AtHz(e)); !relClose(complex(got, 0), complex(edge, 0), condTol(bp, e)) {
				t.Fatalf("bandpass edge %g Hz: |H| = %g, prototype %g", e, got, edge)
			}
			if got := cmplx.Abs(bs.AtHz(e)); !relClose(complex(got, 0), complex(edge, 0), condTol(bs, e)) {
				t.Fatalf("bandstop edge %g Hz: |H| = %g, prototype %g", e, got, edge)
			}
		}
		f := fc * logFreq(t, "f", 1e-3, 1e3)
		if a, b := cmplx.Abs(hp.AtHz(f)), cmplx.Abs(lp.AtHz(fc*fc/f)); !relClose(complex(a, 0), complex(b, 0), condTol(hp, f)) {
			t.Fatalf("|H_hp(%g)| = %g, |H_lp(fc²/f)| = %g", f, a, b)
		}
		// H(1/s) is the highpass of H at 1/(2π) Hz.
		inv, err := h.ToHighpass(1 / (2 * math.Pi))
		if err != nil {
			t.Fatal(err)
		}
		mirror, err := inv.ToBandpass(fc, width)
		if err != nil {
			t.Fatal(err)
		}
		if a, b := bs.AtHz(f), mirror.AtHz(f); !relClose(a, b, condTol(bs, f)) {
			t.Fatalf("bandstop %v, bandpass of H(1/s) %v at %g Hz", a, b, f)
		}
	})
}

func TestTransformErrors(t *testing.T) {
	h, err := Butterworth{}.Prototype(4)
	if err != nil {
		t.Fatal(err)
	}
	bad := []float64{0, -1, math.NaN(), math.Inf(1), math.Inf(-1)}
	for _, v := range bad {
		for _, c := range []struct {
			arg string
			fn  func() (Transfer, error)
		}{
			{"cornerHz", func() (Transfer, error) { return h.ToLowpass(v) }},
			{"cornerHz", func() (Transfer, error) { return h.ToHighpass(v) }},
			{"centerHz", func() (Transfer, error) { return h.ToBandpass(v, 1) }},
			{"widthHz", func() (Transfer, error) { return h.ToBandpass(1, v) }},
			{"centerHz", func() (Transfer, error) { return h.ToBandstop(v, 1) }},
			{"widthHz", func() (Transfer, error) { return h.ToBandstop(1, v) }},
		} {
			_, err := c.fn()
			if !errors.Is(err, ErrFrequency) || !strings.Contains(err.Error(), c.arg) {
				t.Errorf("%s = %g: error %v, want ErrFrequency naming it", c.arg, v, err)
			}
		}
	}
	// Gains that float64 cannot hold: ErrRange, never Inf or 0.
	h64, err := Butterworth{}.Prototype(64)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		reason string
		fn     func() (Transfer, error)
	}{
		{"lowpass gain ω^64 overflows", func() (Transfer, error) { return h64.ToLowpass(1e9) }},
		{"lowpass gain ω^64 underflows", func() (Transfer, error) { return h64.ToLowpass(1e-9) }},
		{"bandpass gain B^64 overflows", func() (Transfer, error) { return h64.ToBandpass(1e9, 1e8) }},
		{"bandpass gain B^64 underflows", func() (Transfer, error) { return h64.ToBandpass(1, 1e-9) }},
		{"non-finite prototype", func() (Transfer, error) {
			return Transfer{Poles: []complex128{complex(math.NaN(), 0)}, Gain: 1}.ToLowpass(1)
		}},
	} {
		g, err := c.fn()
		if !errors.Is(err, ErrRange) {
			t.Errorf("%s: error %v (gain %g), want ErrRange", c.reason, err, g.Gain)
		}
	}
	// Near the top of the range the gain is still exact: the lowpass of the
	// 64th-order prototype at 10 kHz has gain ω^64 ≈ 1e307.
	g, err := h64.ToLowpass(1e4)
	if err != nil {
		t.Fatal(err)
	}
	if got := cmplx.Abs(g.AtHz(0)); math.Abs(got-1) > 1e-12 {
		t.Errorf("order-64 lowpass DC gain %g, want 1", got)
	}
}

// goldenTransforms is filter/testdata/transforms_scipy.json, written by
// internal/scipyref/orders.py: SciPy 1.10.1's lp2lp_zpk, lp2hp_zpk,
// lp2bp_zpk and lp2bs_zpk of its own prototypes.
type goldenTransforms struct {
	ScipyVersion string `json:"scipy_version"`
	Cases        []struct {
		Family string    `json:"family"`
		Order  int       `json:"order"`
		Kind   string    `json:"kind"`
		ArgsHz []float64 `json:"args_hz"`
		Input  Transfer  `json:"input"`
		Output Transfer  `json:"output"`
	} `json:"cases"`
}

// matchRoots reports whether got and want are the same multiset of roots
// to tol relative to scale, by greedy nearest matching.
func matchRoots(got, want []complex128, tol, scale float64) bool {
	if len(got) != len(want) {
		return false
	}
	used := make([]bool, len(want))
	for _, g := range got {
		best, bi := math.Inf(1), -1
		for j, w := range want {
			if d := cmplx.Abs(g - w); !used[j] && d < best {
				best, bi = d, j
			}
		}
		if bi < 0 || best > tol*math.Max(scale, cmplx.Abs(g)) {
			return false
		}
		used[bi] = true
	}
	return true
}

// TestTransformsAgainstSciPy compares the four transforms with SciPy
// 1.10.1's (golden file from internal/scipyref/orders.py).
func TestTransformsAgainstSciPy(t *testing.T) {
	b, err := os.ReadFile("testdata/transforms_scipy.json")
	if err != nil {
		t.Fatal(err)
	}
	var g goldenTransforms
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if g.ScipyVersion == "" || len(g.Cases) < 50 {
		t.Fatalf("golden file incomplete: %q, %d cases", g.ScipyVersion, len(g.Cases))
	}
	for _, c := range g.Cases {
		var got Transfer
		var err error
		switch c.Kind {
		case "lowpass":
			got, err = c.Input.ToLowpass(c.ArgsHz[0])
		case "highpass":
			got, err = c.Input.ToHighpass(c.ArgsHz[0])
		case "bandpass":
			got, err = c.Input.ToBandpass(c.ArgsHz[0], c.ArgsHz[1])
		case "bandstop":
			got, err = c.Input.ToBandstop(c.ArgsHz[0], c.ArgsHz[1])
		}
		if err != nil {
			t.Fatalf("%s %d %s: %v", c.Family, c.Order, c.Kind, err)
		}
		scale := 2 * math.Pi * c.ArgsHz[0]
		if !matchRoots(got.Poles, c.Output.Poles, goldenTol, scale) {
			t.Errorf("%s %d %s %v: poles\n got %v\nwant %v", c.Family, c.Order, c.Kind, c.ArgsHz, got.Poles, c.Output.Poles)
		}
		if !matchRoots(got.Zeros, c.Output.Zeros, goldenTol, scale) {
			t.Errorf("%s %d %s %v: zeros\n got %v\nwant %v", c.Family, c.Order, c.Kind, c.ArgsHz, got.Zeros, c.Output.Zeros)
		}
		if math.Abs(got.Gain-c.Output.Gain) > goldenTol*math.Abs(c.Output.Gain) {
			t.Errorf("%s %d %s %v: gain %.17g, SciPy %.17g", c.Family, c.Order, c.Kind, c.ArgsHz, got.Gain, c.Output.Gain)
		}
	}
}

// TestAtHzAllocatesNothing: the hot path of every sweep.
func TestAtHzAllocatesNothing(t *testing.T) {
	h, err := Design(Elliptic{}, benchEllipticMask)
	if err != nil {
		t.Fatal(err)
	}
	var sink complex128
	if n := testing.AllocsPerRun(100, func() { sink += h.AtHz(1234) }); n != 0 {
		t.Errorf("AtHz allocates %g times per call", n)
	}
	_ = sink
}

func BenchmarkAtHz(b *testing.B) {
	for _, n := range []int{2, 8, 20} {
		h, err := Chebyshev{RippleDB: 0.5}.Prototype(n)
		if err != nil {
			b.Fatal(err)
		}
		h, _ = h.ToBandpass(1000, 200)
		b.Run(fmt.Sprint(2*n, "poles"), func(b *testing.B) {
			b.ReportAllocs()
			var sink complex128
			f := 900.0
			for b.Loop() {
				sink += h.AtHz(f)
			}
			_ = sink
		})
	}
}

func BenchmarkTransforms(b *testing.B) {
	h, err := Elliptic{RippleDB: 0.5, AttenDB: 60}.Prototype(8)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("Lowpass", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			_, _ = h.ToLowpass(1000)
		}
	})
	b.Run("Bandstop", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			_, _ = h.ToBandstop(1000, 100)
		}
	})
}
