"""Cross-check of the Riccati solvers against SciPy's solve_continuous_are / solve_discrete_are.

Usage: scipy_riccati_test.py PATH_TO_RICCATI_TOOL

Random problems from a fixed seed go to the tool (see riccati_tool.cpp for the format); its X must
agree with SciPy's to 1e-8 relative in the Frobenius norm. The discrete H-infinity cases
("dare-hinf") also compare the gain, and check that the tool refuses a γ at which SciPy's
solution breaks the game's conditions. One line per case; exit status 0 only when every case
agrees.
"""
import subprocess
import sys

import numpy as np
from scipy import linalg

AGREEMENT = 1e-8


def run_tool(tool, kind, a, b, q, r, s):
    n, m = b.shape
    numbers = [kind, str(n), str(m)]
    for matrix in (a, b, q, r, s):
        numbers.extend(repr(float(v)) for v in matrix.ravel())
    completed = subprocess.run([tool], input=" ".join(numbers), capture_output=True, text=True,
                               timeout=60, check=False)
    lines = completed.stdout.strip().splitlines()
    if completed.returncode != 0 or not lines or lines[0] != "ok":
        return None, (completed.stdout + completed.stderr).strip()
    return np.array([[float(v) for v in line.split()] for line in lines[1:]]), ""


def random_problem(rng, n, m, cross_term, scale):
    a = scale * rng.standard_normal((n, n))
    b = rng.standard_normal((n, m))
    c = rng.standard_normal((n + m, n))
    d = rng.standard_normal((n + m, m))
    q = c.T @ c
    r = d.T @ d
    s = c.T @ d if cross_term else np.zeros((n, m))
    if not cross_term:
        r += np.eye(m)
    return a, b, (q + q.T) / 2, (r + r.T) / 2, s


def hinf_problem(rng, n, m, gamma):
    """ẋ = A x + B1 w + B2 u, z = C x + D u in the one-solver form: B = [B1 B2],
    R = diag(−γ², DᵀD), S = [0, CᵀD], Q = CᵀC (indefinite R)."""
    a = rng.standard_normal((n, n))
    b = np.hstack([0.5 * rng.standard_normal((n, 1)), rng.standard_normal((n, m))])
    c = rng.standard_normal((n + m, n))
    d = rng.standard_normal((n + m, m))
    r = np.zeros((m + 1, m + 1))
    r[0, 0] = -gamma**2
    r[1:, 1:] = d.T @ d
    s = np.hstack([np.zeros((n, 1)), c.T @ d])
    q = c.T @ c
    return a, b, (q + q.T) / 2, (r + r.T) / 2, s


def discrete_hinf_problem(rng, n, m):
    """x⁺ = A x + B1 w + B2 u, z = [Q½ x; R½ u] with A of spectral radius about 1.2."""
    a = rng.standard_normal((n, n))
    a *= 1.2 / max(abs(np.linalg.eigvals(a)))
    b1 = 0.5 * rng.standard_normal((n, 1))
    b2 = rng.standard_normal((n, m))
    c = rng.standard_normal((n + m, n))
    d = rng.standard_normal((n + m, m))
    q = c.T @ c
    r = d.T @ d + np.eye(m)
    return a, b1, b2, (q + q.T) / 2, (r + r.T) / 2


def indefinite_form(b1, b2, r, gamma):
    """B = [B1 B2], R = diag(−γ², R): the discrete game as one DARE (SciPy accepts R indefinite)."""
    m = b2.shape[1]
    big_r = np.zeros((m + 1, m + 1))
    big_r[0, 0] = -gamma**2
    big_r[1:, 1:] = r
    return np.hstack([b1, b2]), big_r


def scipy_discrete_hinf(a, b1, b2, q, r, gamma):
    """SciPy's X and gain K (the u rows of −(R + BᵀXB)⁻¹BᵀXA), and whether the game's
    conditions hold: the equation satisfied, X ≥ 0, γ² − B1ᵀXB1 > 0, A − B2 K stable.
    None when SciPy finds no solution."""
    b, big_r = indefinite_form(b1, b2, r, gamma)
    try:
        x = linalg.solve_discrete_are(a, b, q, big_r)
    except (ValueError, np.linalg.LinAlgError):
        return None
    middle = big_r + b.T @ x @ b
    gain = np.linalg.solve(middle, b.T @ x @ a)[1:]
    residual = a.T @ x @ a - x - a.T @ x @ b @ np.linalg.solve(middle, b.T @ x @ a) + q
    conditions = (np.linalg.norm(residual) <= 1e-8 * np.linalg.norm(x)
                  and min(np.linalg.eigvalsh(x)) >= -1e-8 * max(abs(np.linalg.eigvalsh(x)))
                  and gamma**2 - (b1.T @ x @ b1)[0, 0] > 0
                  and max(abs(np.linalg.eigvals(a - b2 @ gain))) < 1)
    return x, gain, conditions


def run_discrete_hinf(tool, rng, n, m):
    """One random discrete game: γ at the smallest power of two (from 64 down) where SciPy's
    solution meets the conditions, and twice that, must agree; at half of it, where SciPy's
    does not, the tool must refuse. Returns (label, worst difference or None, message)."""
    a, b1, b2, q, r = discrete_hinf_problem(rng, n, m)
    label = f"dare-hinf n={n} m={m}"
    feasible = 64.0
    reference = scipy_discrete_hinf(a, b1, b2, q, r, feasible)
    if reference is None or not reference[2]:
        return label, None, "SciPy finds no design at gamma = 64"
    while feasible > 1e-3:
        half = scipy_discrete_hinf(a, b1, b2, q, r, feasible / 2)
        if half is None or not half[2]:
            break
        feasible /= 2
    worst = 0.0
    for gamma in (feasible, 2 * feasible):
        x, gain, _ = scipy_discrete_hinf(a, b1, b2, q, r, gamma)
        b, big_r = indefinite_form(b1, b2, r, gamma)
        ours, message = run_tool(tool, "dare-hinf", a, b, q, big_r, np.zeros(b.shape))
        if ours is None:
            return label, None, f"tool failed at gamma = {gamma:g}: {message}"
        if ours.shape != (n + m, n):
            return label, None, f"tool printed a {ours.shape} matrix, expected {(n + m, n)}"
        worst = max(worst, np.linalg.norm(ours[:n] - x) / np.linalg.norm(x),
                    np.linalg.norm(ours[n:] - gain) / np.linalg.norm(gain))
    b, big_r = indefinite_form(b1, b2, r, feasible / 2)
    refused, _ = run_tool(tool, "dare-hinf", a, b, q, big_r, np.zeros(b.shape))
    if refused is not None:
        return label, None, f"tool accepted gamma = {feasible / 2:g}, where SciPy's X breaks the conditions"
    return label + f" gamma_feasible={feasible:g}", worst, ""


def main():
    if len(sys.argv) != 2:
        print(__doc__)
        return 2
    tool = sys.argv[1]
    rng = np.random.default_rng(20240611)
    # (kind, n, m, cross term, parameter): the parameter scales A for "care", "care-sign" and
    # "dare" (discrete systems get a spectral radius around 1.2) and is γ for "care-hinf".
    cases = []
    for n in range(1, 9):
        for m in (1, 2, 3):
            cross_term = (n + m) % 2 == 0
            cases.append(("care", n, m, cross_term, 1.0))
            cases.append(("care-sign", n, m, cross_term, 1.0))
            cases.append(("dare", n, m, cross_term, 1.2 / np.sqrt(n)))
    for n in (2, 4, 6):
        cases.append(("care-hinf", n, 2, True, 10.0))
    failures = 0
    worst = {"care": 0.0, "care-sign": 0.0, "care-hinf": 0.0, "dare": 0.0}
    for kind, n, m, cross_term, parameter in cases:
        if kind == "care-hinf":
            a, b, q, r, s = hinf_problem(rng, n, m, gamma=parameter)
        else:
            a, b, q, r, s = random_problem(rng, n, m, cross_term, parameter)
        if kind.startswith("care"):
            reference = linalg.solve_continuous_are(a, b, q, r, s=s)
        else:
            reference = linalg.solve_discrete_are(a, b, q, r, s=s)
        label = f"{kind} n={n} m={m}{' with S' if cross_term else ''}"
        ours, message = run_tool(tool, "care" if kind == "care-hinf" else kind, a, b, q, r, s)
        if ours is None:
            print(f"FAIL {label}: tool failed: {message}")
            failures += 1
            continue
        if ours.shape != reference.shape:
            print(f"FAIL {label}: tool printed a {ours.shape} matrix, expected {reference.shape}")
            failures += 1
            continue
        difference = np.linalg.norm(ours - reference) / np.linalg.norm(reference)
        worst[kind] = max(worst[kind], difference)
        verdict = "ok  " if difference <= AGREEMENT else "FAIL"
        print(f"{verdict} {label}: relative difference {difference:.3g}")
        if difference > AGREEMENT:
            failures += 1
    worst["dare-hinf"] = 0.0
    discrete_games = [(n, m) for n in (2, 3, 4, 6, 8) for m in (1, 2)]
    for n, m in discrete_games:
        label, difference, message = run_discrete_hinf(tool, rng, n, m)
        if difference is None:
            print(f"FAIL {label}: {message}")
            failures += 1
            continue
        worst["dare-hinf"] = max(worst["dare-hinf"], difference)
        verdict = "ok  " if difference <= AGREEMENT else "FAIL"
        print(f"{verdict} {label}: relative difference of X and K {difference:.3g}")
        if difference > AGREEMENT:
            failures += 1
    cases += discrete_games
    summary = ", ".join(f"{kind} {value:.3g}" for kind, value in worst.items())
    print(f"largest relative difference: {summary} (tolerance {AGREEMENT:g})")
    if failures:
        print(f"FAILED: {failures} of {len(cases)} cases disagree with SciPy")
        return 1
    print(f"PASSED: all {len(cases)} cases agree with SciPy to {AGREEMENT:g}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
