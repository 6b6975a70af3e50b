package main

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// sweepPoints is the number of log-spaced frequencies of the plots.
const sweepPoints = 600

var (
	designColor  = color.NRGBA{R: 0x1f, G: 0x5f, B: 0xbf, A: 0xff} // blue
	snappedColor = color.NRGBA{R: 0xe0, G: 0x6c, B: 0x00, A: 0xff} // orange
	maskFill     = color.NRGBA{R: 0xd0, G: 0x20, B: 0x20, A: 0x30} // translucent red
	maskEdge     = color.NRGBA{R: 0xb0, G: 0x10, B: 0x10, A: 0xc0}
	bandFill     = color.NRGBA{R: 0xe0, G: 0x6c, B: 0x00, A: 0x50}
	// stageColors tell the stages apart in the noise plot (cycled).
	stageColors = []color.Color{
		color.NRGBA{R: 0xe0, G: 0x6c, B: 0x00, A: 0xff}, // orange
		color.NRGBA{R: 0x2a, G: 0x9d, B: 0x3f, A: 0xff}, // green
		color.NRGBA{R: 0x8e, G: 0x44, B: 0xad, A: 0xff}, // purple
		color.NRGBA{R: 0x7f, G: 0x7f, B: 0x7f, A: 0xff}, // grey
		color.NRGBA{R: 0xc0, G: 0x39, B: 0x2b, A: 0xff}, // red
	}
)

// engTicks are log ticks labelled in engineering notation ("100", "1k",
// "10k"): every decade labelled, with 2 and 5 labelled too when fewer than
// three decades show, and every mantissa when less than one does; spans
// narrower than a factor of 3 get linear ticks.
type engTicks struct{}

func (engTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0) || hi/lo < 3 {
		ts := plot.DefaultTicks{}.Ticks(lo, hi)
		for i := range ts {
			if ts[i].Label != "" {
				ts[i].Label = series.FormatValue(ts[i].Value, "")
			}
		}
		return ts
	}
	labelled := map[float64]bool{1: true}
	switch decades := math.Log10(hi / lo); {
	case decades < 1:
		for m := 2.0; m < 10; m++ {
			labelled[m] = true
		}
	case decades < 3:
		labelled[2], labelled[5] = true, true
	}
	var ts []plot.Tick
	for e := math.Floor(math.Log10(lo)); e <= math.Ceil(math.Log10(hi)); e++ {
		for m := 1.0; m < 10; m++ {
			v := m * math.Pow(10, e)
			if v < lo*(1-1e-9) || v > hi*(1+1e-9) {
				continue
			}
			t := plot.Tick{Value: v}
			if labelled[m] {
				t.Label = series.FormatValue(v, "")
			}
			ts = append(ts, t)
		}
	}
	return ts
}

// stepTicks are linear ticks at multiples of step, labelled, with an
// unlabelled minor tick half way.
type stepTicks struct{ step float64 }

func (t stepTicks) Ticks(lo, hi float64) []plot.Tick {
	var ts []plot.Tick
	half := t.step / 2
	for k := math.Ceil(lo / half); k*half <= hi; k++ {
		v := k * half
		if math.Mod(k, 2) == 0 {
			ts = append(ts, plot.Tick{Value: v, Label: strconv.FormatFloat(v, 'g', -1, 64)})
		} else {
			ts = append(ts, plot.Tick{Value: v})
		}
	}
	return ts
}

// gainStep is a tick step in dB giving 5 to 12 labelled ticks over span.
func gainStep(span float64) float64 {
	for _, s := range []float64{0.1, 0.2, 0.25, 0.5, 1, 2, 5, 10, 20, 25, 50, 100} {
		if span/s <= 12 {
			return s
		}
	}
	return 200
}

// phaseStep is a tick step in degrees, a multiple of 45°.
func phaseStep(span float64) float64 {
	for _, s := range []float64{45, 90, 180, 360, 720} {
		if span/s <= 10 {
			return s
		}
	}
	return 1440
}

// newPlot returns a plot with a title, axis labels, a log frequency axis
// when logX, and a light grid.
func newPlot(title, xLabel, yLabel string, logX bool) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	if logX {
		p.X.Scale = plot.LogScale{}
		p.X.Tick.Marker = engTicks{}
	}
	g := plotter.NewGrid()
	g.Vertical.Color = color.Gray{Y: 0xdd}
	g.Horizontal.Color = color.Gray{Y: 0xdd}
	p.Add(g)
	return p
}

// addLine adds a curve; dashed draws it dashed.
func addLine(p *plot.Plot, name string, xs, ys []float64, c color.Color, dashed bool) error {
	pts := make(plotter.XYs, 0, len(xs))
	for i := range xs {
		if !math.IsInf(ys[i], 0) && !math.IsNaN(ys[i]) {
			pts = append(pts, plotter.XY{X: xs[i], Y: ys[i]})
		}
	}
	l, err := plotter.NewLine(pts)
	if err != nil {
		return err
	}
	l.Color = c
	l.Width = vg.Points(1.6)
	if dashed {
		l.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
	}
	p.Add(l)
	if name != "" {
		p.Legend.Add(name, l)
	}
	return nil
}

// addMask shades the regions of the gain plane that the mask forbids,
// between the plot's frequency span [lo, hi] and gain span [yLo, yHi].
func addMask(p *plot.Plot, m filter.Spec, lo, hi, yLo, yHi float64) error {
	rect := func(x0, x1, y0, y1 float64) error {
		if x1 <= x0 {
			return nil
		}
		pg, err := plotter.NewPolygon(plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
		if err != nil {
			return err
		}
		pg.Color = maskFill
		pg.LineStyle.Color = maskEdge
		pg.LineStyle.Width = vg.Points(0.8)
		p.Add(pg)
		return nil
	}
	pass := func(x0, x1 float64) error {
		if err := rect(x0, x1, 0, yHi); err != nil {
			return err
		}
		return rect(x0, x1, yLo, -m.RippleDB)
	}
	stop := func(x0, x1 float64) error { return rect(x0, x1, -m.AttenDB, yHi) }
	var err error
	switch m.Band {
	case filter.Lowpass:
		err = errorsJoin(pass(lo, m.PassHz[0]), stop(m.StopHz[0], hi))
	case filter.Highpass:
		err = errorsJoin(stop(lo, m.StopHz[0]), pass(m.PassHz[0], hi))
	case filter.Bandpass:
		err = errorsJoin(stop(lo, m.StopHz[0]), pass(m.PassHz[0], m.PassHz[1]), stop(m.StopHz[1], hi))
	default:
		err = errorsJoin(pass(lo, m.PassHz[0]), stop(m.StopHz[0], m.StopHz[1]), pass(m.PassHz[1], hi))
	}
	if err != nil {
		return err
	}
	// One legend entry for all the shaded regions.
	key, err := plotter.NewPolygon(plotter.XYs{{X: lo, Y: yHi}, {X: lo, Y: yHi}, {X: lo, Y: yHi}})
	if err != nil {
		return err
	}
	key.Color = maskFill
	key.LineStyle.Color = maskEdge
	p.Legend.Add("mask: forbidden", key)
	return nil
}

func errorsJoin(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

// timeUnit picks seconds, milliseconds or microseconds for a span of t
// seconds, returning the unit's name and its size in seconds.
func timeUnit(t float64) (string, float64) {
	switch {
	case t >= 1:
		return "s", 1
	case t >= 1e-3:
		return "ms", 1e-3
	default:
		return "µs", 1e-6
	}
}

// writePlots renders the four PNG plots of r into dir and returns their
// names.
func writePlots(dir string, r pipeline.Result) ([]string, error) {
	m := r.Doc.Request.Mask
	snapped, err := r.SnappedTransfer()
	if err != nil {
		return nil, err
	}
	lo, hi := pipeline.PlotRange(m)
	f := floats.LogSpan(make([]float64, sweepPoints), lo, hi)
	sd := response.Sweep(r.Design, f)
	ss := response.Sweep(snapped, f)
	col := func(pts []response.Point, get func(response.Point) float64) []float64 {
		out := make([]float64, len(pts))
		for i, pt := range pts {
			out[i] = get(pt)
		}
		return out
	}
	gain := func(pt response.Point) float64 { return pt.GainDB }
	phase := func(pt response.Point) float64 { return pt.PhaseDeg }
	partsName := fmt.Sprintf("snapped parts (%s R, %s C)", r.Doc.Request.ResistorSeries, r.Doc.Request.CapacitorSeries)
	designName := fmt.Sprintf("design (%s, order %d)", r.Doc.Family, r.Doc.Order)
	yLo, yHi := -(m.AttenDB + 40), 10.0
	fLabel := "Frequency (Hz)"

	var names []string
	// save draws the plots stacked in one column and writes them as PNG
	// to name, and as SVG beside it (same name, .svg) when svg is set.
	save := func(name string, svg bool, w, h vg.Length, rows ...*plot.Plot) error {
		grid := make([][]*plot.Plot, len(rows))
		for i, p := range rows {
			grid[i] = []*plot.Plot{p}
		}
		tiles := draw.Tiles{Rows: len(rows), Cols: 1, PadX: vg.Millimeter, PadY: 4 * vg.Millimeter,
			PadTop: 2 * vg.Millimeter, PadBottom: 2 * vg.Millimeter, PadLeft: 2 * vg.Millimeter, PadRight: 4 * vg.Millimeter}
		render := func(c vg.CanvasWriterTo, file string) error {
			cs := plot.Align(grid, tiles, draw.New(c))
			for i, p := range rows {
				p.Draw(cs[i][0])
			}
			var buf bytes.Buffer
			if _, err := c.WriteTo(&buf); err != nil {
				return fmt.Errorf("plot %s: %w", file, err)
			}
			if err := os.WriteFile(filepath.Join(dir, file), buf.Bytes(), 0o644); err != nil {
				return err
			}
			names = append(names, file)
			return nil
		}
		if err := render(vgimg.PngCanvas{Canvas: vgimg.New(w, h)}, name); err != nil {
			return err
		}
		if svg {
			return render(vgsvg.New(w, h), strings.TrimSuffix(name, ".png")+".svg")
		}
		return nil
	}
	legendAt := func(p *plot.Plot, top, left bool) {
		p.Legend.Top, p.Legend.Left = top, left
		p.Legend.XOffs, p.Legend.YOffs = 0, 0
		if left {
			p.Legend.XOffs = vg.Millimeter * 2
		} else {
			p.Legend.XOffs = -vg.Millimeter * 2
		}
		if top {
			p.Legend.YOffs = -vg.Millimeter * 2
		} else {
			p.Legend.YOffs = vg.Millimeter * 2
		}
	}
	// Where the curves are not: a lowpass is low on the right, a highpass on
	// the left; band filters are low at both ends.
	gainLegendLeft := m.Band != filter.Highpass

	// 1. Bode: gain (with the mask) over phase.
	pg := newPlot("Gain: design and snapped parts against the mask", fLabel, "Gain (dB)", true)
	if err := addMask(pg, m, lo, hi, yLo, yHi); err != nil {
		return nil, err
	}
	if err := addLine(pg, designName, f, col(sd, gain), designColor, false); err != nil {
		return nil, err
	}
	if err := addLine(pg, partsName, f, col(ss, gain), snappedColor, true); err != nil {
		return nil, err
	}
	pg.X.Min, pg.X.Max, pg.Y.Min, pg.Y.Max = lo, hi, yLo, yHi
	pg.Y.Tick.Marker = stepTicks{step: gainStep(yHi - yLo)}
	legendAt(pg, false, gainLegendLeft)
	pp := newPlot("Phase (unwrapped; inversions removed)", fLabel, "Phase (degrees)", true)
	if err := addLine(pp, "design", f, col(sd, phase), designColor, false); err != nil {
		return nil, err
	}
	if err := addLine(pp, "snapped parts", f, col(ss, phase), snappedColor, true); err != nil {
		return nil, err
	}
	pp.X.Min, pp.X.Max = lo, hi
	pp.Y.Tick.Marker = stepTicks{step: phaseStep(pp.Y.Max - pp.Y.Min)}
	legendAt(pp, m.Band == filter.Lowpass || m.Band == filter.Bandpass, !(m.Band == filter.Lowpass || m.Band == filter.Bandpass))
	if err := save("bode.png", true, 20*vg.Centimeter, 22*vg.Centimeter, pg, pp); err != nil {
		return nil, err
	}

	// 2. Group delay.
	maxDelay := 0.0
	for _, pt := range sd {
		maxDelay = max(maxDelay, pt.DelayS)
	}
	du, ds := timeUnit(maxDelay)
	delay := func(pt response.Point) float64 { return pt.DelayS / ds }
	pd := newPlot("Group delay", fLabel, "Group delay ("+du+")", true)
	if err := addLine(pd, designName, f, col(sd, delay), designColor, false); err != nil {
		return nil, err
	}
	if err := addLine(pd, partsName, f, col(ss, delay), snappedColor, true); err != nil {
		return nil, err
	}
	pd.X.Min, pd.X.Max, pd.Y.Min = lo, hi, 0
	legendAt(pd, true, m.Band == filter.Highpass)
	if err := save("delay.png", false, 20*vg.Centimeter, 12*vg.Centimeter, pd); err != nil {
		return nil, err
	}

	// 3. Step response.
	span := 0.0
	if st, err := response.MeasureStep(r.Design, 0.001); err == nil {
		span = 1.5 * st.SettleS
	} else {
		slow := math.Inf(1)
		for _, p := range r.Design.Poles {
			slow = min(slow, -real(p))
		}
		span = 10 / slow
	}
	tu, ts := timeUnit(span)
	t := floats.Span(make([]float64, 2000), 0, span)
	yd, err := response.Step(r.Design, t)
	if err != nil {
		return nil, err
	}
	ys, err := response.Step(snapped, t)
	if err != nil {
		return nil, err
	}
	tScaled := make([]float64, len(t))
	for i := range t {
		tScaled[i] = t[i] / ts
	}
	pst := newPlot("Step response (1 V step at the input)", "Time ("+tu+")", "Output (V)", false)
	if err := addLine(pst, designName, tScaled, yd, designColor, false); err != nil {
		return nil, err
	}
	if err := addLine(pst, partsName, tScaled, ys, snappedColor, true); err != nil {
		return nil, err
	}
	pst.X.Min, pst.X.Max = 0, span/ts
	pst.X.Tick.Marker = stepTicks{step: gainStep(span / ts)}
	pst.Y.Tick.Marker = stepTicks{step: gainStep(pst.Y.Max - pst.Y.Min)}
	legendAt(pst, false, false)
	if err := save("step.png", false, 20*vg.Centimeter, 12*vg.Centimeter, pst); err != nil {
		return nil, err
	}

	// 4. Output noise density of the snapped chain: the total and each
	// stage's own share carried to the output (Chain.NoiseSources summed
	// in power per stage), over the plot range.
	nz := r.Doc.Noise
	nm := topology.Noise{AmpVoltage: nz.AmpNoiseNV * 1e-9, AmpCurrent: nz.AmpNoisePA * 1e-12}
	nf := floats.LogSpan(make([]float64, 200), lo, hi)
	total := make([]float64, len(nf))
	perStage := make([][]float64, len(r.Snapped.Circuits))
	for k := range perStage {
		perStage[k] = make([]float64, len(nf))
	}
	for i, fz := range nf {
		src, err := r.Snapped.NoiseSources(nm, fz)
		if err != nil {
			return nil, err
		}
		sum := 0.0
		for _, s := range src {
			p := s.Density * s.Density
			perStage[s.Stage][i] += p
			sum += p
		}
		total[i] = 1e9 * math.Sqrt(sum)
	}
	pn := newPlot(fmt.Sprintf("Output noise: %.3g µV RMS from %s to %s", nz.RMSUV, hz(nz.BandHz[0]), hz(nz.BandHz[1])),
		fLabel, "Noise density (nV/√Hz)", true)
	if err := addLine(pn, "total", nf, total, designColor, false); err != nil {
		return nil, err
	}
	for k, ps := range perStage {
		ys := make([]float64, len(ps))
		for i, p := range ps {
			ys[i] = 1e9 * math.Sqrt(p)
		}
		c := stageColors[k%len(stageColors)]
		if err := addLine(pn, fmt.Sprintf("stage U%d's own", k+1), nf, ys, c, true); err != nil {
			return nil, err
		}
	}
	pn.X.Min, pn.X.Max, pn.Y.Min = lo, hi, 0
	legendAt(pn, true, m.Band == filter.Highpass)
	if err := save("noise.png", false, 20*vg.Centimeter, 12*vg.Centimeter, pn); err != nil {
		return nil, err
	}

	// 5. Monte Carlo envelope against the mask, full span and passband.
	sp := r.Spread
	if len(sp.EnvelopeDB) != len(pipeline.EnvelopePercentiles) {
		return nil, fmt.Errorf("Monte Carlo envelope missing")
	}
	lowEnv, med, highEnv := sp.EnvelopeDB[0], sp.EnvelopeDB[1], sp.EnvelopeDB[2]
	envName := fmt.Sprintf("%g–%g percentile of %d boards", pipeline.EnvelopePercentiles[0], pipeline.EnvelopePercentiles[2], sp.Trials)
	mcPlot := func(title string, x0, x1, y0, y1 float64) (*plot.Plot, error) {
		p := newPlot(title, fLabel, "Gain (dB)", true)
		if err := addMask(p, m, lo, hi, yLo, yHi); err != nil {
			return nil, err
		}
		ring := make(plotter.XYs, 0, 2*len(sp.Hz))
		for i, fz := range sp.Hz {
			ring = append(ring, plotter.XY{X: fz, Y: math.Max(highEnv[i], yLo)})
		}
		for i := len(sp.Hz) - 1; i >= 0; i-- {
			ring = append(ring, plotter.XY{X: sp.Hz[i], Y: math.Max(lowEnv[i], yLo)})
		}
		band, err := plotter.NewPolygon(ring)
		if err != nil {
			return nil, err
		}
		band.Color = bandFill
		band.LineStyle.Width = 0
		p.Add(band)
		p.Legend.Add(envName, band)
		if err := addLine(p, "median board", sp.Hz, med, snappedColor, false); err != nil {
			return nil, err
		}
		if err := addLine(p, "design", f, col(sd, gain), designColor, true); err != nil {
			return nil, err
		}
		p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = x0, x1, y0, y1
		p.Y.Tick.Marker = stepTicks{step: gainStep(y1 - y0)}
		return p, nil
	}
	full, err := mcPlot(fmt.Sprintf("Monte Carlo gain envelope: yield %.1f %%", r.Doc.MonteCarlo.YieldPct), lo, hi, yLo, yHi)
	if err != nil {
		return nil, err
	}
	legendAt(full, false, gainLegendLeft)
	pass, err := series.PassbandOf(m)
	if err != nil {
		return nil, err
	}
	zx0, zx1 := max(pass[0].LoHz/1.2, lo), min(pass[len(pass)-1].HiHz*1.2, hi)
	zoom, err := mcPlot("Passband detail", zx0, zx1, -m.RippleDB-1, 0.75)
	if err != nil {
		return nil, err
	}
	legendAt(zoom, false, gainLegendLeft)
	zoom.Legend = plot.NewLegend() // the upper plot carries the legend
	if err := save("montecarlo.png", false, 20*vg.Centimeter, 22*vg.Centimeter, full, zoom); err != nil {
		return nil, err
	}
	return names, nil
}
