package filter

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/internal/ellip"
	"pgregory.net/rapid"
)

// drawSpeedSpec draws a mask of any band over a wide range: edges from
// 1 mHz to 1 THz, transitions from 1.0005 to 30, ripple from 1e-4 to
// 30 dB and attenuation from just above the ripple to 300 dB.
func drawSpeedSpec(t *rapid.T) Spec {
	band := Band(rapid.IntRange(1, 4).Draw(t, "band"))
	f := math.Pow(10, rapid.Float64Range(-3, 12).Draw(t, "edge"))
	tr := func(name string) float64 {
		return 1 + math.Pow(10, rapid.Float64Range(-3.3, 1.5).Draw(t, name))
	}
	r1, r2, w := tr("transition"), tr("transition 2"), tr("width")
	rp := math.Pow(10, rapid.Float64Range(-4, 1.5).Draw(t, "ripple"))
	as := rp * (1 + math.Pow(10, rapid.Float64Range(-3, 3).Draw(t, "atten/ripple-1")))
	s := Spec{Band: band, RippleDB: rp, AttenDB: math.Min(as, 300+rp)}
	switch band {
	case Lowpass:
		s.PassHz[0], s.StopHz[0] = f, f*r1
	case Highpass:
		s.PassHz[0], s.StopHz[0] = f*r1, f
	case Bandpass:
		s.StopHz = [2]float64{f / r1, f * w * r2}
		s.PassHz = [2]float64{f, f * w}
	case Bandstop:
		s.PassHz = [2]float64{f / r1, f * w * r2}
		s.StopHz = [2]float64{f, f * w}
	}
	return s
}

// drawSpeedFamily draws a family of the package, with its own (stricter)
// parameters at times.
func drawSpeedFamily(t *rapid.T, s Spec) Family {
	switch rapid.IntRange(0, 6).Draw(t, "family") {
	case 0:
		return Butterworth{}
	case 1:
		return Chebyshev{}
	case 2:
		return Chebyshev{RippleDB: s.RippleDB * rapid.Float64Range(0.1, 1).Draw(t, "own ripple")}
	case 3:
		return InverseChebyshev{}
	case 4:
		return Elliptic{}
	case 5:
		return Elliptic{AttenDB: s.AttenDB * rapid.Float64Range(1, 2).Draw(t, "own atten")}
	default:
		return Bessel{}
	}
}

func sameTransferBits(a, b Transfer) bool {
	same := func(x, y []complex128) bool {
		if len(x) != len(y) {
			return false
		}
		for i := range x {
			if math.Float64bits(real(x[i])) != math.Float64bits(real(y[i])) ||
				math.Float64bits(imag(x[i])) != math.Float64bits(imag(y[i])) {
				return false
			}
		}
		return true
	}
	return math.Float64bits(a.Gain) == math.Float64bits(b.Gain) && same(a.Zeros, b.Zeros) && same(a.Poles, b.Poles)
}

// TestPropDesignPathMatchesReference: MinOrder and Design give the order,
// the bits and the errors of the design path before the speed work
// (minDesignRef in speed_ref_test.go), for random masks of every family
// and band.
func TestPropDesignPathMatchesReference(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := drawSpeedSpec(t)
		f := drawSpeedFamily(t, s)
		wantN, wantH, wantErr := minDesignRef(f, s)
		gotN, gotErr := MinOrder(f, s)
		gotH, gotDErr := Design(f, s)
		if (wantErr == nil) != (gotErr == nil) || (wantErr == nil) != (gotDErr == nil) {
			t.Fatalf("%v %+v: errors reference %v, MinOrder %v, Design %v", f, s, wantErr, gotErr, gotDErr)
		}
		if wantErr != nil {
			if gotErr.Error() != wantErr.Error() || gotDErr.Error() != wantErr.Error() {
				t.Fatalf("%v %+v: error reference %q, MinOrder %q, Design %q", f, s, wantErr, gotErr, gotDErr)
			}
			return
		}
		if gotN != wantN {
			t.Fatalf("%v %+v: MinOrder %d, reference %d", f, s, gotN, wantN)
		}
		if !sameTransferBits(gotH, wantH) {
			t.Fatalf("%v %+v: Design differs from the reference:\n%+v\n%+v", f, s, gotH, wantH)
		}
		h, err := DesignOrder(f, s, gotN)
		if err != nil || !sameTransferBits(h, gotH) {
			t.Fatalf("%v %+v: DesignOrder(%d) = %+v, %v; Design %+v", f, s, gotN, h, err, gotH)
		}
	})
}

// TestPropEllipticBuildMatchesReference: the prototype built with the
// arguments climbed together has the bits of the one climbed one at a
// time (buildRef), over random orders, ripples and attenuations.
func TestPropEllipticBuildMatchesReference(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, MaxEllipticOrder).Draw(t, "n")
		rp := math.Pow(10, rapid.Float64Range(-4, 1.5).Draw(t, "ripple"))
		as := rp * (1 + math.Pow(10, rapid.Float64Range(-3, 3).Draw(t, "atten/ripple-1")))
		e := Elliptic{RippleDB: rp, AttenDB: as}
		got, err := e.Prototype(n)
		ep2, es2 := powerRatioM1(rp), powerRatioM1(as)
		k1, k1c := math.Sqrt(ep2/es2), math.Sqrt((es2-ep2)/es2)
		if !(k1 > 0) || math.IsInf(es2, 1) {
			t.Skip("discrimination out of range")
		}
		k, kc := ellipDegree(n, k1, k1c)
		want, wantErr := e.buildRef(n, ep2, k1, k1c, k, kc)
		if (err == nil) != (wantErr == nil) || err != nil && err.Error() != wantErr.Error() {
			t.Fatalf("%+v order %d: error %v, reference %v", e, n, err, wantErr)
		}
		if err == nil && !sameTransferBits(got, want) {
			t.Fatalf("%+v order %d: %+v, reference %+v", e, n, got, want)
		}
	})
}

// TestPropClearWithoutDesignHolds: where clearWithoutDesign lets MinOrder
// (Butterworth, Chebyshev and elliptic masks)
// skip the verifying design, that design is built without error, meets the
// mask by the edges and on the dense grid, has its passband edge
// attenuation within 3e-7 dB of the ripple (the rounding bound its doc
// derives, against MaskToleranceDB's 1e-6) and its stopband attenuation
// above AttenDB by at least skipMarginDB less that. It must fire on a
// good share of the random masks, or the test would check nothing.
func TestPropClearWithoutDesignHolds(t *testing.T) {
	fired, total := 0, 0
	rapid.Check(t, func(t *rapid.T) {
		s := drawSpeedSpec(t)
		f := []Family{Butterworth{}, Chebyshev{}, Elliptic{}}[rapid.IntRange(0, 2).Draw(t, "family")]
		r, err := resolve(f, s)
		if err != nil {
			t.Fatal(err)
		}
		pl := s.plan()
		est, _ := r.estimate(pl.sel)
		total++
		if math.IsNaN(est) || est > 64 {
			return
		}
		n := max(1, int(math.Ceil(est)))
		if r.kind == kindElliptic {
			n = min(n, MaxEllipticOrder)
		}
		if !(est-float64(n-1) > stepDownMargin) || !r.clearWithoutDesign(pl, n) {
			return
		}
		fired++
		h, err := r.design(s, pl, n)
		if err != nil {
			t.Fatalf("%v order %d for %+v: skipped design fails: %v", f, n, s, err)
		}
		if !meetsAtEdges(h, s, r.rp, r.as) || !meetsOnGrid(h, s, r.rp, r.as) {
			t.Fatalf("%v order %d for %+v: skipped design misses the mask", f, n, s)
		}
		att := func(fr float64) float64 { return -20 * math.Log10(magAt(h, 2*math.Pi*fr)) }
		// The pass edges of the lowpass equivalent: the mask's (lowpass,
		// highpass, bandpass) or the plan's (bandstop, possibly moved in).
		var pass []float64
		switch s.Band {
		case Lowpass, Highpass:
			pass = []float64{s.PassHz[0]}
		case Bandpass:
			pass = []float64{s.PassHz[0], s.PassHz[1]}
		default:
			a := math.Sqrt(pl.widthHz*pl.widthHz/4+pl.centerHz*pl.centerHz) - pl.widthHz/2
			pass = []float64{a, a + pl.widthHz}
		}
		for _, fr := range pass {
			if a := att(fr); math.Abs(a-r.rp) > 3e-7 {
				t.Fatalf("%v order %d for %+v: pass edge %g Hz at %.12g dB, ripple %g", f, n, s, fr, a, r.rp)
			}
		}
		stops := []float64{s.StopHz[0]}
		if s.Band == Bandpass || s.Band == Bandstop {
			stops = append(stops, s.StopHz[1])
		}
		for _, fr := range stops {
			if a := att(fr); !(a >= r.as+skipMarginDB-3e-7) {
				t.Fatalf("%v order %d for %+v: stop edge %g Hz at %.12g dB, below %g + margin", f, n, s, fr, a, r.as)
			}
		}
	})
	if fired < total/5 {
		t.Fatalf("clearWithoutDesign fired on %d of %d masks", fired, total)
	}
	t.Logf("clearWithoutDesign fired on %d of %d masks", fired, total)
}

// TestPropMinOrderNearTheMargin: masks whose attenuation lies within
// ±0.01 dB (and down to 1e-9 dB) of what a Butterworth, Chebyshev or
// elliptic order reaches exactly, where clearWithoutDesign's margin
// decides: MinOrder still equals the reference's verified order.
func TestPropMinOrderNearTheMargin(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := drawSpeedSpec(t)
		kind := rapid.IntRange(0, 2).Draw(t, "family")
		f := []Family{Butterworth{}, Chebyshev{}, Elliptic{}}[kind]
		n := rapid.IntRange(1, 32).Draw(t, "n")
		sel := s.plan().sel
		e2 := dbPowM1(s.RippleDB)
		var a float64 // exact attenuation of order n at sel
		switch kind {
		case 0:
			a = 10 * math.Log10(1+e2*math.Pow(sel, 2*float64(n)))
		case 1:
			c := math.Cosh(float64(n) * math.Acosh(sel))
			a = 10 * math.Log10(1+e2*c*c)
		default:
			n = min(n, 16)
			k, kc := selModuli(sel)
			a, _, _ = ellipticSlack(n, ellip.PeriodRatio(k, kc), e2)
		}
		d := math.Copysign(math.Pow(10, rapid.Float64Range(-9, -2).Draw(t, "log10 |delta|")), rapid.Float64Range(-1, 1).Draw(t, "sign"))
		s.AttenDB = a + d
		if !(s.AttenDB > s.RippleDB) || math.IsInf(a, 0) || math.IsNaN(a) {
			t.Skip("attenuation not above the ripple")
		}
		wantN, _, wantErr := minDesignRef(f, s)
		gotN, gotErr := MinOrder(f, s)
		if (wantErr == nil) != (gotErr == nil) || wantErr != nil && wantErr.Error() != gotErr.Error() {
			t.Fatalf("%v %+v: MinOrder error %v, reference %v", f, s, gotErr, wantErr)
		}
		if gotN != wantN {
			t.Fatalf("%v %+v: MinOrder %d, reference %d", f, s, gotN, wantN)
		}
	})
}

// TestPropCoshSinhIsTheLibrarys: coshSinh gives the bits of math.Cosh and
// math.Sinh, across the thresholds 0.5 and 21 and for special values.
func TestPropCoshSinhIsTheLibrarys(t *testing.T) {
	for _, x := range []float64{0, 0.5, math.Nextafter(0.5, 1), 21, math.Nextafter(21, 22), 710, 711,
		-1, math.Inf(1), math.Inf(-1), math.NaN()} {
		checkCoshSinh(t, x)
	}
	rapid.Check(t, func(t *rapid.T) {
		x := rapid.Float64Range(-30, 800).Draw(t, "x")
		if rapid.Bool().Draw(t, "small") {
			x = math.Pow(10, rapid.Float64Range(-300, 1.5).Draw(t, "log10 x"))
		}
		checkCoshSinh(t, x)
	})
}

func checkCoshSinh(t interface{ Fatalf(string, ...any) }, x float64) {
	ch, sh := coshSinh(x)
	if math.Float64bits(ch) != math.Float64bits(math.Cosh(x)) || math.Float64bits(sh) != math.Float64bits(math.Sinh(x)) {
		t.Fatalf("coshSinh(%v) = %v, %v; math: %v, %v", x, ch, sh, math.Cosh(x), math.Sinh(x))
	}
}

// TestPropDivByImagIsDivision: divByImag gives the bits of Go's complex
// division by j·d, for random finite and special operands.
func TestPropDivByImagIsDivision(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		part := func(name string) float64 {
			switch rapid.IntRange(0, 9).Draw(t, name+" kind") {
			case 0:
				return 0
			case 1:
				return math.Copysign(0, -1)
			case 2:
				return math.Inf(rapid.IntRange(-1, 1).Draw(t, name+" sign"))
			case 3:
				return math.NaN()
			}
			v := math.Pow(10, rapid.Float64Range(-320, 308).Draw(t, name+" log10"))
			if rapid.Bool().Draw(t, name+" negative") {
				v = -v
			}
			return v
		}
		p := complex(part("re"), part("im"))
		d := part("d")
		got, want := divByImag(p, d), p/complex(0, d)
		same := func(a, b float64) bool {
			return math.Float64bits(a) == math.Float64bits(b) || math.IsNaN(a) && math.IsNaN(b)
		}
		if !same(real(got), real(want)) || !same(imag(got), imag(want)) {
			t.Fatalf("divByImag(%v, %v) = %v, division %v", p, d, got, want)
		}
	})
}

// TestBandpassSlicesDoNotAlias: the zeros and poles of a bandpass design
// share one backing array; appending to either leaves the other as it was.
func TestBandpassSlicesDoNotAlias(t *testing.T) {
	for _, f := range []Family{Chebyshev{}, Elliptic{}, Butterworth{}, InverseChebyshev{}} {
		h, err := Design(f, perfBandpass)
		if err != nil {
			t.Fatal(err)
		}
		zeros := append([]complex128(nil), h.Zeros...)
		poles := append([]complex128(nil), h.Poles...)
		_ = append(h.Poles, 7+7i)
		_ = append(h.Zeros, 9+9i)
		for i := range zeros {
			if h.Zeros[i] != zeros[i] {
				t.Fatalf("%v: zero %d changed by an append", f, i)
			}
		}
		for i := range poles {
			if h.Poles[i] != poles[i] {
				t.Fatalf("%v: pole %d changed by an append", f, i)
			}
		}
	}
}
