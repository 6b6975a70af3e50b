package topology

import (
	"github.com/rolloff/rolloff/filter"
)

// First-order stages. Design equations: the RC time constant ω0 = 1/(R·C),
// the non-inverting gain 1 + Rf/Rg and the inverting gain −Rf/Rin of the
// ideal op-amp (from memory of Horowitz and Hill, The Art of Electronics,
// ch. 4). The input attenuator of a lowpass is a resistive divider whose
// Thévenin resistance is the section's R (R = Ra·Rb/(Ra+Rb), ratio
// Rb/(Ra+Rb)); that of a highpass a capacitive divider whose total is the
// section's C (ratio Ca/(Ca+Cb)).

func init() {
	register(&kindSpec{
		kind: RCFollower,
		stages: []stageVariants{
			{filter.LowpassStage, 1, 4},
			{filter.HighpassStage, 1, 4},
		},
		variant: gainVariant,
		build:   buildRCFollower,
	})
	register(&kindSpec{
		kind: InvertingFirstOrder,
		stages: []stageVariants{
			{filter.LowpassStage, 1, 1},
			{filter.HighpassStage, 1, 1},
		},
		variant: func(st filter.Stage) (int, error) {
			if st.Gain == 0 {
				return 0, unrealizable(InvertingFirstOrder, st, "gain 0")
			}
			return 0, nil
		},
		build: buildInvertingFirstOrder,
	})
}

// buildRCFollower: lowpass R1 in→a, C1 a→0; highpass C1 in→a, R1 a→0;
// the follower's + input at a. Attenuator: the series part is split into a
// divider (lowpass R1 in→a, R2 a→0; highpass C1 in→a, C2 a→0). Gain pair:
// Rf out→fb, Rg fb→0 (K = 1 + Rf/Rg).
func buildRCFollower(sk filter.StageKind, _, v int) *design {
	b := newBuilder()
	var ser, shunt, r, c int
	if sk == filter.LowpassStage {
		ser = b.R("in", "a")
		if hasAtt(v) {
			shunt = b.R("a", "0")
		}
		c = b.C("a", "0")
		r = ser
	} else {
		ser = b.C("in", "a")
		if hasAtt(v) {
			shunt = b.C("a", "0")
		}
		r = b.R("a", "0")
		c = ser
	}
	rf, rg := addAmp(b, v, "a")
	return b.done(false, gainNote(v), func(st filter.Stage, capF float64, x []float64, keep bool) error {
		_, att, k, err := planGain(st.Gain)
		if err != nil {
			return err
		}
		w := omega(st)
		if sk == filter.LowpassStage {
			if !keep {
				x[c] = capF
			}
			rr := 1 / (w * x[c])
			if hasAtt(v) {
				x[ser], x[shunt] = rr/att, rr/(1-att)
			} else {
				x[ser] = rr
			}
			setAmp(x, v, rf, rg, k, rr)
			return nil
		}
		ct := capF
		if keep {
			ct = x[ser]
			if hasAtt(v) {
				ct += x[shunt]
			}
		} else if hasAtt(v) {
			x[ser], x[shunt] = att*capF, (1-att)*capF
		} else {
			x[ser] = capF
		}
		x[r] = 1 / (w * ct)
		setAmp(x, v, rf, rg, k, x[r])
		return nil
	})
}

// addAmp adds the op-amp with + at plus: a follower, or with the gain pair
// Rf out→fb, Rg fb→0 for the variants that have one. It returns the pair's
// indices (−1 when absent).
func addAmp(b *builder, v int, plus string) (rf, rg int) {
	if !hasAmp(v) {
		b.Amp(plus, "out", "out")
		return -1, -1
	}
	rf = b.R("out", "fb")
	rg = b.R("fb", "0")
	b.Amp(plus, "fb", "out")
	return rf, rg
}

// setAmp sets the gain pair for amplifier gain k at resistance level r0:
// Rg = r0, Rf = (k−1)·r0.
func setAmp(x []float64, v, rf, rg int, k, r0 float64) {
	if hasAmp(v) {
		x[rg] = r0
		x[rf] = (k - 1) * r0
	}
}

// buildInvertingFirstOrder: lowpass R1 in→n, R2 n→out, C1 n→out:
// H = −(R2/R1)/(1 + s·R2·C1); highpass C1 in→x, R1 x→n, R2 n→out:
// H = −(R2/R1)·s·R1·C1/(1 + s·R1·C1). The op-amp's + input is grounded.
func buildInvertingFirstOrder(sk filter.StageKind, _, _ int) *design {
	b := newBuilder()
	if sk == filter.LowpassStage {
		r1 := b.R("in", "n")
		r2 := b.R("n", "out")
		c1 := b.C("n", "out")
		b.Amp("0", "n", "out")
		return b.done(true, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
			if !keep {
				x[c1] = capF
			}
			x[r2] = 1 / (omega(st) * x[c1])
			x[r1] = x[r2] / abs(st.Gain)
			return nil
		})
	}
	c1 := b.C("in", "x")
	r1 := b.R("x", "n")
	r2 := b.R("n", "out")
	b.Amp("0", "n", "out")
	return b.done(true, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
		if !keep {
			x[c1] = capF
		}
		x[r1] = 1 / (omega(st) * x[c1])
		x[r2] = abs(st.Gain) * x[r1]
		return nil
	})
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
