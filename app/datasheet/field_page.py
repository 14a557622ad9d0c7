"""The datasheet's optional appendix: the field solution of the design beside the fast model.

Two solutions are shown: no load (the flux, the flux densities in every part) and the demagnetization
case the fast model finds worst (the field in the magnets under that current or with the rotor out),
each as the picture the desktop tool draws, then one agreement table for both. It says plainly what a
2-D section leaves out.
"""

from __future__ import annotations

from PySide6.QtCore import QBuffer, QIODevice

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.field import FieldOptions, agreement, field_cases, solve_case
from pmdc_sizer.core.project import Project
from pmdc_sizer.core.results import Results

from ..field_picture import field_image
from .content import Paragraph, Picture, Row, Section, Table

#: The agreement table's SI units shown as (unit, factor).
_SHOWN_UNITS = {"Wb": ("mWb", 1e3), "Wb/m": ("mWb/m", 1e3), "A/m": ("kA/m", 1e-3), "1": ("1", 1.0), "T": ("T", 1.0)}


def _png(image) -> bytes:
    buffer = QBuffer()
    buffer.open(QIODevice.OpenModeFlag.WriteOnly)
    if not image.save(buffer, "PNG"):
        raise OSError("the field picture could not be encoded")
    return bytes(buffer.data().data())


def field_solutions(project: Project, results: Results, options: FieldOptions | None = None) -> list:
    """No load and the fast model's worst demagnetization case, solved.

    Parameters
    ----------
    project : Project
    results : Results
        Its fast-model results.
    options : FieldOptions, optional

    Returns
    -------
    list of FieldSolution
        One or two solutions (one when the worst case has no field counterpart).
    """
    design = design_from_project(project)
    cases = field_cases(design, results)
    chosen = [cases[0]]
    worst = next((c for c in cases if c.demagnetization_case == results.demagnetization.worst_case), None)
    if worst is not None:
        chosen.append(worst)
    return [solve_case(design, case, options) for case in chosen]


def appendix_section(results: Results, solutions: list) -> Section:
    """The appendix: a picture per solution and the agreement table.

    Parameters
    ----------
    results : Results
    solutions : list of FieldSolution

    Returns
    -------
    Section
    """
    blocks: list = [Paragraph(
        "A 2-D nonlinear magnetostatic solution of the cross-section (finite elements, the project's own steel "
        "curves, magnets on their recoil line), made by pmdc-sizer as an independent check of the figures in this "
        "sheet. It leaves out end effects: the flux per pole is the 2-D flux per metre times the stack length times "
        "the same end factor (magnet overhang, end fringing) the sheet's own figures use.", "note")]
    rows = []
    for row in agreement(results, solutions).rows:
        if row.fast is None or row.difference_percent is None:
            continue
        unit, scale = _SHOWN_UNITS.get(row.unit, (row.unit, 1.0))
        rows.append(Row((row.quantity, f"{scale * row.fast:.4g}", f"{scale * row.field:.4g}", unit,
                         f"{row.difference_percent:+.1f} %" + (" (over 3 %)" if row.flagged else "")),
                        "fail" if row.flagged else ""))
    blocks.append(Table(("Quantity", "Sheet", "Field solution", "Unit", "Difference"), tuple(rows),
                        widths=(44, 14, 16, 10, 16), numeric_from=1, key="field_agreement",
                        caption="Sheet: the figures of this datasheet. Differences over 3 % are marked."))
    for solution in solutions:
        image = field_image(solution, results.geometry.poles, 1600, 900,
                            title=f"{results.name}: {solution.case.name.replace('-', ' ')}")
        blocks.append(Picture(f"field-{solution.case.name}", _png(image),
                              f"Field solution, {solution.case.name.replace('-', ' ')}: flux density in the iron, "
                              "flux lines, magnets by their margin to the knee; radial air-gap flux density."))
    return Section("field", "Appendix: field solution", tuple(blocks), new_page=True)
