package topology_test

import (
	"encoding/json"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/topology"
)

// FuzzChainJSON decodes arbitrary bytes as a Chain (the form a tool stores
// realized circuits in) and uses what decodes: never a panic; AtHz gives a
// number or NaN (a circuit that fits no template), the analyses (noise
// included) give a value or an error, WriteSPICE writes or errs; a chain that decodes and
// encodes again reads back equal.
func FuzzChainJSON(f *testing.F) {
	for _, st := range [][]filter.Stage{
		{{Kind: filter.LowpassStage, Order: 2, F0Hz: 1e3, Q: 0.7071, Gain: 1}, {Kind: filter.LowpassStage, Order: 1, F0Hz: 2e3, Gain: 2}},
		{{Kind: filter.BandpassStage, Order: 2, F0Hz: 50, Q: 10, Gain: 1}},
		{{Kind: filter.NotchStage, Order: 2, F0Hz: 1e4, Q: 5, ZeroHz: 1.2e4, Gain: 1}, {Kind: filter.HighpassStage, Order: 2, F0Hz: 1e4, Q: 2, Gain: 0.5}},
	} {
		for _, k := range []topology.Kind{topology.Auto, topology.StateVariable} {
			ch, err := topology.Realize(st, topology.Options{Kind: k})
			if err != nil {
				continue
			}
			b, err := json.Marshal(ch)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(b)
		}
	}
	for _, s := range []string{`{}`, `{"circuits":[]}`, `{"circuits":[{}]}`, `{"circuits":null}`,
		`{"circuits":[{"kind":"sallen-key","stage":{"kind":"lowpass","order":2,"f0_hz":1,"q":1,"gain":1},"parts":[{"ref":"R1","value":-1}]}]}`,
		`{"circuits":[{"kind":"tow-thomas","stage":{"kind":"notch","order":2,"f0_hz":1e300,"q":1e-300,"zero_hz":5e-324,"gain":1e308},"parts":[]}]}`} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		var ch topology.Chain
		if err := json.Unmarshal(data, &ch); err != nil {
			return
		}
		if len(ch.Circuits) > 16 {
			return // keep each execution short
		}
		for _, fz := range []float64{0, 1, 1e3, 1e9, math.NaN(), -1} {
			_ = ch.AtHz(fz)
		}
		_ = ch.Inverting()
		var sb strings.Builder
		_ = ch.WriteSPICE(&sb)
		_ = ch.WriteSPICEWith(io.Discard, topology.OpAmp{GBWHz: 1e6, DCGain: 1e5, ROutOhm: 50})
		noise := topology.Noise{AmpVoltage: 4e-9, AmpCurrent: 1e-12, OpAmp: topology.OpAmp{GBWHz: 1e6}}
		if d, err := ch.NoiseAt(noise, 1e3); err == nil && !(d >= 0 && d <= math.MaxFloat64) {
			t.Fatalf("NoiseAt %g without an error", d)
		}
		_, _ = ch.NoiseSources(noise, 1e3)
		if pk, err := ch.AmpPeaks(); err == nil {
			for _, p := range pk {
				if !(p.Gain >= 0 && p.Gain <= math.MaxFloat64) {
					t.Fatalf("AmpPeaks %+v without an error", p)
				}
			}
		}
		if v, err := ch.NoiseRMS(noise, 1e3, 2e3); err == nil && !(v >= 0 && v <= math.MaxFloat64) {
			t.Fatalf("NoiseRMS %g without an error", v)
		}
		for _, c := range ch.Circuits {
			_ = c.OpAmps()
			_, _ = c.Achieved()
			_, _ = c.Biquad()
			_, _ = c.Transfer()
			_ = c.AtHzWith(topology.OpAmp{GBWHz: 1e6}, 1e3)
			if ev, err := c.NewEvaluator(); err == nil {
				_, _ = ev.Eval(c.Values())
			}
			_, _ = c.WithValues(c.Values())
			_, _ = c.Refit(nil)
		}
		b, err := json.Marshal(ch)
		if err != nil {
			return // an unknown kind or a non-finite number has no encoding
		}
		var back topology.Chain
		if err := json.Unmarshal(b, &back); err != nil {
			t.Fatalf("re-encoded chain %s does not decode: %v", b, err)
		}
		if d := cmp.Diff(ch, back); d != "" {
			t.Fatalf("chain JSON round trip (-want +got):\n%s", d)
		}
	})
}
