// Package series turns ideal component values into parts that can be bought,
// and says what the tolerances of those parts do to a filter.
//
// It holds the preferred-number series of IEC 60063 (E3 to E192) with their
// customary tolerances, and finds the nearest standard value, the values
// just below and above, and the values within a range. It parses and formats
// component values in engineering notation ("15.8k", "4.7 µF") and in the
// IEC 60062 letter-and-digit code ("4k7", "2R2"). It snaps a realized
// topology.Chain to standard values (capacitors first, resistors recomputed
// by the circuit's own synthesis equations, then a bounded joint search of
// neighbouring values), writes a bill of materials as CSV, and runs seeded,
// deterministic Monte Carlo and worst-case tolerance analyses.
//
// Designators: the parts of a chain are numbered per stage by topology (R1 in
// stage 1 and R1 in stage 2). This package makes them unique across the chain
// by prefixing the stage number, "U1.R1", "U2.R1": U<n> is the n-th stage of
// the chain, counted from 1 at the input. In the SPICE deck topology writes,
// the same part is named "R1_s1", "R1_s2".
package series
