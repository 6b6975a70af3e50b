package response

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// Step returns the unit step response y(t) of h at the times t (seconds,
// each finite and ≥ 0, in any order). It is StepInto with a nil dst.
func Step(h filter.Transfer, t []float64) ([]float64, error) {
	return StepInto(nil, h, t)
}

// StepInto is Step writing into dst, which it returns. A nil dst is
// allocated; otherwise len(dst) must equal len(t), or StepInto panics.
// Apart from a nil dst it allocates only O(order) scratch, never per sample.
//
// The response is exact: y is the inverse Laplace transform of H(s)/s by
// partial fractions (from memory of Oppenheim and Willsky, Signals and
// Systems, the partial-fraction inverse Laplace transform),
//
//	y(t) = Σᵢ e^{pᵢt} Σₖ rᵢₖ t^{k−1}/(k−1)!,
//
// over the distinct poles pᵢ of H(s)/s (the poles of h and the origin) with
// multiplicities mᵢ, the residues rᵢₖ being the Taylor coefficients of
// (s − pᵢ)^{mᵢ}·H(s)/s at pᵢ. Poles closer together than 1e-5 of their size
// are merged into one repeated pole at their centroid (this changes the
// response by O(spread²), where the separate formula would lose accuracy to
// cancellation in O(1/spread) residues). A biproper h (as many zeros as poles)
// has a step y(0) = Gain. Unstable poles are allowed: the response grows as
// it should and may overflow to ±Inf at late times.
//
// Accuracy: to rounding (about 1e-14 of the response's peak; SciPy's
// state-space simulation agrees to 1e-14) when the poles are well apart or
// exactly repeated; about 1e-10 of the peak in the worst case, poles that
// nearly coincide (spread near the 1e-5 merging threshold), where both the
// merged and the separate formula lose digits.
//
// Errors wrap ErrSystem for more zeros than poles, a non-finite gain, pole or
// zero, or a complex pole or zero without its conjugate, and ErrGrid for a
// time that is negative, NaN or infinite (naming its index).
func StepInto(dst []float64, h filter.Transfer, t []float64) ([]float64, error) {
	if dst != nil && len(dst) != len(t) {
		panic("response: StepInto: len(dst) != len(t)")
	}
	if err := checkTimes(t); err != nil {
		return nil, err
	}
	m, err := newModal(h, true)
	if err != nil {
		return nil, err
	}
	if dst == nil {
		dst = make([]float64, len(t))
	}
	for i, ti := range t {
		dst[i] = m.at(ti)
	}
	return dst, nil
}

// Impulse returns the impulse response of h at the times t (seconds, each
// finite and ≥ 0). It is ImpulseInto with a nil dst.
func Impulse(h filter.Transfer, t []float64) (resp []float64, dirac float64, err error) {
	return ImpulseInto(nil, h, t)
}

// ImpulseInto is Impulse writing into dst, which it returns. A nil dst is
// allocated; otherwise len(dst) must equal len(t), or ImpulseInto panics.
//
// The impulse response of a biproper h (as many zeros as poles) contains a
// Dirac delta D·δ(t) with D = Gain (the value of H at infinity); it is
// returned separately as dirac, and resp holds only the regular part
// (its value at t = 0 being the limit from t > 0). For a strictly proper h
// dirac is 0. The regular part is exact, from the poles and residues of h,
// with the same formula, merging of close poles, accuracy and errors as
// StepInto.
func ImpulseInto(dst []float64, h filter.Transfer, t []float64) (resp []float64, dirac float64, err error) {
	if dst != nil && len(dst) != len(t) {
		panic("response: ImpulseInto: len(dst) != len(t)")
	}
	if err := checkTimes(t); err != nil {
		return nil, 0, err
	}
	m, err := newModal(h, false)
	if err != nil {
		return nil, 0, err
	}
	if dst == nil {
		dst = make([]float64, len(t))
	}
	for i, ti := range t {
		dst[i] = m.at(ti)
	}
	if len(h.Zeros) == len(h.Poles) {
		dirac = h.Gain
	}
	return dst, dirac, nil
}

func checkTimes(t []float64) error {
	for i, ti := range t {
		switch {
		case math.IsNaN(ti) || math.IsInf(ti, 0):
			return fmt.Errorf("response: time t[%d] = %g is not finite: %w", i, ti, ErrGrid)
		case ti < 0:
			return fmt.Errorf("response: time t[%d] = %g is negative: %w", i, ti, ErrGrid)
		}
	}
	return nil
}

// clusterRel is the relative distance below which poles are merged into one
// repeated pole (see StepInto). With the centroid the merging error is
// O(clusterRel²) = 1e-10, the cancellation error of keeping them apart
// O(ε/clusterRel) = 2e-11: the two are balanced near this value.
const clusterRel = 1e-5

// mode is one term of a modal expansion: e^{p·t}·Σₖ c[k]·t^k, weighted by w
// (2 for a complex pole standing for its conjugate too, 1 for a real pole).
type mode struct {
	p complex128
	c []complex128
	w float64
}

// modal is a time response as a sum of modes.
type modal struct {
	modes []mode
}

// at evaluates the response at t ≥ 0.
func (m modal) at(t float64) float64 {
	var y float64
	for _, md := range m.modes {
		var poly complex128
		for k := len(md.c) - 1; k >= 0; k-- {
			poly = poly*complex(t, 0) + md.c[k]
		}
		e := math.Exp(real(md.p) * t)
		if e == 0 {
			continue
		}
		if imag(md.p) == 0 {
			y += md.w * e * real(poly)
			continue
		}
		s, c := math.Sincos(imag(md.p) * t)
		y += md.w * e * (c*real(poly) - s*imag(poly))
	}
	return y
}

// cluster is a group of coincident poles.
type cluster struct {
	p complex128
	m int
}

// checkTransfer validates h for the time-domain and returns an error
// wrapping ErrSystem.
func checkTransfer(h filter.Transfer) error {
	if math.IsNaN(h.Gain) || math.IsInf(h.Gain, 0) {
		return fmt.Errorf("response: transfer Gain %g is not finite: %w", h.Gain, ErrSystem)
	}
	if len(h.Zeros) > len(h.Poles) {
		return fmt.Errorf("response: transfer has %d zeros and only %d poles (improper): %w",
			len(h.Zeros), len(h.Poles), ErrSystem)
	}
	for _, x := range []struct {
		name  string
		roots []complex128
	}{{"Zeros", h.Zeros}, {"Poles", h.Poles}} {
		for i, r := range x.roots {
			if cmplx.IsNaN(r) || cmplx.IsInf(r) {
				return fmt.Errorf("response: transfer %s[%d] = %v is not finite: %w", x.name, i, r, ErrSystem)
			}
		}
		if i := unpaired(x.roots); i >= 0 {
			return fmt.Errorf("response: transfer %s[%d] = %v has no conjugate: %w", x.name, i, x.roots[i], ErrSystem)
		}
	}
	return nil
}

// scaleOf is the largest magnitude among roots.
func scaleOf(roots []complex128) float64 {
	var r float64
	for _, x := range roots {
		r = math.Max(r, cmplx.Abs(x))
	}
	return r
}

// near reports whether a and b coincide within clusterRel of their size,
// with floor as the least size.
func near(a, b complex128, floor float64) bool {
	size := math.Max(math.Max(cmplx.Abs(a), cmplx.Abs(b)), floor)
	return cmplx.Abs(a-b) <= clusterRel*size
}

// isReal reports whether r is real within the clustering tolerance.
func isReal(r complex128, floor float64) bool {
	return math.Abs(imag(r)) <= clusterRel*math.Max(cmplx.Abs(r), floor)
}

// unpaired returns the index of a root in the lower half-plane without an
// upper-half-plane conjugate (each upper root pairs once), or of an upper
// root left over, or −1 when all complex roots pair up.
func unpaired(roots []complex128) int {
	floor := 1e-9 * scaleOf(roots)
	used := make([]bool, len(roots))
	for i, r := range roots {
		if isReal(r, floor) || imag(r) > 0 {
			continue
		}
		found := false
		for j, u := range roots {
			if !used[j] && imag(u) > 0 && !isReal(u, floor) && near(cmplx.Conj(r), u, floor) {
				used[j], found = true, true
				break
			}
		}
		if !found {
			return i
		}
	}
	for j, u := range roots {
		if imag(u) > 0 && !isReal(u, floor) && !used[j] {
			return j
		}
	}
	return -1
}

// split returns the real roots (imaginary part cleared) and the roots in the
// upper half-plane; the lower ones are their conjugates (see unpaired).
func split(roots []complex128, floor float64) (re, up []complex128) {
	for _, r := range roots {
		switch {
		case isReal(r, floor):
			re = append(re, complex(real(r), 0))
		case imag(r) > 0:
			up = append(up, r)
		}
	}
	return re, up
}

// group merges coincident roots into clusters at their centroids.
func group(roots []complex128, floor float64) []cluster {
	var cs []cluster
	sums := []complex128{}
	for _, r := range roots {
		k := -1
		for i, c := range cs {
			if near(r, c.p, floor) {
				k = i
				break
			}
		}
		if k < 0 {
			cs = append(cs, cluster{p: r, m: 1})
			sums = append(sums, r)
			continue
		}
		cs[k].m++
		sums[k] += r
		cs[k].p = sums[k] / complex(float64(cs[k].m), 0)
	}
	return cs
}

// newModal returns the modal expansion of the impulse response of h (its
// regular part), or of h(s)/s when step is true.
func newModal(h filter.Transfer, step bool) (modal, error) {
	if err := checkTransfer(h); err != nil {
		return modal{}, err
	}
	if h.Gain == 0 {
		return modal{}, nil
	}
	poles := h.Poles
	if step {
		poles = append(append(make([]complex128, 0, len(poles)+1), poles...), 0)
	}
	floor := 1e-9 * scaleOf(poles)
	reP, upP := split(poles, floor)
	reC, upC := group(reP, floor), group(upP, floor)
	all := make([]cluster, 0, len(reC)+2*len(upC))
	all = append(all, reC...)
	all = append(all, upC...)
	for _, c := range upC {
		all = append(all, cluster{p: cmplx.Conj(c.p), m: c.m})
	}
	zfloor := 1e-9 * scaleOf(h.Zeros)
	reZ, upZ := split(h.Zeros, zfloor)
	zeros := make([]complex128, 0, len(h.Zeros))
	zeros = append(zeros, reZ...)
	for _, z := range upZ {
		zeros = append(zeros, z, cmplx.Conj(z))
	}
	m := modal{modes: make([]mode, 0, len(reC)+len(upC))}
	for i := range len(reC) + len(upC) {
		w := 1.0
		if i >= len(reC) {
			w = 2
		}
		m.modes = append(m.modes, mode{p: all[i].p, c: residues(h.Gain, zeros, all, i), w: w})
	}
	return m, nil
}

// residues returns c[k] = r_{k+1}/k! for cluster i of the rational function
// gain·Π(s − zeros)/Π_l (s − all[l].p)^{all[l].m}: the coefficients of
// t^k in the cluster's term of the inverse Laplace transform. r_k is the
// coefficient of u^{m−k} in the Taylor series of
// G(u) = gain·Π(pᵢ + u − z)/Π_{l≠i}(pᵢ + u − p_l)^{m_l}, built by series
// multiplication truncated after u^{m−1}, zero and pole factors interleaved
// so that high orders neither overflow nor underflow.
func residues(gain float64, zeros []complex128, all []cluster, i int) []complex128 {
	p, m := all[i].p, all[i].m
	g := make([]complex128, m)
	g[0] = complex(gain, 0)
	// Pole factors, each repeated by multiplicity, skipping cluster i.
	var pf []complex128
	for l, c := range all {
		if l == i {
			continue
		}
		for range c.m {
			pf = append(pf, p-c.p)
		}
	}
	n := max(len(zeros), len(pf))
	for k := range n {
		if k < len(zeros) {
			// Multiply by (d + u).
			d := p - zeros[k]
			for j := m - 1; j >= 1; j-- {
				g[j] = g[j]*d + g[j-1]
			}
			g[0] *= d
		}
		if k < len(pf) {
			// Multiply by 1/(d + u) = (1/d)·Σ (−u/d)ⁿ: solve (d + u)·g' = g.
			d := pf[k]
			g[0] /= d
			for j := 1; j < m; j++ {
				g[j] = (g[j] - g[j-1]) / d
			}
		}
	}
	// c[k] = r_{k+1}/k! = g[m−1−k]/k!.
	c := make([]complex128, m)
	fact := 1.0
	for k := range m {
		if k > 0 {
			fact *= float64(k)
		}
		c[k] = g[m-1-k] / complex(fact, 0)
	}
	return c
}
