"""The conventions registry and the ``conventions`` subcommand."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest
import sympy

from ledger.book import CONVENTION_KEYS, Project, default_conventions, known_keys, validate_conventions
from ledger.book.conventions import (
    amplitude_scale, canonical_value, laurent_variable_scale, mandelstam_scale, measure_scale,
)
from ledger.cli import main
from ledger.errors import ConventionError

PROJECTS = Path(__file__).resolve().parents[2] / "projects"
pi = sympy.pi


def test_defaults_are_the_engines_conventions():
    # DESIGN.md sections 3 and 5: s = -alpha'(k1+k2)^2/4, (tau2/pi)^s, y = pi tau2, d^2tau/tau2^2
    assert default_conventions() == {
        "mandelstam": "alpha'/4", "graph_normalisation": "tau2/pi", "laurent_variable": "pi*tau2",
        "measure": "d2tau/tau2^2", "green_function": "sum/pi", "amplitude_factor": "1"}
    assert known_keys() == [key.name for key in CONVENTION_KEYS]


def test_validation_completes_and_canonicalises():
    declared = validate_conventions({"measure": "d2tau/(pi*tau2^2)", "mandelstam": " alpha' = 1/2 "})
    assert list(declared) == known_keys()
    assert declared["mandelstam"] == "alpha'=1/2"
    assert declared["graph_normalisation"] == "tau2/pi"


@pytest.mark.parametrize("declared, message", [
    ({"colour": "blue"}, "unknown convention key 'colour'; known keys: mandelstam, graph_normalisation"),
    ({"mandelstam": "alpha'/3"}, "known values: \"alpha'/4\", \"alpha'/2\", \"alpha'\"; or alpha'=N"),
    ({"mandelstam": "alpha'=0"}, "needs N > 0"),
    ({"mandelstam": "alpha'=-2"}, "unknown value"),
    ({"measure": 2}, "must be a string"),
    ({"amplitude_factor": "0"}, "non-zero constant"),
    ({"amplitude_factor": "E(2)"}, "non-zero constant"),
    ({"amplitude_factor": "2*"}, "is not a constant"),
    ({"laurent_variable": "y"}, "known values: 'pi*tau2', 'tau2'"),
])
def test_unknown_or_inconsistent_conventions_list_the_known_ones(declared, message):
    with pytest.raises(ConventionError) as info:
        validate_conventions(declared)
    assert message in str(info.value)
    assert "\n" not in str(info.value)


def test_scales_are_exact():
    # s = -(k1+k2)^2 with alpha' = N is 4/N times s = -alpha'(k1+k2)^2/4 (derived)
    assert mandelstam_scale("alpha'") == 4 and mandelstam_scale("alpha'=4") == 1
    assert mandelstam_scale("alpha'=2/3") == 6
    assert laurent_variable_scale("tau2") == 1 and laurent_variable_scale("pi*tau2") == pi
    assert measure_scale("3*d2tau/(pi*tau2^2)") == 3 / pi
    assert amplitude_scale("pi^2/6") == pi**2 / 6
    assert canonical_value("amplitude_factor", " 2*pi ") == "2*pi"


def test_every_listed_value_has_an_exact_meaning():
    for key in CONVENTION_KEYS:
        for value in key.values:
            assert canonical_value(key.name, value) == value
            if key.scales:
                assert sympy.sympify(key.scales[value]).is_number


# --- the subcommand --------------------------------------------------------------------------

def _copy_example(tmp_path) -> Path:
    source = sorted(PROJECTS.glob("*.toml"))[0]
    target = tmp_path / "project.toml"
    shutil.copy(source, target)
    return target


def test_list_shows_every_key_and_value(capsys):
    assert main(["conventions", "--list"]) == 0
    text = capsys.readouterr().out
    for key in CONVENTION_KEYS:
        assert text.count(key.name) >= 1
        for value in key.values:
            assert value in text
    assert main(["conventions", "--list", "--json"]) == 0
    payload = json.loads(capsys.readouterr().out)
    assert [k["key"] for k in payload["keys"]] == known_keys()


def test_show_and_change_declaration_only(tmp_path, capsys):
    path = _copy_example(tmp_path)
    before = Project.load(path)
    assert main(["conventions", str(path), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["conventions"] == before.conventions
    assert main(["conventions", str(path), "mandelstam=alpha'/2", "measure=d2tau/(2tau2^2)"]) == 0
    out = capsys.readouterr().out
    assert "NOT rescaled" in out
    after = Project.load(path)
    assert after.conventions["mandelstam"] == "alpha'/2"
    assert [e.to_dict() for e in after.entries] == [e.to_dict() for e in before.entries]


def test_rescale_converts_the_entries(tmp_path, capsys):
    path = _copy_example(tmp_path)
    before = Project.load(path)
    assert main(["conventions", str(path), "mandelstam=alpha'/2", "--rescale", "--json"]) == 0
    payload = json.loads(capsys.readouterr().out)
    assert payload["rescaled"] is True
    after = Project.load(path)
    from ledger.expr import parse

    for old, new in zip(before.entries, after.entries):
        # derived: the weight-w coefficient is multiplied by 2^-w
        assert sympy.expand(parse(new.coefficient) - parse(old.coefficient) / 2**old.weight) == 0
        assert new.history[-1]["event"] == "rescaled"


@pytest.mark.parametrize("argv, message", [
    (["conventions"], "give a PROJECT, or --list"),
    (["conventions", "--list", "x.toml"], "takes no project"),
    (["conventions", "{path}", "colour=blue"], "unknown convention key 'colour'"),
    (["conventions", "{path}", "mandelstam"], "expected KEY=VALUE"),
    (["conventions", "{path}", "--rescale"], "needs KEY=VALUE"),
])
def test_bad_input_is_one_line_and_changes_nothing(tmp_path, capsys, argv, message):
    path = _copy_example(tmp_path)
    before = path.read_bytes()
    assert main([a.replace("{path}", str(path)) for a in argv]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1
    assert path.read_bytes() == before
