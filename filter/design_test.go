package filter

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"github.com/google/go-cmp/cmp"
	"pgregory.net/rapid"
)

// Tolerances of the design checks.
const (
	// edgeTolDB is how exactly Design puts its exact edge (passband edge
	// at RippleDB, or the inverse Chebyshev stopband edge at AttenDB): the
	// prototypes are accurate to about 1e-9 relative, 1e-7 dB.
	edgeTolDB = 1e-7
	// peakTol is how far above 1 (0 dB) the passband maximum may rise from
	// rounding.
	peakTol = 1e-9
)

// logGrid returns n log-spaced frequencies from lo to hi inclusive.
func logGrid(lo, hi float64, n int) []float64 {
	out := make([]float64, n)
	r := math.Log(hi / lo)
	for i := range out {
		out[i] = lo * math.Exp(r*float64(i)/float64(n-1))
	}
	out[n-1] = hi
	return out
}

// maskSegments returns the passband and stopband segments of s for a dense
// sweep (outer segments reach four decades beyond the outer edges).
func maskSegments(s Spec) (pass, stop [][2]float64) {
	const span = 1e4
	p, t := s.PassHz, s.StopHz
	switch s.Band {
	case Lowpass:
		return [][2]float64{{p[0] / span, p[0]}}, [][2]float64{{t[0], t[0] * span}}
	case Highpass:
		return [][2]float64{{p[0], p[0] * span}}, [][2]float64{{t[0] / span, t[0]}}
	case Bandpass:
		return [][2]float64{{p[0], p[1]}}, [][2]float64{{t[0] / span, t[0]}, {t[1], t[1] * span}}
	default:
		return [][2]float64{{p[0] / span, p[0]}, {p[1], p[1] * span}}, [][2]float64{{t[0], t[1]}}
	}
}

// sweepMask evaluates h densely over the mask: the worst passband
// attenuation, the least stopband attenuation and the largest gain seen.
func sweepMask(h Transfer, s Spec, n int) (worstPass, leastStop, peak float64) {
	pass, stop := maskSegments(s)
	leastStop = math.Inf(1)
	worstPass = math.Inf(-1)
	for _, seg := range pass {
		for _, f := range logGrid(seg[0], seg[1], n) {
			m := cmplx.Abs(h.AtHz(f))
			worstPass = math.Max(worstPass, -20*math.Log10(m))
			peak = math.Max(peak, m)
		}
	}
	for _, seg := range stop {
		for _, f := range logGrid(seg[0], seg[1], n) {
			m := cmplx.Abs(h.AtHz(f))
			leastStop = math.Min(leastStop, -20*math.Log10(m))
			peak = math.Max(peak, m)
		}
	}
	return worstPass, leastStop, peak
}

// genSpec draws a valid mask of modest order for every family.
func genSpec(t *rapid.T) Spec {
	band := Band(rapid.IntRange(1, 4).Draw(t, "band"))
	logU := func(lo, hi float64, name string) float64 {
		return math.Exp(rapid.Float64Range(math.Log(lo), math.Log(hi)).Draw(t, name))
	}
	rp := logU(0.01, 3, "ripple")
	as := rp + rapid.Float64Range(15, 90).Draw(t, "attenAbove")
	f := logU(10, 1e5, "freq")
	s := Spec{Band: band, RippleDB: rp, AttenDB: as}
	switch band {
	case Lowpass:
		s.PassHz[0], s.StopHz[0] = f, f*logU(1.15, 10, "ratio")
	case Highpass:
		s.PassHz[0], s.StopHz[0] = f, f/logU(1.15, 10, "ratio")
	case Bandpass:
		s.PassHz = [2]float64{f, f * logU(1.1, 5, "width")}
		s.StopHz = [2]float64{f / logU(1.15, 5, "lowRatio"), s.PassHz[1] * logU(1.15, 5, "highRatio")}
	case Bandstop:
		t0 := f * logU(1.15, 5, "lowRatio")
		t1 := t0 * logU(1.02, 5, "stopWidth")
		s.PassHz = [2]float64{f, t1 * logU(1.15, 5, "highRatio")}
		s.StopHz = [2]float64{t0, t1}
	}
	return s
}

// genFamily draws a family, sometimes with its own stricter parameters.
func genFamily(t *rapid.T, s Spec) Family {
	strict := rapid.Bool().Draw(t, "strict")
	rp, as := 0.0, 0.0
	if strict {
		rp = s.RippleDB * rapid.Float64Range(0.2, 1).Draw(t, "rpFactor")
		as = s.AttenDB + rapid.Float64Range(0, 20).Draw(t, "asExtra")
	}
	switch rapid.IntRange(0, 4).Draw(t, "family") {
	case 0:
		return Butterworth{}
	case 1:
		return Chebyshev{RippleDB: rp}
	case 2:
		return InverseChebyshev{AttenDB: as}
	case 3:
		return Elliptic{RippleDB: rp, AttenDB: as}
	default:
		return Bessel{Norm: BesselNorm(rapid.IntRange(0, 2).Draw(t, "norm"))}
	}
}

// TestDesignMeetsMaskEverywhere: for random masks and families, Design
// meets the mask over a dense log sweep of the passband and stopband, its
// passband maximum is 0 dB, its poles are in the left half-plane, and one
// order less does not meet the mask (the order is the least).
func TestDesignMeetsMaskEverywhere(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := genSpec(t)
		f := genFamily(t, s)
		h, err := Design(f, s)
		if errors.Is(err, ErrRange) {
			t.Skipf("beyond the supported range: %v", err)
		}
		if err != nil {
			t.Fatalf("Design(%v, %+v): %v", f, s, err)
		}
		r, _ := resolve(f, s)
		worstPass, leastStop, peak := sweepMask(h, s, 2001)
		if worstPass > r.rp+MaskToleranceDB {
			t.Fatalf("%v %+v: passband attenuation %.9g dB above %g", f, s, worstPass, r.rp)
		}
		if leastStop < r.as-MaskToleranceDB {
			t.Fatalf("%v %+v: stopband attenuation %.9g dB below %g", f, s, leastStop, r.as)
		}
		if peak > 1+peakTol {
			t.Fatalf("%v %+v: passband peak %.12g above 0 dB", f, s, peak)
		}
		for _, p := range h.Poles {
			if !(real(p) < 0) {
				t.Fatalf("%v %+v: pole %v not in the left half-plane", f, s, p)
			}
		}
		n, err := MinOrder(f, s)
		if err != nil {
			t.Fatal(err)
		}
		wantPoles := n
		if s.Band == Bandpass || s.Band == Bandstop {
			wantPoles = 2 * n
		}
		if len(h.Poles) != wantPoles {
			t.Fatalf("%d poles for order %d", len(h.Poles), n)
		}
		if n > 1 {
			short, err := r.design(s, s.plan(), n-1)
			if err == nil {
				wp, ls, _ := sweepMask(short, s, 2001)
				if wp <= r.rp+MaskToleranceDB && ls >= r.as-MaskToleranceDB {
					t.Fatalf("%v %+v: order %d also meets the mask (%g, %g dB)", f, s, n-1, wp, ls)
				}
			}
		}
	})
}

// TestDesignSlackPlacement checks where Design puts the exact edge (see the
// Design doc): the passband edge for Butterworth, Chebyshev, elliptic and
// Bessel, the stopband edge for inverse Chebyshev.
func TestDesignSlackPlacement(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := genSpec(t)
		if s.Band != Lowpass && s.Band != Highpass {
			return
		}
		f := genFamily(t, s)
		h, err := Design(f, s)
		if errors.Is(err, ErrRange) {
			t.Skip(err)
		}
		if err != nil {
			t.Fatal(err)
		}
		r, _ := resolve(f, s)
		switch r.kind {
		case kindInverseChebyshev:
			got := -20 * math.Log10(cmplx.Abs(h.AtHz(s.StopHz[0])))
			if math.Abs(got-r.as) > edgeTolDB {
				t.Fatalf("%v: attenuation %.12g dB at the stop edge, want %g", f, got, r.as)
			}
		default:
			got := -20 * math.Log10(cmplx.Abs(h.AtHz(s.PassHz[0])))
			if math.Abs(got-r.rp) > edgeTolDB {
				t.Fatalf("%v: attenuation %.12g dB at the pass edge, want %g", f, got, r.rp)
			}
		}
	})
}

// TestBesselDesignMonotonic: a Bessel design's magnitude falls
// monotonically above DC (lowpass) and is attenuated by exactly RippleDB
// at the passband edge.
func TestBesselDesignMonotonic(t *testing.T) {
	for _, as := range []float64{10, 20, 30, 45} {
		s := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{10000}, RippleDB: 1, AttenDB: as}
		h, err := Design(Bessel{}, s)
		if err != nil {
			t.Fatal(err)
		}
		prev := math.Inf(1)
		for _, f := range logGrid(1, 1e6, 3000) {
			m := cmplx.Abs(h.AtHz(f))
			if m > prev*(1+1e-13) {
				t.Fatalf("atten %g: |H| rises at %g Hz", as, f)
			}
			prev = m
		}
		if got := -20 * math.Log10(cmplx.Abs(h.AtHz(1000))); math.Abs(got-1) > edgeTolDB {
			t.Fatalf("atten %g: %g dB at the passband edge", as, got)
		}
	}
}

// TestDesignErrors: bad specs and family parameters give matchable errors.
func TestDesignErrors(t *testing.T) {
	good := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{3000}, RippleDB: 1, AttenDB: 40}
	cases := []struct {
		reason string
		f      Family
		s      Spec
		want   error
	}{
		{"stop edge inside the passband", Butterworth{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{900}, RippleDB: 1, AttenDB: 40}, ErrSpec},
		{"unknown band", Butterworth{}, Spec{PassHz: [2]float64{1000}, StopHz: [2]float64{2000}, RippleDB: 1, AttenDB: 40}, ErrSpec},
		{"NaN ripple", Butterworth{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{2000}, RippleDB: math.NaN(), AttenDB: 40}, ErrSpec},
		{"looser family ripple", Chebyshev{RippleDB: 2}, good, ErrParam},
		{"looser family attenuation", InverseChebyshev{AttenDB: 20}, good, ErrParam},
		{"negative family ripple", Elliptic{RippleDB: -1}, good, ErrParam},
		{"unknown Bessel norm", Bessel{Norm: 7}, good, ErrParam},
		{"nil family", nil, good, ErrParam},
		{"nil pointer family", (*Chebyshev)(nil), good, ErrParam},
		{"order beyond the range", Butterworth{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1001}, RippleDB: 1, AttenDB: 100}, ErrRange},
		{"Bessel cannot reach it", Bessel{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1100}, RippleDB: 1, AttenDB: 100}, ErrRange},
	}
	for _, c := range cases {
		if _, err := Design(c.f, c.s); !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.reason, err, c.want)
		}
		if _, err := MinOrder(c.f, c.s); !errors.Is(err, c.want) {
			t.Errorf("%s: MinOrder error %v, want %v", c.reason, err, c.want)
		}
	}
	// A pointer to a family works like the value.
	n1, err1 := MinOrder(&Chebyshev{RippleDB: 0.5}, good)
	n2, err2 := MinOrder(Chebyshev{RippleDB: 0.5}, good)
	if err1 != nil || err2 != nil || n1 != n2 {
		t.Errorf("pointer family: %d %v, value %d %v", n1, err1, n2, err2)
	}
}

// TestMinOrderHandbook checks worked examples against outside values.
func TestMinOrderHandbook(t *testing.T) {
	for _, c := range []struct {
		source string
		f      Family
		s      Spec
		want   int
	}{
		// Common practice (and the closed form log(10^4−1)/(2·log 4) = 3.32):
		// a Butterworth 3 dB down at 1 kHz and 40 dB down at 4 kHz is 4th order.
		{"common practice", Butterworth{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{4000}, RippleDB: 3.0103, AttenDB: 40}, 4},
		// From memory of the Butterworth attenuation curves of Williams &
		// Taylor, "Electronic Filter Design Handbook", ch. 2: 60 dB at three
		// times the 3 dB frequency needs n = 7 (closed form 6.29).
		{"from memory of Williams & Taylor, Butterworth curves", Butterworth{}, Spec{Band: Lowpass, PassHz: [2]float64{100}, StopHz: [2]float64{300}, RippleDB: 3, AttenDB: 60}, 7},
		// From memory of the same handbook's 0.5 dB Chebyshev curves: 40 dB
		// at twice the ripple edge needs n = 5 (closed form 4.82).
		{"from memory of Williams & Taylor, 0.5 dB Chebyshev curves", Chebyshev{RippleDB: 0.5}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{2000}, RippleDB: 0.5, AttenDB: 40}, 5},
		// Common practice: the same order for the highpass mirror of a mask.
		{"common practice (highpass mirror)", Chebyshev{RippleDB: 0.5}, Spec{Band: Highpass, PassHz: [2]float64{1000}, StopHz: [2]float64{500}, RippleDB: 0.5, AttenDB: 40}, 5},
	} {
		n, err := MinOrder(c.f, c.s)
		if err != nil || n != c.want {
			t.Errorf("%s: %v %+v: order %d (%v), want %d", c.source, c.f, c.s, n, err, c.want)
		}
	}
}

// Benchmark masks, invented: a 1 kHz anti-alias lowpass that the elliptic
// family meets at order 6, and a 10 kHz carrier bandpass that the Chebyshev
// family meets at prototype order 4 (8 poles).
var (
	benchEllipticMask = Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1250}, RippleDB: 0.5, AttenDB: 50}
	benchBandpassMask = Spec{Band: Bandpass, PassHz: [2]float64{9000, 11000}, StopHz: [2]float64{7500, 13200}, RippleDB: 0.5, AttenDB: 40}
)

func BenchmarkDesign(b *testing.B) {
	for _, c := range []struct {
		name  string
		f     Family
		s     Spec
		poles int
	}{
		{"Elliptic6Lowpass", Elliptic{}, benchEllipticMask, 6},
		{"Chebyshev8Bandpass", Chebyshev{}, benchBandpassMask, 8},
		{"Bessel", Bessel{}, Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{10000}, RippleDB: 1, AttenDB: 40}, 0},
	} {
		h, err := Design(c.f, c.s)
		if err != nil || (c.poles > 0 && len(h.Poles) != c.poles) {
			b.Fatalf("%s: %d poles (%v), want %d", c.name, len(h.Poles), err, c.poles)
		}
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Design(c.f, c.s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkMinOrder(b *testing.B) {
	for _, c := range []struct {
		name string
		f    Family
		s    Spec
	}{
		{"Butterworth", Butterworth{}, benchEllipticMask},
		{"Elliptic", Elliptic{}, benchEllipticMask},
		{"EllipticBandstop", Elliptic{}, Spec{Band: Bandstop, PassHz: [2]float64{40, 75}, StopHz: [2]float64{48, 52}, RippleDB: 1, AttenDB: 40}},
	} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := MinOrder(c.f, c.s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// FuzzDesign: Design never panics on any spec; its result is either an
// error wrapping one of the package's sentinels or a stable filter that
// meets the mask.
func FuzzDesign(f *testing.F) {
	f.Add(uint8(1), uint8(0), 1000.0, 0.0, 2000.0, 0.0, 1.0, 40.0)
	f.Add(uint8(2), uint8(1), 1000.0, 0.0, 300.0, 0.0, 0.5, 60.0)
	f.Add(uint8(3), uint8(2), 1000.0, 2000.0, 500.0, 4000.0, 1.0, 40.0)
	f.Add(uint8(4), uint8(3), 40.0, 75.0, 48.0, 52.0, 1.0, 40.0)
	f.Add(uint8(1), uint8(4), 1000.0, 0.0, 5000.0, 0.0, 1.0, 30.0)
	f.Add(uint8(0), uint8(0), math.NaN(), math.Inf(1), -1.0, 0.0, 0.0, -3.0)
	f.Add(uint8(1), uint8(3), 1000.0, 0.0, 1000.0000001, 0.0, 0.1, 200.0)
	f.Fuzz(func(t *testing.T, band, fam uint8, p0, p1, s0, s1, rp, as float64) {
		s := Spec{Band: Band(band % 6), PassHz: [2]float64{p0, p1}, StopHz: [2]float64{s0, s1}, RippleDB: rp, AttenDB: as}
		var fy Family
		switch fam % 6 {
		case 0:
			fy = Butterworth{}
		case 1:
			fy = Chebyshev{}
		case 2:
			fy = InverseChebyshev{}
		case 3:
			fy = Elliptic{}
		case 4:
			fy = Bessel{}
		default:
			fy = Elliptic{RippleDB: rp / 2, AttenDB: as + 3}
		}
		h, err := Design(fy, s)
		if err != nil {
			for _, e := range []error{ErrSpec, ErrParam, ErrRange, ErrOrder, ErrFrequency} {
				if errors.Is(err, e) {
					return
				}
			}
			t.Fatalf("error %v wraps no sentinel", err)
		}
		for _, p := range h.Poles {
			if !(real(p) < 0) {
				t.Fatalf("pole %v not in the left half-plane", p)
			}
		}
		r, _ := resolve(fy, s)
		if !meetsOnGrid(h, s, r.rp, r.as) {
			t.Fatalf("%v %+v: design misses the mask", fy, s)
		}
	})
}

// shiftedButterworth is a family defined outside the package's own set:
// Butterworth prototypes with the 1 dB point (not the 3 dB point) at
// 1 rad/s.
type shiftedButterworth struct{}

func (shiftedButterworth) String() string { return "shiftedButterworth" }
func (shiftedButterworth) Prototype(n int) (Transfer, error) {
	h, err := Butterworth{}.Prototype(n)
	if err != nil {
		return Transfer{}, err
	}
	// |H|² = 1/(1 + Ω^2n) is 1 dB down at Ω = (10^0.1 − 1)^(1/2n).
	return h.scale(math.Pow(dbPowM1(1), -1/float64(2*n)))
}

// TestDesignOutsideFamily: a family from outside the package is searched
// order by order with its passband edge taken at 1 rad/s, and gives the
// same order as the Butterworth family for a 1 dB mask.
func TestDesignOutsideFamily(t *testing.T) {
	s := Spec{Band: Highpass, PassHz: [2]float64{2000}, StopHz: [2]float64{700}, RippleDB: 1, AttenDB: 45}
	got, err := MinOrder(shiftedButterworth{}, s)
	if err != nil {
		t.Fatal(err)
	}
	want, err := MinOrder(Butterworth{}, s)
	if err != nil || got != want {
		t.Fatalf("outside family order %d, Butterworth %d (%v)", got, want, err)
	}
	h, err := Design(shiftedButterworth{}, s)
	if err != nil {
		t.Fatal(err)
	}
	if a := -20 * math.Log10(cmplx.Abs(h.AtHz(2000))); math.Abs(a-1) > edgeTolDB {
		t.Errorf("attenuation %g dB at the passband edge, want 1", a)
	}
	far := Spec{Band: Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1001}, RippleDB: 1, AttenDB: 60}
	if _, err := MinOrder(shiftedButterworth{}, far); !errors.Is(err, ErrRange) {
		t.Errorf("unreachable mask: %v, want ErrRange", err)
	}
}

// TestDesignConcurrentDeterministic: Design and Stages are pure: the same
// input gives the same bits, from any number of goroutines at once.
func TestDesignConcurrentDeterministic(t *testing.T) {
	type result struct {
		H  Transfer
		St []Stage
	}
	run := func() result {
		h, err := Design(Elliptic{}, benchBandpassMask)
		if err != nil {
			panic(err)
		}
		st, err := h.Stages()
		if err != nil {
			panic(err)
		}
		return result{h, st}
	}
	want := run()
	const workers = 8
	out := make(chan result, workers)
	for range workers {
		go func() { out <- run() }()
	}
	for range workers {
		got := <-out
		if d := cmp.Diff(want, got, sameBits, cmp.Comparer(func(a, b complex128) bool { return a == b })); d != "" {
			t.Fatalf("results differ (-first +concurrent):\n%s", d)
		}
	}
}
