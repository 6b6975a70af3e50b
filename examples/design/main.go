// Command design takes a filter mask to a buildable, checked op-amp chain,
// the main path of Rolloff end to end.
//
// Its built-in demo is the anti-alias filter of the Tremor-3, an invented
// vibration logger strapped to bridge piers: a MEMS accelerometer feeds a
// 16-bit SAR converter sampling at 5 kS/s. The band of interest is 0 to
// 1 kHz (flat within 2 dB; the firmware calibrates the level). Anything at
// or above 4 kHz would fold back into that band (5 kS/s − 1 kHz), so it
// must be 70 dB down there; what lies between 2.5 and 4 kHz folds above
// 1 kHz, where the firmware's digital filter removes it.
//
// It tries every approximation family on the mask, picks one by a stated
// rule, prints the stage table, the circuit of each stage with E-series
// parts, the deviation after snapping, the op-amp gain-bandwidth each
// stage needs and the Monte Carlo yield, and writes into an output folder:
// the JSON result document (design.json), the bill of materials
// (design-bom.csv), the SPICE deck (design.cir) and plots: bode.png (and
// bode.svg) with gain and phase of the design and of the snapped parts
// against the mask, delay.png (group delay), step.png (step response),
// noise.png (the output noise density, in total and per stage) and
// montecarlo.png (the Monte Carlo gain envelope against the mask, with a
// passband detail).
//
// Usage:
//
//	go run ./examples/design                    # the built-in demo
//	go run ./examples/design -in mask.json -out build/filter
//	go run ./examples/design -in - < mask.json  # request from standard input
//
// The request document is described by pipeline.Request: a "mask"
// (filter.Spec's JSON) and optional policy fields (families, kind,
// resistor_series, capacitor_series, tolerances, trials, seed, margin_db,
// min_yield_pct, amp_noise_nv, amp_noise_pa). Flags -trials and -seed override the document's.
//
// Caution: verify the output by simulation and on the bench;
// mains-powered or medical equipment needs qualified review under local
// codes.
package main

import (
	_ "embed"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

//go:embed demo.json
var demo []byte

// defaultOut is the output folder under the current directory.
const defaultOut = "rolloff-design"

func main() {
	if err := run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return // -h: the usage was printed
		}
		fmt.Fprintln(os.Stderr, "design:", err)
		os.Exit(1)
	}
}

// run is the whole command: parse args, design, print the report to
// stdout, write the files. Errors are returned, not printed.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("design", flag.ContinueOnError)
	fs.SetOutput(stderr)
	in := fs.String("in", "", "request JSON file (\"-\" for standard input); empty: the built-in Tremor-3 demo")
	out := fs.String("out", defaultOut, "output folder for the document, BOM, SPICE deck and plots (created if missing)")
	trials := fs.Int("trials", 0, "Monte Carlo trials (0: the request's, else its default)")
	seed := fs.Uint64("seed", 0, "Monte Carlo seed (0: the request's, else 1)")
	noPlots := fs.Bool("noplots", false, "do not render the plots")
	vpeak := fs.Float64("vpeak", 2.5, "peak signal amplitude in volts, for the slew rate the op-amps need")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: design [-in request.json] [-out folder] [-trials n] [-seed n] [-vpeak volts] [-noplots]")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("unexpected argument %q (the request goes in -in)", fs.Arg(0))
	}
	if !(*vpeak > 0) || math.IsInf(*vpeak, 0) {
		return fmt.Errorf("-vpeak %g: want a positive amplitude in volts", *vpeak)
	}
	if *trials < 0 {
		return fmt.Errorf("-trials %d: want a positive count", *trials)
	}
	var src []byte
	var err error
	switch *in {
	case "":
		src = demo
	case "-":
		src, err = io.ReadAll(stdin)
	default:
		src, err = os.ReadFile(*in)
	}
	if err != nil {
		return fmt.Errorf("reading the request: %w", err)
	}
	req, err := pipeline.DecodeRequestBytes(src)
	if err != nil {
		return err
	}
	if *trials > 0 {
		req.Trials = *trials
	}
	if *seed > 0 {
		req.Seed = *seed
	}
	res, err := pipeline.Run(req)
	if err != nil {
		return err
	}
	dir, err := filepath.Abs(*out)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	files, err := pipeline.WriteFiles(dir, "design", res)
	if err != nil {
		return err
	}
	written := []string{files.JSON, files.BOM, files.SPICE}
	if !*noPlots {
		pngs, err := writePlots(dir, res)
		if err != nil {
			return err
		}
		written = append(written, pngs...)
	}
	return report(stdout, res, *vpeak, dir, written)
}
