// Package mcfloor holds the arithmetic floor of a gain-only Monte Carlo
// analysis: the plain loops over precomputed biquad coefficients that the
// series layer's Monte Carlo is measured against, in its benchmarks and in
// the side-by-side comparison tool. They are reference measurements, not
// part of any analysis.
package mcfloor
