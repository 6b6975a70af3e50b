package series

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/rolloff/rolloff/topology"
)

// StageWorst is the linear worst case of one stage: the largest relative
// deviations of its pole frequency, Q and gain when every part sits at the
// end of its tolerance that hurts most, Σ|S|·tol over the parts, where S is
// the part's normalized sensitivity ((∂y/y)/(∂x/x), from the circuit model:
// topology's Circuit.Sensitivities). ZeroHz is for notches.
type StageWorst struct {
	F0, Q, Gain, ZeroHz float64
}

// WorstCase is the result of Analysis.WorstCase.
type WorstCase struct {
	Stages []StageWorst
	// Hz are the analysis frequencies; NominalDB the chain's gain there;
	// LowDB and HighDB the linear worst-case bounds, NominalDB ∓
	// Σ|∂dB/∂ln x|·tol over every part of the chain.
	Hz, NominalDB, LowDB, HighDB []float64
}

// Influence is one part's share in the spread of the gain.
type Influence struct {
	// Ref is the part's chain-unique designator ("U2.R1").
	Ref string
	// Share is the part's fraction of the variance of the gain in dB,
	// summed over the analysis frequencies (the shares add up to 1).
	Share float64
	// PeakStdDB is the largest standard deviation in dB the part alone
	// causes at any analysis frequency, |∂dB/∂ln x|·σ, at PeakHz.
	PeakStdDB, PeakHz float64
}

// gainSlopes returns, for every part of the chain in order, the derivative
// of the chain's gain in dB with respect to the log of the part's value at
// each frequency, ∂dB/∂ln x (central differences of the stage's
// coefficients at x·e^(±h), h = 1e-5: truncation error of order h² ≈ 1e-10
// relative, rounding error near 1e-16/h ≈ 1e-11).
func gainSlopes(chain topology.Chain, hz []float64) ([][]float64, error) {
	const h = 1e-5
	var out [][]float64
	for i, c := range chain.Circuits {
		ev, err := newStageEval(c)
		if err != nil {
			return nil, err
		}
		vals := make([]float64, len(c.Parts))
		for k, p := range c.Parts {
			vals[k] = p.Value
		}
		for k := range c.Parts {
			x := vals[k]
			vals[k] = x * math.Exp(h)
			up, err := ev(vals)
			if err != nil {
				return nil, fmt.Errorf("series: stage %d: %w", i+1, err)
			}
			vals[k] = x * math.Exp(-h)
			dn, err := ev(vals)
			if err != nil {
				return nil, fmt.Errorf("series: stage %d: %w", i+1, err)
			}
			vals[k] = x
			g := make([]float64, len(hz))
			for j, f := range hz {
				w := 2 * math.Pi * f
				g[j] = 10 * math.Log10(up.power(w*w)/dn.power(w*w)) / (2 * h)
			}
			out = append(out, g)
		}
	}
	return out, nil
}

func (m Analysis) prepare(chain topology.Chain) ([]Item, error) {
	if err := m.validate(); err != nil {
		return nil, err
	}
	if len(chain.Circuits) == 0 {
		return nil, fmt.Errorf("series: analysis of a chain of no circuits: %w", ErrChain)
	}
	items, err := Items(chain, m.Resistors, m.Capacitors, m.Tolerances)
	if err != nil {
		return nil, err
	}
	for _, it := range items {
		if it.Tolerance == 0 && !it.Series.valid() && !hasTol(m.Tolerances, it) {
			return nil, fmt.Errorf("series: part %s = %g is on no series and has no tolerance given: %w",
				it.Ref, it.Value, ErrChain)
		}
	}
	return items, nil
}

// WorstCase returns the linear worst-case analysis of chain with m's
// tolerances: per stage the worst relative deviations of f0, Q and gain
// from the parts' sensitivities, and bounds of the gain at m.Hz. Linear:
// the neglected terms are of the order of the squared tolerances (relative),
// so the bounds suit tolerances of a few percent; the Monte Carlo extremes
// stay within them up to such terms (tested at ±0.2 %). m.Dist, Trials and
// the criteria are not used.
func (m Analysis) WorstCase(chain topology.Chain) (WorstCase, error) {
	items, err := m.prepare(chain)
	if err != nil {
		return WorstCase{}, err
	}
	var out WorstCase
	n := 0
	for i, c := range chain.Circuits {
		sens, err := c.Sensitivities()
		if err != nil {
			return WorstCase{}, fmt.Errorf("series: stage %d sensitivities: %w", i+1, err)
		}
		tolOf := map[string]float64{}
		for range c.Parts {
			tolOf[strings.TrimPrefix(items[n].Ref, Designator(i, ""))] = items[n].Tolerance
			n++
		}
		var sw StageWorst
		for _, s := range sens {
			t := tolOf[s.Ref]
			sw.F0 += math.Abs(s.F0) * t
			sw.Q += math.Abs(s.Q) * t
			sw.Gain += math.Abs(s.Gain) * t
			sw.ZeroHz += math.Abs(s.ZeroHz) * t
		}
		out.Stages = append(out.Stages, sw)
	}
	slopes, err := gainSlopes(chain, m.Hz)
	if err != nil {
		return WorstCase{}, err
	}
	nf := len(m.Hz)
	out.Hz = append([]float64(nil), m.Hz...)
	out.NominalDB = make([]float64, nf)
	out.LowDB = make([]float64, nf)
	out.HighDB = make([]float64, nf)
	for j, f := range m.Hz {
		d := 0.0
		for k, g := range slopes {
			d += math.Abs(g[j]) * items[k].Tolerance
		}
		out.NominalDB[j] = 20 * math.Log10(cmplxAbs(chain.AtHz(f)))
		if math.IsNaN(out.NominalDB[j]) || math.IsNaN(d) {
			return WorstCase{}, fmt.Errorf("series: worst case: gain at Hz[%d] = %g Hz is not a number (frequency beyond float64 evaluation): %w", j, f, ErrChain)
		}
		out.LowDB[j], out.HighDB[j] = out.NominalDB[j]-d, out.NominalDB[j]+d
	}
	return out, nil
}

// Ranking returns the parts of chain ranked by their share in the variance
// of the gain at m.Hz, largest first (ties by designator), to the first
// order: part k contributes (∂dB/∂ln x_k · σ_k)² at each frequency, with
// σ_k = tol/√3 for m.Dist Uniform and tol/3 for Normal (the standard
// deviations of those distributions). Parts with zero tolerance get a
// zero share.
func (m Analysis) Ranking(chain topology.Chain) ([]Influence, error) {
	items, err := m.prepare(chain)
	if err != nil {
		return nil, err
	}
	slopes, err := gainSlopes(chain, m.Hz)
	if err != nil {
		return nil, err
	}
	sd := 1 / math.Sqrt(3)
	if m.Dist == Normal {
		sd = 1.0 / 3
	}
	out := make([]Influence, len(items))
	total := 0.0
	contrib := make([]float64, len(items))
	for k, it := range items {
		sigma := it.Tolerance * sd
		out[k].Ref = it.Ref
		for j, g := range slopes[k] {
			s := math.Abs(g) * sigma
			contrib[k] += s * s
			if s > out[k].PeakStdDB || j == 0 {
				out[k].PeakStdDB, out[k].PeakHz = s, m.Hz[j]
			}
		}
		total += contrib[k]
	}
	for k := range out {
		if total > 0 {
			out[k].Share = contrib[k] / total
		}
	}
	slices.SortStableFunc(out, func(a, b Influence) int {
		switch {
		case a.Share > b.Share:
			return -1
		case a.Share < b.Share:
			return 1
		}
		return strings.Compare(a.Ref, b.Ref)
	})
	return out, nil
}
