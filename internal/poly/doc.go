// Package poly does polynomial arithmetic with real and complex
// coefficients and finds polynomial roots: simultaneously by the
// Aberth–Ehrlich iteration in float64 with Newton polishing, and to
// extended precision by the same iteration in math/big for
// ill-conditioned polynomials such as the Bessel polynomials of high
// order.
//
// Coefficient slices are in ascending powers: c[0] + c[1]·x + … + c[n]·xⁿ.
// All functions are pure and safe for concurrent use.
package poly
