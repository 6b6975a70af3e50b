package main

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/examples/internal/textable"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// hz formats a frequency in engineering notation ("1.23 kHz").
func hz(f float64) string { return pipeline.FormatHz(f) }

// topPassHz is the highest frequency the mask passes at full level that
// matters for slew rate: the passband edge of a lowpass or bandpass, the
// upper passband edge of a bandstop, and for a highpass ten times its edge
// (its passband is open upwards; the signal's own bandwidth decides).
func topPassHz(m filter.Spec) float64 {
	switch m.Band {
	case filter.Lowpass:
		return m.PassHz[0]
	case filter.Highpass:
		return 10 * m.PassHz[0]
	default:
		return m.PassHz[1]
	}
}

// report prints the design to w.
func report(w io.Writer, r pipeline.Result, vpeak float64, dir string, files []string) error {
	d := r.Doc
	q := d.Request
	var b strings.Builder
	p := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	title := q.Name
	if title == "" {
		title = "filter design"
	}
	p("Rolloff: %s\n", title)
	p("Mask    %s\n", pipeline.MaskText(q.Mask))
	p("Policy  resistors %s (%g %%), capacitors %s (%g %%), circuits %s, design margin %g dB, yield target %g %%\n\n",
		q.ResistorSeries, q.ResistorTolPct, q.CapacitorSeries, q.CapacitorTolPct, q.Kind, *q.MarginDB, q.MinYieldPct)

	p("Candidates, best first. Rule: %s.\n", d.Rule)
	tw := &textable.Table{Indent: "  ", Right: []bool{false, true, true, true, true, true, true, true}}
	tw.Row("family", "order", "op-amps", "parts", "deviation dB", "yield %", "max GBW", "noise µV", "")
	for _, i := range pipeline.Rank(d.Candidates, q.MinYieldPct) {
		c := d.Candidates[i]
		if c.Error != "" {
			tw.Row(c.Family, "-", "-", "-", "-", "-", "-", "-", "not buildable: "+c.Error)
			continue
		}
		mark := ""
		if c.Family == d.Family {
			mark = "<- chosen"
		}
		tw.Row(c.Family, fmt.Sprint(c.Order), fmt.Sprint(c.OpAmps), fmt.Sprint(c.Parts), fmt.Sprintf("%.3f", c.DeviationDB), fmt.Sprintf("%.1f", c.YieldPct), hz(c.MaxGBWHz), fmt.Sprintf("%.3g", c.NoiseUV), mark)
	}
	tw.WriteTo(&b)

	poles := len(d.Design.Poles)
	p("\nChosen  %s, order %d (%d poles), %d stages, output %s\n\n", d.Family, d.Order, poles, len(d.Stages), map[bool]string{true: "inverted", false: "not inverted"}[d.Inverting])

	p("Stage table (targets, input first):\n")
	tw = &textable.Table{Indent: "  ", Right: []bool{false, false, true, true, true, true, true}}
	tw.Row("stage", "kind", "order", "f0", "Q", "gain", "zero")
	for _, s := range d.Stages {
		t := s.Target
		qs, zs := "-", "-"
		if t.Order == 2 {
			qs = fmt.Sprintf("%.4f", t.Q)
		}
		if t.Kind == filter.NotchStage {
			zs = hz(t.ZeroHz)
		}
		tw.Row(s.Designator, t.Kind.String(), fmt.Sprint(t.Order), hz(t.F0Hz), qs, fmt.Sprintf("%.4f", t.Gain), zs)
	}
	tw.WriteTo(&b)

	p("\nCircuits with snapped parts (%s resistors, %s capacitors; ideal value in brackets):\n", q.ResistorSeries, q.CapacitorSeries)
	for _, s := range d.Stages {
		inv := ""
		if s.Inverting {
			inv = ", inverting"
		}
		qe := fmt.Sprintf("%+.2f %%", s.QErrPct)
		if s.Target.Order == 1 {
			qe = "-"
		}
		p("  %s  %s, %d op-amp(s)%s; snapped vs target: f0 %+.2f %%, Q %s, gain %+.2f %%\n", s.Designator, s.Circuit, s.OpAmps, inv, s.F0ErrPct, qe, s.GainErrPct)
		var parts []string
		for _, pt := range s.Parts {
			unit := "Ω"
			if strings.HasPrefix(pt.Ref, "C") {
				unit = "F"
			}
			parts = append(parts, fmt.Sprintf("%s %s [%s]", pt.Ref, pt.Display, series.Format{Digits: 4}.Value(pt.IdealValue, unit)))
		}
		for len(parts) > 0 {
			n := min(3, len(parts))
			p("        %s\n", strings.Join(parts[:n], ", "))
			parts = parts[n:]
		}
	}

	p("\nDeviation after snapping: %.3f dB worst over the passband (each part rounded on its own: %.3f dB)\n", d.DeviationDB, d.RoundedDeviationDB)
	p("Mask margin: design %.3f dB, snapped chain %.3f dB\n", d.DesignMarginDB, d.SnappedMarginDB)

	p("\nOp-amp gain-bandwidth needed per stage (f0 and Q within %g %%, single-pole op-amp model;\n  rule of thumb 100·max(1, |gain|)·max(1, Q)·f0 beside it):\n", 100*pipeline.GBWMaxErr)
	tw = &textable.Table{Indent: "  ", Right: []bool{false, false, true, true}}
	tw.Row("stage", "circuit", "GBW needed", "rule of thumb")
	for _, s := range d.Stages {
		tw.Row(s.Designator, s.Circuit, hz(s.GBWHz), hz(s.RuleOfThumbGBWHz))
	}
	tw.WriteTo(&b)
	top := topPassHz(q.Mask)
	p("  slew rate for a %g V peak sine at %s (top of the passband): %.3g V/µs at least\n",
		vpeak, hz(top), topology.SlewRateVPerUs(vpeak, top))

	// Every op-amp output's swing with the input at the level that puts a
	// vpeak sine at the chain's output at its peak frequency.
	last := d.Stages[len(d.Stages)-1].Swing
	outGain := 0.0
	for _, w := range last {
		if w.Node == "out" {
			outGain = w.Gain
		}
	}
	if outGain > 0 {
		p("\nOp-amp output swing with the input at %.3g V peak (%g V peak at the output where it peaks):\n", vpeak/outGain, vpeak)
		tw = &textable.Table{Indent: "  ", Right: []bool{false, false, true, true, true, false}}
		tw.Row("op-amp", "node", "gain", "at", "V peak", "")
		for _, s := range d.Stages {
			for _, w := range s.Swing {
				at, mark := "DC", ""
				if w.Hz > 0 {
					at = hz(w.Hz)
				}
				if w.Gain > 1.01*outGain {
					mark = "above the output"
				}
				tw.Row(w.Designator, w.Node, fmt.Sprintf("%.3g", w.Gain), at, fmt.Sprintf("%.3g", vpeak*w.Gain/outGain), mark)
			}
		}
		tw.WriteTo(&b)
	}

	nz := d.Noise
	p("\nOutput noise (snapped parts; resistors at %.0f °C; op-amps %g nV/√Hz and %g pA/√Hz, ideal otherwise):\n",
		nz.TempK-273.15, nz.AmpNoiseNV, nz.AmpNoisePA)
	p("  %.3g nV/√Hz at %s; %.3g µV RMS from %s to %s\n", nz.DensityNV, hz(nz.RefHz), nz.RMSUV, hz(nz.BandHz[0]), hz(nz.BandHz[1]))
	if nz.RMSUV > 0 {
		// A full-scale sine of vpeak at the output against that noise.
		p("  a %g V peak sine at the output stands %.1f dB above it\n", vpeak, 20*math.Log10(vpeak/math.Sqrt2/(nz.RMSUV*1e-6)))
	}
	p("  largest sources at %s:\n", hz(nz.RefHz))
	tw = &textable.Table{Indent: "    ", Right: []bool{false, false, true, true}}
	tw.Row("part", "noise", "nV/√Hz", "share %")
	for _, s := range nz.Top {
		tw.Row(s.Designator, s.Kind, fmt.Sprintf("%.3g", s.DensityNV), fmt.Sprintf("%.1f", s.SharePct))
	}
	tw.WriteTo(&b)

	mc := d.MonteCarlo
	p("\nMonte Carlo: %d boards, seed %d, %s tolerances (R %g %%, C %g %%), checked at %d frequencies against the mask:\n",
		mc.Trials, mc.Seed, mc.Distribution, mc.ResistorTolPct, mc.CapacitorTolPct, mc.Frequencies)
	p("  yield %.1f %% (%d passed, %d failed to evaluate)\n", mc.YieldPct, mc.Passed, mc.Failed)

	p("\nWrote to %s:\n", dir)
	for _, f := range files {
		p("  %s\n", f)
	}
	p("\n%s\n", d.Caution)
	_, err := io.WriteString(w, b.String())
	return err
}
