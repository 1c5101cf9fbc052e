"""Numbers with error estimates, as every engine routine returns them.

A :class:`Value` holds an mpmath number (real or complex), an upper bound on
its absolute error, and the number of significant digits that were asked for.
Arithmetic propagates the error bounds to first order plus the product term.

>>> import mpmath
>>> a = Value(mpmath.mpf("1.5"), mpmath.mpf("1e-20"), 20)
>>> b = Value(mpmath.mpf(2), mpmath.mpf(0), 20)
>>> (a * b).value
mpf('3.0')
>>> float((a * b).error)
2e-20
>>> a.correct_digits() >= 19
True
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
        return Value(self.value + other.value, self.error + other.error,
                     min(self.digits, other.digits))

    __radd__ = __add__

    def __neg__(self) -> "Value":
        return Value(-self.value, self.error, self.digits)

    def __sub__(self, other: "Value") -> "Value":
        return self + (-_as_value(other, self.digits))

    def __rsub__(self, other) -> "Value":
        return _as_value(other, self.digits) - self

    def __mul__(self, other: "Value") -> "Value":
        other = _as_value(other, self.digits)
        err = (abs(self.value) * other.error + abs(other.value) * self.error
               + self.error * other.error)
        return Value(self.value * other.value, err, min(self.digits, other.digits))

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


def _as_value(x, digits: int) -> Value:
    if isinstance(x, Value):
        return x
    return Value.exact(mpmath.mpmathify(x), digits)
