"""The peer: a plain truncated lattice sum, as a careful user would write it.

C(a1..ar)(tau) = sum over non-zero p_1 + ... + p_r = 0 of prod (tau2/pi)^a_i / |p_i|^(2 a_i),
p = m tau + n.  Every momentum is kept in the box |m|, |n| <= L; the constrained
sum is the value at 0 of the r-fold convolution of the box arrays, computed by
zero-padded FFTs (numpy, float64; a padding of r L + 1 avoids wrap-around at 0).
The truncation error is a sum of terms L^-k log^j L (Euler-Maclaurin for the
box sums, with logarithms from nested sub-sums that converge only just, j <= r-2);
power counting gives the leading k = 2 (a_i + a_j) - 2 for the two smallest weights.
The sums at a geometric ladder of L are extrapolated by least squares in that
ansatz; the error estimate is the change between the last two extrapolations.
E_s (r = 2) is the same code.

>>> import numpy
>>> value, error, _ = peer_dihedral((1, 1, 1), 1j, target_digits=6)
>>> bool(abs(value - 1.3523140160545) < 1e-5)
True
"""

from __future__ import annotations

import math
import time

import numpy as np


def truncated_sum(weights, tau: complex, size: int) -> float:
    """The box-truncated sum with |m|, |n| <= size (float64, FFT convolution)."""
    r = len(weights)
    tau = complex(tau)
    pad = r * size + 1
    grid = np.arange(-size, size + 1)
    m, n = np.meshgrid(grid, grid, indexing="ij")
    norm2 = np.abs(m * tau + n) ** 2
    norm2[size, size] = np.inf  # p = 0 is excluded
    spectrum = np.ones((pad, pad), dtype=complex)
    for a in weights:
        edge = np.zeros((pad, pad))
        edge[:2 * size + 1, :2 * size + 1] = (tau.imag / math.pi) ** a / norm2 ** a
        # put p = 0 at index 0 so that the convolution's value at 0 sits at index 0
        edge = np.roll(edge, (-size, -size), axis=(0, 1))
        spectrum *= np.fft.fft2(edge)
    return float(np.real(spectrum.sum()) / pad ** 2)


def _leading_power(weights) -> int:
    smallest = sorted(weights)[:2]
    return max(2, 2 * sum(smallest) - 2)


def _log_powers(weights) -> int:
    """Nested sub-sums that converge only logarithmically: up to log^(r-2) L."""
    return max(1, len(weights) - 2)


def _extrapolate(sizes, values, leading: int, logs: int, terms: int) -> float:
    """Least-squares fit values = C + sum_k sum_j c_kj log^j(L) / L^k, k >= leading, j <= logs."""
    columns = [np.ones(len(sizes))]
    k = leading
    while len(columns) < terms:
        for j in range(logs + 1):
            if len(columns) < terms:
                columns.append(np.array([math.log(s) ** j / s ** k for s in sizes]))
        k += 1
    matrix = np.array(columns).T
    solution, *_ = np.linalg.lstsq(matrix, np.array(values), rcond=None)
    return float(solution[0])


def peer_dihedral(weights, tau: complex, target_digits: float = 12, max_size: int = 768,
                  time_budget: float = 120.0):
    """(value, error estimate, CPU seconds): grow L until the extrapolations agree to
    ``target_digits`` digits, the box reaches ``max_size`` or the time runs out."""
    start = time.process_time()
    leading, logs = _leading_power(weights), _log_powers(weights)
    sizes, values = [], []
    size = 8
    best, error = float("nan"), float("inf")
    previous = None
    while size <= max_size and time.process_time() - start < time_budget:
        sizes.append(size)
        values.append(truncated_sum(weights, tau, size))
        terms = min(len(sizes) - 1, 7)
        if terms >= 3:
            current = _extrapolate(sizes[-terms - 1:], values[-terms - 1:], leading, logs, terms)
            if previous is not None:
                best, error = current, abs(current - previous)
                if error <= 10.0 ** (-target_digits) * abs(current):
                    break
            previous = current
        size = int(size * 1.4) + 1
    return best, error, time.process_time() - start
