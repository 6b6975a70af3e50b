package filter

import (
	"fmt"
	"math/cmplx"
)

// outsidePrototype returns the order-n prototype of a Family defined
// outside this package, checking what the package's own families
// guarantee: every pole finite and strictly in the left half-plane (a
// stable prototype). A pole on or right of the jω axis, or not finite, is
// an error wrapping ErrParam that names the pole, instead of a search that
// never meets the mask. The family's own Prototype error is returned as it
// is (the caller wraps it).
func outsidePrototype(f Family, n int) (Transfer, error) {
	h, err := f.Prototype(n)
	if err != nil {
		return Transfer{}, err
	}
	for i, p := range h.Poles {
		if !(real(p) < 0) || cmplx.IsInf(p) || cmplx.IsNaN(p) {
			return Transfer{}, fmt.Errorf("filter: %v.Prototype(%d): pole Poles[%d] = %v is not finite and strictly in the left half-plane: %w",
				f, n, i, p, ErrParam)
		}
	}
	return h, nil
}
