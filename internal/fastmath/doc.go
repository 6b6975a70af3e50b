// Package fastmath holds the two elementary functions the frequency sweep
// of package response evaluates once per frequency, the decimal logarithm
// and the four-quadrant arctangent, as table-driven routines without the
// divisions of the math package's general algorithms. They are at least
// as accurate as math.Log10 and math.Atan2 (Log10 within 1 ulp, Atan2
// within 1.5 ulp of the exact value over the whole float64 range, tested
// against math/big) and have the same special cases, which they hand to
// the math package. Measured alone they are about as fast as the math
// package's (see the benchmarks).
package fastmath
