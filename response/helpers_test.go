package response

import (
	"math"

	"github.com/rolloff/rolloff/filter"
	"pgregory.net/rapid"
)

// blackBox hides a transfer behind the System interface so that the
// generic (numeric) paths are exercised.
type blackBox struct{ h filter.Transfer }

func (b blackBox) AtHz(f float64) complex128 { return b.h.AtHz(f) }

// cascade multiplies the transfers of stages.
func cascade(stages ...filter.Stage) filter.Transfer {
	h := filter.Transfer{Gain: 1}
	for _, s := range stages {
		t := s.Transfer()
		h.Zeros = append(h.Zeros, t.Zeros...)
		h.Poles = append(h.Poles, t.Poles...)
		h.Gain *= t.Gain
	}
	return h
}

// butterworth returns the Butterworth lowpass of order n and corner fc Hz,
// from its pole formula pₖ = ωc·exp(jπ(2k+n−1)/(2n)), k = 1..n (from memory
// of Williams and Taylor, Electronic Filter Design Handbook, ch. 2).
func butterworth(n int, fc float64) filter.Transfer {
	wc := 2 * math.Pi * fc
	h := filter.Transfer{Gain: 1}
	for k := 1; k <= n; k++ {
		th := math.Pi * float64(2*k+n-1) / float64(2*n)
		p := complex(wc*math.Cos(th), wc*math.Sin(th))
		if 2*k-1 == n {
			p = complex(-wc, 0)
		}
		h.Poles = append(h.Poles, p)
		h.Gain *= wc
	}
	return h
}

// stableTransfer draws a random stable, real transfer function: up to
// maxPairs complex pole pairs (pole frequency 10^decLo to 10^decHi Hz, Q 0.3
// to 20) and up to 2 real poles; zeros (never more than poles) at the
// origin, on the jω axis when onAxis is set, or anywhere in either
// half-plane, in the same frequency range.
func stableTransfer(t *rapid.T, maxPairs int, onAxis bool, decLo, decHi float64) filter.Transfer {
	var h filter.Transfer
	h.Gain = rapid.Float64Range(0.1, 10).Draw(t, "gain")
	if rapid.Bool().Draw(t, "negative") {
		h.Gain = -h.Gain
	}
	scale := 1.0
	for range rapid.IntRange(0, maxPairs).Draw(t, "pairs") {
		w0 := 2 * math.Pi * math.Pow(10, rapid.Float64Range(decLo, decHi).Draw(t, "w0"))
		q := rapid.Float64Range(0.3, 20).Draw(t, "q")
		re := -w0 / (2 * q)
		if q < 0.5 { // two real poles with product w0²
			d := w0 * math.Sqrt(1/(4*q*q)-1)
			h.Poles = append(h.Poles, complex(re-d, 0), complex(w0*w0/(re-d), 0))
		} else {
			im := math.Sqrt(w0*w0 - re*re)
			h.Poles = append(h.Poles, complex(re, im), complex(re, -im))
		}
		scale *= w0 * w0
	}
	for range rapid.IntRange(0, 2).Draw(t, "real poles") {
		w := 2 * math.Pi * math.Pow(10, rapid.Float64Range(decLo, decHi).Draw(t, "wr"))
		h.Poles = append(h.Poles, complex(-w, 0))
		scale *= w
	}
	if len(h.Poles) == 0 {
		w := 2 * math.Pi * math.Pow(10, (decLo+decHi)/2)
		h.Poles = []complex128{complex(-w, 0)}
		scale = w
	}
	nz := rapid.IntRange(0, len(h.Poles)).Draw(t, "zeros")
	for len(h.Zeros) < nz {
		kind := rapid.IntRange(0, 3).Draw(t, "zero kind")
		if kind == 1 && !onAxis {
			kind = 2
		}
		w := 2 * math.Pi * math.Pow(10, rapid.Float64Range(decLo, decHi).Draw(t, "wz"))
		switch {
		case kind == 0:
			h.Zeros = append(h.Zeros, 0)
		case kind == 1 && len(h.Zeros)+2 <= nz:
			h.Zeros = append(h.Zeros, complex(0, w), complex(0, -w))
			scale /= w * w
		case kind == 3 && len(h.Zeros)+2 <= nz:
			re := w * rapid.Float64Range(0.02, 1).Draw(t, "zre")
			if rapid.Bool().Draw(t, "zrhp") {
				re = -re
			}
			h.Zeros = append(h.Zeros, complex(re, w), complex(re, -w))
			scale /= w * w
		default:
			re := w
			if rapid.Bool().Draw(t, "rhp") {
				re = -w
			}
			h.Zeros = append(h.Zeros, complex(-re, 0))
			scale /= w
		}
	}
	h.Gain *= scale
	return h
}
