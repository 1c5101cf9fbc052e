"""Every key of the application, by screen area, with stable ids.

One table serves the key bar of each screen (``bindings(area)``), the help
screen and the command palette, so a key, its description and its palette
command never disagree.  Palette commands are named "area: action".

>>> [k.key for k in AREAS["app"].keys if k.key][:3]
['ctrl+s', 'ctrl+q', 'f1']
>>> find("compute.run").command
'compute: run'
"""

from __future__ import annotations

from dataclasses import dataclass

from textual.binding import Binding


@dataclass(frozen=True)
class Key:
    id: str
    key: str  # textual key name(s); "" for a palette-only command
    action: str  # action on the screen (or "app.<action>")
    label: str  # the short text in the key bar
    command: str = ""  # palette name "area: action"; "" keeps it out of the palette
    help: str = ""
    priority: bool = False
    display: str | None = None


@dataclass(frozen=True)
class Area:
    title: str
    keys: tuple[Key, ...]


AREAS: dict[str, Area] = {
    "app": Area("Everywhere", (
        Key("app.save", "ctrl+s", "app.save", "Save", "project: save",
            "Save the project (atomic; asks before overwriting a file changed on disk)", True),
        Key("app.quit", "ctrl+q", "app.quit", "Quit", "project: quit",
            "Quit (asks about unsaved changes)", True),
        Key("app.help", "f1", "app.help", "Help", "help: keys", "List every key", True),
        Key("app.palette", "ctrl+p", "app.command_palette", "Commands", "",
            "Open the command palette", True),
        Key("app.save_as", "", "app.save_as", "Save as", "project: save as",
            "Save the project under a new file name"),
        Key("app.reload", "", "app.reload", "Reload", "project: reload from disk",
            "Reload the project file (asks about unsaved changes)"),
        Key("app.overview", "", "app.overview", "Overview", "overview: show entries",
            "Return to the overview of entries"),
        Key("app.compute", "", "app.open_compute", "Compute", "compute: new calculation",
            "Type an expression and compute its value, Laurent polynomial or integral"),
        Key("app.plot", "", "app.open_plot", "Plot", "plot: coefficient on a vertical line",
            "Plot a coefficient against its Laurent polynomial"),
        Key("app.expand", "", "app.open_expand", "Expand", "expand: alpha' expansion into project",
            "Expand the amplitude to a given weight and add the coefficients as entries"),
        Key("app.diff", "", "app.open_diff", "Diff", "diff: compare with another project",
            "Open a second project and compare it entry by entry"),
        Key("app.export", "", "app.open_export", "Export", "export: LaTeX, Markdown or CSV table",
            "Choose entries and write a table"),
        Key("app.conventions", "", "app.open_conventions", "Conventions",
            "conventions: view and edit", "View and edit the declared conventions"),
    )),
    "overview": Area("Overview", (
        Key("overview.open", "enter", "open_entry", "Open", "overview: open entry",
            "Open the selected entry"),
        Key("overview.filter", "slash", "focus_filter", "Filter", "overview: filter entries",
            "Type to keep entries containing the text (esc returns to the table)", display="/"),
        Key("overview.sort", "s", "cycle_sort", "Sort", "overview: sort by next column",
            "Sort by the next column (or click a column header)"),
        Key("overview.tree", "b", "toggle_tree", "Backgrounds", "overview: show or hide backgrounds",
            "Show or hide the tree of backgrounds and orders"),
        Key("overview.compute", "c", "app.open_compute", "Compute", "",
            "New calculation"),
        Key("overview.plot", "p", "plot_entry", "Plot", "overview: plot selected coefficient",
            "Plot the selected coefficient against its Laurent polynomial"),
        Key("overview.expand", "x", "app.open_expand", "Expand", "",
            "Expand the amplitude into the project"),
        Key("overview.diff", "d", "app.open_diff", "Diff", "", "Compare with another project"),
        Key("overview.export", "e", "app.open_export", "Export", "", "Write a table"),
        Key("overview.conventions", "v", "app.open_conventions", "Conventions", "",
            "View and edit conventions"),
        Key("overview.delete", "delete", "delete_entry", "Delete", "overview: delete entry",
            "Delete the selected entry (asks first)", display="del"),
    )),
    "entry": Area("Entry", (
        Key("entry.back", "escape", "back", "Back", "", "Back to the overview"),
        Key("entry.notes", "n", "edit_notes", "Notes", "entry: edit notes", "Edit the notes"),
        Key("entry.status", "t", "choose_status", "Status", "entry: change status",
            "Mark the entry verified, unverified or conflict"),
        Key("entry.values", "v", "compute_values", "Values", "entry: recompute values",
            "Recompute the values at the reference points (or at the default tau)"),
        Key("entry.laurent", "l", "compute_laurent", "Laurent", "entry: compute Laurent polynomial",
            "Compute the Laurent polynomial and store it in the entry"),
        Key("entry.integral", "i", "compute_integral", "Integral", "entry: compute integral",
            "Compute the renormalised integral over F and store it"),
        Key("entry.compute", "c", "compute_here", "Compute", "entry: compute at another tau",
            "Open the calculator on this coefficient; results can be attached here"),
        Key("entry.plot", "p", "plot", "Plot", "entry: plot coefficient",
            "Plot the coefficient against its Laurent polynomial"),
        Key("entry.cancel", "ctrl+g", "cancel", "Cancel", "entry: cancel computation",
            "Cancel the running computation (nothing is stored)"),
    )),
    "compute": Area("Compute", (
        Key("compute.run", "ctrl+r", "run", "Run", "compute: run", "Run the checked computations"),
        Key("compute.cancel", "ctrl+g", "cancel", "Cancel", "compute: cancel",
            "Cancel the running computation"),
        Key("compute.record", "ctrl+n", "record", "Record new", "compute: record as new entry",
            "Record the expression and its results as a new entry"),
        Key("compute.attach", "ctrl+t", "attach", "Attach", "compute: attach to an entry",
            "Store the results in an existing entry"),
        Key("compute.plot", "ctrl+l", "plot", "Plot", "compute: plot this expression",
            "Plot the expression against its Laurent polynomial"),
        Key("compute.back", "escape", "back", "Back", "", "Back (cancels a running computation)"),
    )),
    "plot": Area("Plot", (
        Key("plot.draw", "ctrl+r", "draw", "Draw", "plot: draw", "Evaluate along the line and draw"),
        Key("plot.view", "ctrl+t", "toggle_view", "Curves/difference", "plot: toggle difference view",
            "Switch between the two curves and log10 of their difference"),
        Key("plot.cancel", "ctrl+g", "cancel", "Cancel", "plot: cancel", "Cancel the evaluation"),
        Key("plot.back", "escape", "back", "Back", "", "Back"),
    )),
    "diff": Area("Diff", (
        Key("diff.open", "o", "open_other", "Open B", "diff: open second project",
            "Choose the project to compare with"),
        Key("diff.show", "f", "cycle_filter", "Show", "diff: show all or only differences",
            "Show all rows, only differences, or only rows missing on one side"),
        Key("diff.back", "escape", "back", "Back", "", "Back"),
    )),
    "export": Area("Export", (
        Key("export.write", "ctrl+o", "write", "Write", "export: write file",
            "Write the table to the output file"),
        Key("export.all", "ctrl+t", "toggle_all", "All/none", "export: select all or none",
            "Select all entries, or none"),
        Key("export.back", "escape", "back", "Back", "", "Back"),
    )),
    "conventions": Area("Conventions", (
        Key("conventions.edit", "enter", "edit", "Edit", "conventions: edit selected",
            "Change the selected convention"),
        Key("conventions.back", "escape", "back", "Back", "", "Back"),
    )),
    "help": Area("Help", (
        Key("help.close", "escape", "back", "Close", "", "Close the help"),
    )),
    "dialog": Area("Dialogs", (
        Key("dialog.ok", "ctrl+o", "ok", "OK", "", "Accept the dialog (enter in a field too)"),
        Key("dialog.cancel", "escape", "cancel", "Cancel", "", "Close the dialog without changes"),
    )),
}


def bindings(area: str) -> list[Binding]:
    """The textual bindings of one area (palette-only commands have no key)."""
    return [Binding(k.key, k.action, k.label, id=k.id, priority=k.priority, key_display=k.display,
                    tooltip=k.help)
            for k in AREAS[area].keys if k.key]


def find(ident: str) -> Key:
    for area in AREAS.values():
        for key in area.keys:
            if key.id == ident:
                return key
    raise KeyError(ident)
