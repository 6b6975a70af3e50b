package pipeline

import (
	"github.com/rolloff/rolloff/filter"
)

// Version is the value of Document.Version for documents of this layout.
// A change that renames or removes a field, or changes a field's meaning,
// gets a new version; adding a field does not.
const Version = "rolloff.design/v1"

// Caution is the one-line caution every document carries and the examples
// print.
const Caution = "Caution: verify this design by simulation and on the bench before use; " +
	"mains-powered or medical equipment needs review by a qualified person under local codes."

// Rule states how Rank orders the candidates, best first.
const Rule = "buildable first; then Monte Carlo yield at or above min_yield_pct; then fewest op-amps; " +
	"then least passband deviation after snapping; then lowest order; then the order of the request's families"

// Document is the result document of one design: what was asked, what was
// tried, what was chosen and how the board built from it will behave. All
// field names are stable snake_case; frequencies are in hertz (_hz), gains
// and deviations in decibels (_db), part values in ohms or farads, errors
// and tolerances in percent (_pct). It marshals with encoding/json and
// reads back to an equal value.
type Document struct {
	// Version is always Version ("rolloff.design/v1").
	Version string `json:"version"`
	// Request is the request as resolved: every default filled in.
	Request Request `json:"request"`
	// Rule is the ranking rule the choice followed (Rule).
	Rule string `json:"rule"`
	// Candidates lists every family tried, in the order of
	// Request.Families, with its figures or the reason it failed.
	Candidates []Candidate `json:"candidates"`
	// Family is the chosen family's name (one of FamilyNames).
	Family string `json:"family"`
	// Order is the chosen prototype order (bandpass and bandstop designs
	// have twice as many poles).
	Order int `json:"order"`
	// Design is the chosen transfer function, poles and zeros in rad/s
	// (filter.Transfer's JSON).
	Design filter.Transfer `json:"design"`
	// DesignMarginDB is the least margin of the design against the mask
	// (response.CheckMask; 0 means it meets the mask exactly at some edge,
	// negative would be a failure).
	DesignMarginDB float64 `json:"design_margin_db"`
	// SnappedMarginDB is the same for the snapped chain, from its parts.
	SnappedMarginDB float64 `json:"snapped_margin_db"`
	// DeviationDB is the largest |gain difference| between the snapped
	// chain and the design over the passband, in dB.
	DeviationDB float64 `json:"deviation_db"`
	// RoundedDeviationDB is the same figure for every part rounded to its
	// nearest standard value on its own, for comparison.
	RoundedDeviationDB float64 `json:"rounded_deviation_db"`
	// Inverting reports whether the chain's output is inverted.
	Inverting bool `json:"inverting"`
	// Stages are the chain's stages, input first.
	Stages []StageDoc `json:"stages"`
	// MonteCarlo is the tolerance analysis of the snapped chain.
	MonteCarlo MonteCarloDoc `json:"monte_carlo"`
	// Noise is the output noise of the snapped chain.
	Noise NoiseDoc `json:"noise"`
	// BOM is the bill of materials of the snapped chain.
	BOM []BOMLine `json:"bom"`
	// Caution is the caution line (Caution).
	Caution string `json:"caution"`
}

// Candidate is one family tried for the mask.
type Candidate struct {
	// Family is the family's name.
	Family string `json:"family"`
	// Order is the least prototype order of the family that meets the
	// mask; 0 when it failed before that.
	Order int `json:"order"`
	// OpAmps is the number of op-amps of the realized chain.
	OpAmps int `json:"op_amps"`
	// Parts is the number of resistors and capacitors.
	Parts int `json:"parts"`
	// DeviationDB is the worst passband deviation after snapping, dB.
	DeviationDB float64 `json:"deviation_db"`
	// YieldPct is the Monte Carlo yield against the mask, percent.
	YieldPct float64 `json:"yield_pct"`
	// MaxGBWHz is the largest op-amp gain-bandwidth any stage needs, Hz.
	MaxGBWHz float64 `json:"max_gbw_hz"`
	// NoiseUV is the snapped chain's output noise, µV RMS over the plot
	// range (NoiseDoc.RMSUV).
	NoiseUV float64 `json:"noise_uv"`
	// Error says why the family could not give a buildable chain; empty
	// when it could.
	Error string `json:"error,omitempty"`
}

// StageDoc is one stage of the chain: its target, its circuit, its parts
// before and after snapping, and what it asks of its op-amp.
type StageDoc struct {
	// Designator is the stage's prefix in part designators, "U1" for the
	// first stage at the input.
	Designator string `json:"designator"`
	// Target is the stage the circuit was designed for.
	Target filter.Stage `json:"target"`
	// Achieved is the stage the snapped parts realize (from the circuit
	// model).
	Achieved filter.Stage `json:"achieved"`
	// F0ErrPct, QErrPct and GainErrPct are achieved/target − 1 of the
	// pole frequency, Q and gain magnitude, in percent.
	F0ErrPct   float64 `json:"f0_err_pct"`
	QErrPct    float64 `json:"q_err_pct"`
	GainErrPct float64 `json:"gain_err_pct"`
	// Circuit is the circuit kind (topology.Kind's name).
	Circuit string `json:"circuit"`
	// OpAmps is the number of op-amps of the circuit.
	OpAmps int `json:"op_amps"`
	// Inverting reports whether the circuit inverts.
	Inverting bool `json:"inverting"`
	// Parts are the circuit's parts in its template order.
	Parts []PartDoc `json:"parts"`
	// GBWHz is the op-amp gain-bandwidth product, in hertz, this stage's
	// op-amps need to keep its f0 and Q within GBWMaxErr (1 %) of what
	// the same parts give with ideal op-amps, found by nodal analysis with
	// single-pole op-amps (topology.Circuit.RequiredGBWHz).
	GBWHz float64 `json:"gbw_hz"`
	// RuleOfThumbGBWHz is the common rule of thumb for the same stage,
	// 100·max(1, |gain|)·max(1, Q)·f0 (topology.Circuit.RuleOfThumbGBWHz),
	// for comparison.
	RuleOfThumbGBWHz float64 `json:"rule_of_thumb_gbw_hz"`
	// Swing lists how far each of the stage's op-amp outputs swings: its
	// peak gain from the chain's input over frequency
	// (topology.Chain.AmpPeaks of the snapped chain).
	Swing []SwingDoc `json:"swing"`
}

// SwingDoc is one op-amp output's peak gain from the chain's input.
type SwingDoc struct {
	// Designator is the op-amp's ("U2.U1": stage U2, its op-amp U1).
	Designator string `json:"designator"`
	// Node is the circuit node it drives ("bp", "out", ...).
	Node string `json:"node"`
	// Gain is the peak of |V(node)/V(input)|; Hz where it peaks (0: DC).
	Gain float64 `json:"gain"`
	Hz   float64 `json:"hz"`
}

// PartDoc is one resistor or capacitor of a stage.
type PartDoc struct {
	// Ref is the part's reference within the stage ("R1", "C2").
	Ref string `json:"ref"`
	// Designator is its chain-unique designator ("U1.R1").
	Designator string `json:"designator"`
	// IdealValue is the synthesized value, ohms or farads.
	IdealValue float64 `json:"ideal_value"`
	// Value is the snapped standard value, ohms or farads.
	Value float64 `json:"value"`
	// Display is Value in engineering notation with its unit ("15.8 kΩ").
	Display string `json:"display"`
	// Series is the IEC 60063 series Value belongs to ("E96"), "" for
	// none.
	Series string `json:"series"`
}

// MonteCarloDoc is the Monte Carlo tolerance analysis of the snapped chain
// against the mask.
type MonteCarloDoc struct {
	// Trials is the number of boards simulated; Passed the number that met
	// the mask at every analysis frequency; Failed the number that could
	// not be evaluated.
	Trials int `json:"trials"`
	Passed int `json:"passed"`
	Failed int `json:"failed"`
	// YieldPct is 100·Passed/Trials.
	YieldPct float64 `json:"yield_pct"`
	// Seed is the seed of the run.
	Seed uint64 `json:"seed"`
	// Distribution is "uniform" or "normal".
	Distribution string `json:"distribution"`
	// ResistorTolPct and CapacitorTolPct are the tolerances used.
	ResistorTolPct  float64 `json:"resistor_tol_pct"`
	CapacitorTolPct float64 `json:"capacitor_tol_pct"`
	// Frequencies is the number of analysis frequencies at which each
	// trial was checked against the mask.
	Frequencies int `json:"frequencies"`
}

// BOMLine is one line of the bill of materials (series.Line).
type BOMLine struct {
	// Kind is "resistor" or "capacitor".
	Kind string `json:"kind"`
	// Value is in ohms or farads; Display in engineering notation with its
	// unit; Code the IEC 60062 letter-and-digit code.
	Value   float64 `json:"value"`
	Display string  `json:"display"`
	Code    string  `json:"code"`
	// Series is the value's IEC 60063 series, "" for none.
	Series string `json:"series"`
	// TolerancePct is the parts' tolerance in percent.
	TolerancePct float64 `json:"tolerance_pct"`
	// Count is the number of parts; Refs their designators.
	Count int      `json:"count"`
	Refs  []string `json:"refs"`
}

// NoiseDoc is the output noise of the snapped chain (topology's noise
// analysis): every resistor's thermal noise at TempK and the op-amps'
// input noise of the request (white), ideal op-amps otherwise, the input
// driven by an ideal source.
type NoiseDoc struct {
	// TempK is the resistors' temperature, kelvin
	// (topology.DefaultNoiseTempK, 25 °C).
	TempK float64 `json:"temp_k"`
	// AmpNoiseNV and AmpNoisePA are the op-amp noise used (the request's).
	AmpNoiseNV float64 `json:"amp_noise_nv"`
	AmpNoisePA float64 `json:"amp_noise_pa"`
	// BandHz is the band the RMS figure integrates over: the plot range
	// (PlotRange), a decade beyond the mask's outermost edges, which is
	// what a converter behind the filter folds into its band.
	BandHz [2]float64 `json:"band_hz"`
	// RMSUV is the output noise over BandHz, µV RMS.
	RMSUV float64 `json:"rms_uv"`
	// RefHz is the passband frequency of the density figures
	// (NoiseRefHz).
	RefHz float64 `json:"ref_hz"`
	// DensityNV is the output noise density at RefHz, nV/√Hz.
	DensityNV float64 `json:"density_nv"`
	// Top lists the largest sources at RefHz, largest first (at most
	// NoiseTop).
	Top []NoiseSourceDoc `json:"top"`
}

// NoiseSourceDoc is one noise source's share of the output noise at
// NoiseDoc.RefHz.
type NoiseSourceDoc struct {
	// Designator is the resistor's designator ("U2.R3") or the op-amp's
	// ("U2.U1": stage U2, its op-amp U1).
	Designator string `json:"designator"`
	// Kind is the source kind (topology.NoiseKind's String: "resistor",
	// "amp-voltage", "amp-current+", "amp-current-").
	Kind string `json:"kind"`
	// DensityNV is its contribution to the output density, nV/√Hz.
	DensityNV float64 `json:"density_nv"`
	// SharePct is its share of the output noise power there, percent.
	SharePct float64 `json:"share_pct"`
}
