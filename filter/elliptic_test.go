package filter

import (
	"errors"
	"math"
	"sort"
	"testing"

	"github.com/rolloff/rolloff/internal/ellip"
	"pgregory.net/rapid"
)

// protoPeak returns the largest 20·log10|H(jω)| on [a, b] for a
// unimodal |H| there, by golden-section search.
func protoPeak(h Transfer, a, b float64) (w, db float64) {
	const r = 0.6180339887498949
	for range 200 {
		c, d := b-r*(b-a), a+r*(b-a)
		if protoDB(h, c) > protoDB(h, d) {
			b = d
		} else {
			a = c
		}
		if b-a <= 1e-15*b {
			break
		}
	}
	w = (a + b) / 2
	return w, protoDB(h, w)
}

// ellipticStopEdge returns 1/k, the stopband edge implied by the degree
// equation for order n (see Elliptic.Prototype).
func ellipticStopEdge(n int, rip, att float64) float64 {
	ep2, es2 := powerRatioM1(rip), powerRatioM1(att)
	k, _ := ellip.Degree(n, math.Sqrt(ep2/es2), math.Sqrt((es2-ep2)/es2))
	return 1 / k
}

// TestEllipticHandbook checks the defining facts of the elliptic family
// (from memory of Daniels, 1974, and Zverev, 1967; common practice):
// equiripple passband between 0 and −RippleDB dB with n extrema in
// [0, 1) and −RippleDB at 1 rad/s; equiripple stopband whose every lobe
// peak, and its minimum attenuation, equals AttenDB, starting at the
// stopband edge 1/k where the attenuation is exactly AttenDB; for even n
// the level at infinity is the gain, also −AttenDB.
func TestEllipticHandbook(t *testing.T) {
	for _, p := range [][2]float64{{0.1, 40}, {0.5, 60}, {1, 25}, {3, 100}} {
		rip, att := p[0], p[1]
		for n := 1; n <= 14; n++ {
			h, err := Elliptic{RippleDB: rip, AttenDB: att}.Prototype(n)
			if err != nil {
				t.Fatal(err)
			}
			tol := func(w float64) float64 { return 8.7 * protoPoleErr * (1 + protoCond(h, w)) }
			if got := protoDB(h, 1); math.Abs(got+rip) > tol(1) {
				t.Errorf("%v order %d: %.12g dB at 1 rad/s, want −%g", p, n, got, rip)
			}
			// Passband: range and extrema count on a fine grid.
			const m = 20000
			prev, dir, changes := protoDB(h, 0), 0, 0
			lo, hi := prev, prev
			for i := 1; i <= m; i++ {
				v := protoDB(h, float64(i)/m)
				lo, hi = math.Min(lo, v), math.Max(hi, v)
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
			if hi > 1e-9 || lo < -rip-1e-9 {
				t.Errorf("%v order %d: passband spans [%g, %g] dB, want [−%g, 0]", p, n, lo, hi, rip)
			}
			// The extrema sit where Rₙ = 0 (0 dB), at ω = cd(uᵢK, k) = 1/(k·zᵢ)
			// with uᵢ = (2i−1)/n (ω = 0 for the real pole's u = 1 … odd n), and
			// where Rₙ = ±1 (−RippleDB), at ω = cd(2iK/n, k), i ≥ 1 (from memory
			// of Orfanidis, 2006). Together n points in [0, 1).
			ep2, es2 := powerRatioM1(rip), powerRatioM1(att)
			k, kc := ellip.Degree(n, math.Sqrt(ep2/es2), math.Sqrt((es2-ep2)/es2))
			var ext []float64
			for i := 1; 2*i-1 <= n; i++ {
				w := real(ellip.CD(complex(float64(2*i-1)/float64(n), 0), k, kc))
				ext = append(ext, w)
				if got := protoDB(h, w); math.Abs(got) > tol(w) {
					t.Errorf("%v order %d: %.3g dB at reflection zero %g, want 0", p, n, got, w)
				}
			}
			for i := 1; 2*i <= n; i++ {
				w := real(ellip.CD(complex(float64(2*i)/float64(n), 0), k, kc))
				ext = append(ext, w)
				if got := protoDB(h, w); math.Abs(got+rip) > tol(w) {
					t.Errorf("%v order %d: %.12g dB at ripple valley %g, want −%g", p, n, got, w, rip)
				}
			}
			if len(ext) != n {
				t.Errorf("%v order %d: %d extrema, want %d", p, n, len(ext), n)
			}
			// Where the grid resolves them, count the extrema on it as well.
			sort.Float64s(ext)
			resolved := true
			for i := 1; i < len(ext); i++ {
				resolved = resolved && ext[i]-ext[i-1] > 20.0/m
			}
			if resolved && changes+1 != n {
				t.Errorf("%v order %d: %d passband extrema in [0, 1) on the grid, want %d", p, n, changes+1, n)
			}
			// Stopband.
			ws := ellipticStopEdge(n, rip, att)
			if got := protoDB(h, ws); math.Abs(got+att) > tol(ws) {
				t.Errorf("%v order %d: %.12g dB at the stopband edge %g, want −%g", p, n, got, ws, att)
			}
			edges := []float64{ws}
			for i := 0; i < len(h.Zeros); i += 2 {
				edges = append(edges, imag(h.Zeros[i]))
			}
			// Zeros come in descending Q order, i.e. ascending frequency.
			for i := 1; i < len(edges); i++ {
				if !(edges[i] > edges[i-1]) {
					t.Fatalf("%v order %d: zeros not ascending above the edge: %v", p, n, edges)
				}
			}
			if n%2 == 1 {
				edges = append(edges, 1e6*ws)
			}
			for i := 1; i < len(edges); i++ {
				w, db := protoPeak(h, edges[i-1], edges[i])
				if math.Abs(db+att) > 1e-6 && !(i == 1 && n > 1 && db < -att) {
					t.Errorf("%v order %d: lobe %d peak %.10g dB at %g, want −%g", p, n, i, db, w, att)
				}
				if db > -att+1e-6 {
					t.Errorf("%v order %d: lobe %d rises to %.10g dB, above −%g", p, n, i, db, att)
				}
			}
			if n%2 == 0 {
				if got := 20 * math.Log10(h.Gain); math.Abs(got+att) > 1e-9 {
					t.Errorf("%v order %d: level at infinity %.12g dB, want −%g", p, n, got, att)
				}
			}
		}
	}
}

// TestEllipticProperty: for random order and parameters, poles in the
// left half-plane, passband edge −RippleDB, stopband edge −AttenDB.
func TestEllipticProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxEllipticOrder).Draw(t, "n")
		rip := rapid.Float64Range(0.001, 6).Draw(t, "ripple")
		att := rip + rapid.Float64Range(3, 150).Draw(t, "margin")
		h, err := Elliptic{RippleDB: rip, AttenDB: att}.Prototype(n)
		if errors.Is(err, ErrRange) {
			return // pole Q beyond MaxEllipticQ: refused by design
		}
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range h.Poles {
			if !(real(p) < 0) {
				t.Fatalf("pole %v", p)
			}
		}
		if got := protoDB(h, 1); math.Abs(got+rip) > 8.7*protoPoleErr*(1+protoCond(h, 1)) {
			t.Fatalf("order %d: edge %.12g dB, want −%g", n, got, rip)
		}
		ws := ellipticStopEdge(n, rip, att)
		if got := protoDB(h, ws); math.Abs(got+att) > 8.7*protoPoleErr*(1+protoCond(h, ws)) {
			t.Fatalf("order %d: %.12g dB at stopband edge %g, want −%g", n, got, ws, att)
		}
	})
}
