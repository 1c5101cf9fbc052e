"""Exact constants and decimal numbers as stored in a project's derived data.

Exact forms are text in the expression language (``2*zeta(3)/pi``) or in
sympy's own spelling (``2*zeta(3)/pi**2``); numbers are decimal strings,
real (``1.25e-3``) or complex (``0.5+1.25i``), with an absolute error bound.

>>> parse_exact("pi**2/45")
pi**2/45
>>> ctx = working_context(20)
>>> value, error = scale_number("1.5", "1e-20", 20, parse_exact("2/3"), ctx)
>>> value, ctx.mpf(error) >= ctx.mpf("2e-20") / 3
('1.0', True)
>>> format_number(parse_number("0.25-2i", ctx), 5, ctx)
'0.25-2.0i'
"""

from __future__ import annotations

import re
from functools import lru_cache

import mpmath
import sympy

from ledger.errors import LedgerError
from ledger.mgf.rankin_selberg import zeta_prime
from ledger.mgf.zeta_basis import zeta_sv

_SYMPY_TEXT = re.compile(r"^[0-9A-Za-z_+\-*/^(). ]*$")
_ALLOWED_NAMES = {"pi": sympy.pi, "zeta": sympy.zeta, "log": sympy.log, "sqrt": sympy.sqrt,
                  "Rational": sympy.Rational, "Integer": sympy.Integer, "Float": sympy.Float,
                  # constants the engine writes: zeta'(n) in integrals, zeta_sv in Laurent terms
                  "zeta_prime": zeta_prime, "zeta_sv": zeta_sv}
_COMPLEX = re.compile(r"^(?P<re>[+-]?[0-9.]+(?:[eE][+-]?\d+)?)?(?P<im>[+-]?[0-9.]*(?:[eE][+-]?\d+)?)[ij]$")


def parse_exact(text, what: str = "exact value"):
    """An exact constant (rationals, pi, zeta values, logs, square roots) from its text."""
    if not isinstance(text, str) or not text.strip():
        raise LedgerError(f"{what} must be non-empty text, got {text!r}")
    return _parse_exact(text, what)


@lru_cache(maxsize=4096)
def _parse_exact(text: str, what: str):
    from ledger.expr import modular_atoms, parse

    try:
        value = parse(text)
    except LedgerError:
        value = _parse_sympy_text(text, what)
    if modular_atoms(value) or not value.is_number:
        raise LedgerError(f"{what} {text!r} must be a constant, not a function of tau")
    return value


def _parse_sympy_text(text: str, what: str):
    names = set(re.findall(r"[A-Za-z_][A-Za-z_0-9]*", text))
    exponent_marks = {name for name in names if re.fullmatch(r"[eE]\d*", name)}
    if not _SYMPY_TEXT.match(text) or names - set(_ALLOWED_NAMES) - exponent_marks:
        raise LedgerError(f"{what} {text!r} is not an exact constant "
                          "(use rationals, pi, zeta(n), zeta_prime(n), zeta_sv(...), log, sqrt)")
    from sympy.parsing.sympy_parser import convert_xor, parse_expr, standard_transformations

    try:
        return parse_expr(text, local_dict=dict(_ALLOWED_NAMES), global_dict={"__builtins__": {}, **_ALLOWED_NAMES},
                          transformations=standard_transformations + (convert_xor,))
    except Exception:  # sympy raises many types on malformed text
        raise LedgerError(f"{what} {text!r} cannot be read as an exact constant") from None


def exact_text(value) -> str:
    """The sympy spelling of an exact constant, which :func:`parse_exact` reads back.

    >>> exact_text(sympy.zeta(3) / sympy.pi**2)
    'zeta(3)/pi**2'
    """
    return sympy.sstr(sympy.nsimplify(value) if isinstance(value, sympy.Float) else value)


DEFAULT_DIGITS = 30


def record_digits(record: dict, default: int = DEFAULT_DIGITS) -> int:
    """The 'digits' field of a derived record (a positive integer), or ``default``.

    >>> record_digits({"digits": 20}), record_digits({})
    (20, 30)
    """
    digits = record.get("digits", default) if isinstance(record, dict) else default
    if digits is None:
        return default
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= 1000:
        raise LedgerError(f"'digits' must be a positive integer, got {digits!r}")
    return digits


@lru_cache(maxsize=64)
def working_context(digits: int) -> mpmath.MPContext:
    """A private mpmath context with ``digits`` plus guard digits (never the global one).

    Contexts are shared per ``digits``: callers must not change their precision.
    """
    ctx = mpmath.MPContext()
    ctx.dps = int(digits) + 15
    return ctx


def parse_number(text, ctx: mpmath.MPContext, what: str = "value"):
    """A real or complex decimal ('1.5e-3', '0.25-2i', '2j') in context ``ctx``."""
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        return ctx.mpf(text)
    if not isinstance(text, str):
        raise LedgerError(f"{what} must be a decimal number, got {text!r}")
    compact = "".join(text.split())
    try:
        return ctx.mpf(compact)
    except (ValueError, TypeError):
        pass
    match = _COMPLEX.match(compact)
    if match:
        imag = match.group("im")
        imag = imag + "1" if imag in ("", "+", "-") else imag
        try:
            return ctx.mpc(ctx.mpf(match.group("re") or "0"), ctx.mpf(imag))
        except (ValueError, TypeError):
            pass
    raise LedgerError(f"{what} {text!r} is not a decimal number")


def format_number(value, significant: int, ctx: mpmath.MPContext) -> str:
    """Decimal text with ``significant`` digits; complex numbers as 'x+yi'."""
    if isinstance(value, ctx.mpc) or isinstance(value, mpmath.mpc):
        real = ctx.nstr(value.real, significant)
        imag = ctx.nstr(value.imag, significant)
        return f"{real}{'' if imag.startswith('-') else '+'}{imag}i"
    return ctx.nstr(value, significant)


def format_error(error, ctx: mpmath.MPContext) -> str:
    """An error bound in 3 digits, rounded up so that it stays a bound."""
    if error == 0:
        return "0"
    return ctx.nstr(error * ctx.mpf("1.01"), 3)


def evaluate_exact(value, ctx: mpmath.MPContext):
    """A sympy constant as an mpmath number at the context's precision."""
    number = sympy.N(value, ctx.dps + 5)
    real, imag = number.as_real_imag()
    real = ctx.mpf(str(real)) if real != 0 else ctx.mpf(0)
    if imag != 0:
        return ctx.mpc(real, ctx.mpf(str(imag)))
    return real


def scale_number(value_text, error_text, digits: int, factor, ctx: mpmath.MPContext) -> tuple[str, str]:
    """(value, error) texts of ``factor`` times a stored number, the error still a bound.

    The product is printed with ``digits + 3`` significant digits; the rounding
    (at most one unit in the last printed place) is added to the error.
    """
    value = parse_number(value_text, ctx)
    error = abs(parse_number(error_text if error_text is not None else "0", ctx, "error"))
    number = evaluate_exact(factor, ctx)
    product = value * number
    significant = int(digits) + 3
    text = format_number(product, significant, ctx)
    rounding = abs(product) * ctx.mpf(10) ** (1 - significant) if product != 0 else ctx.mpf(0)
    return text, format_error(error * abs(number) + rounding, ctx)


_DECIMAL = re.compile(r"^\s*[+-]?(\d+\.\d*|\.\d+|\d+)([eE][+-]?\d+)?\s*$")


def looks_exact(text) -> bool:
    """Exact text ('4*pi*zeta(3)/45', '1/3') rather than a decimal ('0.25', '1e-3').

    >>> looks_exact("4*pi*zeta(3)/45"), looks_exact("7"), looks_exact("1.25e-3")
    (True, True, False)
    """
    return isinstance(text, str) and not (_DECIMAL.match(text) and any(m in text for m in ".eE"))
