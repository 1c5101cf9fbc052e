"""Fixed-point arithmetic on gmpy2 integers for the inner loops of the engine.

A number x is held as the integer round(x * 2^bits).  Products are shifted back
by ``bits``; sums of many products are accumulated unshifted and shifted once.
Several coefficients can be *packed* into one integer, one per slot of
``slot_bits`` bits, so that a single big multiplication applies one power to
all of them (this is what makes a series in several polylogarithm orders cost
one multiplication per term).  Transcendental functions at a point go through
a private gmpy2 context, so nothing global is touched.

>>> fp = FixedPoint(80)
>>> half = fp.from_number(mpmath.mpf("0.5"))
>>> fp.to_float(fp.mul(half, half))
0.25
>>> packed = fp.pack([fp.from_number(1), fp.from_number(-3)])
>>> [fp.to_float(v) for v in fp.unpack(packed * fp.from_number(2), 2)]
[2.0, -6.0]
"""

from __future__ import annotations

from fractions import Fraction

import gmpy2
import mpmath
from gmpy2 import mpz

__all__ = ["FixedPoint", "mpz"]


class FixedPoint:
    """Conversions, packing and elementary functions at ``bits`` fractional bits."""

    def __init__(self, bits: int):
        self.bits = bits
        self.one = mpz(1) << bits
        self.float_scale = 2.0 ** -bits
        # a packed slot holds a sum of products of two fixed-point numbers
        self.slot_bits = 2 * bits + 64
        self.gmp = gmpy2.context(precision=bits + 24)
        self.pi = self.gmp.const_pi()  # gmpy2 mpfr at the working precision

    # conversions -----------------------------------------------------------
    def from_number(self, x) -> mpz:
        """A real number (int, Fraction, mpf of any context) in fixed point."""
        if isinstance(x, int):
            return mpz(x) << self.bits
        if isinstance(x, Fraction):
            return (mpz(x.numerator) << self.bits) // x.denominator
        if hasattr(x, "_mpf_"):
            return mpz(mpmath.libmp.to_fixed(x._mpf_, self.bits))
        raise TypeError(f"cannot convert {x!r} to fixed point")

    def to_mpf(self, v, ctx):
        """The fixed-point integer ``v`` as an mpf of ``ctx`` (exactly)."""
        return ctx.ldexp(ctx.mpf(int(v)), -self.bits)

    def to_float(self, v) -> float:
        return int(v) / float(1 << self.bits)

    def mul(self, a, b) -> mpz:
        return (a * b) >> self.bits

    # packing ---------------------------------------------------------------
    def pack(self, values) -> mpz:
        """Fixed-point numbers, one per slot, lowest slot first."""
        packed = mpz(0)
        for index, value in enumerate(values):
            packed += mpz(value) << (index * self.slot_bits)
        return packed

    def unpack(self, packed, count: int) -> list:
        """Undo :meth:`pack` after the slots were multiplied by fixed-point numbers:
        every slot is shifted back by ``bits``."""
        width = self.slot_bits
        mask = (mpz(1) << width) - 1
        half = mpz(1) << (width - 1)
        values = []
        for _ in range(count):
            low = packed & mask
            if low >= half:
                low -= mask + 1
            values.append(low >> self.bits)
            packed = (packed - low) >> width
        return values

    # elementary functions at a point --------------------------------------
    def to_gmp(self, v):
        return self.gmp.div_2exp(mpz(v), self.bits)

    def from_gmp(self, x) -> mpz:
        mantissa, exponent = x.as_mantissa_exp()
        shift = exponent + self.bits
        return mantissa << shift if shift >= 0 else mantissa >> -shift

    def cos_sin(self, v) -> tuple:
        sin, cos = self.gmp.sin_cos(self.to_gmp(v))
        return self.from_gmp(cos), self.from_gmp(sin)

    def log(self, v) -> mpz:
        return self.from_gmp(self.gmp.log(self.to_gmp(v)))
