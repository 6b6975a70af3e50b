package response

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"pgregory.net/rapid"
)

// drawSpec draws a valid mask of a random band with edges between 10 Hz
// and 100 kHz, ripple 0.1–3 dB, attenuation 20–80 dB.
func drawSpec(t *rapid.T) filter.Spec {
	band := filter.Band(rapid.IntRange(1, 4).Draw(t, "band"))
	f := math.Pow(10, rapid.Float64Range(2, 4).Draw(t, "edge"))
	r1 := rapid.Float64Range(1.2, 4).Draw(t, "transition")
	w := rapid.Float64Range(1.05, 3).Draw(t, "width")
	r2 := rapid.Float64Range(1.2, 4).Draw(t, "transition 2")
	s := filter.Spec{
		Band:     band,
		RippleDB: rapid.Float64Range(0.1, 3).Draw(t, "ripple"),
		AttenDB:  rapid.Float64Range(20, 80).Draw(t, "atten"),
	}
	switch band {
	case filter.Lowpass:
		s.PassHz[0], s.StopHz[0] = f, f*r1
	case filter.Highpass:
		s.PassHz[0], s.StopHz[0] = f*r1, f
	case filter.Bandpass:
		s.StopHz = [2]float64{f / r1, f * w * r2}
		s.PassHz = [2]float64{f, f * w}
	case filter.Bandstop:
		s.PassHz = [2]float64{f / r1, f * w * r2}
		s.StopHz = [2]float64{f, f * w}
	}
	return s
}

func drawFamily(t *rapid.T) filter.Family {
	switch rapid.IntRange(0, 4).Draw(t, "family") {
	case 0:
		return filter.Butterworth{}
	case 1:
		return filter.Chebyshev{}
	case 2:
		return filter.InverseChebyshev{}
	case 3:
		return filter.Elliptic{}
	}
	return filter.Bessel{}
}

// TestPropDesignMeetsMask: every filter.Design result passes CheckMask, and
// the same family one order short, placed on the mask exactly as Design
// places its own result (filter.DesignOrder), fails it, for every band.
func TestPropDesignMeetsMask(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		spec := drawSpec(t)
		fam := drawFamily(t)
		h, err := filter.Design(fam, spec)
		if err != nil {
			t.Skipf("no design: %v", err) // beyond the family's range
		}
		r, err := CheckMask(h, spec)
		if err != nil {
			t.Fatal(err)
		}
		if !r.Pass {
			t.Fatalf("%v design of order %d fails %+v: %+v", fam, len(h.Poles), spec, r)
		}
		n, err := filter.MinOrder(fam, spec)
		if err != nil {
			t.Fatal(err)
		}
		if n < 2 {
			return
		}
		short, err := filter.DesignOrder(fam, spec, n-1)
		if err != nil {
			t.Fatal(err)
		}
		r, err = CheckMask(short, spec)
		if err != nil {
			t.Fatal(err)
		}
		if r.Pass {
			t.Fatalf("%v of order %d (one short) passes %+v: %+v", fam, n-1, spec, r)
		}
	})
}
