// Command sweep tries every combination of approximation family, circuit
// kind and part policy on one mask, concurrently, and prints them as one
// table, best first.
//
// Its built-in demo is the band filter of the Sonde-12, an invented
// listener clamped to water mains that picks up the hiss of leaks: the
// leak noise it wants lies between 2 and 8 kHz (flat within 1.5 dB); pump
// hum and its low harmonics below 500 Hz, and the ultrasonic chatter of
// the valve actuators above 32 kHz, must be 40 dB down.
//
// Every combination runs the whole design pipeline (least order, stages,
// circuits, snapping, op-amp gain-bandwidth, Monte Carlo yield) on a
// bounded pool of workers; the table's order depends only on the results,
// never on which worker finished first. Ranking rule, best first: higher
// Monte Carlo yield (to 0.1 %), then fewer op-amps, then fewer parts, then
// less passband deviation after snapping, then lower gain-bandwidth
// needed, then the order of the flags' lists. Combinations that cannot be
// built (a circuit kind that does not realize a stage, parts out of range)
// are listed after, with the reason.
//
// Usage:
//
//	go run ./examples/sweep
//	go run ./examples/sweep -in mask.json -families butterworth,elliptic \
//	    -kinds auto,multiple-feedback -parts E96:1/E12:2,E24:1/E6:5 -trials 2000
//
// A part policy is RSERIES[:TOL]/CSERIES[:TOL], tolerances in percent
// (absent: the series' customary tolerance).
package main

import (
	_ "embed"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime"
	"strconv"
	"strings"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

//go:embed demo.json
var demo []byte

func main() {
	if err := run(os.Args[1:], os.Stdout, os.Stderr); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return // -h: the usage was printed
		}
		fmt.Fprintln(os.Stderr, "sweep:", err)
		os.Exit(1)
	}
}

// partPolicy is one resistor/capacitor choice of the sweep.
type partPolicy struct {
	label          string
	res, cap       string
	resTol, capTol float64 // percent; 0: the series' customary
}

// parsePolicies reads "E96:1/E12:2,E24/E6".
func parsePolicies(s string) ([]partPolicy, error) {
	var out []partPolicy
	for _, item := range strings.Split(s, ",") {
		item = strings.TrimSpace(item)
		rs, cs, ok := strings.Cut(item, "/")
		if !ok {
			return nil, fmt.Errorf("-parts %q: want RSERIES[:TOL]/CSERIES[:TOL], e.g. E96:1/E12:2", item)
		}
		p := partPolicy{label: item}
		var err error
		if p.res, p.resTol, err = seriesTol(rs); err != nil {
			return nil, fmt.Errorf("-parts %q: %w", item, err)
		}
		if p.cap, p.capTol, err = seriesTol(cs); err != nil {
			return nil, fmt.Errorf("-parts %q: %w", item, err)
		}
		out = append(out, p)
	}
	return out, nil
}

func seriesTol(s string) (string, float64, error) {
	name, tol, has := strings.Cut(s, ":")
	if !has {
		return name, 0, nil
	}
	t, err := strconv.ParseFloat(tol, 64)
	if err != nil || !(t > 0) {
		return "", 0, fmt.Errorf("tolerance %q: want a positive percentage", tol)
	}
	return name, t, nil
}

func list(s string) []string {
	var out []string
	for _, x := range strings.Split(s, ",") {
		if x = strings.TrimSpace(x); x != "" {
			out = append(out, x)
		}
	}
	return out
}

func run(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("sweep", flag.ContinueOnError)
	fs.SetOutput(stderr)
	in := fs.String("in", "", "request JSON file with the mask (see pipeline.Request); empty: the built-in Sonde-12 demo")
	families := fs.String("families", strings.Join(pipeline.FamilyNames, ","), "families to try, comma-separated")
	kinds := fs.String("kinds", "auto,sallen-key,sallen-key-equal,multiple-feedback,state-variable,tow-thomas", "circuit kinds for the second-order stages, comma-separated")
	parts := fs.String("parts", "E24:1/E6:5,E96:1/E12:2,E192:0.5/E24:1", "part policies RSERIES[:TOL%]/CSERIES[:TOL%], comma-separated")
	trials := fs.Int("trials", 500, "Monte Carlo trials per combination")
	workers := fs.Int("workers", runtime.GOMAXPROCS(0), "combinations designed at once")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: sweep [-in mask.json] [-families list] [-kinds list] [-parts list] [-trials n] [-workers n]")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("unexpected argument %q (the mask goes in -in)", fs.Arg(0))
	}
	if *workers < 1 {
		return fmt.Errorf("-workers %d: want at least 1", *workers)
	}
	if *trials < 1 || *trials > pipeline.MaxTrials {
		return fmt.Errorf("-trials %d: want 1 to %d", *trials, pipeline.MaxTrials)
	}
	src := demo
	if *in != "" {
		var err error
		if src, err = os.ReadFile(*in); err != nil {
			return fmt.Errorf("reading the request: %w", err)
		}
	}
	base, err := pipeline.DecodeRequestBytes(src)
	if err != nil {
		return err
	}
	base.Trials = *trials
	pols, err := parsePolicies(*parts)
	if err != nil {
		return err
	}
	var jobs []job
	for _, fam := range list(*families) {
		for _, k := range list(*kinds) {
			for _, p := range pols {
				req := base
				req.Kind, req.ResistorSeries, req.CapacitorSeries = k, p.res, p.cap
				req.ResistorTolPct, req.CapacitorTolPct = p.resTol, p.capTol
				// Check every combination before running any: a typo in a
				// flag is a usage error, not a row of failures.
				if _, err := withFamily(req, fam).Resolve(); err != nil {
					return fmt.Errorf("family %s, kind %s, parts %s: %w", fam, k, p.label, err)
				}
				jobs = append(jobs, job{family: fam, kind: k, parts: p.label, req: req})
			}
		}
	}
	if len(jobs) == 0 {
		return errors.New("nothing to sweep: -families, -kinds and -parts must each name at least one")
	}
	rows := sweep(jobs, *workers)
	return printTable(stdout, base, rows)
}

func withFamily(r pipeline.Request, fam string) pipeline.Request {
	r.Families = []string{fam}
	return r
}
