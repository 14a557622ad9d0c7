"""The unit system a datasheet is printed in: SI (the figures table's own units) or US customary.

The sheet's content, its charts and its outline drawing all ask :func:`paper_unit` for the unit to print a
figure in; :func:`printed_in` sets the system for the sheet being built or drawn. The conversions
themselves are ``core.units``'.
"""

from __future__ import annotations

from collections.abc import Iterator
from contextlib import contextmanager
from contextvars import ContextVar

from pmdc_sizer.core.units import US_CUSTOMARY

_SYSTEM: ContextVar[str] = ContextVar("paper_units", default="SI")
_KEPT_IN_US = frozenset({"W"})  # horsepower for a 20 W motor reads worse than watts


@contextmanager
def printed_in(system: str) -> Iterator[None]:
    """Print every figure in ``system`` ("SI" or "US customary") inside the block."""
    token = _SYSTEM.set(system)
    try:
        yield
    finally:
        _SYSTEM.reset(token)


def paper_unit(unit: str) -> str:
    """The unit a figure is printed in: its own (SI) or the US customary one of the sheet being built."""
    if _SYSTEM.get() != "US customary":
        return unit
    return _us(unit)


def _us(unit: str) -> str:
    if unit in _KEPT_IN_US:
        return unit
    if unit in US_CUSTOMARY:
        return US_CUSTOMARY[unit]
    numerator, slash, denominator = unit.partition("/")
    if slash:  # a ratio: each side on its own ("rpm/mN·m" → "rpm/oz·in"; "K/W" stays)
        return f"{_us(numerator)}/{_us(denominator)}"
    return unit
