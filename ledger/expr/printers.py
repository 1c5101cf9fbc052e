"""Printers: plain text (re-parses to an equal object), unicode (screen), LaTeX.

>>> from ledger.expr.parser import parse
>>> e = parse("C(1,2,1) - 2/5*E(5) + zeta(3)^2/4")
>>> to_text(e)
'C(2,1,1) - 2/5*E(5) + 1/4*zeta(3)^2'
>>> parse(to_text(e)) == e
True
>>> to_unicode(parse("E(2)^2 + zeta(3)"))
'E₂² + ζ(3)'
>>> to_latex(parse("2/5 E(5) + C(2,1,1)"))
'C_{2,1,1} + \\\\frac{2 E_{5}}{5}'
"""

from __future__ import annotations

import sympy
from sympy.printing.latex import LatexPrinter

from ledger.expr import atoms

_SUB = str.maketrans("0123456789-", "₀₁₂₃₄₅₆₇₈₉₋")
_SUP = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


def ordered_terms(expr) -> list:
    """Terms of a sum: functions of tau first (sympy's order within), constants last."""
    terms = expr.as_ordered_terms()
    return sorted(terms, key=lambda t: 0 if atoms.modular_atoms(t) else 1)


def _rational_text(r) -> str:
    return str(r.p) if r.q == 1 else f"{r.p}/{r.q}"


class _LinearPrinter:
    """Shared walk for the one-line printers; subclasses name the atoms."""

    times = "*"
    minus = "-"

    def __call__(self, expr) -> str:
        return self.print(sympy.sympify(expr))

    def print(self, e) -> str:
        if isinstance(e, sympy.Add):
            return self.add(e)
        if isinstance(e, sympy.Mul):
            return self.mul(e)
        if isinstance(e, sympy.Pow):
            return self.power(e)
        if e.is_Rational:
            return self.rational(e)
        return self.atom(e)

    def rational(self, r) -> str:
        return _rational_text(r)

    def add(self, e) -> str:
        terms = ordered_terms(e)
        pieces = [self.print(terms[0])]
        for term in terms[1:]:
            if term.could_extract_minus_sign():
                pieces.append(f" {self.minus} " + self.print(-term))
            else:
                pieces.append(" + " + self.print(term))
        return "".join(pieces)

    def factor(self, e) -> str:
        text = self.print(e)
        return f"({text})" if isinstance(e, sympy.Add) else text

    def mul(self, e) -> str:
        coefficient, factors = e.as_coeff_mul()
        body = self.times.join(self.factor(f) for f in factors)
        if coefficient == 1:
            return body
        if coefficient == -1:
            return self.minus + body
        return self.rational(coefficient) + self.coefficient_join + body

    coefficient_join = "*"

    def base(self, e) -> str:
        text = self.print(e)
        simple = not isinstance(e, (sympy.Add, sympy.Mul, sympy.Pow)) and not (
            e.is_Rational and (e.q != 1 or e < 0))
        return text if simple else f"({text})"

    def power(self, e) -> str:
        base, exponent = e.as_base_exp()
        return self.base(base) + self.exponent(exponent)

    def exponent(self, n) -> str:
        return f"^{n}" if n >= 0 else f"^({n})"


class _TextPrinter(_LinearPrinter):
    def atom(self, e) -> str:
        if e is sympy.pi:
            return "pi"
        if isinstance(e, sympy.zeta):
            return f"zeta({e.args[0]})"
        if isinstance(e, atoms.E):
            return f"E({e.args[0]})"
        if isinstance(e, atoms.C):
            return "C(" + ",".join(str(a) for a in e.args) + ")"
        if isinstance(e, atoms.GraphFunction):
            return e.graph.text()
        if isinstance(e, atoms.Laplace):
            return f"laplace({self.print(e.args[0])})"
        if isinstance(e, atoms.Eta):
            return "eta"
        names = {atoms.Theta: "theta", atoms.Spin: "spin", atoms.Green: "green",
                 atoms.Etw: "Etw", atoms.EllGenus: "ellgenus"}
        for cls, name in names.items():
            if isinstance(e, cls):
                return name + "(" + ",".join(_rational_text(a) for a in e.args) + ")"
        raise TypeError(f"cannot print {e!r} as ledger text")


class _UnicodePrinter(_LinearPrinter):
    times = "·"
    minus = "−"
    coefficient_join = " "

    def rational(self, r) -> str:
        return _rational_text(r).replace("-", "−")

    def exponent(self, n) -> str:
        return str(n).translate(_SUP)

    def atom(self, e) -> str:
        if e is sympy.pi:
            return "π"
        if isinstance(e, sympy.zeta):
            return f"ζ({e.args[0]})"
        if isinstance(e, atoms.E):
            return "E" + str(e.args[0]).translate(_SUB)
        if isinstance(e, atoms.C):
            return "C" + ",".join(str(a).translate(_SUB) for a in e.args)
        if isinstance(e, atoms.GraphFunction):
            return "𝒢[" + " ".join(f"{u}{v}" + (f":{w}" if w != 1 else "")
                                     for u, v, w in e.graph.edges) + "]"
        if isinstance(e, atoms.Laplace):
            return f"Δ({self.print(e.args[0])})"
        if isinstance(e, atoms.Eta):
            return "η"
        arguments = ",".join(_rational_text(a) for a in e.args[1:])
        if isinstance(e, atoms.Theta):
            return f"θ{str(e.args[0]).translate(_SUB)}[{arguments}]"
        if isinstance(e, atoms.Spin):
            return f"S{str(e.args[0]).translate(_SUB)}[{arguments}]"
        if isinstance(e, atoms.Green):
            return "G[" + ",".join(_rational_text(a) for a in e.args) + "]"
        if isinstance(e, atoms.Etw):
            return f"Eᵗʷ{str(e.args[0]).translate(_SUB)}[{arguments}]"
        if isinstance(e, atoms.EllGenus):
            return f"φ(T⁴/ℤ{str(e.args[0]).translate(_SUB)})[{arguments}]"
        raise TypeError(f"cannot print {e!r}")


class _LedgerLatexPrinter(LatexPrinter):
    def _as_ordered_terms(self, expr, order=None):
        return ordered_terms(expr) if isinstance(expr, sympy.Add) else super()._as_ordered_terms(expr, order)

    def _print_zeta(self, e, exp=None):
        text = rf"\zeta({self._print(e.args[0])})"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_E(self, e, exp=None):
        text = f"E_{{{e.args[0]}}}"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_C(self, e, exp=None):
        text = "C_{" + ",".join(str(a) for a in e.args) + "}"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_GraphFunction(self, e, exp=None):
        edges = ",".join(f"{u}{v}" + (f"^{{{w}}}" if w != 1 else "") for u, v, w in e.graph.edges)
        text = r"\mathcal{G}_{" + edges + "}"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_Laplace(self, e, exp=None):
        text = r"\Delta\left(" + self._print(e.args[0]) + r"\right)"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_Eta(self, e, exp=None):
        return r"\eta(\tau)" + (f"^{{{exp}}}" if exp else "")

    def _point(self, alpha, beta) -> str:
        return self._print(alpha + beta * sympy.Symbol("tau"))

    def _print_Theta(self, e, exp=None):
        text = rf"\vartheta_{{{e.args[0]}}}\left({self._point(*e.args[1:])}\right)"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_Spin(self, e, exp=None):
        text = rf"S_{{{e.args[0]}}}\left({self._point(*e.args[1:])}\right)"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_Green(self, e, exp=None):
        text = rf"G\left({self._point(*e.args)}\right)"
        return f"{text}^{{{exp}}}" if exp else text

    def _print_Etw(self, e, exp=None):
        s, alpha, beta = e.args
        text = (rf"E^{{\mathrm{{tw}}}}_{{{s}}}\left[{self._print(alpha)},"
                rf"{self._print(beta)}\right]")
        return f"{text}^{{{exp}}}" if exp else text

    def _print_EllGenus(self, e, exp=None):
        text = rf"\phi_{{T^4/\mathbb{{Z}}_{{{e.args[0]}}}}}\left({self._point(*e.args[1:])}\right)"
        return f"{text}^{{{exp}}}" if exp else text


to_text = _TextPrinter()
to_unicode = _UnicodePrinter()


def to_latex(expr) -> str:
    """LaTeX for an expression (math mode, without the dollar signs)."""
    return _LedgerLatexPrinter({"order": "lex"}).doprint(sympy.sympify(expr))
