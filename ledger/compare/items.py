"""Comparison of one entry with its counterpart, item by item.

Items are the coefficient (compared exactly, after the identity table, in the
engine's atoms), the Laurent polynomial, the integral and the values at the
reference points both entries share.  Exact forms compare symbolically;
numbers compare to the smaller of the two precisions, within both error bounds.
Each differing item reports the factor between the two when it is a pure
number (first = factor * second).

>>> from ledger.expr import parse
>>> item = compare_coefficient(parse("E(2)"), parse("E(2)/4"), {})
>>> item.status, item.factor.text()
('different', '4')
"""

from __future__ import annotations

from dataclasses import dataclass, field

import mpmath
import sympy

from ledger.book.quantities import (
    DEFAULT_DIGITS, evaluate_exact, looks_exact, parse_exact, parse_number, record_digits, working_context,
)
from ledger.book.transform import convert_laurent, engine_form
from ledger.expr import atoms, modular_atoms

@dataclass(frozen=True)
class Factor:
    """first / second: exact (sympy) when known, always as a number with a relative error."""

    value: object  # mpmath number
    relative_error: object
    exact: object = None  # sympy constant or None

    @classmethod
    def from_exact(cls, exact) -> "Factor":
        ctx = working_context(DEFAULT_DIGITS)
        return cls(evaluate_exact(exact, ctx), ctx.mpf(10) ** (-DEFAULT_DIGITS), exact)

    def agrees(self, other: "Factor") -> bool:
        if self.exact is not None and other.exact is not None:
            return sympy.expand(self.exact - other.exact) == 0
        size = max(abs(self.value), abs(other.value))
        return abs(self.value - other.value) <= (self.relative_error + other.relative_error) * size

    def text(self) -> str:
        if self.exact is not None:
            return sympy.sstr(self.exact).replace("**", "^")
        digits = max(3, min(15, int(-mpmath.log10(self.relative_error)) if self.relative_error else 15))
        return "~" + mpmath.nstr(self.value, digits)


@dataclass
class ItemComparison:
    """One compared item: 'same' or 'different', with the factor when it is a pure number."""

    item: str
    status: str
    first: str = ""
    second: str = ""
    factor: Factor | None = None
    detail: str = ""
    neutral: bool = False  # zero on both sides: the same under any factor

    def to_dict(self) -> dict:
        result = {"item": self.item, "status": self.status, "first": self.first, "second": self.second}
        if self.factor is not None:
            result["factor"] = self.factor.text()
        if self.detail:
            result["detail"] = self.detail
        return result


def _constant_ratio(first, second):
    """first/second if it is free of functions of tau, else None (exact)."""
    if second == 0:
        return None
    found = modular_atoms(first) | modular_atoms(second)
    symbols = {atom: sympy.Dummy() for atom in found}
    ratio = sympy.cancel(sympy.together(first.xreplace(symbols) / second.xreplace(symbols)))
    if ratio.free_symbols & set(symbols.values()):
        return None
    return ratio


def compare_coefficient(first, second, conventions: dict) -> ItemComparison:
    """Exact comparison of two coefficient expressions written in the same conventions."""
    from ledger.amplitudes.identities import apply_identities
    from ledger.expr import to_text

    a, b = engine_form(first, conventions), engine_form(second, conventions)
    if a.atoms(atoms.C, atoms.GraphFunction) or b.atoms(atoms.C, atoms.GraphFunction):
        a, b = apply_identities(a), apply_identities(b)
    texts = {"first": to_text(first), "second": to_text(second)}
    if sympy.expand(a - b) == 0:
        return ItemComparison("coefficient", "same", **texts)
    ratio = _constant_ratio(a, b)
    factor = Factor.from_exact(ratio) if ratio is not None else None
    return ItemComparison("coefficient", "different", factor=factor, **texts)


@dataclass
class Number:
    """A stored number: exact form if known, decimal value, error bound, digits."""

    value: object
    error: object
    digits: int
    exact: object = None
    text: str = ""


def number_from(value_text, error_text, digits, exact_text=None) -> Number:
    """A stored number from its texts (value and error decimals, optional exact form)."""
    digits = record_digits({"digits": digits})
    ctx = working_context(digits)
    exact = parse_exact(exact_text) if exact_text else None
    if value_text in (None, "") and exact is not None:
        return Number(evaluate_exact(exact, ctx), ctx.mpf(0), digits, exact, str(exact_text))
    value = parse_number(value_text, ctx)
    error = abs(parse_number(error_text if error_text not in (None, "") else "0", ctx, "error"))
    return Number(value, error, digits, exact, str(exact_text or value_text))


def compare_numbers(item: str, a: Number, b: Number) -> ItemComparison:
    """Exactly when both are exact; else within both errors at the smaller precision."""
    texts = {"first": a.text, "second": b.text}
    if a.exact is not None and b.exact is not None:
        if sympy.expand(a.exact - b.exact) == 0:
            return ItemComparison(item, "same", neutral=a.exact == 0, **texts)
        pure = a.exact != 0 and b.exact != 0
        factor = Factor.from_exact(sympy.simplify(a.exact / b.exact)) if pure else None
        return ItemComparison(item, "different", factor=factor, **texts)
    digits = min(a.digits, b.digits)
    ctx = working_context(digits)
    x, y, errors = ctx.mpmathify(a.value), ctx.mpmathify(b.value), a.error + b.error
    floor = ctx.mpf(10) ** (-digits)
    if abs(x - y) <= errors + floor * max(abs(x), abs(y)):
        neutral = abs(x) <= a.error + floor and abs(y) <= b.error + floor
        return ItemComparison(item, "same", neutral=neutral, **texts)
    factor = None
    if x != 0 and y != 0:
        relative = (a.error + floor * abs(x)) / abs(x) + (b.error + floor * abs(y)) / abs(y)
        factor = Factor(x / y, relative)
    return ItemComparison(item, "different", detail=f"differ by {ctx.nstr(abs(x - y), 3)}",
                          factor=factor, **texts)


def compare_laurent(first: dict, second: dict) -> ItemComparison:
    """Term by term (both in the same variable); a pure factor if every term has the same ratio."""
    exact = bool(first.get("exact")) and bool(second.get("exact"))
    digits = min(record_digits(first), record_digits(second))
    a_terms = {t["power"]: t["coefficient"] for t in first.get("terms", [])}
    b_terms = {t["power"]: t["coefficient"] for t in second.get("terms", [])}
    results = []
    for power in sorted(set(a_terms) | set(b_terms), reverse=True):
        a = _laurent_number(a_terms.get(power, "0"), exact, digits)
        b = _laurent_number(b_terms.get(power, "0"), exact, digits)
        results.append((power, compare_numbers(f"laurent power {power}", a, b)))
    texts = {"first": _laurent_text(first), "second": _laurent_text(second)}
    differing = [(power, r) for power, r in results if r.status == "different"]
    if not differing:
        return ItemComparison("laurent", "same", neutral=all(r.neutral for _, r in results), **texts)
    factors = [r.factor for _, r in results if not r.neutral]
    common = factors[0] if all(f is not None for f in factors) else None
    if common is not None and not all(common.agrees(f) for f in factors[1:]):
        common = None
    detail = "; ".join(f"power {power}: {r.factor.text() if r.factor else 'not a pure factor'}"
                       for power, r in differing)
    return ItemComparison("laurent", "different", factor=common, detail=detail, **texts)


def _laurent_number(text, exact: bool, digits: int) -> Number:
    if exact or looks_exact(str(text)):
        return number_from(None, None, digits, str(text))
    return number_from(str(text), "0", digits)


def _laurent_text(laurent: dict) -> str:
    variable = "y" if laurent.get("variable") in ("pi*tau2", "y") else str(laurent.get("variable", "y"))
    return " + ".join(f"({t['coefficient']})*{variable}^{t['power']}" for t in laurent.get("terms", []))


def compare_integral(first: dict, second: dict) -> ItemComparison:
    """The renormalised value (and the log L coefficient when both give one)."""
    a = number_from(first.get("value"), first.get("error"), first.get("digits"), first.get("exact"))
    b = number_from(second.get("value"), second.get("error"), second.get("digits"), second.get("exact"))
    result = compare_numbers("integral", a, b)
    logs = first.get("log_coefficient"), second.get("log_coefficient")
    if any(log in (None, "") for log in logs):
        return result
    digits = min(a.digits, b.digits)
    log_result = compare_numbers("log coefficient", _laurent_number(logs[0], False, digits),
                                 _laurent_number(logs[1], False, digits))
    if log_result.status == "same":
        result.neutral = result.neutral and log_result.neutral
        return result
    shared = (result.status == "different" and result.factor is not None
              and log_result.factor is not None and result.factor.agrees(log_result.factor))
    result.status = "different"
    result.factor = result.factor if shared else None
    result.detail = "; ".join(filter(None, [result.detail, "log L coefficients differ"]))
    return result


def compare_values(first: list, second: list) -> list[ItemComparison]:
    """Values at every reference tau both entries have."""
    results = []
    b_by_tau = {_tau_key(v.get("tau")): v for v in second}
    for item in first:
        other = b_by_tau.get(_tau_key(item.get("tau")))
        if other is None:
            continue
        a = number_from(item.get("value"), item.get("error"), item.get("digits"))
        b = number_from(other.get("value"), other.get("error"), other.get("digits"))
        results.append(compare_numbers(f"value at tau={item.get('tau')}", a, b))
    return results


def _tau_key(text) -> tuple:
    """A reference point as exact decimals, so '0.5+1.2i' and '0.50+1.20i' match."""
    from decimal import Decimal, InvalidOperation

    compact = "".join(str(text).split()).replace("j", "i")
    real, imag = compact, "0"
    if compact.endswith("i"):
        body = compact[:-1]
        cut = max(body.rfind("+"), body.rfind("-"))
        real, imag = (body[:cut], body[cut:]) if cut > 0 else ("0", body)
        imag = imag + "1" if imag in ("", "+", "-") else imag
    try:
        return (Decimal(real or "0").normalize(), Decimal(imag).normalize())
    except InvalidOperation:
        return (compact,)


@dataclass
class EntryComparison:
    """All items of one matched pair (second already aligned to the first's conventions)."""

    items: list[ItemComparison] = field(default_factory=list)

    @property
    def same(self) -> bool:
        return all(item.status == "same" for item in self.items)

    @property
    def differing(self) -> list[ItemComparison]:
        return [item for item in self.items if item.status == "different"]

    @property
    def mixed(self) -> bool:
        """Some items agree (and not merely by being zero on both sides) while others differ."""
        return bool(self.differing) and any(i.status == "same" and not i.neutral for i in self.items)

    def common_factor(self) -> Factor | None:
        """The factor shared by every item that is not zero on both sides, when all of those
        differ by the same pure number."""
        informative = [item for item in self.items if not item.neutral]
        factors = [item.factor for item in informative]
        if not factors or any(f is None for f in factors) or any(i.status == "same" for i in informative):
            return None
        exact = next((f for f in factors if f.exact is not None), factors[0])
        return exact if all(exact.agrees(f) for f in factors) else None


def compare_entries(first, second, conventions: dict) -> EntryComparison:
    """Compare two entries already written in the same ``conventions``."""
    from ledger.expr import parse

    result = EntryComparison([compare_coefficient(parse(first.coefficient), parse(second.coefficient),
                                                  conventions)])
    a, b = first.derived or {}, second.derived or {}
    if "laurent" in a and "laurent" in b:
        in_declared_variable = [convert_laurent(x["laurent"], conventions, conventions) for x in (a, b)]
        result.items.append(compare_laurent(*in_declared_variable))
    if "integral" in a and "integral" in b:
        result.items.append(compare_integral(a["integral"], b["integral"]))
    result.items.extend(compare_values(a.get("values", []), b.get("values", [])))
    return result
