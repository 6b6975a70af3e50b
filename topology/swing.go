package topology

import (
	"fmt"
	"math"
	"slices"

	"github.com/rolloff/rolloff/internal/mna"
)

// AmpPeak is how far one op-amp's output swings: the largest gain from
// the chain's input to that output over all frequencies. A sine of
// amplitude A at the chain's input swings the output by at most Gain·A, the
// figure to hold against the op-amp's output swing. The internal outputs
// of a state-variable or Tow-Thomas circuit (its bandpass integrator
// above all) can swing well beyond the stage's own output.
type AmpPeak struct {
	Stage int     `json:"stage"` // index of the circuit in its chain
	Ref   string  `json:"ref"`   // the op-amp ("U1") within its circuit
	Node  string  `json:"node"`  // the template node it drives ("bp", "out", ...)
	Gain  float64 `json:"gain"`  // peak |V(node)/V(chain input)|
	Hz    float64 `json:"hz"`    // where it peaks; 0 for DC
}

// maxPeakDecades bounds the span of the stages' frequencies AmpPeaks
// grids (40 points a decade): far beyond any real chain.
const maxPeakDecades = 60

// ampNode is one op-amp output of a chain.
type ampNode struct {
	stage, amp int // circuit index, op-amp index within it
	node       int // MNA node number of its output
}

// AmpPeaks returns the peak of every op-amp output of the chain (see
// AmpPeak), stage by stage, in template order within each, with ideal
// op-amps (AtHz's model). The search evaluates every circuit's node
// voltages (one nodal solve per circuit and frequency) at DC when the
// circuit has a DC solution, on a log grid of 40 points a decade from a
// hundredth of the lowest f0 or zero to a hundred times the highest (10 a
// decade for a further four decades either side, where the gains have
// settled to their limits), and in steps of an eighth of the bandwidth
// f0/Q within two bandwidths of every f0 of Q above 1; the best grid point
// of each output is then refined by golden-section search in log
// frequency between its neighbours, to about 1e-12 relative in frequency
// and 1e-15 in gain. A second maximum of one output closer than a grid
// step to its highest could be missed; the resonances, where such peaks
// lie, have the finer steps.
//
// Errors wrap ErrStage for an empty chain or stages whose frequencies span
// more than 60 decades, and are otherwise those of the circuits' analysis
// (ErrParts or the template errors), naming the stage.
func (c Chain) AmpPeaks() ([]AmpPeak, error) {
	if len(c.Circuits) == 0 {
		return nil, fmt.Errorf("topology: op-amp peaks of an empty chain: %w", ErrStage)
	}
	type prepared struct {
		d *design
		v []float64
	}
	ps := make([]prepared, len(c.Circuits))
	var nodes []ampNode
	fLo, fHi := math.Inf(1), 0.0
	for i, ci := range c.Circuits {
		d, err := ci.design()
		if err != nil {
			return nil, fmt.Errorf("topology: op-amp peaks of stage %d: %w", i+1, err)
		}
		var buf [maxParts]float64
		v, err := valuesOf(d, ci.Parts, &buf)
		if err != nil {
			return nil, fmt.Errorf("topology: op-amp peaks of stage %d: %w", i+1, err)
		}
		ps[i] = prepared{d, slices.Clone(v)}
		amp := 0
		for _, e := range d.net.Elements {
			if e.Kind == mna.OpAmp {
				nodes = append(nodes, ampNode{stage: i, amp: amp, node: e.Out})
				amp++
			}
		}
		for _, f := range []float64{ci.Stage.F0Hz, ci.Stage.ZeroHz} {
			if f > 0 && f <= math.MaxFloat64 {
				fLo, fHi = min(fLo, f), max(fHi, f)
			}
		}
	}
	if !(fLo > 0) || math.Log10(fHi/fLo) > maxPeakDecades {
		return nil, fmt.Errorf("topology: op-amp peaks: the stages' frequencies %g to %g Hz span more than %d decades: %w",
			fLo, fHi, maxPeakDecades, ErrStage)
	}
	// gains sets g[k] to |V(node k)/V(chain input)| at f hertz for every
	// op-amp output k of the first `upto` circuits; false when a circuit's
	// matrix is singular there.
	var w mna.Workspace
	var xb [mna.MaxDim]complex128
	g := make([]float64, len(nodes))
	gains := func(f float64, upto int) bool {
		before := 1.0 // |H| of the circuits before this one
		k := 0
		for i := range upto {
			p := ps[i]
			x := xb[:p.d.net.Dim()]
			if err := w.Solve(&p.d.net, p.v, mna.Amp{}, complex(0, 2*math.Pi*f), x); err != nil {
				return false
			}
			for ; k < len(nodes) && nodes[k].stage == i; k++ {
				z := x[nodes[k].node-1]
				g[k] = before * math.Hypot(real(z), imag(z))
			}
			out := x[p.d.net.Out-1]
			before *= math.Hypot(real(out), imag(out))
		}
		return true
	}
	// The grid, ascending.
	var hz []float64
	span := func(a, b float64, perDecade int) {
		m := int(math.Ceil(float64(perDecade) * math.Log10(b/a)))
		for j := range m {
			hz = append(hz, a*math.Pow(b/a, float64(j)/float64(m)))
		}
	}
	lo, hi := fLo/100, fHi*100
	span(lo/1e4, lo, 10)
	span(lo, hi, 40)
	span(hi, hi*1e4, 10)
	hz = append(hz, hi*1e4)
	for _, ci := range c.Circuits {
		if st := ci.Stage; st.Order == 2 && st.Q > 1 {
			for j := -16; j <= 16; j++ {
				if f := st.F0Hz * (1 + float64(j)/(8*st.Q)); f > 0 {
					hz = append(hz, f)
				}
			}
		}
	}
	slices.Sort(hz)
	// Points closer than 1e-6 relative count as one (a neighbour that
	// close would make the refinement's bracket miss the peak).
	hz = slices.CompactFunc(hz, func(a, b float64) bool { return math.Abs(b-a) <= 1e-6*max(a, b) })
	out := make([]AmpPeak, len(nodes))
	for k, nd := range nodes {
		d := ps[nd.stage].d
		out[k] = AmpPeak{Stage: nd.stage, Ref: d.amps[nd.amp], Node: d.nodes[nd.node-1], Gain: -1}
	}
	best := make([]int, len(nodes)) // grid index of each output's best value (−1: DC)
	if gains(0, len(c.Circuits)) {
		for k := range nodes {
			out[k].Gain, out[k].Hz, best[k] = g[k], 0, -1
		}
	}
	for j, f := range hz {
		if !gains(f, len(c.Circuits)) {
			return nil, fmt.Errorf("topology: op-amp peaks: circuit matrix singular at %g Hz: %w", f, ErrParts)
		}
		for k := range nodes {
			if g[k] > out[k].Gain {
				out[k].Gain, out[k].Hz, best[k] = g[k], f, j
			}
		}
	}
	// Golden-section refinement in u = ln f between the best point's
	// neighbours (an end of the grid stays as it is).
	const invPhi = 0.6180339887498949 // (√5 − 1)/2
	for k, nd := range nodes {
		j := best[k]
		if j <= 0 || j >= len(hz)-1 {
			continue
		}
		val := func(u float64) float64 {
			if !gains(math.Exp(u), nd.stage+1) {
				return -1
			}
			return g[k]
		}
		a, b := math.Log(hz[j-1]), math.Log(hz[j+1])
		x1, x2 := b-invPhi*(b-a), a+invPhi*(b-a)
		f1, f2 := val(x1), val(x2)
		for range 200 {
			if !(b-a > 1e-12*math.Max(1, math.Abs(a))) {
				break
			}
			if f1 < f2 {
				a, x1, f1 = x1, x2, f2
				x2 = a + invPhi*(b-a)
				f2 = val(x2)
			} else {
				b, x2, f2 = x2, x1, f1
				x1 = b - invPhi*(b-a)
				f1 = val(x1)
			}
		}
		for _, c := range [...]struct{ u, v float64 }{{x1, f1}, {x2, f2}} {
			if c.v > out[k].Gain {
				out[k].Gain, out[k].Hz = c.v, math.Exp(c.u)
			}
		}
	}
	for _, p := range out {
		if !(p.Gain >= 0 && p.Gain <= math.MaxFloat64) {
			return nil, fmt.Errorf("topology: op-amp peaks: stage %d %s gain %g not finite: %w", p.Stage+1, p.Ref, p.Gain, ErrParts)
		}
	}
	return out, nil
}

// AmpPeaks is Chain.AmpPeaks of the circuit alone (Stage 0).
func (c Circuit) AmpPeaks() ([]AmpPeak, error) {
	return Chain{Circuits: []Circuit{c}}.AmpPeaks()
}
