package response

import (
	"math"
	"math/cmplx"

	"github.com/rolloff/rolloff/filter"
)

// The modal expansion of a time response (see StepInto):
//
//   - Complex roots are paired with their conjugates within snapRel of
//     their size, and roots within snapRel of the real axis are taken as
//     real; the pole set is then made exactly conjugate-symmetric.
//   - Poles closer together than nearRel of their size (or of floorRel of
//     the largest pole, for poles near the origin) form a cluster, by single
//     linkage. A cluster of one pole, or of one pole repeated exactly, gives
//     the classical partial-fraction term e^{pt}·Σₖ rₖ t^{k−1}/(k−1)!.
//   - A cluster of distinct but close poles would give residues of size
//     1/spread^{m−1} that cancel. Instead its contribution is the divided
//     difference φ[p₁, …, p_m] of φ(s) = G(s)·e^{st}, G the rest of the
//     transfer function, expanded about the centroid c with u_i = p_i − c:
//     φ[p₁…p_m] = Σ_{k ≥ m−1} φ^{(k)}(c)/k! · h_{k−m+1}(u₁, …, u_m), h_n the
//     complete homogeneous symmetric polynomials (from memory of the
//     divided-difference identity (x − c)^k[p₁…p_m] = h_{k−m+1}(u), e.g. de
//     Boor, Divided differences, Surveys in Approximation Theory 2005).
//     This is e^{ct}·Σⱼ cⱼ t^j/j! with cⱼ = Σ_n g_{n−j+m−1}·h_n (g the
//     Taylor coefficients of G at c), accurate to rounding while
//     r·t ≤ 1, r the cluster radius. For r·t > 1 the classical terms of the
//     cluster's poles are used, whose cancellation then costs at most
//     (m−1)!·ε.
//   - At early times the Taylor series at t = 0 may replace the whole modal
//     sum (see taylorSeries and modal.at).
const (
	snapRel      = 1e-5 // conjugate pairing and real-axis snapping
	nearRel      = 0.1  // clustering distance, relative
	floorRel     = 1e-3 // least size in the relative distances, times the largest pole
	seriesExtra  = 30   // terms of the cluster series beyond the multiplicity: 1/30! ≈ 4e-33
	seriesHTerms = 80   // terms of the h_n sum: (r/D)^80 with r/D ≤ 1/3 is ≈ 6e-39
	seriesSep    = 3    // a cluster gets the series when its nearest outside pole is ≥ 3r from c
)

// mode is one term of a modal expansion: e^{p·t}·Σₖ c[k]·t^k, weighted by w
// (2 for a term standing for its conjugate too, 1 otherwise); for a
// cluster of close poles the series about the centroid holds while t·r ≤ 1
// and the cluster's separate terms split are used beyond.
type mode struct {
	p     complex128
	c     []complex128
	w     float64
	r     float64
	split []mode
}

// modal is a time response as a sum of modes, with its Taylor series at
// t = 0 for early times.
type modal struct {
	modes []mode
	// Early times: y(t) = Σₖ taylor[k]·(ρt)^k for ρt ≤ taylorEnd, ρ the
	// largest pole magnitude. See taylorSeries and crossover.
	rho, taylorEnd float64
	taylor         []float64
}

// at evaluates the response at t ≥ 0: by the Taylor series at t = 0 up to
// ρt = taylorEnd, by the modal sum beyond.
func (m modal) at(t float64) float64 {
	if x := m.rho * t; m.taylor != nil && x <= m.taylorEnd {
		v, _ := m.series(x)
		return v
	}
	var y float64
	for i := range m.modes {
		md := &m.modes[i]
		if md.r > 0 && t*md.r > 1 {
			for j := range md.split {
				y += md.split[j].eval(t)
			}
			continue
		}
		y += md.eval(t)
	}
	return y
}

// series returns the Taylor series at x = ρt and the sum of the
// magnitudes of its terms.
func (m modal) series(x float64) (v, mag float64) {
	for k := len(m.taylor) - 1; k >= 0; k-- {
		v = v*x + m.taylor[k]
		mag = mag*x + math.Abs(m.taylor[k])
	}
	return v, mag
}

// modesMag returns the sum of the magnitudes of the modal terms at t, the
// size of the rounding of the modal sum.
func (m modal) modesMag(t float64) float64 {
	var mag float64
	for i := range m.modes {
		md := &m.modes[i]
		if md.r > 0 && t*md.r > 1 {
			for j := range md.split {
				mag += md.split[j].mag(t)
			}
			continue
		}
		mag += md.mag(t)
	}
	return mag
}

// eval is the weighted real part of e^{pt}·Σ c[k]·t^k.
func (md *mode) eval(t float64) float64 {
	e := math.Exp(real(md.p) * t)
	if e == 0 {
		return 0
	}
	var poly complex128
	for k := len(md.c) - 1; k >= 0; k-- {
		poly = poly*complex(t, 0) + md.c[k]
	}
	if imag(md.p) == 0 {
		return md.w * e * real(poly)
	}
	s, c := math.Sincos(imag(md.p) * t)
	return md.w * e * (c*real(poly) - s*imag(poly))
}

// mag is the weighted e^{Re p·t}·Σ |c[k]|·t^k.
func (md *mode) mag(t float64) float64 {
	var a float64
	for k := len(md.c) - 1; k >= 0; k-- {
		a = a*t + cmplx.Abs(md.c[k])
	}
	return md.w * math.Exp(real(md.p)*t) * a
}

// crossover returns the largest x = ρt on a grid of taylorEnd/64 steps up
// to which the Taylor series' terms sum to less than the modal terms (so
// that its rounding is smaller), starting at x = 0 where the series is
// exact (y(0) is its first coefficient).
func (m modal) crossover() float64 {
	cross := 0.0
	for i := 1; i <= 64; i++ {
		x := m.taylorEnd * float64(i) / 64
		if _, a := m.series(x); !(a < m.modesMag(x/m.rho)) {
			break
		}
		cross = x
	}
	return cross
}

// Taylor series at t = 0 (see taylorSeries).
const (
	taylorMaxX  = 8   // the series is tried for ρt < 8 at most
	taylorTerms = 170 // k! stays finite
)

// taylorSeries returns the Taylor coefficients in x = ρt of the impulse
// response (regular part) or, when step is true, of the step response:
// with H(s) = Σₖ Mₖ s^{−k} about s = ∞ (the Markov parameters), the step
// response is Σₖ Mₖ t^k/k! and the impulse response Σₖ M_{k+1} t^k/k!.
// With w = ρ/s and poles and zeros scaled by 1/ρ, H = K·ρ^{−r}·w^r·
// Π(1 − z̃w)/Π(1 − p̃w), r = poles − zeros, whose coefficients aⱼ are built
// by series multiplication and division with |p̃| ≤ 1. The series is cut
// where its terms at x = taylorEnd fall below 1e-18 of the largest, and
// taylorEnd is lowered from taylorMaxX until that happens within
// taylorTerms terms. The modal sum loses accuracy at early times when the
// residues are large and cancel (high orders, Bessel, Butterworth), exactly
// where this series needs few terms and its own terms do not cancel much.
func taylorSeries(gain float64, zeros, poles []complex128, step bool) (rho, end float64, coef []float64) {
	rho = scaleOf(poles)
	if rho == 0 || len(poles) == 0 {
		return 0, 0, nil
	}
	r := len(poles) - len(zeros)
	kn := gain // K·ρ^{−r}, interleaved with the scaled products below
	a := make([]complex128, taylorTerms+1)
	a[0] = 1
	for i := range max(len(zeros), len(poles)) {
		if i < len(zeros) {
			z := zeros[i] / complex(rho, 0)
			for j := taylorTerms; j >= 1; j-- {
				a[j] -= z * a[j-1]
			}
		}
		if i < len(poles) {
			p := poles[i] / complex(rho, 0)
			for j := 1; j <= taylorTerms; j++ {
				a[j] += p * a[j-1]
			}
			if i >= len(zeros) {
				kn /= rho
			}
		}
	}
	// Coefficient of x^k: step K·ρ^{−r}·a_{k−r}/k!; impulse the same with
	// k+1, times ρ (dy/dt = ρ·dy/dx).
	off := 0
	scale := kn
	if !step {
		off = 1
		scale *= rho
	}
	coef = make([]float64, 0, taylorTerms)
	fact := 1.0
	for k := 0; k < taylorTerms-1; k++ {
		if k > 0 {
			fact *= float64(k)
		}
		j := k + off - r
		c := 0.0
		if j >= 0 && j <= taylorTerms {
			c = scale * real(a[j]) / fact
		}
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return 0, 0, nil // zeros far beyond the poles: no usable series
		}
		coef = append(coef, c)
	}
	for end = taylorMaxX; end >= 0.5; end /= 2 {
		var big float64
		for k, c := range coef {
			big = math.Max(big, math.Abs(c)*math.Pow(end, float64(k)))
		}
		for k := len(coef) - 1; k >= 0; k-- {
			if math.Abs(coef[k])*math.Pow(end, float64(k)) > 1e-18*big {
				if k < len(coef)-8 {
					return rho, end, coef[:k+1]
				}
				break
			}
		}
	}
	return 0, 0, nil
}

// symmetric returns the roots made exactly conjugate-symmetric (real roots
// snapped to the axis, each upper root followed by its conjugate) and, for
// each, the index of its mirror image.
func symmetric(roots []complex128) (out []complex128, mirror []int) {
	floor := 1e-9 * scaleOf(roots)
	for _, r := range roots {
		switch {
		case isReal(r, floor):
			mirror = append(mirror, len(out))
			out = append(out, complex(real(r), 0))
		case imag(r) > 0:
			n := len(out)
			mirror = append(mirror, n+1, n)
			out = append(out, r, cmplx.Conj(r))
		}
	}
	return out, mirror
}

// atom is a pole value with its exact multiplicity.
type atom struct {
	p complex128
	m int
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
	P, mirror := symmetric(poles)
	zeros, _ := symmetric(h.Zeros)
	// Single-linkage clusters by union-find; the relation is symmetric
	// under conjugation, so the partition is too.
	floor := floorRel * scaleOf(P)
	parent := make([]int, len(P))
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	for i := range P {
		for j := i + 1; j < len(P); j++ {
			size := math.Max(math.Max(cmplx.Abs(P[i]), cmplx.Abs(P[j])), floor)
			if cmplx.Abs(P[i]-P[j]) <= nearRel*size {
				if a, b := find(i), find(j); a != b {
					parent[max(a, b)] = min(a, b)
				}
			}
		}
	}
	// Clusters in order of their first member; atoms of each cluster.
	clusterOf := make([]int, len(P))
	var clusters [][]int
	id := make([]int, len(P)) // cluster number of each root of the union-find, plus 1
	for i := range P {
		r := find(i)
		k := id[r] - 1
		if k < 0 {
			k = len(clusters)
			id[r] = k + 1
			clusters = append(clusters, nil)
		}
		clusters[k] = append(clusters[k], i)
		clusterOf[i] = k
	}
	var atoms []atom
	atomsOf := make([][]int, len(clusters))
	for k, members := range clusters {
		for _, i := range members {
			found := false
			for _, a := range atomsOf[k] {
				if atoms[a].p == P[i] {
					atoms[a].m++
					found = true
					break
				}
			}
			if !found {
				atomsOf[k] = append(atomsOf[k], len(atoms))
				atoms = append(atoms, atom{p: P[i], m: 1})
			}
		}
	}
	var m modal
	for k, members := range clusters {
		mk := clusterOf[mirror[members[0]]]
		w := 1.0
		if mk != k {
			if imag(P[members[0]]) < 0 {
				continue // the mirror cluster stands for this one
			}
			w = 2
		}
		if len(atomsOf[k]) == 1 {
			m.modes = append(m.modes, atomMode(h.Gain, zeros, atoms, atomsOf[k][0], w))
			continue
		}
		split := make([]mode, 0, len(atomsOf[k]))
		for _, a := range atomsOf[k] {
			split = append(split, atomMode(h.Gain, zeros, atoms, a, w))
		}
		md, ok := clusterMode(h.Gain, zeros, P, members, clusterOf, k, mk == k)
		if !ok {
			m.modes = append(m.modes, split...)
			continue
		}
		md.w, md.split = w, split
		m.modes = append(m.modes, md)
	}
	hp, _ := symmetric(h.Poles)
	m.rho, m.taylorEnd, m.taylor = taylorSeries(h.Gain, zeros, hp, step)
	if m.taylor != nil {
		m.taylorEnd = m.crossover()
	}
	return m, nil
}

// atomMode is the classical partial-fraction term of atom i:
// c[k] = r_{k+1}/k!, r_k the coefficient of u^{m−k} in the Taylor series of
// G(u) = gain·Π(pᵢ + u − z)/Π_{l≠i}(pᵢ + u − p_l)^{m_l}.
func atomMode(gain float64, zeros []complex128, atoms []atom, i int, w float64) mode {
	p, m := atoms[i].p, atoms[i].m
	var others []complex128
	for l, a := range atoms {
		if l != i {
			for range a.m {
				others = append(others, a.p)
			}
		}
	}
	g := taylor(p, gain, zeros, others, m)
	c := make([]complex128, m)
	fact := 1.0
	for k := range m {
		if k > 0 {
			fact *= float64(k)
		}
		c[k] = g[m-1-k] / complex(fact, 0)
	}
	return mode{p: p, c: c, w: w}
}

// clusterMode is the divided-difference series of cluster k about its
// centroid, valid for t·r ≤ 1; ok is false when the cluster is not
// separated enough from the other poles for the series to converge fast.
func clusterMode(gain float64, zeros, P []complex128, members, clusterOf []int, k int, selfConj bool) (mode, bool) {
	m := len(members)
	var c complex128
	for _, i := range members {
		c += P[i]
	}
	c /= complex(float64(m), 0)
	if selfConj {
		c = complex(real(c), 0)
	}
	u := make([]complex128, m)
	var r float64
	for j, i := range members {
		u[j] = P[i] - c
		r = math.Max(r, cmplx.Abs(u[j]))
	}
	var others []complex128
	d := math.Inf(1)
	for i, q := range P {
		if clusterOf[i] != k {
			others = append(others, q)
			d = math.Min(d, cmplx.Abs(q-c))
		}
	}
	if d < seriesSep*r {
		return mode{}, false
	}
	g := taylor(c, gain, zeros, others, seriesHTerms+m)
	// hn: complete homogeneous symmetric polynomials of u, from the
	// generating function Π 1/(1 − uᵢx) = Σ hₙ xⁿ.
	hn := make([]complex128, seriesHTerms+1)
	hn[0] = 1
	for _, ui := range u {
		for n := 1; n <= seriesHTerms; n++ {
			hn[n] += ui * hn[n-1]
		}
	}
	J := m + seriesExtra
	coef := make([]complex128, J)
	fact := 1.0
	for j := range J {
		if j > 0 {
			fact *= float64(j)
		}
		var cj complex128
		for n := max(0, j-m+1); n <= seriesHTerms; n++ {
			cj += g[n-j+m-1] * hn[n]
		}
		coef[j] = cj / complex(fact, 0)
	}
	return mode{p: c, c: coef, r: r}, true
}

// taylor returns the first n Taylor coefficients about p of
// gain·Π(s − zeros)/Π(s − poles), built by series multiplication with zero
// and pole factors interleaved so that high orders neither overflow nor
// underflow.
func taylor(p complex128, gain float64, zeros, poles []complex128, n int) []complex128 {
	g := make([]complex128, n)
	g[0] = complex(gain, 0)
	for k := range max(len(zeros), len(poles)) {
		if k < len(zeros) {
			// Multiply by (d + u).
			d := p - zeros[k]
			for j := n - 1; j >= 1; j-- {
				g[j] = g[j]*d + g[j-1]
			}
			g[0] *= d
		}
		if k < len(poles) {
			// Divide by (d + u): solve (d + u)·g' = g.
			d := p - poles[k]
			g[0] /= d
			for j := 1; j < n; j++ {
				g[j] = (g[j] - g[j-1]) / d
			}
		}
	}
	return g
}
