"""A project: title, conventions, backgrounds and entries, loaded and saved safely.

Load with tomllib, validate every field, save with tomli-w atomically
(temporary file, fsync, rename; the previous version is kept as FILE.bak).
A file that changed on disk since it was loaded is not overwritten unless
``force=True``.  Loading then saving a file this tool wrote is byte-identical.

>>> project = Project.new("Demo")
>>> project.add_background(Background("flat-iib", "Type IIB, flat", "IIB", 10, "none"))
>>> entry = project.add_entry(background="flat-iib", genus=1, operator="D^4R^4",
...                           structure="sigma2", coefficient="E(2)")
>>> entry.id, entry.alpha_order
('e0001', 5)
>>> Project.from_text(project.to_text()).entries[0].coefficient
'E(2)'
"""

from __future__ import annotations

import datetime as _dt
import hashlib
import os
import tempfile
import tomllib
from pathlib import Path

import tomli_w

from ledger import ENGINE_VERSION
from ledger.book.conventions import validate_conventions
from ledger.book.model import Background, Entry, Provenance, operator_weight
from ledger.errors import LedgerError, ProjectChangedError, ProjectError

SCHEMA_VERSION = 1
_TOP_KNOWN = ("schema_version", "title", "description", "conventions", "backgrounds", "entries")


def now_stamp() -> str:
    return _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


class Project:
    """The in-memory project; the only way the UI and CLI touch a project file."""

    def __init__(self, title: str, conventions: dict | None = None, description: str = ""):
        self.title = title
        self.description = description
        self.conventions = validate_conventions(conventions or {})
        self.backgrounds: list[Background] = []
        self.entries: list[Entry] = []
        self.extra: dict = {}
        self.path: Path | None = None
        self.dirty = False
        self._loaded_digest: str | None = None

    # ---- construction -------------------------------------------------
    @classmethod
    def new(cls, title: str, conventions: dict | None = None) -> "Project":
        project = cls(title, conventions)
        project.dirty = True
        return project

    @classmethod
    def from_dict(cls, data: dict) -> "Project":
        if not isinstance(data, dict):
            raise ProjectError("a project file must be a TOML table")
        version = data.get("schema_version")
        if version is None:
            raise ProjectError("missing field 'schema_version' (is this an alpha-ledger project?)")
        if not isinstance(version, int) or isinstance(version, bool):
            raise ProjectError(f"field 'schema_version' must be an integer, got {version!r}")
        if version > SCHEMA_VERSION:
            raise ProjectError(f"schema_version {version} was written by a newer alpha-ledger "
                               f"(this one reads up to {SCHEMA_VERSION})")
        if version < 1:
            raise ProjectError(f"field 'schema_version' must be >= 1, got {version}")
        title = data.get("title")
        if not isinstance(title, str):
            raise ProjectError(f"field 'title' must be text, got {title!r}")
        description = data.get("description", "")
        if not isinstance(description, str):
            raise ProjectError("field 'description' must be text")
        conventions = data.get("conventions", {})
        try:
            project = cls(title, conventions, description)
        except LedgerError as error:
            raise ProjectError(f"conventions: {error}") from None
        backgrounds = data.get("backgrounds", [])
        entries = data.get("entries", [])
        if not isinstance(backgrounds, list):
            raise ProjectError("field 'backgrounds' must be an array of tables ([[backgrounds]])")
        if not isinstance(entries, list):
            raise ProjectError("field 'entries' must be an array of tables ([[entries]])")
        for raw in backgrounds:
            background = Background.from_dict(raw)
            if project.background(background.id) is not None:
                raise ProjectError(f"background {background.id!r}: duplicate id")
            project.backgrounds.append(background)
        for raw in entries:
            entry = Entry.from_dict(raw)
            if project.entry(entry.id) is not None:
                raise ProjectError(f"entry {entry.id!r}: duplicate id")
            if project.background(entry.background) is None:
                raise ProjectError(f"entry {entry.id!r}: field 'background' names unknown "
                                   f"background {entry.background!r}")
            project.entries.append(entry)
        project.extra = {k: v for k, v in data.items() if k not in _TOP_KNOWN}
        return project

    @classmethod
    def from_text(cls, text: str) -> "Project":
        try:
            data = tomllib.loads(text)
        except tomllib.TOMLDecodeError as error:
            raise ProjectError(f"not valid TOML: {error}") from None
        return cls.from_dict(data)

    @classmethod
    def load(cls, path) -> "Project":
        path = Path(path)
        raw = _read_bytes(path)
        try:
            text = raw.decode("utf-8")
        except UnicodeDecodeError:
            raise ProjectError(f"{path}: not a UTF-8 text file") from None
        if not text.strip():
            raise ProjectError(f"{path}: the file is empty")
        try:
            project = cls.from_text(text)
        except ProjectError as error:
            raise ProjectError(f"{path}: {error}") from None
        project.path = path
        project._loaded_digest = hashlib.sha256(raw).hexdigest()
        project.dirty = False
        return project

    # ---- serialisation ------------------------------------------------
    def to_dict(self) -> dict:
        data = {"schema_version": SCHEMA_VERSION, "title": self.title}
        if self.description:
            data["description"] = self.description
        data["conventions"] = dict(self.conventions)
        data.update(self.extra)
        data["backgrounds"] = [b.to_dict() for b in self.backgrounds]
        data["entries"] = [e.to_dict() for e in self.entries]
        return data

    def to_text(self) -> str:
        return tomli_w.dumps(self.to_dict())

    def save(self, path=None, force: bool = False) -> Path:
        """Write atomically; refuse if the file changed on disk since it was loaded."""
        target = Path(path) if path is not None else self.path
        if target is None:
            raise ProjectError("this project has no file yet: give a path to save it to")
        text = self.to_text()
        Project.from_text(text)  # never write what we could not read back
        if target.exists() and target.is_dir():
            raise ProjectError(f"{target}: is a directory")
        if not force and target.exists():
            current = hashlib.sha256(_read_bytes(target)).hexdigest()
            same_file = self.path is not None and target.resolve() == self.path.resolve()
            if same_file and current != self._loaded_digest:
                raise ProjectChangedError(
                    f"{target}: changed on disk since it was loaded; not overwritten "
                    "(reload it, or save with force)")
            if not same_file:
                raise ProjectChangedError(f"{target}: already exists; not overwritten (use force)")
        data = text.encode("utf-8")
        atomic_write(target, data, keep_backup=True)
        self.path = target
        self._loaded_digest = hashlib.sha256(data).hexdigest()
        self.dirty = False
        return target

    def changed_on_disk(self) -> bool:
        """True when the file differs from what was loaded or last saved."""
        if self.path is None or self._loaded_digest is None or not self.path.exists():
            return False
        return hashlib.sha256(_read_bytes(self.path)).hexdigest() != self._loaded_digest

    # ---- queries --------------------------------------------------------
    def background(self, ident: str) -> Background | None:
        return next((b for b in self.backgrounds if b.id == ident), None)

    def entry(self, ident: str) -> Entry | None:
        return next((e for e in self.entries if e.id == ident), None)

    def find(self, background: str, genus: int, operator: str, exponents: tuple) -> Entry | None:
        """The entry for one (background, genus, operator, sigma structure), if any."""
        key = (background, genus, operator, tuple(exponents))
        return next((e for e in self.entries if e.key() == key), None)

    # ---- changes --------------------------------------------------------
    def add_background(self, background: Background) -> None:
        if self.background(background.id) is not None:
            raise ProjectError(f"background {background.id!r}: duplicate id")
        self.backgrounds.append(background)
        self.dirty = True

    def next_entry_id(self) -> str:
        used = {e.id for e in self.entries}
        number = len(self.entries) + 1
        while f"e{number:04d}" in used:
            number += 1
        return f"e{number:04d}"

    def add_entry(self, *, background: str, genus: int, operator: str, structure: str,
                  coefficient: str, status: str = "unverified", notes: str = "",
                  provenance: Provenance | None = None, derived: dict | None = None,
                  entry_id: str | None = None) -> Entry:
        """Validate and append a new entry; returns it (with its new stable id)."""
        if self.background(background) is None:
            known = ", ".join(b.id for b in self.backgrounds) or "none"
            raise ProjectError(f"unknown background {background!r} (known: {known})")
        ident = entry_id or self.next_entry_id()
        if self.entry(ident) is not None:
            raise ProjectError(f"entry {ident!r}: duplicate id")
        weight = operator_weight(operator)
        entry = Entry(
            id=ident, background=background, genus=genus, operator=operator,
            structure=structure, alpha_order=3 + weight, coefficient=coefficient,
            status=status, notes=notes,
            provenance=provenance or Provenance("computed", ENGINE_VERSION),
            derived=derived or {},
            history=[{"at": now_stamp(), "event": "created"}],
        )
        entry.validate()
        self.entries.append(entry)
        self.dirty = True
        return entry

    def record(self, entry: Entry, event: str, detail: str = "") -> None:
        """Append to an entry's short history (the last 20 events are kept)."""
        item = {"at": now_stamp(), "event": event}
        if detail:
            item["detail"] = detail
        entry.history = (entry.history + [item])[-20:]
        self.dirty = True

    def remove_entry(self, ident: str) -> Entry:
        entry = self.entry(ident)
        if entry is None:
            raise ProjectError(f"no entry with id {ident!r}")
        self.entries.remove(entry)
        self.dirty = True
        return entry


def _read_bytes(path: Path) -> bytes:
    try:
        return path.read_bytes()
    except FileNotFoundError:
        raise ProjectError(f"{path}: no such file") from None
    except IsADirectoryError:
        raise ProjectError(f"{path}: is a directory, not a project file") from None
    except PermissionError:
        raise ProjectError(f"{path}: permission denied") from None
    except OSError as error:
        raise ProjectError(f"{path}: cannot read ({error.strerror})") from None


def atomic_write(target: Path, data: bytes, keep_backup: bool = True) -> None:
    """Write ``data`` to ``target`` so that a crash leaves either old or new content.

    The bytes go to a temporary file in the same directory, are flushed and
    fsync'ed, and the file is renamed over the target.  With ``keep_backup``
    the previous content is first copied to ``target.bak`` the same way.
    """
    directory = target.parent if str(target.parent) else Path(".")
    if not directory.is_dir():
        raise ProjectError(f"{target}: directory {directory} does not exist")
    if keep_backup and target.exists():
        atomic_write(target.with_name(target.name + ".bak"), _read_bytes(target), keep_backup=False)
    handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=directory)
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, target)
    except BaseException as error:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(error, OSError):
            raise ProjectError(f"{target}: could not save ({error.strerror or error}); "
                               "the previous file is unchanged") from None
        raise
    try:
        directory_fd = os.open(directory, os.O_RDONLY)
        try:
            os.fsync(directory_fd)
        finally:
            os.close(directory_fd)
    except OSError:
        pass
