package series

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
)

// Band is a frequency band [LoHz, HiHz], in hertz.
type Band struct{ LoHz, HiHz float64 }

func (b Band) validate() error {
	if !(b.LoHz > 0) || !(b.HiHz >= b.LoHz) || math.IsInf(b.HiHz, 0) {
		return fmt.Errorf("series: band [%g, %g] Hz (want 0 < LoHz <= HiHz, finite): %w", b.LoHz, b.HiHz, ErrPolicy)
	}
	return nil
}

// PassbandOf returns the passband of spec as bands for Snap and the
// deviation checks: a lowpass passes [PassHz[0]/100, PassHz[0]] (two
// decades below the edge stand for "down to DC": an all-pole lowpass's gain
// there is within (f/f0)² of its DC gain), a highpass [PassHz[0],
// 100·PassHz[0]], a bandpass [PassHz[0], PassHz[1]], a bandstop both
// [PassHz[0]/100, PassHz[0]] and [PassHz[1], 100·PassHz[1]]. An invalid
// spec is an error (from spec.Validate).
func PassbandOf(spec filter.Spec) ([]Band, error) {
	if err := spec.Validate(); err != nil {
		return nil, fmt.Errorf("series: passband of spec: %w", err)
	}
	p := spec.PassHz
	switch spec.Band {
	case filter.Lowpass:
		return []Band{{p[0] / 100, p[0]}}, nil
	case filter.Highpass:
		return []Band{{p[0], 100 * p[0]}}, nil
	case filter.Bandpass:
		return []Band{{p[0], p[1]}}, nil
	default: // filter.Bandstop (Validate accepts no other band)
		return []Band{{p[0] / 100, p[0]}, {p[1], 100 * p[1]}}, nil
	}
}

// GridPoints is the number of frequencies per band at which deviations from
// the design are evaluated: log-spaced, both ends included.
const GridPoints = 64

// bandGrid returns the frequencies of bands: GridPoints log-spaced points
// per band (one for a band of zero width), in the order given.
func bandGrid(bands []Band) []float64 {
	var hz []float64
	for _, b := range bands {
		if b.LoHz == b.HiHz {
			hz = append(hz, b.LoHz)
			continue
		}
		l0, l1 := math.Log(b.LoHz), math.Log(b.HiHz)
		for i := range GridPoints {
			x := l0 + (l1-l0)*float64(i)/float64(GridPoints-1)
			hz = append(hz, math.Exp(x))
		}
		hz[len(hz)-1] = b.HiHz
		hz[len(hz)-GridPoints] = b.LoHz
	}
	return hz
}

// stageDB returns 20·log10|H(j2πf)| of a stage's target transfer function.
func stageDB(st filter.Stage, hz float64) float64 {
	return 20 * math.Log10(cmplxAbs(st.Transfer().AtHz(hz)))
}

func cmplxAbs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

// stageOf returns the stage (of the target's kind and order) that the
// coefficients b realize:
//
//	order 2: F0 = √(d0/d2)/2π, Q = √(d0·d2)/d1; Gain n0/d0 (lowpass, notch,
//	         at DC), n2/d2 (highpass, at infinity), n1/d1 (bandpass, at F0);
//	         notch ZeroHz = √(n0/n2)/2π
//	order 1: F0 = (d0/d1)/2π; Gain n0/d0 (lowpass), n1/d1 (highpass)
//
// (from the Stage formulas of package filter, matched term by term). Gain
// keeps its sign (inverting stages give a negative gain). ok is false where
// the coefficients are not those of a stable stage of that kind.
func stageOf(target filter.Stage, b bq) (st filter.Stage, ok bool) {
	st = filter.Stage{Kind: target.Kind, Order: target.Order}
	if target.Order == 1 {
		st.F0Hz = b.d0 / b.d1 / (2 * math.Pi)
		if target.Kind == filter.LowpassStage {
			st.Gain = b.n0 / b.d0
		} else {
			st.Gain = b.n1 / b.d1
		}
	} else {
		r := b.d0 / b.d2
		st.F0Hz = math.Sqrt(r) / (2 * math.Pi)
		st.Q = math.Sqrt(b.d0*b.d2) / b.d1
		if b.d0 < 0 {
			st.Q = -st.Q
		}
		switch target.Kind {
		case filter.LowpassStage:
			st.Gain = b.n0 / b.d0
		case filter.HighpassStage:
			st.Gain = b.n2 / b.d2
		case filter.BandpassStage:
			st.Gain = b.n1 / b.d1
		case filter.NotchStage:
			st.Gain = b.n0 / b.d0
			st.ZeroHz = math.Sqrt(b.n0/b.n2) / (2 * math.Pi)
		}
	}
	return st, st.Validate() == nil
}

// Weights weighs the errors of Snap's per-stage objective,
// F0·ln²(f0/f0*) + Q·ln²(Q/Q*) + Gain·ln²(|G/G*|) (+ F0·ln²(fz/fz*) for a
// notch). The zero value weighs all three 1.
type Weights struct{ F0, Q, Gain float64 }

func (w Weights) orDefault() Weights {
	if w == (Weights{}) {
		return Weights{1, 1, 1}
	}
	return w
}

func (w Weights) validate() error {
	for _, x := range []float64{w.F0, w.Q, w.Gain} {
		if !(x >= 0) || math.IsInf(x, 0) {
			return fmt.Errorf("series: weights %+v (want non-negative and finite): %w", w, ErrPolicy)
		}
	}
	return nil
}

// stageError returns the shape part (f0, Q, zero) and the gain part of the
// objective for achieved stage a against target t.
func stageError(w Weights, t, a filter.Stage) (shape, gain float64) {
	sq := func(x float64) float64 { return x * x }
	shape = w.F0 * sq(math.Log(a.F0Hz/t.F0Hz))
	if t.Order == 2 {
		shape += w.Q * sq(math.Log(a.Q/t.Q))
	}
	if t.Kind == filter.NotchStage {
		shape += w.F0 * sq(math.Log(a.ZeroHz/t.ZeroHz))
	}
	gain = w.Gain * sq(math.Log(math.Abs(a.Gain/t.Gain)))
	if t.Gain == 0 {
		gain = 0
	}
	return shape, gain
}
