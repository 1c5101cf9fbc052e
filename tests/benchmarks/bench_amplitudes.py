"""Timings of the physics layer: genus-one expansion (weights 6 and 7) and tree level.

Run through tests/benchmarks/run.py, which passes ``report(name, seconds,
true_digits, ratio_vs_peer=None, note="")``.  The expansions are exact
(rational coefficients, odd zeta values), so no digits are reported.
"""

from __future__ import annotations

import time


def _timed(function, *args, **kwargs):
    start = time.perf_counter()
    result = function(*args, **kwargs)
    return result, time.perf_counter() - start


def run(report) -> None:
    from ledger.amplitudes.genus_one import expand_genus_one, genus_one_coefficients
    from ledger.amplitudes.tree import tree_coefficients

    for weight in (6, 7):
        expansion, seconds = _timed(expand_genus_one, weight)
        terms = sum(len(b) for b in expansion.coefficients.values())
        report(f"genus-one expansion, weight <= {weight}", seconds, None,
               note=f"exact; {len(expansion.coefficients)} structures, {terms} graph products")
        _, seconds = _timed(genus_one_coefficients, weight, reduce=True)
        report(f"genus-one expansion, weight <= {weight}, reduced", seconds, None,
               note="exact; sympy expressions after the identity table")
    _, seconds = _timed(tree_coefficients, 10)
    report("tree-level expansion, weight <= 10", seconds, None, note="exact in odd zeta values")


if __name__ == "__main__":
    run(lambda name, seconds, digits, ratio_vs_peer=None, note="":
        print(f"{name:<55} {seconds:8.3f} s  {note}"))
