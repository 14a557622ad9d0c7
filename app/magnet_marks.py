"""What the magnet chart marks for each demagnetization case, written once for the screen and the paper.

Both charts (``app.gui.magnet_chart`` and ``app.datasheet.charts``) draw from here:

* :func:`case_marks`: every demagnetization case and every fault (supply applied directly) as a mark:
  its number as the datasheet's table gives it (faults "F1", "F2", ...), its state's point key and
  colour from ``app.figures``, the worst 5 % of the magnet's area (the case's verdict), the magnet's mean under the
  case's current and every segment's point, and a description for tooltips.
* :func:`grouped`: cases at the same point in the same state share one mark and one label ("1,2,3").
* :func:`shifted_load_line`: the no-load load line moved along H by the armature reaction until it
  passes through the worst current-carrying case's worst spot.
* :func:`place_labels`: label boxes placed clear of the marks, of each other and of the curves.

Nothing is computed here that the core does not give: the line is a straight line through points the
core returns, the label placement is geometry in the chart's own pixels.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .figures import DEMAGNETIZATION_STATES, LINES, POINTS, demagnetization_case_colour, demagnetization_point, figure

#: Pc as the charts show it, and why it is not one number: said in the key and in the tooltips.
PC_NOTE = ("Pc is the slope of the no-load operating point, −B/(μ0·H), with the iron's MMF drop included: "
           "the iron takes a share of the magnet's MMF that grows with the flux, so Pc differs between the "
           "cold, nominal and hot curves (a gap-only Pc would not).")
PC_NOTE_SHORT = "Pc: slope of the no-load point, iron included, so it changes with temperature"
#: The same for a printed key, in one line that fits its width.
PC_NOTE_PRINTED = ("Pc: slope −B/(μ0·H) of the no-load point, the iron's MMF drop included: it changes with the "
                   "flux, so with temperature.")

#: Points below this share of the highest Br under B = 0 are drawn at the chart's floor, marked off scale:
#: past the knee the normal curve falls to several tesla below zero, and the rest of the chart would shrink
#: to a strip.
FLOOR_SHARE_OF_BR = 0.75
OFF_SCALE = "↓"


@dataclass(frozen=True)
class CaseMark:
    """One demagnetization case as the magnet chart marks it (SI values)."""

    label: str  #: "3" for the datasheet's case 3, "F2" for its second fault
    case: object  #: the core.results.DemagnetizationCase
    fault: bool  #: one of ``results.faults``
    point: str  #: the app.figures.POINTS key of its state
    colour: str  #: "#rrggbb": the colour of its temperature (the state's own colour wins for marginal and failed)

    @property
    def name(self) -> str:
        return self.case.name

    @property
    def worst_field(self) -> float:
        """The mean field over the worst 5 % of the magnet's area, the case's verdict [A/m]."""
        return self.case.magnet_field_A_per_m

    @property
    def worst_flux_density(self) -> float:
        """The normal-curve B there [T]."""
        return self.case.magnet_flux_density_T

    @property
    def shown_colour(self) -> str:
        """The colour it is drawn in: its state's own (marginal, past the knee), else its temperature's."""
        return POINTS[self.point].colour or self.colour

    @property
    def segments(self) -> tuple[np.ndarray, np.ndarray]:
        """(H [A/m], B [T]) of every magnet segment under the case's current."""
        return (np.asarray(self.case.segment_field_A_per_m, dtype=float),
                np.asarray(self.case.segment_flux_density_T, dtype=float))

    @property
    def mean_on_curve(self) -> bool:
        """The mean is a point of the curve: the core gave segment shares and no segment is past the knee
        (past it, the mean of the segments' B lies off the curve and would read as a point of it)."""
        return math.isfinite(self.mean[0]) and self.case.magnet_area_past_knee_fraction == 0.0

    @property
    def mean(self) -> tuple[float, float]:
        """(H [A/m], B [T]) averaged over the magnet's area; NaN when the core gave no segment shares."""
        return (self.case.mean_field_A_per_m, self.case.mean_flux_density_T)

    def description(self) -> str:
        """Several lines for a tooltip: the case, its state, where the worst spot is, the mean, the margin."""
        c = self.case
        state = DEMAGNETIZATION_STATES.get(c.status, "safe" if c.ok else "past the knee")
        kind = "fault, supply applied directly" if self.fault else "demagnetization case"
        lines = [f"{self.label}  {c.name} ({kind}): {state}",
                 f"{title('worst_angle_rad')}: {worst_spot_text(c)}",
                 f"  H = {text('magnet_field_A_per_m', c)}, B = {text('magnet_flux_density_T', c)}"]
        if math.isfinite(self.mean[0]):
            lines.append(f"{title('mean_field_A_per_m')}: H = {text('mean_field_A_per_m', c)}, "
                         f"B = {text('mean_flux_density_T', c)}")
        lines.append(f"{title('magnet_area_past_knee_fraction')}: {text('magnet_area_past_knee_fraction', c)}")
        lines.append(f"{title('knee_field_A_per_m')} {text('knee_field_A_per_m', c)}; "
                     f"{title('margin_A_per_m').lower()} {text('margin_A_per_m', c)}"
                     + (f" (required {text('required_margin_A_per_m', c)})" if c.required_margin_A_per_m else ""))
        lines.append(f"{title('temperature_C')} {text('temperature_C', c)}"
                     + (f", {title('current_A').lower()} {text('current_A', c)}" if c.current_A else ""))
        return "\n".join(lines)


def title(name: str) -> str:
    return figure(f"demagnetization_case.{name}").title


def text(name: str, case) -> str:
    return figure(f"demagnetization_case.{name}").text(getattr(case, name))


def angle_text(case) -> str:
    """The angle from the pole centre of the segment holding the magnet's most demagnetized cell, signed:
    "+34.9°", "0°" at the centre."""
    angle = case.worst_angle_rad if abs(case.worst_angle_rad) > 1e-9 else 0.0  # the centre, not -3e-17 rad
    return ("+" if angle > 0 else "") + figure("demagnetization_case.worst_angle_rad").text(angle)


def worst_spot_text(case) -> str:
    """Where on the arc the magnet is most demagnetized: the angle from the pole centre and, in words, which part."""
    angles = np.abs(np.asarray(case.segment_angle_rad, dtype=float))
    angle = case.worst_angle_rad
    shown = angle_text(case)
    if angles.size == 0:
        return shown
    tip = float(angles.max())
    if abs(angle) <= 0.05 * tip:
        where = "the pole centre"
    elif abs(angle) >= tip * 0.999:
        where = "the tip toward the rotation" if angle > 0 else "the tip away from the rotation"
    else:
        where = "between the centre and the tip toward the rotation" if angle > 0 else \
            "between the centre and the tip away from the rotation"
    return f"{shown} ({where})"


def design_labels(results) -> list[str]:
    """The numbers of ``results.demagnetization.cases`` as the datasheet's table prints them."""
    return [str(i + 1) for i in range(len(results.demagnetization.cases))]


def fault_labels(results) -> list[str]:
    """The labels of ``results.faults.cases``: F1, F2, ..."""
    return [f"F{i + 1}" for i in range(len(results.faults.cases))] if results.faults is not None else []


def case_marks(results) -> list[CaseMark]:
    """Every demagnetization case, then every fault, as the magnet chart marks it."""
    marks = [CaseMark(label, case, False, demagnetization_point(case), demagnetization_case_colour(case))
             for label, case in zip(design_labels(results), results.demagnetization.cases, strict=True)]
    if results.faults is not None:
        marks += [CaseMark(label, case, True, demagnetization_point(case, fault=True),
                           demagnetization_case_colour(case))
                  for label, case in zip(fault_labels(results), results.faults.cases, strict=True)]
    return marks


def grouped(marks: Sequence[CaseMark]) -> list[tuple[str, list[CaseMark]]]:
    """Marks at the same point (to 0.1 kA/m and 1 mT) in the same state share one label, "1,2,3"."""
    groups: dict[tuple, list[CaseMark]] = {}
    for mark in marks:
        key = (round(mark.worst_field, -2), round(mark.worst_flux_density, 3), mark.point, mark.colour)
        groups.setdefault(key, []).append(mark)
    return [(",".join(m.label for m in members), members) for members in groups.values()]


def least_margin_mark(marks: Sequence[CaseMark]) -> CaseMark | None:
    """The design case with the least margin (the verdict's), or None without cases."""
    design = [m for m in marks if not m.fault]
    return min(design, key=lambda m: m.case.margin_A_per_m) if design else None


def group_label(label: str, members: Sequence[CaseMark], least: CaseMark | None) -> str:
    """The text beside a mark: its numbers, and what the mark says when it matters."""
    if not members[0].case.ok:
        return f"{label} FAILS"
    if least is not None and any(m is least for m in members):
        return f"{label} least margin"
    return label


def chart_floor(results, marks: Sequence[CaseMark]) -> tuple[float, float]:
    """(lowest B a mark is drawn at, lowest B the chart shows) [T].

    The chart starts at B = 0 unless a mark or a knee on the normal curve lies below it; then it goes
    down to the lowest of them, but not below -FLOOR_SHARE_OF_BR·Br or the lowest knee, whichever is
    lower (marks below are drawn at that floor, marked off scale), and a little further so that a mark
    drawn there shows whole.
    """
    top = max(c.curves.remanence for c in results.magnet_chart)
    knees = min([0.0] + [c.curves.knee_flux_density for c in results.magnet_chart])
    lowest = min([knees] + [m.worst_flux_density for m in marks])
    if lowest >= 0.0:
        return 0.0, 0.0
    floor = max(lowest, min(-FLOOR_SHARE_OF_BR * top, knees))
    return floor, floor - 0.05 * top


def on_scale(b: float, floor: float) -> tuple[float, bool]:
    """``b`` as drawn (at least ``floor``) and whether it was moved up to it."""
    return (b, False) if b >= floor else (floor, True)


@dataclass(frozen=True)
class ShiftedLoadLine:
    """The no-load load line of a temperature, moved along H to pass through a case's worst spot."""

    mark: CaseMark  #: the case it passes through
    temperature_case: str  #: "cold", "nominal" or "hot": the curve whose no-load load line is moved
    shift_A_per_m: float  #: where it crosses B = 0: the armature reaction's shift along H (negative) [A/m]
    slope_T_per_A_per_m: float  #: B over H of the no-load load line (negative) [T·m/A]
    top_T: float  #: the remanence of its curve: the line is drawn up to it [T]

    def points(self) -> tuple[np.ndarray, np.ndarray]:
        """(H [A/m], B [T]) of its two ends: on B = 0 and at B = Br."""
        return (np.array([self.shift_A_per_m, self.shift_A_per_m + self.top_T / self.slope_T_per_A_per_m]),
                np.array([0.0, self.top_T]))

    def title(self, short: bool = False) -> str:
        """The key's text: which case, and how far the armature's MMF moves the line."""
        style = LINES["shifted_load_line"]
        shift = figure("magnet_chart_case.curves.field_strength").text(self.shift_A_per_m)
        if short:
            return f"{style.key_text}, case {self.mark.label} ({shift})"
        return f"{style.title}, case {self.mark.label}: {shift} along H"


def shifted_load_line(results) -> ShiftedLoadLine | None:
    """The load line of the worst case that carries armature current (a design case, not a fault).

    The no-load load line runs from the origin through the no-load operating point of the temperature
    case nearest the case's magnet temperature; the armature's MMF moves it along H, parallel to
    itself, until it meets the curve at the case's worst spot. None without a case with current.
    """
    marks = [m for m in case_marks(results) if not m.fault and m.case.current_A > 0.0]
    if not marks:
        return None
    worst = min(marks, key=lambda m: m.case.margin_A_per_m)
    chart = min(results.magnet_chart, key=lambda c: abs(c.curves.temperature_C - worst.case.temperature_C))
    if chart.operating_field_A_per_m >= 0.0:
        return None
    slope = chart.operating_flux_density_T / chart.operating_field_A_per_m
    shift = worst.worst_field - worst.worst_flux_density / slope
    return ShiftedLoadLine(worst, chart.name, shift, slope, chart.curves.remanence)


# ----------------------------------------------------------------------------------------------
# Labels clear of marks, of each other and of the curves, in the chart's own units (pixels down).

Box = tuple[float, float, float, float]  #: left, top, right, bottom
#: How far from its mark a label may go, in gaps: the nearest place clear of everything wins, with a
#: leader line from the mark when it is not beside it.
LABEL_REACHES = (1.0, 2.2, 3.6, 5.5, 8.0, 11.0, 15.0)


def leader(anchor: tuple[float, float], box: Box, gap: float) -> tuple[tuple[float, float], tuple[float, float]] | None:
    """A line from the mark to its label when the label had to move away from it, else None."""
    x, y = anchor
    nearest = (min(max(x, box[0]), box[2]), min(max(y, box[1]), box[3]))
    if math.hypot(nearest[0] - x, nearest[1] - y) <= 1.6 * gap:
        return None
    return anchor, nearest


def _resampled(polyline: np.ndarray, step: float) -> np.ndarray:
    """Points along a polyline no further apart than ``step``, so a box between two vertices sees it."""
    points = polyline[np.all(np.isfinite(polyline), axis=1)]
    if len(points) < 2:
        return points
    starts, pieces = points[:-1], np.diff(points, axis=0)
    counts = np.maximum(1, np.ceil(np.hypot(pieces[:, 0], pieces[:, 1]) / step).astype(int))
    index = np.repeat(np.arange(len(pieces)), counts)
    within = np.arange(counts.sum()) - np.repeat(np.cumsum(counts) - counts, counts)
    t = (within / counts[index])[:, None]
    return np.concatenate([starts[index] + t * pieces[index], points[-1:]])


def _overlap(a: Box, b: Box) -> float:
    width = min(a[2], b[2]) - max(a[0], b[0])
    height = min(a[3], b[3]) - max(a[1], b[1])
    return width * height if width > 0 and height > 0 else 0.0


def place_labels(anchors: Sequence[tuple[float, float]], sizes: Sequence[tuple[float, float]],
                 marks: Sequence[Box], curves: Sequence[np.ndarray], bounds: Box, gap: float) -> list[Box]:
    """A box for each label near its anchor, clear of the marks, the placed labels and the curves.

    Parameters
    ----------
    anchors : sequence of (x, y)
        Each label's point, in the chart's units (y down).
    sizes : sequence of (width, height)
        Each label's size.
    marks : sequence of Box
        Boxes of every mark drawn (labels keep off them).
    curves : sequence of (N, 2) arrays
        The drawn curves as polylines (labels keep off them).
    bounds : Box
        The plot area; a label outside it counts worst.
    gap : float
        Distance from the anchor to the nearest edge of its label.

    Returns
    -------
    list of Box
        The chosen box of each label, in the order given; earlier labels are placed first.
    """
    step = 3.0
    samples = np.concatenate([_resampled(np.asarray(c, dtype=float), step) for c in curves] or [np.zeros((0, 2))])
    inside = samples[(samples[:, 0] >= bounds[0]) & (samples[:, 0] <= bounds[2])
                     & (samples[:, 1] >= bounds[1]) & (samples[:, 1] <= bounds[3])] if samples.size else samples
    placed: list[Box] = []
    for (x, y), (w, h) in zip(anchors, sizes, strict=True):
        best, best_score = None, math.inf
        for reach in LABEL_REACHES:
            d = gap * reach
            for dx, dy in ((d, -d - h), (d, d), (-d - w, -d - h), (-d - w, d), (-w / 2, -d - h), (-w / 2, d),
                           (d, -h / 2), (-d - w, -h / 2)):
                box = (x + dx, y + dy, x + dx + w, y + dy + h)
                outside = box[0] < bounds[0] or box[1] < bounds[1] or box[2] > bounds[2] or box[3] > bounds[3]
                crossed = int(np.count_nonzero((inside[:, 0] >= box[0]) & (inside[:, 0] <= box[2])
                                               & (inside[:, 1] >= box[1]) & (inside[:, 1] <= box[3]))) \
                    if inside.size else 0
                score = (1e6 * outside + 10.0 * sum(_overlap(box, p) for p in placed)
                         + 5.0 * sum(_overlap(box, m) for m in marks) + 40.0 * crossed + reach)
                if score < best_score:
                    best, best_score = box, score
            if best_score < reach + 1.0:  # clear of everything: the nearest clear place wins
                break
        placed.append(best)
    return placed
