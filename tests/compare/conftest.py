"""A project in the engine's conventions whose derived data come from closed forms,
not from the engine, for the diff and conversion tests.

Closed forms used (each named where it is used):
* Fourier expansion of the Eisenstein series (from memory; common practice, e.g. Zagier,
  "Eisenstein series and the Riemann zeta function", 1981):
    sum' tau2^s/|m tau + n|^(2s) = 2 zeta(2s) tau2^s + 2 sqrt(pi) Gamma(s-1/2) zeta(2s-1)/Gamma(s)
        tau2^(1-s) + 8 pi^s sqrt(tau2)/Gamma(s) sum_N N^(s-1/2) sigma_(1-2s)(N) K_(s-1/2)(2 pi N tau2)
        cos(2 pi N tau1);
  the engine's E_s is pi^-s times this (DESIGN.md section 3).
* Renormalised integrals (derived): with Delta E_s = s(s-1) E_s and Green's theorem on F cut at
  tau2 = L, int_{F_L} E_s = pi [s a (pi L)^(s-1) + (1-s) b (pi L)^-s]/(s(s-1)) for the constant
  term a y^s + b y^(1-s); dropping the positive power of L leaves 0 (Zagier 1981, from memory),
  with divergent term a pi^s L^(s-1)/(s-1).  Vol(F) = pi/3 for d^2tau/tau2^2 (common practice).
"""

from __future__ import annotations

import mpmath
import pytest
import sympy

from ledger.book import Background, Project, Provenance

DIGITS = 30
TAUS = ("0.1+1.2i", "-0.3+0.95i")


def eisenstein_textbook(s: int, tau: complex | str, digits: int = DIGITS):
    """sum' tau2^s/|m tau + n|^(2s) from its Fourier expansion, in a private context."""
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    if isinstance(tau, str):
        tau = ctx.mpc(*_tau_parts(tau))
    x, y = ctx.mpf(tau.real), ctx.mpf(tau.imag)
    total = 2 * ctx.zeta(2 * s) * y**s + 2 * ctx.sqrt(ctx.pi) * ctx.gamma(s - ctx.mpf(1) / 2) \
        * ctx.zeta(2 * s - 1) / ctx.gamma(s) * y ** (1 - s)
    prefactor = 8 * ctx.pi**s * ctx.sqrt(y) / ctx.gamma(s)
    n = 1
    while True:
        divisor_sum = sum(ctx.mpf(d) ** (1 - 2 * s) for d in range(1, n + 1) if n % d == 0)
        term = prefactor * ctx.mpf(n) ** (s - ctx.mpf(1) / 2) * divisor_sum \
            * ctx.besselk(s - ctx.mpf(1) / 2, 2 * ctx.pi * n * y) * ctx.cos(2 * ctx.pi * n * x)
        total += term
        if abs(term) < ctx.mpf(10) ** (-(digits + 10)) * abs(total) and n > 3:
            return total
        n += 1


def _tau_parts(text: str) -> tuple[str, str]:
    body = text.replace(" ", "").rstrip("i")
    cut = max(body.rfind("+"), body.rfind("-"))
    return body[:cut], body[cut:]


def engine_eisenstein(s: int, tau: str, digits: int = DIGITS):
    """The engine's E_s = pi^-s sum' tau2^s/|m tau + n|^(2s)."""
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    return eisenstein_textbook(s, tau, digits) / ctx.pi**s


def value_records(function, digits: int = DIGITS) -> list[dict]:
    return [{"tau": tau, "value": mpmath.nstr(function(tau), digits + 5), "error": f"1e-{digits}",
             "digits": digits, "engine": "closed form"} for tau in TAUS]


def laurent_record(terms: dict, exact: bool = True) -> dict:
    return {"variable": "pi*tau2", "exact": exact, "digits": DIGITS, "engine": "closed form",
            "terms": [{"power": k, "coefficient": v} for k, v in sorted(terms.items(), reverse=True)]}


def engine_conventions_project() -> Project:
    """Tree level and genus one in flat ten dimensions, plus an orbifold entry with a Green atom."""
    project = Project.new("Closed-form fixture", {})
    project.add_background(Background("flat-iib", "Type IIB, flat R^10", "IIB", 10, "none"))
    project.add_background(Background("t4z2", "IIB on T^4/Z_2 x R^6", "IIB", 10, "T^4/Z_2"))
    cited = Provenance("reference", arxiv="1502.06698")
    add = project.add_entry
    # Tree level, s = -alpha'(k1+k2)^2/4: 2 zeta(3), zeta(5), 2/3 zeta(3)^2 (from memory; e.g.
    # D'Hoker, Green, Vanhove 2015, arXiv:1502.06698, the tree-level amplitude in sigma_2, sigma_3).
    add(background="flat-iib", genus=0, operator="R^4", structure="1", coefficient="2*zeta(3)",
        provenance=cited)
    add(background="flat-iib", genus=0, operator="D^4R^4", structure="sigma2", coefficient="zeta(5)",
        provenance=cited)
    add(background="flat-iib", genus=0, operator="D^6R^4", structure="sigma3",
        coefficient="2/3*zeta(3)^2", provenance=cited)
    ctx = mpmath.MPContext()
    ctx.dps = 45
    pi3 = sympy.pi / 3
    add(background="flat-iib", genus=1, operator="R^4", structure="1", coefficient="1",
        derived={"values": [{"tau": t, "value": "1", "error": "0", "digits": DIGITS} for t in TAUS],
                 "laurent": laurent_record({0: "1"}),
                 "integral": {"value": ctx.nstr(ctx.pi / 3, 40), "exact": str(pi3),
                              "error": "1e-35", "digits": DIGITS, "engine": "closed form"}})
    add(background="flat-iib", genus=1, operator="D^4R^4", structure="sigma2", coefficient="E(2)",
        derived={"values": value_records(lambda t: engine_eisenstein(2, t)),
                 "laurent": laurent_record({2: "1/45", -1: "zeta(3)"}),
                 "integral": {"value": "0", "exact": "0", "error": "0", "digits": DIGITS,
                              "log_coefficient": "0",
                              "divergent_terms": [{"power": 1, "coefficient": "pi**2/45"}]}})
    add(background="flat-iib", genus=1, operator="D^6R^4", structure="sigma3",
        coefficient="5/3*E(3) + 1/3*zeta(3)",
        derived={"values": value_records(lambda t: 5 * engine_eisenstein(3, t) / 3 + ctx.zeta(3) / 3),
                 # inexact on purpose: decimals of 2/567, zeta(3)/3 and 5 zeta(5)/4
                 "laurent": laurent_record({3: ctx.nstr(ctx.mpf(2) / 567, 35),
                                            0: ctx.nstr(ctx.zeta(3) / 3, 35),
                                            -2: ctx.nstr(5 * ctx.zeta(5) / 4, 35)}, exact=False),
                 "integral": {"value": ctx.nstr(ctx.pi * ctx.zeta(3) / 9, 35), "error": "1e-33",
                              "digits": DIGITS, "log_coefficient": "0",
                              "divergent_terms": [{"power": 2, "coefficient": "pi**3/567"}]}})
    add(background="flat-iib", genus=1, operator="D^8R^4", structure="sigma2^2",
        coefficient="C(2,1,1) + 3/2*E(2)^2 - 1/2*E(4)", notes="fixture only: a mixed-weight form")
    add(background="t4z2", genus=1, operator="D^4R^4", structure="sigma2",
        coefficient="E(2) + 1/4*green(1/2,0)*E(2)", notes="fixture only: exercises Green atoms")
    return project


@pytest.fixture
def engine_project() -> Project:
    return engine_conventions_project()
