"""Cross-check of the design pictures' curves against SciPy.

Usage: scipy_design_curves_test.py PATH_TO_CURVES_TOOL MODEL.xml...

For each demo robot, the tool prints every picture's loop (A, B, C, D and the period) with the
frequencies and our L(jω), and every controller's closed loop under the design push with our
response. Here SciPy computes them independently:
- the frequency responses by their definition, C (sI − A)⁻¹ B + D at s = jω (continuous) or
  z = e^{jωT} (sampled), with scipy.linalg.solve: they must agree to 1e-9 relative to |L|; and
  the continuous loops of six states also with scipy.signal.freqresp, to 1e-8 (SciPy goes through
  a transfer function, too badly conditioned for the larger loops to compare closer);
- the push responses by integrating ẋ = A x + B F(t), F the half-sine, with
  scipy.integrate.solve_ivp (DOP853, rtol 1e-11, atol 1e-13 × scale) from rest, sampled at the
  tool's times; the pitch, position and current must agree to 1e-6 of each signal's peak.
One line per case; exit status 0 only when every case agrees.
"""
import json
import subprocess
import sys
import warnings

import numpy as np
from scipy import integrate, linalg, signal

FREQUENCY_AGREEMENT = 1e-9
TRANSFER_FUNCTION_AGREEMENT = 1e-8
RESPONSE_AGREEMENT = 1e-6


def check_loop(loop):
    a, b, c, d = (np.array(loop[k], dtype=float) for k in ("A", "B", "C", "D"))
    omega = np.array(loop["omega"])
    period = loop["period_s"]
    ours = np.array(loop["re"]) + 1j * np.array(loop["im"])
    points = np.exp(1j * omega * period) if period > 0 else 1j * omega
    identity = np.eye(a.shape[0])
    by_definition = np.array([(c @ linalg.solve(p * identity - a, b))[0, 0] + d[0, 0]
                              for p in points])
    worst = np.max(np.abs(ours - by_definition) / (np.abs(by_definition) + 1e-12))
    agreed = worst <= FREQUENCY_AGREEMENT
    line = f"{loop['name']}: worst relative gap {worst:.2e}"
    # SciPy's own frequency response goes through a transfer function, well conditioned only for
    # the continuous loops of the plant's six states.
    if period == 0 and a.shape[0] <= 6:
        _, theirs = signal.freqresp((a, b, c, d), w=omega)
        gap = np.max(np.abs(ours - np.ravel(theirs)) / (np.abs(theirs) + 1e-12))
        agreed &= gap <= TRANSFER_FUNCTION_AGREEMENT
        line += f", to scipy.signal.freqresp {gap:.2e}"
    return agreed, line


def check_push(push):
    a, b, c = (np.array(push[k], dtype=float) for k in ("A", "B", "C"))
    peak, duration = push["peak_N"], push["duration_s"]
    times = np.array(push["time_s"])

    def force(t):
        return peak * np.sin(np.pi * t / duration) if t < duration else 0.0

    def derivative(t, x):
        return a @ x + b[:, 0] * force(t)

    n = a.shape[0]
    # Two pieces, so the integrator never steps across the push's end.
    during = times[times <= duration]
    after = times[times > duration]
    first = integrate.solve_ivp(derivative, (0, duration), np.zeros(n), method="DOP853",
                                t_eval=during, rtol=1e-11, atol=1e-13, max_step=duration / 20)
    at_end = integrate.solve_ivp(derivative, (0, duration), np.zeros(n), method="DOP853",
                                 rtol=1e-11, atol=1e-13, max_step=duration / 20).y[:, -1]
    second = integrate.solve_ivp(derivative, (duration, times[-1]), at_end, method="DOP853",
                                 t_eval=after, rtol=1e-11, atol=1e-13)
    states = np.hstack([first.y, second.y])
    outputs = c @ states
    x, u = outputs[:6], outputs[6:]
    current = push["current_per_input"] * u + np.array(push["current_per_state"]) @ x
    worst = 0.0
    for ours, theirs in ((push["pitch_rad"], x[2]), (push["position_m"], x[0]),
                         (push["current_left_A"], current[0])):
        ours = np.array(ours)
        worst = max(worst, np.max(np.abs(ours - theirs)) / max(np.max(np.abs(theirs)), 1e-300))
    return worst <= RESPONSE_AGREEMENT, f"{push['name']} push: worst gap {worst:.2e} of the peak"


def main():
    # The transfer function's conditioning is judged by the comparison itself.
    warnings.simplefilter("ignore", signal.BadCoefficients)
    tool = sys.argv[1]
    ok = True
    for model in sys.argv[2:]:
        completed = subprocess.run([tool, model], capture_output=True, text=True, timeout=120,
                                   check=False)
        if completed.returncode != 0:
            print(f"{model}: the tool failed: {completed.stderr.strip()}")
            ok = False
            continue
        curves = json.loads(completed.stdout)
        if not curves["loops"] or not curves["pushes"]:
            print(f"{model}: no curves")
            ok = False
        for case in curves["loops"]:
            agreed, line = check_loop(case)
            ok &= agreed
            print(("ok   " if agreed else "FAIL ") + model + " " + line)
        for case in curves["pushes"]:
            agreed, line = check_push(case)
            ok &= agreed
            print(("ok   " if agreed else "FAIL ") + model + " " + line)
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
