"""The application: one project, a stack of screens, workers for slow work.

``create_app(path)`` builds it (the tests drive it with Pilot);
``run_app(path)`` runs it for the command line and returns the exit code.
The app owns the project and the safety rules: unsaved changes are marked in
the header and asked about on quit; saving is atomic and never overwrites a
file changed on disk without asking; a file that cannot be read opens an
error dialog and is left untouched.
"""

from __future__ import annotations

from pathlib import Path

from textual.app import App

from ledger.book import Background, Project
from ledger.errors import LedgerError, ProjectChangedError
from ledger.tui.keys import bindings
from ledger.tui.palette import LedgerCommands
from ledger.tui.tasks import TaskCancelled, TaskFailed, TaskFinished, TaskRunner

STYLES = Path(__file__).parent
SCRATCH_TITLE = "Scratch project"


def scratch_project() -> Project:
    """An empty project with the flat type IIB background, not yet tied to a file."""
    project = Project.new(SCRATCH_TITLE)
    try:
        from ledger.amplitudes.backgrounds import get_background

        b = get_background("flat-iib")
        project.add_background(Background(b.id, b.name, b.theory, b.dimension, b.compactification))
    except (ImportError, LedgerError):
        project.add_background(Background("flat-iib", "Type IIB on flat R^10", "IIB", 10, "none"))
    project.dirty = False
    return project


class LedgerApp(App):
    """alpha-ledger's terminal application."""

    TITLE = "alpha-ledger"
    CSS_PATH = sorted(STYLES.glob("*.tcss"))
    COMMANDS = {LedgerCommands}  # only our "area: action" commands
    BINDINGS = bindings("app")
    ENABLE_COMMAND_PALETTE = True

    def __init__(self, path: str | None = None) -> None:
        super().__init__()
        self.requested_path = path
        self.project: Project = scratch_project()
        self.load_error: str | None = None
        self.tasks = TaskRunner(self)

    # ---- start ------------------------------------------------------------
    def on_mount(self) -> None:
        from ledger.tui.screens.overview import OverviewScreen

        if self.requested_path is not None:
            try:
                self.project = Project.load(self.requested_path)
            except LedgerError as error:
                self.load_error = str(error)
        self.update_titles()
        self.push_screen(OverviewScreen())
        if self.load_error is not None:
            if Path(self.requested_path).exists():
                after = "The file was not changed. You are in a scratch project; ctrl+s asks where to save it."
            else:
                after = f"You are in a scratch project; ctrl+s offers to create {self.requested_path}."
            self.show_error(f"Cannot open {self.requested_path}", f"{self.load_error}\n\n{after}")

    # ---- project state ----------------------------------------------------
    def update_titles(self) -> None:
        name = self.project.path.name if self.project.path else "scratch (no file yet)"
        self.title = f"{name} [modified]" if self.project.dirty else name
        self.sub_title = self.project.title

    def project_changed(self) -> None:
        """Redraw everything that shows the project (after any change to it)."""
        self.update_titles()
        for screen in self.screen_stack:
            refresh = getattr(screen, "refresh_from_project", None)
            if refresh is not None and screen.is_mounted:
                refresh()

    def show_error(self, title: str, reason: str) -> None:
        from ledger.tui.dialogs.error import ErrorDialog

        self.push_screen(ErrorDialog(title, reason))

    # ---- task messages (every failure ends here) --------------------------
    def on_task_failed(self, message: TaskFailed) -> None:
        self.show_error(f"{message.task.title}: failed", message.reason)

    def on_task_finished(self, message: TaskFinished) -> None:
        self.notify(f"done in {message.seconds:.1f} s", title=message.task.title)

    def on_task_cancelled(self, message: TaskCancelled) -> None:
        self.notify("cancelled; nothing was stored", title=message.task.title)

    # ---- saving and quitting ------------------------------------------------
    def action_save(self, then=None) -> None:
        if self.project.path is None:
            self.action_save_as(then)
            return
        self._save_to(None, then)

    def action_save_as(self, then=None) -> None:
        from ledger.tui.dialogs.path_prompt import PathDialog

        initial = ""
        if self.requested_path and not Path(self.requested_path).exists():
            initial = self.requested_path
        elif self.project.path:
            initial = str(self.project.path)
        self.push_screen(PathDialog("Save the project as", "File name (.toml):", initial),
                         lambda path: path and self._save_to(path, then))

    def _save_to(self, path: str | None, then=None, force: bool = False) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        try:
            target = self.project.save(path, force=force)
        except ProjectChangedError as error:
            question = f"{error}.\nOverwrite it with this version?"
            self.push_screen(ChoiceDialog("The file on disk is different", question,
                                          [("cancel", "Don't save"), ("overwrite", "Overwrite")]),
                             lambda answer: answer == "overwrite" and self._save_to(path, then, True))
            return
        except LedgerError as error:
            self.show_error("Could not save", str(error))
            return
        self.project_changed()
        self.notify(f"saved {target}", title="Saved")
        if then is not None:
            then()

    def action_quit(self) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        if not self.project.dirty:
            self._leave()
            return

        def answered(answer) -> None:
            if answer == "save":
                self.action_save(then=self._leave)
            elif answer == "discard":
                self._leave()

        self.push_screen(ChoiceDialog("Unsaved changes", "The project has unsaved changes.",
                                      [("save", "Save and quit"), ("discard", "Quit without saving"),
                                       ("cancel", "Cancel")]), answered)

    def _leave(self) -> None:
        self.tasks.cancel_all()
        self.exit(0)

    def on_unmount(self) -> None:
        self.tasks.cancel_all()  # however the app ends, running computations unwind

    def action_reload(self) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        if self.project.path is None:
            self.notify("a scratch project has no file to reload", severity="warning")
            return

        def reload(answer="reload") -> None:
            if answer != "reload":
                return
            try:
                project = Project.load(self.project.path)
            except LedgerError as error:
                self.show_error("Cannot reload", str(error))
                return
            self.project = project
            self.action_overview()
            self.project_changed()

        if self.project.dirty:
            self.push_screen(ChoiceDialog("Unsaved changes", "Reloading drops the unsaved changes.",
                                          [("cancel", "Keep them"), ("reload", "Reload anyway")]), reload)
        else:
            reload()

    # ---- navigation -------------------------------------------------------
    def action_help(self) -> None:
        from ledger.tui.screens.help import HelpScreen

        self.push_screen(HelpScreen())

    def action_overview(self) -> None:
        while len(self.screen_stack) > 2:
            self.pop_screen()

    def open_entry(self, entry_id: str) -> None:
        from ledger.tui.screens.entry import EntryScreen

        if self.project.entry(entry_id) is not None:
            self.push_screen(EntryScreen(entry_id))

    def open_compute(self, expression: str = "", attach_to: str | None = None) -> None:
        from ledger.tui.screens.compute import ComputeScreen

        self.push_screen(ComputeScreen(expression, attach_to))

    def open_plot(self, expression: str = "") -> None:
        from ledger.tui.screens.plot import PlotScreen

        self.push_screen(PlotScreen(expression))

    def action_open_compute(self) -> None:
        self.open_compute()

    def action_open_plot(self) -> None:
        self.open_plot()

    def action_open_diff(self) -> None:
        from ledger.tui.screens.diff import DiffScreen

        self.push_screen(DiffScreen())

    def action_open_export(self) -> None:
        from ledger.tui.screens.export import ExportScreen

        self.push_screen(ExportScreen())

    def action_open_conventions(self) -> None:
        from ledger.tui.screens.conventions import ConventionsScreen

        self.push_screen(ConventionsScreen())

    def action_open_expand(self) -> None:
        from ledger.tui.dialogs.expand import ExpandDialog

        try:
            from ledger.amplitudes.backgrounds import known_backgrounds
        except ImportError:
            known = {}
        else:
            known = known_backgrounds()
        order = [b.id for b in self.project.backgrounds]
        choices = sorted(((b.id, f"{b.id}: {b.name}") for b in known.values()),
                         key=lambda c: order.index(c[0]) if c[0] in order else len(order))
        self.push_screen(ExpandDialog(choices), self._merge_expansion)

    def _merge_expansion(self, plan) -> None:
        from ledger.book.fill import apply_merge

        if not plan:
            return
        try:
            report = apply_merge(self.project, plan)
        except LedgerError as error:
            self.show_error("Expansion not added", str(error))
            return
        self.project_changed()
        message = (f"added {len(report['added'])} entries, derived data for {len(report['updated'])}, "
                   f"{len(report['unchanged'])} already present")
        if report["verified"]:
            message += f"; cited and confirmed: {', '.join(report['verified'])}"
        if report["differing"]:
            message += f"; different coefficient (marked conflict): {', '.join(report['differing'])}"
        if "sector_integrands" in report:
            message += (f"; sector-summed integrands kept with the background: "
                        f"{', '.join(report['sector_integrands']) or 'none changed'}")
        self.notify(message, title="Expansion", timeout=10)

    def delete_entry(self, entry_id: str) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        def answered(answer) -> None:
            if answer == "delete" and self.project.entry(entry_id) is not None:
                self.project.remove_entry(entry_id)
                self.project_changed()
                self.notify(f"deleted {entry_id} (ctrl+s saves; quitting without saving keeps it)")

        self.push_screen(ChoiceDialog("Delete entry", f"Delete entry {entry_id}?",
                                      [("keep", "Keep it"), ("delete", "Delete")]), answered)


def create_app(path: str | None = None) -> LedgerApp:
    """The application on a project file (or a scratch project); used by the CLI and the tests."""
    return LedgerApp(path)


def run_app(path: str | None = None) -> int:
    """Run the application in the terminal; returns the exit code."""
    app = create_app(path)
    app.run()
    return int(app.return_code or 0)
