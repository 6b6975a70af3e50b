package filter

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// besselDelayTaylor returns the Taylor coefficients c₀…c_m of the group
// delay τ(ω) = Σₚ Re(1/(jω − p)) of an all-pole H with H(0) = 1, from its
// poles: 1/(jω − p) = −(1/p)·Σₖ (jω/p)ᵏ gives cₖ = −Re(jᵏ·Σₚ p^−(k+1)),
// with the scale sₖ = Σₚ |p|^−(k+1) against which cₖ's rounding is judged.
func besselDelayTaylor(poles []complex128, m int) (c, scale []float64) {
	c, scale = make([]float64, m+1), make([]float64, m+1)
	jk := complex(1, 0)
	for k := 0; k <= m; k++ {
		var s complex128
		for _, p := range poles {
			s += cmplx.Pow(p, complex(float64(-(k+1)), 0))
			scale[k] += math.Pow(cmplx.Abs(p), float64(-(k + 1)))
		}
		c[k] = -real(jk * s)
		jk *= 1i
	}
	return c, scale
}

// TestBesselMaximallyFlatDelay checks the defining property of the Bessel
// family (Thomson, 1949; from memory of any filter handbook): with the
// delay normalization the group delay is 1 s at DC and its first 2n−1
// derivatives vanish there (the Taylor coefficients of ω¹…ω^(2n−1)), the
// ω^(2n) one does not. The group delay is computed analytically from the
// poles (a sum over poles).
func TestBesselMaximallyFlatDelay(t *testing.T) {
	for n := 1; n <= 12; n++ {
		h, err := Bessel{Norm: BesselDelay}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		c, scale := besselDelayTaylor(h.Poles, 2*n)
		if math.Abs(c[0]-1) > 1e-14 {
			t.Errorf("order %d: delay at DC %.16g s, want 1", n, c[0])
		}
		for k := 1; k < 2*n; k++ {
			if math.Abs(c[k]) > 1e-13*scale[k] {
				t.Errorf("order %d: delay Taylor coefficient of ω^%d = %g (scale %g), want 0", n, k, c[k], scale[k])
			}
		}
		if math.Abs(c[2*n]) < 1e-6*scale[2*n] {
			t.Errorf("order %d: coefficient of ω^%d = %g vanishes too: not the expected order of flatness", n, 2*n, c[2*n])
		}
		// Direct sum at a small frequency agrees: τ(ω) − 1 = c₂ₙω^(2n)·(1 + O(ω²)).
		w := 0.05
		tau := 0.0
		for _, p := range h.Poles {
			tau += -real(p) / (real(p)*real(p) + (w-imag(p))*(w-imag(p)))
		}
		if want := 1 + c[2*n]*math.Pow(w, float64(2*n)); math.Abs(tau-want) > 1e-13+0.01*math.Abs(want-1) {
			t.Errorf("order %d: τ(%g) = %.16g, series %.16g", n, w, tau, want)
		}
	}
}

// TestBesselNormalizations checks the three normalizations for every
// order: corner −3.0103 dB (half power) at 1 rad/s; phase-normalized
// poles' product of magnitudes 1, so that |H(jω)|·ωⁿ → 1 as ω → ∞ (the
// Butterworth asymptote); all three are frequency scalings of one another
// with H(0) = 1.
func TestBesselNormalizations(t *testing.T) {
	for n := 1; n <= MaxBesselOrder; n++ {
		hc, _ := Bessel{Norm: BesselCorner}.Prototype(n)
		hd, _ := Bessel{Norm: BesselDelay}.Prototype(n)
		hp, err := Bessel{Norm: BesselPhase}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		if got := protoDB(hc, 1); math.Abs(got+10*math.Log10(2)) > 1e-12 {
			t.Errorf("order %d: corner normalization %.15g dB at 1 rad/s", n, got)
		}
		prod := 1.0
		for _, p := range hp.Poles {
			prod *= cmplx.Abs(p)
		}
		if math.Abs(prod-1) > 1e-13 {
			t.Errorf("order %d: phase normalization |Π p| = %.16g", n, prod)
		}
		if n <= 20 {
			w := 1e6
			if got := cmplx.Abs(hp.At(complex(0, w))) * math.Pow(w, float64(n)); math.Abs(got-1) > 1e-4*float64(n) {
				t.Errorf("order %d: |H(jω)|·ωⁿ = %.8g at ω = 1e6, want → 1", n, got)
			}
		}
		for _, h := range []Transfer{hc, hd, hp} {
			if g := cmplx.Abs(h.At(0)); math.Abs(g-1) > 1e-13 {
				t.Errorf("order %d: |H(0)| = %.16g", n, g)
			}
		}
		r := hd.Poles[0] / hc.Poles[0]
		for i := range hd.Poles {
			if q := hd.Poles[i] / hc.Poles[i]; cmplx.Abs(q-r) > 1e-13*cmplx.Abs(r) || math.Abs(imag(r)) > 1e-13 {
				t.Fatalf("order %d: delay and corner poles not a real scaling (%v vs %v)", n, q, r)
			}
		}
	}
}

// TestBesselTable compares low orders with the handbook tables: θ₂ gives
// delay-normalized poles −3/2 ± j√3/2; corner-normalized order 2 is
// −1.1016 ± j0.6360 and order 3 is −1.0474 ± j0.9993, −1.3227 (from memory
// of the Bessel pole tables in Williams & Taylor, "Electronic Filter
// Design Handbook", to the four decimals those tables give).
func TestBesselTable(t *testing.T) {
	hd, _ := Bessel{Norm: BesselDelay}.Prototype(2)
	if e := protoMatch(hd.Poles, []complex128{complex(-1.5, math.Sqrt(3)/2), complex(-1.5, -math.Sqrt(3)/2)}); e > 1e-15 || math.Abs(hd.Gain-3) > 1e-15 {
		t.Errorf("delay order 2: %v (rel err %g)", hd, e)
	}
	h2, _ := Bessel{}.Prototype(2)
	if e := protoMatch(h2.Poles, []complex128{complex(-1.1016, 0.6360), complex(-1.1016, -0.6360)}); e > 1e-4 {
		t.Errorf("corner order 2: %v (rel err %g)", h2.Poles, e)
	}
	h3, _ := Bessel{}.Prototype(3)
	if e := protoMatch(h3.Poles, []complex128{complex(-1.0474, 0.9993), complex(-1.0474, -0.9993), -1.3227}); e > 1e-4 {
		t.Errorf("corner order 3: %v (rel err %g)", h3.Poles, e)
	}
}

// TestBesselProperty: for random order and normalization, poles in the
// left half-plane, H(0) = 1 and the magnitude falls monotonically.
func TestBesselProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxBesselOrder).Draw(t, "n")
		norm := BesselNorm(rapid.IntRange(0, 2).Draw(t, "norm"))
		h, err := Bessel{Norm: norm}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range h.Poles {
			if !(real(p) < 0) {
				t.Fatalf("pole %v", p)
			}
		}
		prev := cmplx.Abs(h.At(0))
		if math.Abs(prev-1) > 1e-13 {
			t.Fatalf("|H(0)| = %v", prev)
		}
		for i := 1; i <= 200; i++ {
			v := cmplx.Abs(h.At(complex(0, 0.05*float64(i))))
			if v > prev*(1+1e-14) {
				t.Fatalf("order %d %v: |H| rises at %g rad/s", n, norm, 0.05*float64(i))
			}
			prev = v
		}
	})
}

func TestBesselString(t *testing.T) {
	for _, c := range []struct {
		b    Bessel
		want string
	}{{Bessel{}, "Bessel(corner)"}, {Bessel{Norm: BesselDelay}, "Bessel(delay)"}, {Bessel{Norm: BesselPhase}, "Bessel(phase)"}, {Bessel{Norm: 7}, "Bessel(BesselNorm(7))"}} {
		if got := c.b.String(); got != c.want {
			t.Errorf("String = %q, want %q", got, c.want)
		}
	}
}

// TestBesselConcurrent calls Prototype for the same orders from many
// goroutines: the per-order cache must give every caller the same bits,
// and callers must not share slices.
func TestBesselConcurrent(t *testing.T) {
	const workers = 8
	results := make([][]Transfer, workers)
	done := make(chan int)
	for g := range workers {
		go func() {
			for n := 1; n <= MaxBesselOrder; n += 3 {
				h, err := Bessel{Norm: BesselNorm(g % 3)}.Prototype(n)
				if err != nil {
					t.Error(err)
				}
				results[g] = append(results[g], h)
			}
			done <- g
		}()
	}
	for range workers {
		<-done
	}
	for g := 3; g < workers; g++ {
		for i, h := range results[g] {
			ref := results[g%3][i]
			for j := range h.Poles {
				if h.Poles[j] != ref.Poles[j] {
					t.Fatalf("worker %d order %d: pole %d differs", g, 1+3*i, j)
				}
			}
			if &h.Poles[0] == &ref.Poles[0] {
				t.Fatalf("worker %d order %d shares its pole slice", g, 1+3*i)
			}
		}
	}
}

// BenchmarkBesselCold measures the first computation of an order (the
// float64 start plus the 256-bit polishing and the corner search), which
// Prototype does once per order and caches.
func BenchmarkBesselCold(b *testing.B) {
	for _, n := range []int{4, 8, 16, 40} {
		b.Run(itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if r := computeBessel(n); r.err != nil {
					b.Fatal(r.err)
				}
			}
		})
	}
}
