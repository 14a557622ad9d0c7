"""What the sizing page can plot, colour by and list: each objective, key figure and free key of a result.

A :class:`Quantity` reads its numbers off a ``core.sizing.SizingResult`` (every feasible candidate)
or one of its ``SizedDesign``\\ s, already in the unit the screen shows. Objectives and key figures take
their title, unit and digits from ``app.figures.SIZING_FIGURES``; free keys their editor label and the
file's unit in the display system. No Qt here.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from pmdc_sizer.core.sizing_objectives import OBJECTIVES
from pmdc_sizer.core.sizing_space import CHOICE_KEYS, GRADE_KEY

from ..field_labels import label_for
from ..figures import LABELS, SIZING_FIGURES, shown_value, torque_unit
from ..formatting import significant, unit_label
from .display_units import DisplayUnits

OBJECTIVE, FIGURE, VALUE = "objective", "figure", "value"


@dataclass(frozen=True)
class Quantity:
    """One thing the page can show of the designs of a search."""

    kind: str  #: OBJECTIVE, FIGURE or VALUE (a free key)
    name: str  #: the objective's name, the batch figure's name or the free key
    title: str
    unit: str  #: as shown: a ``core.units`` unit, "%", "1", or the project's currency
    file_unit: str = ""  #: a free key's unit in the file
    digits: int = 3
    money: bool = False  #: a cost, shown in the project's currency as it is
    integer: bool = False  #: a whole-number key (poles, slots, turns per coil), shown as a count

    def label(self) -> str:
        """The title with its unit, "Active mass: magnets, copper, steel [g]"."""
        return self.title if self.unit in ("1", "") else f"{self.title} [{unit_label(self.unit)}]"

    def number(self, shown: float) -> str:
        """A shown value alone, for a column whose heading carries the unit."""
        if not np.isfinite(shown):
            return "–"
        whole = self.integer or self.unit in ("°C", "°F")
        return f"{shown:.0f}" if whole else significant(shown, self.digits)

    def text(self, shown: float) -> str:
        """A shown value with its unit."""
        number = self.number(shown)
        return number if self.unit in ("1", "") or number == "–" else f"{number} {unit_label(self.unit)}"

    def _source(self) -> str:
        return OBJECTIVES[self.name].figure if self.kind == OBJECTIVE else self.name

    def feasible(self, result, display: DisplayUnits) -> np.ndarray:
        """Every feasible candidate's value, shown units (NaN where it has none)."""
        store = result.feasible_values if self.kind == VALUE else result.feasible_figures
        raw = store.get(self._source())
        if raw is None and self.kind == OBJECTIVE:
            raw = store.get(self.name)
        if raw is None:
            return np.full(result.feasible_count, np.nan)
        return self._shown(np.asarray(raw, dtype=float), display)

    def of_design(self, design, display: DisplayUnits) -> float:
        """One returned design's value, shown units."""
        if self.kind == VALUE:
            raw = design.values.get(self.name)
        elif self.kind == OBJECTIVE and self.name in design.objectives:
            raw = design.objectives[self.name]
        else:
            raw = design.figures.get(self._source())
        try:  # a count chosen from a list (poles) is kept as its text, "4"
            number = float(raw) if raw is not None else float("nan")
        except ValueError:
            return float("nan")
        return float(self._shown(np.asarray(number), display))

    def _shown(self, raw: np.ndarray, display: DisplayUnits) -> np.ndarray:
        if self.kind == VALUE:
            return raw if not self.file_unit else np.asarray(display.to_screen(raw, self.file_unit))
        if self.money:
            return raw
        with np.errstate(invalid="ignore"):
            return np.asarray(shown_value(raw, self.unit))


def _figure_quantity(kind: str, name: str, figure_name: str, display: DisplayUnits, results, currency: str
                     ) -> Quantity:
    shown = SIZING_FIGURES[figure_name]
    unit = shown.unit
    if "mN·m" in unit and unit != "mN·m/A" and results is not None:
        unit = unit.replace("mN·m", torque_unit(results))
    money = unit == "currency"
    unit = currency if money else display.screen_unit(unit)
    return Quantity(kind, name, shown.title, unit, digits=shown.digits, money=money)


def quantities(result, free_units: dict[str, str], display: DisplayUnits, results=None,
               currency: str = "EUR") -> list[Quantity]:
    """What the page offers for a result: its objectives, the key figures it kept, its numeric free keys
    (a pole count chosen from a list among them).

    ``free_units``: free key → its unit in the file ("" for a count); ``results``: the open design's
    evaluation, for its torque unit. A kept figure ``app.figures.SIZING_FIGURES`` has no entry for is
    left out.
    """
    out = [_figure_quantity(OBJECTIVE, name, OBJECTIVES[name].figure, display, results, currency)
           for name in result.spec.objectives]
    taken = {OBJECTIVES[name].figure for name in result.spec.objectives}
    out += [_figure_quantity(FIGURE, name, name, display, results, currency)
            for name in SIZING_FIGURES if name in result.feasible_figures and name not in taken]
    for free in result.spec.free:
        if free.choices and not free.integer:  # grades, steels, wire: text columns (choice_columns)
            continue
        unit = free_units.get(free.key, "")
        shown_unit = display.screen_unit(unit) if unit else "1"
        out.append(Quantity(VALUE, free.key, label_for(free.key), shown_unit, unit, integer=free.integer))
    return out


def choice_columns(result) -> list[tuple[str, str]]:
    """(key, heading) of each named choice the search made (the grade, the steels, the wire), in the order
    of ``core.sizing_space.CHOICE_KEYS``: the table lists them as text beside the numbers."""
    free = {v.key for v in result.spec.free if v.choices and not v.integer}
    return [(key, LABELS["magnet.name"] if key == GRADE_KEY else label_for(key)) for key in CHOICE_KEYS if key in free]


def choice_of(design, key: str) -> str:
    """The design's choice for ``key`` (a grade, a steel, a wire size) when the search chose it, else ""."""
    value = design.values.get(key, "")
    return value if isinstance(value, str) else ""

