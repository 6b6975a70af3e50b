package filter

import (
	"math"
	"testing"

	"pgregory.net/rapid"
)

// TestChebyshevRipple checks the handbook facts of the Chebyshev family
// (from memory of Williams & Taylor, "Electronic Filter Design Handbook",
// ch. 2; common practice): |H(jω)|² = g²/(1+ε²Tₙ²(ω)); the passband
// ripples between 0 dB (at the n points where Tₙ = 0 … the maxima) and
// −RippleDB (where Tₙ = ±1), with exactly n extrema of |H| in [0, 1)
// (ω = 0 included; it is always one since |H| is even in ω), and
// −RippleDB at the ripple edge 1 rad/s.
func TestChebyshevRipple(t *testing.T) {
	for _, rip := range []float64{0.01, 0.1, 0.5, 1, 3} {
		for n := 1; n <= 20; n++ {
			h, err := Chebyshev{RippleDB: rip}.Prototype(n)
			if err != nil {
				t.Fatal(err)
			}
			tol := func(w float64) float64 { return 8.7 * protoPoleErr * (1 + protoCond(h, w)) }
			for k := 1; 2*k-1 <= n; k++ { // maxima: Tₙ = 0 at cos((2k−1)π/(2n)) ∈ [0, 1)
				w := math.Cos(float64(2*k-1) * math.Pi / float64(2*n))
				if got := protoDB(h, w); math.Abs(got) > tol(w) {
					t.Errorf("ripple %g order %d: %.3g dB at peak ω = %g, want 0", rip, n, got, w)
				}
			}
			for k := 0; 2*k <= n; k++ { // valleys: Tₙ = ±1 at cos(kπ/n), k = 0 is the edge
				w := math.Cos(float64(k) * math.Pi / float64(n))
				if got := protoDB(h, w); math.Abs(got+rip) > tol(w) {
					t.Errorf("ripple %g order %d: %.12g dB at valley ω = %g, want −%g", rip, n, got, w, rip)
				}
			}
			// Count the extrema on a fine grid: n−1 sign changes of the
			// slope inside (0, 1), plus the one at ω = 0.
			const m = 20000
			prev, changes := protoDB(h, 0), 0
			dir := 0
			for i := 1; i < m; i++ {
				v := protoDB(h, float64(i)/m)
				d := 0
				if v > prev {
					d = 1
				} else if v < prev {
					d = -1
				}
				if d != 0 && dir != 0 && d != dir {
					changes++
				}
				if d != 0 {
					dir = d
				}
				prev = v
			}
			if changes+1 != n {
				t.Errorf("ripple %g order %d: %d extrema in [0, 1), want %d", rip, n, changes+1, n)
			}
		}
	}
}

// TestInverseChebyshevStopband checks the handbook facts of the inverse
// Chebyshev family (from memory of Daniels, 1974; common practice):
// H(0) = 1, monotonic passband, exactly −AttenDB at the stopband edge
// 1 rad/s and at each stopband lobe peak 1/cos(kπ/n), never above −AttenDB
// from 1 rad/s up, and transmission zeros at 1/cos((2k−1)π/(2n)).
func TestInverseChebyshevStopband(t *testing.T) {
	for _, att := range []float64{10, 40, 80, 150} {
		for n := 1; n <= 20; n++ {
			h, err := InverseChebyshev{AttenDB: att}.Prototype(n)
			if err != nil {
				t.Fatal(err)
			}
			tol := func(w float64) float64 { return 8.7 * protoPoleErr * (1 + protoCond(h, w)) }
			for k := 0; 2*k < n; k++ {
				w := 1 / math.Cos(float64(k)*math.Pi/float64(n))
				if got := protoDB(h, w); math.Abs(got+att) > tol(w) {
					t.Errorf("atten %g order %d: %.12g dB at lobe peak %g, want −%g", att, n, got, w, att)
				}
			}
			for i := 0; i <= 5000; i++ {
				w := math.Pow(10, 4*float64(i)/5000) // 1 … 1e4 rad/s
				if got := protoDB(h, w); got > -att+tol(w) {
					t.Fatalf("atten %g order %d: %.12g dB at %g rad/s, above −%g", att, n, got, w, att)
				}
			}
			if got := protoDB(h, 0); math.Abs(got) > 1e-12 {
				t.Errorf("atten %g order %d: %g dB at DC", att, n, got)
			}
			for i, z := range h.Zeros {
				if i%2 == 0 {
					want := 1 / math.Cos(float64(i+1)*math.Pi/float64(2*n))
					if math.Abs(imag(z)-want) > 1e-14*want {
						t.Errorf("atten %g order %d: zero %v, want j%g", att, n, z, want)
					}
				}
			}
		}
	}
}

// TestChebyshevProperty: for random order and ripple, the ripple edge is
// at −RippleDB and DC is 0 dB (odd) or −RippleDB (even).
func TestChebyshevProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxChebyshevOrder).Draw(t, "n")
		rip := math.Exp(rapid.Float64Range(math.Log(1e-4), math.Log(20)).Draw(t, "logrip"))
		h, err := Chebyshev{RippleDB: rip}.Prototype(n)
		if err != nil {
			t.Fatal(err)
		}
		want := 0.0
		if n%2 == 0 {
			want = -rip
		}
		if got := protoDB(h, 0); math.Abs(got-want) > 1e-11*math.Max(1, rip) {
			t.Fatalf("order %d ripple %g: DC %.15g dB, want %g", n, rip, got, want)
		}
		if got := protoDB(h, 1); math.Abs(got+rip) > 8.7*protoPoleErr*(1+protoCond(h, 1)) {
			t.Fatalf("order %d ripple %g: edge %.15g dB", n, rip, got)
		}
	})
}
