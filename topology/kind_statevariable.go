package topology

import (
	"math"

	"github.com/rolloff/rolloff/filter"
)

// The state-variable circuit (W. J. Kerwin, L. P. Huelsman and R. W.
// Newcomb, "State-variable synthesis for insensitive integrated circuit
// transfer functions", IEEE J. Solid-State Circuits SC-2 (1967); equations
// from memory of Huelsman and Allen, Introduction to the Theory and Design
// of Active Filters, and re-derived by nodal analysis):
//
//	U1 summer:     R1 in→n1, R2 lp→n1, R3 hp→n1 (feedback), R4 bp→p1, R5 p1→0;
//	               + at p1, − at n1, output hp
//	U2 integrator: R6 hp→n2, C1 n2→bp; output bp = −hp/(s·R6·C1)
//	U3 integrator: R7 bp→n3, C2 n3→lp; output lp = −bp/(s·R7·C2)
//	U4 (notch):    R8 hp→n4, R9 lp→n4, R10 n4→out; output −(R10/R8)hp − (R10/R9)lp
//
// With a = R3/R1, b = R3/R2, k = R5/(R4+R5)·(1 + a + b), τ1 = R6C1,
// τ2 = R7C2: D(s) = s² + s·k/τ1 + b/(τ1τ2) and
// hp = −a·s²/D, bp = (a/τ1)·s/D, lp = −(a/(τ1τ2))/D.
// The lowpass and highpass outputs invert, the bandpass and notch do not.
// The notch's zero is at ωz² = ω0²·R8/R9 (below ω0 a highpass notch,
// above a lowpass notch, equal a symmetric one).

func init() {
	register(&kindSpec{
		kind: StateVariable,
		stages: []stageVariants{
			{filter.LowpassStage, 2, 1}, {filter.HighpassStage, 2, 1},
			{filter.BandpassStage, 2, 1}, {filter.NotchStage, 2, 1},
		},
		variant: func(st filter.Stage) (int, error) {
			if st.Gain == 0 {
				return 0, unrealizable(StateVariable, st, "gain 0")
			}
			return 0, nil
		},
		build: buildStateVariable,
	})
}

// svGainA is the summer's input gain a = R3/R1 for stage st. The lowpass,
// highpass and bandpass outputs carry a as their gain, so a is fixed by the
// stage; the notch's gain is set by its own summer (R10), so there a is free
// and is raised for low Q: the damping divider needs Q·(2 + a) > 1, and
// a = max(1, 1.5/Q − 2) keeps Q·(2 + a) ≥ 1.5, R4 ≥ R0/2, for every Q
// (a wide bandstop's notch sections have Q well below 1/3).
func svGainA(st filter.Stage) float64 {
	switch st.Kind {
	case filter.BandpassStage:
		return abs(st.Gain) / st.Q
	case filter.NotchStage:
		return math.Max(1, 1.5/st.Q-2)
	}
	return abs(st.Gain)
}

// buildStateVariable lays out the circuit with its output at the node the
// stage kind needs.
//
// Synthesis: C1 = C2 = CapF, R6 = 1/(ω0C1), R7 = 1/(ω0C2) (τ1 = τ2 = 1/ω0),
// R2 = R3 = R0 = √(R6R7) (b = 1), R1 = R0/a with a = G (lowpass,
// highpass), G/Q (bandpass) or max(1, 1.5/Q − 2) (notch, see svGainA); the
// damping divider R5/(R4+R5) = 1/(Q(2+a)): R5 = R0, R4 = R0·(Q(2+a) − 1),
// which needs Q > 1/(2+a) (always met by a notch). Notch: R9 = R0,
// R8 = R0·ωz²/ω0², R10 = G·R0/a (the lowpass output's DC gain is −a).
func buildStateVariable(sk filter.StageKind, _, _ int) *design {
	name := func(n string) string {
		switch {
		case sk == filter.LowpassStage && n == "lp",
			sk == filter.HighpassStage && n == "hp",
			sk == filter.BandpassStage && n == "bp":
			return "out"
		}
		return n
	}
	hp, bp, lp := name("hp"), name("bp"), name("lp")
	b := newBuilder()
	r1 := b.R("in", "n1")
	r2 := b.R(lp, "n1")
	r3 := b.R(hp, "n1")
	r4 := b.R(bp, "p1")
	r5 := b.R("p1", "0")
	b.Amp("p1", "n1", hp)
	r6 := b.R(hp, "n2")
	c1 := b.C("n2", bp)
	b.Amp("0", "n2", bp)
	r7 := b.R(bp, "n3")
	c2 := b.C("n3", lp)
	b.Amp("0", "n3", lp)
	r8, r9, r10 := -1, -1, -1
	if sk == filter.NotchStage {
		r8 = b.R(hp, "n4")
		r9 = b.R(lp, "n4")
		r10 = b.R("n4", "out")
		b.Amp("0", "n4", "out")
	}
	inverting := sk == filter.LowpassStage || sk == filter.HighpassStage
	return b.done(inverting, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
		w, q := omega(st), st.Q
		if !keep {
			x[c1], x[c2] = capF, capF
		}
		x[r6], x[r7] = 1/(w*x[c1]), 1/(w*x[c2])
		r0 := math.Sqrt(x[r6] * x[r7])
		a := svGainA(st)
		x[r1], x[r2], x[r3] = r0/a, r0, r0
		if !(q*(2+a) > 1) {
			return unrealizable(StateVariable, st, "Q must exceed 1/(2 + a) = %.4g", 1/(2+a))
		}
		x[r5] = r0
		x[r4] = r0 * (q*(2+a) - 1)
		if sk == filter.NotchStage {
			ratio := st.ZeroHz / st.F0Hz
			x[r9] = r0
			x[r8] = r0 * ratio * ratio
			x[r10] = abs(st.Gain) * r0 / a
		}
		return nil
	})
}
