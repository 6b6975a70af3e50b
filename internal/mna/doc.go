// Package mna is a small modified nodal analysis (MNA) solver for linear
// circuits of resistors, capacitors and operational amplifiers driven by one
// independent voltage source, the shape of every active filter stage.
//
// A Netlist names its nodes by number (0 is ground) and refers to part
// values by index, so one netlist serves every set of values: the nominal
// design, a snapped design, each Monte Carlo trial. A Workspace holds the
// preallocated complex matrix; its Transfer method stamps the matrix at one
// complex frequency s and solves it by LU factorization with partial
// pivoting, without allocating. Ideal op-amps are nullors (the input voltage
// difference is held at exactly zero and the output current is free), not a
// large finite gain; a non-ideal op-amp has a finite DC gain A0, a single
// pole set by its gain-bandwidth product,
//
//	A(s) = A0 / (1 + s·A0/(2π·GBW)),
//
// and an output resistance, stamped through 1/A(s) = 1/A0 + s/(2π·GBW) so
// that the ideal limit is the same equations with 1/A = 0.
//
// Coefficients recovers the transfer function as a ratio of polynomials in
// s: by Cramer's rule the numerator and denominator are det(M with the output
// column replaced by the source vector) = H·det(M) and det(M), polynomials of
// degree at most the number of capacitors plus the number of band-limited
// op-amps (Netlist.Degree). They are sampled at that many plus one points
// spread evenly over the right half of a circle |s| = r, from −j·r through r
// to +j·r, and the real coefficients are recovered exactly (up to rounding)
// by solving the interpolation equations. The right half-plane is used, not
// the whole circle of a discrete Fourier transform, because the poles of a
// stable circuit lie in the left half-plane: a sample point can never fall
// on a pole, whatever the circuit's Q. Choosing r near the circuit's natural
// frequencies (RadiusOf) keeps the interpolation well conditioned.
// RationalOf repeats this on circles of radii spread over twelve decades and
// keeps each coefficient from the circle where its term dominates, so that
// the far-away op-amp poles of a non-ideal circuit are recovered as well as
// the stage's. Roots gives poles and zeros from the coefficients.
package mna
