"""Screen text for project data: operators, structures, coefficients, numbers.

Pure functions (no textual); every screen formats through them so that the
same quantity always reads the same way.

>>> operator_unicode("D^10R^4"), structure_unicode("sigma2 sigma3"), alpha_unicode(8)
('D¹⁰R⁴', 'σ₂σ₃', "α'⁸")
>>> coefficient_unicode("5/3*E(3) + 1/3*zeta(3)")
'5/3 E₃ + 1/3 ζ(3)'
>>> short_number("0.61064373255373157887400862155")
'0.61064373'
"""

from __future__ import annotations

import re

import mpmath
import sympy

from ledger.errors import LedgerError

_SUP = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")
_SUB = str.maketrans("0123456789", "₀₁₂₃₄₅₆₇₈₉")
_POWER = re.compile(r"\^(-?\d+)")


def superscript(n) -> str:
    return str(n).translate(_SUP)


def operator_unicode(label: str) -> str:
    """'D^4R^4' -> 'D⁴R⁴'."""
    return _POWER.sub(lambda m: superscript(m.group(1)), label.replace(" ", ""))


def structure_unicode(label: str) -> str:
    """'sigma2^2 sigma3' -> 'σ₂²σ₃' ('1' stays '1')."""
    if label.strip() == "1":
        return "1"
    text = re.sub(r"sigma(\d)", lambda m: "σ" + m.group(1).translate(_SUB), label)
    return _POWER.sub(lambda m: superscript(m.group(1)), text).replace(" ", "")


def operator_with_structure(operator: str, structure: str) -> str:
    """'D⁶R⁴ σ₃' ('R⁴' alone for the structure 1).

    >>> operator_with_structure("D^12R^4", "sigma2^3"), operator_with_structure("R^4", "1")
    ('D¹²R⁴ σ₂³', 'R⁴')
    """
    shown = structure_unicode(structure)
    return operator_unicode(operator) if shown == "1" else f"{operator_unicode(operator)} {shown}"


def alpha_unicode(order: int) -> str:
    return "α'" + superscript(order)


def genus_label(genus: int) -> str:
    """'tree level', 'genus one', 'genus 2', ..."""
    return {0: "tree level", 1: "genus one"}.get(genus, f"genus {genus}")


def coefficient_unicode(text: str) -> str:
    """The coefficient as screen math; the raw text if it does not parse."""
    from ledger.expr import parse, to_unicode

    try:
        return to_unicode(parse(text))
    except (LedgerError, TypeError):
        return text


def sympy_unicode(text: str) -> str:
    """A sympy-parsable constant (zeta values, pi, rationals, decimals) as screen math.

    >>> sympy_unicode("zeta(3)/3 + pi**2/6")
    'ζ(3)/3 + π²/6'
    >>> sympy_unicode("-zeta(3)**2/4")
    '−ζ(3)²/4'
    >>> sympy_unicode("pi*log(2)*zeta(3)/45")
    'π log(2)ζ(3)/45'
    """
    from ledger.book.quantities import parse_exact

    try:  # never sympify file text: parse_exact reads only the names it allows
        value = parse_exact(text)
    except LedgerError:
        return text
    return _unicode_sstr(sympy.sstr(value))


def _unicode_sstr(text: str) -> str:
    text = re.sub(r"\bzeta_prime\(", "ζ′(", text)
    text = re.sub(r"\bzeta_sv\(", "ζsv(", text)
    text = re.sub(r"\bzeta\(", "ζ(", text)
    text = re.sub(r"\bpi\b", "π", text)
    text = re.sub(r"\bEulerGamma\b", "γ", text)
    text = re.sub(r"\bsqrt\(", "√(", text)
    text = re.sub(r"\*\*(?:\((-\d+)\)|(\d+))", lambda m: superscript(m.group(1) or m.group(2)), text)
    text = re.sub(r"(?<=\d)\*(?=\d)", "·", text)
    text = re.sub(r"\*(?=log\()", " ", text)
    return text.replace("*", "").replace("-", "−")


def laurent_unicode(laurent: dict) -> str:
    """A stored Laurent polynomial {"variable", "terms"} as one line, highest power first.

    >>> laurent_unicode({"variable": "y", "terms": [{"power": -1, "coefficient": "zeta(3)"},
    ...                                          {"power": 2, "coefficient": "1/45"}]})
    'y²/45 + ζ(3)/y'
    """
    from ledger.book.quantities import parse_exact

    name = laurent.get("variable", "y")
    variable = sympy.Symbol("τ₂" if name == "tau2" else name, positive=True)
    pieces = []
    for term in sorted(laurent.get("terms", []), key=lambda t: -int(t["power"])):
        try:
            coefficient = parse_exact(str(term["coefficient"]))
        except LedgerError:
            pieces.append(f"({term['coefficient']}) {variable}{superscript(term['power'])}")
            continue
        if coefficient == 0:
            continue
        piece = _unicode_sstr(sympy.sstr(coefficient * variable ** int(term["power"])))
        if term.get("error"):
            piece += f" (± {error_text(str(term['error']))} in the coefficient)"
        pieces.append(piece)
    if not pieces:
        return "0"
    text = pieces[0]
    for piece in pieces[1:]:
        text += " − " + piece[1:] if piece.startswith("−") else " + " + piece
    return text


def short_number(text: str, significant: int = 8) -> str:
    """A stored decimal (real or complex) rounded for a table column."""
    try:
        ctx = mpmath.MPContext()
        ctx.dps = significant + 5
        number = ctx.mpmathify(text.replace("i", "j"))
        return ctx.nstr(number, significant).replace("j", "i").strip("()")
    except (ValueError, TypeError):
        return text


def error_text(text: str) -> str:
    """'3.2e-31' -> '3.2·10⁻³¹' (0 -> 'exact')."""
    try:
        value = mpmath.mpf(text)
    except (ValueError, TypeError):
        return text
    if value == 0:
        return "exact"
    mantissa, exponent = mpmath.nstr(value, 2, min_fixed=1, max_fixed=0).split("e")
    return f"{mantissa}·10{superscript(int(exponent))}"


def grouped_digits(text: str, group: int = 5) -> str:
    """Split the fractional digits of a decimal into groups for reading.

    >>> grouped_digits("0.61064373255373157")
    '0.61064 37325 53731 57'
    """
    if "." not in text or "e" in text.lower() or "i" in text or "j" in text:
        return text
    whole, fraction = text.split(".", 1)
    return whole + "." + " ".join(fraction[i:i + group] for i in range(0, len(fraction), group))


def value_line(record: dict) -> str:
    """One stored value at a reference point: the digits, then error, digits and engine."""
    value = grouped_digits(record.get("value", "?"))
    error = error_text(record.get("error", "")) if record.get("error") else "no error estimate"
    engine = f", engine {record['engine']}" if record.get("engine") else ""
    return f"{value}\n± {error}  ({record.get('digits', '?')} digits{engine})"


def integral_short(integral: dict) -> str:
    """The integrated value for a table column: exact form if known, else a short decimal."""
    if not integral:
        return "—"
    exact = integral.get("exact") or ""
    if exact:
        return sympy_unicode(exact)
    value = integral.get("value")
    return short_number(value) if value else "—"
