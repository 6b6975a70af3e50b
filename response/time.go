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
// (s − pᵢ)^{mᵢ}·H(s)/s at pᵢ. Poles that are close but not equal (within
// 10 % of their size) would have large residues that cancel; such a cluster
// is summed instead as the divided difference of G(s)·e^{st} over its poles
// (G the rest of the transfer function), expanded about the cluster's
// centroid, which is exact for repeated and nearly repeated poles alike;
// beyond t = 1/r, r the cluster's radius, the separate terms no longer
// cancel and are used instead. A biproper h (as many zeros as poles) has a
// step y(0) = Gain. Unstable poles are allowed: the response
// grows as it should and may overflow to ±Inf at late times.
//
// At early times, where the residues of high orders are large and cancel,
// the Taylor series of the response at t = 0 (from the Markov parameters,
// the expansion of H about s = ∞) is used instead, up to the time where
// the magnitudes of its terms first sum to more than those of the modal
// terms (each sum's rounding error is ε times that magnitude).
//
// Accuracy, relative to the response's peak: rounding (≤ 3e-13, mostly
// ≈ 1e-15) for every family up to order 20 against the residue sum in
// 512-bit arithmetic, and for repeated and nearly repeated poles against
// 256-bit arithmetic; SciPy's state-space simulation agrees to 1e-14 on the
// golden cases. Beyond order 20 the Bessel residues grow so fast that about
// 1e-11 (order 25) to 6e-10 (order 30) is left at the crossover of the two
// sums; Butterworth 30 keeps 3e-13. Complex roots are paired with their
// conjugates, and roots within 1e-5 of their size of the real axis are
// taken as real.
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

// near reports whether a and b coincide within snapRel of their size,
// with floor as the least size.
func near(a, b complex128, floor float64) bool {
	size := math.Max(math.Max(cmplx.Abs(a), cmplx.Abs(b)), floor)
	return cmplx.Abs(a-b) <= snapRel*size
}

// isReal reports whether r is real within snapRel of its size.
func isReal(r complex128, floor float64) bool {
	return math.Abs(imag(r)) <= snapRel*math.Max(cmplx.Abs(r), floor)
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
