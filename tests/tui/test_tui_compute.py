"""The calculator: live parse errors, a real computation, cancel, failures as dialogs."""

from __future__ import annotations

import importlib.util
import time

import mpmath
import pytest
from tui_helpers import FIXTURES, SIZE, screen_text, settle

from ledger.errors import LedgerError, NotAvailableError
from ledger.tui import engine
from ledger.tui.app import create_app
from ledger.tui.dialogs.error import ErrorDialog
from ledger.tui.screens.compute import ComputeScreen
from ledger.tui.widgets.expression_input import ExpressionInput
from ledger.tui.widgets.progress_panel import ProgressPanel
from ledger.tui.widgets.toggles import TickBox


async def open_compute(pilot, expression: str):
    await pilot.press("c")
    await settle(pilot, lambda: isinstance(pilot.app.screen, ComputeScreen))
    screen = pilot.app.screen
    screen.query_one(ExpressionInput).text = expression
    await pilot.pause()
    return screen


def choose(screen, value=False, laurent=False, integral=False) -> None:
    for name, on in (("value", value), ("laurent", laurent), ("integral", integral)):
        screen.query_one(f"#want-{name}", TickBox).value = on


async def test_parse_error_points_at_the_column():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("c")
        await settle(pilot, lambda: isinstance(app.screen, ComputeScreen))
        await pilot.press(*"C(1,1,1")
        await pilot.pause()
        lines = screen_text(app).splitlines()
        row = next(i for i, line in enumerate(lines) if "C(1,1,1" in line)
        caret = lines[row + 1]
        # the caret sits under column 8, just after the text
        assert caret.index("↑") == lines[row].index("C(1,1,1") + 7
        assert "column 8" in caret
        await pilot.press("right_parenthesis")
        await pilot.pause()
        assert "= C₁,₁,₁" in screen_text(app)


async def test_laurent_polynomial_computed_in_a_worker():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen = await open_compute(pilot, "E(2)")
        choose(screen, laurent=True)
        await pilot.press("ctrl+r")
        await settle(pilot, lambda: screen.results is not None)
        # E_s has the Laurent polynomial 2 zeta(2s) y^s / pi^(2s) + 2 Gamma(s-1/2) zeta(2s-1)
        # / (sqrt(pi) Gamma(s)) y^(1-s) (DESIGN.md section 3; standard, e.g. Green, Russo,
        # Vanhove 2008, arXiv:0801.0322); at s = 2: y^2/45 + zeta(3)/y.
        assert "y²/45 + ζ(3)/y" in screen_text(app)
        terms = {t["power"]: t["coefficient"] for t in screen.results["laurent"]["terms"]}
        assert terms == {2: "1/45", -1: "zeta(3)"}
        assert not screen.query_one(ProgressPanel).display


@pytest.mark.skipif(importlib.util.find_spec("ledger.mgf.evaluate") is None
                    or importlib.util.find_spec("ledger.expr.tau") is None,
                    reason="the evaluator is not in this build yet")
async def test_value_at_tau_i():
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen = await open_compute(pilot, "E(2)")
        choose(screen, value=True)
        screen.query_one("#tau").value = "i"
        screen.query_one("#digits").value = "20"
        await pilot.press("ctrl+r")
        await settle(pilot, lambda: screen.results is not None, timeout=60)
        record = screen.results["values"][0]
        # E_2(i) = (4/pi^2) zeta(2) beta(2) = 2G/3, G Catalan's constant: the lattice sum
        # sum'(m^2+n^2)^-s = 4 zeta(s) beta(s) (from memory; e.g. Zucker 1974); mpmath gives G.
        ctx = mpmath.MPContext()
        ctx.dps = 30
        exact = 2 * ctx.catalan / 3
        assert abs(ctx.mpf(record["value"]) - exact) <= ctx.mpf(record["error"]) + ctx.mpf(10) ** -20
        assert "0.61064" in screen_text(app)


def slow_compute(request, job):
    for step in range(400):
        job.report(step / 400, f"step {step}")
        time.sleep(0.01)
    return {"values": []}


async def test_cancel_leaves_nothing_behind(monkeypatch):
    monkeypatch.setattr(engine, "compute", slow_compute)
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        screen = await open_compute(pilot, "E(3)")
        await pilot.press("ctrl+r")
        panel = screen.query_one(ProgressPanel)
        await settle(pilot, lambda: panel.display and "step" in screen_text(app))
        assert "^g cancels" in screen_text(app)
        await pilot.press("ctrl+g")
        await settle(pilot, lambda: not app.tasks.running("compute") and not panel.display)
        assert screen.results is None
        assert not app.project.dirty
        assert "(^t Attach)" in screen_text(app)  # nothing to attach


async def test_engine_failure_becomes_a_titled_dialog(monkeypatch):
    def failing(request, job):
        raise LedgerError("tau must lie in the upper half plane, got 0.3-1i")

    monkeypatch.setattr(engine, "compute", failing)
    app = create_app(str(FIXTURES / "two-levels.toml"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await open_compute(pilot, "E(2)")
        await pilot.press("ctrl+r")
        await settle(pilot, lambda: isinstance(app.screen, ErrorDialog))
        text = screen_text(app)
        assert "Computing E₂: failed" in text
        assert "upper half plane" in text


def test_missing_engine_module_is_not_available():
    with pytest.raises(NotAvailableError, match="not available yet"):
        engine.require("ledger.mgf.no_such_module", "the frobnicator")
