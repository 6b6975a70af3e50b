#!/usr/bin/python3
"""Write series/testdata/wilson_scipy.json: Wilson score intervals of a
binomial proportion computed with SciPy, for comparison with
series.Spread.YieldInterval.

Each case is a Monte Carlo outcome (passed out of trials) and a
confidence level; the interval is
scipy.stats.binomtest(passed, trials).proportion_ci(confidence,
method="wilson"), stored with repr precision (json writes floats
round-trip exact).

Run from the repository root with Debian's interpreter:
    /usr/bin/python3 internal/scipyref/yield.py
"""
import json
import os

import scipy
from scipy import stats

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "series", "testdata", "wilson_scipy.json")

# (passed, trials, confidence): an even split, all passed, none passed, and
# a low yield at two confidence levels.
CASES = [
    (50, 100, 0.95),
    (20, 20, 0.95),
    (0, 20, 0.95),
    (37, 400, 0.95),
    (37, 400, 0.99),
]


def main():
    cases = []
    for passed, trials, conf in CASES:
        ci = stats.binomtest(passed, trials).proportion_ci(confidence_level=conf, method="wilson")
        cases.append({"passed": passed, "trials": trials, "confidence": conf,
                      "lo": float(ci.low), "hi": float(ci.high)})
    out = {
        "generator": "internal/scipyref/yield.py",
        "source": "scipy.stats.binomtest(passed, trials).proportion_ci(confidence, method='wilson')",
        "scipy_version": scipy.__version__,
        "cases": cases,
    }
    with open(OUT, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
