package ngspice

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"time"
)

// Program is the name of the executable looked up on PATH.
const Program = "ngspice"

// Timeout bounds one ngspice run. A run that takes longer is killed and
// reported as an error wrapping ErrRun.
const Timeout = 60 * time.Second

// Sentinel errors; every error of this package wraps one of them.
var (
	// ErrMissing reports that the ngspice executable is not on PATH.
	ErrMissing = errors.New("ngspice: executable not found on PATH (Debian package ngspice)")
	// ErrDeck reports a deck or request this package refuses before running
	// anything: no ".end" line, an existing ".control" block, a bad node name
	// or sweep.
	ErrDeck = errors.New("ngspice: bad deck or request")
	// ErrRun reports that ngspice ran but failed: a non-zero exit, a timeout,
	// or output that could not be read.
	ErrRun = errors.New("ngspice: run failed")
)

// Available reports whether the ngspice executable is on PATH.
func Available() bool {
	_, err := exec.LookPath(Program)
	return err == nil
}

// TB is the part of testing.TB that Required uses.
type TB interface {
	Helper()
	Skip(args ...any)
	Fatal(args ...any)
}

// Required stops the calling test when ngspice is missing: it skips the test
// on a developer's machine and fails it when the environment variable CI is
// "true", where the simulator must be installed.
func Required(t TB) {
	t.Helper()
	if Available() {
		return
	}
	if os.Getenv("CI") == "true" {
		t.Fatal("ngspice is required in CI (CI=true) but is not on PATH: install the Debian package ngspice")
	}
	t.Skip("ngspice not on PATH: skipping the simulator check (install the Debian package ngspice)")
}

// Sweep is the result of an AC analysis of one node, one entry per
// frequency point, in the order ngspice computed them.
type Sweep struct {
	Hz       []float64 // frequency, hertz
	GainDB   []float64 // 20·log10|V(node)|, with the deck's AC source as the reference
	PhaseDeg []float64 // phase of V(node), degrees, wrapped to (−180, 180]
}

// AC runs a decade AC sweep of deck from f1 to f2 hertz with perDecade points
// per decade and returns the gain and phase of node. The deck must be a
// complete netlist ending in a ".end" line and must not hold a ".control"
// block of its own: AC appends one before ".end". Values are read back with
// 12 significant digits.
func AC(deck, node string, perDecade int, f1, f2 float64) (Sweep, error) {
	if perDecade < 1 {
		return Sweep{}, fmt.Errorf("ngspice: %d points per decade (must be at least 1): %w", perDecade, ErrDeck)
	}
	if !(f1 > 0) || !(f2 >= f1) || math.IsInf(f2, 0) {
		return Sweep{}, fmt.Errorf("ngspice: sweep %g..%g Hz (need 0 < f1 <= f2 finite): %w", f1, f2, ErrDeck)
	}
	if node == "" || strings.ContainsAny(node, " \t\r\n()=,;") {
		return Sweep{}, fmt.Errorf("ngspice: node name %q: %w", node, ErrDeck)
	}
	control := fmt.Sprintf("set wr_singlescale\noption numdgt=12\nac dec %d %.12g %.12g\nwrdata ac.txt vdb(%s) vp(%s)\n",
		perDecade, f1, f2, node, node)
	var sw Sweep
	_, err := run(deck, control, func(dir string) error {
		b, err := os.ReadFile(filepath.Join(dir, "ac.txt"))
		if err != nil {
			return fmt.Errorf("ngspice: no AC output: %v: %w", err, ErrRun)
		}
		sw, err = parseColumns(b)
		return err
	})
	return sw, err
}

func parseColumns(b []byte) (Sweep, error) {
	var sw Sweep
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		fs := strings.Fields(sc.Text())
		if len(fs) == 0 {
			continue
		}
		if len(fs) != 3 {
			return Sweep{}, fmt.Errorf("ngspice: AC output line %q has %d columns, want 3: %w", sc.Text(), len(fs), ErrRun)
		}
		var v [3]float64
		for i, f := range fs {
			x, err := strconv.ParseFloat(f, 64)
			if err != nil {
				return Sweep{}, fmt.Errorf("ngspice: AC output value %q: %w", f, ErrRun)
			}
			v[i] = x
		}
		sw.Hz = append(sw.Hz, v[0])
		sw.GainDB = append(sw.GainDB, v[1])
		sw.PhaseDeg = append(sw.PhaseDeg, v[2]*180/math.Pi)
	}
	if len(sw.Hz) == 0 {
		return Sweep{}, fmt.Errorf("ngspice: AC output is empty: %w", ErrRun)
	}
	return sw, nil
}

// RunControl runs deck with the given control block (the lines between
// ".control" and ".endc", without those two lines; "quit 0" is appended) and
// returns what ngspice printed on standard output. Use Values to read the
// "name = value" lines of print and meas commands. The control block runs in
// a fresh temporary directory, which is removed afterwards.
func RunControl(deck, control string) (string, error) {
	return run(deck, control, nil)
}

// Value is one "name = value" line of ngspice output.
type Value struct {
	Name  string
	Value float64
}

// Values returns the "name = number" lines of ngspice output in order, as
// printed by print (scalars) and meas. Lines that do not have that form
// are ignored.
func Values(stdout string) []Value {
	var vs []Value
	for line := range strings.SplitSeq(stdout, "\n") {
		name, val, ok := strings.Cut(line, "=")
		if !ok {
			continue
		}
		name = strings.TrimSpace(name)
		fs := strings.Fields(val)
		if name == "" || strings.ContainsAny(name, " \t") || len(fs) == 0 {
			continue
		}
		x, err := strconv.ParseFloat(fs[0], 64)
		if err != nil {
			continue
		}
		vs = append(vs, Value{Name: name, Value: x})
	}
	return vs
}

// run writes deck with control spliced in before ".end", runs ngspice -b in
// a temporary directory, calls read (if not nil) on that directory, and
// returns the standard output.
func run(deck, control string, read func(dir string) error) (string, error) {
	full, err := splice(deck, control)
	if err != nil {
		return "", err
	}
	path, err := exec.LookPath(Program)
	if err != nil {
		return "", ErrMissing
	}
	dir, err := os.MkdirTemp("", "rolloff-ngspice-")
	if err != nil {
		return "", fmt.Errorf("ngspice: temporary directory: %v: %w", err, ErrRun)
	}
	defer os.RemoveAll(dir)
	if err := os.WriteFile(filepath.Join(dir, "deck.cir"), []byte(full), 0o644); err != nil {
		return "", fmt.Errorf("ngspice: writing deck: %v: %w", err, ErrRun)
	}
	ctx, cancel := context.WithTimeout(context.Background(), Timeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, path, "-b", "deck.cir")
	cmd.Dir = dir
	var stdout, stderr bytes.Buffer
	cmd.Stdout = &stdout
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		return stdout.String(), fmt.Errorf("ngspice: %v; stderr: %s: %w", err, strings.TrimSpace(stderr.String()), ErrRun)
	}
	if read != nil {
		if err := read(dir); err != nil {
			return stdout.String(), err
		}
	}
	return stdout.String(), nil
}

// splice inserts a .control block (ending in quit 0) before the deck's
// final ".end" line.
func splice(deck, control string) (string, error) {
	lines := strings.Split(strings.TrimRight(deck, " \t\r\n"), "\n")
	end := -1
	for i := len(lines) - 1; i >= 0; i-- {
		l := strings.ToLower(strings.TrimSpace(lines[i]))
		if l == "" {
			continue
		}
		if l == ".end" {
			end = i
		}
		break
	}
	if end < 1 {
		return "", fmt.Errorf("ngspice: deck has no title line and final .end line: %w", ErrDeck)
	}
	for _, l := range lines {
		if strings.HasPrefix(strings.ToLower(strings.TrimSpace(l)), ".control") {
			return "", fmt.Errorf("ngspice: deck already has a .control block: %w", ErrDeck)
		}
	}
	var b strings.Builder
	for _, l := range lines[:end] {
		b.WriteString(strings.TrimRight(l, "\r"))
		b.WriteByte('\n')
	}
	b.WriteString(".control\n")
	b.WriteString(strings.TrimRight(control, "\n"))
	b.WriteString("\nquit 0\n.endc\n.end\n")
	return b.String(), nil
}
