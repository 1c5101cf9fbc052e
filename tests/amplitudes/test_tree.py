"""Tree-level (Virasoro-Shapiro) expansion: against mpmath's Gamma and published coefficients."""

from __future__ import annotations

import math

import mpmath
import pytest
import sympy

from ledger.amplitudes.operators import Structure
from ledger.amplitudes.tree import power_sums, tree_coefficients
from ledger.errors import LedgerError
from ledger.expr import parse


def _series_value(coefficients, s, t, ctx):
    u = -s - t
    sigma2, sigma3 = s**2 + t**2 + u**2, s**3 + t**3 + u**3
    total = ctx.mpf(0)
    for structure, expr in coefficients.items():
        value = ctx.mpf(sympy.N(expr, ctx.dps + 5))
        total += value * sigma2**structure.p * sigma3**structure.q / (
            math.factorial(structure.p) * math.factorial(structure.q))
    return total


def _gamma_ratio_minus_pole(s, t, ctx):
    # T = Gamma(1-s)Gamma(1-t)Gamma(1-u) / (s t u Gamma(1+s)Gamma(1+t)Gamma(1+u)), minus
    # 1/(s t u); evaluated with mpmath's Gamma function (reference library).
    u = -s - t
    ratio = (ctx.gamma(1 - s) * ctx.gamma(1 - t) * ctx.gamma(1 - u)
             / (ctx.gamma(1 + s) * ctx.gamma(1 + t) * ctx.gamma(1 + u)))
    return (ratio - 1) / (s * t * u)


@pytest.mark.parametrize("scale, tolerance", [("1e-3", "1e-30"), ("2e-2", "2e-16")])
def test_series_matches_gamma_functions(scale, tolerance):
    ctx = mpmath.MPContext()
    ctx.dps = 60
    coefficients = tree_coefficients(10)
    for a, b in [(13, -7), (5, 11), (-17, 4)]:
        s, t = ctx.mpf(a) / 10 * ctx.mpf(scale), ctx.mpf(b) / 10 * ctx.mpf(scale)
        # truncation after weight 10: the omitted terms are of order |s|^11; the tolerance
        # lies below the size of the weight-10 terms (~|s|^10), so a wrong or missing
        # weight-10 coefficient fails here
        difference = abs(_series_value(coefficients, s, t, ctx) - _gamma_ratio_minus_pole(s, t, ctx))
        assert difference < ctx.mpf(tolerance)


def test_truncation_error_scales_like_weight_eleven():
    # halving the Mandelstams divides the residual by about 2^11 if the series is right
    # through weight 10 (a wrong coefficient at weight w would give 2^w instead).
    ctx = mpmath.MPContext()
    ctx.dps = 80
    coefficients = tree_coefficients(10)
    residuals = []
    for scale in ("4e-2", "2e-2"):
        s, t = ctx.mpf("1.3") * ctx.mpf(scale), ctx.mpf("-0.7") * ctx.mpf(scale)
        residuals.append(abs(_series_value(coefficients, s, t, ctx) - _gamma_ratio_minus_pole(s, t, ctx)))
    ratio = residuals[0] / residuals[1]
    assert 2**10.5 < ratio < 2**11.5


def test_published_low_orders():
    # T = 3/sigma3 + 2 zeta(3) + zeta(5) sigma2 + 2/3 zeta(3)^2 sigma3 + 1/2 zeta(7) sigma2^2
    #     + 2/3 zeta(3) zeta(5) sigma2 sigma3 + 1/4 zeta(9) sigma2^3
    #     + 2/27 (2 zeta(3)^3 + zeta(9)) sigma3^2 + ...
    # Green, Russo, Vanhove 2008, arXiv:0801.0322; D'Hoker, Green, Vanhove 2015,
    # arXiv:1502.06698 (from memory).  Our basis divides by p! q!.
    # Derivation of the two lowest: in T = (3/sigma3) exp(2 zeta3 sigma3/3 + 2 zeta5 sigma5/5
    # + ...), sigma5 = 5/6 sigma2 sigma3 (Newton, sigma1 = 0) gives zeta5 sigma2 sigma3/3, so
    # the sigma2 coefficient is zeta5; the square (2 zeta3 sigma3/3)^2/2 gives 2/3 zeta3^2 sigma3.
    expected = {
        Structure(0, 0): "2*zeta(3)",
        Structure(1, 0): "zeta(5)",
        Structure(0, 1): "2/3*zeta(3)^2",
        Structure(2, 0): "2*(1/2)*zeta(7)",
        Structure(1, 1): "2/3*zeta(3)*zeta(5)",
        Structure(3, 0): "6*(1/4)*zeta(9)",
        Structure(0, 2): "2*(2/27)*(2*zeta(3)^3 + zeta(9))",
    }
    coefficients = tree_coefficients(6)
    for structure, text in expected.items():
        assert sympy.expand(coefficients[structure] - parse(text)) == 0, structure


def test_power_sums_follow_newton_identities():
    # compare with s^k + t^k + u^k computed directly (sympy), u = -s - t
    s, t = sympy.symbols("s t")
    u = -s - t
    sigma2, sigma3 = sympy.symbols("sigma2 sigma3")
    direct2, direct3 = sympy.expand(s**2 + t**2 + u**2), sympy.expand(s**3 + t**3 + u**3)
    for k, poly in power_sums(13).items():
        substituted = sympy.expand(poly.subs({sigma2: direct2, sigma3: direct3}))
        assert substituted == sympy.expand(s**k + t**k + u**k), k


def test_only_odd_zeta_values_appear():
    for expr in tree_coefficients(10).values():
        arguments = {int(z.args[0]) for z in expr.atoms(sympy.zeta)}
        assert arguments and all(n % 2 == 1 and n >= 3 for n in arguments)


@pytest.mark.parametrize("order", [-1, 17, 1.0])
def test_bad_order(order):
    with pytest.raises(LedgerError, match="order"):
        tree_coefficients(order)
