package topology

import (
	"math"

	"github.com/rolloff/rolloff/filter"
)

// Multiple-feedback (Rauch) circuits, all inverting, op-amp + input
// grounded, − input at node b (from memory of Williams and Taylor,
// Electronic Filter Design Handbook, ch. 3; the bandpass is the
// Deliyannis-Friend form with a resistive input divider). Derived by nodal
// analysis with b a virtual ground:
//
//	lowpass  R1 in→a, R2 a→out, R3 a→b, C1 a→0, C2 b→out:
//	         H = −(R2/R1) / (s²R2R3C1C2 + s·C2(R2 + R3 + R2R3/R1) + 1)
//	highpass C1 in→a, C2 a→b, C3 a→out, R1 a→0, R2 b→out:
//	         H = −(C1/C3)·s² / (s² + s(C1+C2+C3)/(R2C2C3) + 1/(R1R2C2C3))
//	bandpass R1 in→a, R2 a→0, C1 a→b, C2 a→out, R3 b→out:
//	         H = −(s/(R1C2)) / (s² + s(C1+C2)/(R3C1C2) + (1/R1 + 1/R2)/(R3C1C2))
//
// The highpass gain is the capacitor ratio C1/C3; Refit with snapped
// capacitors keeps f0 and Q and lets the gain follow that ratio.

func init() {
	register(&kindSpec{
		kind: MultipleFeedback,
		stages: []stageVariants{
			{filter.LowpassStage, 2, 1}, {filter.HighpassStage, 2, 1}, {filter.BandpassStage, 2, 1},
		},
		variant: func(st filter.Stage) (int, error) {
			if st.Gain == 0 {
				return 0, unrealizable(MultipleFeedback, st, "gain 0")
			}
			return 0, nil
		},
		build: buildMFB,
	})
}

// mfbMargin is the factor by which the lowpass capacitor ratio C1/C2
// exceeds its minimum 4Q²(1+G) (same reasoning as skRatioMargin).
const mfbMargin = 1.5

// buildMFB lays out the three multiple-feedback circuits.
//
// Lowpass synthesis: C2 = CapF, C1 = 1.5·4Q²(1+G)·C2; R2 is the smaller
// root of C2·R2² − R2/(ω0Q) + (1+G)/(ω0²C1) = 0, R3 = 1/(ω0²C1C2R2),
// R1 = R2/G. Highpass: C1 = C2 = CapF, C3 = C1/G, R2 = Q(C1+C2+C3)/(ω0C2C3),
// R1 = 1/(ω0²R2C2C3). Bandpass: C2 = CapF, C1 = n·C2 with
// n = max(1, 2G/Q² − 1) (so that R2 comes out positive with margin; the
// circuit needs Q²(1 + C1/C2) > G), R3 = Q(C1+C2)/(ω0C1C2),
// 1/R1 = G(C1+C2)/(R3C1), 1/R2 = ω0²R3C1C2 − 1/R1.
func buildMFB(sk filter.StageKind, _, _ int) *design {
	b := newBuilder()
	switch sk {
	case filter.LowpassStage:
		r1 := b.R("in", "a")
		r2 := b.R("a", "out")
		r3 := b.R("a", "b")
		c1 := b.C("a", "0")
		c2 := b.C("b", "out")
		b.Amp("0", "b", "out")
		return b.done(true, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
			w, q, g := omega(st), st.Q, abs(st.Gain)
			if !keep {
				x[c2] = capF
				x[c1] = mfbMargin * 4 * q * q * (1 + g) * capF
			}
			disc := 1/(w*w*q*q) - 4*x[c2]*(1+g)/(w*w*x[c1])
			if disc < 0 {
				return unrealizable(MultipleFeedback, st, "capacitor ratio C1/C2 = %.4g below 4Q²(1+G) = %.4g", x[c1]/x[c2], 4*q*q*(1+g))
			}
			x[r2] = 2 * (1 + g) / (w * w * x[c1]) / (1/(w*q) + math.Sqrt(disc))
			x[r3] = 1 / (w * w * x[c1] * x[c2] * x[r2])
			x[r1] = x[r2] / g
			return nil
		})
	case filter.HighpassStage:
		c1 := b.C("in", "a")
		c2 := b.C("a", "b")
		c3 := b.C("a", "out")
		r1 := b.R("a", "0")
		r2 := b.R("b", "out")
		b.Amp("0", "b", "out")
		return b.done(true, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
			w, q, g := omega(st), st.Q, abs(st.Gain)
			if !keep {
				x[c1], x[c2], x[c3] = capF, capF, capF/g
			}
			x[r2] = q * (x[c1] + x[c2] + x[c3]) / (w * x[c2] * x[c3])
			x[r1] = 1 / (w * w * x[r2] * x[c2] * x[c3])
			return nil
		})
	}
	r1 := b.R("in", "a")
	r2 := b.R("a", "0")
	c1 := b.C("a", "b")
	c2 := b.C("a", "out")
	r3 := b.R("b", "out")
	b.Amp("0", "b", "out")
	return b.done(true, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
		w, q, g := omega(st), st.Q, abs(st.Gain)
		if !keep {
			x[c2] = capF
			x[c1] = math.Max(1, 2*g/(q*q)-1) * capF
		}
		cc1, cc2 := x[c1], x[c2]
		x[r3] = q * (cc1 + cc2) / (w * cc1 * cc2)
		g1 := g * (cc1 + cc2) / (x[r3] * cc1)
		g2 := w*w*x[r3]*cc1*cc2 - g1
		if !(g2 > 0) {
			return unrealizable(MultipleFeedback, st, "bandpass gain %g needs Q²(1 + C1/C2) > G, have %.4g", g, q*q*(1+cc1/cc2))
		}
		x[r1], x[r2] = 1/g1, 1/g2
		return nil
	})
}
