package main

import (
	"bytes"
	"errors"
	"flag"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// small is a sweep small enough for a test: 2 families × 2 kinds × 2
// policies on the demo mask.
var small = []string{"-families", "butterworth,chebyshev", "-kinds", "auto,sallen-key", "-parts", "E96:1/E12:2,E24/E6:5", "-trials", "100"}

func runSweep(t *testing.T, args ...string) string {
	t.Helper()
	var stdout, stderr bytes.Buffer
	if err := run(args, &stdout, &stderr); err != nil {
		t.Fatalf("run %v: %v (%s)", args, err, stderr.String())
	}
	return stdout.String()
}

func TestSweepTable(t *testing.T) {
	out := runSweep(t, small...)
	for _, want := range []string{"Sonde-12", "8 combinations", "Best first", "family", "yield %", "max GBW", "Not buildable (4 combinations)", "sallen-key does not realize a bandpass"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	// The ranked rows: numbered 1..4, yield non-increasing down the table.
	re := regexp.MustCompile(`(?m)^\s*(\d+)\s+(butterworth|chebyshev)\s+auto\s+\S+\s+\d+\s+\d+\s+\d+\s+[\d.]+\s+([\d.]+)\s`)
	m := re.FindAllStringSubmatch(out, -1)
	if len(m) != 4 {
		t.Fatalf("%d ranked rows, want 4:\n%s", len(m), out)
	}
	prev := 101.0
	for i, row := range m {
		if row[1] != strconv.Itoa(i+1) {
			t.Errorf("row %d numbered %s", i+1, row[1])
		}
		y, _ := strconv.ParseFloat(row[3], 64)
		if y > prev {
			t.Errorf("row %d yield %g above the row before (%g)", i+1, y, prev)
		}
		prev = y
	}
}

// TestSweepDeterministic checks that the output does not depend on the
// number of workers or on scheduling.
func TestSweepDeterministic(t *testing.T) {
	one := runSweep(t, append(small, "-workers", "1")...)
	for range 2 {
		if many := runSweep(t, append(small, "-workers", "4")...); many != one {
			t.Fatalf("4 workers differ from 1:\n%s\nvs\n%s", many, one)
		}
	}
}

func TestSweepBadInput(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"-nope"}, "flag provided but not defined"},
		{[]string{"extra"}, "unexpected argument"},
		{[]string{"-workers", "0"}, "-workers"},
		{[]string{"-trials", "0"}, "-trials"},
		{[]string{"-parts", "E96"}, "RSERIES"},
		{[]string{"-parts", "E96:x/E12"}, "tolerance"},
		{[]string{"-parts", "E97/E12"}, "field resistor_series"},
		{[]string{"-kinds", "twin-tee"}, "field kind"},
		{[]string{"-families", "gaussian"}, "field families[0]"},
		{[]string{"-families", ","}, "nothing to sweep"},
		{[]string{"-in", "/nonexistent/mask.json"}, "reading the request"},
	} {
		var stdout, stderr bytes.Buffer
		err := run(c.args, &stdout, &stderr)
		if err == nil {
			t.Errorf("%v: no error", c.args)
			continue
		}
		if !strings.Contains(err.Error()+stderr.String(), c.want) {
			t.Errorf("%v: error %q does not say %q", c.args, err, c.want)
		}
	}
	var stdout, stderr bytes.Buffer
	if err := run([]string{"-help"}, &stdout, &stderr); !errors.Is(err, flag.ErrHelp) {
		t.Errorf("-help: %v", err)
	}
}
