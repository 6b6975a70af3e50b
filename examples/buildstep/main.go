// Command buildstep turns a board's list of filter channels into generated
// design files, the same bytes on every run, for a firmware or board build
// to run as a step:
//
// Its built-in demo (board.json, embedded) is the Orca-4, an invented
// ocean-bottom seismometer whose analog front board has three channels: a
// geophone anti-alias lowpass, a hydrophone highpass that keeps tides and
// microseisms out (with E6 capacitors: film parts of a microfarad and more
// are stocked in E6 values), and a slow tilt-meter lowpass that must step without
// ringing, so Bessel only.
//
// The board file holds "board" (a title), "defaults" (any fields of a
// pipeline.Request but the mask: part series, tolerances, trials, seed...)
// and "channels", each a pipeline.Request with a "name" (lower case
// letters, digits, - and _; it names the files) and a "mask"; a channel's
// fields override the defaults. For each channel it writes NAME.json (the
// result document), NAME-bom.csv and NAME.cir (the SPICE deck of the
// snapped chain); for the board, board-bom.csv (every channel's parts,
// designators prefixed "NAME/") and manifest.json (what was generated,
// per channel its family, order, yield and files).
//
// Determinism: no timestamps, no host names, no map iteration; channels in
// file order; the Monte Carlo runs seeded. Files that an earlier run listed
// in manifest.json and this run no longer generates are removed, so the
// folder holds exactly this board's files.
//
// Usage:
//
//	go run ./examples/buildstep                       # the demo board into ./gen
//	go run ./examples/buildstep -in board.json -out gen
//
// Caution: verify generated designs by simulation and on the bench;
// mains-powered or medical equipment needs qualified review under local
// codes.
//
//go:generate go run github.com/rolloff/rolloff/examples/buildstep -in board.json -out gen
package main

import (
	"bytes"
	_ "embed"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/series"
)

//go:embed board.json
var demoBoard []byte

// ManifestVersion is the version of manifest.json's layout.
const ManifestVersion = "rolloff.board/v1"

func main() {
	if err := run(os.Args[1:], os.Stdout, os.Stderr); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return // -h: the usage was printed
		}
		fmt.Fprintln(os.Stderr, "buildstep:", err)
		os.Exit(1)
	}
}

// board is the input file.
type board struct {
	Board    string            `json:"board"`
	Defaults json.RawMessage   `json:"defaults"`
	Channels []json.RawMessage `json:"channels"`
}

// Manifest is manifest.json: what one run generated.
type Manifest struct {
	// Version is ManifestVersion.
	Version string `json:"version"`
	// Board is the board's title.
	Board string `json:"board"`
	// Channels are the board's channels in file order.
	Channels []ManifestChannel `json:"channels"`
	// BOM is the board's combined bill of materials file.
	BOM string `json:"bom"`
	// Caution is pipeline.Caution.
	Caution string `json:"caution"`
}

// ManifestChannel is one channel's entry in the manifest.
type ManifestChannel struct {
	Name     string  `json:"name"`
	Family   string  `json:"family"`
	Order    int     `json:"order"`
	OpAmps   int     `json:"op_amps"`
	YieldPct float64 `json:"yield_pct"`
	Document string  `json:"document"`
	BOM      string  `json:"bom"`
	SPICE    string  `json:"spice"`
}

var channelName = regexp.MustCompile(`^[a-z0-9][a-z0-9_-]{0,63}$`)

// reserved are the board-level file names a channel may not take.
var reserved = []string{"board", "manifest"}

func run(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("buildstep", flag.ContinueOnError)
	fs.SetOutput(stderr)
	in := fs.String("in", "", "board JSON file; empty: the built-in Orca-4 demo board")
	out := fs.String("out", "gen", "output folder (created if missing)")
	strict := fs.Bool("strict", false, "fail when a channel's Monte Carlo yield is below its min_yield_pct")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: buildstep [-in board.json] [-out folder]")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("unexpected argument %q (the board file goes in -in)", fs.Arg(0))
	}
	src := demoBoard
	if *in != "" {
		var err error
		if src, err = os.ReadFile(*in); err != nil {
			return fmt.Errorf("reading the board: %w", err)
		}
	}
	reqs, title, err := parseBoard(src)
	if err != nil {
		return err
	}
	// Design everything before writing anything: a failing channel leaves
	// the previous output as it was.
	results := make([]pipeline.Result, len(reqs))
	var low []string
	for i, req := range reqs {
		if results[i], err = pipeline.Run(req); err != nil {
			return fmt.Errorf("channel %q: %w", req.Name, pipeline.WithPath(err, fmt.Sprintf("channels[%d]", i)))
		}
		if y := results[i].Doc.MonteCarlo.YieldPct; y < req.MinYieldPct {
			low = append(low, fmt.Sprintf("channel %q: yield %.1f %% below its target %g %%", req.Name, y, req.MinYieldPct))
		}
	}
	if *strict && len(low) > 0 {
		return fmt.Errorf("-strict: %s", strings.Join(low, "; "))
	}
	if err := os.MkdirAll(*out, 0o755); err != nil {
		return err
	}
	old := previousFiles(*out)
	man := Manifest{Version: ManifestVersion, Board: title, BOM: "board-bom.csv", Caution: pipeline.Caution}
	var items []series.Item
	for i, r := range results {
		name := reqs[i].Name
		files, err := pipeline.WriteFiles(*out, name, r)
		if err != nil {
			return fmt.Errorf("channel %q: %w", name, err)
		}
		ch := ManifestChannel{Name: name, Family: r.Doc.Family, Order: r.Doc.Order, YieldPct: r.Doc.MonteCarlo.YieldPct,
			Document: files.JSON, BOM: files.BOM, SPICE: files.SPICE}
		for _, s := range r.Doc.Stages {
			ch.OpAmps += s.OpAmps
		}
		man.Channels = append(man.Channels, ch)
		q := r.Doc.Request
		its, err := series.Items(r.Snapped, mustSeries(q.ResistorSeries), mustSeries(q.CapacitorSeries),
			series.Tolerances{Resistor: q.ResistorTolPct / 100, Capacitor: q.CapacitorTolPct / 100, Override: true})
		if err != nil {
			return fmt.Errorf("channel %q: %w", name, err)
		}
		for _, it := range its {
			it.Ref = name + "/" + it.Ref
			items = append(items, it)
		}
		fmt.Fprintf(stdout, "%-12s %s order %d, %d op-amp(s), yield %.1f %%: %s %s %s\n",
			name, r.Doc.Family, r.Doc.Order, ch.OpAmps, ch.YieldPct, files.JSON, files.BOM, files.SPICE)
	}
	var bom bytes.Buffer
	if err := series.WriteCSV(&bom, series.BOM(items)); err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(*out, man.BOM), bom.Bytes(), 0o644); err != nil {
		return err
	}
	mb, err := json.MarshalIndent(man, "", "  ")
	if err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(*out, "manifest.json"), append(mb, '\n'), 0o644); err != nil {
		return err
	}
	// Remove what an earlier run generated and this one did not.
	now := manifestFiles(man)
	for _, f := range old {
		if !slices.Contains(now, f) {
			if err := os.Remove(filepath.Join(*out, f)); err != nil && !errors.Is(err, os.ErrNotExist) {
				return err
			}
		}
	}
	for _, l := range low {
		fmt.Fprintln(stderr, "buildstep: warning:", l)
	}
	fmt.Fprintf(stdout, "board bill of materials: %s; manifest: manifest.json; in %s\n%s\n", man.BOM, *out, pipeline.Caution)
	return nil
}

// parseBoard decodes the board file into one resolved request per channel.
func parseBoard(src []byte) ([]pipeline.Request, string, error) {
	var b board
	dec := json.NewDecoder(bytes.NewReader(src))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&b); err != nil {
		return nil, "", fmt.Errorf("board file: %w", err)
	}
	if dec.More() {
		return nil, "", errors.New("board file: trailing data after the JSON document")
	}
	if len(b.Channels) == 0 {
		return nil, "", errors.New("board file: no channels")
	}
	var defaults pipeline.Request
	if len(b.Defaults) > 0 {
		var err error
		if defaults, err = pipeline.DecodeRequestOnto(pipeline.Request{}, b.Defaults, "defaults"); err != nil {
			return nil, "", err
		}
		if defaults.Mask.Band != 0 || defaults.Name != "" {
			return nil, "", errors.New(`board file: field defaults: "mask" and "name" belong to each channel`)
		}
	}
	var reqs []pipeline.Request
	seen := map[string]bool{}
	for i, raw := range b.Channels {
		path := fmt.Sprintf("channels[%d]", i)
		req, err := pipeline.DecodeRequestOnto(defaults, raw, path)
		if err != nil {
			return nil, "", err
		}
		switch {
		case !channelName.MatchString(req.Name):
			return nil, "", fmt.Errorf("board file: field %s.name: %q is not a channel name (lower case letters, digits, - and _, at most 64)", path, req.Name)
		case seen[req.Name]:
			return nil, "", fmt.Errorf("board file: field %s.name: %q used twice", path, req.Name)
		case slices.Contains(reserved, req.Name):
			return nil, "", fmt.Errorf("board file: field %s.name: %q is reserved for a board-level file", path, req.Name)
		}
		seen[req.Name] = true
		if req, err = req.Resolve(); err != nil {
			return nil, "", pipeline.WithPath(err, path)
		}
		reqs = append(reqs, req)
	}
	return reqs, b.Board, nil
}

func mustSeries(name string) series.Series {
	s, err := series.ParseSeries(name)
	if err != nil {
		panic(err) // resolved requests carry valid series names
	}
	return s
}

// manifestFiles lists every file a manifest accounts for.
func manifestFiles(m Manifest) []string {
	files := []string{"manifest.json", m.BOM}
	for _, c := range m.Channels {
		files = append(files, c.Document, c.BOM, c.SPICE)
	}
	return files
}

// previousFiles returns the files an earlier run's manifest lists (none if
// there is no readable manifest). Only plain names inside the folder are
// taken, so a tampered manifest cannot point elsewhere.
func previousFiles(dir string) []string {
	b, err := os.ReadFile(filepath.Join(dir, "manifest.json"))
	if err != nil {
		return nil
	}
	var m Manifest
	if json.Unmarshal(b, &m) != nil || m.Version != ManifestVersion {
		return nil
	}
	var out []string
	for _, f := range manifestFiles(m) {
		if f != "" && filepath.Base(f) == f && f != "." && f != ".." {
			out = append(out, f)
		}
	}
	return out
}
