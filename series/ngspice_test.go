package series

import (
	"bufio"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/ngspice"
	"github.com/rolloff/rolloff/topology"
	"gonum.org/v1/gonum/stat/distuv"
)

// spiceName returns the name topology's WriteSPICE gives part ref of stage
// i (from 0): "R1_s2" for the second stage's R1 (the designator U2.R1).
func spiceName(i int, ref string) string { return ref + "_s" + strconv.Itoa(i+1) }

// ngspiceMonteCarlo runs the deck topology writes for chain in ngspice with
// a .control loop of runs trials: each part altered to nominal·(1 +
// tol/3·sgauss(0)) (Normal: tolerance = 3σ) or nominal·(1 + tol·sunif(0))
// (Uniform: sunif is uniform on [−1, 1], from memory of the ngspice
// manual's description of its random functions), an AC sweep of 10
// points a decade from 100 Hz to 10 kHz, and the gain in dB at the sweep
// points idx echoed. It returns the gains, runs × len(idx), and the
// frequencies of those points as ngspice computed them.
func ngspiceMonteCarlo(t *testing.T, chain topology.Chain, tol map[string]float64, dist Distribution, runs int, idx []int) ([][]float64, []float64) {
	t.Helper()
	var deck strings.Builder
	if err := chain.WriteSPICE(&deck); err != nil {
		t.Fatal(err)
	}
	var c strings.Builder
	c.WriteString("set rndseed=20261201\nlet run = 0\n")
	fmt.Fprintf(&c, "dowhile run < %d\n", runs)
	for i, ci := range chain.Circuits {
		for _, p := range ci.Parts {
			name := spiceName(i, p.Ref)
			if dist == Normal {
				fmt.Fprintf(&c, "let pv = %.15g * (1 + %.15g * sgauss(0))\nalter %s = pv\n", p.Value, tol[Designator(i, p.Ref)]/3, name)
			} else {
				fmt.Fprintf(&c, "let pv = %.15g * (1 + %.15g * sunif(0))\nalter %s = pv\n", p.Value, tol[Designator(i, p.Ref)], name)
			}
		}
	}
	c.WriteString("ac dec 10 100 10k\nlet g = db(v(out))\nlet fr = real(frequency)\n")
	var echo, fecho strings.Builder
	for k, j := range idx {
		fmt.Fprintf(&c, "let g%d = g[%d]\nlet f%d = fr[%d]\n", k, j, k, j)
		fmt.Fprintf(&echo, " $&g%d", k)
		fmt.Fprintf(&fecho, " $&f%d", k)
	}
	fmt.Fprintf(&c, "echo \"mc%s\"\n", echo.String())
	fmt.Fprintf(&c, "if run = 0\necho \"hz%s\"\nend\n", fecho.String())
	c.WriteString("destroy all\nlet run = run + 1\nend\n")
	out, err := ngspice.RunControl(deck.String(), c.String())
	if err != nil {
		t.Fatalf("ngspice: %v\n%s", err, out)
	}
	var gains [][]float64
	var hz []float64
	sc := bufio.NewScanner(strings.NewReader(out))
	for sc.Scan() {
		fs := strings.Fields(sc.Text())
		if len(fs) != len(idx)+1 || (fs[0] != "mc" && fs[0] != "hz") {
			continue
		}
		row := make([]float64, len(idx))
		for k, f := range fs[1:] {
			x, err := strconv.ParseFloat(f, 64)
			if err != nil {
				t.Fatalf("ngspice printed %q", sc.Text())
			}
			row[k] = x
		}
		if fs[0] == "hz" {
			hz = row
		} else {
			gains = append(gains, row)
		}
	}
	if len(gains) != runs || len(hz) != len(idx) {
		t.Fatalf("ngspice gave %d runs (want %d) and %d frequencies:\n%s", len(gains), runs, len(hz), out)
	}
	return gains, hz
}

// meanVar returns the mean and the sample variance of column k.
func meanVar(rows [][]float64, k int) (float64, float64) {
	m, m2 := 0.0, 0.0
	for i, r := range rows {
		d := r[k] - m
		m += d / float64(i+1)
		m2 += d * (r[k] - m)
	}
	return m, m2 / float64(len(rows)-1)
}

// TestMonteCarloAgainstNgspice: the spread of the gain of a small chain
// (a 4th-order Butterworth lowpass at 1 kHz in two Sallen-Key stages, the
// second with a gain of 2; 2 % resistors and 10 % capacitors, normal and
// uniform) is the same in ngspice, simulating the deck topology writes with
// a .control loop of alter commands and sgauss or sunif draws, as in the
// library's Monte Carlo.
//
// Statistics: at each of 4 frequencies a two-sided z test of the means
// (Welch's standard error) and a two-sided F test of the variances (the
// gain in dB is close to normal here: a smooth function of eight small
// independent deviations). Family-wise confidence 99.9 %: Bonferroni over the 8
// tests, each at α = 0.001/8. A negative control checks the test has power:
// the library with 1.5× the tolerances must be rejected.
func TestMonteCarloAgainstNgspice(t *testing.T) {
	ngspice.Required(t)
	st := butterworthStages(filter.LowpassStage, 4, 1e3)
	st[1].Gain = 2
	chain, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	tol := Tolerances{Resistor: 0.02, Capacitor: 0.10, Override: true}
	items, err := Items(chain, E96, E12, tol)
	if err != nil {
		t.Fatal(err)
	}
	tolOf := map[string]float64{}
	for _, it := range items {
		tolOf[it.Ref] = it.Tolerance
	}
	const runs = 400
	idx := []int{5, 8, 10, 12} // 316 Hz, 631 Hz, 1 kHz, 1.58 kHz of the 10-a-decade grid
	for _, dist := range []Distribution{Normal, Uniform} {
		t.Run(dist.String(), func(t *testing.T) { ngspiceCompare(t, chain, tol, tolOf, dist, runs, idx) })
	}
}

func ngspiceCompare(t *testing.T, chain topology.Chain, tol Tolerances, tolOf map[string]float64, dist Distribution, runs int, idx []int) {
	spice, hz := ngspiceMonteCarlo(t, chain, tolOf, dist, runs, idx)
	lib := func(scale float64) Spread {
		a := Analysis{Trials: 20000, Seed: 5, Dist: dist, Hz: hz, Moments: true,
			Tolerances: Tolerances{Resistor: tol.Resistor * scale, Capacitor: tol.Capacitor * scale, Override: true}}
		s, err := a.MonteCarlo(chain)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	const alpha = 0.001 / 8
	zCrit := distuv.UnitNormal.Quantile(1 - alpha/2)
	check := func(s Spread, report bool) (rejected bool) {
		for k := range idx {
			m, v := meanVar(spice, k)
			n2 := float64(s.Trials)
			se := math.Sqrt(v/float64(runs) + s.StdDB[k]*s.StdDB[k]/n2)
			z := (m - s.MeanDB[k]) / se
			f := v / (s.StdDB[k] * s.StdDB[k])
			fd := distuv.F{D1: float64(runs - 1), D2: n2 - 1}
			lo, hi := fd.Quantile(alpha/2), fd.Quantile(1-alpha/2)
			bad := math.Abs(z) > zCrit || f < lo || f > hi
			if report {
				t.Logf("%7.1f Hz: ngspice %.4f ± %.4f dB, library %.4f ± %.4f dB; z = %+.2f (|z| <= %.2f), F = %.3f in [%.3f, %.3f]",
					hz[k], m, math.Sqrt(v), s.MeanDB[k], s.StdDB[k], z, zCrit, f, lo, hi)
			}
			rejected = rejected || bad
		}
		return rejected
	}
	if check(lib(1), true) {
		t.Error("ngspice's Monte Carlo spread differs from the library's at 99.9 % confidence")
	}
	if !check(lib(1.5), false) {
		t.Error("the test cannot tell 1.5× the tolerances apart: no power")
	}
}

// TestWorstCaseCornersInNgspice: the linear worst-case bounds of
// WorstCase are the gains ngspice simulates (on the deck topology writes)
// with every part moved to the end of its tolerance that raises (or lowers)
// the gain at that frequency, to second order in the tolerances: at ±0.5 %
// the neglected terms are below 0.005 dB here.
func TestWorstCaseCornersInNgspice(t *testing.T) {
	ngspice.Required(t)
	st := butterworthStages(filter.LowpassStage, 4, 2e3)
	st[0].Gain = 1.8
	chain, err := topology.Realize(st, topology.Options{})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 0.005
	for _, f := range []float64{1e3, 2e3, 3e3} {
		a := Analysis{Hz: []float64{f}, Tolerances: Tolerances{Resistor: tol, Capacitor: tol}}
		wc, err := a.WorstCase(chain)
		if err != nil {
			t.Fatal(err)
		}
		slopes, err := gainSlopes(chain, []float64{f})
		if err != nil {
			t.Fatal(err)
		}
		for _, dir := range []float64{1, -1} {
			var deck strings.Builder
			k := 0
			corner := topology.Chain{}
			for _, c := range chain.Circuits {
				v := c.Values()
				for m := range v {
					v[m] *= 1 + dir*math.Copysign(tol, slopes[k][0])
					k++
				}
				cc, err := c.WithValues(v)
				if err != nil {
					t.Fatal(err)
				}
				corner.Circuits = append(corner.Circuits, cc)
			}
			if err := corner.WriteSPICE(&deck); err != nil {
				t.Fatal(err)
			}
			sw, err := ngspice.AC(deck.String(), "out", 1, f, 10*f) // points f and 10f
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(sw.Hz[0]/f-1) > 1e-9 {
				t.Fatalf("ngspice's first point %g Hz, want %g Hz", sw.Hz[0], f)
			}
			bound := wc.HighDB[0]
			if dir < 0 {
				bound = wc.LowDB[0]
			}
			t.Logf("%.0f Hz, dir %+.0f: ngspice corner %.5f dB, linear bound %.5f dB", f, dir, sw.GainDB[0], bound)
			if math.Abs(sw.GainDB[0]-bound) > 0.005 {
				t.Errorf("%.0f Hz: ngspice corner %.5f dB, linear bound %.5f dB", f, sw.GainDB[0], bound)
			}
		}
	}
}
