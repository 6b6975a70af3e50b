package pipeline

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// ErrRequest reports a request that cannot be designed as stated: JSON that
// does not decode, an unknown field, a bad mask, an unknown family, series,
// circuit kind or distribution, a tolerance or trial count out of range.
// Every such error is a *FieldError wrapping ErrRequest.
var ErrRequest = errors.New("pipeline: bad request")

// ErrDocument reports a result document that UnmarshalDocument refuses:
// JSON that does not decode strictly, another version, or a request inside
// it that does not resolve (then ErrRequest is wrapped too).
var ErrDocument = errors.New("pipeline: bad document")

// ErrDesign reports a valid request that no candidate can realize: every
// family failed (too high an order, a stage no circuit of the kind can
// build, parts out of range). The message lists each family's reason.
var ErrDesign = errors.New("pipeline: no buildable design")

// FieldError is a request error tied to one field of the request document,
// named by its JSON path ("mask", "families[1]", "trials"; "" for the
// document as a whole).
type FieldError struct {
	Field string // JSON path of the offending field, "" for the whole body
	Err   error  // what is wrong; wraps ErrRequest (and the layer's sentinel)
}

// Error returns "pipeline: field <path>: <reason>".
func (e *FieldError) Error() string {
	if e.Field == "" {
		return "pipeline: request: " + e.Err.Error()
	}
	return "pipeline: field " + e.Field + ": " + e.Err.Error()
}

// Unwrap returns the underlying error, so errors.Is matches ErrRequest and
// the layer's own sentinel (filter.ErrSpec, series.ErrSeries, ...).
func (e *FieldError) Unwrap() error { return e.Err }

func fieldErr(field string, err error) error {
	if !errors.Is(err, ErrRequest) {
		err = fmt.Errorf("%w: %w", err, ErrRequest)
	}
	return &FieldError{Field: field, Err: err}
}

// Request is the input document: a mask and the policy to meet it with.
// Zero fields take the defaults listed (Resolve fills them in), so
// {"mask": {...}} alone is a complete request.
type Request struct {
	// Name labels the design (a channel or product name); free text, may
	// be empty.
	Name string `json:"name,omitempty"`
	// Mask is the specification the filter must meet (filter.Spec's JSON:
	// band, pass_hz, stop_hz, ripple_db, atten_db). Required.
	Mask filter.Spec `json:"mask"`
	// Families lists the approximation families to try, by the names of
	// FamilyNames; empty means all of them.
	Families []string `json:"families,omitempty"`
	// Kind is the circuit kind for the second-order stages, by
	// topology.Kind's name ("sallen-key", "multiple-feedback", ...);
	// empty or "auto" lets topology choose per stage. First-order stages
	// that kind cannot realize take an RC + follower
	// (topology.Options.FirstOrder).
	Kind string `json:"kind,omitempty"`
	// ResistorSeries is the IEC 60063 series resistors are snapped to;
	// default "E96".
	ResistorSeries string `json:"resistor_series,omitempty"`
	// CapacitorSeries is the IEC 60063 series capacitors are snapped to;
	// default "E12".
	CapacitorSeries string `json:"capacitor_series,omitempty"`
	// ResistorTolPct is the resistor tolerance in percent for the Monte
	// Carlo run; 0 means the series' customary tolerance (1 % for E96).
	ResistorTolPct float64 `json:"resistor_tol_pct,omitempty"`
	// CapacitorTolPct is the capacitor tolerance in percent; 0 means the
	// series' customary tolerance (10 % for E12).
	CapacitorTolPct float64 `json:"capacitor_tol_pct,omitempty"`
	// Distribution is the distribution of part values in the Monte Carlo
	// run, "uniform" (the default) or "normal" (tolerance = 3σ).
	Distribution string `json:"distribution,omitempty"`
	// CapF is the reference capacitor of each stage in farads; 0 lets
	// topology pick one per stage (resistors near 10 kΩ).
	CapF float64 `json:"cap_f,omitempty"`
	// Trials is the number of Monte Carlo trials, 1 to MaxTrials; default
	// DefaultTrials.
	Trials int `json:"trials,omitempty"`
	// Seed seeds the Monte Carlo run (same seed, same yield, bit for
	// bit); default 1.
	Seed uint64 `json:"seed,omitempty"`
	// MarginDB is the design margin in dB, left on every limit of the mask
	// for part tolerances: the filter is designed for a passband ripple of
	// RippleDB − 2·MarginDB and its gain lowered by MarginDB, so its
	// passband lies in [−RippleDB + MarginDB, −MarginDB] dB and its
	// stopband at or below −AttenDB − MarginDB. Margins, deviation and
	// yield are measured against the mask as given. Absent (null) means
	// the default, a quarter of the ripple but at most 0.5 dB; 0 designs
	// to the mask itself (every limit touched, no room for tolerances). It
	// must be below RippleDB/2.
	MarginDB *float64 `json:"margin_db,omitempty"`
	// MinYieldPct is the Monte Carlo yield, in percent, a candidate must
	// reach to rank above those that do not (see Rule); 0 means
	// DefaultMinYieldPct. At most 100.
	MinYieldPct float64 `json:"min_yield_pct,omitempty"`
	// AmpNoiseNV is the op-amp input voltage noise density, nV/√Hz, of
	// the noise figures (Document.Noise); 0 means DefaultAmpNoiseNV. At
	// most MaxAmpNoise.
	AmpNoiseNV float64 `json:"amp_noise_nv,omitempty"`
	// AmpNoisePA is the op-amp input current noise density at each input,
	// pA/√Hz; 0 means DefaultAmpNoisePA. At most MaxAmpNoise.
	AmpNoisePA float64 `json:"amp_noise_pa,omitempty"`
}

// Defaults and limits of a Request.
const (
	DefaultResistorSeries  = "E96"
	DefaultCapacitorSeries = "E12"
	DefaultTrials          = 2000
	DefaultSeed            = 1
	DefaultMinYieldPct     = 90
	MaxTrials              = 200000
	// DefaultAmpNoiseNV and DefaultAmpNoisePA are a general-purpose
	// precision op-amp's input noise, 10 nV/√Hz and 1 pA/√Hz (common
	// practice; low-noise audio parts reach 1 nV/√Hz, JFET-input parts
	// have far less current noise).
	DefaultAmpNoiseNV = 10
	DefaultAmpNoisePA = 1
	MaxAmpNoise       = 1e4
)

// FamilyNames lists the family names a Request accepts, in the order they
// are tried (and listed in a Document): Butterworth, Chebyshev (ripple of
// the mask), inverse Chebyshev (attenuation of the mask), elliptic (both),
// Bessel (−3.01 dB corner normalization).
var FamilyNames = []string{"butterworth", "chebyshev", "inverse-chebyshev", "elliptic", "bessel"}

// familyOf returns the filter.Family for a name of FamilyNames. The
// families' own ripple and attenuation are left zero, so Design takes the
// mask's.
func familyOf(name string) (filter.Family, bool) {
	switch name {
	case "butterworth":
		return filter.Butterworth{}, true
	case "chebyshev":
		return filter.Chebyshev{}, true
	case "inverse-chebyshev":
		return filter.InverseChebyshev{}, true
	case "elliptic":
		return filter.Elliptic{}, true
	case "bessel":
		return filter.Bessel{Norm: filter.BesselCorner}, true
	}
	return nil, false
}

// policy is a resolved request in the library's own types.
type policy struct {
	families []string
	kind     topology.Kind
	res, cap series.Series
	tol      series.Tolerances
	dist     series.Distribution
	// designMask is the mask tightened by the margin; gainScale lowers the
	// design's gain into the middle of the passband window.
	designMask filter.Spec
	gainScale  float64
}

// Resolve returns r with every default filled in (names in canonical
// form) and checks every field; the error is a *FieldError wrapping
// ErrRequest. A resolved request resolves to itself.
func (r Request) Resolve() (Request, error) {
	_, out, err := r.resolve()
	return out, err
}

func (r Request) resolve() (policy, Request, error) {
	var p policy
	if r.Mask.Band == 0 {
		return p, r, fieldErr("mask", errors.New("missing: a mask with band, pass_hz, stop_hz, ripple_db and atten_db is required"))
	}
	if err := r.Mask.Validate(); err != nil {
		return p, r, fieldErr("mask", err)
	}
	if len(r.Families) == 0 {
		r.Families = append([]string(nil), FamilyNames...)
	} else {
		r.Families = append([]string(nil), r.Families...)
	}
	seen := map[string]bool{}
	for i, name := range r.Families {
		name = strings.ToLower(strings.TrimSpace(name))
		if _, ok := familyOf(name); !ok {
			return p, r, fieldErr(fmt.Sprintf("families[%d]", i), fmt.Errorf("unknown family %q (want one of %s)", r.Families[i], strings.Join(FamilyNames, ", ")))
		}
		if seen[name] {
			return p, r, fieldErr(fmt.Sprintf("families[%d]", i), fmt.Errorf("family %q listed twice", name))
		}
		seen[name] = true
		r.Families[i] = name
	}
	p.families = r.Families
	if r.Kind == "" {
		r.Kind = topology.Auto.String()
	}
	k, err := topology.ParseKind(strings.ToLower(strings.TrimSpace(r.Kind)))
	if err != nil {
		return p, r, fieldErr("kind", err)
	}
	p.kind, r.Kind = k, k.String()
	if r.ResistorSeries == "" {
		r.ResistorSeries = DefaultResistorSeries
	}
	if p.res, err = series.ParseSeries(r.ResistorSeries); err != nil {
		return p, r, fieldErr("resistor_series", err)
	}
	r.ResistorSeries = p.res.String()
	if r.CapacitorSeries == "" {
		r.CapacitorSeries = DefaultCapacitorSeries
	}
	if p.cap, err = series.ParseSeries(r.CapacitorSeries); err != nil {
		return p, r, fieldErr("capacitor_series", err)
	}
	r.CapacitorSeries = p.cap.String()
	if r.ResistorTolPct == 0 {
		r.ResistorTolPct = 100 * p.res.Tolerance()
	}
	if r.CapacitorTolPct == 0 {
		r.CapacitorTolPct = 100 * p.cap.Tolerance()
	}
	for _, t := range []struct {
		field string
		pct   float64
	}{{"resistor_tol_pct", r.ResistorTolPct}, {"capacitor_tol_pct", r.CapacitorTolPct}} {
		if !(t.pct > 0 && t.pct < 50) {
			return p, r, fieldErr(t.field, fmt.Errorf("tolerance %g %% (want 0 < tolerance < 50 %%)", t.pct))
		}
	}
	p.tol = series.Tolerances{Resistor: r.ResistorTolPct / 100, Capacitor: r.CapacitorTolPct / 100, Override: true}
	switch strings.ToLower(strings.TrimSpace(r.Distribution)) {
	case "", "uniform":
		p.dist, r.Distribution = series.Uniform, series.Uniform.String()
	case "normal":
		p.dist, r.Distribution = series.Normal, series.Normal.String()
	default:
		return p, r, fieldErr("distribution", fmt.Errorf("unknown distribution %q (want uniform or normal)", r.Distribution))
	}
	if r.CapF < 0 || math.IsNaN(r.CapF) || math.IsInf(r.CapF, 0) {
		return p, r, fieldErr("cap_f", fmt.Errorf("reference capacitor %g F (want 0 for automatic, or a positive value)", r.CapF))
	}
	if r.Trials == 0 {
		r.Trials = DefaultTrials
	}
	if r.Trials < 1 || r.Trials > MaxTrials {
		return p, r, fieldErr("trials", fmt.Errorf("%d trials (want 1 to %d)", r.Trials, MaxTrials))
	}
	if r.Seed == 0 {
		r.Seed = DefaultSeed
	}
	if r.MarginDB == nil {
		m := min(r.Mask.RippleDB/4, 0.5)
		r.MarginDB = &m
	} else {
		m := *r.MarginDB
		r.MarginDB = &m // the resolved request shares no memory with r
	}
	if m := *r.MarginDB; !(m >= 0 && m < r.Mask.RippleDB/2) || math.IsInf(m, 0) {
		return p, r, fieldErr("margin_db", fmt.Errorf("design margin %g dB (want 0 <= margin < ripple_db/2 = %g)", m, r.Mask.RippleDB/2))
	}
	if r.MinYieldPct == 0 {
		r.MinYieldPct = DefaultMinYieldPct
	}
	if !(r.MinYieldPct > 0 && r.MinYieldPct <= 100) {
		return p, r, fieldErr("min_yield_pct", fmt.Errorf("yield target %g %% (want 0 < target <= 100)", r.MinYieldPct))
	}
	if r.AmpNoiseNV == 0 {
		r.AmpNoiseNV = DefaultAmpNoiseNV
	}
	if r.AmpNoisePA == 0 {
		r.AmpNoisePA = DefaultAmpNoisePA
	}
	for _, a := range []struct {
		field, unit string
		v           float64
	}{{"amp_noise_nv", "nV/√Hz", r.AmpNoiseNV}, {"amp_noise_pa", "pA/√Hz", r.AmpNoisePA}} {
		if !(a.v > 0 && a.v <= MaxAmpNoise) {
			return p, r, fieldErr(a.field, fmt.Errorf("op-amp noise %g %s (want 0 for the default, or up to %g)", a.v, a.unit, float64(MaxAmpNoise)))
		}
	}
	p.designMask = r.Mask
	p.designMask.RippleDB -= 2 * *r.MarginDB
	p.gainScale = math.Pow(10, -*r.MarginDB/20)
	return p, r, nil
}

// DecodeRequest reads one JSON request document from rd, strictly: unknown
// fields, wrong types and trailing data are errors. The error is a
// *FieldError naming the field (its JSON path) and wrapping ErrRequest. It
// does not Resolve the request.
func DecodeRequest(rd io.Reader) (Request, error) {
	var r Request
	dec := json.NewDecoder(rd)
	dec.DisallowUnknownFields()
	if err := dec.Decode(&r); err != nil {
		return Request{}, jsonFieldErr(err, "")
	}
	if dec.More() {
		return Request{}, fieldErr("", errors.New("trailing data after the JSON document"))
	}
	return r, nil
}

// jsonFieldErr turns an encoding/json error into a *FieldError naming the
// field; prefix is the JSON path of the decoded value ("" at the top).
func jsonFieldErr(err error, prefix string) error {
	join := func(f string) string {
		switch {
		case prefix == "":
			return f
		case f == "":
			return prefix
		}
		return prefix + "." + f
	}
	var syn *json.SyntaxError
	var typ *json.UnmarshalTypeError
	switch {
	case errors.Is(err, filter.ErrFormat):
		// filter.Spec's own decoder: its message names the mask's field.
		return fieldErr(join("mask"), err)
	case errors.As(err, &syn):
		return fieldErr(join(""), fmt.Errorf("malformed JSON at byte %d: %w", syn.Offset, err))
	case errors.As(err, &typ):
		return fieldErr(join(typ.Field), fmt.Errorf("wrong type: %s where %s is expected", typ.Value, typ.Type))
	case errors.Is(err, io.EOF):
		return fieldErr(join(""), errors.New("empty body: a JSON request document is required"))
	case errors.Is(err, io.ErrUnexpectedEOF):
		return fieldErr(join(""), errors.New("truncated JSON"))
	}
	if name, ok := strings.CutPrefix(err.Error(), "json: unknown field "); ok {
		return fieldErr(join(strings.Trim(name, `"`)), errors.New("unknown field"))
	}
	return fieldErr(join(""), err)
}

// DecodeRequestBytes is DecodeRequest on a byte slice.
func DecodeRequestBytes(b []byte) (Request, error) { return DecodeRequest(bytes.NewReader(b)) }

// DecodeRequestOnto reads one JSON request document from b onto a copy of
// base: fields present in b replace base's, absent ones keep base's (a
// board's defaults with a channel's own fields on top). Decoding is strict
// as in DecodeRequest; field names in errors are prefixed with path (e.g.
// "channels[2]") when path is not empty. base is not modified.
func DecodeRequestOnto(base Request, b []byte, path string) (Request, error) {
	r := base
	r.Families = append([]string(nil), base.Families...)
	if base.MarginDB != nil {
		m := *base.MarginDB
		r.MarginDB = &m
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&r); err != nil {
		return Request{}, jsonFieldErr(err, path)
	}
	if dec.More() {
		return Request{}, fieldErr(path, errors.New("trailing data after the JSON document"))
	}
	return r, nil
}

// WithPath returns err with its field path prefixed by path ("channels[1]"
// + "mask" = "channels[1].mask") when err is a *FieldError; other errors
// are returned as they are.
func WithPath(err error, path string) error {
	var fe *FieldError
	if !errors.As(err, &fe) || path == "" {
		return err
	}
	f := path
	if fe.Field != "" {
		f += "." + fe.Field
	}
	return &FieldError{Field: f, Err: fe.Err}
}
