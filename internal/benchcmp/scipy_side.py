"""SciPy side of the Rolloff comparison (internal/benchcmp).

Run by `go run ./internal/benchcmp` with Debian's /usr/bin/python3 (SciPy
1.10.1 from python3-scipy); it can also be run alone:

    /usr/bin/python3 internal/benchcmp/scipy_side.py [runs]

It times, with timeit, the SciPy equivalents of the cases the Go side
times, on the same masks and the same filter, and prints one JSON object:
the versions, the orders SciPy found (so the Go side can check that both
design filters of the same order), the gain of the swept filter at a few
frequencies (so the Go side can check that both sweep the same filter),
and per case the median over `runs` repetitions
of the best-of-autorange time per call, in nanoseconds.

Cases (frequencies in rad/s, as SciPy's analog functions take them):

  design/elliptic-lowpass   ellipord + ellip(analog, zpk) + zpk2sos(analog)
  design/chebyshev-bandpass cheb1ord + cheby1(bandpass, analog, zpk) + zpk2sos
  sweep/gain-phase/N        freqs_zpk at N points + 20·log10|H| + unwrap(angle H)
  sweep/gain-phase-delay/N  the same + group delay as −d(phase)/dω by
                            numpy.gradient (second-order differences: an
                            approximation, where the Go side is analytic)

The masks are invented scenarios (see main.go): an anti-alias lowpass flat
to 20 kHz within 0.5 dB and 50 dB down from 25 kHz, and a 40 kHz receiver
bandpass, 36 to 44 kHz within 1 dB and 40 dB down below 28 kHz and above
56 kHz.
"""

import json
import statistics
import sys
import timeit

import numpy as np
import scipy
from scipy import signal

TWO_PI = 2 * np.pi


def design_lowpass():
    n, wn = signal.ellipord(TWO_PI * 20e3, TWO_PI * 25e3, 0.5, 50, analog=True)
    z, p, k = signal.ellip(n, 0.5, 50, wn, "low", analog=True, output="zpk")
    return n, signal.zpk2sos(z, p, k, analog=True)


def design_bandpass():
    n, wn = signal.cheb1ord(TWO_PI * np.array([36e3, 44e3]), TWO_PI * np.array([28e3, 56e3]), 1, 40, analog=True)
    z, p, k = signal.cheby1(n, 1, wn, "bandpass", analog=True, output="zpk")
    return n, signal.zpk2sos(z, p, k, analog=True)


def sweep_case(zpk, n, delay):
    z, p, k = zpk
    w = TWO_PI * np.logspace(3, 5, n)

    def run():
        _, h = signal.freqs_zpk(z, p, k, worN=w)
        gain = 20 * np.log10(np.abs(h))
        phase = np.unwrap(np.angle(h))
        if delay:
            return gain, phase, -np.gradient(phase, w)
        return gain, phase

    return run


def per_call_ns(fn, runs):
    """Median over runs of the best-of-3 time per call (autorange sizing)."""
    t = timeit.Timer(fn)
    number, _ = t.autorange()
    samples = []
    for _ in range(runs):
        samples.append(min(t.repeat(3, number)) / number * 1e9)
    return statistics.median(samples), number


def main():
    runs = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    n_lp, _ = design_lowpass()
    n_bp, _ = design_bandpass()
    nz, wz = signal.ellipord(TWO_PI * 20e3, TWO_PI * 25e3, 0.5, 50, analog=True)
    zpk = signal.ellip(nz, 0.5, 50, wz, "low", analog=True, output="zpk")
    cases = {
        "design/elliptic-lowpass": design_lowpass,
        "design/chebyshev-bandpass": design_bandpass,
    }
    for n in (100, 1000, 10000):
        cases["sweep/gain-phase/%d" % n] = sweep_case(zpk, n, False)
        cases["sweep/gain-phase-delay/%d" % n] = sweep_case(zpk, n, True)
    check_hz = [1e3, 19e3, 20e3, 25e3, 60e3]
    _, hc = signal.freqs_zpk(*zpk, worN=TWO_PI * np.array(check_hz))
    out = {
        "check": {"hz": check_hz, "gain_db": [float(x) for x in 20 * np.log10(np.abs(hc))]},
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "python": sys.version.split()[0],
        "runs": runs,
        "orders": {"elliptic-lowpass": int(n_lp), "chebyshev-bandpass": int(n_bp)},
        "ns": {},
        "calls": {},
    }
    for name, fn in cases.items():
        ns, number = per_call_ns(fn, runs)
        out["ns"][name] = ns
        out["calls"][name] = number
    json.dump(out, sys.stdout, indent=1, sort_keys=True)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
