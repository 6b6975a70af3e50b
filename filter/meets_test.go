package filter

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"
)

// TestPropEdgesDecideAsTheGridDoes: for the package's own families the
// edge rule of meetsAtEdges gives the same verdict as the dense grid of
// meetsOnGrid, at the least order and one order either side, for random
// masks of every band (asymmetric band edges included). This is the check
// of the shape argument in meetsAtEdges' doc.
func TestPropEdgesDecideAsTheGridDoes(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := drawMeetSpec(t)
		var f Family
		switch rapid.IntRange(0, 4).Draw(t, "family") {
		case 0:
			f = Butterworth{}
		case 1:
			f = Chebyshev{}
		case 2:
			f = InverseChebyshev{}
		case 3:
			f = Elliptic{}
		default:
			f = Bessel{}
		}
		n, err := MinOrder(f, s)
		if errors.Is(err, ErrRange) {
			t.Skip("beyond the family's range")
		}
		if err != nil {
			t.Fatal(err)
		}
		r, err := resolve(f, s)
		if err != nil {
			t.Fatal(err)
		}
		pl := s.plan()
		for m := max(1, n-1); m <= n+1; m++ {
			h, err := r.design(s, pl, m)
			if err != nil {
				continue // beyond the range at n+1
			}
			edge, grid := meetsAtEdges(h, s, r.rp, r.as), meetsOnGrid(h, s, r.rp, r.as)
			if edge != grid {
				t.Fatalf("%v order %d for %+v: edges say %v, grid says %v", f, m, s, edge, grid)
			}
			if m == n && !grid {
				t.Fatalf("%v: least order %d misses %+v on the grid", f, n, s)
			}
		}
	})
}

func drawMeetSpec(t *rapid.T) Spec {
	band := Band(rapid.IntRange(1, 4).Draw(t, "band"))
	f := math.Pow(10, rapid.Float64Range(0, 5).Draw(t, "edge"))
	r1 := rapid.Float64Range(1.05, 5).Draw(t, "transition")
	w := rapid.Float64Range(1.02, 4).Draw(t, "width")
	r2 := rapid.Float64Range(1.05, 5).Draw(t, "transition 2")
	s := Spec{
		Band:     band,
		RippleDB: rapid.Float64Range(0.01, 3).Draw(t, "ripple"),
		AttenDB:  rapid.Float64Range(10, 120).Draw(t, "atten"),
	}
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
