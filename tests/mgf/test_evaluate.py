"""Expression evaluation, tau text and the ``eval`` command."""

from __future__ import annotations

import json

import mpmath
import pytest
import sympy

from ledger.errors import ExpressionError, LedgerError
from ledger.expr import parse
from ledger.expr.tau import normalise_tau_text, parse_tau
from ledger.mgf import dihedral, evaluate as evaluate_module
from ledger.mgf.eisenstein import eisenstein_value
from ledger.mgf.evaluate import evaluate, value_text


def _ctx(dps=60):
    ctx = mpmath.MPContext()
    ctx.dps = dps
    return ctx


# -- tau text ------------------------------------------------------------------------

@pytest.mark.parametrize("text, real, imag", [
    ("0.27+1.31i", "0.27", "1.31"), ("i", "0", "1"), ("-0.4+0.95j", "-0.4", "0.95"),
    ("2i", "0", "2"), ("1.3i", "0", "1.3"), (" 0.5 + 0.1e1 i ", "0.5", "1"),
    ("+i", "0", "1"), ("1e-1+2E0i", "0.1", "2"),
])
def test_parse_tau(text, real, imag):
    ctx = _ctx(200)
    tau = parse_tau(text)
    # exact to far beyond the engine's digits: 0.27 means 27/100
    assert abs(ctx.convert(tau) - ctx.mpc(ctx.mpf(real), ctx.mpf(imag))) < ctx.mpf(10) ** -195


@pytest.mark.parametrize("text", ["-i", "0.5", "3-2i", "", "abc", "1+2", "i+1", "1..2i", "2ii"])
def test_parse_tau_rejects(text):
    with pytest.raises(LedgerError):
        parse_tau(text)


def test_normalised_tau_text():
    assert normalise_tau_text(" -0.4 + 0.95 J") == "-0.4+0.95i"


# -- evaluation ----------------------------------------------------------------------

def test_arithmetic_with_constants_and_eisenstein_series():
    ctx = _ctx()
    tau = parse_tau("0.27+1.31i")
    e2 = ctx.convert(eisenstein_value(2, tau, 40).value)
    e4 = ctx.convert(eisenstein_value(4, tau, 40).value)
    value = evaluate(parse("3/7*E(2)^2 - 2*pi*E(4) + zeta(3)^2 - 5"), tau, 30)
    expected = ctx.mpf(3) / 7 * e2 ** 2 - 2 * ctx.pi * e4 + ctx.zeta(3) ** 2 - 5
    assert abs(ctx.convert(value.value) - expected) <= value.error <= ctx.mpf(10) ** -30 * abs(expected)


def test_identity_residual_is_zero_within_error():
    # D'Hoker, Green, Vanhove, arXiv:1502.06698: C_{2,2,1} = 2/5 E_5 + zeta(5)/30
    value = evaluate(parse("C(2,2,1) - 2/5*E(5) - zeta(5)/30"), "-0.3+1.05i", 25)
    assert abs(value.value) <= value.error < 1e-25


def test_graph_atoms_use_the_reduced_tau_and_theta_atoms_the_given_one():
    ctx = _ctx()
    tau = ctx.mpc("0.3", "0.5")  # outside the fundamental domain
    value = evaluate(parse("E(3) + eta()"), tau, 25)
    eta = ctx.expjpi(tau / 12) * ctx.qp(ctx.expjpi(2 * tau))  # Dedekind eta at tau itself
    e3 = ctx.convert(eisenstein_value(3, tau, 40).value)
    assert abs(ctx.convert(value.value) - (e3 + eta)) <= value.error


def test_each_distinct_atom_is_evaluated_once(monkeypatch):
    calls = []
    original = dihedral.dihedral_values

    def counting(graphs, tau, digits=30, job=None):
        calls.append(list(graphs))
        return original(graphs, tau, digits, job)

    monkeypatch.setattr(dihedral, "dihedral_values", counting)
    evaluate(parse("C(1,1,1)^2 + 3*C(1,1,1) - C(1,1,1)*E(3) + C(2,1,1)"), 1j, 12)
    assert calls == [[(1, 1, 1), (2, 1, 1)]]  # once, and all dihedral atoms in one pass


def test_cancellation_is_recomputed_with_more_digits():
    # C(1,1,1) - E(3) - zeta(3) + 10^-12: ten digits cancel; the answer still has 15
    ctx = _ctx()
    value = evaluate(parse("C(1,1,1) - E(3) - zeta(3) + 1/1000000000000"), 1j, 15)
    assert value.correct_digits() >= 15
    assert abs(ctx.convert(value.value) - ctx.mpf(10) ** -12) <= value.error


def test_value_text():
    ctx = _ctx()
    assert value_text(evaluate(parse("zeta(3)"), 1j, 12), 12) == "1.20205690316"
    text = value_text(evaluate(parse("theta(1,1/3,1/4)"), "0.1+1.1i", 10), 10)
    assert text.endswith("i") and "+" in text
    del ctx


def test_unsupported_input():
    with pytest.raises(LedgerError, match="digits"):
        evaluate(parse("E(2)"), 1j, 0)
    with pytest.raises(LedgerError, match="upper half plane"):
        evaluate(parse("E(2)"), mpmath.mpc(0.1, -1), 10)
    with pytest.raises(ExpressionError):
        evaluate(sympy.Symbol("x") + 1, 1j, 10)


# -- the eval command -----------------------------------------------------------------

def test_eval_command_json(capsys):
    from ledger.cli import main

    assert main(["eval", "C(1,1,1) - E(3)", "--tau", "-0.4+0.95j", "--digits", "20", "--json"]) == 0
    payload = json.loads(capsys.readouterr().out)
    assert set(payload) == {"expr", "tau", "value", "error", "digits", "seconds"}
    assert payload["tau"] == "-0.4+0.95i" and payload["digits"] == 20
    assert payload["expr"] == "C(1,1,1) - E(3)"
    ctx = _ctx()
    # Zagier: C(1,1,1) - E(3) = zeta(3)
    assert abs(ctx.mpf(payload["value"]) - ctx.zeta(3)) < ctx.mpf(10) ** -19
    assert float(payload["error"]) < 1e-20


def test_eval_command_plain_and_bad_input(capsys):
    from ledger.cli import main

    assert main(["eval", "2*zeta(3)", "--tau", "i"]) == 0
    out = capsys.readouterr().out
    assert "2.40411380631918857079947632302" in out
    for arguments in (["eval", "E(2)", "--tau", "0.5"], ["eval", "E(1)", "--tau", "i"],
                      ["eval", "C(1,1", "--tau", "i"], ["eval", "E(2)", "--tau", "i", "--digits", "0"]):
        assert main(arguments) == 2
        captured = capsys.readouterr()
        assert captured.out == "" and captured.err.startswith("alpha-ledger: error:")
        assert captured.err.count("\n") == 1


def test_evaluate_module_exports():
    assert callable(evaluate_module.evaluate)
