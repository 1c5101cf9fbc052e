"""The overview's tree: backgrounds, then genus, then the orders in alpha'.

Every order from R⁴ up to the highest one present is listed, so a gap in a
ledger shows as "(none)".  Each node carries the filter it stands for.
"""

from __future__ import annotations

from textual.widgets import Tree

from ledger.book.sector_records import sector_records_of
from ledger.tui.display import alpha_unicode, genus_label, operator_unicode


def _operator(weight: int) -> str:
    return "R^4" if weight == 0 else f"D^{2 * weight}R^4"


class OrdersTree(Tree):
    """Node data: {} (everything), {"background"}, {+ "genus"}, {+ "operator"}, or
    {"background", "sectors": True} for an orbifold's sector-summed integrands (not entries)."""

    def __init__(self, **kwargs) -> None:
        super().__init__("entries", **kwargs)
        self.show_root = False
        self.guide_depth = 2

    def build(self, project) -> None:
        selected = self.cursor_node.data if self.cursor_node is not None else None
        self.clear()
        self.root.add_leaf(f"All entries ({len(project.entries)})", data={})
        for background in project.backgrounds:
            entries = [e for e in project.entries if e.background == background.id]
            node = self.root.add(f"{background.id} ({len(entries)})",
                                 data={"background": background.id}, expand=True)
            for genus in sorted({e.genus for e in entries}):
                at_genus = [e for e in entries if e.genus == genus]
                genus_node = node.add(f"{genus_label(genus)} ({len(at_genus)})",
                                      data={"background": background.id, "genus": genus}, expand=True)
                top = max(e.weight for e in at_genus)
                for weight in (w for w in range(top + 1) if w != 1):
                    count = sum(1 for e in at_genus if e.weight == weight)
                    label = (f"{operator_unicode(_operator(weight))} {alpha_unicode(3 + weight)} "
                             + (f"({count})" if count else "(none)"))
                    genus_node.add_leaf(label, data={"background": background.id, "genus": genus,
                                                     "operator": _operator(weight)})
            self._add_sector_integrands(node, background)
        self._restore_cursor(selected)

    @staticmethod
    def _add_sector_integrands(node, background) -> None:
        """Orbifold backgrounds: one node for the sector-summed integrands kept with them."""
        records = sector_records_of(background)
        if records:
            node.add_leaf(f"sector integrands ({len(records)})",
                          data={"background": background.id, "sectors": True})

    def _restore_cursor(self, data) -> None:
        if data is None:
            return
        for line in range(self.last_line + 1):
            node = self.get_node_at_line(line)
            if node is not None and node.data == data:
                self.move_cursor(node)
                return


def matches(entry, scope: dict) -> bool:
    """Whether an entry lies inside a tree node's scope (no entry lies in a sectors node)."""
    return "sectors" not in scope and all(getattr(entry, field) == value
                                          for field, value in scope.items())


def describe(scope: dict) -> str:
    """The scope in words, for the table's title."""
    if not scope:
        return "all backgrounds"
    parts = [scope["background"]]
    if "sectors" in scope:
        parts.append("sector integrands")
    if "genus" in scope:
        parts.append(genus_label(scope["genus"]))
    if "operator" in scope:
        parts.append(operator_unicode(scope["operator"]))
    return " · ".join(parts)
