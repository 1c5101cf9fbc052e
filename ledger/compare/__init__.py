"""Diff of two projects after convention alignment.

Public API::

    diff_projects(first, second) -> ProjectDiff   (entries: EntryDiff with status, factor, causes)
    format_text(diff, first_name, second_name) -> str;  to_json(diff, ...) -> dict
"""

from ledger.compare.diff import STATUSES, EntryDiff, ProjectDiff, Relabel, diff_projects
from ledger.compare.report import format_text, to_json

__all__ = ["STATUSES", "EntryDiff", "ProjectDiff", "Relabel", "diff_projects", "format_text", "to_json"]
