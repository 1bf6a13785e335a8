#!/usr/bin/python3
"""Side-by-side timings: lyacert against Debian's sympy and scipy.

Run by hand from the repository root (Debian's interpreter, which sees
python3-sympy and python3-scipy; the script installs them with apt-get when
they are missing and it runs as root):

    /usr/bin/python3 bench/side_by_side.py [--derive 5,10,20,40,80] [--find 10,20,50] [--runs 5]

Two workloads, interleaved size by size, each printed as our median, the
reference's median and the ratio reference/ours (> 1: lyacert is faster):

derive  The cyclic chain x_i' = -x_i + k*x_(i-1) (x_0 = x_n), V = sum x_i^2,
        one symbolic gain k (an invented model, the same text as the Go
        benchmark's). Ours: BenchmarkDeriveCyclic (V-dot, Gram matrices,
        exact LDL^T, leading minors, factored conditions) through go test.
        Reference: sympy computes V-dot, the Gram matrix of -V-dot, all its
        leading minors by one fraction-free (Bareiss) elimination over Z[k]
        with exact division, and factors each minor.
find    A random stable linear model x' = A x (numpy's generator, seed 1):
        A = M - s I, M with entries k/(10 ceil(sqrt n)), k integer in [-9, 9],
        s the least integer >= alpha(M) + 1. Ours: `lyacert find` end to end
        (the exact certificate and its re-check included), one process per
        run. Reference: scipy.linalg.solve_continuous_lyapunov(A^T, -I) and a
        numpy Cholesky of P and of -(A^T P + P A) (floating point only).
"""
import argparse, math, os, re, shutil, statistics, subprocess, sys, tempfile, time

def ensure_packages():
    try:
        import sympy, scipy  # noqa: F401
        return
    except ImportError:
        pass
    if os.geteuid() != 0 or not shutil.which("apt-get"):
        sys.exit("needs python3-sympy and python3-scipy: apt-get update && apt-get install -y python3-sympy python3-scipy")
    subprocess.run(["apt-get", "update", "-qq"], check=True)
    subprocess.run(["apt-get", "install", "-y", "-qq", "python3-sympy", "python3-scipy"], check=True)

def median_time(fn, runs):
    ts = []
    for _ in range(runs):
        t = time.perf_counter(); fn(); ts.append(time.perf_counter() - t)
    return statistics.median(ts)

def sympy_derive(n):
    import sympy as sp
    k = sp.Symbol("k")
    x = sp.symbols(f"x1:{n + 1}")
    f = [-x[i] + k * x[(i - 1) % n] for i in range(n)]
    V = sum(xi**2 for xi in x)
    vdot = sp.expand(sum(sp.diff(V, x[i]) * f[i] for i in range(n)))
    G = [[sp.Poly(sp.diff(-vdot, x[i], x[j]) / 2, k, domain="ZZ") for j in range(n)] for i in range(n)]
    prev = sp.Poly(1, k, domain="ZZ")
    minors = []
    for p in range(n):  # Bareiss: G[p][p] is the (p+1)-th leading minor
        minors.append(G[p][p])
        for i in range(p + 1, n):
            for j in range(p + 1, n):
                G[i][j] = (G[p][p] * G[i][j] - G[i][p] * G[p][j]).exquo(prev)
        prev = G[p][p]
    return [m.factor_list() for m in minors]

def go_bench(pattern, pkg, runs):
    out = subprocess.run(["go", "test", pkg, "-run", "^$", "-bench", pattern, "-benchtime", "1x",
                          "-count", str(runs)], capture_output=True, text=True, check=True).stdout
    ts = [float(m.group(1)) / 1e9 for m in re.finditer(r"\s(\d+(?:\.\d+)?) ns/op", out)]
    if not ts:
        sys.exit("no benchmark output for " + pattern + ":\n" + out)
    return statistics.median(ts)

def random_stable(n, rng):
    import numpy as np
    den = 10 * math.ceil(math.sqrt(n))
    K = rng.integers(-9, 10, size=(n, n))
    alpha = max(np.linalg.eigvals(K / den).real)
    s = math.ceil(alpha + 1)
    return K - s * den * np.eye(n, dtype=int), den

def model_text(K, den):
    n = len(K)
    names = [f"x{i + 1}" for i in range(n)]
    lines = ["state " + ", ".join(names)]
    for i in range(n):
        terms = [f"{int(K[i][j])}/{den}*{names[j]}" for j in range(n) if K[i][j] != 0]
        lines.append(f"{names[i]}' = " + " + ".join(terms))
    return "\n".join(lines) + "\n"

def scipy_find(A):
    import numpy as np
    from scipy.linalg import solve_continuous_lyapunov
    P = solve_continuous_lyapunov(A.T, -np.eye(len(A)))
    np.linalg.cholesky(P)
    np.linalg.cholesky(-(A.T @ P + P @ A))

def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--derive", default="5,10,20,40,80")
    ap.add_argument("--find", default="10,20,50,100,200")
    ap.add_argument("--runs", type=int, default=5)
    a = ap.parse_args()
    ensure_packages()
    import numpy as np, sympy, scipy
    print(f"sympy {sympy.__version__}, scipy {scipy.__version__}, numpy {np.__version__}; medians of {a.runs} runs")
    print(f"{'workload':<10} {'n':>4} {'lyacert':>12} {'reference':>12} {'ratio':>8}")
    for n in [int(v) for v in a.derive.split(",") if v]:
        ours = go_bench(f"BenchmarkDeriveCyclic/n={n}$", "./certify/direct", a.runs)
        ref = median_time(lambda: sympy_derive(n), a.runs)
        print(f"{'derive':<10} {n:>4} {ours:>11.4f}s {ref:>11.4f}s {ref / ours:>8.2f}", flush=True)
    tmp = tempfile.mkdtemp()
    exe = os.path.join(tmp, "lyacert")
    subprocess.run(["go", "build", "-o", exe, "./cmd/lyacert"], check=True)
    rng = np.random.default_rng(1)
    for n in [int(v) for v in a.find.split(",") if v]:
        K, den = random_stable(n, rng)
        path = os.path.join(tmp, f"linear{n}.lya")
        with open(path, "w") as fh:
            fh.write(model_text(K, den))
        def ours_run():
            r = subprocess.run([exe, "find", path], capture_output=True, text=True)
            if r.returncode != 0:
                raise RuntimeError(f"lyacert find n={n} exited {r.returncode}: {r.stderr.strip()[:300]}")
        try:
            ours = median_time(ours_run, a.runs)
        except RuntimeError as e:
            print(f"{'find':<10} {n:>4} {'failed':>12}   ({e})", flush=True)
            continue
        A = K / den
        ref = median_time(lambda: scipy_find(A), a.runs)
        print(f"{'find':<10} {n:>4} {ours:>11.4f}s {ref:>11.4f}s {ref / ours:>8.4f}", flush=True)
    shutil.rmtree(tmp)

if __name__ == "__main__":
    main()
