// Package ellip computes complete elliptic integrals of the first kind,
// Jacobi elliptic functions, the nome and the elliptic degree equation, as
// needed by the elliptic (Cauer) filter prototype.
//
// The methods are the arithmetic-geometric mean and the descending Landen
// transformation (DLMF §19.8, §22.7, §22.20; Abramowitz & Stegun 16.4 and
// 17.6), Carlson's duplication algorithm for the symmetric integral R_F
// (DLMF §19.36) and the theta-function series of the nome (DLMF §20.2,
// §22.2). Where a modulus k is close to 1 the functions take the
// complementary modulus k' = √(1−k²) as a separate argument, so that no
// accuracy is lost forming 1−k².
//
// All functions are pure and safe for concurrent use.
package ellip
