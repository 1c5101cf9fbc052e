"""Private working precision and error-carrying numbers for one computation.

Every engine routine that needs more than machine precision builds its own
``mpmath.MPContext`` (UI workers run concurrently, so the global ``mpmath.mp``
is never touched), computes with :class:`Approx` numbers, which carry an upper
bound on their absolute error and add a rounding allowance at each operation,
and converts the result into a :class:`~ledger.mgf.values.Value` at the end
without rounding it to the global precision.

>>> ctx = working_context(20)
>>> third = Approx.exact(ctx, ctx.mpf(1)) / Approx.exact(ctx, ctx.mpf(3))
>>> value = third.to_value(20)
>>> abs(value.value - mpmath.mpf(1) / 3) < 1e-15, value.error < 1e-30
(True, True)
"""

from __future__ import annotations

from dataclasses import dataclass

import mpmath
import sympy

from ledger.errors import LedgerError
from ledger.mgf.values import Value

GUARD_DIGITS = 12
MAX_DIGITS = 2000


def working_context(digits: int, extra_digits: int = 0) -> mpmath.MPContext:
    """A fresh mpmath context with ``digits`` + guard digits of precision."""
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= MAX_DIGITS:
        raise LedgerError(f"digits must be an integer between 1 and {MAX_DIGITS}, got {digits!r}")
    ctx = mpmath.MPContext()
    ctx.dps = digits + GUARD_DIGITS + extra_digits
    return ctx


def export(x):
    """The same number as a global-context mpf/mpc, without rounding it."""
    if hasattr(x, "_mpc_"):
        return mpmath.mp.make_mpc(x._mpc_)
    if hasattr(x, "_mpf_"):
        return mpmath.mp.make_mpf(x._mpf_)
    return mpmath.mpmathify(x)


def as_tau(tau, ctx):
    """``tau`` as a ctx complex number; it must lie in the upper half plane."""
    z = as_complex(tau, ctx, "tau")
    if not z.imag > 0:
        raise LedgerError(f"tau must lie in the upper half plane (Im tau > 0), got {tau}")
    return z


def as_complex(x, ctx, what: str = "argument"):
    """Convert a number (mpmath, Python, sympy, or text like ``0.27+1.31i``)
    to a ctx complex number."""
    try:
        if isinstance(x, sympy.Basic):
            re_part, im_part = sympy.N(x, ctx.dps + 5).as_real_imag()
            return ctx.mpc(ctx.mpf(str(re_part)), ctx.mpf(str(im_part)))
        if isinstance(x, str):
            x = x.strip().replace(" ", "").replace("i", "j")
        return ctx.mpc(ctx.convert(x))
    except (TypeError, ValueError) as exc:
        raise LedgerError(f"{what} must be a number, got {x!r}") from exc


@dataclass(frozen=True)
class Approx:
    """A number in a private context with an upper bound on its absolute error."""

    ctx: object
    value: object
    error: object

    @classmethod
    def exact(cls, ctx, x) -> "Approx":
        return cls(ctx, ctx.convert(x), ctx.zero)

    def _rounded(self, value, error) -> "Approx":
        # one rounding of the result plus a margin for the elementary function calls
        return Approx(self.ctx, value, error + 4 * self.ctx.eps * abs(value))

    def _lift(self, other) -> "Approx":
        return other if isinstance(other, Approx) else Approx.exact(self.ctx, other)

    def __add__(self, other) -> "Approx":
        other = self._lift(other)
        return self._rounded(self.value + other.value, self.error + other.error)

    __radd__ = __add__

    def __neg__(self) -> "Approx":
        return Approx(self.ctx, -self.value, self.error)

    def __sub__(self, other) -> "Approx":
        return self + (-self._lift(other))

    def __rsub__(self, other) -> "Approx":
        return self._lift(other) - self

    def __mul__(self, other) -> "Approx":
        other = self._lift(other)
        error = (abs(self.value) * other.error + abs(other.value) * self.error
                 + self.error * other.error)
        return self._rounded(self.value * other.value, error)

    __rmul__ = __mul__

    def __truediv__(self, other) -> "Approx":
        other = self._lift(other)
        margin = abs(other.value) - other.error
        if margin <= 0:
            raise ZeroDivisionError("division by a number indistinguishable from zero")
        quotient = self.value / other.value
        error = (self.error + abs(quotient) * other.error) / margin
        return self._rounded(quotient, error)

    def __rtruediv__(self, other) -> "Approx":
        return self._lift(other) / self

    def __pow__(self, n: int) -> "Approx":
        result = Approx.exact(self.ctx, 1)
        for _ in range(n):
            result = result * self
        return result

    def conjugate(self) -> "Approx":
        return Approx(self.ctx, self.ctx.conj(self.value), self.error)

    @property
    def real(self) -> "Approx":
        return Approx(self.ctx, self.ctx.re(self.value), self.error)

    def log_abs(self) -> "Approx":
        """log|x|; |log|x+e| - log|x|| <= e/(|x| - e)."""
        margin = abs(self.value) - self.error
        if margin <= 0:
            raise ZeroDivisionError("logarithm of a number indistinguishable from zero")
        value = self.ctx.log(abs(self.value))
        return self._rounded(value, self.error / margin)

    def to_value(self, digits: int) -> Value:
        """The exported :class:`Value`, real when the imaginary part is exactly zero."""
        value = self.value
        if hasattr(value, "_mpc_") and self.ctx.im(value) == 0:
            value = self.ctx.re(value)
        return Value(export(value), export(self.ctx.mpf(self.error)), digits)


def refine(compute, digits: int, retries: int = 2):
    """Run ``compute(ctx) -> Approx`` and repeat with more guard digits while
    the error bound is above 10^-digits relative (cancellation near a zero).

    Stops early when a retry leaves the value within the previous error bar
    (a quantity that vanishes). Returns the last :class:`Approx`; its error
    bound stays honest either way.
    """
    result = None
    for attempt in range(retries + 1):
        ctx = working_context(digits, extra_digits=20 * attempt)
        previous, result = result, compute(ctx)
        if result.error <= ctx.mpf(10) ** (-digits) * abs(result.value):
            break
        if previous is not None and abs(result.value) <= previous.error:
            break
    return result
