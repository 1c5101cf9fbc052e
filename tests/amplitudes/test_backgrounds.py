"""The background catalogue."""

from __future__ import annotations

import dataclasses
import sys

import pytest

from ledger.amplitudes.backgrounds import (
    FLAT_IIA, FLAT_IIB, Background, get_background, is_flat, known_backgrounds,
)
from ledger.errors import LedgerError


def test_flat_backgrounds():
    # flat ten dimensions: 32 supercharges for both type II theories (common practice)
    catalogue = known_backgrounds()
    assert catalogue["flat-iia"] == FLAT_IIA and catalogue["flat-iib"] == FLAT_IIB
    for background in (FLAT_IIA, FLAT_IIB):
        assert background.dimension == 10 and background.supercharges == 32
        assert background.compactification == "none" and is_flat(background)
    assert (FLAT_IIA.theory, FLAT_IIB.theory) == ("IIA", "IIB")


def test_background_is_frozen():
    with pytest.raises(dataclasses.FrozenInstanceError):
        FLAT_IIB.dimension = 4  # type: ignore[misc]


def test_unknown_background_lists_the_known_ones():
    with pytest.raises(LedgerError, match="flat-iia, flat-iib"):
        get_background("flat-bosonic")


def test_catalogue_tolerates_a_missing_orbifold_module(monkeypatch):
    monkeypatch.setitem(sys.modules, "ledger.amplitudes.orbifold", None)  # import fails
    assert set(known_backgrounds()) == {"flat-iia", "flat-iib"}


def test_catalogue_includes_orbifold_backgrounds(monkeypatch):
    import types

    fake = types.ModuleType("ledger.amplitudes.orbifold")
    extra = Background("t4-z2", "T^4/Z_2 x R^6", "IIB", 10, "T^4/Z_2", 16)
    fake.orbifold_backgrounds = lambda: [extra]
    monkeypatch.setitem(sys.modules, "ledger.amplitudes.orbifold", fake)
    catalogue = known_backgrounds()
    assert catalogue["t4-z2"] == extra and not is_flat(extra)
    assert list(catalogue)[:2] == ["flat-iia", "flat-iib"]
