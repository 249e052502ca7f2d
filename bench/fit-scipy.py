"""
The SciPy anchor of `npm run bench -- fit`: fits the same data from the same start values with
the same σ by scipy.optimize.curve_fit (method "lm", MINPACK lmder with the analytic Jacobian) at
the fitter's own tolerances, and times the fits inside this process so start-up is not counted.
Driven over stdin/stdout by bench/fit.ts, one JSON line each way (see main).
"""
import json
import sys
import time

import numpy as np
import scipy
from scipy.optimize import curve_fit


def hahn_echo(t, s0, a, t2, n):
    return s0 + a * np.exp(-((t / t2) ** n))


def hahn_echo_jacobian(t, s0, a, t2, n):
    positive = t > 0
    log_u = np.log(t / t2, where=positive, out=np.zeros_like(t))
    un = np.exp(n * log_u) * positive
    e = np.exp(-un)
    jac = np.empty((t.size, 4))
    jac[:, 0] = 1
    jac[:, 1] = e
    jac[:, 2] = a * e * un * n / t2
    jac[:, 3] = -a * e * un * log_u
    return jac


PATTERN_14N = np.array([-1.0, 0.0, 1.0])


def triplet(f, b, f0, apar, w, c):
    q = 2 * (f[:, None] - f0 - PATTERN_14N * apar) / w
    return b * (1 - c * (1 / (1 + q * q)).sum(axis=1))


def triplet_jacobian(f, b, f0, apar, w, c):
    q = 2 * (f[:, None] - f0 - PATTERN_14N * apar) / w
    lorentz = 1 / (1 + q * q)
    slope = 4 * q * lorentz * lorentz / w
    total = lorentz.sum(axis=1)
    jac = np.empty((f.size, 5))
    jac[:, 0] = 1 - c * total
    jac[:, 1] = -b * c * slope.sum(axis=1)
    jac[:, 2] = -b * c * (slope * PATTERN_14N).sum(axis=1)
    jac[:, 3] = -b * c * (2 * q * q * lorentz * lorentz / w).sum(axis=1)
    jac[:, 4] = -b * total
    return jac


MODELS = {
    "hahn_echo": (hahn_echo, hahn_echo_jacobian),
    "odmr_14n_triplet": (triplet, triplet_jacobian),
}


def make_fit(case):
    model, jacobian = MODELS[case["model"]]
    tol = case["tolerances"]
    datasets = [
        (np.asarray(d["x"], float), np.asarray(d["y"], float), np.asarray(d["sigma"], float), np.asarray(d["start"], float))
        for d in case["datasets"]
    ]

    def fit(i):
        x, y, sigma, start = datasets[i % len(datasets)]
        popt, _ = curve_fit(
            model, x, y, p0=start, sigma=sigma, jac=jacobian, method="lm",
            ftol=tol["ftol"], xtol=tol["xtol"], gtol=tol["gtol"], maxfev=tol["maxEvaluations"],
        )
        return popt

    return fit, len(datasets)


def main():
    """
    First line: {"cases": [...]}; answers with the versions and every case's optima per dataset.
    Then each line "<case index> <fits>" runs that many fits (after a warm-up the first time) and
    answers with their times in milliseconds, so the caller can alternate rounds with its own.
    """
    request = json.loads(sys.stdin.readline())
    fits = [make_fit(case) for case in request["cases"]]
    hello = {"scipy": scipy.__version__, "numpy": np.__version__, "python": sys.version.split()[0]}
    hello["params"] = [[fit(i).tolist() for i in range(count)] for fit, count in fits]
    for case, (fit, _) in zip(request["cases"], fits):
        for i in range(case["warmup"]):
            fit(i)
    print(json.dumps(hello), flush=True)
    clock = time.perf_counter
    next_index = [0] * len(fits)
    for line in sys.stdin:
        case_index, count = (int(v) for v in line.split())
        fit = fits[case_index][0]
        times = []
        for _ in range(count):
            t0 = clock()
            fit(next_index[case_index])
            times.append(1e3 * (clock() - t0))
            next_index[case_index] += 1
        print(json.dumps(times), flush=True)


if __name__ == "__main__":
    main()
