package topology

import (
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"pgregory.net/rapid"
)

// Tolerance levels. exact: the nodal analysis of synthesized parts against
// the stage's closed form, both in float64 through a few dozen operations
// (the brief's 1e-9 relative). coef: quantities read from the interpolated
// coefficients (f0, Q, gain, zero) after a Refit or from Achieved.
const (
	exact = 1e-9
	coef  = 1e-9
)

// support lists, per kind, the stage kinds and orders it realizes.
var support = map[Kind][]struct {
	kind  filter.StageKind
	order int
}{
	RCFollower:          {{filter.LowpassStage, 1}, {filter.HighpassStage, 1}},
	InvertingFirstOrder: {{filter.LowpassStage, 1}, {filter.HighpassStage, 1}},
	SallenKey:           {{filter.LowpassStage, 2}, {filter.HighpassStage, 2}},
	SallenKeyEqual:      {{filter.LowpassStage, 2}, {filter.HighpassStage, 2}},
	MultipleFeedback:    {{filter.LowpassStage, 2}, {filter.HighpassStage, 2}, {filter.BandpassStage, 2}},
	StateVariable:       {{filter.LowpassStage, 2}, {filter.HighpassStage, 2}, {filter.BandpassStage, 2}, {filter.NotchStage, 2}},
	TowThomas:           {{filter.LowpassStage, 2}, {filter.BandpassStage, 2}, {filter.NotchStage, 2}},
}

var allKinds = []Kind{RCFollower, InvertingFirstOrder, SallenKey, SallenKeyEqual, MultipleFeedback, StateVariable, TowThomas}

// drawStage draws a stage that kind k realizes within the default ranges:
// f0 from 10 Hz to 100 kHz, Q from 0.55 to 10, gain from 0.2 to 5, and a
// notch zero from f0/3 to 3·f0 (all three notch types). Some kinds narrow
// the gain (the equal-component Sallen-Key cannot exceed K).
func drawStage(t *rapid.T, k Kind) filter.Stage {
	sup := support[k]
	s := sup[rapid.IntRange(0, len(sup)-1).Draw(t, "stage")]
	st := filter.Stage{Kind: s.kind, Order: s.order}
	st.F0Hz = math.Pow(10, rapid.Float64Range(1, 5).Draw(t, "logF0"))
	st.Gain = math.Pow(10, rapid.Float64Range(-0.7, 0.7).Draw(t, "logGain"))
	if rapid.IntRange(0, 3).Draw(t, "unity") == 0 {
		st.Gain = 1
	}
	if s.order == 2 {
		st.Q = math.Pow(10, rapid.Float64Range(math.Log10(0.55), 1).Draw(t, "logQ"))
	}
	if s.kind == filter.NotchStage {
		st.ZeroHz = st.F0Hz * math.Pow(3, rapid.Float64Range(-1, 1).Draw(t, "zeroRatio"))
		if rapid.IntRange(0, 3).Draw(t, "symmetric") == 0 {
			st.ZeroHz = st.F0Hz
		}
	}
	if k == SallenKeyEqual {
		st.Q = math.Max(st.Q, 0.6)
		kk := 3 - 1/st.Q
		st.Gain = kk * rapid.Float64Range(0.2, 0.8).Draw(t, "gainOverK")
		if rapid.IntRange(0, 3).Draw(t, "gainK") == 0 {
			st.Gain = kk
		}
	}
	if k == MultipleFeedback && st.Kind == filter.LowpassStage {
		st.Q = math.Min(st.Q, 5) // keeps C1/C2 = 6Q²(1+G) inside the range
	}
	return st
}

func relDiff(a, b complex128) float64 {
	return cmplx.Abs(a-b) / math.Max(cmplx.Abs(b), 1e-300)
}

// sign returns −1 for an inverting circuit.
func sign(c Circuit) complex128 {
	if c.Inverting() {
		return -1
	}
	return 1
}

// passLevel is the smaller of a stage's passband gains (for a notch, the
// DC gain Gain and the high-frequency gain Gain·(f0/fz)²), the scale for
// errors near a transmission zero; 0 for other stages.
func passLevel(st filter.Stage) float64 {
	if st.Kind != filter.NotchStage {
		return 0
	}
	r := st.F0Hz / st.ZeroHz
	return math.Abs(st.Gain) * math.Min(1, r*r)
}

func cmplxAbs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

// Circuits and chains are response.Systems (compile-time check).
var (
	_ response.System = Circuit{}
	_ response.System = Chain{}
	_ response.System = Biquad{}
)

// plainStage is a stage of kind sk and order for circuit kind k at gain 1
// with f0, the Q of a second-order stage, a notch zero at zeroHz, and the
// equal-component Sallen-Key's gain skeGain (it cannot give 1 at low Q):
// the fixed cases of the non-ideal op-amp checks.
func plainStage(k Kind, sk filter.StageKind, order int, f0, q, zeroHz, skeGain float64) filter.Stage {
	st := filter.Stage{Kind: sk, Order: order, F0Hz: f0, Gain: 1}
	if order == 2 {
		st.Q = q
	}
	if sk == filter.NotchStage {
		st.ZeroHz = zeroHz
	}
	if k == SallenKeyEqual {
		st.Gain = skeGain
	}
	return st
}

// drawCircuit draws a kind, a stage it realizes (drawStage) and its
// circuit, skipping the draw when the kind's ranges refuse the stage.
func drawCircuit(t *rapid.T) (filter.Stage, Circuit) {
	k := rapid.SampledFrom(allKinds).Draw(t, "kind")
	st := drawStage(t, k)
	c, err := RealizeStage(st, Options{Kind: k})
	if err != nil {
		t.Skip(err)
	}
	return st, c
}
