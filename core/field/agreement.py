"""How far the fast model and the field solution agree: one table, a row per quantity.

Like for like: the flux per pole compares the fast model's figure with the field's Φ_2D·L·end_factor,
the fast model's own end factor applied to both (see :mod:`.postprocess`); each flux density is the
field's counterpart of the fast model's definition (named in the row's note). A row is flagged when the
two differ by more than :data:`TOLERANCE_PERCENT` (the issue's threshold for the fast model).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ..magnet_field_share import WORST_AREA_SHARE
from .cases import ARMATURE_CURRENT, NO_LOAD, ROTOR_REMOVED
from .postprocess import FieldSolution

TOLERANCE_PERCENT = 3.0  #: a difference beyond this is flagged [%]


@dataclass(frozen=True)
class AgreementRow:
    """One quantity, fast model against field solution (SI)."""

    quantity: str  #: what is compared, with the case where it matters
    unit: str  #: SI unit of both values
    fast: float | None  #: the fast model's value; None where the fast model has no such quantity
    field: float  #: the field solution's value
    difference_percent: float | None  #: (fast - field)/|field|·100 [%]
    flagged: bool  #: |difference| > TOLERANCE_PERCENT
    case: str  #: the field case's name
    note: str = ""  #: how the field's value is defined


@dataclass(frozen=True)
class AgreementTable:
    """The rows, and the threshold they were flagged against."""

    rows: tuple[AgreementRow, ...]
    tolerance_percent: float = TOLERANCE_PERCENT

    @property
    def flagged(self) -> tuple[AgreementRow, ...]:
        """The rows beyond the tolerance."""
        return tuple(row for row in self.rows if row.flagged)


def _row(quantity: str, unit: str, fast: float | None, field: float, case: str, note: str = "") -> AgreementRow:
    if fast is None or field == 0.0:
        return AgreementRow(quantity, unit, fast, float(field), None, False, case, note)
    difference = (float(fast) - float(field)) / abs(float(field)) * 100.0
    return AgreementRow(quantity, unit, float(fast), float(field), difference,
                        abs(difference) > TOLERANCE_PERCENT, case, note)


def _no_load_rows(results, solution: FieldSolution) -> list[AgreementRow]:
    m, s, name = results.magnetics, solution, solution.case.name
    return [
        _row("flux per pole", "Wb", m.flux_per_pole_Wb, s.flux_per_pole_Wb, name,
             f"field: 2-D flux per metre × stack length × the fast model's end factor {s.end_factor:.3f}"),
        _row("air-gap flux density", "T", m.airgap_flux_density_T, s.airgap_flux_density_mean_T, name,
             "field: mean |B_r| at mid-gap under the magnet arc"),
        _row("housing flux density", "T", m.housing_flux_density_T, s.housing_section_flux_density_T, name,
             "field: flux through the wall at the interpolar axis over the wall"),
        _row("tooth flux density", "T", m.tooth_flux_density_T, s.tooth_flux_density_busiest_T, name,
             "field: mean in the steel of the most loaded tooth"),
        _row("core flux density", "T", m.core_flux_density_T, s.core_section_flux_density_T, name,
             "field: flux through the core (slot bottom to shaft) at the interpolar axis over its steel depth"),
        _row("leakage factor", "1", m.leakage_factor, s.leakage_factor, name,
             "field: flux through the magnet at mid-thickness over the flux per pole"),
        _row("flux outside the housing", "Wb/m", None, s.outside_air_flux_Wb_per_m, name,
             "field: return flux crossing the interpolar axis outside the housing (the fast model has no such path)"),
    ]


def _case_rows(results, solution: FieldSolution) -> list[AgreementRow]:
    s, case = solution, solution.case
    rows = []
    fast_case = next((c for c in results.demagnetization.cases if c.name == case.demagnetization_case), None)
    if fast_case is not None:
        past = f"{100.0 * s.magnet_area_past_knee_fraction:.1f} % of the magnet area past the knee"
        rows.append(_row(f"worst magnet field, {case.name}", "A/m", fast_case.magnet_field_A_per_m,
                         s.worst_share_magnet_field_A_per_m, case.name,
                         f"both: mean over the most-demagnetized {100 * WORST_AREA_SHARE:g} % of the magnet's area "
                         f"(field's single worst element {s.worst_magnet_field_A_per_m / 1e3:.0f} kA/m); fast: "
                         f"{'passes' if fast_case.ok else 'fails'}, field: {past}"))
    if case.kind == ARMATURE_CURRENT:
        same_temperature = [c for c in results.cases if abs(c.magnet_temperature_C - case.magnet_temperature_C) < 0.01]
        if same_temperature:
            rows.append(_row(f"flux per pole at {case.current_A:.4g} A, {case.name}", "Wb",
                             same_temperature[0].flux_per_pole_Wb, s.flux_per_pole_Wb, case.name,
                             "fast: no-load flux at the case's magnet temperature (kept under load); "
                             "field: between the neutral axes with the slot currents"))
    return rows


def agreement(results, solutions: FieldSolution | Sequence[FieldSolution]) -> AgreementTable:
    """Fast model against field solution, per quantity and case.

    Parameters
    ----------
    results : Results
        What :func:`pmdc_sizer.core.evaluate.evaluate` returned for the design.
    solutions : FieldSolution or sequence of FieldSolution
        Field solutions of the design's cases (:func:`~.cases.field_cases`); the no-load case gives the
        flux and flux-density rows, every loaded or rotor-removed case its worst magnet field (and, with
        current, its flux per pole under load).

    Returns
    -------
    AgreementTable
        The rows, flagged beyond :data:`TOLERANCE_PERCENT`.
    """
    if isinstance(solutions, FieldSolution):
        solutions = [solutions]
    rows: list[AgreementRow] = []
    for solution in solutions:
        if solution.case.kind == NO_LOAD:
            rows += _no_load_rows(results, solution)
        elif solution.case.kind in (ARMATURE_CURRENT, ROTOR_REMOVED):
            rows += _case_rows(results, solution)
    return AgreementTable(tuple(rows))
