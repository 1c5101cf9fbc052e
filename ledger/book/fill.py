"""Fill a project from an expansion: one computed entry per operator and sigma structure.

The merge never overwrites what a person wrote: notes stay, cited entries keep
their coefficient (a cited entry that disagrees with the computation is marked
``conflict``; one that agrees is marked ``verified``), and an entry whose
derived data were already produced by this engine version is left as it is,
so running the same expansion twice changes nothing.

Derived data for genus-one entries: the Laurent polynomial, the renormalised
integral (log coefficient kept separately) and values at the reference points
``REFERENCE_TAUS``, each with the digits and the engine version.

>>> from ledger.book import Project
>>> project = Project.new("demo")
>>> payload = {"genus": 0, "order": 3, "background": "flat-iib", "reduced": False,
...            "coefficients": [{"p": 1, "q": 0, "operator": "D^4R^4", "structure": "sigma2",
...                              "expr": "zeta(5)"}]}
>>> merge_expansion(project, payload, derive=False)["added"]
['e0001']
>>> merge_expansion(project, payload, derive=False)["unchanged"]
['e0001']
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ledger import ENGINE_VERSION
from ledger.book.model import Background, Provenance
from ledger.book.sector_records import RECORD_KEY, plan_sector_records, store_sector_records
from ledger.errors import ConventionError, NotAvailableError
from ledger.mgf.jobs import ensure_job

REFERENCE_TAUS = ("i", "0.5+0.9i", "0.13+1.72i")
VALUE_DIGITS = 30
INTEGRAL_DIGITS = 15
# The conventions that change the coefficients themselves (the others only change
# how derived data are written, and the engine writes them in its own conventions).
COEFFICIENT_CONVENTIONS = ("mandelstam", "graph_normalisation", "green_function", "amplitude_factor",
                           "laurent_variable", "measure")


def check_engine_conventions(project) -> None:
    """Refuse to add engine results to a project that declares other conventions."""
    from ledger.book.conventions import default_conventions

    engine = default_conventions()
    differing = [k for k in COEFFICIENT_CONVENTIONS if project.conventions.get(k) != engine[k]]
    if differing:
        raise ConventionError(
            "the project declares " + ", ".join(f"{k}={project.conventions[k]}" for k in differing)
            + "; computed entries are in the engine's conventions, so none were added "
              "(compare such projects with 'diff' instead)")


def same_coefficient(a: str, b: str) -> bool:
    """Equal as expressions once the published identities are applied."""
    from ledger.amplitudes.identities import apply_identities
    from ledger.expr import parse

    return apply_identities(parse(a) - parse(b)) == 0


def compute_derived(coefficient: str, job=None, taus=REFERENCE_TAUS) -> dict:
    """Laurent polynomial, renormalised integral and reference values of a coefficient.

    They are computed for the coefficient after the published identities (the same
    function, written in atoms whose Laplace equations and closed forms are known).
    """
    from ledger.amplitudes.identities import apply_identities
    from ledger.commands import eval_cmd, integrate_cmd, laurent_cmd
    from ledger.expr import parse, to_text

    job = ensure_job(job)
    steps = 2 + len(taus)
    original = parse(coefficient)
    reduced = apply_identities(original)  # same function, cheaper atoms
    coefficient = to_text(reduced)
    derived, missing = {}, []
    if reduced != original:
        derived["computed_from"] = coefficient  # says which form the numbers below come from
    try:
        laurent = laurent_cmd.compute(coefficient, VALUE_DIGITS, job.part(0, 1 / steps))
        derived["laurent"] = {"variable": "y", "terms": laurent["terms"], "exact": laurent["exact"],
                              "digits": VALUE_DIGITS, "engine": ENGINE_VERSION}
        integral = integrate_cmd.compute(coefficient, INTEGRAL_DIGITS, "auto",
                                         job.part(1 / steps, 2 / steps))
        derived["integral"] = {
            "value": integral["decimal"], "exact": integral["value"] if integral["exact"] else "",
            "log_coefficient": integral["log_coefficient"],
            "divergent_terms": integral["divergent_terms"], "error": integral["error"],
            "digits": INTEGRAL_DIGITS, "route": integral["route"], "engine": ENGINE_VERSION}
    except NotAvailableError as reason:
        for what in ("laurent", "integral"):
            if what not in derived:
                missing.append({"what": what, "reason": str(reason), "engine": ENGINE_VERSION})
    values = []
    for i, tau in enumerate(taus):
        part = job.part((2 + i) / steps, (3 + i) / steps)
        result = eval_cmd.compute(coefficient, tau, _value_digits(coefficient), part)
        values.append({"tau": result["tau"], "value": result["value"], "error": result["error"],
                       "digits": result["digits"], "engine": ENGINE_VERSION})
    derived["values"] = values
    if missing:
        derived["missing"] = missing
    return derived


def _value_digits(coefficient: str) -> int:
    """Digits of the stored values: 30 for Eisenstein and dihedral coefficients, 12 where a
    cycle of bundles appears, 9 where a graph needs the mixed route (K4 and the like: its
    values stall near 14 digits and cost minutes beyond; the evaluator asks atoms for 3 more).

    >>> _value_digits("E(2)"), _value_digits("graph(0-1, 0-2, 0-2, 1-2, 1-2)")
    (30, 12)
    >>> _value_digits("graph(0-1, 0-2, 0-3, 1-2, 1-3, 2-3) + E(6)")
    9
    """
    from ledger.expr import GraphFunction, parse
    from ledger.mgf.multivertex import cycle_bundles

    graphs = [atom.graph for atom in parse(coefficient).atoms(GraphFunction)]
    if not graphs:
        return VALUE_DIGITS
    return 12 if all(cycle_bundles(graph) is not None for graph in graphs) else 9


@dataclass
class MergePlan:
    """What merging an expansion will do, with every derived record already computed.

    Planning only reads the project (it may run in a worker thread and be
    cancelled); :func:`apply_merge` then changes the project in one quick step,
    so a cancelled computation leaves nothing half-written.
    """

    payload: dict
    actions: list = field(default_factory=list)  # (row, entry id or None, action, derived or None)
    sector_records: list = field(default_factory=list)  # orbifold backgrounds: see sector_records


def plan_merge(project, payload: dict, derive: bool = True, job=None) -> MergePlan:
    """Decide, row by row, to add / verify / mark conflict / leave, and compute derived data."""
    check_engine_conventions(project)
    job = ensure_job(job)
    plan = MergePlan(payload)
    rows = payload["coefficients"]
    for index, row in enumerate(rows):
        part = job.part(index / len(rows), (index + 1) / len(rows))
        part.report(0, f"{row['operator']} {row['structure']}")
        entry = project.find(payload["background"], payload["genus"], row["operator"],
                             (row["p"], row["q"]))
        if entry is None:
            action = "add"
        elif not same_coefficient(entry.coefficient, row["expr"]):
            action = "conflict"
        elif entry.provenance.kind == "reference":
            action = "verify"
        else:
            action = "keep"
        derived = None
        wants = action == "add" or (action in ("verify", "keep") and _needs_derived(entry))
        if derive and payload["genus"] == 1 and wants:
            derived = compute_derived(row["expr"] if entry is None else entry.coefficient, part)
        plan.actions.append((row, None if entry is None else entry.id, action, derived))
    if payload.get(RECORD_KEY):
        plan.sector_records = plan_sector_records(payload, job=job)
    return plan


def apply_merge(project, plan: MergePlan) -> dict:
    """Carry out a plan; returns ids by what happened to them."""
    from ledger.amplitudes.backgrounds import get_background

    payload = plan.payload
    background = get_background(payload["background"])
    if project.background(background.id) is None:
        project.add_background(Background(background.id, background.name, background.theory,
                                          background.dimension, background.compactification,
                                          {"supercharges": background.supercharges}))
    report = {"path": str(project.path or ""), "added": [], "updated": [], "unchanged": [],
              "verified": [], "differing": []}
    if plan.sector_records:
        report["sector_integrands"] = store_sector_records(project.background(background.id),
                                                           plan.sector_records)
        if report["sector_integrands"]:
            project.dirty = True
    for row, entry_id, action, derived in plan.actions:
        entry = project.entry(entry_id) if entry_id else None
        if action == "add":
            entry = project.add_entry(background=background.id, genus=payload["genus"],
                                      operator=row["operator"], structure=row["structure"],
                                      coefficient=row["expr"], notes=_note(payload),
                                      provenance=Provenance("computed", ENGINE_VERSION))
            report["added"].append(entry.id)
        elif action == "conflict":
            if entry.status != "conflict":
                entry.status = "conflict"
                project.record(entry, "conflict", f"the engine computes {row['expr']}")
            report["differing"].append(entry.id)
        elif action == "verify":
            if entry.status != "verified":
                entry.status = "verified"
                project.record(entry, "verified", f"agrees with the engine's {row['expr']}")
            report["verified"].append(entry.id)
        elif derived is None:
            report["unchanged"].append(entry.id)
        else:
            report["updated"].append(entry.id)
        if derived is not None:
            entry.derived = derived
            project.record(entry, "derived", "Laurent polynomial, integral and values by engine "
                                             f"{ENGINE_VERSION}")
    return report


def merge_expansion(project, payload: dict, derive: bool = True, job=None) -> dict:
    """Plan and apply in one go (the command line's path)."""
    return apply_merge(project, plan_merge(project, payload, derive, job))


def _needs_derived(entry) -> bool:
    engines = {item.get("engine") for key in ("laurent", "integral") if isinstance(
        item := entry.derived.get(key), dict)}
    engines |= {v.get("engine") for key in ("values", "missing")
                for v in entry.derived.get(key, []) if isinstance(v, dict)}
    return not entry.derived or engines != {ENGINE_VERSION}


def _note(payload: dict) -> str:
    if payload["genus"] == 0:
        note = ("tree level, T = Gamma(1-s)Gamma(1-t)Gamma(1-u)/(s t u Gamma(1+s)Gamma(1+t)"
                "Gamma(1+u)), pole 3/sigma3 excluded")
        return f"{note}; {payload['note']}" if payload.get("note") else note
    form = "after known identities" if payload.get("reduced") else "raw graph form"
    return f"genus-one integrand B_(p,q), {form}"
