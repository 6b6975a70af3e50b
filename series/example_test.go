package series_test

import (
	"fmt"
	"math"
	"os"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

func ExampleSeries_Nearest() {
	// A bias resistor computed as 15.83 kΩ, a timing capacitor as 5.3 nF.
	fmt.Println(series.FormatValue(series.E96.Nearest(15.83e3), "Ω"))
	fmt.Println(series.FormatValue(series.E12.Nearest(5.3e-9), "F"))
	fmt.Println(series.FormatValue(series.E12.Below(4.7e3), "Ω"), series.FormatValue(series.E12.Above(4.7e3), "Ω"))
	fmt.Println(math.IsNaN(series.E24.Nearest(-1)))
	// Output:
	// 15.8 kΩ
	// 5.6 nF
	// 3.9 kΩ 5.6 kΩ
	// true
}

func ExampleSeries_Range() {
	for _, v := range series.E6.Range(1e3, 1e4) {
		fmt.Print(series.FormatCode(v), " ")
	}
	fmt.Println()
	// Output:
	// 1K0 1K5 2K2 3K3 4K7 6K8 10K
}

func ExampleParseValue() {
	for _, s := range []string{"4k7", "2.2 kΩ", "100n", "4.7 µF", "R47", "p68", "12 apples"} {
		v, err := series.ParseValue(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-7s %g\n", s, v)
	}
	// Output:
	// 4k7     4700
	// 2.2 kΩ  2200
	// 100n    1e-07
	// 4.7 µF  4.7e-06
	// R47     0.47
	// p68     6.8e-13
	// series: parse value "12 apples": unexpected "apples": series: invalid syntax
}

func ExampleFormatCode() {
	fmt.Println(series.FormatCode(4.7e3), series.FormatCode(2.2), series.FormatCode(0.47), series.FormatCode(100e-9))
	fmt.Println(series.Format{Digits: 4}.Value(12.34e3, "Ω"))
	// Output:
	// 4K7 2R2 R47 100n
	// 12.34 kΩ
}

// A 6th-order Butterworth lowpass at 3.4 kHz for a telemetry channel of our
// own invention, realized as three Sallen-Key stages and snapped to E96
// resistors and E12 capacitors.
func ExampleSnap() {
	var stages []filter.Stage
	for _, q := range []float64{0.5176, 0.7071, 1.9319} { // Butterworth Qs of order 6
		stages = append(stages, filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 3400, Q: q, Gain: 1})
	}
	chain, err := topology.Realize(stages, topology.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := series.Snap(chain, series.Policy{
		Resistors: series.E96, Capacitors: series.E12,
		Passband: []series.Band{{LoHz: 34, HiHz: 3400}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, st := range res.Stages {
		fmt.Printf("stage %d: f0 %+.2f %%, Q %+.2f %%\n", i+1, 100*st.F0Err, 100*st.QErr)
	}
	fmt.Printf("worst passband deviation %.3f dB (each part rounded on its own: %.3f dB)\n", res.WorstDB, res.RoundedDB)
	fmt.Println(len(res.Items), "parts on", len(series.BOM(res.Items)), "BOM lines")
	// Output:
	// stage 1: f0 -0.65 %, Q +1.19 %
	// stage 2: f0 -0.89 %, Q +0.79 %
	// stage 3: f0 +0.42 %, Q -0.70 %
	// worst passband deviation 0.042 dB (each part rounded on its own: 0.150 dB)
	// 12 parts on 10 BOM lines
}

// The bill of materials of a small chain, as CSV.
func ExampleWriteCSV() {
	chain := topology.Chain{Circuits: []topology.Circuit{
		{Kind: topology.SallenKey, Parts: []topology.Part{
			{Ref: "R1", Value: 10e3}, {Ref: "R2", Value: 10e3}, {Ref: "C1", Value: 22e-9}, {Ref: "C2", Value: 10e-9}}},
		{Kind: topology.RCFollower, Parts: []topology.Part{{Ref: "R1", Value: 10e3}, {Ref: "C1", Value: 10e-9}}},
	}}
	items, err := series.Items(chain, series.E24, series.E6, series.Tolerances{Resistor: 0.01})
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := series.WriteCSV(os.Stdout, series.BOM(items)); err != nil {
		fmt.Println(err)
	}
	// Output:
	// kind,value,display,code,series,tolerance,count,refs
	// resistor,10000,10 kΩ,10K,E24,1,3,"U1.R1, U1.R2, U2.R1"
	// capacitor,1e-08,10 nF,10n,E6,20,2,"U1.C2, U2.C1"
	// capacitor,2.2e-08,22 nF,22n,E6,20,1,U1.C1
}

// The yield of the snapped telemetry filter against its mask with 1 %
// resistors and 5 % capacitors, and the parts that matter most.
func ExampleAnalysis_MonteCarlo() {
	var stages []filter.Stage
	for _, q := range []float64{0.5176, 0.7071, 1.9319} {
		stages = append(stages, filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 3400, Q: q, Gain: 1})
	}
	chain, _ := topology.Realize(stages, topology.Options{})
	res, _ := series.Snap(chain, series.Policy{Passband: []series.Band{{LoHz: 34, HiHz: 3400}}})
	hz := make([]float64, 100)
	for i := range hz {
		hz[i] = 100 * math.Pow(100, float64(i)/99) // 100 Hz to 10 kHz
	}
	a := series.Analysis{
		Trials: 4000, Seed: 1, Hz: hz,
		Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05},
		Spec: &filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{2000}, StopHz: [2]float64{8000},
			RippleDB: 0.5, AttenDB: 40},
		SlackDB:     0.25, // allow 0.25 dB above the design's passband maximum
		Percentiles: []float64{1, 99},
	}
	s, err := a.MonteCarlo(res.Chain)
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi, _ := s.YieldInterval(0.95)
	fmt.Printf("yield %.0f %% (95 %% interval %.0f %% to %.0f %%)\n", 100*s.Yield, 100*lo, 100*hi)
	rank, _ := a.Ranking(res.Chain)
	fmt.Println("most influential:", rank[0].Ref)
	// Output:
	// yield 83 % (95 % interval 81 % to 84 %)
	// most influential: U3.C2
}

// The linear worst case of one Sallen-Key stage of a sensor filter of our
// own invention (f0 500 Hz, Q 0.707) with 1 % resistors and 5 % capacitors,
// and the part that matters most at the corner.
func ExampleAnalysis_WorstCase() {
	st := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 500, Q: 0.7071, Gain: 1}
	chain, err := topology.Realize([]filter.Stage{st}, topology.Options{Kind: topology.SallenKey})
	if err != nil {
		fmt.Println(err)
		return
	}
	a := series.Analysis{Hz: []float64{500}, Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}
	wc, err := a.WorstCase(chain)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("f0 within ±%.1f %%, Q within ±%.1f %%\n", 100*wc.Stages[0].F0, 100*wc.Stages[0].Q)
	fmt.Printf("gain at 500 Hz: %.2f dB to %.2f dB\n", wc.LowDB[0], wc.HighDB[0])
	rank, _ := a.Ranking(chain)
	fmt.Printf("largest share: %s (%.0f %%)\n", rank[0].Ref, 100*rank[0].Share)
	// Output:
	// f0 within ±6.0 %, Q within ±5.6 %
	// gain at 500 Hz: -3.53 dB to -2.49 dB
	// largest share: U1.C2 (97 %)
}
