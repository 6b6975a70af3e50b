// Package ngspice runs the ngspice circuit simulator in batch mode on a
// SPICE deck and reads back what it computed. It exists for tests: the decks
// the library writes are simulated by this independent program and compared
// with the library's own analysis.
//
// Run AC for a small-signal sweep of one node (gain in dB and phase), and
// RunControl for any control block (Monte Carlo with alter, meas, print),
// with Values to read the "name = value" lines it prints. Available reports
// whether the ngspice executable is on PATH; Required makes a test skip
// locally when it is missing and fail when the environment variable CI is
// "true", so that the checks always run in continuous integration.
//
// Each run uses a fresh temporary directory, so runs are independent and
// safe to start from parallel tests.
package ngspice
