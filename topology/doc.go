// Package topology realizes filter stages as op-amp circuits (Sallen-Key,
// multiple feedback, state-variable, Tow-Thomas, first-order RC stages),
// analyzes each circuit from its parts by nodal analysis, writes SPICE decks,
// and states what each stage asks of its op-amp.
package topology
