"""Changes the UI makes to a project, each in one step with a history line.

Pure model code (no textual): results computed in a worker arrive here
complete, so an entry is either updated with all of them or not at all.

>>> from ledger.book import Background, Project
>>> project = Project.new("Demo")
>>> project.add_background(Background("flat-iib", "Type IIB, flat", "IIB", 10, "none"))
>>> entry = project.add_entry(background="flat-iib", genus=1, operator="D^4R^4",
...                           structure="sigma2", coefficient="E(2)")
>>> attach_results(project, entry, {"values": [{"tau": "i", "value": "0.61", "error": "1e-2",
...                                              "digits": 2, "engine": "0.1.0"}]})
>>> entry.derived["values"][0]["tau"], entry.history[-1]["event"]
('i', 'computed value at tau = i')
"""

from __future__ import annotations

from ledger.book import STATUSES, Project
from ledger.errors import LedgerError


def same_expression(a: str, b: str) -> bool:
    """Whether two coefficient texts are equal exactly, also through the known identities.

    >>> same_expression("1/3*C(1,1,1) + 4/3*E(3)", "5/3*E(3) + zeta(3)/3")
    True
    """
    from ledger.book.fill import same_coefficient

    try:
        return same_coefficient(a, b)
    except LedgerError:
        return a.strip() == b.strip()


def attach_results(project: Project, entry, results: dict, coefficient: str | None = None) -> None:
    """Store computed results in an entry's derived data.

    ``results`` has any of "values" (a list of value records), "laurent" and
    "integral", each in the derived-data schema of the project file.

    A value at a tau already stored replaces it; with ``coefficient`` the
    entry's coefficient is replaced too (the results belong to it).
    """
    derived = dict(entry.derived)
    events = []
    if coefficient is not None and not same_expression(coefficient, entry.coefficient):
        events.append(("coefficient replaced", f"was {entry.coefficient}"))
        entry.coefficient = coefficient
        derived = {}
    for record in results.get("values", []):
        values = [v for v in derived.get("values", []) if v.get("tau") != record["tau"]]
        derived["values"] = values + [record]
        events.append((f"computed value at tau = {record['tau']}", ""))
    for name, event in (("laurent", "computed Laurent polynomial"), ("integral", "computed integral over F")):
        if name in results:
            derived[name] = results[name]
            events.append((event, ""))
    entry.derived = derived
    for event, detail in events:
        project.record(entry, event, detail)
    project.dirty = True


def add_recorded_entry(project: Project, answer: dict, coefficient: str, results: dict):
    """Add the entry described by the record dialog's answer, with the computed results."""
    if answer["new_background"]:
        project.add_background(answer["background"])
    entry = project.add_entry(background=answer["background"].id, genus=answer["genus"],
                              operator=answer["operator"], structure=answer["structure"],
                              coefficient=coefficient, notes=answer["notes"],
                              provenance=answer["provenance"])
    if results:
        attach_results(project, entry, results)
    return entry


def guess_slot(coefficient: str) -> tuple[int, int]:
    """(genus, weight w of D^{2w}R^4) suggested by the transcendental weight of a coefficient.

    At genus one B_(p,q) is a sum of graph functions of weight w = 2p + 3q; at tree level
    T_(p,q) is a sum of zeta products of weight w + 3.  Only a default for the user to confirm.

    >>> guess_slot("5/3*E(3) + 1/3*zeta(3)"), guess_slot("2*zeta(3)^2/3"), guess_slot("E(2)^2")
    ((1, 3), (0, 3), (1, 4))
    """
    import sympy

    from ledger.expr import parse
    from ledger.expr.atoms import C, E, GraphFunction, graph_of, modular_atoms

    try:
        expr = parse(coefficient)
    except LedgerError:
        return (1, 0)

    def weight(factor) -> int:
        base, power = factor.as_base_exp()
        if isinstance(base, (E, C, GraphFunction)):
            return int(power) * sum(w for _, _, w in graph_of(base).edges)
        if isinstance(base, sympy.zeta):
            return int(power) * int(base.args[0])
        return int(power) if base is sympy.pi else 0

    terms = sympy.Add.make_args(sympy.expand(expr))
    top = max(sum(weight(f) for f in sympy.Mul.make_args(t)) for t in terms)
    genus = 1 if modular_atoms(expr) else 0
    w = top if genus == 1 else top - 3
    return (genus, w) if 0 <= w <= 10 and w != 1 else (genus, 0)


def set_status(project: Project, entry, status: str) -> None:
    if status not in STATUSES:
        raise LedgerError(f"status must be one of {', '.join(STATUSES)}")
    if status != entry.status:
        project.record(entry, "status changed", f"{entry.status} -> {status}")
        entry.status = status


def set_notes(project: Project, entry, notes: str) -> None:
    if notes != entry.notes:
        entry.notes = notes
        project.record(entry, "notes edited")


def set_convention(project: Project, name: str, value: str) -> None:
    from ledger.book.conventions import check_value

    check_value(name, value)
    if project.conventions.get(name) != value:
        project.conventions[name] = value
        project.dirty = True
