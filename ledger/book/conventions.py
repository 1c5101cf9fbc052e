"""The conventions a project declares: keys, allowed values, and their exact meaning.

Each key names one normalisation choice that differs between papers; each
value is a short identifier with a one-line meaning and an exact scale relative
to the engine's convention (the default of every key).  What a scale does to
stored data is derived in :mod:`ledger.book.transform`.

* ``mandelstam``: s_project = c s_engine, with s_engine = -alpha' (k1+k2)^2/4.
  ``alpha'/2`` has c = 2, ``alpha'`` has c = 4, and ``alpha'=N`` means
  s = -(k1+k2)^2 in units where alpha' = N, so c = 4/N.
* ``graph_normalisation``: how a lattice sum of weight w is normalised;
  ``tau2`` is pi^w times the engine's, ``coprime/2`` writes E_s as a sum over
  coprime pairs, pi^s/(2 zeta(2s)) times the engine's E_s.
* ``laurent_variable``: x = lambda tau2 with lambda = pi (engine) or 1.
* ``measure``: d mu_project = m d^2tau/tau2^2.
* ``green_function``: G_project = g G_engine.
* ``amplitude_factor``: the project's amplitude is f times the engine's.

>>> validate_conventions({"mandelstam": "alpha'/2"})["laurent_variable"]
'pi*tau2'
>>> validate_conventions({"mandelstam": "alpha' = 2"})["mandelstam"]
"alpha'=2"
>>> mandelstam_scale("alpha'=2"), measure_scale("d2tau/(pi*tau2^2)")
(2, 1/pi)
>>> validate_conventions({"colour": "blue"})  # doctest: +IGNORE_EXCEPTION_DETAIL
Traceback (most recent call last):
ConventionError: unknown convention key 'colour'; known keys: ...
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import lru_cache

import sympy

from ledger.errors import ConventionError, LedgerError


@dataclass(frozen=True)
class ConventionKey:
    """One declared choice: its values (id -> meaning) and exact scales (id -> sympy text)."""

    name: str
    meaning: str
    default: str
    values: dict  # value id -> meaning
    scales: dict = field(default_factory=dict)  # value id -> exact scale, as sympy text
    free_form: str = ""  # meaning of values outside ``values`` (empty: none allowed)


CONVENTION_KEYS: tuple[ConventionKey, ...] = (
    ConventionKey(
        "mandelstam", "normalisation of the Mandelstam invariants", "alpha'/4",
        {"alpha'/4": "s = -alpha' (k1+k2)^2 / 4 (the engine's)",
         "alpha'/2": "s = -alpha' (k1+k2)^2 / 2 (twice the engine's s)",
         "alpha'": "s = -alpha' (k1+k2)^2 (four times the engine's s)"},
        {"alpha'/4": "1", "alpha'/2": "2", "alpha'": "4"},
        "alpha'=N: s = -(k1+k2)^2 in units where alpha' = N, a positive rational "
        "(4/N times the engine's s)"),
    ConventionKey(
        "graph_normalisation", "normalisation of E_s and modular graph functions", "tau2/pi",
        {"tau2/pi": "(tau2/pi)^a per edge of weight a, as in the engine",
         "tau2": "tau2^a per edge of weight a (pi^w times the engine's, w the weight)",
         "coprime/2": "E_s = 1/2 sum over coprime (c,d) of tau2^s/|c tau + d|^(2s) "
                      "(pi^s/(2 zeta(2s)) times the engine's); other graphs as 'tau2'"}),
    ConventionKey(
        "laurent_variable", "variable of Laurent polynomials at the cusp", "pi*tau2",
        {"pi*tau2": "y = pi tau2", "tau2": "tau2"},
        {"pi*tau2": "pi", "tau2": "1"}),
    ConventionKey(
        "measure", "measure on the fundamental domain F (cut off at tau2 = L)", "d2tau/tau2^2",
        {"d2tau/tau2^2": "d^2tau/tau2^2 with d^2tau = dtau1 dtau2 (Vol F = pi/3)",
         "d2tau/(2tau2^2)": "one half of d^2tau/tau2^2 (Vol F = pi/6)",
         "2*d2tau/tau2^2": "d^2tau = |dtau ^ dtaubar| = 2 dtau1 dtau2 (Vol F = 2 pi/3)",
         "d2tau/(pi*tau2^2)": "d^2tau/(pi tau2^2) (Vol F = 1/3)",
         "3*d2tau/(pi*tau2^2)": "unit-volume measure 3 d^2tau/(pi tau2^2) (Vol F = 1)"},
        {"d2tau/tau2^2": "1", "d2tau/(2tau2^2)": "1/2", "2*d2tau/tau2^2": "2",
         "d2tau/(pi*tau2^2)": "1/pi", "3*d2tau/(pi*tau2^2)": "3/pi"}),
    ConventionKey(
        "green_function", "normalisation of the scalar Green's function G on the torus", "sum/pi",
        {"sum/pi": "G(z) = sum' tau2/(pi |p|^2) chi_p(z), zero mean (G ~ -log|z|^2 at z -> 0)",
         "2*sum/pi": "twice the engine's (G ~ -2 log|z|^2 at short distance)",
         "-sum/pi": "minus the engine's (G ~ +log|z|^2 at short distance)",
         "sum": "G(z) = sum' tau2/|p|^2 chi_p(z) (pi times the engine's)"},
        {"sum/pi": "1", "2*sum/pi": "2", "-sum/pi": "-1", "sum": "pi"}),
    ConventionKey(
        "amplitude_factor", "overall factor of the amplitude relative to the engine's", "1",
        {},
        free_form="a non-zero constant such as 1, 1/2, 2*pi or pi^2/6 (rationals, pi and "
                  "zeta values): every coefficient, value and integral is that times the engine's"),
)

_BY_NAME = {key.name: key for key in CONVENTION_KEYS}
_ALPHA_NUMBER = re.compile(r"^alpha'=(?P<number>\d+(?:/\d+)?)$")


def known_keys() -> list[str]:
    """The convention keys in canonical order.

    >>> known_keys()[:2]
    ['mandelstam', 'graph_normalisation']
    """
    return [key.name for key in CONVENTION_KEYS]


def convention_key(name: str) -> ConventionKey:
    """The registry record of one key (ConventionError listing the keys if unknown)."""
    if name not in _BY_NAME:
        raise ConventionError(f"unknown convention key {name!r}; known keys: {', '.join(known_keys())}")
    return _BY_NAME[name]


def default_conventions() -> dict:
    """The engine's own conventions, in the canonical key order."""
    return {key.name: key.default for key in CONVENTION_KEYS}


def validate_conventions(declared: dict) -> dict:
    """Check a declaration and return it completed with defaults, canonical order and spelling."""
    if not isinstance(declared, dict):
        raise ConventionError("conventions must be a table of key = value")
    result = default_conventions()
    for name, value in declared.items():
        convention_key(name)
        result[name] = canonical_value(name, value)
    return {name: result[name] for name in known_keys()}


def canonical_value(name: str, value) -> str:
    """The checked value in canonical spelling (spaces dropped from formulas).

    >>> canonical_value("amplitude_factor", " 1/2 ")
    '1/2'
    """
    key = convention_key(name)
    if not isinstance(value, str):
        raise ConventionError(f"convention {name} must be a string, got {type(value).__name__}")
    text = value.strip()
    if text in key.values:
        return text
    if name == "mandelstam":
        compact = "".join(text.split())
        if _ALPHA_NUMBER.match(compact):
            mandelstam_scale(compact)
            return compact
    if name == "amplitude_factor":
        amplitude_scale(text)
        return text
    known = ", ".join(repr(v) for v in key.values)
    extra = f"; or {key.free_form}" if key.free_form else ""
    raise ConventionError(f"unknown value {value!r} for convention {name}; known values: {known}{extra}")


def check_value(name: str, value) -> None:
    """Raise ConventionError unless ``value`` is allowed for key ``name``."""
    canonical_value(name, value)


@lru_cache(maxsize=256)
def _table_scale(name: str, value: str):
    key = convention_key(name)
    if value not in key.scales:
        canonical_value(name, value)  # raises with the list of known values
    return sympy.sympify(key.scales[value])


@lru_cache(maxsize=256)
def mandelstam_scale(value: str):
    """c in s_project = c s_engine, exact.

    >>> mandelstam_scale("alpha'/2"), mandelstam_scale("alpha'=1/2")
    (2, 8)
    """
    match = _ALPHA_NUMBER.match("".join(value.split())) if isinstance(value, str) else None
    if match:
        number = sympy.Rational(match.group("number"))
        if number == 0:
            raise ConventionError("mandelstam: alpha'=N needs N > 0, got alpha'=0")
        return 4 / number
    return _table_scale("mandelstam", value)


def laurent_variable_scale(value: str):
    """lambda in x = lambda tau2 for the Laurent variable x.

    >>> laurent_variable_scale("pi*tau2")
    pi
    """
    return _table_scale("laurent_variable", value)


def measure_scale(value: str):
    """m in d mu_project = m d^2tau/tau2^2."""
    return _table_scale("measure", value)


def green_scale(value: str):
    """g in G_project = g G_engine."""
    return _table_scale("green_function", value)


@lru_cache(maxsize=256)
def amplitude_scale(value: str):
    """f, the project's amplitude over the engine's, as an exact sympy constant.

    >>> amplitude_scale("2*pi")
    2*pi
    """
    from ledger.expr import modular_atoms, parse

    try:
        factor = parse(value) if isinstance(value, str) else None
    except LedgerError as error:
        raise ConventionError(f"amplitude_factor {value!r} is not a constant: {error}") from None
    if factor is None or modular_atoms(factor) or factor == 0 or not factor.is_number:
        raise ConventionError(f"amplitude_factor must be a non-zero constant like '1', '1/2' or "
                              f"'2*pi', got {value!r}")
    return factor
