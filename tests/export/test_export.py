"""``alpha-ledger export``: LaTeX that compiles, Markdown, CSV, escaping, safe writing."""

from __future__ import annotations

import csv
import io
import json
import os
import shutil
import subprocess
from pathlib import Path

import pytest

from ledger.book import Background, Project, Provenance
from ledger.cli import main
from ledger.export import escape_latex, export_text, parse_selection
from ledger.expr import parse

PROJECTS = sorted((Path(__file__).resolve().parents[2] / "projects").glob("*.toml"))
PDFLATEX = shutil.which("pdflatex")
needs_latex = pytest.mark.skipif(PDFLATEX is None, reason="no LaTeX engine (pdflatex) on this machine; "
                                 ".ci/run installs texlive-latex-base and texlive-latex-recommended")
NASTY = "Ω & 100% {braces} $x$ ~tilde^ _under #hash \\input{evil} <a|b> café Øre “q” – ζ(3) ☃"


def compile_latex(text: str, directory: Path) -> str:
    """Run pdflatex twice (longtable settles column widths); fail with the log's error lines."""
    source = directory / "table.tex"
    source.write_text(text, encoding="ascii")  # the writer promises pure ASCII
    environment = {**os.environ, "TEXMFVAR": str(directory / "texmf-var")}
    for _ in range(2):
        result = subprocess.run([PDFLATEX, "-interaction=nonstopmode", "-halt-on-error", "table.tex"],
                                cwd=directory, capture_output=True, text=True, timeout=120, env=environment)
        log = (directory / "table.log").read_text(errors="replace")
        assert result.returncode == 0, "\n".join(l for l in log.splitlines() if l.startswith("!"))[:2000]
    assert (directory / "table.pdf").stat().st_size > 1000
    return result.stdout + result.stderr + log


def nasty_project() -> Project:
    project = Project.new(NASTY, {"laurent_variable": "tau2", "mandelstam": "alpha'/2"})
    project.description = "Description with 50% & _ and\nnewlines"
    project.add_background(Background("flat-iib", "Type IIB on R^{10} & friends", "IIB", 10, "none"))
    project.add_entry(background="flat-iib", genus=1, operator="D^4R^4", structure="sigma2",
                      coefficient="1/4*pi^(-2)*E(2)", notes=NASTY, provenance=Provenance("computed", "0.1.0"),
                      derived={"laurent": {"variable": "tau2", "exact": True, "digits": 30, "terms": [
                          {"power": 2, "coefficient": "pi**2/180"},
                          {"power": -1, "coefficient": "zeta(3)/(4*pi)"}]},
                          "integral": {"value": "0", "exact": "0", "error": "0", "digits": 30}})
    project.add_entry(background="flat-iib", genus=1, operator="D^12R^4", structure="sigma3^2",
                      coefficient="C(2,1,1)*E(2) - 1/3*zeta(3)^2 + graph(0-1,1-2,2-3,3-0,0-2,1-3)",
                      provenance=Provenance("reference", arxiv="1502.06698", equation="(4.2)"),
                      derived={"laurent": {"variable": "tau2", "exact": False, "digits": 20, "terms": [
                          {"power": 6, "coefficient": "-1.2345678901234567890e-4"},
                          {"power": 0, "coefficient": "0.5"}]},
                          "integral": {"value": "-3.14159265358979323846e-12", "error": "1e-30",
                                       "digits": 20, "log_coefficient": "1/3"}})
    project.add_entry(background="flat-iib", genus=0, operator="R^4", structure="1",
                      coefficient="2*zeta(3)", status="verified")
    return project


@needs_latex
@pytest.mark.parametrize("path", PROJECTS, ids=lambda p: p.name)
def test_example_projects_export_to_latex_that_compiles(path, tmp_path):
    text = export_text(Project.load(path), "latex")
    output = compile_latex(text, tmp_path)
    # only the fonts of a basic installation: no bitmap font generated on the fly
    assert "mktexpk" not in output


@needs_latex
def test_special_characters_are_escaped_and_compile(tmp_path):
    text = export_text(nasty_project(), "latex")
    assert "\\input{evil}" not in text and "$\\backslash$input\\{evil\\}" in text
    assert "100\\% \\{braces\\} $\\$$x$\\$$" in text
    assert text.isascii()
    assert "mktexpk" not in compile_latex(text, tmp_path)


def test_computed_and_cited_entries_are_told_apart_in_words():
    text = export_text(nasty_project(), "latex")
    assert "computed (engine 0.1.0), unverified" in text
    assert "cited arXiv:1502.06698 eq. (4.2), unverified" in text
    markdown = export_text(nasty_project(), "markdown")
    assert "computed (engine 0.1.0)" in markdown and "cited arXiv:1502.06698" in markdown


def test_laurent_polynomials_and_integrals_are_shown_in_the_projects_variable():
    text = export_text(nasty_project(), "latex")
    assert r"\frac{\pi^{2}}{180}\,\tau_2^{2}" in text
    assert r"\log L$: $\frac{1}{3}$" in text
    assert r"-0.000123456789012\ldots\,\tau_2^{6}" in text  # 12 significant digits at most


def test_csv_round_trips_the_coefficients():
    project = nasty_project()
    rows = list(csv.DictReader(io.StringIO(export_text(project, "csv"))))
    assert [r["id"] for r in rows] == ["e0003", "e0001", "e0002"]  # genus, then weight
    for row in rows:
        assert parse(row["coefficient"]) == parse(project.entry(row["id"]).coefficient)
    assert rows[1]["laurent"] == "1/180*pi^2*tau2^2 + 1/4*pi^(-1)*zeta(3)*tau2^(-1)"
    assert rows[2]["source_kind"] == "cited" and rows[0]["status"] == "verified"
    assert "\n" not in rows[1]["notes"]


def test_markdown_cells_escape_table_syntax():
    markdown = export_text(nasty_project(), "markdown")
    table = [line for line in markdown.splitlines() if line.startswith("| flat-iib")]
    assert len(table) == 3
    assert all(line.count(" | ") == 7 for line in table)  # the '|' in the notes does not split cells
    assert "\\<a\\|b\\>" in markdown


def test_selection():
    project = nasty_project()
    only_cited = export_text(project, "csv", parse_selection(["source=cited"]))
    assert [r["id"] for r in csv.DictReader(io.StringIO(only_cited))] == ["e0002"]
    both = export_text(project, "csv", parse_selection(["genus=1", "operator=D^4R^4,D^12R^4"]))
    assert len(list(csv.DictReader(io.StringIO(both)))) == 2
    structure = export_text(project, "csv", parse_selection(["structure=sigma3^2"]))
    assert len(list(csv.DictReader(io.StringIO(structure)))) == 1


# --- the command: files, refusal to overwrite, nothing written on bad input --------------------

@pytest.fixture
def project_file(tmp_path) -> Path:
    path = tmp_path / "nasty.toml"
    nasty_project().save(path)
    return path


def test_writes_a_file_and_refuses_to_overwrite_it(project_file, tmp_path, capsys):
    target = tmp_path / "table.tex"
    assert main(["export", str(project_file), "--latex", "-o", str(target)]) == 0
    first = target.read_bytes()
    assert first.startswith(b"\\documentclass")
    target.write_text("mine")
    assert main(["export", str(project_file), "--latex", "-o", str(target)]) == 2
    assert "already exists" in capsys.readouterr().err and target.read_text() == "mine"
    assert main(["export", str(project_file), "--latex", "-o", str(target), "--force"]) == 0
    assert target.read_bytes() == first
    assert not list(tmp_path.glob("*.tmp")) and not list(tmp_path.glob(".table.tex.*"))


def test_stdout_and_json(project_file, capsys):
    assert main(["export", str(project_file), "--markdown"]) == 0
    assert capsys.readouterr().out.startswith("# Ω")
    assert main(["export", str(project_file), "--csv", "--json"]) == 0
    payload = json.loads(capsys.readouterr().out)
    assert payload["format"] == "csv" and payload["text"].startswith("id,background")


@pytest.mark.parametrize("extra, message", [
    (["--select", "colour=red"], "unknown key 'colour'"),
    (["--select", "genus"], "expects KEY=VALUE"),
    (["--select", "operator=D^2R^4"], "D^2R^4"),
    (["--select", "genus=7"], "no entry matches"),
    (["--select", "source=paper"], "'computed' or 'cited'"),
    (["--latex", "--csv"], "not allowed with argument"),
    ([], "one of the arguments --latex --markdown --csv is required"),
])
def test_bad_input_writes_nothing(project_file, tmp_path, capsys, extra, message):
    target = tmp_path / "out.tex"
    fmt = [] if any(a.startswith("--latex") for a in extra) or not extra else ["--latex"]
    assert main(["export", str(project_file), *fmt, *extra, "-o", str(target)]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1
    assert not target.exists()


def test_never_overwrites_the_project_itself(project_file, capsys):
    before = project_file.read_bytes()
    assert main(["export", str(project_file), "--csv", "-o", str(project_file), "--force"]) == 2
    assert "project file itself" in capsys.readouterr().err
    assert project_file.read_bytes() == before


def test_escape_latex_covers_every_special_character():
    for char, escaped in {"&": "\\&", "%": "\\%", "$": "$\\$$", "#": "\\#", "_": "\\_", "{": "\\{",
                          "}": "\\}", "~": "\\~{}", "^": "\\^{}", "\\": "$\\backslash$"}.items():
        assert escape_latex(char) == escaped
    assert escape_latex("☃") == "?"


@pytest.mark.parametrize("derived, message", [
    ({"laurent": {"terms": [{"power": "two", "coefficient": "1"}]}}, "integer"),
    ({"laurent": {"variable": "q", "terms": []}}, "unknown variable"),
    ({"integral": {"value": "lots", "digits": 20}}, "not a decimal number"),
    ({"integral": {"exact": "E(2)"}}, "must be a constant"),
    ({"laurent": {"digits": "many", "terms": []}}, "'digits' must be a positive integer"),
])
def test_bad_derived_data_is_bad_input_naming_the_entry(tmp_path, capsys, derived, message):
    project = nasty_project()
    project.entries[0].derived = derived
    path = tmp_path / "bad.toml"
    project.save(path)
    target = tmp_path / "out.csv"
    assert main(["export", str(path), "--csv", "-o", str(target)]) == 2
    err = capsys.readouterr().err
    assert "entry e0001" in err and message in err and err.count("\n") == 1
    assert not target.exists()
