package series

import (
	"fmt"
	"testing"
	"time"
)

func BenchmarkNearest(b *testing.B) {
	for _, s := range []Series{E12, E96, E192} {
		b.Run(s.String(), func(b *testing.B) {
			b.ReportAllocs()
			v := 1234.5
			for b.Loop() {
				v = s.Nearest(v*1.37) + 1
				if v > 1e9 {
					v = 1.1
				}
			}
		})
	}
}

func BenchmarkParseValue(b *testing.B) {
	for _, in := range []string{"4k7", "15.8 kΩ", "1e-9"} {
		b.Run(in, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := ParseValue(in); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkSnap snaps the 4-stage (8th-order Butterworth) anti-alias chain.
func BenchmarkSnap(b *testing.B) {
	ch := antiAlias(b)
	for _, p := range []Policy{
		{Resistors: E96, Capacitors: E12, Passband: antiAliasBand},
		{Resistors: E24, Capacitors: E6, Pairs: true, Passband: antiAliasBand},
		{Resistors: E96, Capacitors: E12, CapRadius: 1, Passband: antiAliasBand},
	} {
		b.Run(fmt.Sprintf("%v-%v-pairs=%v-capradius=%d", p.Resistors, p.Capacitors, p.Pairs, p.CapRadius), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Snap(ch, p); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkMonteCarlo is the performance target: 10,000 trials of a
// 4-stage chain at 200 frequencies, gain only (yield against a mask), on all
// cores. It reports trials per second and ns per trial × frequency × stage.
func BenchmarkMonteCarlo(b *testing.B) {
	ch := antiAlias(b)
	spec := butterworthSpec(8, 20e3, 0.8, 2.2)
	for _, trials := range []int{1000, 10000} {
		b.Run(fmt.Sprint(trials), func(b *testing.B) {
			a := Analysis{Trials: trials, Hz: logGrid(100, 100e3, 200), Spec: &spec,
				Tolerances: Tolerances{Resistor: 0.01, Capacitor: 0.05}}
			b.ReportAllocs()
			start := time.Now()
			for b.Loop() {
				if _, err := a.MonteCarlo(ch); err != nil {
					b.Fatal(err)
				}
			}
			per := time.Since(start).Seconds() / float64(b.N)
			b.ReportMetric(float64(trials)/per, "trials/s")
			b.ReportMetric(per*1e9/float64(trials*200*len(ch.Circuits)), "ns/trial·freq·stage")
		})
	}
}
