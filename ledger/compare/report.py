"""Text and JSON renderings of a project diff.

The text is one line per entry, ``STATUS  KEY  IDS  [factor ...] [cause: ...]``,
indented detail lines below differing entries, and a final ``summary:`` line;
the first word of each entry line is its status, so scripts can grep it.
"""

from __future__ import annotations

from ledger.book.model import structure_label
from ledger.compare.diff import STATUSES, EntryDiff, ProjectDiff


def key_text(key: tuple) -> str:
    """The words for an Entry.key() tuple.

    >>> key_text(("flat-iib", 1, "D^10R^4", (1, 1)))
    'flat-iib genus 1 D^10R^4 sigma2 sigma3'
    """
    background, genus, operator, (p, q) = key
    return f"{background} genus {genus} {operator} {structure_label(p, q)}"


def _ids(entry: EntryDiff) -> str:
    return f"{entry.first_id or '-'} | {entry.second_id or '-'}"


def _headline(entry: EntryDiff) -> str:
    parts = [f"{entry.status:<15}{key_text(entry.key):<42}{_ids(entry)}"]
    if entry.status in ("different", "conflict"):
        factor = entry.factor
        if factor is not None:
            parts.append(f"factor {factor.text()} (first = factor x second)")
        else:
            parts.append("differs in: " + ", ".join(
                f"{item.item} ({'factor ' + item.factor.text() if item.factor else 'not a pure factor'})"
                for item in entry.comparison.differing))
    return "  ".join(parts)


def _details(entry: EntryDiff) -> list[str]:
    lines = []
    if entry.comparison is not None and entry.status != "same":
        for item in entry.comparison.items:
            if item.status == "same":
                lines.append(f"    {item.item}: same")
                continue
            factor = f"factor {item.factor.text()}" if item.factor is not None else "not a pure factor"
            lines.append(f"    {item.item}: different, {factor}")
            lines.append(f"      first:  {item.first}")
            lines.append(f"      second: {item.second}")
            if item.detail:
                lines.append(f"      {item.detail}")
        if entry.cause is not None:
            lines.append(f"    cause: {entry.cause.describe()}")
        elif entry.status in ("different", "conflict"):
            lines.append("    cause: no single convention change explains it")
    return lines


def format_text(diff: ProjectDiff, first_name: str, second_name: str) -> str:
    """The terminal report of a diff."""
    lines = [f"first:  {first_name}", f"second: {second_name}"]
    if diff.alignment:
        lines.append("aligned the second to the first's conventions:")
        for step in diff.alignment:
            lines.append(f"  {step.key}: {step.source} -> {step.target}  ({step.effect})")
    else:
        lines.append("both projects declare the same conventions")
    for entry in diff.entries:
        lines.append(_headline(entry))
        lines.extend(_details(entry))
    if diff.cause is not None:
        lines.append(f"every difference is explained by one convention: {diff.cause.describe()}")
    counts = diff.counts()
    summary = ", ".join(f"{counts[s]} {s}" for s in STATUSES)
    verdict = "equal after alignment" if diff.equal else "different"
    lines.append(f"summary: {summary}: {verdict}")
    return "\n".join(lines)


def to_json(diff: ProjectDiff, first_name: str, second_name: str) -> dict:
    """The JSON object printed by ``diff --json``."""
    entries = []
    for entry in diff.entries:
        background, genus, operator, (p, q) = entry.key
        record = {"status": entry.status, "background": background, "genus": genus,
                  "operator": operator, "structure": structure_label(p, q),
                  "first_id": entry.first_id, "second_id": entry.second_id}
        if entry.comparison is not None:
            record["items"] = [item.to_dict() for item in entry.comparison.items]
            factor = entry.factor
            record["factor"] = factor.text() if factor is not None and entry.status != "same" else None
            record["causes"] = [cause.to_dict() for cause in entry.causes]
        entries.append(record)
    return {
        "first": first_name, "second": second_name, "equal": diff.equal,
        "first_conventions": diff.first_conventions, "second_conventions": diff.second_conventions,
        "alignment": [{"key": s.key, "from": s.source, "to": s.target, "effect": s.effect}
                      for s in diff.alignment],
        "entries": entries, "cause": diff.cause.to_dict() if diff.cause else None,
        "summary": diff.counts(),
    }
