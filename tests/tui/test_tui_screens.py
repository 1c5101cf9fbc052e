"""Every screen at 80x24: entry view, conventions, diff, export, plot, help, palette, expand."""

from __future__ import annotations

import math

from tui_helpers import FIXTURES, ROOT, SIZE, screen_text, settle

from ledger.tui import engine
from ledger.tui.app import create_app
from ledger.tui.dialogs.convention_value import ConventionDialog
from ledger.tui.dialogs.expand import ExpandDialog
from ledger.tui.dialogs.path_prompt import PathDialog
from ledger.tui.keys import AREAS
from ledger.tui.palette import LedgerCommands
from ledger.tui.screens.conventions import ConventionsScreen
from ledger.tui.screens.diff import DiffScreen
from ledger.tui.screens.entry import EntryScreen
from ledger.tui.screens.export import ExportScreen
from ledger.tui.screens.help import HelpScreen, help_table
from ledger.tui.screens.plot import PlotScreen
from ledger.tui.widgets.entries_table import EntriesTable

FIXTURE = str(FIXTURES / "two-levels.toml")


async def open_entry(pilot, ident: str) -> EntryScreen:
    table = pilot.app.screen.query_one(EntriesTable)
    table.move_cursor(row=table.get_row_index(ident))
    await pilot.press("enter")
    await settle(pilot, lambda: isinstance(pilot.app.screen, EntryScreen))
    return pilot.app.screen


async def test_entry_view_shows_every_part():
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await open_entry(pilot, "e0003")
        text = screen_text(app)
        for expected in ("D⁴R⁴", "σ₂", "α'⁵", "genus one", "E₂", "y²/45 + ζ(3)/y",
                         "τ = i", "0.61064 37294", "cited arXiv:0801.0322 eq. (2.11)",
                         "Recomputed below."):
            assert expected in text, expected
        await pilot.press("n")
        await settle(pilot, lambda: app.screen.__class__.__name__ == "NotesDialog")
        notes = app.screen.query_one("#notes")
        notes.text = "Checked against the lattice sum."
        await pilot.press("ctrl+o")
        await settle(pilot, lambda: isinstance(app.screen, EntryScreen))
        assert app.project.entry("e0003").notes == "Checked against the lattice sum."
        assert app.project.entry("e0003").history[-1]["event"] == "notes edited"
        await pilot.press("escape")
        await pilot.pause()
        await open_entry(pilot, "e0002")
        text = screen_text(app)
        assert "exact  π/3" in text and "1.04719 75511" in text  # Vol F = pi/3 in the fixture


async def test_entry_laurent_is_computed_and_stored():
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await open_entry(pilot, "e0004")
        assert "not computed" in screen_text(app)
        await pilot.press("l")
        entry = app.project.entry("e0004")
        await settle(pilot, lambda: "laurent" in entry.derived)
        await pilot.pause()
        # 1/3 C(1,1,1) + 4/3 E(3) = 5/3 E(3) + 1/3 zeta(3) by Zagier's C(1,1,1) = E(3) + zeta(3)
        # (from memory; e.g. D'Hoker, Green, Vanhove 2015, arXiv:1502.06698), so its Laurent
        # polynomial is 5/3 (2 y^3/945 + 3 zeta(5)/(4 y^2)) + zeta(3)/3 by the E_s formula.
        assert "2y³/567 + ζ(3)/3 + 5ζ(5)/(4y²)" in screen_text(app)
        assert entry.history[-1]["event"] == "computed Laurent polynomial"
        assert app.project.dirty


async def test_conventions_view_and_edit():
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("v")
        await settle(pilot, lambda: isinstance(app.screen, ConventionsScreen))
        text = screen_text(app)
        assert "mandelstam" in text and "alpha'/4" in text and "s = -alpha' (k1+k2)^2 / 4" in text
        await pilot.press("enter")
        await settle(pilot, lambda: isinstance(app.screen, ConventionDialog))
        await pilot.press("down", "enter")
        await settle(pilot, lambda: isinstance(app.screen, ConventionsScreen))
        assert app.project.conventions["mandelstam"] == "alpha'/2"
        assert "alpha'/2 *" in screen_text(app) and app.project.dirty


async def test_diff_with_a_second_project(tmp_path):
    other = tmp_path / "other.toml"
    text = (FIXTURES / "two-levels.toml").read_text()
    other.write_text(text.replace('coefficient = "E(2)"', 'coefficient = "2*E(2)"')
                     .replace('coefficient = "2*zeta(3)"', 'coefficient = "2*zeta(3)"\n# same'))
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("d")
        await settle(pilot, lambda: isinstance(app.screen, PathDialog))
        app.screen.query_one("#path").value = str(other)
        await pilot.press("enter")
        await settle(pilot, lambda: isinstance(app.screen, DiffScreen) and app.screen.result)
        screen = app.screen
        verdicts = {row.first.id: row.status for row in screen.result.rows if row.first}
        # the coefficient doubled but the stored values did not: a self-contradicting pair
        assert verdicts["e0003"] == "conflict" and verdicts["e0001"] == "same"
        text = screen_text(app)
        assert "conflict" in text and "same" in text
        await pilot.press("f")  # only differences
        await pilot.pause()
        assert screen.query_one("#diff-table").row_count == 1
        assert "coefficient: different, factor 1/2" in screen_text(app)  # E(2) vs 2 E(2)


async def test_export_preview_and_write(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("e")
        await settle(pilot, lambda: isinstance(app.screen, ExportScreen))
        screen = app.screen
        assert "\\toprule" in screen.text and "\\zeta(3)" in screen.text
        assert "toprule" in screen_text(app)  # the preview shows the table
        await pilot.press("ctrl+t")  # none
        await settle(pilot, lambda: not screen.chosen())
        assert "choose at least one entry" in screen_text(app)
        await pilot.press("ctrl+t")  # all again
        await settle(pilot, lambda: len(screen.chosen()) == 4)
        screen.query_one("#export-path").value = "table.tex"
        await pilot.press("ctrl+o")
        await settle(pilot, lambda: (tmp_path / "table.tex").exists())
    written = (tmp_path / "table.tex").read_text()
    assert written == screen.text and written.count("\\\\\n") >= 4  # four rows


def fake_samples(expression, tau1, low, high, points, job):
    heights = [low + (high - low) * k / (points - 1) for k in range(points)]
    polynomial = [h * h for h in heights]
    values = [p + math.exp(-2 * math.pi * h) for p, h in zip(polynomial, heights)]
    return engine.LineSamples(tau1, tuple(heights), tuple(values), tuple(polynomial),
                              tuple(1e-12 for _ in heights),
                              tuple(math.exp(-2 * math.pi * h) for h in heights))


async def test_plot_draws_both_views(monkeypatch):
    monkeypatch.setattr(engine, "sample_line", fake_samples)
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("p")  # the first row is a tree-level number: nothing to plot
        await pilot.pause()
        assert not isinstance(app.screen, PlotScreen)
        table = app.screen.query_one(EntriesTable)
        table.move_cursor(row=table.get_row_index("e0003"))
        await pilot.press("p")
        await settle(pilot, lambda: isinstance(app.screen, PlotScreen))
        assert app.screen.query_one("ExpressionInput").text == "E(2)"
        await pilot.press("ctrl+r")
        await settle(pilot, lambda: app.screen.samples is not None)
        text = screen_text(app)
        assert "━ coefficient f(τ)" in text and "┈ Laurent polynomial" in text and "τ₂" in text
        assert any(0x2800 < ord(ch) <= 0x28FF for ch in text)
        await pilot.press("ctrl+t")
        await pilot.pause()
        text = screen_text(app)
        assert "log₁₀|f − Laurent|" in text
        # the fake: |f - Laurent| = exp(-2 pi tau2) meets the 12-digit resolution tau2^2 1e-12
        # between tau2 = 3.9 and 4.0; the first grid point past it (0.9 + 5.1 k/29) is k = 18
        assert "beyond τ₂ ≈ 4.07" in " ".join(text.split())  # the caption wraps


async def test_help_lists_every_key_and_palette_has_our_commands():
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("f1")
        await settle(pilot, lambda: isinstance(app.screen, HelpScreen))
        assert "[Everywhere]" in screen_text(app) and "Save the project" in screen_text(app)
        table = help_table(app)
        descriptions = [str(cell) for cell in table.columns[1]._cells]
        for area in AREAS.values():
            for key in area.keys:
                assert (key.help or key.label) in descriptions
        await pilot.press("escape")
        await pilot.pause()
        provider = LedgerCommands(app.screen)
        names = [hit.text async for hit in provider.search("compute")]
        assert "compute: new calculation" in names
        assert all(": " in key.command for area in AREAS.values() for key in area.keys if key.command)


async def test_keys_have_unique_ids_and_bar_shows_them():
    ids = [key.id for area in AREAS.values() for key in area.keys]
    assert len(ids) == len(set(ids))
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        text = screen_text(app)
        for key in AREAS["overview"].keys + AREAS["app"].keys:
            if key.key:
                assert key.label in text, key.label


async def test_expand_dialog_adds_entries():
    app = create_app(FIXTURE)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await pilot.press("x")
        await settle(pilot, lambda: isinstance(app.screen, ExpandDialog))
        app.screen.query_one("#order").value = "3"
        await pilot.press("ctrl+o")
        await settle(pilot, lambda: not isinstance(app.screen, ExpandDialog))
        # flat-iib genus one already has R^4 (e0002) and D^4R^4 (e0003); D^6R^4 is new
        new = app.project.find("flat-iib", 1, "D^6R^4", (0, 1))
        assert new is not None and len(app.project.entries) == 5
        assert app.project.dirty


def test_example_projects_exist():
    assert sorted((ROOT / "projects").glob("*.toml")), "no example projects to open"


async def test_orbifold_sector_integrands_sheet(tmp_path):
    # An orbifold project filled through the same functions as `expand --into`; the tree's
    # "sector integrands" node shows them in place of the entries table.
    from ledger.book import Project
    from ledger.book.fill import merge_expansion
    from ledger.commands.expand_cmd import compute

    path = tmp_path / "z2.toml"
    project = Project.new("Z2 limit")
    project.path = path
    merge_expansion(project, compute(2, False, False, "t4z2-iib"))
    project.save()
    app = create_app(str(path))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        tree = app.screen.query_one("#orders")
        node = next(n for n in (tree.get_node_at_line(i) for i in range(tree.last_line + 1))
                    if n is not None and (n.data or {}).get("sectors"))
        tree.focus()
        tree.move_cursor(node)
        await settle(pilot, lambda: "I_2 = −6 E₂" in screen_text(app))
        text = screen_text(app)
        # -6 E_2 = -2y^2/15 - 6 zeta(3)/y: E_2's Laurent polynomial y^2/45 + zeta(3)/y
        # (common practice), and I_1 = -16 log 2 for the 16 fixed points of T^4/Z_2
        assert "−2y²/15 − 6ζ(3)/y" in text and "I_1 = −16 log(2)" in text
        assert not app.screen.query_one(EntriesTable).display
