"""Diff of two projects after bringing the second into the first's conventions.

Entries match by background, genus, operator and sigma structure
(:meth:`Entry.key`).  Each matched pair is classified

* ``same``: every compared item agrees after alignment;
* ``different``: the items disagree consistently (all of them, or in the way a
  single convention read differently explains);
* ``conflict``: some items agree and others do not, and no single convention
  explains it (e.g. equal coefficients with different integrals): one of the
  two entries contradicts itself;

and unmatched entries are ``only-in-first`` / ``only-in-second``.

A cause is a *relabel*: one convention of one project read as another value.
It explains a pair when, aligned under the relabel, the pair is the same.
Discrete values are tried in turn; the Mandelstam scale is solved from the
pair's common factor F (first = F x second): a weight-w pair fixes
c' = c F^(1/w), tried when c'/c = p/q with p, q <= 64 (powers of 2 between the
usual conventions, or alpha' = N).  The amplitude factor explains
any constant, so it is named only for the whole project, when every matched
pair differs by the same F (then f' = f/F).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

import mpmath
import sympy

from ledger.book.conventions import CONVENTION_KEYS, convention_key, mandelstam_scale
from ledger.book.transform import convert_entry, describe_change
from ledger.compare.items import EntryComparison, Factor, compare_entries

STATUSES = ("same", "different", "conflict", "only-in-first", "only-in-second")
_MAX_SCALE = 64
_DISCRETE_KEYS = tuple(key for key in CONVENTION_KEYS if key.values and key.name != "mandelstam")
# The one item each representation convention acts on (the others leave it alone).
_AFFECTS = {"graph_normalisation": "coefficient", "green_function": "coefficient",
            "laurent_variable": "laurent", "measure": "integral"}


@dataclass(frozen=True)
class Relabel:
    """One convention of one project ('first' or 'second') read as another value."""

    project: str
    key: str
    declared: str
    reading: str

    def describe(self) -> str:
        return (f"{self.key}: the {self.project} project's data match if read as "
                f"{self.key} = {self.reading} (declared {self.declared})")

    def to_dict(self) -> dict:
        return {"project": self.project, "key": self.key, "declared": self.declared,
                "reading": self.reading, "text": self.describe()}


@dataclass
class EntryDiff:
    status: str
    key: tuple
    first: object = None  # the first project's Entry, if any
    second: object = None  # the second project's Entry (as stored, not aligned), if any
    comparison: EntryComparison | None = None
    causes: list[Relabel] = field(default_factory=list)

    @property
    def first_id(self) -> str | None:
        return self.first.id if self.first is not None else None

    @property
    def second_id(self) -> str | None:
        return self.second.id if self.second is not None else None

    @property
    def factor(self) -> Factor | None:
        return self.comparison.common_factor() if self.comparison else None

    @property
    def cause(self) -> Relabel | None:
        return self.causes[0] if self.causes else None


@dataclass(frozen=True)
class AlignmentStep:
    key: str
    source: str
    target: str
    effect: str


@dataclass
class ProjectDiff:
    first_conventions: dict
    second_conventions: dict
    alignment: list[AlignmentStep]
    entries: list[EntryDiff]
    cause: Relabel | None = None

    @property
    def equal(self) -> bool:
        return all(entry.status == "same" for entry in self.entries)

    def counts(self) -> dict:
        return {status: sum(e.status == status for e in self.entries) for status in STATUSES}


def diff_projects(first, second) -> ProjectDiff:
    """Compare two projects; the second is aligned to the first's conventions.

    >>> from ledger.book import Background, Project
    >>> from ledger.book.transform import convert_project
    >>> a = Project.new("A")
    >>> a.add_background(Background("flat-iib", "Type IIB, flat", "IIB", 10, "none"))
    >>> _ = a.add_entry(background="flat-iib", genus=1, operator="D^4R^4", structure="sigma2",
    ...                 coefficient="E(2)")
    >>> b = convert_project(a, {"mandelstam": "alpha'/2"})
    >>> b.entries[0].coefficient, diff_projects(a, b).equal
    ('1/4*E(2)', True)
    >>> b.conventions["mandelstam"] = "alpha'/4"  # the data stay as they were
    >>> d = diff_projects(a, b)
    >>> d.entries[0].status, d.entries[0].factor.text(), d.cause.reading
    ('different', '4', "alpha'/2")
    """
    alignment = [AlignmentStep(key, second.conventions[key], first.conventions[key],
                               describe_change(key, second.conventions[key], first.conventions[key]))
                 for key in first.conventions if first.conventions[key] != second.conventions[key]]
    pairs, only_first, only_second = _match(first.entries, second.entries)
    entries = []
    for a, b in pairs:
        comparison = _compare(a, b, first.conventions, second.conventions)
        entry = EntryDiff("same", a.key(), a, b, comparison)
        if not comparison.same:
            entry.causes = _explaining_relabels(a, b, comparison, first.conventions, second.conventions)
            entry.status = "conflict" if comparison.mixed and not entry.causes else "different"
        entries.append(entry)
    entries.extend(EntryDiff("only-in-first", e.key(), first=e) for e in only_first)
    entries.extend(EntryDiff("only-in-second", e.key(), second=e) for e in only_second)
    result = ProjectDiff(first.conventions, second.conventions, alignment, entries)
    result.cause = _project_cause(result, first.conventions, second.conventions)
    if result.cause is not None:
        for entry in result.entries:
            if result.cause in entry.causes:
                entry.causes.remove(result.cause)
                entry.causes.insert(0, result.cause)
    return result


def _match(first_entries, second_entries):
    """Pairs with equal keys (positionally when a key repeats), then the unmatched."""
    remaining: dict[tuple, list] = {}
    for entry in second_entries:
        remaining.setdefault(entry.key(), []).append(entry)
    pairs, only_first = [], []
    for entry in first_entries:
        bucket = remaining.get(entry.key())
        if bucket:
            pairs.append((entry, bucket.pop(0)))
        else:
            only_first.append(entry)
    matched = {id(b) for _, b in pairs}
    only_second = [e for e in second_entries if id(e) not in matched]
    return pairs, only_first, only_second


def _compare(a, b, first_conventions: dict, second_conventions: dict) -> EntryComparison:
    aligned = convert_entry(b, second_conventions, first_conventions)
    return compare_entries(a, aligned, first_conventions)


def _apply(relabel: Relabel, first_conventions: dict, second_conventions: dict) -> tuple[dict, dict]:
    first, second = dict(first_conventions), dict(second_conventions)
    (first if relabel.project == "first" else second)[relabel.key] = relabel.reading
    return first, second


def _explains(relabel: Relabel, a, b, first_conventions: dict, second_conventions: dict) -> bool:
    first, second = _apply(relabel, first_conventions, second_conventions)
    return _compare(a, b, first, second).same


def _candidates(weight: int, factor: Factor | None, differing_items: set, first_conventions: dict,
                second_conventions: dict) -> list[Relabel]:
    """Relabels worth trying for one pair: every other value of a key whose one item is the
    only differing one, and the Mandelstam scale solved from the pair's common factor (it
    scales every item alike) when the ratio of scales is a simple fraction."""
    candidates = []
    for project, conventions in (("second", second_conventions), ("first", first_conventions)):
        for key in _DISCRETE_KEYS:
            if differing_items <= {_AFFECTS[key.name]}:
                candidates.extend(Relabel(project, key.name, conventions[key.name], value)
                                  for value in key.values if value != conventions[key.name])
    if factor is None or weight == 0:
        return candidates
    for project, conventions, sign in (("second", second_conventions, 1), ("first", first_conventions, -1)):
        # first = F second; reading the second's scale as c' multiplies it by (c'/c)^w,
        # reading the first's as c' multiplies the aligned second by (c'/c)^-w.
        ratio = _rational_root(factor, weight, sign)
        if ratio is not None:
            reading = _mandelstam_value(mandelstam_scale(conventions["mandelstam"]) * ratio)
            if reading != conventions["mandelstam"]:
                candidates.append(Relabel(project, "mandelstam", conventions["mandelstam"], reading))
    return list(dict.fromkeys(candidates))


def _explaining_relabels(a, b, comparison, first_conventions, second_conventions) -> list[Relabel]:
    differing = {item.item for item in comparison.differing}
    candidates = _candidates(a.weight, comparison.common_factor(), differing, first_conventions,
                             second_conventions)
    return [r for r in candidates if _explains(r, a, b, first_conventions, second_conventions)]


def _project_cause(result: ProjectDiff, first_conventions: dict, second_conventions: dict):
    """A relabel that makes every matched pair the same: one shared by every differing pair,
    or, when every matched pair differs by one common factor F, the amplitude factor."""
    matched = [e for e in result.entries if e.comparison is not None]
    differing = [e for e in matched if e.status != "same"]
    if not differing:
        return None
    same = [e for e in matched if e.status == "same"]
    for relabel in differing[0].causes:
        if all(relabel in e.causes for e in differing[1:]) and all(
                _explains(relabel, e.first, e.second, first_conventions, second_conventions) for e in same):
            return relabel
    factors = [e.factor for e in matched]
    if same or any(f is None or (f.exact is None and _is_complex(f.value)) for f in factors) \
            or not all(factors[0].agrees(f) for f in factors[1:]):
        return None
    exact = next((f for f in factors if f.exact is not None), factors[0])
    declared = second_conventions["amplitude_factor"]
    relabel = Relabel("second", "amplitude_factor", declared, _amplitude_value(declared, exact))
    if all(_explains(relabel, e.first, e.second, first_conventions, second_conventions) for e in matched):
        for entry in matched:
            entry.causes.insert(0, relabel)
            entry.status = "different"
        return relabel
    return None


def _rational_root(factor: Factor, weight: int, sign: int):
    """r = p/q > 0 with p, q <= 64 and r^weight = factor^sign, if there is one (the caller
    verifies it on the whole pair)."""
    if factor.exact is not None:
        root = sympy.root(factor.exact ** sign, weight)
        small = root.is_Rational and root > 0 and max(root.p, root.q) <= _MAX_SCALE
        return root if small else None
    if _is_complex(factor.value) or factor.value <= 0:
        return None
    guess = Fraction(str(float(factor.value ** (mpmath.mpf(sign) / weight)))).limit_denominator(_MAX_SCALE)
    if guess <= 0 or guess.numerator > _MAX_SCALE:
        return None
    return sympy.Rational(guess.numerator, guess.denominator)


def _is_complex(value) -> bool:
    return getattr(value, "imag", 0) != 0


def _mandelstam_value(scale) -> str:
    """The registry's name for a Mandelstam scale c, else alpha'=4/c."""
    for value, text in convention_key("mandelstam").scales.items():
        if sympy.sympify(text) == scale:
            return value
    return f"alpha'={sympy.sstr(4 / scale)}"


def _amplitude_value(declared: str, factor: Factor) -> str:
    """The second's amplitude factor f/F that makes first = F x second hold (F exact if known,
    else the nearest fraction with denominator <= 1000, verified by the caller)."""
    from ledger.book.conventions import amplitude_scale
    from ledger.expr import to_text

    exact = factor.exact
    if exact is None:
        guess = Fraction(str(float(factor.value))).limit_denominator(1000)
        exact = sympy.Rational(guess.numerator, guess.denominator)
    return to_text(sympy.simplify(amplitude_scale(declared) / exact))
