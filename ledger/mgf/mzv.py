"""Multiple zeta values to any precision.

Convention: zeta(s1, ..., sk) = sum over n1 > n2 > ... > nk >= 1 of
1/(n1^s1 ... nk^sk), convergent for s1 >= 2.  As an iterated integral on
[0, 1] the index word is the letter word w0^(s1-1) w1 ... w0^(sk-1) w1
(w0 = dt/t, w1 = dt/(1-t), outermost letter first).  Splitting the path at
1/2 (Hoelder convolution, Borwein-Bradley-Broadhurst-Lisonek 1999, and
t -> 1-t on the outer part) writes every such value as a finite sum of
products of multiple polylogarithms at 1/2,

    zeta(word) = sum_j Li(word[j:])(1/2) * Li(dual(word[:j]))(1/2),

dual = reverse and swap w0 <-> w1, each a nested sum converging like 2^-n.
The nested sums run in fixed-point integer arithmetic (scale 2^bits), so a
few hundred digits cost milliseconds.

>>> values = MZVEvaluator(30)
>>> mpmath.nstr(values.zeta((2, 1)) - values.zeta((3,)), 5)  # Euler: zeta(2,1) = zeta(3)
'0.0'
>>> mpmath.nstr(values.zeta((3, 1)) * 360, 25)  # Euler: zeta(3,1) = pi^4/360
'97.40909103400243723644033'
"""

from __future__ import annotations

import mpmath

from ledger.errors import LedgerError

GUARD_BITS = 64


class MZVEvaluator:
    """Multiple zeta values at ``digits`` significant digits, with a cache
    of the nested harmonic sums shared between all values it computes.

    The absolute error of each value is below 10^-(digits + 5).
    """

    def __init__(self, digits: int):
        if digits < 1:
            raise LedgerError(f"digits must be positive, got {digits}")
        self.digits = digits
        self.bits = int(digits * 3.3219280948873626) + GUARD_BITS
        # 2^-n sum: the tail after n_max terms is below 2^-(bits) even with
        # the polylogarithmic growth of the inner harmonic sums
        self.n_max = self.bits + 2 * GUARD_BITS
        self.ctx = mpmath.MPContext()
        self.ctx.prec = self.bits
        self._scale = 1 << self.bits
        self._harmonic: dict[tuple, list] = {(): None}
        self._li_half: dict[tuple, int] = {}
        self._zeta: dict[tuple, object] = {}

    def zeta(self, indices: tuple) -> object:
        """zeta(s1, ..., sk) as an mpf of this evaluator's context."""
        indices = tuple(int(s) for s in indices)
        if not indices:
            return self.ctx.mpf(1)
        if min(indices) < 1 or indices[0] < 2:
            raise LedgerError(f"zeta{indices} diverges: the first index must be >= 2, all >= 1")
        cached = self._zeta.get(indices)
        if cached is None:
            letters = _letters(indices)
            total = 0
            for j in range(len(letters) + 1):
                inner = self._li_half_fixed(_indices(letters[j:]))
                if inner:
                    outer = self._li_half_fixed(_indices(_dual(letters[:j])))
                    total += (inner * outer) >> self.bits
            cached = self.ctx.ldexp(self.ctx.mpf(total), -self.bits)
            self._zeta[indices] = cached
        return cached

    def polylog_half(self, indices: tuple) -> object:
        """Li_{s1..sk}(1/2) = sum_{n1>...>nk>=1} 2^-n1 / (n1^s1 ... nk^sk)."""
        return self.ctx.ldexp(self.ctx.mpf(self._li_half_fixed(tuple(indices))), -self.bits)

    def _li_half_fixed(self, indices: tuple) -> int:
        if not indices:
            return self._scale
        cached = self._li_half.get(indices)
        if cached is None:
            first, rest = indices[0], indices[1:]
            inner = self._harmonic_sums(rest)
            total = 0
            for n in range(1, self.n_max + 1):
                previous = self._scale if inner is None else inner[n - 1]
                if previous:
                    total += (previous >> n) // n ** first
            cached = total
            self._li_half[indices] = cached
        return cached

    def _harmonic_sums(self, indices: tuple):
        """[S(0), ..., S(n_max)] scaled by 2^bits, S(n) = sum_{n>=n1>...} prod n_i^-s_i;
        None stands for the empty word (S = 1)."""
        if indices in self._harmonic:
            return self._harmonic[indices]
        first, rest = indices[0], indices[1:]
        inner = self._harmonic_sums(rest)
        sums = [0] * (self.n_max + 1)
        running = 0
        for n in range(1, self.n_max + 1):
            previous = self._scale if inner is None else inner[n - 1]
            running += previous // n ** first
            sums[n] = running
        self._harmonic[indices] = sums
        return sums


def _letters(indices: tuple) -> str:
    """Index word -> letter word ('0' = dt/t, '1' = dt/(1-t)), outermost first."""
    return "".join("0" * (s - 1) + "1" for s in indices)


def _indices(letters: str) -> tuple:
    """Letter word ending in '1' (or empty) -> index word."""
    if letters and not letters.endswith("1"):
        raise ValueError(f"letter word {letters!r} must end in 1")
    return tuple(len(block) + 1 for block in letters.split("1")[:-1])


def _dual(letters: str) -> str:
    return letters[::-1].translate(str.maketrans("01", "10"))
