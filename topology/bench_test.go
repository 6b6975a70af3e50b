package topology

import (
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// benchStages has one stage per kind the benchmarks realize.
var benchStages = map[Kind]filter.Stage{
	RCFollower:          {Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1},
	InvertingFirstOrder: {Kind: filter.HighpassStage, Order: 1, F0Hz: 1e3, Gain: 2},
	SallenKey:           {Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7071, Gain: 1},
	SallenKeyEqual:      {Kind: filter.HighpassStage, Order: 2, F0Hz: 1e3, Q: 0.7071, Gain: 1},
	MultipleFeedback:    {Kind: filter.BandpassStage, Order: 2, F0Hz: 1e3, Q: 5, Gain: 1},
	StateVariable:       {Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 3, ZeroHz: 1.2e3, Gain: 1},
	TowThomas:           {Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 3, ZeroHz: 0.8e3, Gain: 1},
}

func benchCircuit(b testing.TB, k Kind) Circuit {
	c, err := RealizeStage(benchStages[k], Options{Kind: k})
	if err != nil {
		b.Fatal(err)
	}
	return c
}

func BenchmarkRealizeStage(b *testing.B) {
	for _, k := range allKinds {
		b.Run(k.String(), func(b *testing.B) {
			st := benchStages[k]
			b.ReportAllocs()
			for b.Loop() {
				_, _ = RealizeStage(st, Options{Kind: k})
			}
		})
	}
}

// BenchmarkCircuitAtHz is one MNA solve per frequency, from the Circuit
// value (template lookup, value copy, stamp, LU).
func BenchmarkCircuitAtHz(b *testing.B) {
	for _, k := range allKinds {
		b.Run(k.String(), func(b *testing.B) {
			c := benchCircuit(b, k)
			b.ReportAllocs()
			for b.Loop() {
				_ = c.AtHz(1.1e3)
			}
		})
	}
}

func BenchmarkEvaluatorEval(b *testing.B) {
	for _, k := range allKinds {
		b.Run(k.String(), func(b *testing.B) {
			c := benchCircuit(b, k)
			ev, _ := c.NewEvaluator()
			v := c.Values()
			b.ReportAllocs()
			for b.Loop() {
				_, _ = ev.Eval(v)
			}
		})
	}
}

func BenchmarkBiquadOf(b *testing.B) {
	c := benchCircuit(b, SallenKey)
	v := c.Values()
	b.ReportAllocs()
	for b.Loop() {
		_, _ = c.BiquadOf(v)
	}
}

func BenchmarkRequiredGBWHz(b *testing.B) {
	c := benchCircuit(b, SallenKey)
	b.ReportAllocs()
	for b.Loop() {
		_, _ = c.RequiredGBWHz(0)
	}
}

// TestNoAllocs proves the hot paths allocate nothing.
func TestNoAllocs(t *testing.T) {
	for _, k := range allKinds {
		c := benchCircuit(t, k)
		ch := Chain{Circuits: []Circuit{c, c}}
		ev, _ := c.NewEvaluator()
		v := c.Values()
		var sink complex128
		allocs := testing.AllocsPerRun(50, func() {
			sink += c.AtHz(900)
			sink += ch.AtHz(900)
			sink += c.AtHzWith(OpAmp{GBWHz: 1e6, DCGain: 1e5, ROutOhm: 10}, 900)
			b, _ := ev.Eval(v)
			sink += b.AtHz(900)
			b, _ = c.BiquadOf(v)
			sink += b.AtHz(900)
			b, _ = c.Biquad()
			sink += b.AtHz(900)
			st, _ := ev.Achieved(v)
			sink += complex(st.F0Hz, 0)
		})
		if allocs != 0 {
			t.Errorf("%v: %v allocations per run, want 0", k, allocs)
		}
		_ = sink
	}
}
