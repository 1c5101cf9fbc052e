"""The conventions a project declares, with their allowed values.

Each key names one normalisation choice that differs between papers; each
value is a short identifier with a one-line meaning.  The default of every key
is the engine's own convention.

>>> validate_conventions({"mandelstam": "alpha'/2"})["laurent_variable"]
'pi*tau2'
>>> validate_conventions({"colour": "blue"})  # doctest: +IGNORE_EXCEPTION_DETAIL
Traceback (most recent call last):
ConventionError: unknown convention key 'colour'; known keys: ...
"""

from __future__ import annotations

from dataclasses import dataclass

from ledger.errors import ConventionError


@dataclass(frozen=True)
class ConventionKey:
    name: str
    meaning: str
    default: str
    values: dict  # value id -> meaning


CONVENTION_KEYS: tuple[ConventionKey, ...] = (
    ConventionKey(
        "mandelstam", "normalisation of the Mandelstam invariants", "alpha'/4",
        {"alpha'/4": "s = -alpha' (k1+k2)^2 / 4",
         "alpha'/2": "s = -alpha' (k1+k2)^2 / 2",
         "alpha'": "s = -alpha' (k1+k2)^2"}),
    ConventionKey(
        "graph_normalisation", "normalisation of E_s and modular graph functions", "tau2/pi",
        {"tau2/pi": "(tau2/pi)^a per edge of weight a, as in the engine",
         "tau2": "tau2^a per edge of weight a (pi^w times the engine's, w the weight)",
         "coprime/2": "E_s = 1/2 sum over coprime (c,d) of tau2^s/|c tau + d|^(2s)"}),
    ConventionKey(
        "laurent_variable", "variable of Laurent polynomials at the cusp", "pi*tau2",
        {"pi*tau2": "y = pi tau2", "tau2": "tau2"}),
    ConventionKey(
        "measure", "measure on the fundamental domain F", "d2tau/tau2^2",
        {"d2tau/tau2^2": "d^2tau/tau2^2 with d^2tau = dtau1 dtau2 (Vol F = pi/3)",
         "d2tau/(2tau2^2)": "one half of d^2tau/tau2^2",
         "d2tau/(pi*tau2^2)": "d^2tau/(pi tau2^2) (Vol F = 1/3)"}),
    ConventionKey(
        "green_function", "normalisation of the scalar Green's function G on the torus", "sum/pi",
        {"sum/pi": "G(z) = sum' tau2/(pi |p|^2) chi_p(z), zero mean",
         "2*sum/pi": "twice that (G ~ -2 log|z|^2 at short distance)"}),
    ConventionKey(
        "amplitude_factor", "overall factor of the amplitude (a rational number)", "1",
        {}),
)

_BY_NAME = {key.name: key for key in CONVENTION_KEYS}


def known_keys() -> list[str]:
    return [key.name for key in CONVENTION_KEYS]


def default_conventions() -> dict:
    """The engine's own conventions, in the canonical key order."""
    return {key.name: key.default for key in CONVENTION_KEYS}


def validate_conventions(declared: dict) -> dict:
    """Check a declaration and return it completed with defaults, in canonical order."""
    if not isinstance(declared, dict):
        raise ConventionError("conventions must be a table of key = value")
    for name, value in declared.items():
        if name not in _BY_NAME:
            raise ConventionError(
                f"unknown convention key {name!r}; known keys: {', '.join(known_keys())}")
        check_value(name, value)
    result = default_conventions()
    result.update(declared)
    return {name: result[name] for name in known_keys()}


def check_value(name: str, value) -> None:
    key = _BY_NAME[name]
    if not isinstance(value, str):
        raise ConventionError(f"convention {name} must be a string, got {type(value).__name__}")
    if key.values:
        if value not in key.values:
            raise ConventionError(
                f"unknown value {value!r} for convention {name}; known values: "
                + ", ".join(repr(v) for v in key.values))
    elif name == "amplitude_factor":
        _check_rational(value)


def _check_rational(text: str) -> None:
    from fractions import Fraction

    try:
        if Fraction(text) == 0:
            raise ValueError
    except (ValueError, ZeroDivisionError):
        raise ConventionError(
            f"amplitude_factor must be a non-zero rational number like '1' or '1/2', got {text!r}") from None
