"""A T^4/Z_N project created, filled and checked from the command line."""

import json
import subprocess
import sys

import mpmath
import pytest
import tomllib


def run(*args):
    return subprocess.run([sys.executable, "-m", "ledger", *args], capture_output=True,
                          text=True, timeout=300)


def _eisenstein_at_i(s: int, dps: int = 40):
    # sum'_{(m,n)} (m^2 + n^2)^-s = 4 zeta(s) beta(s), beta the Dirichlet beta function
    # (handbook: Zucker 1974; Borwein et al., "Lattice sums then and now", 2013, eq. (1.3.17),
    # from memory); E_s(i) = that sum / pi^s in the engine normalisation.
    ctx = mpmath.MPContext()
    ctx.dps = dps
    beta = ctx.dirichlet(s, [0, 1, 0, -1])
    return 4 * ctx.zeta(s) * beta / ctx.pi ** s


@pytest.fixture(scope="module")
def filled(tmp_path_factory):
    path = tmp_path_factory.mktemp("orbifold") / "z3.toml"
    assert run("new", str(path), "--title", "Z3 limit of K3", "--background", "t4z3-iia").returncode == 0
    genus_one = run("expand", "--order", "3", "--background", "t4z3-iia", "--into", str(path))
    tree = run("expand", "--order", "5", "--tree", "--background", "t4z3-iia", "--into", str(path))
    return path, genus_one, tree


def test_tree_level_entries_are_the_ten_dimensional_ones(filled):
    path, _, tree = filled
    assert tree.returncode == 0, tree.stderr
    entries = tomllib.loads(path.read_text())["entries"]
    assert {e["background"] for e in entries} == {"t4z3-iia"} and {e["genus"] for e in entries} == {0}
    by_operator = {e["operator"]: e["coefficient"] for e in entries}
    # Virasoro-Shapiro: 2 zeta(3) R^4, zeta(5) D^4R^4, 2/3 zeta(3)^2 D^6R^4 in sigma_2, sigma_3
    # (e.g. D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; common practice)
    assert by_operator["R^4"] == "2*zeta(3)" and by_operator["D^4R^4"] == "zeta(5)"
    assert by_operator["D^6R^4"] == "2/3*zeta(3)^2"


def test_genus_one_keeps_sector_integrands_with_the_background(filled):
    path, genus_one, _ = filled
    assert genus_one.returncode == 0, genus_one.stderr
    assert "are not derived" in " ".join(genus_one.stdout.split())  # the missing D^{2w}R^4 rows are said, not guessed
    background = tomllib.loads(path.read_text())["backgrounds"][0]
    records = {r["name"]: r for r in background["sector_integrands"]}
    assert sorted(records) == ["I_1", "I_2", "I_3"]
    # I_1: the Green's functions at the 8 non-zero 3-torsion points sum to -2 log 3 (distribution
    # relation of the Siegel functions, Kubert and Lang, "Modular units", 1981, from memory), each
    # sector weighted by its 9 fixed points / N = 3: -6 log 3, constant in tau.
    at_i = {r["name"]: r["values"][0] for r in records.values()}
    assert abs(mpmath.mpf(at_i["I_1"]["value"]) + 6 * mpmath.log(3)) < mpmath.mpf(10) ** -28
    # I_s = 3 (3^(2-2s) - 1) E_s for s >= 2 (sum over all 3-torsion characteristics: Poisson,
    # common practice), checked at tau = i against the lattice sum 4 zeta(s) beta(s)
    for s in (2, 3):
        expected = 3 * (mpmath.mpf(3) ** (2 - 2 * s) - 1) * _eisenstein_at_i(s)
        stored = at_i[f"I_{s}"]
        assert abs(mpmath.mpf(stored["value"]) - expected) <= mpmath.mpf(stored["error"]) + mpmath.mpf(10) ** -28
    assert records["I_1"]["integral"] == "-2*pi*log(3)"  # -6 log 3 times vol(F) = pi/3


def test_check_recomputes_entries_and_sector_integrands(filled):
    path, _, _ = filled
    result = run("check", str(path), "--json")
    assert result.returncode == 0, result.stderr
    report = json.loads(result.stdout)
    assert report["ok"] and report["projects"][0]["values_checked"] == 9


def test_check_catches_a_tampered_sector_value(filled, tmp_path):
    path, _, _ = filled
    text = path.read_text()
    stored = tomllib.loads(text)["backgrounds"][0]["sector_integrands"][1]["values"][0]["value"]
    tampered = tmp_path / "tampered.toml"
    altered = stored[:6] + ("1" if stored[6] != "1" else "2") + stored[7:]  # 6th significant digit
    tampered.write_text(text.replace(stored, altered, 1))
    result = run("check", str(tampered))
    assert result.returncode == 1 and "t4z3-iia:I_2" in result.stdout


def test_check_rejects_a_malformed_sector_record(filled, tmp_path):
    path, _, _ = filled
    broken = tmp_path / "broken.toml"
    broken.write_text(path.read_text().replace('expr = "3*green', 'expr = 3.5 #', 1))
    before = broken.read_bytes()
    result = run("check", str(broken))
    assert result.returncode == 2 and len(result.stderr.strip().splitlines()) == 1
    assert "sector integrand 'I_1'" in result.stderr and broken.read_bytes() == before


def test_refilling_changes_nothing(filled):
    path, _, _ = filled
    before = path.read_bytes()
    again = run("expand", "--order", "3", "--background", "t4z3-iia", "--into", str(path))
    assert again.returncode == 0 and "none changed" in again.stdout
    assert path.read_bytes() == before


def test_show_lists_the_sector_integrands(filled):
    path, _, _ = filled
    result = run("show", str(path))
    assert result.returncode == 0
    # 3 (3^(2-2s) - 1) E_s for s = 2, 3 (see above): -8/3 E_2 and -80/27 E_3
    assert "sector integrand I_2 = -8*E(2)/3" in result.stdout
    assert "sector integrand I_3 = -80*E(3)/27" in result.stdout
