"""Backgrounds on which four-graviton coefficients are computed.

Flat ten-dimensional type IIA and IIB have the same four-graviton amplitude
through genus one (the odd-odd spin structure does not contribute to the
four-graviton amplitude at one loop), so both expand to the same B_(p,q).
Orbifold backgrounds come from :mod:`ledger.amplitudes.orbifold` when present.

>>> backgrounds = known_backgrounds()
>>> backgrounds["flat-iib"].supercharges, backgrounds["flat-iia"].dimension
(32, 10)
>>> get_background("flat-iib").theory
'IIB'
"""

from __future__ import annotations

from dataclasses import dataclass

from ledger.errors import LedgerError


@dataclass(frozen=True)
class Background:
    """A spacetime background: ``id`` is the stable key used by projects and the CLI."""

    id: str
    name: str
    theory: str
    dimension: int
    compactification: str
    supercharges: int


FLAT_IIA = Background("flat-iia", "Flat ten dimensions, type IIA", "IIA", 10, "none", 32)
FLAT_IIB = Background("flat-iib", "Flat ten dimensions, type IIB", "IIB", 10, "none", 32)
FLAT_BACKGROUNDS = (FLAT_IIA, FLAT_IIB)


def known_backgrounds() -> dict[str, Background]:
    """Every background this build knows, by id (flat ones first)."""
    catalogue = {b.id: b for b in FLAT_BACKGROUNDS}
    try:
        from ledger.amplitudes.orbifold import orbifold_backgrounds
    except ImportError:
        return catalogue
    for background in orbifold_backgrounds():
        catalogue.setdefault(background.id, background)
    return catalogue


def get_background(background_id: str) -> Background:
    """The background with this id, or a :class:`LedgerError` listing the known ids."""
    catalogue = known_backgrounds()
    if background_id not in catalogue:
        raise LedgerError(f"unknown background {background_id!r}; known: {', '.join(catalogue)}")
    return catalogue[background_id]


def is_flat(background: Background) -> bool:
    return background.id in {b.id for b in FLAT_BACKGROUNDS}
