// Package pipeline is the one design path shared by the runnable examples
// of Rolloff: from a mask and a part policy to a buildable, checked chain.
//
// Run takes a Request (a filter.Spec mask plus the policy: families to
// try, circuit kind, resistor and capacitor series, tolerances, Monte Carlo
// trials and seed) and goes down the library's layers:
//
//  1. filter: for each family, the least order that meets the mask
//     (filter.MinOrder, filter.Design) and its stages (Transfer.Stages);
//  2. topology: a circuit per stage (topology.RealizeStage);
//  3. series: the chain snapped to standard parts (series.Snap) and its
//     worst deviation from the design over the passband;
//  4. topology: the op-amp gain-bandwidth each stage needs;
//  5. series: the Monte Carlo yield of the snapped chain against the mask.
//
// The candidates are ranked by a fixed rule (see Rank) and the best one is
// described by a Document, the versioned JSON result document the examples
// print, write and serve. Result keeps the document together with the
// library values behind it (transfer function, chains), for plots and
// SPICE decks.
//
// The package lives under examples/internal: it is example code, not part
// of the library's API.
package pipeline
