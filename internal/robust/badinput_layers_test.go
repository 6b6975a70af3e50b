package robust_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// refDesign is a valid 4th-order Butterworth lowpass at 1 kHz, its stages
// and its realized chain: the good values the rows of the other layers
// spoil one argument of.
func refDesign(t testing.TB) (filter.Transfer, []filter.Stage, topology.Chain) {
	t.Helper()
	h, err := filter.Butterworth{}.Prototype(4)
	if err != nil {
		t.Fatal(err)
	}
	if h, err = h.ToLowpass(1000); err != nil {
		t.Fatal(err)
	}
	st, err := h.Stages()
	if err != nil {
		t.Fatal(err)
	}
	ch, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return h, st, ch
}

// nanSystem is a System whose response is NaN everywhere.
type nanSystem struct{}

func (nanSystem) AtHz(float64) complex128 { return complex(nan, nan) }

// flatSystem has 0 dB gain everywhere.
type flatSystem struct{}

func (flatSystem) AtHz(float64) complex128 { return 1 }

func responseBadInputs(t *testing.T) []badInput {
	h, _, _ := refDesign(t)
	var rows []badInput
	// Bands for every band-taking function.
	type band struct {
		reason, field string
		lo, hi        float64
	}
	var bandRows []band
	for _, x := range badNumbers {
		bandRows = append(bandRows, band{"loHz " + x.name, "loHz", x.v, 1e4})
	}
	for _, x := range []struct {
		name string
		v    float64
	}{{"NaN", nan}, {"+Inf", inf}, {"-Inf", ninf}} {
		bandRows = append(bandRows, band{"hiHz " + x.name, "hiHz", 10, x.v})
	}
	bandRows = append(bandRows,
		band{"hiHz below loHz", "hiHz", 1e4, 10},
		band{"hiHz equal to loHz", "hiHz", 10, 10},
		band{"hiHz above MaxSearchHz", "hiHz", 10, 1e301},
	)
	for _, b := range bandRows {
		rows = append(rows,
			badInput{"CrossingHz " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, err := response.CrossingHz(h, -3, b.lo, b.hi); return err }},
			badInput{"GainExtremes " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, err := response.GainExtremes(h, b.lo, b.hi); return err }},
			badInput{"PassbandRippleDB " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, err := response.PassbandRippleDB(h, b.lo, b.hi); return err }},
			badInput{"PeakGain " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, _, err := response.PeakGain(h, b.lo, b.hi); return err }},
			badInput{"StopbandAttenDB " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, _, err := response.StopbandAttenDB(h, b.lo, b.hi); return err }},
			badInput{"Bandwidth " + b.reason, errs(response.ErrGrid), b.field,
				func() error { _, err := response.Bandwidth(h, 3, b.lo, b.hi); return err }},
		)
	}
	for _, x := range []struct {
		name string
		v    float64
	}{{"NaN", nan}, {"+Inf", inf}, {"-Inf", ninf}} {
		rows = append(rows, badInput{"CrossingHz levelDB " + x.name, errs(response.ErrGrid), "levelDB",
			func() error { _, err := response.CrossingHz(h, x.v, 1, 1e4); return err }})
	}
	for _, x := range badNumbers {
		rows = append(rows, badInput{"Bandwidth dropDB " + x.name, errs(response.ErrGrid), "dropDB",
			func() error { _, err := response.Bandwidth(h, x.v, 1, 1e5); return err }})
	}
	rows = append(rows,
		badInput{"CrossingHz no crossing", errs(response.ErrNoCrossing), "cross",
			func() error { _, err := response.CrossingHz(flatSystem{}, -3, 1, 1e4); return err }},
		badInput{"CrossingHz NaN system", errs(response.ErrSystem), "NaN",
			func() error { _, err := response.CrossingHz(nanSystem{}, -3, 1, 1e4); return err }},
		badInput{"GainExtremes NaN system", errs(response.ErrSystem), "NaN",
			func() error { _, err := response.GainExtremes(nanSystem{}, 1, 1e4); return err }},
		badInput{"CheckMask NaN system", errs(response.ErrSystem), "NaN",
			func() error { _, err := response.CheckMask(nanSystem{}, okSpec(filter.Lowpass)); return err }},
		badInput{"CrossingHz nil System", errs(response.ErrSystem), "nil System",
			func() error { _, err := response.CrossingHz(nil, -3, 1, 1e4); return err }},
		badInput{"CheckMask nil System", errs(response.ErrSystem), "nil System",
			func() error { _, err := response.CheckMask(nil, okSpec(filter.Lowpass)); return err }},
		badInput{"GainExtremes nil *filter.Transfer", errs(response.ErrSystem), "nil System",
			func() error { _, err := response.GainExtremes((*filter.Transfer)(nil), 1, 1e4); return err }},
		badInput{"PassbandRippleDB nil System", errs(response.ErrSystem), "nil System",
			func() error { _, err := response.PassbandRippleDB(nil, 1, 1e4); return err }},
		badInput{"StopbandAttenDB nil System", errs(response.ErrSystem), "nil System",
			func() error { _, _, err := response.StopbandAttenDB(nil, 1, 1e4); return err }},
		badInput{"PeakGain nil System", errs(response.ErrSystem), "nil System",
			func() error { _, _, err := response.PeakGain(nil, 1, 1e4); return err }},
		badInput{"Bandwidth nil System", errs(response.ErrSystem), "nil System",
			func() error { _, err := response.Bandwidth(nil, 3, 1, 1e4); return err }},
		badInput{"CheckMask edge above MaxSearchHz", errs(response.ErrGrid), "Hz",
			func() error {
				_, err := response.CheckMask(h, filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e299}, StopHz: [2]float64{1e301}, RippleDB: 1, AttenDB: 40})
				return err
			}},
	)
	for _, c := range badSpecs() {
		rows = append(rows, badInput{"CheckMask: " + c.reason, errs(filter.ErrSpec), c.field,
			func() error { _, err := response.CheckMask(h, c.s); return err }})
	}
	// Time responses: bad transfers and bad times.
	for _, c := range []struct {
		reason, field string
		h             filter.Transfer
	}{
		{"more zeros than poles", "zeros", filter.Transfer{Zeros: []complex128{-1, -2}, Poles: []complex128{-3}, Gain: 1}},
		{"NaN gain", "Gain", filter.Transfer{Poles: []complex128{-1}, Gain: nan}},
		{"infinite gain", "Gain", filter.Transfer{Poles: []complex128{-1}, Gain: inf}},
		{"NaN pole", "Poles[0]", filter.Transfer{Poles: []complex128{complex(nan, 0)}, Gain: 1}},
		{"infinite zero", "Zeros[0]", filter.Transfer{Zeros: []complex128{complex(inf, 0)}, Poles: []complex128{-1}, Gain: 1}},
		{"complex pole without conjugate", "Poles[0]", filter.Transfer{Poles: []complex128{complex(-1, 2)}, Gain: 1}},
	} {
		rows = append(rows,
			badInput{"Step: " + c.reason, errs(response.ErrSystem), c.field,
				func() error { _, err := response.Step(c.h, []float64{0, 1}); return err }},
			badInput{"Impulse: " + c.reason, errs(response.ErrSystem), c.field,
				func() error { _, _, err := response.Impulse(c.h, []float64{0, 1}); return err }},
			badInput{"MeasureStep: " + c.reason, errs(response.ErrSystem), c.field,
				func() error { _, err := response.MeasureStep(c.h, 0.01); return err }},
		)
	}
	for _, x := range []struct {
		name  string
		v     float64
		field string
	}{{"NaN", nan, "t[1]"}, {"+Inf", inf, "t[1]"}, {"-Inf", ninf, "t[1]"}, {"negative", -1e-3, "t[1]"}} {
		tt := []float64{0, x.v, 1}
		rows = append(rows,
			badInput{"Step time " + x.name, errs(response.ErrGrid), x.field, func() error { _, err := response.Step(h, tt); return err }},
			badInput{"Impulse time " + x.name, errs(response.ErrGrid), x.field, func() error { _, _, err := response.Impulse(h, tt); return err }},
		)
	}
	for _, b := range []float64{nan, inf, 0, -0.1, 1, 2, 1e-10} {
		rows = append(rows, badInput{fmt.Sprintf("MeasureStep band %g", b), errs(response.ErrGrid), "band",
			func() error { _, err := response.MeasureStep(h, b); return err }})
	}
	hp, _ := filter.Butterworth{}.Prototype(2)
	hp, _ = hp.ToHighpass(100)
	rows = append(rows,
		badInput{"MeasureStep unstable pole", errs(response.ErrSystem), "Poles[0]",
			func() error {
				_, err := response.MeasureStep(filter.Transfer{Poles: []complex128{1}, Gain: 1}, 0.01)
				return err
			}},
		badInput{"MeasureStep highpass (final value 0)", errs(response.ErrSystem), "final value",
			func() error { _, err := response.MeasureStep(hp, 0.01); return err }},
	)
	return rows
}

// topologyBadInputs returns the rows of package topology, and apart the
// rows whose error comes from elsewhere unchanged (the writer's own error,
// encoding/json's), which carry no topology prefix.
func topologyBadInputs(t *testing.T) (rows, raw []badInput) {
	_, st, ch := refDesign(t)
	good := ch.Circuits[0]
	// Realize and RealizeStage: one bad stage field each, every kind.
	stageCases := []struct {
		reason, field string
		s             filter.Stage
		want          []error
	}{}
	with := func(f func(*filter.Stage)) filter.Stage { s := st[0]; f(&s); return s }
	for _, x := range badNumbers {
		stageCases = append(stageCases,
			struct {
				reason, field string
				s             filter.Stage
				want          []error
			}{"F0Hz " + x.name, "F0Hz", with(func(s *filter.Stage) { s.F0Hz = x.v }), errs(topology.ErrStage, filter.ErrStage)},
			struct {
				reason, field string
				s             filter.Stage
				want          []error
			}{"Q " + x.name, "Q", with(func(s *filter.Stage) { s.Q = x.v }), errs(topology.ErrStage, filter.ErrStage)})
	}
	stageCases = append(stageCases, []struct {
		reason, field string
		s             filter.Stage
		want          []error
	}{
		{"order 0", "Order", with(func(s *filter.Stage) { s.Order = 0 }), errs(topology.ErrStage, filter.ErrStage)},
		{"order -1", "Order", with(func(s *filter.Stage) { s.Order = -1 }), errs(topology.ErrStage, filter.ErrStage)},
		{"order 1e9", "Order", with(func(s *filter.Stage) { s.Order = 1e9 }), errs(topology.ErrStage, filter.ErrStage)},
		{"unknown stage kind", "Kind", with(func(s *filter.Stage) { s.Kind = 42 }), errs(topology.ErrStage, filter.ErrStage)},
		{"NaN gain", "Gain", with(func(s *filter.Stage) { s.Gain = nan }), errs(topology.ErrStage, filter.ErrStage)},
		{"zero gain", "gain", with(func(s *filter.Stage) { s.Gain = 0 }), errs(topology.ErrUnrealizable)},
		{"notch without ZeroHz", "ZeroHz", filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, Gain: 1}, errs(topology.ErrStage, filter.ErrStage)},
	}...)
	for _, c := range stageCases {
		for _, k := range []topology.Kind{topology.Auto, topology.SallenKey, topology.MultipleFeedback, topology.StateVariable} {
			rows = append(rows,
				badInput{fmt.Sprintf("RealizeStage %v: %s", k, c.reason), c.want, c.field,
					func() error { _, err := topology.RealizeStage(c.s, topology.Options{Kind: k}); return err }},
				badInput{fmt.Sprintf("Realize %v: %s (second stage)", k, c.reason), c.want, "stage",
					func() error {
						_, err := topology.Realize([]filter.Stage{st[0], c.s}, topology.Options{Kind: k})
						return err
					}})
		}
	}
	// Kinds that cannot realize the stage, unknown kinds.
	for _, c := range []struct {
		reason string
		s      filter.Stage
		k      topology.Kind
	}{
		{"Sallen-Key bandpass", filter.Stage{Kind: filter.BandpassStage, Order: 2, F0Hz: 1e3, Q: 2, Gain: 1}, topology.SallenKey},
		{"Sallen-Key first order", filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1e3, Gain: 1}, topology.SallenKey},
		{"RC follower second order", st[0], topology.RCFollower},
		{"Tow-Thomas highpass", filter.Stage{Kind: filter.HighpassStage, Order: 2, F0Hz: 1e3, Q: 0.7, Gain: 1}, topology.TowThomas},
		{"MFB notch", filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1e3, Q: 2, ZeroHz: 1e3, Gain: 1}, topology.MultipleFeedback},
		{"kind 42", st[0], 42},
		{"kind -1", st[0], -1},
	} {
		rows = append(rows, badInput{"RealizeStage: " + c.reason, errs(topology.ErrKind), "kind",
			func() error { _, err := topology.RealizeStage(c.s, topology.Options{Kind: c.k}); return err }})
	}
	// Options.
	for _, x := range []struct {
		name string
		v    float64
	}{{"NaN", nan}, {"+Inf", inf}, {"-Inf", ninf}, {"negative", -1e-9}} {
		for _, o := range []struct {
			field string
			opt   topology.Options
		}{
			{"CapF", topology.Options{CapF: x.v}},
			{"RMinOhm", topology.Options{RMinOhm: x.v}},
			{"RMaxOhm", topology.Options{RMaxOhm: x.v}},
			{"CMinF", topology.Options{CMinF: x.v}},
			{"CMaxF", topology.Options{CMaxF: x.v}},
		} {
			rows = append(rows, badInput{"Realize Options." + o.field + " " + x.name, errs(topology.ErrOptions), o.field,
				func() error { _, err := topology.Realize(st, o.opt); return err }})
		}
	}
	rows = append(rows,
		badInput{"Realize empty resistor range", errs(topology.ErrOptions), "resistor range",
			func() error { _, err := topology.Realize(st, topology.Options{RMinOhm: 1e5, RMaxOhm: 1e3}); return err }},
		badInput{"Realize empty capacitor range", errs(topology.ErrOptions), "capacitor range",
			func() error { _, err := topology.Realize(st, topology.Options{CMinF: 1e-6, CMaxF: 1e-9}); return err }},
		badInput{"Realize CapF 1 F: resistors out of range", errs(topology.ErrRange), "R1",
			func() error { _, err := topology.Realize(st, topology.Options{CapF: 1}); return err }},
		badInput{"Realize empty stage list", errs(topology.ErrStage), "stage",
			func() error { _, err := topology.Realize(nil, topology.Options{}); return err }},
		badInput{"Realize zero-length stage list", errs(topology.ErrStage), "stage",
			func() error { _, err := topology.Realize([]filter.Stage{}, topology.Options{}); return err }},
		badInput{"Realize list of zero stages", errs(topology.ErrStage, filter.ErrStage), "Kind",
			func() error { _, err := topology.Realize(make([]filter.Stage, 3), topology.Options{}); return err }},
	)
	// Kind parsing and text/JSON decoding.
	for _, s := range []string{"", "auto-magic", "Sallen Key", "sallen-key ", "SALLEN-KEY", "\x00", "mfb", "9", "Kind(3)", strings.Repeat("x", 1000)} {
		rows = append(rows,
			badInput{fmt.Sprintf("ParseKind(%.20q)", s), errs(topology.ErrKind), "kind", func() error { _, err := topology.ParseKind(s); return err }},
			badInput{fmt.Sprintf("Kind.UnmarshalText(%.20q)", s), errs(topology.ErrKind), "kind", func() error { var k topology.Kind; return k.UnmarshalText([]byte(s)) }})
	}
	for _, k := range []topology.Kind{-1, 99} {
		rows = append(rows, badInput{fmt.Sprintf("Kind(%d).MarshalText", int(k)), errs(topology.ErrKind), "kind",
			func() error { _, err := k.MarshalText(); return err }})
	}
	// Part values.
	vals := good.Values()
	for _, x := range badNumbers {
		for i := range vals {
			v := append([]float64(nil), vals...)
			v[i] = x.v
			rows = append(rows,
				badInput{fmt.Sprintf("WithValues [%d] %s", i, x.name), errs(topology.ErrParts), "value", func() error { _, err := good.WithValues(v); return err }},
				badInput{fmt.Sprintf("BiquadOf [%d] %s", i, x.name), errs(topology.ErrParts), "value", func() error { _, err := good.BiquadOf(v); return err }})
		}
		rows = append(rows, badInput{"Refit C1 " + x.name, errs(topology.ErrParts), "C1",
			func() error { _, err := good.Refit([]topology.Part{{Ref: "C1", Value: x.v}}); return err }})
	}
	ev, err := good.NewEvaluator()
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range [][]float64{nil, vals[:1], append(append([]float64(nil), vals...), 1), {nan, nan, nan, nan}, {-1, 1, 1, 1}} {
		rows = append(rows,
			badInput{fmt.Sprintf("WithValues %v", v), errs(topology.ErrParts), "value", func() error { _, err := good.WithValues(v); return err }},
			badInput{fmt.Sprintf("Evaluator.Eval %v", v), errs(topology.ErrParts), "value", func() error { _, err := ev.Eval(v); return err }},
			badInput{fmt.Sprintf("Evaluator.Achieved %v", v), errs(topology.ErrParts), "value", func() error { _, err := ev.Achieved(v); return err }})
	}
	rows = append(rows,
		badInput{"Refit unknown part", errs(topology.ErrParts), "C9", func() error { _, err := good.Refit([]topology.Part{{Ref: "C9", Value: 1e-9}}); return err }},
		badInput{"Refit a resistor", errs(topology.ErrParts), "R1", func() error { _, err := good.Refit([]topology.Part{{Ref: "R1", Value: 1e3}}); return err }},
		badInput{"Refit junk reference", errs(topology.ErrParts), "junk", func() error { _, err := good.Refit([]topology.Part{{Ref: "junk", Value: 1e3}}); return err }},
	)
	// Op-amp models.
	for _, c := range []struct {
		reason string
		op     topology.OpAmp
	}{
		{"NaN GBW", topology.OpAmp{GBWHz: nan}}, {"negative GBW", topology.OpAmp{GBWHz: -1}},
		{"NaN DC gain", topology.OpAmp{GBWHz: 1e6, DCGain: nan}}, {"negative DC gain", topology.OpAmp{GBWHz: 1e6, DCGain: -1}},
		{"NaN output resistance", topology.OpAmp{GBWHz: 1e6, ROutOhm: nan}}, {"infinite output resistance", topology.OpAmp{GBWHz: 1e6, ROutOhm: inf}},
	} {
		rows = append(rows,
			badInput{"DominantWith " + c.reason, errs(topology.ErrOpAmp), "op-amp", func() error { _, _, err := good.DominantWith(c.op); return err }},
			badInput{"PolesZerosWith " + c.reason, errs(topology.ErrOpAmp), "op-amp", func() error { _, _, _, err := good.PolesZerosWith(c.op); return err }},
			badInput{"Predistort " + c.reason, errs(topology.ErrOpAmp), "op-amp", func() error { _, err := good.Predistort(c.op); return err }},
			badInput{"WriteSPICEWith " + c.reason, errs(topology.ErrOpAmp), "op-amp", func() error { return ch.WriteSPICEWith(io.Discard, c.op) }},
		)
	}
	rows = append(rows,
		badInput{"WriteSPICEWith zero GBW (no DC path)", errs(topology.ErrOpAmp), "GBW", func() error { return ch.WriteSPICEWith(io.Discard, topology.OpAmp{DCGain: 1e5}) }},
		badInput{"WriteSPICEWith zero DC gain", errs(topology.ErrOpAmp), "DC", func() error { return ch.WriteSPICEWith(io.Discard, topology.OpAmp{GBWHz: 1e6}) }},
		badInput{"Predistort with a far too slow op-amp", errs(topology.ErrUnrealizable), "capacitor ratio", func() error { _, err := good.Predistort(topology.OpAmp{GBWHz: 10}); return err }},
	)
	for _, e := range []float64{nan, -0.01, inf, ninf} {
		rows = append(rows,
			badInput{fmt.Sprintf("RequiredGBWHz maxErr %g", e), errs(topology.ErrOpAmp), "maxErr", func() error { _, err := good.RequiredGBWHz(e); return err }},
			badInput{fmt.Sprintf("RequiredGBWHzWith maxErr %g", e), errs(topology.ErrOpAmp), "maxErr", func() error { _, err := good.RequiredGBWHzWith(topology.OpAmp{DCGain: 1e5}, e); return err }})
	}
	rows = append(rows,
		badInput{"RequiredGBWHzWith DC gain too low", errs(topology.ErrOpAmp), "gain-bandwidth", func() error { _, err := good.RequiredGBWHzWith(topology.OpAmp{DCGain: 10}, 1e-4); return err }},
		badInput{"WriteSPICE empty chain", errs(topology.ErrStage), "chain", func() error { return topology.Chain{}.WriteSPICE(io.Discard) }},
	)
	// Malformed circuits built by hand (or decoded from JSON).
	bad := []struct {
		reason, field string
		c             topology.Circuit
		want          []error
	}{
		{"zero Circuit", "Kind 0", topology.Circuit{}, errs(topology.ErrStage, filter.ErrStage)},
		{"no parts", "0 parts", topology.Circuit{Kind: good.Kind, Stage: good.Stage}, errs(topology.ErrParts)},
		{"too few parts", "2 parts", topology.Circuit{Kind: good.Kind, Stage: good.Stage, Parts: good.Parts[:2]}, errs(topology.ErrParts)},
		{"wrong kind for the parts", "part", topology.Circuit{Kind: topology.TowThomas, Stage: good.Stage, Parts: good.Parts}, errs(topology.ErrParts)},
		{"unknown kind", "kind", topology.Circuit{Kind: 77, Stage: good.Stage, Parts: good.Parts}, errs(topology.ErrKind)},
		{"junk reference", "X1", topology.Circuit{Kind: good.Kind, Stage: good.Stage, Parts: []topology.Part{{Ref: "X1", Value: 1}, {Ref: "R2", Value: 1}, {Ref: "C1", Value: 1}, {Ref: "C2", Value: 1}}}, errs(topology.ErrParts)},
		{"invalid stage", "Kind 9", topology.Circuit{Kind: good.Kind, Stage: filter.Stage{Kind: 9}, Parts: good.Parts}, errs(topology.ErrStage, filter.ErrStage)},
	}
	for _, c := range bad {
		rows = append(rows,
			badInput{"Achieved: " + c.reason, c.want, c.field, func() error { _, err := c.c.Achieved(); return err }},
			badInput{"Biquad: " + c.reason, c.want, c.field, func() error { _, err := c.c.Biquad(); return err }},
			badInput{"Transfer: " + c.reason, c.want, c.field, func() error { _, err := c.c.Transfer(); return err }},
			badInput{"Sensitivities: " + c.reason, c.want, c.field, func() error { _, err := c.c.Sensitivities(); return err }},
			badInput{"NewEvaluator: " + c.reason, c.want, c.field, func() error { _, err := c.c.NewEvaluator(); return err }},
			badInput{"RequiredGBWHz: " + c.reason, c.want, c.field, func() error { _, err := c.c.RequiredGBWHz(0); return err }},
			badInput{"Refit: " + c.reason, c.want, c.field, func() error { _, err := c.c.Refit(nil); return err }},
			badInput{"WriteSPICE: " + c.reason, c.want, c.field, func() error { return topology.Chain{Circuits: []topology.Circuit{c.c}}.WriteSPICE(io.Discard) }},
		)
	}
	raw = append(raw, badInput{"WriteSPICE failing writer", errs(io.ErrShortWrite), "short write", func() error { return ch.WriteSPICE(failWriter{}) }})
	// Chain JSON: malformed documents.
	for _, j := range []string{`{`, `{"circuits":[{"kind":"nonsense","stage":{"kind":"lowpass","order":2,"f0_hz":1,"q":1,"gain":1},"parts":[]}]}`,
		`{"circuits":[{"kind":"sallen-key","stage":{"kind":"allpass","order":2,"f0_hz":1,"q":1,"gain":1},"parts":[]}]}`,
		`{"circuits":[{"kind":"sallen-key","stage":{"kind":"lowpass","order":2,"q":1,"gain":1},"parts":[]}]}`,
		`{"circuits":[{"kind":3}]}`, `{"circuits":"x"}`} {
		raw = append(raw, badInput{fmt.Sprintf("Chain JSON %.40s", j), nil, "",
			func() error { var c topology.Chain; return json.Unmarshal([]byte(j), &c) }})
	}
	return rows, raw
}

type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, io.ErrShortWrite }

func seriesBadInputs(t *testing.T) []badInput {
	_, _, ch := refDesign(t)
	spec := okSpec(filter.Lowpass)
	pb, err := series.PassbandOf(spec)
	if err != nil {
		t.Fatal(err)
	}
	var rows []badInput
	// Value parsing: junk strings.
	for _, s := range []string{"", " ", "k", "4k7k", "1.2.3", "NaN", "nan", "Inf", "-Inf", "+inf", "abc", "--1", "4 7k", "0x10", "1_000", "µ",
		"4k7Ω?", "1e", "1e+", ".", "-", "1kk", "1e309k", "1e-320p", "1 k k", "RR", "4R7R", "1,5k", "١٢", "\x00", "1\x00", "4.7 uFF", "10 mΩ Ω",
		strings.Repeat("9", 400) + "x", "R", "4k7.2", "e5"} {
		rows = append(rows, badInput{fmt.Sprintf("ParseValue(%.20q)", s), errs(series.ErrSyntax), fmt.Sprintf("%q", s)[:min(len(fmt.Sprintf("%q", s)), 10)],
			func() error { _, err := series.ParseValue(s); return err }})
	}
	for _, s := range []string{"1e400", "1e-400", "-1e400", "1e9999999999999", "4.7e-330"} {
		rows = append(rows, badInput{fmt.Sprintf("ParseValue(%q) beyond float64", s), errs(series.ErrRange), s[:3],
			func() error { _, err := series.ParseValue(s); return err }})
	}
	for _, s := range []string{"", "E", "E0", "E25", "E-12", "E 24", "24", "e24x", "Series(none)", "E1920"} {
		rows = append(rows, badInput{fmt.Sprintf("ParseSeries(%q)", s), errs(series.ErrSeries), "series name",
			func() error { _, err := series.ParseSeries(s); return err }})
	}
	// Lookups.
	for _, x := range badNumbers {
		rows = append(rows,
			badInput{"NearestValue " + x.name, errs(series.ErrValue), "nearest", func() error { _, err := series.E24.NearestValue(x.v); return err }},
			badInput{"Neighbours " + x.name, errs(series.ErrValue), "neighbours", func() error { _, err := series.E24.Neighbours(x.v); return err }},
			badInput{"Values lo " + x.name, errs(series.ErrValue), "", func() error { _, err := series.E24.Values(x.v, 10); return err }},
			badInput{"Values hi " + x.name, errs(series.ErrValue), "", func() error { _, err := series.E24.Values(1, x.v); return err }},
			badInput{"BestPair " + x.name, errs(series.ErrValue), "", func() error { _, _, err := series.E24.BestPair(x.v); return err }},
		)
	}
	var none series.Series
	rows = append(rows,
		badInput{"NearestValue subnormal", errs(series.ErrRange), "below the normal", func() error { _, err := series.E24.NearestValue(1e-310); return err }},
		// NearestValue(MaxFloat64) is 1.6e308 (the nearest value float64
		// holds); the neighbour above it is still beyond float64.
		badInput{"Neighbours beyond float64", errs(series.ErrRange), "beyond float64", func() error { _, err := series.E24.Neighbours(math.MaxFloat64); return err }},
		badInput{"NearestValue of the zero Series", errs(series.ErrSeries), "zero Series", func() error { _, err := none.NearestValue(1); return err }},
		badInput{"Neighbours of the zero Series", errs(series.ErrSeries), "zero Series", func() error { _, err := none.Neighbours(1); return err }},
		badInput{"Values of the zero Series", errs(series.ErrSeries), "zero Series", func() error { _, err := none.Values(1, 10); return err }},
		badInput{"BestPair of the zero Series", errs(series.ErrSeries), "zero Series", func() error { _, _, err := none.BestPair(1); return err }},
		badInput{"Values reversed", errs(series.ErrRange), "wrong order", func() error { _, err := series.E24.Values(10, 1); return err }},
		badInput{"Values too many", errs(series.ErrRange), "holds", func() error { _, err := series.E192.Values(1e-300, 1e300); return err }},
	)
	for _, ref := range []string{"", "X1", "L1", "U1.", "U1.X2", "r1x", "1R", "\x00"} {
		rows = append(rows, badInput{fmt.Sprintf("KindOf(%q)", ref), errs(series.ErrChain), fmt.Sprintf("%q", ref),
			func() error { _, err := series.KindOf(ref); return err }})
	}
	// Chains that cannot be snapped or analyzed.
	withPart := func(ref string, v float64) topology.Chain {
		c := ch.Circuits[0]
		c.Parts = append([]topology.Part(nil), c.Parts...)
		c.Parts[0] = topology.Part{Ref: ref, Value: v}
		return topology.Chain{Circuits: append([]topology.Circuit{c}, ch.Circuits[1:]...)}
	}
	policy := series.Policy{Passband: pb}
	an := series.Analysis{Trials: 16, Hz: []float64{100, 1000, 4000}, Spec: &spec}
	badChains := []struct {
		reason, field string
		c             topology.Chain
		want          []error
	}{
		{"empty chain", "no circuits", topology.Chain{}, errs(series.ErrChain)},
		{"junk designator", "X1", withPart("X1", 1e3), errs(series.ErrChain)},
		{"NaN part", "", withPart("R1", nan), nil},
		{"negative part", "", withPart("R1", -1e3), nil},
	}
	for _, c := range badChains {
		if c.reason != "empty chain" { // Round and Items of no circuits are empty, not an error
			rows = append(rows,
				badInput{"Round: " + c.reason, c.want, c.field, func() error { _, err := series.Round(c.c, series.E96, series.E12); return err }},
				badInput{"Items: " + c.reason, c.want, c.field, func() error { _, err := series.Items(c.c, series.E96, series.E12, series.Tolerances{}); return err }})
		}
		rows = append(rows,
			badInput{"Snap: " + c.reason, c.want, c.field, func() error { _, err := series.Snap(c.c, policy); return err }},
			badInput{"MonteCarlo: " + c.reason, c.want, c.field, func() error { _, err := an.MonteCarlo(c.c); return err }},
			badInput{"WorstCase: " + c.reason, c.want, c.field, func() error { _, err := an.WorstCase(c.c); return err }},
			badInput{"Ranking: " + c.reason, c.want, c.field, func() error { _, err := an.Ranking(c.c); return err }},
		)
	}
	// Snap policies.
	for _, c := range []struct {
		reason, field string
		p             series.Policy
	}{
		{"no passband", "Passband", series.Policy{}},
		{"negative radius", "Radius", series.Policy{Passband: pb, Radius: -1}},
		{"absurd radius", "Radius", series.Policy{Passband: pb, Radius: 1e9}},
		{"negative cap radius", "CapRadius", series.Policy{Passband: pb, CapRadius: -2}},
		{"negative MaxCombos", "MaxCombos", series.Policy{Passband: pb, MaxCombos: -1}},
		{"NaN PairAbove", "PairAbove", series.Policy{Passband: pb, PairAbove: nan}},
		{"negative weight", "weights", series.Policy{Passband: pb, Weights: series.Weights{Q: -1}}},
		{"NaN weight", "weights", series.Policy{Passband: pb, Weights: series.Weights{F0: nan}}},
		{"reversed band", "band", series.Policy{Passband: []series.Band{{LoHz: 1e3, HiHz: 10}}}},
		{"NaN band", "band", series.Policy{Passband: []series.Band{{LoHz: nan, HiHz: 10}}}},
		{"zero band", "band", series.Policy{Passband: []series.Band{{}}}},
	} {
		rows = append(rows, badInput{"Snap policy: " + c.reason, errs(series.ErrPolicy), c.field, func() error { _, err := series.Snap(ch, c.p); return err }})
	}
	rows = append(rows,
		badInput{"DeviationDB no band", errs(series.ErrPolicy), "no band", func() error { _, err := series.DeviationDB(ch, nil); return err }},
		badInput{"DeviationDB empty chain", errs(series.ErrChain), "no circuits", func() error {
			_, err := series.DeviationDB(topology.Chain{}, []series.Band{{LoHz: 10, HiHz: 1e3}})
			return err
		}},
		badInput{"DeviationDB reversed band", errs(series.ErrPolicy), "band", func() error { _, err := series.DeviationDB(ch, []series.Band{{LoHz: 10, HiHz: 1}}); return err }},
		badInput{"DeviationDB infinite band", errs(series.ErrPolicy), "band", func() error { _, err := series.DeviationDB(ch, []series.Band{{LoHz: 10, HiHz: inf}}); return err }},
	)
	for _, c := range badSpecs() {
		rows = append(rows, badInput{"PassbandOf: " + c.reason, errs(filter.ErrSpec), c.field,
			func() error { _, err := series.PassbandOf(c.s); return err }})
	}
	// Analysis options.
	badSpec := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{500}, RippleDB: 1, AttenDB: 40}
	for _, c := range []struct {
		reason, field string
		a             series.Analysis
		want          []error
	}{
		{"no frequencies", "Hz", series.Analysis{}, errs(series.ErrPolicy)},
		{"NaN frequency", "frequency", series.Analysis{Hz: []float64{1, nan}}, errs(series.ErrPolicy)},
		{"zero frequency", "frequency", series.Analysis{Hz: []float64{0}}, errs(series.ErrPolicy)},
		{"negative frequency", "frequency", series.Analysis{Hz: []float64{-1}}, errs(series.ErrPolicy)},
		{"infinite frequency", "frequency", series.Analysis{Hz: []float64{inf}}, errs(series.ErrPolicy)},
		{"negative trials", "Trials", series.Analysis{Hz: []float64{1}, Trials: -1}, errs(series.ErrPolicy)},
		{"absurd trials", "Trials", series.Analysis{Hz: []float64{1}, Trials: 1e12}, errs(series.ErrPolicy)},
		{"negative workers", "Workers", series.Analysis{Hz: []float64{1}, Workers: -1}, errs(series.ErrPolicy)},
		{"unknown distribution", "Dist", series.Analysis{Hz: []float64{1}, Dist: 9}, errs(series.ErrPolicy)},
		{"NaN slack", "SlackDB", series.Analysis{Hz: []float64{1}, SlackDB: nan}, errs(series.ErrPolicy)},
		{"negative slack", "SlackDB", series.Analysis{Hz: []float64{1}, SlackDB: -1}, errs(series.ErrPolicy)},
		{"percentile 101", "percentile", series.Analysis{Hz: []float64{1}, Percentiles: []float64{101}}, errs(series.ErrPolicy)},
		{"percentile NaN", "percentile", series.Analysis{Hz: []float64{1}, Percentiles: []float64{nan}}, errs(series.ErrPolicy)},
		{"tolerance 1", "tolerance", series.Analysis{Hz: []float64{1}, Tolerances: series.Tolerances{Resistor: 1}}, errs(series.ErrPolicy)},
		{"tolerance negative", "tolerance", series.Analysis{Hz: []float64{1}, Tolerances: series.Tolerances{Capacitor: -0.1}}, errs(series.ErrPolicy)},
		{"tolerance NaN for one part", "tolerance", series.Analysis{Hz: []float64{1}, Tolerances: series.Tolerances{Part: map[string]float64{"U1.R1": nan}}}, errs(series.ErrPolicy)},
		{"bad mask", "StopHz[0]", series.Analysis{Hz: []float64{1}, Spec: &badSpec}, errs(filter.ErrSpec)},
		{"reversed deviation band", "band", series.Analysis{Hz: []float64{1}, Band: &series.Deviation{LoHz: 10, HiHz: 1, DB: 1}}, errs(series.ErrPolicy)},
		{"negative deviation", "Band.DB", series.Analysis{Hz: []float64{1}, Band: &series.Deviation{LoHz: 1, HiHz: 10, DB: -1}}, errs(series.ErrPolicy)},
	} {
		rows = append(rows, badInput{"MonteCarlo: " + c.reason, c.want, c.field, func() error { _, err := c.a.MonteCarlo(ch); return err }})
		if c.reason != "bad mask" && c.reason != "unknown distribution" && !strings.Contains(c.reason, "trials") && !strings.Contains(c.reason, "workers") &&
			!strings.Contains(c.reason, "percentile") && !strings.Contains(c.reason, "slack") && !strings.Contains(c.reason, "deviation") {
			rows = append(rows,
				badInput{"WorstCase: " + c.reason, c.want, c.field, func() error { _, err := c.a.WorstCase(ch); return err }},
				badInput{"Ranking: " + c.reason, c.want, c.field, func() error { _, err := c.a.Ranking(ch); return err }})
		}
	}
	sp, err := series.Analysis{Trials: 20, Hz: []float64{1e3}, Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}.MonteCarlo(ch)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []float64{nan, inf, ninf, 0, 1, -0.5, 1.5} {
		rows = append(rows, badInput{fmt.Sprintf("YieldInterval confidence %g", c), errs(series.ErrPolicy), "confidence",
			func() error { _, _, err := sp.YieldInterval(c); return err }})
	}
	rows = append(rows, badInput{"YieldInterval of no trials", errs(series.ErrPolicy), "trials",
		func() error { _, _, err := (series.Spread{}).YieldInterval(0.95); return err }})
	rows = append(rows, badInput{"WriteCSV failing writer", errs(io.ErrShortWrite), "write CSV",
		func() error { return series.WriteCSV(failWriter{}, nil) }})
	return rows
}

func TestBadInputsLayers(t *testing.T) {
	topo, raw := topologyBadInputs(t)
	for _, c := range []struct {
		name, prefix string
		rows         []badInput
	}{
		{"response", "response: ", responseBadInputs(t)},
		{"topology", "topology: ", topo},
		{"topology-raw", "", raw},
		{"series", "series: ", seriesBadInputs(t)},
	} {
		t.Run(c.name, func(t *testing.T) {
			runBad(t, c.prefix, c.rows)
			t.Logf("%s: %d bad inputs tried", c.name, len(c.rows))
		})
	}
	// Entry points without an error result: no panic on bad values.
	_, _, ch := refDesign(t)
	var b bytes.Buffer
	for _, f := range []float64{nan, inf, ninf, -1, 0, 1e308} {
		noPanic(t, fmt.Sprintf("Sweep at %g Hz", f), func() {
			h, _, _ := refDesign(t)
			_ = response.Sweep(h, []float64{1, f, 10})
			_ = response.Sweep(ch, []float64{1, f, 10})
			_ = response.Sweep(nanSystem{}, []float64{f})
		})
		noPanic(t, fmt.Sprintf("Chain.AtHz(%g)", f), func() { _ = ch.AtHz(f); _ = (topology.Circuit{}).AtHz(f) })
		noPanic(t, fmt.Sprintf("series lookups of %g", f), func() {
			_ = series.E24.Nearest(f)
			_ = series.E24.Below(f)
			_ = series.E24.Above(f)
			_ = series.E24.Range(f, 10)
			b.WriteString(series.FormatValue(f, "Ω") + series.FormatCode(f))
			b.WriteString(series.Format{Digits: 99}.Value(f, "F") + series.Format{Digits: -3}.Code(f))
		})
	}
	noPanic(t, "Sweep of nothing", func() { _ = response.Sweep(ch, nil) })
	noPanic(t, "Designator of odd input", func() { _ = series.Designator(-1, ""); _ = series.Designator(1<<40, "\x00") })
	noPanic(t, "BOM of nothing", func() { _ = series.BOM(nil) })
	for _, st := range []filter.Stage{{}, {Kind: 9, Order: 7, F0Hz: nan, Q: inf}} {
		noPanic(t, fmt.Sprintf("AutoKind(%+v)", st), func() { _ = topology.AutoKind(st) })
	}
	for _, x := range []float64{nan, inf, -1, 0} {
		noPanic(t, fmt.Sprintf("SlewRateVPerUs(%g)", x), func() { _ = topology.SlewRateVPerUs(x, x); _ = topology.SlewRateVPerUs(1, x) })
	}
	for _, c := range []topology.Circuit{{}, {Kind: 77}, {Kind: topology.SallenKey, Parts: []topology.Part{{Ref: "R1", Value: nan}}}} {
		noPanic(t, fmt.Sprintf("methods of malformed %+v", c), func() {
			_ = c.RuleOfThumbGBWHz()
			_ = c.Inverting()
			_ = c.OpAmps()
			_ = c.Values()
			_ = c.AtHzWith(topology.OpAmp{GBWHz: nan}, 1e3)
			_ = c.Kind.String()
		})
	}
	noPanic(t, "String of invalid enums", func() {
		_ = filter.Band(99).String() + filter.StageKind(-3).String() + filter.BesselNorm(7).String() + (filter.Bessel{Norm: 9}).String()
		_ = response.Region(0).String() + series.Distribution(5).String() + series.PartKind(0).String() + (series.Series{}).String()
		_ = (series.Series{}).Tolerance() + float64((series.Series{}).Len())
		_ = (series.Series{}).Mantissas()
		_ = (series.Pair{A: nan, B: -1}).String()
	})
	t.Logf("%d bad inputs tried in this package so far (with -run TestBadInputs: all of filter, response, topology, series)", triedBad.Load())
}
