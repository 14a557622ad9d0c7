"""Production spread of a design: its tolerances in SI, motors drawn from them, each built as a Design.

A tolerance is a ± about the design's value with a distribution (``[tolerances]`` of the project
file): "normal" reads the ± as 3σ, "uniform" spreads the part evenly across it. A normal spread is
truncated at its ±: a part outside the drawing's tolerance is rejected at incoming inspection, so no
motor of the study is built from one, and the ends of every spread are parts the fit rules accept
(:func:`core.fit_rules.check_tolerance_fit`).

The motors are drawn as a Latin hypercube (``scipy.stats.qmc``), which stratifies every tolerance's
range so that the tails of each are sampled as often as their probability says, from a numpy
Generator seeded with the study's seed: the same seed draws the same motors.

A drawn motor's magnets come from a lot whose Br and HcJ sit off the grade's typical values; the lot's
curve keeps the grade's shape (its squareness, and its knee's centre and width in units of HcJ) and
its HcB follows from that curve (:func:`lot_grade`).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np
from scipy.stats import qmc, truncnorm

from .conductors import diameter_tolerance
from .design import Design
from .errors import ProjectError
from .fit_rules import check_tolerance_fit
from .magnet_grades import GradeDataError, MagnetGrade
from .magnet_knee import knee_shape
from .magnets import CurveAtTemperature
from .schema import Project
from .shared_docs import parameter_table, shared_parameters
from .solvers import find_root
from .units import MU_0, to_si

NORMAL_SIGMAS = 3.0  #: a normal spread's ± is this many standard deviations (the usual reading of a ±)


@dataclass(frozen=True)
class Spread:
    """One tolerance of a design, in SI."""

    key: str  #: the file's key, e.g. "tolerances.airgap_mm"
    label: str  #: what it spreads, as an engineer names it, e.g. "air gap"
    plus_minus: float  #: the ±: a share of the value [1] where ``relative``, else in the quantity's SI unit
    relative: bool  #: whether the ± is a share of the value
    distribution: str  #: "normal" (± is 3σ, truncated there) or "uniform"
    unit: str  #: the SI unit of an absolute ± ("m", "V"), "" for a share


#: (file key without "tolerances.", label, relative, SI unit of an absolute ±), in the file's order.
_SPREADS = (
    ("remanence_pct", "Br", True, ""),
    ("coercivity_pct", "HcJ", True, ""),
    ("magnet_thickness_mm", "magnet thickness", False, "m"),
    ("airgap_mm", "air gap", False, "m"),
    ("wire_diameter_mm", "wire diameter", False, "m"),
    ("copper_resistivity_pct", "copper resistivity", True, ""),
    ("brush_drop_V", "brush drop", False, "V"),
    ("friction_torque_pct", "friction torque", True, ""),
    ("supply_voltage_pct", "supply voltage", True, ""),
)


def spreads_of(project: Project, design: Design) -> tuple[Spread, ...]:
    """The tolerances of a project in SI, the wire's from IEC 60317-0-1 where the file leaves it out.

    Parameters
    ----------
    project : Project
        The validated project (its ``[tolerances]`` table).
    design : Design
        The same project in SI (its wire's nominal diameter).

    Returns
    -------
    tuple of Spread
        One per tolerance, zero ones included, in the file's order.

    References
    ----------
    .. [1] IEC 60317-0-1, the tolerance on the nominal conductor diameter (:func:`conductors.diameter_tolerance`).
    """
    t = project.tolerances
    spreads = []
    for name, label, relative, unit in _SPREADS:
        value = getattr(t, name)
        if name == "wire_diameter_mm" and value is None:
            plus_minus = diameter_tolerance(design.winding.wire.bare_diameter)
        elif relative:
            plus_minus = to_si(value, "%")
        else:
            plus_minus = to_si(value, name.rsplit("_", 1)[1])
        distribution = getattr(t, name.rsplit("_", 1)[0] + "_distribution")
        spreads.append(Spread(f"tolerances.{name}", label, float(plus_minus), relative, distribution, unit))
    return tuple(spreads)


def draw(spreads: tuple[Spread, ...], samples: int, seed: int) -> np.ndarray:
    """Deviations of ``samples`` motors, each a share of its tolerance's ±, in [-1, 1].

    Parameters
    ----------
    spreads : tuple of Spread
        The tolerances (their distributions).
    samples : int
        Motors to draw [1].
    seed : int
        Seed of the numpy Generator that drives the Latin hypercube.

    Returns
    -------
    ndarray
        Shape (samples, len(spreads)): -1 is the low end of the ±, +1 the high end. A normal spread is a
        standard normal over 3, truncated at ±1 (±3σ); a uniform one is even across [-1, 1].

    References
    ----------
    .. [1] M. D. McKay, R. J. Beckman, W. J. Conover (1979), a comparison of three methods for selecting
       values of input variables in the analysis of output from a computer code, Technometrics 21(2)
       (Latin hypercube sampling, as scipy.stats.qmc.LatinHypercube draws it).
    """
    rng = np.random.default_rng(seed)
    unit_cube = np.asarray(qmc.LatinHypercube(d=len(spreads), seed=rng).random(samples), dtype=float)
    deviations = 2.0 * unit_cube - 1.0
    for column, spread in enumerate(spreads):
        if spread.distribution == "normal":
            deviations[:, column] = truncnorm.ppf(unit_cube[:, column], -NORMAL_SIGMAS, NORMAL_SIGMAS) / NORMAL_SIGMAS
    return deviations


def _model_hcb(grade: MagnetGrade, remanence: np.ndarray, coercivity_hcj: np.ndarray) -> np.ndarray:
    """HcB of the grade's curve shape at other Br and HcJ, 20 °C: where that normal curve crosses B = 0."""
    shape = knee_shape(grade)
    recoil_slope = MU_0 * (grade.recoil_permeability - 1.0)
    curve = CurveAtTemperature(remanence, coercivity_hcj, recoil_slope, remanence - recoil_slope * coercivity_hcj,
                               shape.width_ratio * coercivity_hcj, shape.centre_ratio * coercivity_hcj)
    return -find_root(curve.flux_density, -coercivity_hcj, np.zeros_like(coercivity_hcj)).root


def lot_grade(grade: MagnetGrade, remanence_factor: np.ndarray, coercivity_factor: np.ndarray) -> list[MagnetGrade]:
    """The grade of magnet lots whose Br and HcJ sit at factors of the grade's typical values.

    Br and HcJ scale by their factors; the lot keeps the grade's squareness and its knee's shape in units
    of HcJ, so its HcB is where that curve crosses B = 0, scaled to the grade's stored HcB (a factor of 1
    gives the grade itself); (BH)max scales with Br², as on a straight recoil line.

    Parameters
    ----------
    grade : MagnetGrade
        The grade as the library states it.
    remanence_factor, coercivity_factor : ndarray
        Br and HcJ of each lot over the grade's [1].

    Returns
    -------
    list of MagnetGrade
        One per lot.

    References
    ----------
    .. [1] the project's curve model (:mod:`core.magnets`); (BH)max = Br²/(4·μ0·μrec) of a straight recoil
       line (textbook relation, from memory).
    """
    remanence_factor = np.asarray(remanence_factor, dtype=float)
    coercivity_factor = np.asarray(coercivity_factor, dtype=float)
    nominal = _model_hcb(grade, np.array([grade.remanence]), np.array([grade.coercivity_hcj]))[0]
    hcb = grade.coercivity_hcb * _model_hcb(grade, grade.remanence * remanence_factor,
                                            grade.coercivity_hcj * coercivity_factor) / nominal
    unchanged = (remanence_factor == 1.0) & (coercivity_factor == 1.0)
    hcb = np.where(unchanged, grade.coercivity_hcb, hcb)
    return [grade if same else replace(grade, remanence=grade.remanence * fb, coercivity_hcj=grade.coercivity_hcj * fj,
                                       coercivity_hcb=float(b), energy_product=grade.energy_product * fb**2)
            for fb, fj, b, same in zip(remanence_factor.tolist(), coercivity_factor.tolist(), hcb.tolist(),
                                       unchanged.tolist(), strict=True)]


#: The arguments of the drawn motors' functions, described once (:mod:`core.shared_docs`).
DRAWN_PARAMETERS = parameter_table("""
design : Design
    The nominal design, SI.
spreads : tuple of Spread
    Its tolerances, as :func:`spreads_of` gives them.
deviations : ndarray
    Shape (N, len(spreads)), shares of each ± (:func:`draw`).
""")


@shared_parameters(DRAWN_PARAMETERS)
def drawn_parts(design: Design, spreads: tuple[Spread, ...], deviations: np.ndarray) -> dict[str, np.ndarray]:
    """What each drawn motor is built from: the value of every spread quantity, SI.

    Returns
    -------
    dict of str to ndarray
        Shape (N,) each: ``remanence_T`` and ``coercivity_HcJ_A_per_m`` at 20 °C, ``magnet_thickness_m``,
        ``airgap_m``, ``wire_bare_diameter_m``, ``copper_resistivity_factor`` (over IEC 60028's copper),
        ``brush_drop_V``, ``friction_torque_N_m``, ``supply_voltage_V``.
    """
    step = {s.key.removeprefix("tolerances."): s.plus_minus * deviations[:, i] for i, s in enumerate(spreads)}
    g, w = design.geometry, design.winding
    return {
        "remanence_T": design.magnet.remanence * (1.0 + step["remanence_pct"]),
        "coercivity_HcJ_A_per_m": design.magnet.coercivity_hcj * (1.0 + step["coercivity_pct"]),
        "magnet_thickness_m": g.magnet_thickness + step["magnet_thickness_mm"],
        "airgap_m": g.airgap + step["airgap_mm"],
        "wire_bare_diameter_m": w.wire.bare_diameter + step["wire_diameter_mm"],
        "copper_resistivity_factor": w.resistivity_factor * (1.0 + step["copper_resistivity_pct"]),
        "brush_drop_V": design.brush_drop + step["brush_drop_V"],
        "friction_torque_N_m": design.losses.friction_torque * (1.0 + step["friction_torque_pct"]),
        "supply_voltage_V": design.supply_voltage * (1.0 + step["supply_voltage_pct"]),
    }


@shared_parameters(DRAWN_PARAMETERS)
def drawn_designs(design: Design, spreads: tuple[Spread, ...], deviations: np.ndarray) -> list[Design]:
    """The motors of the drawn deviations, each the design with its parts moved (``dataclasses.replace``).

    Returns
    -------
    list of Design
        N designs built from :func:`drawn_parts`: Br and HcJ on a lot's grade (:func:`lot_grade`), the
        magnet thickness and air gap on the geometry (the armature is the datum, so the housing moves
        with them), the bare diameter on the wire (its enamel build kept), the copper's resistivity
        factor on the winding, the brush drop and supply voltage on the design, the friction on its losses.
    """
    parts = drawn_parts(design, spreads, deviations)
    grades = lot_grade(design.magnet, parts["remanence_T"] / design.magnet.remanence,
                       parts["coercivity_HcJ_A_per_m"] / design.magnet.coercivity_hcj)
    g, w, wire = design.geometry, design.winding, design.winding.wire
    rows = zip(grades, *(parts[name].tolist() for name in (
        "magnet_thickness_m", "airgap_m", "wire_bare_diameter_m", "copper_resistivity_factor", "brush_drop_V",
        "friction_torque_N_m", "supply_voltage_V")), strict=True)
    return [replace(
        design,
        magnet=grade,
        geometry=replace(g, magnet_thickness=thickness, airgap=gap),
        winding=replace(w, wire=replace(wire, bare_diameter=bare,
                                        overall_diameter=wire.overall_diameter + bare - wire.bare_diameter),
                        resistivity_factor=resistivity),
        brush_drop=brush_drop,
        supply_voltage=supply,
        losses=replace(design.losses, friction_torque=friction),
    ) for grade, thickness, gap, bare, resistivity, brush_drop, friction, supply in rows]


def check_spreads(project: Project, design: Design, spreads: tuple[Spread, ...]) -> None:
    """Refuse, naming the tolerance and its limit, spreads whose ends are parts that cannot be made.

    The dimensional ends go through the fit rules of a file (:func:`core.fit_rules.check_tolerance_fit`,
    every tolerance, defaults included); the magnet lots at the corners of the Br and HcJ spreads must
    have a curve the model can follow.

    Parameters
    ----------
    project : Project
        The validated project.
    design : Design
        The same in SI.
    spreads : tuple of Spread
        Its tolerances (:func:`spreads_of`).

    Raises
    ------
    ProjectError
        With ``key`` the tolerance at fault.
    """
    check_tolerance_fit(project)
    by_key = {s.key: s for s in spreads}
    wire = by_key["tolerances.wire_diameter_mm"]
    if wire.plus_minus >= design.winding.wire.bare_diameter:  # the IEC tolerance never does; a file's may
        raise ProjectError("tolerances.wire_diameter_mm: the thinnest wire of the spread would have no copper",
                           key="tolerances.wire_diameter_mm")
    br, hcj = by_key["tolerances.remanence_pct"].plus_minus, by_key["tolerances.coercivity_pct"].plus_minus
    for key, factors in (("tolerances.remanence_pct", ([1 - br, 1 + br], [1.0, 1.0])),
                         ("tolerances.coercivity_pct", ([1 - br, 1 + br, 1 - br, 1 + br],
                                                         [1 - hcj, 1 - hcj, 1 + hcj, 1 + hcj]))):
        for grade in lot_grade(design.magnet, np.array(factors[0]), np.array(factors[1])):
            try:
                knee_shape(grade)
            except GradeDataError as error:
                share = br if key.endswith("remanence_pct") else hcj
                raise ProjectError(f"{key} = {100 * share:g} %: a magnet lot at the end of the spread has no curve "
                                   f"the model can follow ({error}); lower the tolerance", key=key) from None


__all__ = ["NORMAL_SIGMAS", "Spread", "check_spreads", "draw", "drawn_designs", "drawn_parts", "lot_grade",
           "spreads_of"]
