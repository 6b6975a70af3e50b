package topology

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/mna"
)

// This file is the framework every circuit kind is built on. A kind is
// described once, in its own file, by
//
//   - a kindSpec: its name, which stages it takes (accepts), and which
//     structural variant a stage needs (variant: e.g. with or without an
//     input attenuator);
//   - a build function that, for one (stage kind, order, variant), lays out
//     the netlist template with a builder (nodes by name, parts R1, C1, ...
//     numbered in the order they are added, op-amps U1, ...) and returns the
//     synthesis equations as a closure over the part indices.
//
// Everything else is derived from that one description: the MNA netlist
// (AtHz, Biquad, Achieved, sensitivities, the non-ideal analysis), the SPICE
// deck (node names and parts from the template), Refit (the same synthesis
// with the capacitors held). The analysis never looks at the target stage
// except to pick the template.

// synthFunc fills v (part values in template order) for stage st. When
// keepCaps is false it first sets the capacitors from the reference
// capacitor capF; when true the capacitors already in v are kept and only
// the resistors are solved (Refit). Errors wrap ErrUnrealizable.
type synthFunc func(st filter.Stage, capF float64, v []float64, keepCaps bool) error

// design is one netlist template with its synthesis equations.
type design struct {
	kind      Kind
	stage     filter.StageKind
	order     int
	variant   int
	note      string   // what the variant adds, for the SPICE comment
	refs      []string // part references in value order
	isCap     []bool
	nodes     []string // node names; node i+1 of net is nodes[i]
	amps      []string // op-amp references U1, ...
	net       mna.Netlist
	inverting bool
	synth     synthFunc
	ncoef     int // coefficients the interpolation recovers: max(degree+1, 3)
}

// builder lays out a template.
type builder struct {
	nodeIdx map[string]int
	d       *design
	nr, nc  int
}

func newBuilder() *builder {
	return &builder{nodeIdx: map[string]int{}, d: &design{}}
}

// node returns the number of the named node; "0" is ground. "in" and "out"
// are the stage's input and output.
func (b *builder) node(name string) int {
	if name == "0" {
		return 0
	}
	if k, ok := b.nodeIdx[name]; ok {
		return k
	}
	b.d.nodes = append(b.d.nodes, name)
	k := len(b.d.nodes)
	b.nodeIdx[name] = k
	return k
}

func (b *builder) part(kind mna.ElementKind, ref string, x, y string) int {
	k := len(b.d.refs)
	b.d.refs = append(b.d.refs, ref)
	b.d.isCap = append(b.d.isCap, kind == mna.Capacitor)
	b.d.net.Elements = append(b.d.net.Elements, mna.Element{Kind: kind, A: b.node(x), B: b.node(y), Value: k})
	return k
}

// R adds the next resistor between nodes x and y and returns its index.
func (b *builder) R(x, y string) int {
	b.nr++
	return b.part(mna.Resistor, fmt.Sprintf("R%d", b.nr), x, y)
}

// C adds the next capacitor between nodes x and y and returns its index.
func (b *builder) C(x, y string) int {
	b.nc++
	return b.part(mna.Capacitor, fmt.Sprintf("C%d", b.nc), x, y)
}

// Amp adds an op-amp with non-inverting input plus, inverting input minus
// and output out.
func (b *builder) Amp(plus, minus, out string) {
	b.d.amps = append(b.d.amps, fmt.Sprintf("U%d", len(b.d.amps)+1))
	b.d.net.Elements = append(b.d.net.Elements, mna.Element{Kind: mna.OpAmp, A: b.node(plus), B: b.node(minus), Out: b.node(out)})
}

// done finishes the template.
func (b *builder) done(inverting bool, note string, synth synthFunc) *design {
	d := b.d
	d.inverting, d.note, d.synth = inverting, note, synth
	d.net.Nodes = len(d.nodes)
	d.net.In, d.net.Out = b.node("in"), b.node("out")
	if err := d.net.Check(len(d.refs)); err != nil {
		panic("topology: template: " + err.Error()) // a bug in a template, found by every test
	}
	d.ncoef = max(d.net.Degree(mna.Amp{})+1, 3)
	return d
}

// kindSpec describes one circuit kind.
type kindSpec struct {
	kind Kind
	// stages lists the (stage kind, order) pairs the kind realizes, with
	// the number of variants of each.
	stages []stageVariants
	// variant returns the variant stage st needs (st already validated and
	// of a listed kind and order), or an error wrapping ErrUnrealizable.
	variant func(st filter.Stage) (int, error)
	// build lays out one template.
	build func(sk filter.StageKind, order, variant int) *design
}

type stageVariants struct {
	kind     filter.StageKind
	order    int
	variants int
}

type designKey struct {
	kind    Kind
	stage   filter.StageKind
	order   int
	variant int
}

var (
	kindSpecs = map[Kind]*kindSpec{}
	designs   = map[designKey]*design{}
)

// register adds a kind and builds all its templates (called from init
// functions of the kind files).
func register(ks *kindSpec) {
	kindSpecs[ks.kind] = ks
	for _, sv := range ks.stages {
		for v := range sv.variants {
			d := ks.build(sv.kind, sv.order, v)
			d.kind, d.stage, d.order, d.variant = ks.kind, sv.kind, sv.order, v
			designs[designKey{ks.kind, sv.kind, sv.order, v}] = d
		}
	}
}

// designFor returns the template realizing st with kind k (not Auto).
func designFor(k Kind, st filter.Stage) (*design, error) {
	if err := st.Validate(); err != nil {
		return nil, fmt.Errorf("%w: %w", ErrStage, err)
	}
	ks, ok := kindSpecs[k]
	if !ok {
		return nil, fmt.Errorf("topology: circuit kind %v unknown: %w", k, ErrKind)
	}
	supported := false
	for _, sv := range ks.stages {
		if sv.kind == st.Kind && sv.order == st.Order {
			supported = true
		}
	}
	if !supported {
		return nil, fmt.Errorf("topology: %v does not realize a %v stage of order %d: %w", k, st.Kind, st.Order, ErrKind)
	}
	v, err := ks.variant(st)
	if err != nil {
		return nil, err
	}
	d := designs[designKey{k, st.Kind, st.Order, v}]
	if d == nil {
		return nil, fmt.Errorf("topology: %v has no template variant %d for a %v stage: %w", k, v, st.Kind, ErrKind)
	}
	return d, nil
}

// design returns the template of c, or an error if c's Kind, Stage and
// parts do not fit one.
func (c Circuit) design() (*design, error) {
	d, err := designFor(c.Kind, c.Stage)
	if err != nil {
		return nil, err
	}
	if len(c.Parts) != len(d.refs) {
		return nil, fmt.Errorf("topology: %v %v circuit has %d parts, its template %d: %w", c.Kind, c.Stage.Kind, len(c.Parts), len(d.refs), ErrParts)
	}
	for i, p := range c.Parts {
		if p.Ref != d.refs[i] {
			return nil, fmt.Errorf("topology: part %d is %q, the template has %q: %w", i, p.Ref, d.refs[i], ErrParts)
		}
	}
	return d, nil
}

// checkValues reports whether the values are positive and finite.
func checkValues(d *design, values []float64) error {
	if len(values) != len(d.refs) {
		return fmt.Errorf("topology: %d values for %d parts: %w", len(values), len(d.refs), ErrParts)
	}
	for i, v := range values {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("topology: %s = %g (must be positive and finite): %w", d.refs[i], v, ErrParts)
		}
	}
	return nil
}

// maxParts bounds the parts of any template (the notch state-variable
// circuit has the most).
const maxParts = 16

// gain plans shared by the non-inverting kinds. A circuit of amplifier gain
// K (a follower when K = 1) behind an input attenuator of ratio att
// realizes gain att·K.
const (
	plainGain = 0 // follower, no attenuator
	attOnly   = 1 // follower behind an attenuator: gain < 0.9
	ampOnly   = 2 // gain-setting pair, K = gain ≥ 1.5
	attAmp    = 3 // K = 2 behind an attenuator of gain/2: 0.9 ≤ gain < 1.5
)

// unityTol is how close to 1 a gain must be to be realized as exactly 1
// (the realized gain is then off by at most this, relative).
const unityTol = 1e-12

// planGain returns the variant and (att, K) realizing |g| for kinds whose
// amplifier gain is free. Between 0.9 and 1.5 (except 1 itself) a gain
// near 1 would need a nearly zero feedback resistor or a nearly infinite
// attenuator leg; there the amplifier is set to K = 2 and the attenuator to
// gain/2, keeping every ratio between 1:1 and 1:3.
func planGain(g float64) (variant int, att, k float64, err error) {
	g = math.Abs(g)
	switch {
	case g == 0:
		return 0, 0, 0, fmt.Errorf("topology: stage gain 0 cannot be realized: %w", ErrUnrealizable)
	case math.Abs(g-1) <= unityTol:
		return plainGain, 1, 1, nil
	case g < 0.9:
		return attOnly, g, 1, nil
	case g < 1.5:
		return attAmp, g / 2, 2, nil
	default:
		return ampOnly, 1, g, nil
	}
}

func gainVariant(st filter.Stage) (int, error) {
	v, _, _, err := planGain(st.Gain)
	return v, err
}

// hasAtt and hasAmp tell what a gain variant adds.
func hasAtt(v int) bool { return v == attOnly || v == attAmp }
func hasAmp(v int) bool { return v == ampOnly || v == attAmp }

func gainNote(v int) string {
	switch v {
	case attOnly:
		return "input attenuator"
	case ampOnly:
		return "gain-setting pair"
	case attAmp:
		return "input attenuator, gain-setting pair"
	}
	return ""
}

// omega returns 2π·F0Hz.
func omega(st filter.Stage) float64 { return 2 * math.Pi * st.F0Hz }

func unrealizable(k Kind, st filter.Stage, format string, a ...any) error {
	return fmt.Errorf("topology: %v %v stage (f0 %g Hz, Q %g, gain %g): %s: %w", k, st.Kind, st.F0Hz, st.Q, st.Gain, fmt.Sprintf(format, a...), ErrUnrealizable)
}
