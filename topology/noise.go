package topology

import (
	"fmt"
	"math"
	"slices"

	"github.com/rolloff/rolloff/internal/mna"
)

// Boltzmann is the Boltzmann constant k in joules per kelvin, exact since
// the 2019 redefinition of the SI (BIPM, The International System of Units,
// 9th edition, 2019).
const Boltzmann = 1.380649e-23

// DefaultNoiseTempK is the temperature Noise uses when TempK is zero:
// 25 °C, where op-amp datasheets quote their noise (common practice).
const DefaultNoiseTempK = 298.15

// Noise lists the noise sources of a circuit's noise analysis (NoiseAt,
// NoiseSources, Chain.NoiseRMS):
//
//   - every resistor's thermal noise, a current of density 4kT/R A²/Hz
//     across it (Johnson and Nyquist; common practice);
//   - every op-amp's input voltage noise, a source in series with its
//     non-inverting input of density AmpVoltage²·(1 + VoltageCornerHz/f)
//     V²/Hz;
//   - every op-amp's input current noise, a current from each input to
//     ground of density AmpCurrent²·(1 + CurrentCornerHz/f) A²/Hz, the two
//     inputs uncorrelated.
//
// All sources are uncorrelated; capacitors and the ideal op-amps of the
// analysis are noiseless. The zero value is resistor noise alone at
// DefaultNoiseTempK.
type Noise struct {
	// TempK is the resistors' temperature in kelvin; 0 means
	// DefaultNoiseTempK.
	TempK float64
	// AmpVoltage is the op-amp input voltage noise density in the white
	// region, V/√Hz (a "4 nV/√Hz" part is 4e-9); 0 for none.
	AmpVoltage float64
	// AmpCurrent is the op-amp input current noise density at each input
	// in the white region, A/√Hz (0.5 pA/√Hz is 0.5e-12); 0 for none.
	AmpCurrent float64
	// VoltageCornerHz and CurrentCornerHz are the 1/f corners of the two,
	// where the 1/f part equals the white part; 0 for white noise.
	VoltageCornerHz, CurrentCornerHz float64
	// OpAmp is the op-amp model of the transfers from the sources to the
	// output (AtHzWith's); the zero value is the ideal op-amp of AtHz. Its
	// output resistance, a model of the open-loop output impedance and
	// not a resistor, is noiseless.
	OpAmp OpAmp
}

// NoiseKind is the kind of a NoiseSource.
type NoiseKind int

// The noise source kinds.
const (
	// ResistorNoise is a resistor's thermal noise.
	ResistorNoise NoiseKind = iota + 1
	// AmpVoltageNoise is an op-amp's input voltage noise.
	AmpVoltageNoise
	// AmpCurrentPlusNoise is an op-amp's current noise at its
	// non-inverting input.
	AmpCurrentPlusNoise
	// AmpCurrentMinusNoise is an op-amp's current noise at its inverting
	// input.
	AmpCurrentMinusNoise
)

// String returns "resistor", "amp-voltage", "amp-current+",
// "amp-current-", or "NoiseKind(n)".
func (k NoiseKind) String() string {
	if b, err := k.MarshalText(); err == nil {
		return string(b)
	}
	return fmt.Sprintf("NoiseKind(%d)", int(k))
}

// noiseKindNames are the String forms of the NoiseKinds, by value.
var noiseKindNames = [...]string{ResistorNoise: "resistor", AmpVoltageNoise: "amp-voltage",
	AmpCurrentPlusNoise: "amp-current+", AmpCurrentMinusNoise: "amp-current-"}

// MarshalText implements encoding.TextMarshaler (the String form); an
// unknown kind is an error wrapping ErrOptions.
func (k NoiseKind) MarshalText() ([]byte, error) {
	if k < ResistorNoise || int(k) >= len(noiseKindNames) {
		return nil, fmt.Errorf("topology: noise kind %d unknown: %w", int(k), ErrOptions)
	}
	return []byte(noiseKindNames[k]), nil
}

// UnmarshalText implements encoding.TextUnmarshaler: one of the String
// forms, or an error wrapping ErrOptions.
func (k *NoiseKind) UnmarshalText(b []byte) error {
	for v, name := range noiseKindNames {
		if v > 0 && name == string(b) {
			*k = NoiseKind(v)
			return nil
		}
	}
	return fmt.Errorf("topology: noise kind %q unknown: %w", b, ErrOptions)
}

// NoiseSource is one source's share of the output noise at one frequency.
// It marshals to JSON as {"stage", "ref", "kind", "density"}.
type NoiseSource struct {
	Stage int       `json:"stage"` // index of the circuit in its chain (0 for Circuit.NoiseSources)
	Ref   string    `json:"ref"`   // the resistor ("R3") or op-amp ("U1") it belongs to
	Kind  NoiseKind `json:"kind"`  // what noise it is
	// Density is its contribution to the output noise density, V/√Hz:
	// the source's density times the magnitude of its transfer to the
	// output. The output density is the root of the sum of the squares.
	Density float64 `json:"density"`
}

// errNoiseRange is the error of a noise figure float64 cannot hold.
var errNoiseRange = fmt.Errorf("topology: noise density not representable (parts far out of scale): %w", ErrParts)

// noiseLevels are a Noise's densities at one frequency, squared, and its
// op-amp model.
type noiseLevels struct {
	amp    mna.Amp
	fourKT float64 // 4kT in joules: over R it is the current density A²/Hz
	v2, i2 float64 // op-amp voltage (V²/Hz) and current (A²/Hz) densities
}

// levels checks n and returns its densities at f hertz.
func (n Noise) levels(f float64) (noiseLevels, error) {
	bad := func(name string, v float64) error {
		return fmt.Errorf("topology: Noise.%s %g not finite and non-negative: %w", name, v, ErrOptions)
	}
	fields := [...]struct {
		name string
		v    float64
	}{{"TempK", n.TempK}, {"AmpVoltage", n.AmpVoltage}, {"AmpCurrent", n.AmpCurrent},
		{"VoltageCornerHz", n.VoltageCornerHz}, {"CurrentCornerHz", n.CurrentCornerHz}}
	for _, fd := range fields {
		if !(fd.v >= 0) || math.IsInf(fd.v, 0) {
			return noiseLevels{}, bad(fd.name, fd.v)
		}
	}
	if !(f > 0) || math.IsInf(f, 0) {
		return noiseLevels{}, fmt.Errorf("topology: noise frequency %g Hz not positive and finite: %w", f, ErrOptions)
	}
	amp, err := n.OpAmp.amp()
	if err != nil {
		return noiseLevels{}, err
	}
	t := n.TempK
	if t == 0 {
		t = DefaultNoiseTempK
	}
	return noiseLevels{
		amp:    amp,
		fourKT: 4 * Boltzmann * t,
		v2:     n.AmpVoltage * n.AmpVoltage * (1 + n.VoltageCornerHz/f),
		i2:     n.AmpCurrent * n.AmpCurrent * (1 + n.CurrentCornerHz/f),
	}, nil
}

// noiseTerms calls emit with the squared output density of every source of
// the circuit d with part values v, from the adjoint transfers y (mna's
// Workspace.Adjoint), in template order: the resistors, then per op-amp its
// voltage noise and its two current noises (sources of zero density
// included). It reports false if a density is not finite (parts so far
// out of scale that float64 cannot hold a square).
func noiseTerms(d *design, v []float64, y []complex128, lv noiseLevels, emit func(ref string, k NoiseKind, p float64)) bool {
	node := func(i int) complex128 {
		if i == 0 {
			return 0
		}
		return y[i-1]
	}
	sq := func(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
	sum := 0.0
	put := func(ref string, k NoiseKind, p float64) {
		sum += p
		emit(ref, k, p)
	}
	amp := 0
	for _, e := range d.net.Elements {
		switch e.Kind {
		case mna.Resistor:
			put(d.refs[e.Value], ResistorNoise, sq(node(e.B)-node(e.A))*lv.fourKT/v[e.Value])
		case mna.OpAmp:
			ref := d.amps[amp]
			put(ref, AmpVoltageNoise, sq(y[d.net.Nodes+1+amp])*lv.v2)
			put(ref, AmpCurrentPlusNoise, sq(node(e.A))*lv.i2)
			put(ref, AmpCurrentMinusNoise, sq(node(e.B))*lv.i2)
			amp++
		}
	}
	return sum <= math.MaxFloat64 // false for +Inf and NaN
}

// noise runs the adjoint analysis of c at f hertz, calls emit for every
// source (noiseTerms) and returns the circuit's response there (AtHzWith
// of n.OpAmp: the output per volt of the input source, from the same
// solve).
func (c Circuit) noise(n Noise, f float64, emit func(ref string, k NoiseKind, p float64)) (complex128, error) {
	lv, err := n.levels(f)
	if err != nil {
		return 0, err
	}
	d, err := c.design()
	if err != nil {
		return 0, err
	}
	var buf [maxParts]float64
	v, err := valuesOf(d, c.Parts, &buf)
	if err != nil {
		return 0, err
	}
	var w mna.Workspace
	var yb [mna.MaxDim]complex128
	y := yb[:d.net.Dim()]
	if err := w.Adjoint(&d.net, v, lv.amp, complex(0, 2*math.Pi*f), y); err != nil {
		return 0, errSingular
	}
	if !noiseTerms(d, v, y, lv, emit) {
		return 0, errNoiseRange
	}
	return y[d.net.Nodes], nil
}

// NoiseAt returns the circuit's output noise density at f hertz, in V/√Hz,
// with its input driven by an ideal (noiseless, zero-impedance) source:
// the root of the sum of the squares of every source of n times its
// transfer to the output, found by one adjoint solve of the circuit's
// nodal equations (with n.OpAmp's model; ideal op-amps, as AtHz, by
// default). It does not allocate.
//
// Errors wrap ErrOptions for a negative, NaN or infinite field of n or a
// frequency that is not positive and finite, ErrOpAmp for bad n.OpAmp
// parameters, and ErrParts (or the template errors) for a circuit whose
// parts do not fit its kind.
func (c Circuit) NoiseAt(n Noise, f float64) (float64, error) {
	p, _, err := c.noisePower(n, f)
	return math.Sqrt(p), err
}

// noisePower returns the square of NoiseAt and the response AtHz.
func (c Circuit) noisePower(n Noise, f float64) (float64, complex128, error) {
	sum := 0.0
	h, err := c.noise(n, f, func(_ string, _ NoiseKind, p float64) { sum += p })
	if err != nil {
		return 0, 0, err
	}
	return sum, h, nil
}

// NoiseSources returns every noise source's share of the circuit's output
// noise at f hertz (see NoiseSource), in template order: the resistors in
// part order, then for each op-amp its voltage noise and its two current
// noises. Sources n gives no density appear with Density 0. The squares of
// the densities sum to the square of NoiseAt. Errors are those of NoiseAt.
func (c Circuit) NoiseSources(n Noise, f float64) ([]NoiseSource, error) {
	var out []NoiseSource
	_, err := c.noise(n, f, func(ref string, k NoiseKind, p float64) {
		out = append(out, NoiseSource{Ref: ref, Kind: k, Density: math.Sqrt(p)})
	})
	if err != nil {
		return nil, err
	}
	return out, nil
}

// NoiseAt returns the chain's output noise density at f hertz, in V/√Hz:
// each circuit's own output noise (Circuit.NoiseAt) carried to the chain's
// output by the circuits after it (|AtHzWith| of each with n.OpAmp), the
// contributions adding in power. Each circuit is driven by the one before it, whose
// op-amp output is an ideal source, the first by an ideal source (the
// model of Chain.AtHz). It does not allocate. Errors are those of
// Circuit.NoiseAt, naming the stage, and ErrStage for an empty chain.
func (c Chain) NoiseAt(n Noise, f float64) (float64, error) {
	if len(c.Circuits) == 0 {
		return 0, fmt.Errorf("topology: noise of an empty chain: %w", ErrStage)
	}
	total := 0.0
	for i, ci := range c.Circuits {
		own, h, err := ci.noisePower(n, f)
		if err != nil {
			return 0, fmt.Errorf("topology: noise of stage %d: %w", i+1, err)
		}
		total = total*(real(h)*real(h)+imag(h)*imag(h)) + own
	}
	if !(total <= math.MaxFloat64) {
		return 0, errNoiseRange
	}
	return math.Sqrt(total), nil
}

// NoiseSources returns every noise source of the chain with its share of
// the chain's output noise density at f hertz: Circuit.NoiseSources of
// each circuit, Stage set to its index, Density carried to the chain's
// output by the circuits after it. Errors are those of NoiseAt.
func (c Chain) NoiseSources(n Noise, f float64) ([]NoiseSource, error) {
	if len(c.Circuits) == 0 {
		return nil, fmt.Errorf("topology: noise of an empty chain: %w", ErrStage)
	}
	var out []NoiseSource
	first := make([]int, len(c.Circuits)) // where each circuit's sources start
	for i, ci := range c.Circuits {
		first[i] = len(out)
		h, err := ci.noise(n, f, func(ref string, k NoiseKind, p float64) {
			out = append(out, NoiseSource{Stage: i, Ref: ref, Kind: k, Density: math.Sqrt(p)})
		})
		if err != nil {
			return nil, fmt.Errorf("topology: noise of stage %d: %w", i+1, err)
		}
		// Carry every earlier circuit's sources through this one.
		g := math.Hypot(real(h), imag(h))
		for j := range out[:first[i]] {
			out[j].Density *= g
		}
	}
	return out, nil
}

// noiseTol is the relative accuracy NoiseRMS integrates to, and
// noiseMaxPanels the most panels it halves before giving up.
const (
	noiseTol       = 1e-7
	noiseMaxPanels = 10000
)

// NoiseRMS returns the chain's output noise in volts RMS over the band
// [loHz, hiHz]: the square root of the integral of the square of NoiseAt
// over frequency. The integral is taken in log frequency by Simpson's rule
// on panels that start from a grid of 10 a decade and from each circuit's
// f0 and zero (with steps of an eighth of the bandwidth f0/Q within two
// bandwidths of f0 for Q above 1, so that no resonance falls between
// samples), the panel of the largest error estimate halved until the
// estimates sum to 1e-7 of the total. The estimates overstate the error:
// against closed forms and a dense rule the result is within about 1e-9
// relative. It takes a few hundred evaluations of NoiseAt for a band of a
// few decades.
//
// Errors wrap ErrOptions for a band that is not 0 < loHz < hiHz < +Inf,
// and are otherwise those of NoiseAt.
func (c Chain) NoiseRMS(n Noise, loHz, hiHz float64) (float64, error) {
	if !(loHz > 0) || !(hiHz > loHz) || math.IsInf(hiHz, 0) {
		return 0, fmt.Errorf("topology: noise band [%g, %g] Hz not 0 < lo < hi < +Inf: %w", loHz, hiHz, ErrOptions)
	}
	if _, err := c.NoiseAt(n, loHz); err != nil {
		return 0, err
	}
	ul, uh := math.Log(loHz), math.Log(hiHz)
	// The panels' ends in u = ln f.
	us := []float64{ul, uh}
	add := func(f float64) {
		if u := math.Log(f); u > ul && u < uh {
			us = append(us, u)
		}
	}
	decades := (uh - ul) / math.Ln10
	if m := int(math.Ceil(10 * decades)); m < 1<<20 {
		for i := 1; i < m; i++ {
			us = append(us, ul+(uh-ul)*float64(i)/float64(m))
		}
	}
	for _, ci := range c.Circuits {
		st := ci.Stage
		add(st.F0Hz)
		if st.ZeroHz > 0 {
			add(st.ZeroHz)
		}
		if st.Order == 2 && st.Q > 1 {
			for k := -16; k <= 16; k++ {
				add(st.F0Hz * (1 + float64(k)/(8*st.Q)))
			}
		}
	}
	slices.Sort(us)
	us = slices.Compact(us)
	// g is the integrand in u: S(f)·f, f = e^u.
	var gErr error
	g := func(u float64) float64 {
		f := math.Exp(u)
		d, err := c.NoiseAt(n, f)
		if err != nil && gErr == nil {
			gErr = err
		}
		return d * d * f
	}
	// Each panel holds Simpson's rule over it and over its two halves
	// (five points): the halves' sum with Richardson's correction is its
	// estimate, a fifteenth of their difference its error. The panel of
	// the largest error is halved until the errors sum to noiseTol of the
	// total (a global adaptive rule; common practice).
	type panel struct {
		a, b, fa, flm, fm, frm, fb float64
		val, err                   float64
	}
	mk := func(a, b, fa, fm, fb float64) panel {
		m := (a + b) / 2
		p := panel{a: a, b: b, fa: fa, flm: g((a + m) / 2), fm: fm, frm: g((m + b) / 2), fb: fb}
		whole := (b - a) / 6 * (fa + 4*fm + fb)
		halves := (b - a) / 12 * (fa + 4*p.flm + 2*fm + 4*p.frm + fb)
		p.val = halves + (halves-whole)/15
		p.err = math.Abs(halves-whole) / 15
		return p
	}
	ps := make([]panel, 0, 2*len(us))
	fb := g(us[0])
	for i := range len(us) - 1 {
		a, b := us[i], us[i+1]
		fa, fm := fb, g((a+b)/2)
		fb = g(b)
		ps = append(ps, mk(a, b, fa, fm, fb))
	}
	for range noiseMaxPanels {
		if gErr != nil {
			return 0, gErr
		}
		total, errSum, worst := 0.0, 0.0, 0
		for i, p := range ps {
			total += p.val
			errSum += p.err
			if p.err > ps[worst].err {
				worst = i
			}
		}
		if !(total <= math.MaxFloat64) {
			return 0, errNoiseRange
		}
		p := ps[worst]
		if errSum <= noiseTol*total || !(p.b-p.a > 1e-12*(uh-ul)) {
			return math.Sqrt(max(total, 0)), nil
		}
		m := (p.a + p.b) / 2
		ps[worst] = mk(p.a, m, p.fa, p.flm, p.fm)
		ps = append(ps, mk(m, p.b, p.fm, p.frm, p.fb))
	}
	return 0, fmt.Errorf("topology: noise integral over [%g, %g] Hz did not converge in %d panels: %w", loHz, hiHz, noiseMaxPanels, ErrOptions)
}
