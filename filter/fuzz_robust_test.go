package filter_test

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// FuzzTransforms moves prototypes of every family to arbitrary corners,
// centres and widths: never a panic; errors wrap ErrFrequency or ErrRange;
// results hold finite poles in the left half-plane, finite zeros and gain;
// and where the frequencies are sane (1e-6 to 1e12 Hz) the response at the
// mapped edges equals the prototype's at 1 rad/s (to 1e-9, looser for
// very narrow bands by their conditioning, see tol).
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
		// slope is |d|H(jΩ)|/dΩ| of the prototype at its edge Ω = 1.
		slope := math.Abs(cmplx.Abs(p.At(complex(0, 1+1e-6)))-cmplx.Abs(p.At(complex(0, 1-1e-6)))) / 2e-6
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
			// Edge tolerance: 1e-9, or for narrow bands
			// 5e-15·(centre/width)·slope: the edges f1 = centre²/f2 are
			// computed with a rounding of about 2e-16·centre, which moves
			// the prototype's frequency by about 4e-16·centre/width, and
			// AtHz near a narrow band loses the same again in jω − p; |H|
			// then moves by that times its slope d|H|/dΩ at the edge, so
			// about 1e-15·(centre/width)·slope, and 5e-15 leaves a factor 5.
			// The slope is the prototype's own (at least 20): a selective
			// elliptic edge is steeper than its order (a 12th-order one at
			// centre/width 1.2e5 moved |H| by 1.4e-8).
			tol := 1e-9
			if name == "ToBandpass" || name == "ToBandstop" {
				tol = math.Max(tol, 5e-15*a/b*math.Max(20, slope))
			}
			for _, e := range edges {
				got := cmplx.Abs(h.AtHz(e))
				if d := math.Abs(got - cmplx.Abs(edge)); !(d <= tol*math.Max(1, cmplx.Abs(edge))) {
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
