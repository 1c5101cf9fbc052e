"""Benchmarks for Laurent polynomials and integrals over the fundamental domain.

* all dihedral graphs C(a1..ar) of weight <= 6 (r >= 3): exact Laurent polynomials
  (bar: under 30 s in total);
* one renormalised integral of a weight-4 graph function, C(2,1,1), to 15 digits by
  the quadrature route (a) (bar: under 60 s of CPU time); its true digits are measured against
  the closed form of route (b) (Laplace equation + Rankin-Selberg);
* for scale: weight-7 dihedral Laurent polynomials (the first with zeta_sv(3,5,3)).
"""

from __future__ import annotations

import time

import mpmath
import sympy


def _dihedral_weights(max_weight: int, min_weight: int = 3):
    def partitions(n, largest):
        if n == 0:
            yield ()
            return
        for part in range(min(n, largest), 0, -1):
            for rest in partitions(n - part, part):
                yield (part,) + rest
    for w in range(min_weight, max_weight + 1):
        yield from (p for p in partitions(w, w) if len(p) >= 3)


def _laurent_batch(report, name, max_weight, min_weight=3):
    from ledger.expr import parse
    from ledger.mgf.dihedral_laurent import _dihedral_terms
    from ledger.mgf.laurent import laurent_polynomial

    _dihedral_terms.cache_clear()
    graphs = list(_dihedral_weights(max_weight, min_weight))
    start = time.perf_counter()
    exact = sum(laurent_polynomial(parse("C(" + ",".join(map(str, w)) + ")")).exact for w in graphs)
    seconds = time.perf_counter() - start
    report(name, seconds, None, note=f"{exact}/{len(graphs)} graphs exact")


def run(report) -> None:
    _laurent_batch(report, "laurent: all dihedral, weight <= 6 (bar 30 s)", 6)
    _laurent_batch(report, "laurent: dihedral of weight 7", 7, 7)

    from ledger.expr import parse
    from ledger.mgf.integrate import integrate_over_fundamental_domain, quadrature_integral
    from ledger.mgf.laurent import laurent_polynomial

    expr = parse("C(2,1,1)")
    start = time.perf_counter()
    exact = integrate_over_fundamental_domain(expr, 15, route="laplace").exact
    report("integrate: C(2,1,1), route (b), closed form", time.perf_counter() - start, None, note=str(exact))

    # the bar is in CPU seconds (the machine is shared): process time, not wall time
    start = time.process_time()
    numeric = quadrature_integral(expr, laurent_polynomial(expr), 15)
    seconds = time.process_time() - start
    ctx = mpmath.MPContext()
    ctx.dps = 40
    true_error = abs(ctx.convert(numeric.value) - ctx.convert(str(sympy.N(exact, 40))))
    digits = float(-ctx.log10(true_error / abs(ctx.convert(numeric.value)))) if true_error else float("inf")
    report("integrate: C(2,1,1) route (a) CPU (bar 60 s)", seconds, digits,
           note=f"15 digits asked; claimed error {mpmath.nstr(numeric.error, 2)} ({numeric.correct_digits():.1f} digits), "
                f"honest: {true_error <= ctx.convert(numeric.error)}")
