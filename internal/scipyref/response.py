#!/usr/bin/python3
"""Write response/testdata/scipy_response.json: time and frequency responses
of analog zpk systems computed with SciPy's scipy.signal, for comparison with
package response.

Run from the repository root with Debian's interpreter:
    /usr/bin/python3 internal/scipyref/response.py

Systems are H(s) = k * prod(s - z) / prod(s - p), s in rad/s; zeros and
poles are stored as [re, im] pairs.

"time" cases: scipy.signal.step and scipy.signal.impulse on a uniform time
grid. SciPy converts the zpk system to state space and simulates it with
the matrix exponential (lsim, zero-order hold, which is exact for a step).
Its impulse response is C·exp(A t)·B: the Dirac term D·delta(t) of a
biproper system is not included, which is the regular part that
response.Impulse returns.

"freq" cases: scipy.signal.freqs_zpk on a log grid; gain in dB, phase in
degrees (numpy.unwrap of the angle; compare modulo 360), and group delay
computed NUMERICALLY here as the central difference
-angle(H(w(1+d)) / H(w(1-d))) / (2 w d) with d = 1e-6 (truncation error
~d^2 relative, rounding ~1e-10 relative), independent of the analytic
formula in the Go code.
"""
import json
import os

import numpy as np
import scipy
from scipy import signal

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "response", "testdata", "scipy_response.json")


def pairs(v):
    return [[float(np.real(x)), float(np.imag(x))] for x in np.atleast_1d(v)]


def zpk_dict(name, z, p, k):
    return {"name": name, "zeros": pairs(z), "poles": pairs(p), "gain": float(np.real(k))}


def time_case(name, z, p, k, t_end, n=201):
    z = np.asarray(z, dtype=complex)
    p = np.asarray(p, dtype=complex)
    t = np.linspace(0.0, t_end, n)
    _, ys = signal.step((z, p, k), T=t)
    _, yi = signal.impulse((z, p, k), T=t)
    d = zpk_dict(name, z, p, k)
    d.update({"t": t.tolist(), "step": np.real(ys).tolist(), "impulse": np.real(yi).tolist()})
    return d


def freq_case(name, z, p, k):
    w = np.logspace(-2, 2, 81)
    _, h = signal.freqs_zpk(z, p, k, worN=w)
    dd = 1e-6
    _, hp = signal.freqs_zpk(z, p, k, worN=w * (1 + dd))
    _, hm = signal.freqs_zpk(z, p, k, worN=w * (1 - dd))
    delay = -np.angle(hp / hm) / (2 * w * dd)
    d = zpk_dict(name, z, p, k)
    d.update({
        "hz": (w / (2 * np.pi)).tolist(),
        "gain_db": (20 * np.log10(np.abs(h))).tolist(),
        "phase_deg": np.degrees(np.unwrap(np.angle(h))).tolist(),
        "delay_s": delay.tolist(),
    })
    return d


def main():
    b2 = signal.buttap(2)
    b4 = signal.buttap(4)
    time = [
        time_case("first order, tau 1 s", [], [-1.0], 1.0, 8.0),
        time_case("Butterworth 2", *b2, 12.0),
        time_case("Butterworth 4", *b4, 20.0),
        time_case("triple real pole", [], [-1.0, -1.0, -1.0], 1.0, 15.0),
        time_case("double complex pair", [], [-1 + 2j, -1 - 2j, -1 + 2j, -1 - 2j], 25.0, 10.0),
        time_case("biproper notch", [2j, -2j], [-0.5 + 1.5j, -0.5 - 1.5j], 1.0, 20.0),
        time_case("bandpass origin zero", [0.0], b2[1], 1.0, 12.0),
        time_case("Chebyshev 4, 0.5 dB", *signal.cheb1ap(4, 0.5), 40.0),
        time_case("elliptic 3, 1 dB, 40 dB", *signal.ellipap(3, 1, 40), 30.0),
        time_case("elliptic 4, 0.5 dB, 40 dB (biproper)", *signal.ellipap(4, 0.5, 40), 40.0),
        time_case("Bessel 5, delay", *signal.besselap(5, norm="delay"), 6.0),
    ]
    freq = [
        freq_case("Butterworth 5", *signal.buttap(5)),
        freq_case("Chebyshev 4, 0.5 dB", *signal.cheb1ap(4, 0.5)),
        freq_case("Bessel 4, delay", *signal.besselap(4, norm="delay")),
        freq_case("elliptic 4, 0.5 dB, 40 dB", *signal.ellipap(4, 0.5, 40)),
        freq_case("inverse Chebyshev 5, 40 dB", *signal.cheb2ap(5, 40)),
        freq_case("bandpass origin zero", [0.0], b2[1], 1.0),
    ]
    out = {
        "generator": "internal/scipyref/response.py",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "time": time,
        "freq": freq,
    }
    with open(OUT, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
