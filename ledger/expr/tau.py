"""The modular parameter tau as text: ``0.27+1.31i``, ``i``, ``-0.4+0.95j``, ``2i``, ``1.3i``.

A real part (optional) and an imaginary part ending in ``i`` or ``j`` (a bare
``i`` means 1), decimal numbers with an optional exponent, spaces allowed.
Decimals are converted exactly enough for any precision the engine offers
(TAU_BITS bits), so ``0.27`` means 27/100 to far beyond 30 digits.

>>> tau = parse_tau("0.27+1.31i")
>>> mpmath.nstr(tau.imag, 40)
'1.31'
>>> parse_tau("i")
mpc(real='0.0', imag='1.0')
>>> normalise_tau_text(" -0.4 + 0.95 j")
'-0.4+0.95i'
>>> parse_tau("0.5")  # doctest: +IGNORE_EXCEPTION_DETAIL
Traceback (most recent call last):
ledger.errors.LedgerError: tau must lie in the upper half plane (Im tau > 0), got '0.5'
"""

from __future__ import annotations

import re

import mpmath

from ledger.errors import LedgerError

TAU_BITS = 1000  # about 300 digits
_NUMBER = re.compile(r"(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?")


def normalise_tau_text(text: str) -> str:
    """The canonical spelling: no spaces, lower case, ``i`` for the imaginary unit."""
    if not isinstance(text, str):
        raise LedgerError(f"tau must be text like 0.27+1.31i, got {text!r}")
    return re.sub(r"\s+", "", text).lower().replace("j", "i").replace("*i", "i")


def parse_tau(text: str):
    """tau as an mpmath mpc carrying TAU_BITS bits; LedgerError unless Im tau > 0."""
    cleaned = normalise_tau_text(text)
    real_text, imag_text = _split(cleaned, text)
    ctx = mpmath.MPContext()
    ctx.prec = TAU_BITS
    tau = ctx.mpc(_number(real_text, text, ctx), _number(imag_text, text, ctx))
    if not tau.imag > 0:
        raise LedgerError(f"tau must lie in the upper half plane (Im tau > 0), got {text!r}")
    return mpmath.mp.make_mpc(tau._mpc_)


def _split(cleaned: str, original: str) -> tuple:
    """(real part, imaginary coefficient) as text; the coefficient may be '', '+' or '-'."""
    if not cleaned:
        raise LedgerError("tau is empty; write it like 0.27+1.31i")
    if not cleaned.endswith("i"):
        return cleaned, "0"
    body = cleaned[:-1]
    split = None
    for index in range(len(body) - 1, 0, -1):
        if body[index] in "+-" and body[index - 1] != "e":
            split = index
            break
    if split is None:
        return "0", body
    return body[:split], body[split:]


def _number(text: str, original: str, ctx):
    sign = 1
    if text in ("", "+", "-"):
        return ctx.mpf(-1 if text == "-" else 1)
    if text[0] in "+-":
        sign, text = (-1 if text[0] == "-" else 1), text[1:]
    if not _NUMBER.fullmatch(text):
        raise LedgerError(f"cannot read tau {original!r}: write it like 0.27+1.31i, i or 2i")
    return sign * ctx.mpf(text)
