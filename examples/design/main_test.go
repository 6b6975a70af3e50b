package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"errors"
	"flag"
	"image/png"
	"io"
	"math"
	"math/cmplx"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/internal/ngspice"
)

// runDemo runs the command on the built-in demo with few trials (to keep
// the test fast) into a fresh folder and returns the folder and stdout.
func runDemo(t *testing.T, extra ...string) (string, string) {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "out")
	var stdout, stderr bytes.Buffer
	args := append([]string{"-out", dir, "-trials", "300"}, extra...)
	if err := run(args, strings.NewReader(""), &stdout, &stderr); err != nil {
		t.Fatalf("run %v: %v (stderr %q)", args, err, stderr.String())
	}
	return dir, stdout.String()
}

func TestDemoReportAndFiles(t *testing.T) {
	dir, out := runDemo(t)
	for _, want := range []string{
		"Tremor-3", "Candidates, best first", "<- chosen", "Chosen", "Stage table",
		"Circuits with snapped parts", "Deviation after snapping", "gain-bandwidth needed", "slew rate for a 2.5 V peak sine at 1 kHz",
		"Monte Carlo: 300 boards", "yield", dir, pipeline.Caution,
	} {
		if !strings.Contains(out, want) {
			t.Errorf("report lacks %q:\n%s", want, out)
		}
	}
	for _, name := range []string{"design.json", "design-bom.csv", "design.cir", "bode.png", "bode.svg", "delay.png", "step.png", "noise.png", "montecarlo.png"} {
		fi, err := os.Stat(filepath.Join(dir, name))
		if err != nil || fi.Size() == 0 {
			t.Errorf("%s: missing or empty (%v)", name, err)
		}
		if strings.HasSuffix(name, ".png") {
			f, err := os.Open(filepath.Join(dir, name))
			if err != nil {
				t.Fatal(err)
			}
			img, err := png.Decode(f)
			f.Close()
			if err != nil {
				t.Errorf("%s does not decode as PNG: %v", name, err)
			} else if b := img.Bounds(); b.Dx() < 400 || b.Dy() < 300 {
				t.Errorf("%s is only %v", name, b)
			}
		}
	}

	// The SVG is well-formed XML with an <svg> root and the plot's text.
	svg, err := os.ReadFile(filepath.Join(dir, "bode.svg"))
	if err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(bytes.NewReader(svg))
	root := ""
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("bode.svg is not XML: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok && root == "" {
			root = se.Name.Local
		}
	}
	if root != "svg" || !bytes.Contains(svg, []byte("Frequency (Hz)")) {
		t.Errorf("bode.svg: root <%s>, axis label present %t", root, bytes.Contains(svg, []byte("Frequency (Hz)")))
	}

	// The JSON document parses, has its version and round-trips.
	raw, err := os.ReadFile(filepath.Join(dir, "design.json"))
	if err != nil {
		t.Fatal(err)
	}
	doc, err := pipeline.UnmarshalDocument(raw)
	if err != nil {
		t.Fatal(err)
	}
	again, err := pipeline.MarshalDocument(doc)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(raw, again) {
		t.Error("design.json does not round-trip byte for byte")
	}
	if doc.MonteCarlo.Trials != 300 || doc.Request.Seed != 7 {
		t.Errorf("flags not applied: trials %d, seed %d", doc.MonteCarlo.Trials, doc.Request.Seed)
	}
	// The report names the family the document chose.
	if !strings.Contains(out, "Chosen  "+doc.Family) {
		t.Errorf("report and document disagree on the family %q", doc.Family)
	}

	// The BOM has its header and one designator per part of the document.
	bom, err := os.ReadFile(filepath.Join(dir, "design-bom.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(string(bom), "kind,value,display,code,series,tolerance,count,refs\n") {
		t.Errorf("BOM header: %q", strings.SplitN(string(bom), "\n", 2)[0])
	}
	for _, s := range doc.Stages {
		for _, p := range s.Parts {
			if !strings.Contains(string(bom), p.Designator) {
				t.Errorf("BOM lacks %s", p.Designator)
			}
		}
	}
}

// TestDemoDeckInNgspice simulates the written deck in ngspice and compares
// its gain with the document's snapped chain, from the parts (tolerance
// 0.01 dB: the deck's op-amps are gain-1e7 sources, the analysis uses
// ideal ones; see topology.SPICEOpAmpGain).
func TestDemoDeckInNgspice(t *testing.T) {
	ngspice.Required(t)
	dir, _ := runDemo(t, "-noplots")
	deck, err := os.ReadFile(filepath.Join(dir, "design.cir"))
	if err != nil {
		t.Fatal(err)
	}
	raw, err := os.ReadFile(filepath.Join(dir, "design.json"))
	if err != nil {
		t.Fatal(err)
	}
	doc, err := pipeline.UnmarshalDocument(raw)
	if err != nil {
		t.Fatal(err)
	}
	sw, err := ngspice.AC(string(deck), "out", 20, 10, 40e3)
	if err != nil {
		t.Fatal(err)
	}
	r, err := pipeline.Run(doc.Request)
	if err != nil {
		t.Fatal(err)
	}
	for i, f := range sw.Hz {
		want := 20 * math.Log10(cmplx.Abs(r.Snapped.AtHz(f)))
		if want < -150 {
			continue // below what the simulator's output resolves
		}
		if d := math.Abs(sw.GainDB[i] - want); d > 0.01 {
			t.Errorf("%.1f Hz: ngspice %.4f dB, chain %.4f dB", f, sw.GainDB[i], want)
		}
	}
}

func TestDemoDeterministic(t *testing.T) {
	a, _ := runDemo(t, "-noplots")
	b, _ := runDemo(t, "-noplots")
	for _, name := range []string{"design.json", "design-bom.csv", "design.cir"} {
		x, _ := os.ReadFile(filepath.Join(a, name))
		y, _ := os.ReadFile(filepath.Join(b, name))
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between two runs", name)
		}
	}
}

func TestRequestFromFileAndStdin(t *testing.T) {
	req := `{"name": "bench test", "mask": {"band": "highpass", "pass_hz": [200], "stop_hz": [50], "ripple_db": 1, "atten_db": 40},
		"families": ["butterworth", "chebyshev"], "trials": 200}`
	in := filepath.Join(t.TempDir(), "req.json")
	if err := os.WriteFile(in, []byte(req), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		args  []string
		stdin string
	}{
		{"file", []string{"-in", in}, ""},
		{"stdin", []string{"-in", "-"}, req},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "o")
			var stdout, stderr bytes.Buffer
			if err := run(append(c.args, "-out", dir, "-noplots"), strings.NewReader(c.stdin), &stdout, &stderr); err != nil {
				t.Fatal(err)
			}
			raw, err := os.ReadFile(filepath.Join(dir, "design.json"))
			if err != nil {
				t.Fatal(err)
			}
			var generic map[string]any
			if err := json.Unmarshal(raw, &generic); err != nil {
				t.Fatal(err)
			}
			if generic["version"] != pipeline.Version {
				t.Errorf("version %v", generic["version"])
			}
			if !strings.Contains(stdout.String(), "bench test") || !strings.Contains(stdout.String(), "highpass") {
				t.Errorf("report: %s", stdout.String())
			}
		})
	}
}

func TestPlotsDecodeBandpass(t *testing.T) {
	// The plots of a band the demo does not cover still render.
	req := `{"mask": {"band": "bandpass", "pass_hz": [900, 1100], "stop_hz": [500, 2000], "ripple_db": 1, "atten_db": 30}, "trials": 100}`
	in := filepath.Join(t.TempDir(), "bp.json")
	if err := os.WriteFile(in, []byte(req), 0o644); err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(t.TempDir(), "o")
	var stdout, stderr bytes.Buffer
	if err := run([]string{"-in", in, "-out", dir}, nil, &stdout, &stderr); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"bode.png", "delay.png", "step.png", "noise.png", "montecarlo.png"} {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := png.Decode(f); err != nil {
			t.Errorf("%s: %v", name, err)
		}
		f.Close()
	}
}

func TestBadInput(t *testing.T) {
	tmp := t.TempDir()
	bad := filepath.Join(tmp, "bad.json")
	os.WriteFile(bad, []byte(`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [500], "ripple_db": 1, "atten_db": 40}}`), 0o644)
	typo := filepath.Join(tmp, "typo.json")
	os.WriteFile(typo, []byte(`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}, "trails": 10}`), 0o644)
	for _, c := range []struct {
		name string
		args []string
		want string // in the error message
	}{
		{"unknown flag", []string{"-bogus"}, "flag provided but not defined"},
		{"stray argument", []string{"mask.json"}, "unexpected argument"},
		{"negative trials", []string{"-trials", "-5"}, "-trials"},
		{"bad amplitude", []string{"-vpeak", "0"}, "-vpeak"},
		{"missing file", []string{"-in", filepath.Join(tmp, "nope.json")}, "reading the request"},
		{"bad mask", []string{"-in", bad}, "field mask"},
		{"unknown field", []string{"-in", typo}, "field trails"},
	} {
		t.Run(c.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			err := run(append(c.args, "-out", filepath.Join(tmp, "o")), strings.NewReader(""), &stdout, &stderr)
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), c.want) && !strings.Contains(stderr.String(), c.want) {
				t.Errorf("error %q (stderr %q) does not say %q", err, stderr.String(), c.want)
			}
		})
	}
	// -h is not a failure of the input but still not a design.
	var stdout, stderr bytes.Buffer
	if err := run([]string{"-h"}, nil, &stdout, &stderr); !errors.Is(err, flag.ErrHelp) {
		t.Errorf("-h: %v", err)
	}
}

// TestDocumentMatchesRun checks that the written document equals the one
// the pipeline returns for the same request (go-cmp, exact floats).
func TestDocumentMatchesRun(t *testing.T) {
	dir, _ := runDemo(t, "-noplots")
	raw, err := os.ReadFile(filepath.Join(dir, "design.json"))
	if err != nil {
		t.Fatal(err)
	}
	doc, err := pipeline.UnmarshalDocument(raw)
	if err != nil {
		t.Fatal(err)
	}
	req, err := pipeline.DecodeRequestBytes(demo)
	if err != nil {
		t.Fatal(err)
	}
	req.Trials = 300
	r, err := pipeline.Run(req)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(r.Doc, doc, cmpopts.EquateEmpty()); diff != "" {
		t.Errorf("written document differs (-run +file):\n%s", diff)
	}
}

// TestMain lets the test binary stand in for the command: with
// ROLLOFF_DESIGN_AS_MAIN=1 in its environment it runs main with the
// arguments after "--", so TestExitStatus can check real exit codes.
func TestMain(m *testing.M) {
	if os.Getenv("ROLLOFF_DESIGN_AS_MAIN") == "1" {
		for i, a := range os.Args {
			if a == "--" {
				os.Args = append([]string{"design"}, os.Args[i+1:]...)
				break
			}
		}
		main()
		os.Exit(0)
	}
	os.Exit(m.Run())
}

func TestExitStatus(t *testing.T) {
	tmp := t.TempDir()
	for _, c := range []struct {
		args   []string
		code   int
		stderr string
	}{
		{[]string{"-out", filepath.Join(tmp, "ok"), "-trials", "50", "-noplots"}, 0, ""},
		{[]string{"-h"}, 0, "usage: design"},
		{[]string{"-bogus"}, 1, "design: flag provided but not defined"},
		{[]string{"-in", filepath.Join(tmp, "missing.json")}, 1, "design: reading the request"},
	} {
		cmd := exec.Command(os.Args[0], append([]string{"-test.run=^$", "--"}, c.args...)...)
		cmd.Env = append(os.Environ(), "ROLLOFF_DESIGN_AS_MAIN=1")
		var stderr bytes.Buffer
		cmd.Stderr = &stderr
		err := cmd.Run()
		code := 0
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			code = ee.ExitCode()
		} else if err != nil {
			t.Fatal(err)
		}
		if code != c.code || !strings.Contains(stderr.String(), c.stderr) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d with %q", c.args, code, stderr.String(), c.code, c.stderr)
		}
	}
}
