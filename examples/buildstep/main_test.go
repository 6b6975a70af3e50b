package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/internal/ngspice"
)

// fastBoard is the demo board with fewer trials, to keep tests quick.
func fastBoard(t *testing.T) string {
	t.Helper()
	src := strings.Replace(string(demoBoard), `"trials": 1000`, `"trials": 200`, 1)
	if src == string(demoBoard) {
		t.Fatal("demo board has no trials default to lower")
	}
	p := filepath.Join(t.TempDir(), "board.json")
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func runStep(t *testing.T, args ...string) string {
	t.Helper()
	var stdout, stderr bytes.Buffer
	if err := run(args, &stdout, &stderr); err != nil {
		t.Fatalf("run %v: %v (%s)", args, err, stderr.String())
	}
	return stdout.String()
}

// readDir returns every file of dir with its bytes.
func readDir(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][]byte{}
	for _, e := range ents {
		b, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		out[e.Name()] = b
	}
	return out
}

func TestBuildStepDeterministic(t *testing.T) {
	board := fastBoard(t)
	a, b := filepath.Join(t.TempDir(), "a"), filepath.Join(t.TempDir(), "b")
	runStep(t, "-in", board, "-out", a)
	runStep(t, "-in", board, "-out", b)
	fa, fb := readDir(t, a), readDir(t, b)
	want := []string{"board-bom.csv", "manifest.json"}
	for _, ch := range []string{"geophone-z", "hydrophone", "tilt"} {
		want = append(want, ch+".json", ch+"-bom.csv", ch+".cir")
	}
	slices.Sort(want)
	var got []string
	for name := range fa {
		got = append(got, name)
	}
	slices.Sort(got)
	if !slices.Equal(got, want) {
		t.Fatalf("files %v, want %v", got, want)
	}
	for name, x := range fa {
		if !bytes.Equal(x, fb[name]) {
			t.Errorf("%s differs between two runs", name)
		}
	}
	// A second run into the same folder rewrites the same bytes.
	runStep(t, "-in", board, "-out", a)
	for name, x := range readDir(t, a) {
		if !bytes.Equal(x, fb[name]) {
			t.Errorf("%s differs after a rerun in place", name)
		}
	}
	// The documents round-trip and the manifest agrees with them.
	var man Manifest
	if err := json.Unmarshal(fa["manifest.json"], &man); err != nil {
		t.Fatal(err)
	}
	if man.Version != ManifestVersion || len(man.Channels) != 3 {
		t.Fatalf("manifest %+v", man)
	}
	for _, ch := range man.Channels {
		doc, err := pipeline.UnmarshalDocument(fa[ch.Document])
		if err != nil {
			t.Fatal(err)
		}
		if doc.Family != ch.Family || doc.Order != ch.Order || doc.MonteCarlo.YieldPct != ch.YieldPct || doc.Request.Name != ch.Name {
			t.Errorf("manifest %+v disagrees with %s", ch, ch.Document)
		}
		again, err := pipeline.MarshalDocument(doc)
		if err != nil || !bytes.Equal(again, fa[ch.Document]) {
			t.Errorf("%s does not round-trip (%v)", ch.Document, err)
		}
	}
	// The channel overrides took effect over the defaults.
	hyd, _ := pipeline.UnmarshalDocument(fa["hydrophone.json"])
	geo, _ := pipeline.UnmarshalDocument(fa["geophone-z.json"])
	if hyd.Request.CapacitorSeries != "E6" || geo.Request.CapacitorSeries != "E12" || geo.Request.Seed != 42 || hyd.Request.Seed != 42 {
		t.Errorf("overrides: hydrophone %+v, geophone %+v", hyd.Request, geo.Request)
	}
	// Every channel's parts are in the board BOM under its prefix.
	for _, ch := range []string{"geophone-z/U1.", "hydrophone/U1.", "tilt/U1."} {
		if !bytes.Contains(fa["board-bom.csv"], []byte(ch)) {
			t.Errorf("board BOM lacks %s parts", ch)
		}
	}
}

func TestBuildStepRemovesStaleFiles(t *testing.T) {
	out := filepath.Join(t.TempDir(), "gen")
	runStep(t, "-in", fastBoard(t), "-out", out)
	// A board with one channel fewer: the tilt files go, an unrelated file stays.
	if err := os.WriteFile(filepath.Join(out, "notes.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	var b map[string]any
	if err := json.Unmarshal(demoBoard, &b); err != nil {
		t.Fatal(err)
	}
	b["channels"] = b["channels"].([]any)[:2]
	b["defaults"].(map[string]any)["trials"] = 100
	src, _ := json.Marshal(b)
	p := filepath.Join(t.TempDir(), "two.json")
	os.WriteFile(p, src, 0o644)
	runStep(t, "-in", p, "-out", out)
	files := readDir(t, out)
	for _, gone := range []string{"tilt.json", "tilt.cir", "tilt-bom.csv"} {
		if _, ok := files[gone]; ok {
			t.Errorf("stale %s left behind", gone)
		}
	}
	if _, ok := files["notes.txt"]; !ok {
		t.Error("a file the build step did not write was removed")
	}
}

// TestBuildStepDecksInNgspice runs each generated deck in ngspice and
// compares it with the channel's document at its passband edge and
// stopband edge (0.01 dB; the deck's op-amps have gain 1e7).
func TestBuildStepDecksInNgspice(t *testing.T) {
	ngspice.Required(t)
	out := filepath.Join(t.TempDir(), "gen")
	runStep(t, "-in", fastBoard(t), "-out", out)
	files := readDir(t, out)
	for _, ch := range []string{"geophone-z", "hydrophone", "tilt"} {
		doc, err := pipeline.UnmarshalDocument(files[ch+".json"])
		if err != nil {
			t.Fatal(err)
		}
		r, err := pipeline.Run(doc.Request)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := pipeline.PlotRange(doc.Request.Mask)
		sw, err := ngspice.AC(string(files[ch+".cir"]), "out", 10, lo, hi)
		if err != nil {
			t.Fatalf("%s: %v", ch, err)
		}
		for i, f := range sw.Hz {
			want := 20 * math.Log10(cmplx.Abs(r.Snapped.AtHz(f)))
			if want > -150 && math.Abs(sw.GainDB[i]-want) > 0.01 {
				t.Errorf("%s at %.3g Hz: ngspice %.4f dB, chain %.4f dB", ch, f, sw.GainDB[i], want)
			}
		}
	}
}

func TestGoGenerateLine(t *testing.T) {
	src, err := os.ReadFile("main.go")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(src), "//go:generate go run github.com/rolloff/rolloff/examples/buildstep -in board.json -out gen\n") {
		t.Error("main.go lacks its go:generate line")
	}
}

func TestBuildStepBadInput(t *testing.T) {
	const mask = `"mask": {"band": "lowpass", "pass_hz": [100], "stop_hz": [400], "ripple_db": 2, "atten_db": 40}`
	for _, c := range []struct {
		name, board, want string
	}{
		{"not JSON", `{"board": `, "board file"},
		{"unknown top field", `{"board": "x", "channel": []}`, "unknown field"},
		{"no channels", `{"board": "x", "channels": []}`, "no channels"},
		{"bad name", `{"channels": [{"name": "Geo Z", ` + mask + `}]}`, "channels[0].name"},
		{"reserved name", `{"channels": [{"name": "manifest", ` + mask + `}]}`, "reserved"},
		{"duplicate", `{"channels": [{"name": "a", ` + mask + `}, {"name": "a", ` + mask + `}]}`, "used twice"},
		{"channel typo", `{"channels": [{"name": "a", ` + mask + `, "trails": 3}]}`, "field channels[0].trails"},
		{"bad mask", `{"channels": [{"name": "a", ` + mask + `}, {"name": "b", "mask": {"band": "lowpass", "pass_hz": [100], "stop_hz": [50], "ripple_db": 2, "atten_db": 40}}]}`, "field channels[1].mask"},
		{"mask in defaults", `{"defaults": {` + mask + `}, "channels": [{"name": "a", ` + mask + `}]}`, "defaults"},
		{"bad default", `{"defaults": {"resistor_series": "E7"}, "channels": [{"name": "a", ` + mask + `}]}`, "field channels[0].resistor_series"},
		{"unbuildable", `{"channels": [{"name": "a", "families": ["bessel"], "mask": {"band": "lowpass", "pass_hz": [100], "stop_hz": [110], "ripple_db": 1, "atten_db": 80}}]}`, "no buildable design"},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			p := filepath.Join(dir, "board.json")
			os.WriteFile(p, []byte(c.board), 0o644)
			var stdout, stderr bytes.Buffer
			err := run([]string{"-in", p, "-out", filepath.Join(dir, "gen")}, &stdout, &stderr)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("error %v, want one saying %q", err, c.want)
			}
			if _, serr := os.Stat(filepath.Join(dir, "gen")); serr == nil {
				t.Error("a failed run created the output folder")
			}
		})
	}
	var stdout, stderr bytes.Buffer
	if err := run([]string{"-h"}, &stdout, &stderr); !errors.Is(err, flag.ErrHelp) {
		t.Errorf("-h: %v", err)
	}
	if err := run([]string{"-in", "/nonexistent/board.json"}, &stdout, &stderr); err == nil || !strings.Contains(err.Error(), "reading the board") {
		t.Errorf("missing file: %v", err)
	}
	if err := run([]string{"stray"}, &stdout, &stderr); err == nil {
		t.Error("stray argument accepted")
	}
}

func TestStrictYield(t *testing.T) {
	// A target no design reaches: a warning normally, an error with -strict.
	const b = `{"defaults": {"trials": 100, "capacitor_series": "E6", "capacitor_tol_pct": 20, "min_yield_pct": 99.9},
		"channels": [{"name": "a", "families": ["chebyshev"], "mask": {"band": "lowpass", "pass_hz": [100], "stop_hz": [300], "ripple_db": 1, "atten_db": 40}}]}`
	dir := t.TempDir()
	p := filepath.Join(dir, "board.json")
	os.WriteFile(p, []byte(b), 0o644)
	var stdout, stderr bytes.Buffer
	if err := run([]string{"-in", p, "-out", filepath.Join(dir, "gen")}, &stdout, &stderr); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stderr.String(), "warning") {
		t.Errorf("no warning: %q", stderr.String())
	}
	if err := run([]string{"-strict", "-in", p, "-out", filepath.Join(dir, "gen2")}, &stdout, &stderr); err == nil || !strings.Contains(err.Error(), "below its target") {
		t.Errorf("-strict: %v", err)
	}
}
