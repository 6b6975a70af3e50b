package poly_test

import (
	"fmt"
	"slices"

	"github.com/rolloff/rolloff/internal/poly"
)

// ExampleRoots finds the roots of x³ − 6x² + 11x − 6 = (x − 1)(x − 2)(x − 3),
// coefficients in ascending powers, and rebuilds the polynomial from them.
func ExampleRoots() {
	c := []float64{-6, 11, -6, 1}
	r, err := poly.Roots(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	slices.SortFunc(r, func(a, b complex128) int {
		switch {
		case real(a) < real(b):
			return -1
		case real(a) > real(b):
			return 1
		}
		return 0
	})
	for _, z := range r {
		fmt.Printf("%.6f%+.6fi\n", real(z)+0, imag(z)+0)
	}
	back := poly.FromRootsReal(r)
	fmt.Printf("%.6f\n", back)
	// Output:
	// 1.000000+0.000000i
	// 2.000000+0.000000i
	// 3.000000+0.000000i
	// [-6.000000 11.000000 -6.000000 1.000000]
}
