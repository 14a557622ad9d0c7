"""What a datasheet is made as: its edition, its paper and its unit system (no Qt here, so the command
line can offer the choices without loading the drawing code)."""

from __future__ import annotations

from dataclasses import dataclass

EDITIONS = ("customer", "internal")
PAPER_SIZES_MM = {"A4": (210.0, 297.0), "Letter": (215.9, 279.4)}  #: ISO 216 A4; ANSI/ASME Y14.1 Letter
UNIT_SYSTEMS = ("SI", "US customary")


@dataclass(frozen=True)
class SheetOptions:
    """Who the sheet is for, what paper it is printed on and the unit system of its figures.

    ``customer``: ratings, constants, curves, demagnetization and thermal verdicts, outline and cautions.
    ``internal``: everything, with material sources, costs, every design check and the model notes.
    """

    edition: str = "customer"
    paper: str = "A4"
    units: str = "SI"

    def __post_init__(self):
        for name, allowed in (("edition", EDITIONS), ("paper", tuple(PAPER_SIZES_MM)), ("units", UNIT_SYSTEMS)):
            if getattr(self, name) not in allowed:
                raise ValueError(f"datasheet {name} {getattr(self, name)!r}: use one of {', '.join(allowed)}")

    @property
    def internal(self) -> bool:
        return self.edition == "internal"


DEFAULT_OPTIONS = SheetOptions()  #: the customer edition, A4, SI
