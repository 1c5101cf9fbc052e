"""The identity finder: published identities found, absent ones reported as such.

References: C(2,2,1) = 2/5 E(5) + zeta(5)/30 (D'Hoker, Green, Vanhove 2015,
arXiv:1502.06698); C(1,1,1,1) = 24 C(2,1,1) - 18 E(4) + 3 E(2)^2 (D'Hoker, Green,
Vanhove 2015; D'Hoker, Kaidi 2016, arXiv:1608.04393; from memory); C(1,1,1) = E(3) + zeta(3) (D. Zagier).
Values come from ledger.mgf.evaluate (position-space evaluator, Fourier series of E_s).
"""

import json
import subprocess
import sys

import pytest
import sympy

from ledger.commands.identify_cmd import split_top_level
from ledger.errors import LedgerError
from ledger.expr import parse
from ledger.mgf.identify import find_identity


def coefficients(result):
    return {str(b): q for b, q in result.coefficients}


@pytest.mark.slow
def test_c1111_from_laurent_polynomials_and_values():
    result = find_identity(parse("C(1,1,1,1)"), [parse("C(2,1,1)"), parse("E(4)"), parse("E(2)^2")], digits=15)
    assert result.found and result.method == "laurent"
    assert coefficients(result) == {"C(2, 1, 1)": 24, "E(4)": -18, "E(2)**2": 3}
    assert result.residual_digits >= 15


def test_c111_with_constant_in_basis():
    result = find_identity(parse("C(1,1,1)"), [parse("E(3)"), parse("zeta(3)"), parse("1")], digits=20)
    assert result.found
    assert coefficients(result) == {"E(3)": 1, "zeta(3)": 1, "1": 0}


def test_no_relation_is_an_answer():
    result = find_identity(parse("C(2,1,1)"), [parse("E(4)"), parse("E(2)^2")], digits=15)
    assert not result.found and result.coefficients == ()


@pytest.mark.slow
def test_values_alone_find_c221():
    result = find_identity(parse("C(2,2,1)"), [parse("E(5)"), parse("zeta(5)")], digits=20, use_laurent=False)
    assert result.found and result.method == "values"
    assert coefficients(result) == {"E(5)": sympy.Rational(2, 5), "zeta(5)": sympy.Rational(1, 30)}


def test_bad_basis():
    with pytest.raises(LedgerError):
        find_identity(parse("E(2)"), [])
    with pytest.raises(LedgerError):
        find_identity(parse("E(2)"), [parse("E(3)"), parse("E(3)")])
    assert split_top_level("C(2,1,1),E(4)") == ["C(2,1,1)", "E(4)"]
    with pytest.raises(LedgerError):
        split_top_level("E(4),,E(2)")


def run_cli(*args):
    return subprocess.run([sys.executable, "-m", "ledger", *args], capture_output=True, text=True, timeout=300)


@pytest.mark.slow
def test_cli_json():
    result = run_cli("identify", "C(2,2,1)", "--basis", "E(5),zeta(5)", "--digits", "15", "--json")
    assert result.returncode == 0, result.stderr
    payload = json.loads(result.stdout)
    assert payload["found"] is True
    assert payload["coefficients"] == [{"basis": "E(5)", "value": "2/5"}, {"basis": "zeta(5)", "value": "1/30"}]
    assert payload["residual_digits"] >= 15
    missing = json.loads(run_cli("identify", "C(2,1,1)", "--basis", "E(4)", "--json").stdout)
    assert missing["found"] is False and missing["coefficients"] == []
