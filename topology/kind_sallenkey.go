package topology

import (
	"math"

	"github.com/rolloff/rolloff/filter"
)

// Sallen-Key circuits (R. P. Sallen and E. L. Key, "A practical method of
// designing RC active filters", IRE Trans. Circuit Theory CT-2 (1955)).
// With amplifier gain K, lowpass R1 in→a, R2 a→b, C1 a→out, C2 b→0,
//
//	H(s) = K / (s²·R1R2C1C2 + s·[R1C2 + R2C2 + R1C1(1−K)] + 1),
//
// and its RC–CR dual, highpass C1 in→a, C2 a→b, R1 a→out, R2 b→0,
//
//	H(s) = K·s² / (s² + s·[1/(R2C1) + 1/(R2C2) + (1−K)/(R1C1)] + 1/(R1R2C1C2))
//
// (from memory of Williams and Taylor, Electronic Filter Design Handbook,
// ch. 3). The equal-component circuit (R1 = R2, C1 = C2) has Q = 1/(3 − K)
// (same source). The property tests check every equation below against the
// nodal analysis of the template.

// skRatioMargin is the factor by which the unity-gain Sallen-Key lowpass's
// capacitor ratio C1/C2 exceeds its minimum 4Q²: with 1.5 the resistors are
// real with room for the capacitors to be snapped to a standard series (an
// E6 step changes the ratio by at most about 1.5) and R2/R1 is 3.7 (common
// practice: a ratio a little above the minimum).
const skRatioMargin = 1.5

func init() {
	register(&kindSpec{
		kind:    SallenKey,
		stages:  []stageVariants{{filter.LowpassStage, 2, 4}, {filter.HighpassStage, 2, 4}},
		variant: gainVariant,
		build:   buildSallenKey,
	})
	register(&kindSpec{
		kind:    SallenKeyEqual,
		stages:  []stageVariants{{filter.LowpassStage, 2, 2}, {filter.HighpassStage, 2, 2}},
		variant: skeVariant,
		build:   buildSallenKeyEqual,
	})
}

// skFront lays out the Sallen-Key network up to the amplifier's + input
// (node b), with the first series part split into a divider when att is
// set, and returns the part indices (shunt −1 when absent).
func skFront(b *builder, sk filter.StageKind, att bool) (ser1, shunt, ser2, fbk, gnd int) {
	shunt = -1
	if sk == filter.LowpassStage {
		ser1 = b.R("in", "a")
		if att {
			shunt = b.R("a", "0")
		}
		ser2 = b.R("a", "b")
		fbk = b.C("a", "out")
		gnd = b.C("b", "0")
		return
	}
	ser1 = b.C("in", "a")
	if att {
		shunt = b.C("a", "0")
	}
	ser2 = b.C("a", "b")
	fbk = b.R("a", "out")
	gnd = b.R("b", "0")
	return
}

// buildSallenKey lays out the Sallen-Key circuit with the gain plan's
// attenuator and gain pair.
//
// Lowpass synthesis: C2 = CapF, C1 = 1.5·4Q²·C2 (skRatioMargin); then with
// P = 1/(ω0²C1C2) = R1R2, B = 1/(ω0Q) and α = C2 + C1(1−K), R1 is the
// smaller root of α·R1² − B·R1 + P·C2 = 0, R1 = 2PC2/(B + √(B² − 4αPC2)),
// and R2 = P/R1. A negative discriminant (capacitor ratio too small) is
// ErrUnrealizable.
//
// Highpass synthesis: C1 = C2 = CapF; with G = 1/R, G1·G2 = ω0²C1C2 and
// a·G2 + b·G1 = ω0/Q (a = (C1+C2)/(C1C2), b = (1−K)/C1 ≤ 0) give
// G1 = 2aω0²C1C2/(ω0/Q + √(ω0²/Q² − 4abω0²C1C2)), always real for K ≥ 1.
//
// Gain pair Rg = √(R1R2), Rf = (K−1)·Rg. Attenuator: lowpass R1 splits into
// R1/att (in→a) and R1/(1−att) (a→0); highpass C1 into att·C1 (in→a) and
// (1−att)·C1 (a→0).
func buildSallenKey(sk filter.StageKind, _, v int) *design {
	b := newBuilder()
	ser1, shunt, ser2, fbk, gnd := skFront(b, sk, hasAtt(v))
	rf, rg := addAmp(b, v, "b")
	return b.done(false, gainNote(v), func(st filter.Stage, capF float64, x []float64, keep bool) error {
		_, att, k, err := planGain(st.Gain)
		if err != nil {
			return err
		}
		w, q := omega(st), st.Q
		if sk == filter.LowpassStage {
			r1, r2, c1, c2 := ser1, ser2, fbk, gnd
			if !keep {
				x[c2] = capF
				x[c1] = skRatioMargin * 4 * q * q * capF
			}
			p := 1 / (w * w * x[c1] * x[c2])
			bb := 1 / (w * q)
			alpha := x[c2] + x[c1]*(1-k)
			disc := bb*bb - 4*alpha*p*x[c2]
			if disc < 0 {
				return unrealizable(SallenKey, st, "capacitor ratio C1/C2 = %.4g is below the %.4g needed", x[c1]/x[c2], minSKRatio(q, k))
			}
			rr1 := 2 * p * x[c2] / (bb + math.Sqrt(disc))
			rr2 := p / rr1
			if hasAtt(v) {
				x[r1], x[shunt] = rr1/att, rr1/(1-att)
			} else {
				x[r1] = rr1
			}
			x[r2] = rr2
			setAmp(x, v, rf, rg, k, math.Sqrt(rr1*rr2))
			return nil
		}
		c1, c2, r1, r2 := ser1, ser2, fbk, gnd
		var cc1 float64
		if keep {
			cc1 = x[c1]
			if hasAtt(v) {
				cc1 += x[shunt]
			}
		} else {
			cc1 = capF
			x[c2] = capF
			if hasAtt(v) {
				x[c1], x[shunt] = att*capF, (1-att)*capF
			} else {
				x[c1] = capF
			}
		}
		cc2 := x[c2]
		a := (cc1 + cc2) / (cc1 * cc2)
		bq := (1 - k) / cc1
		g1 := 2 * a * w * w * cc1 * cc2 / (w/q + math.Sqrt(w*w/(q*q)-4*a*bq*w*w*cc1*cc2))
		g2 := w * w * cc1 * cc2 / g1
		x[r1], x[r2] = 1/g1, 1/g2
		setAmp(x, v, rf, rg, k, math.Sqrt(x[r1]*x[r2]))
		return nil
	})
}

// minSKRatio is the least C1/C2 of a Sallen-Key lowpass of gain K that
// gives real resistors: B² ≥ 4αPC2 with α = C2 + C1(1−K), i.e.
// n ≥ 4Q²(1 + n(1−K)), n ≥ 4Q²/(1 − 4Q²(1−K)) (no bound when the
// denominator is not positive). It is 4Q² for K = 1.
func minSKRatio(q, k float64) float64 {
	d := 1 - 4*q*q*(1-k)
	if d <= 0 {
		return 0
	}
	return 4 * q * q / d
}

// skeK is the equal-component Sallen-Key's amplifier gain for Q.
func skeK(q float64) float64 { return 3 - 1/q }

func skeVariant(st filter.Stage) (int, error) {
	if !(st.Q > 0.5) {
		return 0, unrealizable(SallenKeyEqual, st, "Q %g must exceed 1/2 (K = 3 − 1/Q > 1)", st.Q)
	}
	k, g := skeK(st.Q), abs(st.Gain)
	switch {
	case g == 0:
		return 0, unrealizable(SallenKeyEqual, st, "gain 0")
	case math.Abs(g-k) <= unityTol*k:
		return 0, nil
	case g < k:
		return 1, nil
	}
	return 0, unrealizable(SallenKeyEqual, st, "gain %g above K = 3 − 1/Q = %g (use SallenKey)", g, k)
}

// buildSallenKeyEqual lays out the equal-component Sallen-Key circuit,
// variant 1 with the input attenuator of ratio gain/K.
//
// Synthesis: C1 = C2 = CapF and R1 = R2 = R = 1/(ω0·√(C1C2)); K from the
// s-coefficient: lowpass K = 1 + (2C2 − 1/(ω0QR))/C1, highpass
// K = 2 + C1/C2 − C1Rω0/Q (both 3 − 1/Q for equal capacitors, and valid for
// unequal, e.g. snapped, ones). Rg = R, Rf = (K−1)·R.
func buildSallenKeyEqual(sk filter.StageKind, _, v int) *design {
	b := newBuilder()
	ser1, shunt, ser2, fbk, gnd := skFront(b, sk, v == 1)
	rf, rg := addAmp(b, ampOnly, "b")
	note := "gain K = 3 − 1/Q"
	if v == 1 {
		note += ", input attenuator"
	}
	return b.done(false, note, func(st filter.Stage, capF float64, x []float64, keep bool) error {
		w, q := omega(st), st.Q
		var r, k float64
		if sk == filter.LowpassStage {
			c1, c2 := fbk, gnd
			if !keep {
				x[c1], x[c2] = capF, capF
			}
			r = 1 / (w * math.Sqrt(x[c1]*x[c2]))
			k = 1 + (2*x[c2]-1/(w*q*r))/x[c1]
			if !(k > 1) {
				return unrealizable(SallenKeyEqual, st, "capacitors give K = %g ≤ 1", k)
			}
			att := abs(st.Gain) / k
			if v == 1 {
				if !(att < 1) {
					return unrealizable(SallenKeyEqual, st, "gain %g above K = %g", abs(st.Gain), k)
				}
				x[ser1], x[shunt] = r/att, r/(1-att)
			} else {
				x[ser1] = r
			}
			x[ser2] = r
		} else {
			c1, c2 := ser1, ser2
			var cc1 float64
			if keep {
				cc1 = x[c1]
				if v == 1 {
					cc1 += x[shunt]
				}
			} else {
				cc1 = capF
				x[c2] = capF
			}
			r = 1 / (w * math.Sqrt(cc1*x[c2]))
			k = 2 + cc1/x[c2] - cc1*r*w/q
			if !(k > 1) {
				return unrealizable(SallenKeyEqual, st, "capacitors give K = %g ≤ 1", k)
			}
			if !keep {
				if v == 1 {
					att := abs(st.Gain) / k
					x[c1], x[shunt] = att*capF, (1-att)*capF
				} else {
					x[c1] = capF
				}
			}
			x[fbk], x[gnd] = r, r
		}
		setAmp(x, ampOnly, rf, rg, k, r)
		return nil
	})
}
