// Command benchcmp measures Rolloff's hot paths and their SciPy
// equivalents in one run on this machine and prints each ratio against the
// performance targets: the design path, the frequency sweep, and the Monte
// Carlo gain evaluation against its arithmetic floor.
//
// Usage, from the module root:
//
//	go run ./internal/benchcmp [-runs 5] [-best 3] [-benchtime 0.5s] [-python /usr/bin/python3] [-no-scipy]
//
// The Go figures are the median over -runs samples, each the fastest of
// -best runs of testing.Benchmark (ns per call); the SciPy figures are the
// median over as many samples of timeit's best of three (scipy_side.py,
// embedded and run with Debian's /usr/bin/python3, which has SciPy 1.10.1).
// The two sides take turns: each round times every Go case once and then
// every SciPy case once, so that a ratio compares samples taken within a
// minute or two of each other; the ratio printed is the median of the
// rounds' ratios, with their range beside it (this machine's speed drifts
// by up to 1.5× over minutes, which moves both sides of a round alike).
// Where Python or SciPy is missing the program says so and prints the Go
// side alone. It is a tool, not a test: the exit status is 0 whether the
// targets pass or not (2 only for a usage error or a failure of the
// library itself).
package main

import (
	_ "embed"
	"encoding/json"
	"flag"
	"fmt"
	"github.com/rolloff/rolloff/internal/mcfloor"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"os"
	"os/exec"
	"runtime"
	"slices"
	"strings"
	"testing"
	"text/tabwriter"
	"time"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
	"gonum.org/v1/gonum/floats"
)

//go:embed scipy_side.py
var scipySide string

// The masks, invented scenarios shared with scipy_side.py: an anti-alias
// lowpass in front of a converter, flat to 20 kHz within 0.5 dB and 50 dB
// down from 25 kHz (elliptic: order 6), and a 40 kHz ultrasonic receiver,
// 36 to 44 kHz within 1 dB and 40 dB down below 28 kHz and above 56 kHz
// (Chebyshev: prototype order 4, 8 poles).
var (
	lowpassMask = filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{20e3}, StopHz: [2]float64{25e3},
		RippleDB: 0.5, AttenDB: 50}
	bandpassMask = filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{36e3, 44e3}, StopHz: [2]float64{28e3, 56e3},
		RippleDB: 1, AttenDB: 40}
)

// Monte Carlo size of the target: 10,000 trials of the 4-stage bandpass
// chain at 200 frequencies.
const (
	mcTrials = 10000
	mcFreqs  = 200
)

type scipyResult struct {
	SciPy, NumPy, Python string
	Orders               map[string]int
	NS                   map[string]float64
	Check                struct {
		Hz     []float64
		GainDB []float64 `json:"gain_db"`
	}
	// rounds holds every round's ns per case (paired with the Go side's
	// samples of the same round); NS is their median.
	rounds []map[string]float64
}

// mergeRounds returns the first round's result with NS the median over
// the rounds and every round's figures kept for the paired ratios.
func mergeRounds(rs []*scipyResult) *scipyResult {
	out := *rs[0]
	out.NS = map[string]float64{}
	for name := range rs[0].NS {
		var x []float64
		for _, r := range rs {
			if v, ok := r.NS[name]; ok {
				x = append(x, v)
			}
		}
		out.NS[name] = median(x)
	}
	for _, r := range rs {
		out.rounds = append(out.rounds, r.NS)
	}
	return &out
}

func main() {
	runs := flag.Int("runs", 5, "repetitions of every measurement; the median is reported")
	benchtime := flag.Duration("benchtime", 500*time.Millisecond, "target time of one Go measurement")
	python := flag.String("python", "/usr/bin/python3", "Python interpreter with SciPy (Debian's python3-scipy)")
	noPython := flag.Bool("no-scipy", false, "skip the SciPy side")
	flag.IntVar(&best, "best", best, "Go runs per sample, the fastest kept (SciPy: best of 3)")
	testing.Init()
	flag.Parse()
	if *runs < 1 || best < 1 {
		fmt.Fprintln(os.Stderr, "benchcmp: -runs and -best must be at least 1")
		os.Exit(2)
	}
	if err := flag.Set("test.benchtime", benchtime.String()); err != nil {
		fmt.Fprintln(os.Stderr, "benchcmp:", err)
		os.Exit(2)
	}
	fmt.Printf("benchcmp: %s %s/%s, %d CPUs, GOMAXPROCS %d; median of %d rounds (Go, then SciPy), each Go sample the best of %d runs of %v (SciPy: best of 3 timeit repeats)\n",
		runtime.Version(), runtime.GOOS, runtime.GOARCH, runtime.NumCPU(), runtime.GOMAXPROCS(0), *runs, best, *benchtime)
	fmt.Printf("load average at start: %s\n", loadAvg())

	var sp *scipyResult
	var spErr error
	if !*noPython {
		spErr = checkSciPy(*python)
		if spErr != nil {
			fmt.Printf("SciPy side will NOT RUN: %v\n", spErr)
		}
	}
	// The SciPy side's round follows the Go side's, never beside it, so the
	// two do not compete for the cores.
	var spRounds []*scipyResult
	afterRound := func(r int) {
		if *noPython || spErr != nil {
			return
		}
		fmt.Fprintf(os.Stderr, "benchcmp: SciPy round %d of %d\n", r+1, *runs)
		res, err := runSciPy(*python, 1)
		if err != nil {
			spErr = err
			return
		}
		spRounds = append(spRounds, res)
	}

	g, err := measureGo(*runs, afterRound)
	if err != nil {
		fmt.Fprintln(os.Stderr, "benchcmp: library failure:", err)
		os.Exit(2)
	}
	if spErr == nil && len(spRounds) > 0 {
		sp = mergeRounds(spRounds)
	}
	fmt.Printf("load average at end:   %s\n\n", loadAvg())
	if *noPython {
		fmt.Println("SciPy side skipped (-no-scipy).")
	} else if spErr != nil {
		fmt.Printf("SciPy side NOT RUN: %v\n", spErr)
		fmt.Printf("(install Debian's python3-scipy for %s; the Go figures follow alone)\n\n", *python)
		sp = nil
	} else {
		fmt.Printf("SciPy %s, NumPy %s, Python %s (%s)\n", sp.SciPy, sp.NumPy, sp.Python, *python)
		for _, c := range []struct {
			name string
			got  int
		}{
			{"elliptic-lowpass", g.orders[0]}, {"chebyshev-bandpass", g.orders[1]},
		} {
			same := "same"
			if sp.Orders[c.name] != c.got {
				same = "DIFFERENT: the design comparison is not like for like"
			}
			fmt.Printf("order of %s: rolloff %d, scipy %d (%s)\n", c.name, c.got, sp.Orders[c.name], same)
		}
		worst := 0.0
		for i, f := range sp.Check.Hz {
			got := 20 * math.Log10(cmplx.Abs(g.swept.AtHz(f)))
			worst = math.Max(worst, math.Abs(got-sp.Check.GainDB[i]))
		}
		fmt.Printf("swept filter: gain at %v Hz within %.2g dB of SciPy's (same filter)\n", sp.Check.Hz, worst)
		fmt.Println()
	}
	printTable(g, sp)
}

// goFigures are the Go side's medians.
type goFigures struct {
	orders []int                // MinOrder of the two masks
	swept  filter.Transfer      // the filter of the sweep cases
	ns     map[string]float64   // ns per call
	allocs map[string]float64   // allocations per call
	rounds map[string][]float64 // ns per call of every round, in order
	// Monte Carlo: ns per (trial × frequency × stage) of the analysis and
	// of the floor, per number of frequencies; total ms of the analysis.
	mcCell, floorCell, prodCell, mcMS map[int]float64
	// scaling figures: name -> size -> ns/op
	scale []scaleRow
}

type scaleRow struct {
	what, unit string
	sizes      []int
	ns         []float64
	per        func(size int) float64 // divisor for the per-unit figure
}

// best is the number of testing.Benchmark runs each sample is the
// fastest of (as timeit's repeat on the SciPy side): a burst of load from
// elsewhere on the machine then spoils one run, not the sample.
var best = 3

// sample returns the fastest ns/op of best runs of f, and its allocs/op.
func sample(f func(b *testing.B)) (ns, allocs float64) {
	ns = math.Inf(1)
	for range best {
		r := testing.Benchmark(f)
		if r.N == 0 {
			return math.NaN(), math.NaN()
		}
		if t := float64(r.T.Nanoseconds()) / float64(r.N); t < ns {
			ns, allocs = t, float64(r.MemAllocs)/float64(r.N)
		}
	}
	return ns, allocs
}

func median(x []float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// designPath is the design path of the target: MinOrder, Design and Stages
// (with the gain plan opt; the default is dynamic-range scaling).
func designPath(f filter.Family, s filter.Spec, opt filter.StageOptions) (int, []filter.Stage, error) {
	n, err := filter.MinOrder(f, s)
	if err != nil {
		return 0, nil, err
	}
	h, err := filter.Design(f, s)
	if err != nil {
		return 0, nil, err
	}
	st, err := h.StagesWith(opt)
	return n, st, err
}

// job is one measurement: its samples are taken round-robin with every
// other job's (see measureGo).
type job struct {
	f          func(b *testing.B)
	ns, allocs []float64
}

func (j *job) median() (ns, allocs float64) { return median(j.ns), median(j.allocs) }

// measureGo registers every Go measurement as a job, then takes the
// samples in rounds, one sample of every job per round, so that a burst of
// load from elsewhere on the machine spoils one sample of many cases (which
// the median discards) rather than all samples of one case. afterRound is
// called after each round (the SciPy side's turn).
func measureGo(runs int, afterRound func(r int)) (*goFigures, error) {
	g := &goFigures{ns: map[string]float64{}, allocs: map[string]float64{}, rounds: map[string][]float64{},
		mcCell: map[int]float64{}, floorCell: map[int]float64{}, prodCell: map[int]float64{}, mcMS: map[int]float64{}}
	var failure error
	fail := func(b *testing.B, err error) {
		failure = err
		b.SkipNow()
	}
	var jobs []*job
	add := func(f func(b *testing.B)) *job {
		j := &job{f: f}
		jobs = append(jobs, j)
		return j
	}
	named := map[string]*job{}
	record := func(name string, f func(b *testing.B)) { named[name] = add(f) }
	type sized struct {
		row  *scaleRow
		size int
		j    *job
	}
	var sizedJobs []sized

	// Design path.
	designs := []struct {
		name string
		fam  filter.Family
		spec filter.Spec
	}{
		{"design/elliptic-lowpass", filter.Elliptic{}, lowpassMask},
		{"design/chebyshev-bandpass", filter.Chebyshev{}, bandpassMask},
	}
	for _, d := range designs {
		n, _, err := designPath(d.fam, d.spec, filter.StageOptions{})
		if err != nil {
			return nil, fmt.Errorf("%s: %w", d.name, err)
		}
		g.orders = append(g.orders, n)
		record(d.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := designPath(d.fam, d.spec, filter.StageOptions{}); err != nil {
					fail(b, err)
				}
			}
		})
		// The same with all gain in the last stage: no peak searches.
		record(d.name+"/gain-last", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := designPath(d.fam, d.spec, filter.StageOptions{Gain: filter.GainLast}); err != nil {
					fail(b, err)
				}
			}
		})
	}

	// Sweep: the filter SciPy's side designs, ellip(6, 0.5, 50, 2π·20 kHz):
	// the order-6 prototype at its passband edge (no slack placed, unlike
	// Design), over a log grid from 1 kHz to 100 kHz.
	proto, err := filter.Elliptic{RippleDB: 0.5, AttenDB: 50}.Prototype(6)
	if err != nil {
		return nil, err
	}
	h, err := proto.ToLowpass(20e3)
	if err != nil {
		return nil, err
	}
	g.swept = h
	sweepRow := &scaleRow{what: "SweepInto, 6th-order elliptic", unit: "point", per: func(n int) float64 { return float64(n) }}
	for _, n := range []int{100, 1000, 10000} {
		hz := floats.LogSpan(make([]float64, n), 1e3, 1e5)
		dst := make([]response.Point, n)
		name := fmt.Sprintf("sweep/gain-phase-delay/%d", n)
		var sys response.System = h // boxed once, as a caller holding a System does
		record(name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				response.SweepInto(dst, sys, hz)
			}
		})
		sizedJobs = append(sizedJobs, sized{sweepRow, n, named[name]})
		if n == 1000 {
			record("sweep/allocating/1000", func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					_ = response.Sweep(h, hz)
				}
			})
		}
	}

	// Scaling with order: AtHz of Butterworth filters and the Chebyshev
	// prototype.
	atRow := &scaleRow{what: "Transfer.AtHz, Butterworth", unit: "pole", per: func(n int) float64 { return float64(n) }}
	protoRow := &scaleRow{what: "Chebyshev.Prototype", unit: "pole", per: func(n int) float64 { return float64(n) }}
	for _, n := range []int{2, 4, 8, 16, 32} {
		bw, err := filter.Butterworth{}.Prototype(n)
		if err != nil {
			return nil, err
		}
		bw, err = bw.ToLowpass(1e3)
		if err != nil {
			return nil, err
		}
		var sink complex128
		sizedJobs = append(sizedJobs, sized{atRow, n, add(func(b *testing.B) {
			f := 1234.5
			for b.Loop() {
				sink += bw.AtHz(f)
			}
		})})
		sizedJobs = append(sizedJobs, sized{protoRow, n, add(func(b *testing.B) {
			for b.Loop() {
				if _, err := (filter.Chebyshev{RippleDB: 1}).Prototype(n); err != nil {
					fail(b, err)
				}
			}
		})})
	}

	// Scaling with order: Stages of Chebyshev bandpass filters (2n poles)
	// and Design of Butterworth masks whose least order is n.
	stagesRow := &scaleRow{what: "Transfer.Stages, Chebyshev bandpass", unit: "pole", per: func(n int) float64 { return float64(n) }}
	designRow := &scaleRow{what: "Design, Butterworth lowpass", unit: "pole", per: func(n int) float64 { return float64(n) }}
	for _, n := range []int{2, 4, 8, 16} {
		p, err := filter.Chebyshev{RippleDB: 1}.Prototype(n)
		if err != nil {
			return nil, err
		}
		bp, err := p.ToBandpass(40e3, 8e3)
		if err != nil {
			return nil, err
		}
		sizedJobs = append(sizedJobs, sized{stagesRow, 2 * n, add(func(b *testing.B) {
			for b.Loop() {
				if _, err := bp.Stages(); err != nil {
					fail(b, err)
				}
			}
		})})
		// A mask whose Butterworth estimate is n − 1/2 (1 dB to 1 kHz,
		// 60 dB from the edge that gives it).
		d := math.Expm1(6*math.Ln10) / math.Expm1(0.1*math.Ln10)
		mask := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1e3},
			StopHz: [2]float64{1e3 * math.Pow(d, 1/(2*(float64(n)-0.5)))}, RippleDB: 1, AttenDB: 60}
		sizedJobs = append(sizedJobs, sized{designRow, n, add(func(b *testing.B) {
			for b.Loop() {
				if _, err := filter.Design(filter.Butterworth{}, mask); err != nil {
					fail(b, err)
				}
			}
		})})
	}

	// Monte Carlo and its floors.
	chain, err := bandpassChain()
	if err != nil {
		return nil, err
	}
	coef, err := trialCoefficients(chain, mcTrials)
	if err != nil {
		return nil, err
	}
	stages := len(chain.Circuits)
	mcRow := &scaleRow{what: fmt.Sprintf("MonteCarlo, %d trials × %d stages", mcTrials, stages), unit: "cell",
		per: func(nf int) float64 { return float64(mcTrials * nf * stages) }}
	type mcJobs struct {
		nf               int
		floor, prod, ana *job
	}
	var mcs []mcJobs
	for _, nf := range []int{50, mcFreqs, 800} {
		hz := floats.LogSpan(make([]float64, nf), 10e3, 160e3)
		w2 := make([]float64, nf)
		for j, f := range hz {
			w := 2 * math.Pi * f
			w2[j] = w * w
		}
		a := series.Analysis{Trials: mcTrials, Seed: 7, Hz: hz, Spec: &bandpassMask,
			Tolerances: series.Tolerances{Resistor: 0.01, Capacitor: 0.05}}
		// The floors count the trials whose power is positive everywhere
		// (the analysis checks its mask per trial too).
		lo, hi := make([]float64, nf), make([]float64, nf)
		for j := range lo {
			lo[j], hi[j] = math.SmallestNonzeroFloat64, math.Inf(1)
		}
		m := mcJobs{nf: nf}
		m.floor = add(func(b *testing.B) {
			for b.Loop() {
				mcfloor.Power(coef, stages, w2, lo, hi, runtime.GOMAXPROCS(0))
			}
		})
		m.prod = add(func(b *testing.B) {
			for b.Loop() {
				mcfloor.Products(coef, stages, w2, lo, hi, runtime.GOMAXPROCS(0))
			}
		})
		m.ana = add(func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := a.MonteCarlo(chain); err != nil {
					fail(b, err)
				}
			}
		})
		mcs = append(mcs, m)
	}

	for r := range runs {
		fmt.Fprintf(os.Stderr, "benchcmp: Go round %d of %d (%d cases)\n", r+1, runs, len(jobs))
		for _, j := range jobs {
			x, y := sample(j.f)
			if failure != nil {
				return nil, failure
			}
			j.ns, j.allocs = append(j.ns, x), append(j.allocs, y)
		}
		afterRound(r)
	}

	for name, j := range named {
		g.ns[name], g.allocs[name] = j.median()
		g.rounds[name] = j.ns
	}
	for _, sj := range sizedJobs {
		ns, _ := sj.j.median()
		sj.row.sizes, sj.row.ns = append(sj.row.sizes, sj.size), append(sj.row.ns, ns)
	}
	for _, m := range mcs {
		cells := float64(mcTrials * m.nf * stages)
		fl, _ := m.floor.median()
		pr, _ := m.prod.median()
		an, _ := m.ana.median()
		g.floorCell[m.nf], g.prodCell[m.nf], g.mcCell[m.nf], g.mcMS[m.nf] = fl/cells, pr/cells, an/cells, an/1e6
		mcRow.sizes, mcRow.ns = append(mcRow.sizes, m.nf), append(mcRow.ns, an)
	}
	g.scale = []scaleRow{*protoRow, *designRow, *stagesRow, *atRow, *sweepRow, *mcRow}
	return g, nil
}

// bandpassChain realizes the Chebyshev bandpass design: four
// multiple-feedback stages.
func bandpassChain() (topology.Chain, error) {
	h, err := filter.Design(filter.Chebyshev{}, bandpassMask)
	if err != nil {
		return topology.Chain{}, err
	}
	st, err := h.Stages()
	if err != nil {
		return topology.Chain{}, err
	}
	return topology.Realize(st, topology.Options{})
}

// biquad is one stage's coefficients, H(s) = (n0 + n1·s + n2·s²) /
// (d0 + d1·s + d2·s²).
type biquad = mcfloor.Biquad

// trialCoefficients draws trials sets of part values (uniform within 1 %
// for resistors, 5 % for capacitors, as the analysis is given) and returns
// each stage's coefficients from topology's Evaluator, trials × stages:
// the precomputed input of the floor.
func trialCoefficients(chain topology.Chain, trials int) ([]biquad, error) {
	rng := rand.New(rand.NewPCG(1, 2))
	var evs []*topology.Evaluator
	for _, c := range chain.Circuits {
		ev, err := c.NewEvaluator()
		if err != nil {
			return nil, err
		}
		evs = append(evs, ev)
	}
	out := make([]biquad, 0, trials*len(evs))
	for range trials {
		for k, c := range chain.Circuits {
			v := make([]float64, len(c.Parts))
			for i, p := range c.Parts {
				tol := 0.01
				if strings.HasPrefix(p.Ref, "C") {
					tol = 0.05
				}
				v[i] = p.Value * (1 + tol*(2*rng.Float64()-1))
			}
			b, err := evs[k].Eval(v)
			if err != nil {
				return nil, err
			}
			out = append(out, biquad{N0: b.Num[0], N1: b.Num[1], N2: b.Num[2], D0: b.Den[0], D1: b.Den[1], D2: b.Den[2]})
		}
	}
	return out, nil
}

// checkSciPy reports whether python exists and imports scipy.signal.
func checkSciPy(python string) error {
	if _, err := os.Stat(python); err != nil {
		return fmt.Errorf("%s not found: %w", python, err)
	}
	if out, err := exec.Command(python, "-c", "import scipy.signal").CombinedOutput(); err != nil {
		return fmt.Errorf("%s cannot import scipy.signal: %v: %s", python, err, strings.TrimSpace(string(out)))
	}
	return nil
}

// runSciPy runs the embedded scipy_side.py and decodes its JSON.
func runSciPy(python string, runs int) (*scipyResult, error) {
	cmd := exec.Command(python, "-", fmt.Sprint(runs))
	cmd.Stdin = strings.NewReader(scipySide)
	cmd.Stderr = os.Stderr
	out, err := cmd.Output()
	if err != nil {
		return nil, fmt.Errorf("scipy_side.py: %w", err)
	}
	var r scipyResult
	if err := json.Unmarshal(out, &r); err != nil {
		return nil, fmt.Errorf("scipy_side.py output: %w", err)
	}
	return &r, nil
}

// pairedRatio returns the median, least and greatest over the rounds of
// the SciPy case's time over the Go case's (goNS, one sample a round).
func pairedRatio(sp *scipyResult, scipyName string, goNS []float64) (mid, lo, hi float64) {
	var rs []float64
	for i, r := range sp.rounds {
		if v, ok := r[scipyName]; ok && i < len(goNS) {
			rs = append(rs, v/goNS[i])
		}
	}
	if len(rs) == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	return median(rs), slices.Min(rs), slices.Max(rs)
}

func loadAvg() string {
	b, err := os.ReadFile("/proc/loadavg")
	if err != nil {
		return "unknown"
	}
	f := strings.Fields(string(b))
	if len(f) < 3 {
		return "unknown"
	}
	return strings.Join(f[:3], " ") + " (1, 5, 15 min)"
}

func verdict(ok bool) string {
	if ok {
		return "PASS"
	}
	return "FAIL"
}

func printTable(g *goFigures, sp *scipyResult) {
	tw := tabwriter.NewWriter(os.Stdout, 2, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(os.Stdout, "Side by side (ratio = scipy time / rolloff time: how many times faster rolloff is)")
	fmt.Fprintln(tw, "case\trolloff ns/op\tallocs/op\tscipy case\tscipy ns/op\tratio\trounds' range\ttarget\tresult\t")
	row := func(name, scipyName string, target float64) {
		ns := g.ns[name]
		sns, ratio, span, res, tgt := "-", "-", "-", "-", "-"
		if target > 0 {
			tgt = fmt.Sprintf(">= %gx", target)
		}
		if sp != nil {
			if v, ok := sp.NS[scipyName]; ok {
				sns = fmt.Sprintf("%.0f", v)
				mid, lo, hi := pairedRatio(sp, scipyName, g.rounds[name])
				ratio = fmt.Sprintf("%.1fx", mid)
				span = fmt.Sprintf("%.1f-%.1fx", lo, hi)
				if target > 0 {
					res = verdict(mid >= target)
				}
			}
		} else if target > 0 {
			res = "no scipy"
		}
		fmt.Fprintf(tw, "%s\t%.0f\t%.0f\t%s\t%s\t%s\t%s\t%s\t%s\t\n", name, ns, g.allocs[name], scipyName, sns, ratio, span, tgt, res)
	}
	row("design/elliptic-lowpass", "design/elliptic-lowpass", 200)
	row("design/chebyshev-bandpass", "design/chebyshev-bandpass", 200)
	row("design/elliptic-lowpass/gain-last", "design/elliptic-lowpass", 0)
	row("design/chebyshev-bandpass/gain-last", "design/chebyshev-bandpass", 0)
	row("sweep/gain-phase-delay/1000", "sweep/gain-phase/1000", 2)
	row("sweep/gain-phase-delay/1000", "sweep/gain-phase-delay/1000", 2)
	row("sweep/allocating/1000", "sweep/gain-phase/1000", 0)
	row("sweep/gain-phase-delay/100", "sweep/gain-phase/100", 0)
	row("sweep/gain-phase-delay/100", "sweep/gain-phase-delay/100", 0)
	row("sweep/gain-phase-delay/10000", "sweep/gain-phase/10000", 0)
	row("sweep/gain-phase-delay/10000", "sweep/gain-phase-delay/10000", 0)
	tw.Flush()
	fmt.Println(`
  design: rolloff MinOrder + Design + Stages (verified least order, stage table with
          dynamic-range gain scaling; gain-last: StagesWith GainLast, no peak searches);
          scipy ellipord/cheb1ord + ellip/cheby1(analog, zpk) + zpk2sos(analog).
  sweep:  rolloff SweepInto: gain dB, unwrapped phase, exact group delay, into a reused slice
          (sweep/allocating: Sweep, a new slice per call); scipy freqs_zpk + 20·log10|H| +
          unwrap(angle H), and in the gain-phase-delay case also −gradient(phase, ω)
          (a finite-difference delay). Same filter: ellip(6, 0.5, 50) at 20 kHz, log grid 1-100 kHz.`)

	fmt.Println()
	fmt.Printf("Monte Carlo gain evaluation against its arithmetic floor (%d trials of the 4-stage bandpass chain, %d cores)\n",
		mcTrials, runtime.GOMAXPROCS(0))
	tw = tabwriter.NewWriter(os.Stdout, 2, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "frequencies\tanalysis ms\tanalysis ns/cell\tfloor ns/cell\tanalysis/floor\ttarget\tresult\tproduct floor ns/cell\tanalysis/product floor\t")
	for _, nf := range []int{50, mcFreqs, 800} {
		r := g.mcCell[nf] / g.floorCell[nf]
		tgt, res := "-", "-"
		if nf == mcFreqs {
			tgt = "<= 2x, < 50 ms"
			res = verdict(r <= 2 && g.mcMS[nf] < 50)
		}
		fmt.Fprintf(tw, "%d\t%.1f\t%.3f\t%.3f\t%.2fx\t%s\t%s\t%.3f\t%.2fx\t\n", nf, g.mcMS[nf], g.mcCell[nf], g.floorCell[nf], r, tgt, res,
			g.prodCell[nf], g.mcCell[nf]/g.prodCell[nf])
	}
	tw.Flush()
	fmt.Println(`
  cell = one (trial × frequency × stage). analysis: series.Analysis.MonteCarlo with the mask's yield
  (parts drawn per trial, each stage's coefficients from its circuit by topology's Evaluator, |H|²
  in real arithmetic); floor: the same |H|² product from coefficients computed beforehand, one
  division per cell (the formula of the target); product floor: the division-free form (numerator
  and denominator products, which is how the analysis evaluates), the tightest plain loop.`)

	fmt.Println()
	fmt.Println("Scaling (cost per unit should stay flat as the size grows)")
	tw = tabwriter.NewWriter(os.Stdout, 2, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "path\tsize\tns/op\tns/unit\tunit\t")
	for _, s := range g.scale {
		for i, n := range s.sizes {
			fmt.Fprintf(tw, "%s\t%d\t%.0f\t%.3f\t%s\t\n", s.what, n, s.ns[i], s.ns[i]/s.per(n), s.unit)
		}
	}
	tw.Flush()
}
