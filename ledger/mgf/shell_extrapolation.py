"""Extrapolation of shell sums s_k (k = max_e |m_e|) of the mixed route to k -> infinity.

The shells of the mixed Fourier route (:mod:`ledger.mgf.mixed_route`) are exact
but decay only like a power of k: the region where a subgraph H with loops
carries large m (its positions coincide) contributes ~ k^-(1 + 2 (weight(H) - loops(H))),
with logarithms from nested regions.  The tail beyond the last shell is fitted
and summed in closed form; the error estimate compares with the extrapolation
from fewer shells (from further back it is worse), with a safety factor.

>>> import mpmath
>>> ctx = mpmath.MPContext(); ctx.dps = 40
>>> shells = [ctx.zero] + [ctx.mpf(k) ** -5 + ctx.mpf(k) ** -6 for k in range(1, 31)]
>>> value, error = extrapolate(shells, 5, ctx)
>>> bool(abs(value - ctx.zeta(5) - ctx.zeta(6)) <= error < 1e-20)
True
"""

from __future__ import annotations

import itertools

from ledger.mgf.graph import Graph


def shell_power(graph: Graph) -> int:
    """p with shells ~ k^-p (up to logarithms): 1 + min over subgraphs H with loops
    of 2 (weight(H) - loops(H)) (power counting of the region where H is hard)."""
    best = None
    edges = graph.edges
    for size in range(1, len(edges) + 1):
        for subset in itertools.combinations(edges, size):
            sub = Graph.from_edges(subset)
            if sub.loops >= 1:
                value = 2 * (sub.weight - sub.loops)
                best = value if best is None else min(best, value)
    return 1 + best


def extrapolate(shells, power: int, ctx) -> tuple:
    """(sum of all shells, error) from exact shells s_0..s_K.

    Models s_k = k^-power (c_0 + c_1/k + ... [+ log k (d_0 + d_1/k + ...)]) are fitted
    by least squares on the last shells and summed beyond K with Hurwitz zeta
    functions (and their derivative for log k); the model that best predicts the
    last shells from the earlier ones is used.  The error is ten times the change of
    the result when only the shells up to 3K/4 are used (extrapolation from further
    back is worse), plus the spread among the well-predicting models.
    """
    full, spread = _extrapolate_once(shells, power, ctx)
    short, _ = _extrapolate_once(shells[:(3 * (len(shells) - 1)) // 4 + 1], power, ctx)
    return full, 10 * abs(full - short) + spread


def _extrapolate_once(shells, power: int, ctx) -> tuple:
    K = len(shells) - 1
    head = ctx.fsum(shells)
    candidates = []
    for logs in (False, True):
        for order in range(2, 9):
            unknowns = order * (2 if logs else 1)
            window = list(range(max(4, K - 3 * unknowns), K + 1))
            if len(window) < unknowns + 4:
                continue
            held = window[-3:]
            fit = _fit(shells, window[:-3], power, order, logs, ctx)
            fit_all = _fit(shells, window, power, order, logs, ctx)
            if fit is None or fit_all is None:
                continue
            prediction = max(abs(_model(fit, k, power, order, logs, ctx) - shells[k]) for k in held)
            tail = _model_tail(fit_all, K, power, order, logs, ctx)
            scale = prediction / abs(shells[K]) * abs(tail)   # relative misfit carried to the tail
            candidates.append((scale, tail, order, logs))
    if not candidates:
        return head, abs(shells[-1]) * K
    candidates.sort(key=lambda c: c[0])
    best = candidates[0]
    good = [c for c in candidates if c[0] <= 100 * best[0] + ctx.mpf(10) ** (-ctx.dps + 5)]
    spread = max(abs(c[1] - best[1]) for c in good)
    return head + best[1], spread


def _basis(k, power, order, logs, ctx):
    k = ctx.mpf(k)
    row = [k ** (-power - j) for j in range(order)]
    if logs:
        row += [ctx.log(k) * k ** (-power - j) for j in range(order)]
    return row


def _fit(shells, window, power, order, logs, ctx):
    rows = [_basis(k, power, order, logs, ctx) for k in window]
    try:
        matrix = ctx.matrix(rows)
        values = ctx.matrix([shells[k] for k in window])
        return ctx.qr_solve(matrix, values)[0]
    except (ZeroDivisionError, ValueError):
        return None


def _model(fit, k, power, order, logs, ctx):
    return ctx.fsum(c * b for c, b in zip(fit, _basis(k, power, order, logs, ctx)))


def _model_tail(fit, K, power, order, logs, ctx):
    """sum_{k > K} of the model, by Hurwitz zeta (and its s-derivative for log k)."""
    total = ctx.zero
    for j in range(order):
        total += fit[j] * ctx.zeta(power + j, K + 1)
        if logs:
            total -= fit[order + j] * ctx.zeta(power + j, K + 1, derivative=1)
    return total
