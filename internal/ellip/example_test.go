package ellip_test

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/internal/ellip"
)

// ExampleK evaluates the complete elliptic integral at the modulus
// k = 1/√2, the lemniscatic case, where K = Γ(1/4)²/(4√π) = 1.8540746773…
// (from memory of DLMF §19.6, special values), and the Jacobi functions at
// the quarter period: sn(K, k) = 1, cn(K, k) = 0, dn(K, k) = k' (DLMF
// table 22.5.1, from memory).
func ExampleK() {
	k := math.Sqrt(0.5)
	kc := math.Sqrt(0.5)
	K := ellip.K(k)
	fmt.Printf("K(1/√2) = %.10f\n", K)
	lemniscatic := math.Pow(math.Gamma(0.25), 2) / (4 * math.Sqrt(math.Pi))
	fmt.Printf("Γ(1/4)²/(4√π) = %.10f\n", lemniscatic)
	sn, cn, dn := ellip.Jacobi(K, k, kc)
	fmt.Printf("sn, cn, dn at K: %.6f %.6f %.6f\n", sn, math.Abs(cn), dn)
	// Output:
	// K(1/√2) = 1.8540746773
	// Γ(1/4)²/(4√π) = 1.8540746773
	// sn, cn, dn at K: 1.000000 0.000000 0.707107
}
