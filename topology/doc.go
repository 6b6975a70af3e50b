// Package topology realizes filter stages as op-amp circuits (Sallen-Key,
// equal-component Sallen-Key, multiple feedback, state-variable,
// Tow-Thomas, first-order RC stages), analyzes each circuit from its parts
// by nodal analysis, writes SPICE decks, and states what each stage asks of
// its op-amp.
//
// # From stages to parts
//
// Realize takes the stages of a design (filter.Transfer.Stages) and returns
// a Chain of Circuits, one per stage; RealizeStage does one. Options.Kind
// picks the circuit kind (Auto: Sallen-Key for second-order lowpass and
// highpass, multiple feedback for bandpass, state-variable for notch, RC +
// follower for first order), Options.CapF the reference capacitor (0: a
// level that puts the resistors near 10 kΩ), and the R and C ranges every
// part must fall in. Each kind's documentation says which stages it
// realizes; others are refused with an error wrapping ErrKind.
//
// # One description per kind
//
// Each circuit kind is described once, as a netlist template (nodes by
// name, parts R1, C1, ... in order, op-amps) plus its synthesis equations,
// each with its published source beside it. Everything else is derived
// from that description, never from the target stage: AtHz is the nodal
// analysis (internal/mna) of the template with the part values and ideal
// op-amps held exactly (nullors); Biquad, Achieved and Sensitivities read
// the transfer function's coefficients from the same analysis; AtHzWith,
// DominantWith, RequiredGBWHz and Predistort put a non-ideal op-amp (finite
// DC gain, one pole, output resistance) into it; WriteSPICE prints the
// template's netlist. The tests compare AtHz with the stage's own transfer
// function, and the decks with ngspice, so the analysis checks the
// synthesis.
//
// # Noise
//
// NoiseAt, NoiseSources and Chain.NoiseRMS give the output noise of what
// is built: every resistor's thermal noise and every op-amp's input
// voltage and current noise (Noise: densities, 1/f corners, temperature,
// an op-amp model), each carried to the output by its own transfer. One
// solve of the transposed nodal equations (the adjoint network) gives all
// those transfers at once, from the same template, so every kind has its
// noise figures; the tests compare them with ngspice's noise analysis of
// the same decks.
//
// # Standard values and tolerances
//
// The series layer snaps parts to standard values: Refit holds snapped
// capacitors and re-solves the resistors with the kind's own equations;
// WithValues, BiquadOf and an Evaluator (one per goroutine, allocation
// free) analyze perturbed values for Monte Carlo runs.
//
// # Sign
//
// Inverting circuits (Circuit.Inverting) give the negative of their stage's
// transfer function; Chain.AtHz differs from the design by sign only. A
// circuit realizes |Stage.Gain|.
//
// # Adding a circuit kind
//
// Add a Kind constant (after the existing ones, with its name in
// kindNames), and a file kind_<name>.go whose init calls register with a
// kindSpec: the (stage kind, order) pairs it realizes with their number of
// structural variants, the function that picks the variant a stage needs,
// and a build function that lays out each template with a builder (R, C,
// Amp between named nodes; "in", "out" and "0" are the stage input, output
// and ground) and returns the synthesis closure over the part indices.
// The property, Refit, SPICE and fuzz tests then cover it once it is added
// to the support table of helpers_test.go.
package topology
