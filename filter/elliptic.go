package filter

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/internal/ellip"
)

// MaxEllipticOrder is the highest order Elliptic.Prototype accepts; poles,
// zeros and gain are accurate to 1e-9 relative up to it (see
// accuracy_test.go) for every design whose highest pole Q is at most
// MaxEllipticQ.
const MaxEllipticOrder = 30

// MaxEllipticQ is the highest pole quality factor Elliptic.Prototype
// returns. A high order with little attenuation to spare puts the pole
// pair nearest the passband edge within 1/(2Q) of the jω axis; measured
// against 200-bit references, float64 keeps its real part to 1e-11 up to
// Q = 1e9 and loses accuracy beyond (1e-9 near Q = 1e14). Such poles cannot
// be built either (a real stage's Q is well under 1e3), so beyond
// MaxEllipticQ Prototype returns ErrRange instead of an inaccurate answer.
const MaxEllipticQ = 1e9

// String returns "Elliptic".
func (Elliptic) String() string { return "Elliptic" }

// MaxOrder returns MaxEllipticOrder.
func (Elliptic) MaxOrder() int { return MaxEllipticOrder }

// Prototype returns the order-n elliptic (Cauer) lowpass prototype,
// |H(jω)|² = g²/(1+εp²·Rₙ²(ω)) with Rₙ the elliptic rational function:
// passband ripple exactly RippleDB on [0, 1] rad/s (passband edge 1 rad/s,
// maximum 0 dB; for even n, H(0) = 10^(−RippleDB/20)), stopband minimum
// exactly AttenDB from the stopband edge 1/k rad/s upward, where the
// selectivity k solves the degree equation for n exactly (so the
// stopband edge is as low as order n allows).
//
// Construction (from memory of the Landen-transformation formulation of
// S. J. Orfanidis, 2006, equivalent to the classical one of Antoniou,
// "Digital Filters", ch. 5, and Daniels, 1974): εp² = 10^(RippleDB/10)−1,
// εs² = 10^(AttenDB/10)−1, discrimination k1 = εp/εs; k from
// n·K'(k)/K(k) = K'(k1)/K(k1) (ellip.Degree); with uᵢ = (2i−1)/n,
// i = 1…⌊n/2⌋, zeros ±j/(k·cd(uᵢK, k)) and poles j·cd((uᵢ − j·v0)K, k),
// where v0 = sc⁻¹(1/εp, k1')/(n·K(k1)) (ellip.ArcSC, by Carlson's R_F;
// DLMF 19.25.5 with the inverse functions of 22.15); odd n adds the real
// pole j·cd((1 − j·v0)K, k). Poles and zeros are in conjugate pairs, positive-imaginary member first, pole
// pairs by descending Q with the real pole of an odd order last, zero pair
// i belonging to pole pair i (zeros in ascending frequency). The gain is
// H(0)·Π(−p)/Π(−z).
//
// Accuracy: 1e-9 relative (real parts of the poles included) for
// 1 ≤ n ≤ MaxEllipticOrder and 0 < RippleDB < AttenDB with AttenDB up to a
// few hundred dB (float64 holds εs); in practice 1e-13 for orders to 14
// and pole Q to 1e4. Errors: ErrOrder for n outside that range; ErrParam
// for a RippleDB or AttenDB that is not positive and finite, or AttenDB
// not above RippleDB; ErrRange when the highest pole Q would exceed
// MaxEllipticQ.
func (e Elliptic) Prototype(n int) (Transfer, error) {
	if err := checkOrder(e.String(), n, MaxEllipticOrder); err != nil {
		return Transfer{}, err
	}
	if err := checkDB(e.String(), "RippleDB", e.RippleDB); err != nil {
		return Transfer{}, err
	}
	if err := checkDB(e.String(), "AttenDB", e.AttenDB); err != nil {
		return Transfer{}, err
	}
	if !(e.AttenDB > e.RippleDB) {
		return Transfer{}, fmt.Errorf("filter: Elliptic AttenDB %g not above RippleDB %g: %w", e.AttenDB, e.RippleDB, ErrParam)
	}
	ep2 := powerRatioM1(e.RippleDB)
	es2 := powerRatioM1(e.AttenDB)
	k1 := math.Sqrt(ep2 / es2)
	// k1' = √(1−k1²) = √((εs²−εp²)/εs²), without cancellation.
	k1c := math.Sqrt((es2 - ep2) / es2)
	if !(k1 > 0) || math.IsInf(es2, 1) {
		return Transfer{}, fmt.Errorf("filter: Elliptic AttenDB %g with RippleDB %g: discrimination out of float64 range: %w", e.AttenDB, e.RippleDB, ErrRange)
	}
	k, kc := ellip.Degree(n, k1, k1c)
	return e.build(n, ep2, k1, k1c, k, kc)
}

// build returns the order-n prototype of Prototype's construction from its
// moduli: εp² = ep2, the discrimination k1 (k1c = √(1−k1²)) and the
// selectivity k (kc = √(1−k²)), which must satisfy the degree equation
// (Prototype solves it for k; the design path, which knows k, solves it
// for k1 instead). e names the filter in error messages.
//
// The Jacobi functions are evaluated at the modulus k only, by one Landen
// sequence (ellip.Landen) computed once and climbed for every argument
// together (Landen.ClimbAll): zero i is 1/(k·cd(uᵢK)), pole i is
// j·cd((uᵢ − j·v0)K), and the cosines the climb starts from share
// cosh(v0·π/2) and sinh(v0·π/2) (cos((u − jv)π/2) = cos(uπ/2)cosh(vπ/2) +
// j·sin(uπ/2)sinh(vπ/2)), the cosine of the zero's argument being the real
// factor of the pole's. The results are those of ellip.CD (Landen's
// climb to the last bit; the start cosine to within an ulp of cmplx.Cos).
func (e Elliptic) build(n int, ep2, k1, k1c, k, kc float64) (Transfer, error) {
	return e.buildInto(nil, n, ep2, k1, k1c, k, kc)
}

// buildInto is build with the poles and zeros in dst's array when it has
// room for all of them (MinOrder's check of a design it does not return),
// in a new one otherwise.
func (e Elliptic) buildInto(dst []complex128, n int, ep2, k1, k1c, k, kc float64) (Transfer, error) {
	// sn⁻¹(j/εp, k1) = j·sc⁻¹(1/εp, k1'), normalized by n·K(k1).
	v0 := ellip.ArcSC(1/math.Sqrt(ep2), k1c, k1) / (float64(n) * ellip.KComp(k1c))
	lan := ellip.NewLanden(k, kc)
	ch, sh := coshSinh(v0 * math.Pi / 2)
	m := n / 2
	// The start cosines of every pole (the real one of an odd order last)
	// and zero, climbed together (ClimbAll: the bits of Climb and
	// ClimbReal one at a time). n ≤ MaxEllipticOrder bounds the counts.
	var wsBuf [MaxEllipticOrder/2 + 1]complex128
	var csBuf [MaxEllipticOrder / 2]float64
	ws, cs := wsBuf[:m+n%2], csBuf[:m]
	for i := 1; i <= m; i++ {
		u := float64(2*i-1) / float64(n)
		s, c := math.Sincos(u * math.Pi / 2)
		ws[i-1] = complex(c*ch, s*sh)
		cs[i-1] = c
	}
	if n%2 == 1 {
		s, c := math.Sincos(math.Pi / 2) // u = 1
		ws[m] = complex(c*ch, s*sh)
	}
	lan.ClimbAll(ws, cs)
	// One backing array: poles first, then zeros (the zeros' capacity ends
	// at their length, so an append to them cannot overwrite the poles).
	buf := dst[:cap(dst)]
	if len(buf) < n+2*m {
		buf = make([]complex128, n+2*m)
	}
	poles, zeros := buf[:0:n], buf[n:n:n+2*m]
	for i := range m {
		w := ws[i]
		p := complex(-math.Abs(imag(w)), math.Abs(real(w))) // j·w, upper member
		poles = append(poles, p, complex(real(p), -imag(p)))
		z := 1 / (k * cs[i])
		zeros = append(zeros, complex(0, z), complex(0, -z))
	}
	if n%2 == 1 {
		poles = append(poles, complex(-math.Abs(imag(ws[m])), 0))
	}
	if len(poles) > 1 {
		// Pair 0 is nearest the jω axis (highest Q).
		p := poles[0]
		if q := math.Hypot(real(p), imag(p)) / (-2 * real(p)); !(q <= MaxEllipticQ) {
			return Transfer{}, fmt.Errorf("filter: Elliptic order %d with RippleDB %g, AttenDB %g: pole Q %.3g beyond MaxEllipticQ %g: %w",
				n, e.RippleDB, e.AttenDB, q, float64(MaxEllipticQ), ErrRange)
		}
	}
	h0 := 1.0
	if n%2 == 0 {
		h0 = 1 / math.Sqrt(1+ep2)
	}
	g, ok := dcGain(h0, zeros, poles)
	if !ok {
		return Transfer{}, fmt.Errorf("filter: Elliptic order %d: gain %g not representable: %w", n, g, ErrRange)
	}
	return Transfer{Zeros: zeros, Poles: poles, Gain: g}, nil
}
