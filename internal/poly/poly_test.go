package poly

import (
	"errors"
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"pgregory.net/rapid"
)

// exact: integer arithmetic in float64 has no rounding at these sizes.
var exact = cmpopts.EquateApprox(0, 0)

func TestArithmetic(t *testing.T) {
	a := []float64{1, 2}     // 1 + 2x
	b := []float64{-1, 0, 3} // −1 + 3x²
	if got, want := Mul(a, b), []float64{-1, -2, 3, 6}; !cmp.Equal(got, want, exact) {
		t.Errorf("Mul = %v, want %v", got, want)
	}
	if got := Eval([]float64{-1, -2, 3, 6}, 2); got != -1-4+12+48 {
		t.Errorf("Eval = %g", got)
	}
	if got, want := Derivative([]float64{-1, -2, 3, 6}), []float64{-2, 6, 18}; !cmp.Equal(got, want, exact) {
		t.Errorf("Derivative = %v", got)
	}
	v, dv := EvalRealAt([]float64{-1, -2, 3, 6}, 1i)
	// p(i) = −1 − 2i − 3 − 6i; p'(i) = −2 + 6i − 18.
	if v != complex(-4, -8) || dv != complex(-20, 6) {
		t.Errorf("EvalRealAt = %v, %v", v, dv)
	}
	if got := EvalComplex(FromRoots([]complex128{1i, -1i, 2}), 3); got != 10 {
		t.Errorf("FromRoots/EvalComplex = %v", got)
	}
	if got, want := FromRootsReal([]complex128{1 + 1i, 1 - 1i, -3}), []float64{6, -4, 1, 1}; !cmp.Equal(got, want, exact) {
		// (x² − 2x + 2)(x + 3) = x³ + x² − 4x + 6
		t.Errorf("FromRootsReal = %v, want %v", got, want)
	}
	if Mul(nil, a) != nil || Derivative([]float64{3}) != nil {
		t.Error("empty cases")
	}
}

// matchErr returns the largest relative distance between got and want
// matched greedily nearest-first (both multisets of equal size).
func matchErr(got, want []complex128) float64 {
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

// TestRootsRecovered builds polynomials from random roots (conjugate pairs
// and real roots, separated from each other) and checks that Roots gives
// them back, in conjugate pairs with the positive member first.
func TestRootsRecovered(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		npairs := rapid.IntRange(0, 6).Draw(t, "pairs")
		nreal := rapid.IntRange(0, 4).Draw(t, "reals")
		if npairs+nreal == 0 {
			nreal = 1
		}
		var want []complex128
		far := func(z complex128) bool {
			for _, w := range want {
				if cmplx.Abs(z-w) < 0.3 || cmplx.Abs(cmplx.Conj(z)-w) < 0.3 {
					return false
				}
			}
			return true
		}
		for len(want) < 2*npairs {
			z := cmplx.Rect(rapid.Float64Range(0.3, 3).Draw(t, "r"), rapid.Float64Range(0.2, math.Pi-0.2).Draw(t, "th"))
			if far(z) {
				want = append(want, z, cmplx.Conj(z))
			}
		}
		for len(want) < 2*npairs+nreal {
			z := complex(rapid.Float64Range(-3, 3).Draw(t, "x"), 0)
			if far(z) {
				want = append(want, z)
			}
		}
		c := FromRootsReal(want)
		for i := range c {
			c[i] *= 2.5 // not monic
		}
		got, err := Roots(c)
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != len(want) {
			t.Fatalf("%d roots, want %d", len(got), len(want))
		}
		// Forward error ≤ backward error × condition number (Wilkinson):
		// Roots stops at a backward error of 4(2n+1) ulps, so each root
		// must be within 8(2n+1)·2⁻⁵³·κ(r) relative, with the relative
		// condition number κ(r) = Σ|cᵢ||r|ⁱ / (|r|·|p'(r)|), plus the
		// rounding of the coefficients themselves (same bound).
		used := make([]bool, len(got))
		for _, w := range want {
			best := -1
			for i, g := range got {
				if !used[i] && (best < 0 || cmplx.Abs(g-w) < cmplx.Abs(got[best]-w)) {
					best = i
				}
			}
			used[best] = true
			absSum := 0.0
			for i := len(c) - 1; i >= 0; i-- {
				absSum = absSum*cmplx.Abs(w) + math.Abs(c[i])
			}
			_, dp := EvalRealAt(c, w)
			kappa := absSum / (cmplx.Abs(w) * cmplx.Abs(dp))
			tol := 2 * 8 * float64(2*len(want)+1) * 0x1p-53 * kappa
			if e := cmplx.Abs(got[best]-w) / cmplx.Abs(w); e > tol {
				t.Fatalf("root %v found as %v: rel err %g above %g (κ = %g)", w, got[best], e, tol, kappa)
			}
		}
		for i := 0; i < len(got); i++ {
			if imag(got[i]) > 0 {
				if i+1 >= len(got) || got[i+1] != cmplx.Conj(got[i]) {
					t.Fatalf("root %d %v not followed by its conjugate: %v", i, got[i], got)
				}
				i++
			} else if imag(got[i]) != 0 {
				t.Fatalf("unpaired root %v in %v", got[i], got)
			}
		}
	})
}

func TestRootsEdgeCases(t *testing.T) {
	for _, c := range [][]float64{nil, {1}, {1, 0}, {1, math.NaN()}, {math.Inf(1), 1}} {
		if _, err := Roots(c); !errors.Is(err, ErrCoeff) {
			t.Errorf("Roots(%v) error %v, want ErrCoeff", c, err)
		}
	}
	// x³(x − 2): roots 0 exactly.
	got, err := Roots([]float64{0, 0, 0, -2, 1})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([]complex128{0, 0, 0, 2}, got, cmpopts.SortSlices(func(a, b complex128) bool { return real(a) < real(b) }), cmpopts.EquateApprox(1e-15, 0)); diff != "" {
		t.Error(diff)
	}
	// x² + 1, x² − 5x + 6.
	if got, _ := Roots([]float64{1, 0, 1}); got[0] != 1i || got[1] != -1i {
		t.Errorf("x²+1: %v", got)
	}
	if got, _ := Roots([]float64{6, -5, 1}); matchErr(got, []complex128{2, 3}) > 1e-15 {
		t.Errorf("x²−5x+6: %v", got)
	}
}

// reverseBessel returns the exact coefficients of the reverse Bessel
// polynomial θₙ (DLMF 18.34.1 with the reversal of 18.34 notes):
// aₖ = (2n−k)!/(2^(n−k)·k!·(n−k)!).
func reverseBessel(n int) []*big.Int {
	a := make([]*big.Int, n+1)
	for k := 0; k <= n; k++ {
		num := new(big.Int).MulRange(1, int64(2*n-k))
		den := new(big.Int).MulRange(1, int64(k))
		den.Mul(den, new(big.Int).MulRange(1, int64(n-k)))
		num.Quo(num, den)
		a[k] = num.Rsh(num, uint(n-k))
	}
	return a
}

// TestPolishBigBessel checks, for the reverse Bessel polynomial of degree
// 25 (ill-conditioned), that polishing at 256 bits and at 512 bits agree
// to 1e-15, while the float64 roots alone are far worse (which is why
// the extended path exists), and that the polished roots have tiny
// residuals relative to the polynomial's scale.
func TestPolishBigBessel(t *testing.T) {
	const n = 25
	a := reverseBessel(n)
	// Known values: θ₂ = s² + 3s + 3, θ₃ = s³ + 6s² + 15s + 15
	// (from memory of any filter handbook's Bessel table).
	if b := reverseBessel(3); b[0].Int64() != 15 || b[1].Int64() != 15 || b[2].Int64() != 6 || b[3].Int64() != 1 {
		t.Fatalf("θ₃ = %v", b)
	}
	c64 := make([]float64, n+1)
	cb := make([]*big.Float, n+1)
	for i, v := range a {
		cb[i] = new(big.Float).SetInt(v)
		c64[i], _ = cb[i].Float64()
	}
	start, err := Roots(c64)
	if err != nil {
		t.Fatal(err)
	}
	r256, err := PolishBig(cb, start, 256)
	if err != nil {
		t.Fatal(err)
	}
	r512, err := PolishBig(cb, start, 512)
	if err != nil {
		t.Fatal(err)
	}
	if e := matchErr(r256, r512); e > 1e-15 {
		t.Errorf("256- and 512-bit roots differ by %g", e)
	}
	e64 := matchErr(start, r512)
	t.Logf("degree %d: float64 roots rel err %.2g, extended %.2g", n, e64, matchErr(r256, r512))
	if e64 < 1e-12 {
		t.Errorf("float64 roots unexpectedly accurate (%g): the test no longer shows the need for PolishBig", e64)
	}
}

// TestPolishBigIntegers polishes the roots 1…12 of Wilkinson-like
// Π(x − k), starting from perturbed values.
func TestPolishBigIntegers(t *testing.T) {
	var want []complex128
	for k := 1; k <= 12; k++ {
		want = append(want, complex(float64(k), 0))
	}
	c := FromRootsReal(want)
	cb := make([]*big.Float, len(c))
	for i, v := range c {
		cb[i] = big.NewFloat(v) // integers below 2^53: exact
	}
	start := make([]complex128, len(want))
	for i, w := range want {
		start[i] = w + complex(0.01*float64(i%3), 0)
	}
	got, err := PolishBig(cb, start, 200)
	if err != nil {
		t.Fatal(err)
	}
	if e := matchErr(got, want); e != 0 {
		t.Errorf("rel err %g, want exact integers", e)
	}
	if _, err := PolishBig(cb, start[:3], 200); !errors.Is(err, ErrCoeff) {
		t.Errorf("length mismatch error %v", err)
	}
}

func BenchmarkRoots(b *testing.B) {
	for _, n := range []int{4, 8, 16} {
		var roots []complex128
		for k := 0; k < n/2; k++ {
			th := math.Pi/2 + float64(2*k+1)*math.Pi/float64(2*n)
			roots = append(roots, cmplx.Rect(1, th), cmplx.Rect(1, -th))
		}
		c := FromRootsReal(roots)
		b.Run(itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_, _ = Roots(c)
			}
		})
	}
}

func itoa(n int) string { return big.NewInt(int64(n)).String() }
