#!/usr/bin/python3
"""Write internal/ellip/testdata/scipy_ellip.json: reference values of the
complete elliptic integral K and the Jacobi elliptic functions sn, cn, dn,
computed with SciPy (scipy.special.ellipk, ellipkm1,
ellipj, ellipkinc).

Run from the repository root with Debian's interpreter:
    /usr/bin/python3 internal/scipyref/ellip.py
Arguments are moduli k (the Go convention), converted to SciPy's
parameter m = k^2; for k close to 1 the complementary parameter
p = 1 - m = kc^2 is passed to ellipkm1 instead.
"""
import json
import math
import os

import numpy as np
import scipy
from scipy import special

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "ellip", "testdata", "scipy_ellip.json")


def main():
    kvals = []
    for k in [0.0, 1e-8, 1e-4, 0.01, 0.1, 0.3, 0.5, 1 / math.sqrt(2), 0.8, 0.9, 0.99, 0.999]:
        kc = math.sqrt((1 - k) * (1 + k))
        kvals.append({"k": k, "kc": kc, "K": float(special.ellipk(k * k)), "Kc": float(special.ellipkm1(k * k)) if k > 0 else None})
    # Moduli so close to 1 that only the complementary modulus is exact.
    kc_small = []
    for kc in [1e-12, 1e-8, 1e-5, 1e-3, 0.05]:
        kc_small.append({"kc": kc, "K": float(special.ellipkm1(kc * kc))})
    jac = []
    for k in [0.0, 0.2, 0.5, 0.8, 0.95, 0.999]:
        kc = math.sqrt((1 - k) * (1 + k))
        for u in [-2.5, -0.7, 0.0, 0.1, 0.5, 1.0, 1.7, 3.0, 6.0]:
            sn, cn, dn, _ = special.ellipj(u, k * k)
            jac.append({"u": u, "k": k, "kc": kc, "sn": float(sn), "cn": float(cn), "dn": float(dn)})
    inc = []
    for k in [0.1, 0.6, 0.99]:
        for phi in [0.2, 1.0, 1.5]:
            inc.append({"phi": phi, "k": k, "F": float(special.ellipkinc(phi, k * k))})
    data = {
        "source": "scipy.special.ellipk, ellipkm1, ellipj, ellipkinc",
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "k": kvals,
        "kc_small": kc_small,
        "jacobi": jac,
        "incomplete": inc,
    }
    # K(k) complement column: K'(k) = K(kc) = ellipk(kc^2) = ellipkm1(k^2).
    with open(OUT, "w") as f:
        json.dump(data, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
