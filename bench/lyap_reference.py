#!/usr/bin/python3
"""SciPy reference timings for lyacert/certify/lyap.

Times scipy.linalg.solve_continuous_lyapunov and solve_discrete_lyapunov on
the same kind of random stable matrices as the Go benchmarks
(BenchmarkContinuous / BenchmarkDiscrete in certify/lyap/bench_test.go):

  continuous:  A = M - (alpha(M) + 1) I, so the spectral abscissa is -1
  discrete:    A = 0.9 M / rho(M),       so the spectral radius is 0.9
  both:        Q = N N^T + I

with M, N having independent N(0, 1/n) entries, drawn from a fixed seed
(NumPy's generator, so the matrices are of the same kind as Go's, not the
same numbers). Each solve is timed as the median of several runs and the
relative residual is printed with the same formula as the Go package's
ContinuousResidual / DiscreteResidual.

SciPy's conventions differ from lyacert's:
  solve_continuous_lyapunov(a, q) solves a X + X a^H = q
  solve_discrete_lyapunov(a, q)   solves a X a^H - X + q = 0
so lyacert's  A^T P + P A = -Q  is  solve_continuous_lyapunov(A.T, -Q)  and
             A^T P A - P = -Q   is  solve_discrete_lyapunov(A.T, Q).

Run with Debian's Python (apt-get install -y python3-scipy):

  /usr/bin/python3 bench/lyap_reference.py
"""

import argparse
import os
import platform
import statistics
import sys
import time

try:
    import numpy as np
    import scipy
    import scipy.linalg as sla
except ImportError as exc:  # pragma: no cover - environment message
    sys.exit(
        f"lyap_reference.py: {exc}\n"
        "Install Debian's SciPy with `apt-get install -y python3-scipy` and run this\n"
        "script with that interpreter: `/usr/bin/python3 bench/lyap_reference.py`\n"
        "(a python3 earlier on PATH, e.g. pyenv's, does not see Debian's packages)."
    )


def rand_stable(n, rng):
    m = rng.standard_normal((n, n)) / np.sqrt(n)
    alpha = np.linalg.eigvals(m).real.max()
    return m - (alpha + 1.0) * np.eye(n)


def rand_schur_stable(n, rng):
    m = rng.standard_normal((n, n)) / np.sqrt(n)
    rho = np.abs(np.linalg.eigvals(m)).max()
    return 0.9 * m / rho


def rand_spd(n, rng):
    m = rng.standard_normal((n, n)) / np.sqrt(n)
    return m @ m.T + np.eye(n)


def fro(x):
    return np.linalg.norm(x, "fro")


def continuous(a, q):
    return sla.solve_continuous_lyapunov(a.T, -q)


def discrete(a, q):
    return sla.solve_discrete_lyapunov(a.T, q)


def continuous_residual(a, p, q):
    return fro(a.T @ p + p @ a + q) / (fro(a) * fro(p) + fro(q))


def discrete_residual(a, p, q):
    an, pn = fro(a), fro(p)
    return fro(a.T @ p @ a - p + q) / (an * an * pn + pn + fro(q))


def median_time(f, min_runs, min_seconds):
    """Median wall time of f() over at least min_runs runs and min_seconds."""
    f()  # warm-up
    times = []
    start = time.perf_counter()
    while len(times) < min_runs or time.perf_counter() - start < min_seconds:
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
        if len(times) >= 1000:
            break
    return statistics.median(times), len(times)


def blas_info():
    try:
        import threadpoolctl

        infos = threadpoolctl.threadpool_info()
        return "; ".join(
            f"{i.get('internal_api')} {i.get('version')} {i.get('architecture', '')} "
            f"threads={i.get('num_threads')}"
            for i in infos
        )
    except ImportError:
        pass
    try:  # Debian's NumPy links OpenBLAS through libblas.so.3 by default
        import ctypes

        lib = ctypes.CDLL("libblas.so.3")
        lib.openblas_get_config.restype = ctypes.c_char_p
        lib.openblas_get_corename.restype = ctypes.c_char_p
        return (
            f"{lib.openblas_get_config().decode()} core={lib.openblas_get_corename().decode()} "
            f"threads={lib.openblas_get_num_threads()}"
        )
    except (OSError, AttributeError):
        return "unknown (install python3-threadpoolctl to see it)"


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sizes", default="10,20,50,100,200,400", help="comma-separated n (default %(default)s)")
    ap.add_argument("--seed", type=int, default=20260101, help="RNG seed (default %(default)s)")
    ap.add_argument("--min-runs", type=int, default=7, help="at least this many timed runs (default %(default)s)")
    ap.add_argument("--min-seconds", type=float, default=0.5, help="and at least this long per case (default %(default)s)")
    args = ap.parse_args()
    sizes = [int(s) for s in args.sizes.split(",") if s]

    print(f"python {platform.python_version()}, numpy {np.__version__}, scipy {scipy.__version__}")
    print(f"BLAS: {blas_info()}")
    env = {k: os.environ[k] for k in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "OPENBLAS_CORETYPE", "OPENBLAS_L2_SIZE") if k in os.environ}
    if env:
        print(f"env: {env}")
    print(f"cpus: {os.cpu_count()}, seed {args.seed}, median of >= {args.min_runs} runs and >= {args.min_seconds}s")
    print()
    print(f"{'equation':<11} {'n':>4} {'median':>12} {'runs':>5} {'rel. residual':>14}")

    rng = np.random.default_rng(args.seed)
    for kind, gen, solve, resid in (
        ("continuous", rand_stable, continuous, continuous_residual),
        ("discrete", rand_schur_stable, discrete, discrete_residual),
    ):
        for n in sizes:
            a = gen(n, rng)
            q = rand_spd(n, rng)
            med, runs = median_time(lambda: solve(a, q), args.min_runs, args.min_seconds)
            p = solve(a, q)
            p = 0.5 * (p + p.T)
            print(f"{kind:<11} {n:>4} {fmt_time(med):>12} {runs:>5} {resid(a, p, q):>14.2e}")


def fmt_time(s):
    if s < 1e-3:
        return f"{s * 1e6:.1f} µs"
    return f"{s * 1e3:.2f} ms"


if __name__ == "__main__":
    main()
