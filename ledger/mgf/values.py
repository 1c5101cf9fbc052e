"""Numbers with error estimates, as every engine routine returns them.

A :class:`Value` holds an mpmath number (real or complex), an upper bound on
its absolute error, and the number of significant digits that were asked for.
Arithmetic propagates the error bounds to first order plus the product term,
and is carried out in a private mpmath context at the operands' precision
plus guard digits (never in the global ``mpmath.mp``, whose 15 digits would
silently round a 30-digit value); results are exported without rounding.

>>> import mpmath
>>> a = Value(mpmath.mpf("1.5"), mpmath.mpf("1e-20"), 20)
>>> b = Value(mpmath.mpf(2), mpmath.mpf(0), 20)
>>> (a * b).value
mpf('3.0')
>>> float((a * b).error)
2e-20
>>> a.correct_digits() >= 19
True
>>> ctx = mpmath.MPContext(); ctx.dps = 40
>>> third = Value(ctx.mpf(1) / 3, mpmath.mpf(0), 40)
>>> mpmath.libmp.to_str((third + third).value._mpf_, 35)
'0.66666666666666666666666666666666667'
"""

from __future__ import annotations

from dataclasses import dataclass

import mpmath


@dataclass(frozen=True)
class Value:
    value: object  # mpmath.mpf or mpmath.mpc
    error: object  # mpmath.mpf, an upper bound on |true - value|
    digits: int = 30

    @classmethod
    def exact(cls, x, digits: int = 30) -> "Value":
        return cls(x, mpmath.mpf(0), digits)

    @property
    def is_complex(self) -> bool:
        return isinstance(self.value, mpmath.mpc) and self.value.imag != 0

    def __add__(self, other: "Value") -> "Value":
        other = _as_value(other, self.digits)
        ctx = _context(self, other)
        total = ctx.convert(self.value) + ctx.convert(other.value)
        error = ctx.convert(self.error) + ctx.convert(other.error)
        return Value(_export(total), _export(error), min(self.digits, other.digits))

    __radd__ = __add__

    def __neg__(self) -> "Value":
        return Value(-self.value, self.error, self.digits)

    def __sub__(self, other: "Value") -> "Value":
        return self + (-_as_value(other, self.digits))

    def __rsub__(self, other) -> "Value":
        return _as_value(other, self.digits) - self

    def __mul__(self, other: "Value") -> "Value":
        other = _as_value(other, self.digits)
        ctx = _context(self, other)
        a, b = ctx.convert(self.value), ctx.convert(other.value)
        ea, eb = ctx.convert(self.error), ctx.convert(other.error)
        error = abs(a) * eb + abs(b) * ea + ea * eb
        return Value(_export(a * b), _export(error), min(self.digits, other.digits))

    __rmul__ = __mul__

    def __pow__(self, n: int) -> "Value":
        if not isinstance(n, int) or n < 0:
            raise ValueError("only non-negative integer powers are supported")
        result = Value.exact(mpmath.mpf(1), self.digits)
        for _ in range(n):
            result = result * self
        return result

    def correct_digits(self) -> float:
        """Significant digits guaranteed by the error bound (inf if exact)."""
        if self.error == 0:
            return float("inf")
        size = abs(self.value)
        if size == 0:
            return 0.0
        return float(mpmath.log10(size / self.error))


def number_text(number, digits: int) -> str:
    """Decimal text, ``digits`` significant digits; complex as 'a+bi' / 'a-bi'.

    >>> number_text(mpmath.mpc(1.5, -0.25), 5)
    '1.5-0.25i'
    """
    if isinstance(number, mpmath.mpc) and number.imag != 0:
        real = mpmath.nstr(number.real, digits)
        imag = mpmath.nstr(abs(number.imag), digits)
        return f"{real}{'-' if number.imag < 0 else '+'}{imag}i"
    return mpmath.nstr(mpmath.re(number) if isinstance(number, mpmath.mpc) else number, digits)


def _bits(x) -> int:
    raw = getattr(x, "_mpf_", None)
    if raw is not None:
        return raw[3] if raw[1] else 0  # mantissa bit count
    raw = getattr(x, "_mpc_", None)
    if raw is not None:
        return max((part[3] if part[1] else 0) for part in raw)
    return 0


def _context(*values: Value):
    """A private context wide enough for the operands (digits asked, mantissas held)."""
    ctx = mpmath.MPContext()
    bits = max(max(_bits(v.value) for v in values), max(v.digits for v in values) * 3.33)
    ctx.prec = int(bits) + 64
    return ctx


def _export(x):
    """The same number as a global-context mpf/mpc, without rounding it."""
    if hasattr(x, "_mpc_"):
        return mpmath.mp.make_mpc(x._mpc_)
    return mpmath.mp.make_mpf(x._mpf_)


def _as_value(x, digits: int) -> Value:
    if isinstance(x, Value):
        return x
    if hasattr(x, "_mpf_") or hasattr(x, "_mpc_"):
        return Value.exact(_export(x), digits)
    ctx = mpmath.MPContext()
    ctx.dps = digits + 20
    return Value.exact(_export(ctx.convert(x)), digits)
