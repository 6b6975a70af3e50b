package filter

import (
	"math"
	"testing"

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

// TestPropEdgeMagIsMagAt: edgeMag agrees with magAt to 1e-13 relative
// (both exact: 0 on a zero, +Inf on a pole) on random designs and
// frequencies, including the mask's edges.
func TestPropEdgeMagIsMagAt(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := drawSpeedSpec(t)
		f := drawSpeedFamily(t, s)
		n := rapid.IntRange(1, 40).Draw(t, "order")
		h, err := DesignOrder(f, s, n)
		if err != nil {
			t.Skip(err)
		}
		fr := s.PassHz[0] * math.Pow(10, rapid.Float64Range(-3, 3).Draw(t, "log10 f/PassHz"))
		switch rapid.IntRange(0, 4).Draw(t, "at") {
		case 0:
			fr = s.PassHz[0]
		case 1:
			fr = s.StopHz[0]
		case 2:
			fr = s.StopHz[1]
		}
		w := 2 * math.Pi * fr
		got, want := edgeMag(h, w), magAt(h, w)
		if got == want {
			return
		}
		if math.Abs(got-want) > 1e-13*want {
			t.Fatalf("%v order %d at %g Hz: edgeMag %.17g, magAt %.17g", f, n, fr, got, want)
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
