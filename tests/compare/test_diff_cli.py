"""``alpha-ledger diff A B``: exit codes, stable text and JSON, the example projects."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
import sympy

from ledger.book import Project, operator_weight
from ledger.book.transform import convert_project
from ledger.cli import main
from ledger.expr import parse

PROJECTS = Path(__file__).resolve().parents[2] / "projects"
HALVORSEN = PROJECTS / "iib-flat-halvorsen.toml"
OSTRANDER = PROJECTS / "iib-flat-ostrander.toml"
OTHER = {"mandelstam": "alpha'/2", "graph_normalisation": "tau2", "laurent_variable": "tau2",
         "measure": "3*d2tau/(pi*tau2^2)", "green_function": "-sum/pi", "amplitude_factor": "1/2"}


def _save(project, path: Path) -> str:
    project.save(path)
    return str(path)


def test_equal_after_alignment_exits_0(engine_project, tmp_path, capsys):
    first = _save(engine_project, tmp_path / "a.toml")
    second = _save(convert_project(engine_project, OTHER), tmp_path / "b.toml")
    assert main(["diff", first, second]) == 0
    out = capsys.readouterr().out
    assert "aligned the second to the first's conventions:" in out
    assert "mandelstam: alpha'/2 -> alpha'/4  (coefficient of sigma2^p sigma3^q x 2^(2p+3q))" in out
    assert out.rstrip().splitlines()[-1].endswith("equal after alignment")
    assert all(line.split()[0] == "same" for line in out.splitlines() if line.startswith(("same", "diff")))


def test_different_exits_1_with_factor_and_cause(engine_project, tmp_path, capsys):
    first = _save(engine_project, tmp_path / "a.toml")
    altered = convert_project(engine_project, OTHER)
    altered.conventions["mandelstam"] = "alpha'"  # declared s = 4 s_engine, data in s = 2 s_engine
    second = _save(altered, tmp_path / "b.toml")
    assert main(["diff", first, second]) == 1
    out = capsys.readouterr().out
    # derived: weight 2 read with c = 4 instead of 2 -> second is 2^-2 too large -> first = 1/4 x second
    line = next(l for l in out.splitlines() if l.startswith("different") and "D^4R^4" in l and "genus 1" in l
                and "flat-iib" in l)
    assert "factor 1/4" in line
    assert "cause: mandelstam: the second project's data match if read as mandelstam = alpha'/2 " \
           "(declared alpha')" in out
    assert main(["diff", first, second, "--json"]) == 1
    payload = json.loads(capsys.readouterr().out)
    assert payload["equal"] is False
    assert payload["cause"]["key"] == "mandelstam" and payload["cause"]["reading"] == "alpha'/2"
    d4 = next(e for e in payload["entries"] if e["operator"] == "D^4R^4" and e["genus"] == 1
              and e["background"] == "flat-iib")
    assert d4["status"] == "different" and d4["factor"] == "1/4"
    assert set(payload) == {"first", "second", "equal", "first_conventions", "second_conventions",
                            "alignment", "entries", "cause", "summary"}


@pytest.mark.parametrize("make_second, message", [
    (lambda tmp: str(tmp / "absent.toml"), "no such file"),
    (lambda tmp: (tmp / "bad.toml").write_text("title = [") and str(tmp / "bad.toml"), "not valid TOML"),
])
def test_bad_input_exits_2_with_one_line(engine_project, tmp_path, capsys, make_second, message):
    first = _save(engine_project, tmp_path / "a.toml")
    assert main(["diff", first, make_second(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1


def test_the_two_example_projects_are_equal_after_alignment(capsys):
    assert Project.load(HALVORSEN).conventions != Project.load(OSTRANDER).conventions
    assert main(["diff", str(HALVORSEN), str(OSTRANDER)]) == 0
    assert main(["diff", str(OSTRANDER), str(HALVORSEN)]) == 0


def test_an_altered_copy_of_the_example_diffs_with_factor_and_cause(tmp_path, capsys):
    altered = Project.load(OSTRANDER)
    altered.conventions["mandelstam"] = "alpha'/4"  # the declaration only; the data stay in alpha'/2
    path = _save(altered, tmp_path / "altered.toml")
    assert main(["diff", str(HALVORSEN), path, "--json"]) == 1
    payload = json.loads(capsys.readouterr().out)
    factors = {e["operator"]: e["factor"] for e in payload["entries"]}
    # derived: data with s' = 2s read as s' = s are 2^-w too small: first = 2^w x second
    assert factors["R^4"] is None and factors["D^4R^4"] == "4" and factors["D^6R^4"] == "8"
    for operator, factor in factors.items():
        weight = operator_weight(operator)
        assert factor == (None if weight == 0 else str(2 ** weight)), operator
    assert payload["cause"]["key"] == "mandelstam" and payload["cause"]["reading"] == "alpha'/2"


def test_the_second_example_project_checked_by_hand():
    pi, zeta = sympy.pi, sympy.zeta
    project = Project.load(OSTRANDER)
    assert project.conventions["mandelstam"] == "alpha'/2" and project.conventions["laurent_variable"] == "tau2"
    d4 = project.find("flat-iib", 1, "D^4R^4", (1, 0))
    # Derived: B_(1,0) = E_2 with s = -alpha'(k1+k2)^2/4 (arXiv:0801.0322); with s' = 2s the
    # sigma2' coefficient is E_2/4, and E_2 = pi^-2 E_2' for E_2' = sum' tau2^2/|m tau + n|^4.
    assert parse(d4.coefficient) == parse("E(2)") / (4 * pi**2)
    # Textbook constant term (from memory, common practice): E_s' = 2 zeta(2s) tau2^s
    # + 2 sqrt(pi) Gamma(s-1/2) zeta(2s-1)/Gamma(s) tau2^(1-s): pi^4/45 tau2^2 + pi zeta(3)/tau2.
    terms = {t["power"]: sympy.sympify(t["coefficient"]) for t in d4.derived["laurent"]["terms"]}
    assert terms == {2: sympy.simplify(pi**4 / 45 / (4 * pi**2)), -1: sympy.simplify(pi * zeta(3) / (4 * pi**2))}
    d6 = project.find("flat-iib", 1, "D^6R^4", (0, 1))
    # B_(0,1) = 5/3 E_3 + zeta(3)/3 (D'Hoker, Green, Vanhove 2015, arXiv:1502.06698), so here
    # (5/3 pi^-3 E_3' + zeta(3)/3)/8.
    assert parse(d6.coefficient) == (sympy.Rational(5, 3) * parse("E(3)") / pi**3 + zeta(3) / 3) / 8
    # Its renormalised integral: E_3 integrates to 0 (Zagier 1981, from memory), zeta(3)/3 to
    # zeta(3)/3 * pi/3; times 1/8 (s' = 2s) and 3/pi (unit-volume measure) gives zeta(3)/24.
    assert sympy.sympify(d6.derived["integral"]["exact"]) == zeta(3) / 24
    r4 = project.find("flat-iib", 1, "R^4", (0, 0))
    assert sympy.sympify(r4.derived["integral"]["exact"]) == 1  # Vol(F) in the unit-volume measure


def test_bad_derived_data_is_bad_input_naming_the_entry(engine_project, tmp_path, capsys):
    first = _save(engine_project, tmp_path / "a.toml")
    broken = convert_project(engine_project, OTHER)
    broken.find("flat-iib", 1, "D^4R^4", (1, 0)).derived["values"][0]["value"] = "lots"
    second = _save(broken, tmp_path / "b.toml")
    assert main(["diff", first, second]) == 2
    err = capsys.readouterr().err
    assert "entry e0005" in err and "not a decimal number" in err and err.count("\n") == 1
