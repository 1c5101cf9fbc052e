"""Project files: schema, load/validate/save, history, conventions.

Public API::

    Project.load(path) / Project.new(title, conventions) / project.save(path=None, force=False)
    project.add_background(Background(...)); project.add_entry(...) -> Entry
    project.entry(id), project.find(background, genus, operator, (p, q)), project.record(entry, event)
    Entry fields: id, background, genus, operator, structure, alpha_order, coefficient,
                  status, notes, provenance (Provenance), derived (dict), history (list)
"""

from ledger.book.conventions import (
    CONVENTION_KEYS, default_conventions, known_keys, validate_conventions,
)
from ledger.book.model import (
    Background, Entry, Provenance, STATUSES, operator_weight, structure_exponents, structure_label,
)
from ledger.book.project import SCHEMA_VERSION, Project, atomic_write, now_stamp

__all__ = [
    "CONVENTION_KEYS", "default_conventions", "known_keys", "validate_conventions",
    "Background", "Entry", "Provenance", "STATUSES", "operator_weight", "structure_exponents",
    "structure_label", "SCHEMA_VERSION", "Project", "atomic_write", "now_stamp",
]
