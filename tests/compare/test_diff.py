"""Diffs of project pairs built by converting a closed-form project into other conventions.

The expected factors are derived by hand: reading data written with s' = 2s as if s' = s
multiplies a weight-w coefficient by 2^w; a measure declared twice too large halves
integrals; tau2-normalised atoms read as engine atoms are pi^w too large.
"""

from __future__ import annotations

import copy

import pytest
import sympy
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from conftest import engine_conventions_project
from ledger.book.transform import convert_project
from ledger.compare import diff_projects, format_text, to_json

OTHER = {"mandelstam": "alpha'/2", "graph_normalisation": "tau2", "laurent_variable": "tau2",
         "measure": "d2tau/(2tau2^2)", "green_function": "2*sum/pi", "amplitude_factor": "1"}


def _declared_only(project):
    """Drop the Laurent records' own variable field, so that the declaration governs them
    (a record that names its variable is read in that variable whatever the project declares)."""
    for entry in project.entries:
        entry.derived.get("laurent", {}).pop("variable", None)
    return project


def _entry(diff, operator, genus=1, background="flat-iib"):
    return next(e for e in diff.entries if e.key[:3] == (background, genus, operator))


def test_same_physics_in_other_conventions_is_equal_after_alignment(engine_project):
    other = convert_project(engine_project, OTHER)
    diff = diff_projects(engine_project, other)
    assert diff.equal, format_text(diff, "A", "B")
    assert {s.key for s in diff.alignment} == {"mandelstam", "graph_normalisation", "laurent_variable",
                                               "measure", "green_function"}
    # and the other way round
    assert diff_projects(other, engine_project).equal


def test_converted_coefficients_are_as_derived_by_hand(engine_project):
    other = convert_project(engine_project, OTHER)
    from ledger.expr import parse

    d4 = other.find("flat-iib", 1, "D^4R^4", (1, 0))
    # E_2 (ours) -> c^-2 pi^-2 E_2' with c = 2 (derived)
    assert parse(d4.coefficient) == parse("E(2)") / (4 * sympy.pi**2)
    # y^2/45 + zeta(3)/y times 1/4, in tau2: pi^2/180 tau2^2 + zeta(3)/(4 pi) tau2^-1 (derived)
    terms = {t["power"]: sympy.sympify(t["coefficient"]) for t in d4.derived["laurent"]["terms"]}
    assert sympy.simplify(terms[2] - sympy.pi**2 / 180) == 0
    assert sympy.simplify(terms[-1] - sympy.zeta(3) / (4 * sympy.pi)) == 0
    r4 = other.find("flat-iib", 1, "R^4", (0, 0))
    # Vol(F) = pi/3 in d2tau/tau2^2 -> pi/6 in half that measure (common practice)
    assert sympy.sympify(r4.derived["integral"]["exact"]) == sympy.pi / 6


@pytest.mark.parametrize("key, declared", [
    ("mandelstam", "alpha'/4"), ("graph_normalisation", "tau2/pi"), ("laurent_variable", "pi*tau2"),
    ("measure", "d2tau/tau2^2"), ("green_function", "sum/pi"), ("amplitude_factor", "3"),
])
def test_a_wrong_declaration_is_found_with_its_cause(engine_project, key, declared):
    other = _declared_only(convert_project(engine_project, OTHER))
    original = other.conventions[key]
    other.conventions[key] = declared  # declaration changed, data left alone
    diff = diff_projects(engine_project, other)
    assert not diff.equal
    assert diff.cause is not None, format_text(diff, "A", "B")
    assert (diff.cause.project, diff.cause.key) == ("second", key)
    if key != "amplitude_factor":
        assert diff.cause.reading == original
    else:
        assert sympy.sympify(diff.cause.reading) == 1


def test_mandelstam_factors_are_powers_of_two_by_weight(engine_project):
    other = convert_project(engine_project, OTHER)
    other.conventions["mandelstam"] = "alpha'/4"
    diff = diff_projects(engine_project, other)
    # derived: first = 2^w x second for the weight-w coefficient
    for operator, weight in (("D^4R^4", 2), ("D^6R^4", 3), ("D^8R^4", 4)):
        entry = _entry(diff, operator)
        assert entry.status == "different"
        assert entry.factor.exact == 2**weight
        assert entry.cause.key == "mandelstam"
    assert _entry(diff, "R^4").status == "same"
    assert _entry(diff, "D^6R^4", genus=0).factor.exact == 8


def test_measure_mislabel_changes_only_integrals(engine_project):
    other = convert_project(engine_project, OTHER)
    other.conventions["measure"] = "d2tau/tau2^2"
    diff = diff_projects(engine_project, other)
    entry = _entry(diff, "R^4")
    integral = next(i for i in entry.comparison.items if i.item == "integral")
    # the second's pi/6 read in d2tau/tau2^2 is aligned as pi/6: first/second = 2 (derived)
    assert integral.status == "different" and integral.factor.exact == 2
    assert all(i.status == "same" for i in entry.comparison.items if i.item != "integral")
    assert entry.status == "different" and entry.cause.key == "measure"
    assert "differs in: integral (factor 2)" in format_text(diff, "A", "B")


def test_a_laurent_record_naming_its_variable_is_read_in_it(engine_project):
    other = convert_project(engine_project, OTHER)
    other.conventions["laurent_variable"] = "pi*tau2"
    assert diff_projects(engine_project, other).equal


def test_laurent_variable_mislabel_is_a_per_term_power_of_pi(engine_project):
    other = _declared_only(convert_project(engine_project, OTHER))
    other.conventions["laurent_variable"] = "pi*tau2"
    diff = diff_projects(engine_project, other)
    entry = _entry(diff, "D^4R^4")
    laurent = next(i for i in entry.comparison.items if i.item == "laurent")
    assert laurent.status == "different" and laurent.factor is None
    # derived: tau2-coefficients pi^2/45, zeta(3)/pi read as y-coefficients; first/second is
    # 1/pi^2 at y^2 and pi at y^-1
    assert "power 2: pi^(-2)" in laurent.detail and "power -1: pi" in laurent.detail
    assert entry.cause.key == "laurent_variable"


def test_graph_normalisation_mislabel_gives_pi_to_the_weight(engine_project):
    other = convert_project(engine_project, OTHER)
    other.conventions["graph_normalisation"] = "tau2/pi"
    diff = diff_projects(engine_project, other)
    coefficient = next(i for i in _entry(diff, "D^4R^4").comparison.items if i.item == "coefficient")
    assert coefficient.factor.exact == sympy.pi**2  # derived: E_2' = pi^2 E_2
    assert _entry(diff, "D^6R^4").comparison.items[0].factor is None  # 5/3 E_3 + zeta(3)/3: mixed
    assert diff.cause.key == "graph_normalisation"


def test_coprime_mislabel_names_two_zeta_factor(engine_project):
    coprime = convert_project(engine_project, {"graph_normalisation": "coprime/2"})
    coprime.conventions["graph_normalisation"] = "tau2"
    diff = diff_projects(engine_project, coprime)
    item = _entry(diff, "D^4R^4").comparison.items[0]
    # derived: E_2 (ours) = 2 zeta(4)/pi^2 E_2^coprime, stored as pi^2/45 E(2); read as
    # tau2-normalised (E' = pi^2 E_2) that is pi^4/45 E_2, so first/second = 1/(2 zeta(4))
    assert sympy.simplify(item.factor.exact - 1 / (2 * sympy.zeta(4))) == 0
    assert diff.cause.key == "graph_normalisation" and diff.cause.reading == "coprime/2"


def test_one_altered_entry_is_reported_with_its_factor(engine_project):
    other = convert_project(engine_project, OTHER)
    entry = other.find("flat-iib", 1, "D^4R^4", (1, 0))
    entry.coefficient = "3/4*pi^(-2)*E(2)"  # three times the right value, nothing else changed
    diff = diff_projects(engine_project, other)
    result = _entry(diff, "D^4R^4")
    # the coefficient differs by 1/3 while laurent, integral and values agree: a conflict
    assert result.status == "conflict"
    assert result.comparison.items[0].factor.exact == sympy.Rational(1, 3)
    assert diff.cause is None
    assert sum(e.status != "same" for e in diff.entries) == 1


def test_a_pure_factor_on_every_item_and_its_mandelstam_cause(engine_project):
    other = convert_project(engine_project, OTHER)
    wrong = convert_project(engine_project, {**OTHER, "mandelstam": "alpha'"})
    other.entries = [wrong.entry(e.id) if e.weight == 2 else e for e in other.entries]
    diff = diff_projects(engine_project, other)
    result = _entry(diff, "D^4R^4")
    # entered with s' = 4s but declared s' = 2s: first = (4/2)^2 x second
    assert result.status == "different" and result.factor.exact == 4
    assert (result.cause.key, result.cause.reading) == ("mandelstam", "alpha'")
    assert diff.cause is None  # other entries are the same, so no project-wide cause


def test_only_in_first_and_second(engine_project):
    other = convert_project(engine_project, OTHER)
    removed = other.entries.pop(0)
    extra = copy.deepcopy(engine_project.entries[0])
    extra.id, extra.operator, extra.structure, extra.alpha_order = "e9999", "D^10R^4", "sigma2 sigma3", 8
    other.entries.append(extra)
    diff = diff_projects(engine_project, other)
    counts = diff.counts()
    assert counts["only-in-first"] == 1 and counts["only-in-second"] == 1
    assert _entry(diff, removed.operator, genus=removed.genus).status == "only-in-first"
    report = to_json(diff, "A", "B")
    assert report["equal"] is False and report["summary"]["only-in-second"] == 1


def test_a_numeric_difference_beyond_the_errors_is_seen(engine_project):
    other = convert_project(engine_project, OTHER)
    entry = other.find("flat-iib", 1, "D^6R^4", (0, 1))
    value = entry.derived["values"][0]["value"]
    entry.derived["values"][0]["value"] = value[:-8] + ("1" if value[-8] != "1" else "2") + value[-7:]
    diff = diff_projects(engine_project, other)
    result = _entry(diff, "D^6R^4")
    assert result.status == "conflict"
    assert [i.status for i in result.comparison.items].count("different") == 1


# --- conventions not seen combined --------------------------------------------------------

VALUE_CHOICES = {
    "mandelstam": ["alpha'/4", "alpha'/2", "alpha'", "alpha'=2", "alpha'=1/2", "alpha'=3"],
    "graph_normalisation": ["tau2/pi", "tau2", "coprime/2"],
    "laurent_variable": ["pi*tau2", "tau2"],
    "measure": ["d2tau/tau2^2", "d2tau/(2tau2^2)", "2*d2tau/tau2^2", "d2tau/(pi*tau2^2)", "3*d2tau/(pi*tau2^2)"],
    "green_function": ["sum/pi", "2*sum/pi", "-sum/pi", "sum"],
    "amplitude_factor": ["1", "1/2", "2*pi", "pi^2/6", "4"],
}
conventions_strategy = st.fixed_dictionaries({k: st.sampled_from(v) for k, v in VALUE_CHOICES.items()})
BASE = engine_conventions_project()


@pytest.mark.slow
@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(conventions_strategy, conventions_strategy, st.sampled_from(sorted(VALUE_CHOICES)), st.data())
def test_random_convention_pairs_align_and_mislabels_are_named(first_conventions, second_conventions,
                                                               key, data):
    first = convert_project(BASE, first_conventions)
    second = _declared_only(convert_project(BASE, second_conventions))
    assert diff_projects(first, second).equal
    wrong = data.draw(st.sampled_from([v for v in VALUE_CHOICES[key]
                                       if sympy.sympify(_scale(key, v)) != sympy.sympify(
                                           _scale(key, second_conventions[key]))]))
    second.conventions[key] = wrong
    diff = diff_projects(first, second)
    assert not diff.equal
    assert diff.cause is not None, format_text(diff, "A", "B")
    assert diff.cause.key == key
    if diff.cause.project == "second" and key != "amplitude_factor":
        assert _scale(key, diff.cause.reading) == _scale(key, second_conventions[key])


def _scale(key, value):
    """A comparable exact identity for a value (alpha'=2 and alpha'/2 are the same scale)."""
    from ledger.book import conventions

    scales = {"mandelstam": conventions.mandelstam_scale, "measure": conventions.measure_scale,
              "green_function": conventions.green_scale, "amplitude_factor": conventions.amplitude_scale,
              "laurent_variable": conventions.laurent_variable_scale}
    return scales[key](value) if key in scales else value
