#!/usr/bin/python3
"""Write the filter layer's SciPy golden files for orders and transforms:

  filter/testdata/orders_scipy.json      minimum analog orders of masks
  filter/testdata/transforms_scipy.json  frequency transforms of prototypes
  filter/testdata/orders_designs_scipy.json  whole designs from masks

Orders come from SciPy's analog order estimators (buttord, cheb1ord,
cheb2ord, ellipord with analog=True) for lowpass, highpass, bandpass and
bandstop masks, symmetric and asymmetric. Band edges are passed in rad/s
(2*pi*Hz); the orders depend only on ratios. The Go test asserts that
filter.MinOrder is never above SciPy's order.

Transforms take SciPy's own normalized prototypes (zpk form) and apply
scipy.signal's zpk frequency transforms with the centre and width in rad/s;
the input zpk is stored too, so the Go test transforms exactly the same
input.

Designs: for masks where SciPy and filter.Design place the slack the same
way (Butterworth and Chebyshev type I, lowpass, highpass and bandpass:
passband edge exact, the transform centred on the passband edges), the
order from buttord/cheb1ord and the zpk from butter/cheby1 with
analog=True; the Go test compares filter.Design's poles, zeros and gain.

Run from the repository root with Debian's interpreter:
    /usr/bin/python3 internal/scipyref/orders.py
"""
import json
import math
import os

import numpy as np
import scipy
from scipy import signal

HERE = os.path.dirname(os.path.abspath(__file__))
TESTDATA = os.path.join(HERE, "..", "..", "filter", "testdata")

TWO_PI = 2 * math.pi


def masks():
    out = []
    levels = [(0.1, 40.0), (0.5, 60.0), (1.0, 30.0), (3.0, 80.0), (0.01, 50.0), (2.0, 100.0)]
    for rp, rs in levels:
        for ratio in [1.05, 1.2, 1.5, 2.0, 3.0, 5.0, 10.0]:
            out.append({"band": "lowpass", "pass_hz": [1000.0, 0], "stop_hz": [1000.0 * ratio, 0],
                        "ripple_db": rp, "atten_db": rs})
        for ratio in [1.1, 1.7, 2.5, 4.0]:
            out.append({"band": "highpass", "pass_hz": [5000.0, 0], "stop_hz": [5000.0 / ratio, 0],
                        "ripple_db": rp, "atten_db": rs})
    # Masks met exactly by a whole-number order, where a rounded estimate
    # may land just above the integer: Butterworth with rp = 10*log10(2)
    # (epsilon = 1) and 10^(rs/10) - 1 = ratio^(2n); Chebyshev with
    # sqrt(D) = T_n(ratio).
    for ratio, n in [(2.0, 4), (3.0, 3), (1.5, 7), (10.0, 2)]:
        out.append({"band": "lowpass", "pass_hz": [1000.0, 0], "stop_hz": [1000.0 * ratio, 0],
                    "ripple_db": 10 * math.log10(2), "atten_db": 10 * math.log10(1 + ratio ** (2 * n))})
    for ratio, n, rp in [(2.0, 3, 1.0), (1.5, 5, 0.5), (3.0, 4, 0.1)]:
        tn = math.cosh(n * math.acosh(ratio))
        e2 = 10 ** (rp / 10) - 1
        out.append({"band": "lowpass", "pass_hz": [1000.0, 0], "stop_hz": [1000.0 * ratio, 0],
                    "ripple_db": rp, "atten_db": 10 * math.log10(1 + e2 * tn * tn)})
    # Bandpass: geometrically symmetric, arithmetically symmetric and lopsided.
    bp = [
        ([1000, 2000], [500, 4000]),
        ([1000, 2000], [700, 3000]),
        ([1000, 2000], [500, 5000]),
        ([1000, 2000], [900, 2500]),
        ([10000, 12000], [9000, 13000]),
        ([10000, 12000], [8000, 16000]),
        ([300, 3400], [200, 4000]),
        ([300, 3400], [100, 8000]),
        ([50, 60], [40, 90]),
        ([1e5, 3e5], [2e4, 3.1e5]),
    ]
    # Bandstop: the notch band inside the passband edges, symmetric and not.
    bs = [
        ([1000, 5000], [1500, 2000]),
        ([1000, 4000], [1500, 2600]),
        ([500, 8000], [1900, 2100]),
        ([45, 70], [49, 51]),
        ([900, 1100], [990, 1010]),
        ([100, 20000], [1000, 1200]),
        ([2000, 2300], [2100, 2200]),
        ([1000, 3000], [1700, 1800]),
        ([10, 1000], [20, 30]),
        ([300, 400], [310, 390]),
    ]
    for rp, rs in [(0.1, 40.0), (1.0, 60.0), (0.5, 25.0)]:
        for p, s in bp:
            out.append({"band": "bandpass", "pass_hz": [float(p[0]), float(p[1])],
                        "stop_hz": [float(s[0]), float(s[1])], "ripple_db": rp, "atten_db": rs})
        for p, s in bs:
            out.append({"band": "bandstop", "pass_hz": [float(p[0]), float(p[1])],
                        "stop_hz": [float(s[0]), float(s[1])], "ripple_db": rp, "atten_db": rs})
    return out


def scipy_orders(m):
    band = m["band"]
    if band in ("lowpass", "highpass"):
        wp = TWO_PI * m["pass_hz"][0]
        ws = TWO_PI * m["stop_hz"][0]
    else:
        wp = [TWO_PI * m["pass_hz"][0], TWO_PI * m["pass_hz"][1]]
        ws = [TWO_PI * m["stop_hz"][0], TWO_PI * m["stop_hz"][1]]
    rp, rs = m["ripple_db"], m["atten_db"]
    res = {}
    for name, fn in [("butterworth", signal.buttord), ("chebyshev", signal.cheb1ord),
                     ("inverse_chebyshev", signal.cheb2ord), ("elliptic", signal.ellipord)]:
        n, _ = fn(wp, ws, rp, rs, analog=True)
        res[name] = int(n)
    return res


def zpk_json(z, p, k):
    return {
        "zeros": [[float(np.real(v)), float(np.imag(v))] for v in z],
        "poles": [[float(np.real(v)), float(np.imag(v))] for v in p],
        "gain": float(np.real(k)),
    }


def transforms():
    protos = []
    for n in [1, 2, 3, 5, 8]:
        protos.append(("butterworth", n, signal.buttap(n)))
    for n, rp in [(3, 0.5), (4, 1.0), (7, 0.1)]:
        protos.append(("chebyshev", n, signal.cheb1ap(n, rp)))
    for n, rs in [(4, 40.0), (5, 60.0)]:
        protos.append(("inverse_chebyshev", n, signal.cheb2ap(n, rs)))
    for n, rp, rs in [(3, 0.5, 40.0), (4, 0.1, 60.0), (6, 1.0, 80.0)]:
        protos.append(("elliptic", n, signal.ellipap(n, rp, rs)))
    cases = []
    for fam, n, (z, p, k) in protos:
        inp = zpk_json(z, p, k)
        for kind, args in [("lowpass", (1234.5,)), ("highpass", (50.0,)), ("bandpass", (1000.0, 300.0)),
                           ("bandpass", (20000.0, 15000.0)), ("bandstop", (60.0, 10.0)),
                           ("bandstop", (3000.0, 4000.0))]:
            if kind == "lowpass":
                out = signal.lp2lp_zpk(z, p, k, wo=TWO_PI * args[0])
            elif kind == "highpass":
                out = signal.lp2hp_zpk(z, p, k, wo=TWO_PI * args[0])
            elif kind == "bandpass":
                out = signal.lp2bp_zpk(z, p, k, wo=TWO_PI * args[0], bw=TWO_PI * args[1])
            else:
                out = signal.lp2bs_zpk(z, p, k, wo=TWO_PI * args[0], bw=TWO_PI * args[1])
            cases.append({"family": fam, "order": n, "kind": kind, "args_hz": list(args),
                          "input": inp, "output": zpk_json(*out)})
    return cases


def designs():
    cases = []
    masks_ = [
        {"band": "lowpass", "pass_hz": [1000.0, 0], "stop_hz": [3000.0, 0], "ripple_db": 1.0, "atten_db": 40.0},
        {"band": "lowpass", "pass_hz": [20000.0, 0], "stop_hz": [30000.0, 0], "ripple_db": 0.5, "atten_db": 60.0},
        {"band": "highpass", "pass_hz": [300.0, 0], "stop_hz": [100.0, 0], "ripple_db": 0.2, "atten_db": 45.0},
        {"band": "highpass", "pass_hz": [5.0, 0], "stop_hz": [3.0, 0], "ripple_db": 2.0, "atten_db": 30.0},
        {"band": "bandpass", "pass_hz": [1000.0, 2000.0], "stop_hz": [500.0, 5000.0], "ripple_db": 1.0, "atten_db": 40.0},
        {"band": "bandpass", "pass_hz": [9000.0, 11000.0], "stop_hz": [7500.0, 13200.0], "ripple_db": 0.5, "atten_db": 40.0},
    ]
    for m in masks_:
        band = m["band"]
        if band in ("lowpass", "highpass"):
            wp, ws = TWO_PI * m["pass_hz"][0], TWO_PI * m["stop_hz"][0]
        else:
            wp = [TWO_PI * m["pass_hz"][0], TWO_PI * m["pass_hz"][1]]
            ws = [TWO_PI * m["stop_hz"][0], TWO_PI * m["stop_hz"][1]]
        rp, rs = m["ripple_db"], m["atten_db"]
        n, wn = signal.buttord(wp, ws, rp, rs, analog=True)
        z, p, k = signal.butter(n, wn, btype=band, analog=True, output="zpk")
        cases.append({"family": "butterworth", "mask": m, "order": int(n), "output": zpk_json(z, p, k)})
        n, wn = signal.cheb1ord(wp, ws, rp, rs, analog=True)
        z, p, k = signal.cheby1(n, rp, wn, btype=band, analog=True, output="zpk")
        cases.append({"family": "chebyshev", "mask": m, "order": int(n), "output": zpk_json(z, p, k)})
    return cases


def main():
    rows = []
    for m in masks():
        rows.append({"mask": m, "scipy": scipy_orders(m)})
    head = "scipy.signal analog order estimators (buttord, cheb1ord, cheb2ord, ellipord, analog=True)"
    with open(os.path.join(TESTDATA, "orders_scipy.json"), "w") as f:
        json.dump({"source": head, "scipy_version": scipy.__version__, "rows": rows}, f, indent=1)
        f.write("\n")
    head = "scipy.signal buttord+butter, cheb1ord+cheby1 (analog=True, output='zpk')"
    with open(os.path.join(TESTDATA, "orders_designs_scipy.json"), "w") as f:
        json.dump({"source": head, "scipy_version": scipy.__version__, "cases": designs()}, f, indent=1)
        f.write("\n")
    head = "scipy.signal lp2lp_zpk, lp2hp_zpk, lp2bp_zpk, lp2bs_zpk of buttap, cheb1ap, cheb2ap, ellipap"
    with open(os.path.join(TESTDATA, "transforms_scipy.json"), "w") as f:
        json.dump({"source": head, "scipy_version": scipy.__version__, "cases": transforms()}, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
