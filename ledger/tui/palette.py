"""The command palette (ctrl+p): our commands, named "area: action".

The commands come from :mod:`ledger.tui.keys`: those of the app (available on
every screen) and those of the screen the palette was opened from.
"""

from __future__ import annotations

from functools import partial

from textual.command import DiscoveryHit, Hit, Hits, Provider

from ledger.tui.keys import AREAS, Key


class LedgerCommands(Provider):
    """Palette commands of the app and of the current screen."""

    def _commands(self) -> list[Key]:
        area = getattr(self.screen, "AREA", None)
        keys = list(AREAS["app"].keys)
        if area in AREAS and area != "app":
            keys += list(AREAS[area].keys)
        seen, result = set(), []
        for key in keys:
            if key.command and key.command not in seen:
                seen.add(key.command)
                result.append(key)
        return result

    def _runner(self, key: Key):
        return partial(self.screen.run_action, key.action)

    async def discover(self) -> Hits:
        for key in self._commands():
            yield DiscoveryHit(key.command, self._runner(key), help=key.help)

    async def search(self, query: str) -> Hits:
        matcher = self.matcher(query)
        for key in self._commands():
            score = matcher.match(key.command)
            if score > 0:
                yield Hit(score, matcher.highlight(key.command), self._runner(key),
                          text=key.command, help=key.help)
