package pipeline

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/response"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// testRequest is a small lowpass request that every family but Bessel
// builds quickly (few trials).
const testRequest = `{"name": "test", "mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": 300, "seed": 3}`

func mustRun(t *testing.T, src string) Result {
	t.Helper()
	req, err := DecodeRequestBytes([]byte(src))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(req)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func TestDocumentRoundTrip(t *testing.T) {
	r := mustRun(t, testRequest)
	b, err := MarshalDocument(r.Doc)
	if err != nil {
		t.Fatal(err)
	}
	back, err := UnmarshalDocument(b)
	if err != nil {
		t.Fatal(err)
	}
	// Exact equality: encoding/json writes the shortest decimal that reads
	// back to the same float64.
	if diff := cmp.Diff(r.Doc, back); diff != "" {
		t.Errorf("round trip (-before +after):\n%s", diff)
	}
	if back.Version != Version {
		t.Errorf("version %q", back.Version)
	}
	// The field names are the documented snake_case ones.
	var generic map[string]any
	if err := json.Unmarshal(b, &generic); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"version", "request", "rule", "candidates", "family", "order", "design",
		"design_margin_db", "snapped_margin_db", "deviation_db", "rounded_deviation_db", "inverting",
		"stages", "monte_carlo", "noise", "bom", "caution"} {
		if _, ok := generic[k]; !ok {
			t.Errorf("document lacks field %q", k)
		}
	}
	if len(generic) != 17 {
		t.Errorf("document has %d fields, want 17 (a new field needs its test and its doc)", len(generic))
	}
	// A document of another version is refused.
	other := bytes.Replace(b, []byte(Version), []byte("rolloff.design/v0"), 1)
	if _, err := UnmarshalDocument(other); err == nil {
		t.Error("a v0 document was accepted")
	}
}

func TestDocumentIsConsistent(t *testing.T) {
	r := mustRun(t, testRequest)
	d := r.Doc
	if len(d.Candidates) != len(FamilyNames) {
		t.Fatalf("%d candidates, want %d", len(d.Candidates), len(FamilyNames))
	}
	chosen := d.Candidates[Rank(d.Candidates, d.Request.MinYieldPct)[0]]
	if chosen.Family != d.Family || chosen.Order != d.Order {
		t.Errorf("chosen %s/%d, document %s/%d", chosen.Family, chosen.Order, d.Family, d.Order)
	}
	// The design meets the mask with the margin asked (to CheckMask's
	// own slack), the snapped chain with what is left.
	if m := *d.Request.MarginDB; math.Abs(d.DesignMarginDB-m) > 1e-4 {
		t.Errorf("design margin %g dB, want the requested %g dB", d.DesignMarginDB, m)
	}
	if d.DeviationDB > d.RoundedDeviationDB {
		t.Errorf("snapping (%g dB) worse than rounding (%g dB)", d.DeviationDB, d.RoundedDeviationDB)
	}
	// Per stage: the parts in the document are those of the snapped
	// chain, the achieved stage is the circuit's, GBW is positive.
	nParts := 0
	for i, s := range d.Stages {
		c := r.Snapped.Circuits[i]
		if len(s.Parts) != len(c.Parts) {
			t.Fatalf("stage %d: %d parts, chain %d", i, len(s.Parts), len(c.Parts))
		}
		for k, p := range s.Parts {
			if p.Value != c.Parts[k].Value || p.Ref != c.Parts[k].Ref {
				t.Errorf("stage %d part %d: %+v vs %+v", i, k, p, c.Parts[k])
			}
			if p.Series == "" {
				t.Errorf("%s = %g is on no series", p.Designator, p.Value)
			}
		}
		nParts += len(s.Parts)
		ach, err := c.Achieved()
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(ach, s.Achieved); diff != "" {
			t.Errorf("stage %d achieved:\n%s", i, diff)
		}
		if !(s.GBWHz > 0) || !(s.RuleOfThumbGBWHz > 0) {
			t.Errorf("stage %d: GBW %g, rule %g", i, s.GBWHz, s.RuleOfThumbGBWHz)
		}
		// One swing figure per op-amp; the stage output's is at least the
		// chain's gain up to it at every analysis frequency.
		if len(s.Swing) != c.OpAmps() {
			t.Errorf("stage %d: %d swing figures for %d op-amps", i, len(s.Swing), c.OpAmps())
		}
		for _, w := range s.Swing {
			if w.Node != "out" {
				continue
			}
			upTo := topology.Chain{Circuits: r.Snapped.Circuits[:i+1]}
			for _, f := range AnalysisHz(d.Request.Mask) {
				if g := abs(upTo.AtHz(f)); g > w.Gain*(1+1e-12) {
					t.Errorf("stage %d output: |H| %g at %g Hz above its peak %g", i, g, f, w.Gain)
					break
				}
			}
		}
	}
	bomParts := 0
	for _, l := range d.BOM {
		bomParts += l.Count
		if len(l.Refs) != l.Count {
			t.Errorf("BOM line %+v: count and refs disagree", l)
		}
	}
	if bomParts != nParts {
		t.Errorf("BOM holds %d parts, stages %d", bomParts, nParts)
	}
	// The noise figures are the snapped chain's, with the request's
	// op-amp noise, the largest sources first.
	nz := d.Noise
	if nz.AmpNoiseNV != DefaultAmpNoiseNV || nz.AmpNoisePA != DefaultAmpNoisePA || nz.TempK != topology.DefaultNoiseTempK {
		t.Errorf("noise model %+v", nz)
	}
	tn := topology.Noise{AmpVoltage: 1e-9 * nz.AmpNoiseNV, AmpCurrent: 1e-12 * nz.AmpNoisePA}
	dens, err := r.Snapped.NoiseAt(tn, nz.RefHz)
	if err != nil {
		t.Fatal(err)
	}
	rms, err := r.Snapped.NoiseRMS(tn, nz.BandHz[0], nz.BandHz[1])
	if err != nil {
		t.Fatal(err)
	}
	if nz.DensityNV != dens*1e9 || nz.RMSUV != rms*1e6 || nz.RefHz != NoiseRefHz(d.Request.Mask) {
		t.Errorf("noise %+v, chain %g nV/√Hz, %g µV", nz, dens*1e9, rms*1e6)
	}
	if len(nz.Top) != NoiseTop {
		t.Fatalf("%d top sources, want %d", len(nz.Top), NoiseTop)
	}
	share := 0.0
	for i, s := range nz.Top {
		share += s.SharePct
		if i > 0 && s.DensityNV > nz.Top[i-1].DensityNV {
			t.Errorf("top sources out of order: %+v", nz.Top)
		}
		if math.Abs(s.SharePct-100*(s.DensityNV/nz.DensityNV)*(s.DensityNV/nz.DensityNV)) > 1e-9 {
			t.Errorf("source %+v: share and density disagree", s)
		}
	}
	if !(share > 0 && share <= 100+1e-9) {
		t.Errorf("top sources' shares sum to %g %%", share)
	}
	if d.MonteCarlo.Trials != 300 || d.MonteCarlo.Seed != 3 {
		t.Errorf("Monte Carlo %+v", d.MonteCarlo)
	}
	// The snapped transfer function equals the snapped chain in magnitude
	// and the design in sign.
	h, err := r.SnappedTransfer()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []float64{10, 500, 1000, 3000} {
		a, b := h.AtHz(f), r.Snapped.AtHz(f)
		if math.Abs(abs(a)/abs(b)-1) > 1e-9 {
			t.Errorf("%g Hz: |snapped transfer| %g, |chain| %g", f, abs(a), abs(b))
		}
	}
	if real(h.AtHz(10)) <= 0 {
		t.Error("snapped transfer not sign-matched to the design at DC")
	}
}

func abs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }

// TestMonteCarloCriterion checks the glue between the margin and
// series.Analysis: with every part exact (a tolerance far below anything
// that moves the gain) every board of a design with margin passes, and
// a design with zero margin passes too (it meets the mask to rounding).
func TestMonteCarloCriterion(t *testing.T) {
	for _, src := range []string{
		`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": 50,
		  "families": ["butterworth"], "resistor_tol_pct": 1e-9, "capacitor_tol_pct": 1e-9}`,
	} {
		r := mustRun(t, src)
		if r.Doc.MonteCarlo.YieldPct != 100 {
			t.Errorf("near-exact parts: yield %g %%", r.Doc.MonteCarlo.YieldPct)
		}
	}
	// Much wider tolerances lose yield: the criterion does bite.
	r := mustRun(t, `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": 300,
		"families": ["chebyshev"], "capacitor_series": "E6", "capacitor_tol_pct": 20}`)
	if r.Doc.MonteCarlo.YieldPct > 80 {
		t.Errorf("20 %% capacitors on a Chebyshev: yield %g %%, implausibly high", r.Doc.MonteCarlo.YieldPct)
	}
}

func TestResolveDefaultsAndIdempotent(t *testing.T) {
	req, err := DecodeRequestBytes([]byte(`{"mask": {"band": "highpass", "pass_hz": [100], "stop_hz": [25], "ripple_db": 1, "atten_db": 40}}`))
	if err != nil {
		t.Fatal(err)
	}
	r1, err := req.Resolve()
	if err != nil {
		t.Fatal(err)
	}
	if r1.ResistorSeries != "E96" || r1.CapacitorSeries != "E12" || r1.Trials != DefaultTrials || r1.Seed != DefaultSeed ||
		r1.Kind != "auto" || r1.Distribution != "uniform" || r1.ResistorTolPct != 1 || r1.CapacitorTolPct != 10 ||
		*r1.MarginDB != 0.25 || r1.MinYieldPct != DefaultMinYieldPct || len(r1.Families) != len(FamilyNames) {
		t.Errorf("defaults: %+v (margin %g)", r1, *r1.MarginDB)
	}
	r2, err := r1.Resolve()
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(r1, r2); diff != "" {
		t.Errorf("resolving twice changes the request:\n%s", diff)
	}
	// Names are taken in any case and written canonically.
	req.ResistorSeries, req.Families, req.Kind = "e24", []string{" Elliptic"}, "SALLEN-KEY"
	r3, err := req.Resolve()
	if err != nil {
		t.Fatal(err)
	}
	if r3.ResistorSeries != "E24" || r3.Families[0] != "elliptic" || r3.Kind != "sallen-key" {
		t.Errorf("canonical names: %+v", r3)
	}
}

func TestBadRequests(t *testing.T) {
	const mask = `"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}`
	for _, c := range []struct {
		body, field string
		also        error // a layer sentinel the error must also match, if any
	}{
		{`{` + mask + `, "trails": 5}`, "trails", nil},
		{`{` + mask + `, "trials": "many"}`, "trials", nil},
		{`{` + mask + `, "trials": -1}`, "trials", nil},
		{`{` + mask + `, "trials": 1000000000}`, "trials", nil},
		{`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2}}`, "mask", filter.ErrFormat},
		{`{"mask": {"band": "sideways", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}}`, "mask", filter.ErrSpec},
		{`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [500], "ripple_db": 2, "atten_db": 50}}`, "mask", filter.ErrSpec},
		{`{"trials": 5}`, "mask", nil},
		{`{` + mask + `, "families": ["butterworth", "chebychev"]}`, "families[1]", nil},
		{`{` + mask + `, "families": ["bessel", "bessel"]}`, "families[1]", nil},
		{`{` + mask + `, "kind": "twin-tee"}`, "kind", topology.ErrKind},
		{`{` + mask + `, "resistor_series": "E25"}`, "resistor_series", series.ErrSeries},
		{`{` + mask + `, "capacitor_series": "X7R"}`, "capacitor_series", series.ErrSeries},
		{`{` + mask + `, "resistor_tol_pct": -1}`, "resistor_tol_pct", nil},
		{`{` + mask + `, "capacitor_tol_pct": 60}`, "capacitor_tol_pct", nil},
		{`{` + mask + `, "distribution": "cauchy"}`, "distribution", nil},
		{`{` + mask + `, "cap_f": -1e-9}`, "cap_f", nil},
		{`{` + mask + `, "margin_db": 1}`, "margin_db", nil},
		{`{` + mask + `, "margin_db": -0.1}`, "margin_db", nil},
		{`{` + mask + `, "min_yield_pct": 101}`, "min_yield_pct", nil},
		{`{` + mask + `, "seed": -3}`, "seed", nil},
		{`{` + mask + `, "amp_noise_nv": -4}`, "amp_noise_nv", nil},
		{`{` + mask + `, "amp_noise_pa": 1e9}`, "amp_noise_pa", nil},
		{`{` + mask + `} {}`, "", nil},
		{`{` + mask, "", nil},
		{``, "", nil},
		{`[1, 2]`, "", nil},
		{`{"mask": 7}`, "mask", nil},
	} {
		req, err := DecodeRequestBytes([]byte(c.body))
		if err == nil {
			_, err = Run(req)
		}
		var fe *FieldError
		if !errors.As(err, &fe) || !errors.Is(err, ErrRequest) {
			t.Errorf("%s: error %v is not a FieldError wrapping ErrRequest", c.body, err)
			continue
		}
		if fe.Field != c.field {
			t.Errorf("%s: field %q, want %q (%v)", c.body, fe.Field, c.field, err)
		}
		if c.also != nil && !errors.Is(err, c.also) {
			t.Errorf("%s: %v does not match %v", c.body, err, c.also)
		}
		if c.field != "" && !strings.Contains(err.Error(), "field "+c.field) {
			t.Errorf("%s: message %q does not name the field", c.body, err)
		}
	}
}

func TestNoBuildableDesign(t *testing.T) {
	// Only Bessel, on a mask far too sharp for it.
	req, err := DecodeRequestBytes([]byte(`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [1100], "ripple_db": 1, "atten_db": 80}, "families": ["bessel"]}`))
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(req)
	if !errors.Is(err, ErrDesign) || !strings.Contains(err.Error(), "bessel") {
		t.Errorf("error %v", err)
	}
	if errors.Is(err, ErrRequest) {
		t.Error("a valid request reported as bad")
	}
}

func TestRankRule(t *testing.T) {
	c := []Candidate{
		{Family: "a", Order: 5, OpAmps: 3, DeviationDB: 0.1, YieldPct: 50},
		{Family: "b", Error: "failed"},
		{Family: "c", Order: 7, OpAmps: 4, DeviationDB: 0.02, YieldPct: 95},
		{Family: "d", Order: 4, OpAmps: 4, DeviationDB: 0.02, YieldPct: 99},
		{Family: "e", Order: 6, OpAmps: 4, DeviationDB: 0.01, YieldPct: 91},
		{Family: "f", Order: 4, OpAmps: 4, DeviationDB: 0.02, YieldPct: 92},
	}
	got := Rank(c, 90)
	// e: fewest op-amps among those reaching 90 %, then least deviation;
	// d before c by order, d before f by index; a misses the yield; b fails.
	want := []int{4, 3, 5, 2, 0, 1}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("rank (-want +got):\n%s", diff)
	}
}

func TestRunDeterministic(t *testing.T) {
	a := mustRun(t, testRequest)
	b := mustRun(t, testRequest)
	x, _ := MarshalDocument(a.Doc)
	y, _ := MarshalDocument(b.Doc)
	if !bytes.Equal(x, y) {
		t.Error("two runs of one request give different documents")
	}
}

func TestEvaluateOneFamilyAndKind(t *testing.T) {
	req, err := DecodeRequestBytes([]byte(`{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "kind": "multiple-feedback", "trials": 100}`))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Evaluate(req, "butterworth")
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Doc.Candidates) != 1 || r.Doc.Family != "butterworth" {
		t.Errorf("candidates %+v", r.Doc.Candidates)
	}
	for _, s := range r.Doc.Stages {
		want := "multiple-feedback"
		if s.Target.Order == 1 {
			want = topology.AutoKind(s.Target).String()
		}
		if s.Circuit != want {
			t.Errorf("%s: circuit %s, want %s", s.Designator, s.Circuit, want)
		}
	}
	chk, err := response.CheckMask(r.Snapped, req.Mask)
	if err != nil || chk.MarginDB != r.Doc.SnappedMarginDB {
		t.Errorf("snapped margin %g, CheckMask %+v %v", r.Doc.SnappedMarginDB, chk.MarginDB, err)
	}
}

func TestAnalysisHz(t *testing.T) {
	m := filter.Spec{Band: filter.Bandstop, PassHz: [2]float64{100, 1000}, StopHz: [2]float64{250, 400}, RippleDB: 1, AttenDB: 30}
	hz := AnalysisHz(m)
	for i := 1; i < len(hz); i++ {
		if !(hz[i] > hz[i-1]) {
			t.Fatalf("not strictly ascending at %d: %g, %g", i, hz[i-1], hz[i])
		}
	}
	for _, e := range []float64{100, 1000, 250, 400} {
		found := false
		for _, f := range hz {
			found = found || f == e
		}
		if !found {
			t.Errorf("edge %g Hz missing", e)
		}
	}
	lo, hi := PlotRange(m)
	if hz[0] != lo || hz[len(hz)-1] != hi {
		t.Errorf("span [%g, %g], want [%g, %g]", hz[0], hz[len(hz)-1], lo, hi)
	}
}

// BenchmarkRun times the whole pipeline on the test request, every family,
// to size a server's worker pool: one design is a few hundred
// milliseconds of CPU at most.
func BenchmarkRun(b *testing.B) {
	req, err := DecodeRequestBytes([]byte(testRequest))
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Run(req); err != nil {
			b.Fatal(err)
		}
	}
}
