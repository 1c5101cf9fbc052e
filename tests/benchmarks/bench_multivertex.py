"""General graph functions: trihedral graphs of weight <= 6 at 20 digits, the two weight-6
four-vertex graphs of the four-graviton expansion (the doubled square and K4) at 12 digits,
and the plain truncated lattice sum as the peer.

True digits: each value is compared with a value at higher precision from an independent
run — for cycles of bundles the same sum with a larger split radius, higher local-expansion
degree, larger quadrature rules and box (digits + 8); for K4 the mixed route with more
shells; for the cycles that are secretly dihedral (C(2,1,1), C(1,1,1,1,1) as cycles of two
or three bundles) the dihedral engine at 40 digits, a different method altogether.
Times are CPU seconds of this process (time.process_time).
"""

from __future__ import annotations

import math
import time

import mpmath
import numpy as np

from accuracy import true_digits

TAUS = {"0.27+1.31i": mpmath.mpc("0.27", "1.31"), "i": mpmath.mpc(0, 1)}
TRIHEDRALS = {
    "(1;11;11) w5": [(1,), (1, 1), (1, 1)],
    "(2;11;11) w6": [(2,), (1, 1), (1, 1)],
    "(1;21;11) w6": [(1,), (2, 1), (1, 1)],
    "(11;11;11) w6": [(1, 1), (1, 1), (1, 1)],
    "(1;11;111) w6": [(1,), (1, 1), (1, 1, 1)],
}
DIHEDRAL_CYCLES = {"C(2,1,1) as (11;1;1)": ([(1, 1), (1,), (1,)], (2, 1, 1)),
                   "C(1,1,1,1,1) as (11;111)": ([(1, 1), (1, 1, 1)], (1, 1, 1, 1, 1))}


def _timed(function, *args, **kwargs):
    start = time.process_time()
    result = function(*args, **kwargs)
    return result, time.process_time() - start


def peer_cycle(tau: complex, bundles, target_digits: float = 12, time_budget: float = 120.0):
    """The plain truncated lattice sum of a cycle of bundles (numpy FFTs, every edge momentum
    in |m|, |n| <= L), extrapolated in L with (a + b log L)/L^2 + c/L^3; returns
    (value, CPU seconds) when two extrapolations agree to ``target_digits`` or time is up."""
    start = time.process_time()
    sizes, values, best, previous = [], [], float("nan"), None
    size = 16
    while time.process_time() - start < time_budget and size <= 512:
        sizes.append(size)
        values.append(_truncated_cycle(tau, bundles, size))
        if len(sizes) >= 4:
            matrix = np.array([[1.0, s ** -2.0, math.log(s) * s ** -2.0, s ** -3.0]
                               for s in sizes[-4:]])
            best = float(np.linalg.solve(matrix, np.array(values[-4:]))[0])
            if previous is not None and abs(best - previous) <= 10.0 ** -target_digits * abs(best):
                break
            previous = best
        size *= 2
    return best, time.process_time() - start


def _truncated_cycle(tau: complex, bundles, size: int) -> float:
    n = 2 * max(len(b) for b in bundles) * size + 2
    grid = np.arange(-size, size + 1)
    m, k = np.meshgrid(grid, grid, indexing="ij")
    norm2 = np.abs(m * tau + k) ** 2
    norm2[size, size] = np.inf
    greens = {}
    for a in {a for b in bundles for a in b}:
        table = np.zeros((n, n), dtype=complex)
        table[m % n, (-k) % n] = (tau.imag / math.pi) ** a / norm2 ** a
        greens[a] = np.fft.ifft2(table) * n * n
    product = np.ones((n, n), dtype=complex)
    for bundle in bundles:
        b = np.ones((n, n), dtype=complex)
        for a in bundle:
            b = b * greens[a]
        product = product * np.fft.fft2(b) / (n * n)
    return float(product.sum().real)


def run(report) -> None:
    from ledger.mgf.bundle_cycle import cycle_value
    from ledger.mgf.dihedral import dihedral_value
    from ledger.mgf.graph import Graph
    from ledger.mgf.mixed_route import mixed_route_value
    from ledger.mgf.multivertex import graph_value

    for label, tau in TAUS.items():
        for name, bundles in TRIHEDRALS.items():
            value, seconds = _timed(cycle_value, bundles, tau, 20)
            reference = cycle_value(bundles, tau, 28).value
            report(f"trihedral {name} at {label}, 20 digits", seconds,
                   true_digits(value.value, reference),
                   note=f"claimed error {mpmath.nstr(value.error, 2)}")
    tau = TAUS["0.27+1.31i"]
    for name, (bundles, weights) in DIHEDRAL_CYCLES.items():
        value, seconds = _timed(cycle_value, bundles, tau, 20)
        reference = dihedral_value(weights, tau, 40).value
        report(f"{name} at 0.27+1.31i, 20 digits", seconds, true_digits(value.value, reference),
               note="reference: the dihedral engine (another method)")
    square = Graph.from_edges([(0, 1, 1), (0, 1, 1), (1, 2, 1), (2, 3, 1), (2, 3, 1), (3, 0, 1)])
    value, seconds = _timed(graph_value, square, tau, 12)
    reference = graph_value(square, tau, 22).value
    peer_value, peer_seconds = peer_cycle(complex(tau), [(1, 1), (1,), (1, 1), (1,)])
    report("doubled square at 0.27+1.31i, 12 digits", seconds, true_digits(value.value, reference),
           peer_seconds / seconds,
           note=f"peer (plain lattice sum) reached {true_digits(peer_value, reference):.1f} "
                f"true digits in {peer_seconds:.0f} s")
    k4 = Graph.from_edges([(0, 1, 1), (0, 2, 1), (0, 3, 1), (1, 2, 1), (1, 3, 1), (2, 3, 1)])
    value, seconds = _timed(graph_value, k4, tau, 12)
    reference = mixed_route_value(k4, tau, digits=16, shells=64)
    report("K4 at 0.27+1.31i, 12 digits", seconds, true_digits(value.value, reference.value),
           note=f"claimed error {mpmath.nstr(value.error, 2)}; reference: 64 shells, "
                f"its own error {mpmath.nstr(reference.error, 2)}")
    peer_value, peer_seconds = peer_cycle(complex(tau), [(1,), (1, 1), (1, 1)])
    value, seconds = _timed(cycle_value, [(1,), (1, 1), (1, 1)], tau, 12)
    reference = cycle_value([(1,), (1, 1), (1, 1)], tau, 24).value
    report("trihedral (1;11;11) at 0.27+1.31i, 12 digits", seconds,
           true_digits(value.value, reference), peer_seconds / seconds,
           note=f"peer (plain lattice sum) reached {true_digits(peer_value, reference):.1f} "
                f"true digits in {peer_seconds:.0f} s")


if __name__ == "__main__":
    run(lambda name, seconds, digits, ratio_vs_peer=None, note="":
        print(f"{name:<52} {seconds:8.2f} s {round(digits, 1)!s:>6} "
              f"{'' if ratio_vs_peer is None else f'{ratio_vs_peer:.1f}x':>7}  {note}", flush=True))
