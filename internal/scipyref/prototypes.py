#!/usr/bin/python3
"""Write filter/testdata/prototypes.json: analog lowpass prototypes of
every family computed with SciPy's scipy.signal (buttap, cheb1ap, cheb2ap,
ellipap, besselap), for comparison with filter.Family.Prototype.

Run from the repository root with Debian's interpreter:
    /usr/bin/python3 internal/scipyref/prototypes.py

Each case lists zeros, poles (as [re, im] pairs) and the gain k of
H(s) = k * prod(s - z) / prod(s - p). SciPy's conventions match the Go
contract: passband maximum 0 dB (even-order Chebyshev and elliptic have
DC gain 10^(-rp/20)); the inverse Chebyshev stopband edge is 1 rad/s; the
elliptic passband edge is 1 rad/s; Bessel 'mag', 'delay' and 'phase'
correspond to BesselCorner, BesselDelay and BesselPhase.
"""
import json
import os

import numpy as np
import scipy
from scipy import signal

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "filter", "testdata", "prototypes.json")


def pairs(v):
    return [[float(np.real(x)), float(np.imag(x))] for x in np.atleast_1d(v)]


def case(family, order, params, zpk):
    z, p, k = zpk
    return {
        "family": family,
        "order": order,
        "params": params,
        "zeros": pairs(z),
        "poles": pairs(p),
        "gain": float(np.real(k)),
    }


def main():
    cases = []
    for n in range(1, 21):
        cases.append(case("butterworth", n, {}, signal.buttap(n)))
        for rp in (0.01, 0.5, 3.0):
            cases.append(case("chebyshev", n, {"RippleDB": rp}, signal.cheb1ap(n, rp)))
        for rs in (20.0, 60.0, 100.0):
            cases.append(case("inversechebyshev", n, {"AttenDB": rs}, signal.cheb2ap(n, rs)))
        for norm, name in (("mag", "corner"), ("delay", "delay"), ("phase", "phase")):
            cases.append(case("bessel", n, {"Norm": name}, signal.besselap(n, norm=norm)))
    for n in range(1, 15):
        for rp, rs in ((0.1, 40.0), (0.5, 60.0), (1.0, 80.0), (3.0, 120.0)):
            cases.append(case("elliptic", n, {"RippleDB": rp, "AttenDB": rs}, signal.ellipap(n, rp, rs)))
    data = {
        "source": "scipy.signal buttap, cheb1ap, cheb2ap, ellipap, besselap",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "cases": cases,
    }
    with open(OUT, "w") as f:
        json.dump(data, f, indent=0)
        f.write("\n")


if __name__ == "__main__":
    main()
