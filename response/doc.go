// Package response measures transfer functions: frequency sweeps with gain,
// unwrapped phase and group delay, exact step and impulse responses from
// poles and residues, level crossings, the figures a designer reads off a
// plot (passband ripple, stopband attenuation, peak gain, bandwidth, step
// overshoot, rise and settling time) and a pass/fail check of a response
// against a filter.Spec mask.
//
// Any System (anything with an AtHz method: a filter.Transfer, a realized
// circuit chain) can be swept and measured. A filter.Transfer is recognized
// and handled exactly: its phase is the sum of its factor phases, so the
// unwrapping is exact on any grid, and its group delay is analytic. Other
// systems get phase unwrapped along the grid and a numeric group delay,
// unless they implement Delayer.
//
// Frequencies are in hertz, times in seconds, gains in decibels
// (20·log10|H|), phases in degrees. Every function is a pure computation on
// its arguments and is safe for concurrent use; SweepInto, StepInto and
// ImpulseInto write into a caller's slice so that repeated sweeps need not
// allocate.
package response
