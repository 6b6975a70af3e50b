package topology

import (
	"math"

	"github.com/rolloff/rolloff/filter"
)

// The Tow-Thomas two-integrator loop (J. Tow, "Active RC filters: a
// state-space realization", Proc. IEEE 56 (1968); L. C. Thomas, "The
// biquad: part I", IEEE Trans. Circuit Theory CT-18 (1971); equations from
// memory of Sedra and Smith, Microelectronic Circuits, two-integrator-loop
// biquads, and re-derived by nodal analysis):
//
//	U1 lossy integrator: R1 in→n1, R2 n1→bp, C1 n1→bp, R3 lpi→n1; output bp
//	U2 integrator:       R4 bp→n2, C2 n2→lp; output lp
//	U3 inverter:         R5 lp→n3, R6 n3→lpi; output lpi = −(R6/R5)·lp
//
// D(s) = s² + s/(R2C1) + 1/(R3R4C1C2) (R5 = R6), bp = −(s/(R1C1))/D
// (inverting), lp = (1/(R1R4C1C2))/D (non-inverting, DC gain R3/R1).
//
// Notch by feed-forward of the input into the other two op-amps (derived
// here by nodal analysis, in the manner of the feed-forward Tow-Thomas
// biquad of the same source): R7 in→n3 and R8 in→n2, output at lpi. With
// d = R6/R7 and Gi = 1/Ri the numerator of lpi/in is
// −[d·C1C2·s² + s·(d·G2·C2 − G8·C1) + (G1G4 − d·G2²·C2/C1)]; G8 = d·G2·C2/C1
// cancels the s term, leaving H = −d·(s² + ωz²)/D with
// ωz² = (G1G4 − d·G2²·C2/C1)/(d·C1C2): an inverting notch of every type,
// high-frequency gain d and DC gain d·ωz²/ω0².

func init() {
	register(&kindSpec{
		kind: TowThomas,
		stages: []stageVariants{
			{filter.LowpassStage, 2, 1}, {filter.BandpassStage, 2, 1}, {filter.NotchStage, 2, 1},
		},
		variant: func(st filter.Stage) (int, error) {
			if st.Gain == 0 {
				return 0, unrealizable(TowThomas, st, "gain 0")
			}
			return 0, nil
		},
		build: buildTowThomas,
	})
}

// buildTowThomas lays out the loop with its output at lp (lowpass), bp
// (bandpass) or lpi (notch).
//
// Synthesis: C1 = C2 = CapF, R3 = 1/(ω0C1), R4 = 1/(ω0C2), R2 = Q/(ω0C1),
// R5 = R6 = √(R3R4); lowpass R1 = R3/G, bandpass R1 = R2/G; notch
// d = G·ω0²/ωz², R7 = R6/d, G8 = d·G2·C2/C1, G1 = d·C2·(C1ωz² + G2²/C1)/G4.
func buildTowThomas(sk filter.StageKind, _, _ int) *design {
	name := func(n string) string {
		switch {
		case sk == filter.LowpassStage && n == "lp",
			sk == filter.BandpassStage && n == "bp",
			sk == filter.NotchStage && n == "lpi":
			return "out"
		}
		return n
	}
	bp, lp, lpi := name("bp"), name("lp"), name("lpi")
	b := newBuilder()
	r1 := b.R("in", "n1")
	r2 := b.R("n1", bp)
	c1 := b.C("n1", bp)
	r3 := b.R(lpi, "n1")
	b.Amp("0", "n1", bp)
	r4 := b.R(bp, "n2")
	c2 := b.C("n2", lp)
	b.Amp("0", "n2", lp)
	r5 := b.R(lp, "n3")
	r6 := b.R("n3", lpi)
	b.Amp("0", "n3", lpi)
	r7, r8 := -1, -1
	if sk == filter.NotchStage {
		r7 = b.R("in", "n3")
		r8 = b.R("in", "n2")
	}
	inverting := sk != filter.LowpassStage
	return b.done(inverting, "", func(st filter.Stage, capF float64, x []float64, keep bool) error {
		w, q, g := omega(st), st.Q, abs(st.Gain)
		if !keep {
			x[c1], x[c2] = capF, capF
		}
		cc1, cc2 := x[c1], x[c2]
		x[r3], x[r4] = 1/(w*cc1), 1/(w*cc2)
		x[r2] = q / (w * cc1)
		x[r5] = math.Sqrt(x[r3] * x[r4])
		x[r6] = x[r5]
		switch sk {
		case filter.LowpassStage:
			x[r1] = x[r3] / g
		case filter.BandpassStage:
			x[r1] = x[r2] / g
		default:
			wz := 2 * math.Pi * st.ZeroHz
			d := g * (w / wz) * (w / wz)
			g2, g4 := 1/x[r2], 1/x[r4]
			x[r7] = x[r6] / d
			x[r8] = cc1 / (d * g2 * cc2)
			x[r1] = g4 / (d * cc2 * (cc1*wz*wz + g2*g2/cc1))
		}
		return nil
	})
}
