"""``alpha-ledger diff A B``: exit codes, stable text and JSON, the example projects."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from ledger.book import Project
from ledger.book.transform import convert_project
from ledger.cli import main

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


@pytest.mark.skipif(not OSTRANDER.exists(), reason="the second example project is not in projects/")
def test_the_two_example_projects_are_equal_after_alignment(capsys):
    assert Project.load(HALVORSEN).conventions != Project.load(OSTRANDER).conventions
    assert main(["diff", str(HALVORSEN), str(OSTRANDER)]) == 0
    assert main(["diff", str(OSTRANDER), str(HALVORSEN)]) == 0
