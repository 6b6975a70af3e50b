// Package robust holds the cross-layer reliability tests of Rolloff: a table
// of bad inputs for every public entry point of filter, response, topology
// and series (each must return an error that errors.Is matches to the
// documented sentinel, with a message naming the bad field, and never
// panic), numerical limits at the edges of the documented ranges (corners
// from 1 mHz to 1 GHz, Q up to 100, 200 dB masks, very narrow and very wide
// bands), concurrent use of shared values from many goroutines (meaningful
// under go test -race), and bit-for-bit determinism across runs and Monte
// Carlo worker counts.
//
// The package has no exported API; it exists for its _test.go files. Fuzz
// targets live beside the code they exercise, in files named
// *_robust_test.go, with their seed corpora under the package's
// testdata/fuzz/<FuzzName>/.
package robust
