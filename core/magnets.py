"""The demagnetization curves of a permanent-magnet grade at any temperature.

Model
-----
The intrinsic (polarization) curve in the second quadrant is the recoil line less a knee that drops it
to zero at H = -HcJ (u = -H >= 0):

    J(H) = Jr(H) - A·F(u/HcJ),   Jr(H) = Br + μ0 (μrec - 1) H,   A = Jr(-HcJ),

with F a logistic step from F(0) = 0 to F(1) = 1 whose centre and width, in units of HcJ, are fitted
once per grade at 20 °C (:mod:`magnet_knee`): through Hk (J = 0.9·Br, Hk = squareness·HcJ; the 0.9·Br
definition is the industry's, from memory of IEC 60404-5 and MMPA 0100-00) and, where the stored HcB
lies on the knee, through HcB. They are held constant with temperature, so the knee keeps its shape as
HcJ moves. The normal curve is B(H) = μ0 H + J(H). Br and HcJ are met exactly, at every temperature.

Why this model: a straight recoil line with a one-parameter (exponential) knee fitted to Hk alone
missed the stored HcB of every grade whose HcB lies on the knee (bonded NdFeB +6.5 %, isotropic ferrite
+7.6 %, Y25 +2.7 %): one parameter cannot pass through two points. The logistic step has two, so it
passes through Hk and HcB; with its centre far beyond HcJ it is the old exponential knee, which is kept
wherever HcB lies on the recoil line (the sintered NdFeB and SmCo grades, whose curves do not change).
The alternative, a recoil permeability fitted to Br/HcB for the curve alone, was rejected: the magnetic
circuit, the demagnetization checks and the field solution use ``grade.recoil_permeability``, and a
grade must have one recoil line. Where the stored values themselves contradict each other (Y40's
squareness 0.90 puts J = 0.9·Br before its HcB, where its Br and HcB put J = 0.93·Br), no curve is
right; the data were corrected with the reason beside them (``core/data/magnets.toml``), or the grade is
refused. AlNiCo, whose recoil lines start from the working point, is refused for this motor type
(:data:`core.magnet_grades.REFUSED_FAMILIES`).

Faithfulness: :func:`core.magnet_grade_check.require_faithful_curve` refuses a grade whose curve misses
its stored HcB or (BH)max by more than 2 %; the library calls it on every grade it loads. The model's HcB
and (BH)max, and its curves as plot data, are read off it in :mod:`core.magnet_curve_figures`.

Temperature enters through Br(T) and HcJ(T) (:mod:`magnet_grades`, whose grade type and temperature
functions are re-exported here for the callers that need both).

The knee reported for the demagnetization checks is the onset of irreversible loss: the field at which
J has fallen 1 % of Br(T) below its recoil line (see ``knee_field_at``); Hk itself is kept for reference.

The curve model (the recoil line with its logistic knee, and the 1 % knee) is this project's own
construction to fit a grade's data sheet values; it is not taken from a publication (sigmoid fits of
the knee are common in the literature, from memory, no one paper followed).

References
----------
.. [1] IEC 60404-5 (methods of measurement of permanent-magnet materials): the normal and intrinsic
   demagnetization curves, B = μ0·H + J, and the points of them a grade's data give (Br, HcB, HcJ,
   (BH)max, μrec). The temperature coefficients' source is given in :mod:`magnet_grades`.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np
from scipy.special import expit

from .magnet_grades import (
    FAMILIES,
    REFERENCE_TEMPERATURE_C,
    GradeDataError,
    GradeLots,
    MagnetGrade,
    intrinsic_coercivity_at,
    model_temperature_range_C,
    model_temperature_ranges_C,
    remanence_at,
    require_ambient_inside_model,
)
from .magnet_knee import KNEE_LOSS_FRACTION, knee_fraction_inverse, knee_shape, knee_shapes
from .shared_docs import parameter_table, shared_parameters
from .units import MU_0

#: The arguments of the curve lookups, described once (:mod:`core.shared_docs`).
CURVE_PARAMETERS = parameter_table("""
grade : MagnetGrade
    The grade.
field_strength : float or ndarray
    Field strength H in the magnet [A/m], negative in the second quadrant.
temperature_C : float or ndarray
    Magnet temperature [°C]; arrays broadcast with ``field_strength``.
""")


def knee_field_at(grade: MagnetGrade | GradeLots, temperature_C: float | np.ndarray):
    """The knee: the field at which the intrinsic curve has fallen ``KNEE_LOSS_FRACTION``·Br(T) below
    its recoil line, the onset of irreversible loss.

    The knee term A·F(u/HcJ) equals k·Br at u_knee = HcJ·F⁻¹(k·Br/A), in closed form
    (:func:`core.magnet_knee.knee_fraction_inverse`).

    Parameters
    ----------
    grade : MagnetGrade or GradeLots
        The grade, whose knee shape is fitted once (:func:`core.magnet_knee.knee_shape`), or many lots
        (their knees' shapes fitted already), broadcasting with ``temperature_C``.
    temperature_C : float or ndarray
        Magnet temperature [°C]; an array gives the knee at each.

    Returns
    -------
    ndarray
        The knee field H [A/m], negative (a 0-d array for a scalar temperature).

    References
    ----------
    .. [1] the project's own definition on its own curve model (module docstring); no published source
    """
    curve = curve_at(grade, np.asarray(temperature_C, dtype=float))
    shape = _shape_of(grade)
    fraction = KNEE_LOSS_FRACTION * curve.remanence / curve.amplitude
    return -curve.coercivity_hcj * knee_fraction_inverse(fraction, shape.centre_ratio, shape.width_ratio)


def squareness_field_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """The trade's Hk as a field, -squareness·HcJ(T): where J = 0.9·Br (for reference on charts).

    Parameters
    ----------
    grade : MagnetGrade
        The grade, with its squareness Hk/HcJ.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    float or ndarray
        -Hk [A/m], negative.

    References
    ----------
    .. [1] the 0.9·Br definition of Hk, from memory of IEC 60404-5 and MMPA 0100-00
    """
    return -grade.squareness * intrinsic_coercivity_at(grade, temperature_C)


@dataclass(frozen=True)
class CurveAtTemperature:
    """The constants of the curve model at one temperature, for repeated lookups.

    Fields are floats for one temperature or arrays for several (they broadcast with the field).
    """

    remanence: float | np.ndarray  #: Br(T) [T]
    coercivity_hcj: float | np.ndarray  #: HcJ(T) [A/m]
    recoil_slope: float | np.ndarray  #: μ0·(μrec - 1) [T·m/A]
    amplitude: float | np.ndarray  #: A = Jr(-HcJ) [T]
    width: float | np.ndarray  #: width w of the knee's logistic step [A/m]
    centre: float | np.ndarray  #: its centre, a demagnetizing field -H [A/m]

    @cached_property
    def _knee_constants(self):
        # the knee term A·(L(u) - L(0))/(L(HcJ) - L(0)) with L the logistic step, constants hoisted
        at_zero = expit(-self.centre / self.width)
        scale = self.amplitude / (expit((self.coercivity_hcj - self.centre) / self.width) - at_zero)
        return 1.0 / self.width, self.centre / self.width, scale, scale * at_zero

    @shared_parameters(CURVE_PARAMETERS)
    def polarization(self, field_strength: float | np.ndarray):
        """Intrinsic curve J(H), floored at -Br far beyond -HcJ, where the model is no longer used.

        Returns
        -------
        ndarray
            Polarization J [T].

        References
        ----------
        .. [1] the project's own curve model (module docstring)
        """
        inverse_width, centre_over_width, scale, shift = self._knee_constants
        step = expit(-field_strength * inverse_width - centre_over_width)
        j = self.remanence + self.recoil_slope * field_strength - (scale * step - shift)
        return np.maximum(j, -self.remanence)

    @shared_parameters(CURVE_PARAMETERS)
    def flux_density(self, field_strength: float | np.ndarray):
        """Normal curve B(H) = μ0·H + J(H).

        Returns
        -------
        ndarray
            Flux density B [T].

        References
        ----------
        .. [1] IEC 60404-5 (B = μ0·H + J, the relation between the normal and intrinsic curves)
        """
        return MU_0 * field_strength + self.polarization(field_strength)

    def recoil_flux_density(self, field_strength: float | np.ndarray):
        """The straight recoil line B = Br + μ0·μrec·H, the normal curve without its knee.

        Parameters
        ----------
        field_strength : float or ndarray
            H in the magnet [A/m]; the line is the curve only while H stays short of the knee.

        Returns
        -------
        float or ndarray
            B on the recoil line [T].
        """
        return self.remanence + (MU_0 + self.recoil_slope) * field_strength


def grade_lots(grades) -> GradeLots:
    """The lots of a sequence of grades, as arrays (each distinct grade's knee fitted once, all in one scan).

    Parameters
    ----------
    grades : sequence of MagnetGrade
        One per lot.

    Returns
    -------
    GradeLots
        Arrays of ``len(grades)``.
    """
    distinct = list(dict.fromkeys(grades))
    shapes = {grade: (shape.centre_ratio, shape.width_ratio)
              for grade, shape in zip(distinct, knee_shapes(distinct), strict=True)}

    def column(read) -> np.ndarray:
        return np.array([read(grade) for grade in grades], dtype=float)

    return GradeLots(column(lambda g: g.remanence), column(lambda g: g.coercivity_hcj),
                     column(lambda g: g.remanence_temp_coeff), column(lambda g: g.coercivity_temp_coeff),
                     column(lambda g: g.recoil_permeability), column(lambda g: shapes[g][0]),
                     column(lambda g: shapes[g][1]))


def _shape_of(grade: MagnetGrade | GradeLots):
    """The knee's shape: fitted to a grade (cached), or the lots' own."""
    return grade if isinstance(grade, GradeLots) else knee_shape(grade)


def curve_at(grade: MagnetGrade | GradeLots, temperature_C: float | np.ndarray) -> CurveAtTemperature:
    """The curve model's constants at a temperature, for repeated lookups of J(H) and B(H).

    Parameters
    ----------
    grade : MagnetGrade or GradeLots
        Br and HcJ at 20 °C with their coefficients, μrec and the squareness the knee is fitted to (or
        many lots, broadcasting with ``temperature_C``).
    temperature_C : float or ndarray
        Magnet temperature [°C]; an array gives a curve whose constants are arrays (they broadcast).

    Returns
    -------
    CurveAtTemperature
        Br(T), HcJ(T), the recoil slope, the knee amplitude, width and centre.

    Raises
    ------
    GradeDataError
        If the grade's squareness cannot be reached (see :func:`core.magnet_knee.knee_shape`).
    """
    br = remanence_at(grade, temperature_C)
    hcj = intrinsic_coercivity_at(grade, temperature_C)
    recoil_slope = MU_0 * (grade.recoil_permeability - 1.0)
    shape = _shape_of(grade)
    return CurveAtTemperature(br, hcj, recoil_slope, br - recoil_slope * hcj, shape.width_ratio * hcj,
                              shape.centre_ratio * hcj)


@shared_parameters(CURVE_PARAMETERS)
def polarization(grade: MagnetGrade, field_strength: float | np.ndarray,
                 temperature_C: float | np.ndarray):
    """Intrinsic curve J(H) of a grade at a temperature, for a single lookup.

    Many lookups at one temperature take :func:`curve_at` once and call its
    :meth:`CurveAtTemperature.polarization`, which this calls.

    Returns
    -------
    ndarray
        J [T], floored at -Br as the method floors it.

    References
    ----------
    .. [1] module docstring: the project's own curve model
    """
    return curve_at(grade, temperature_C).polarization(field_strength)


@shared_parameters(CURVE_PARAMETERS)
def flux_density(grade: MagnetGrade, field_strength: float | np.ndarray,
                 temperature_C: float | np.ndarray):
    """Normal curve B(H) = μ0·H + J(H) of a grade at a temperature; as :func:`polarization`, a
    single lookup through :meth:`CurveAtTemperature.flux_density`.

    Returns
    -------
    ndarray
        B [T], on the normal curve of ``grade`` at ``temperature_C``.

    References
    ----------
    .. [1] the project's own curve model (module docstring); B = μ0·H + J as in IEC 60404-5
    """
    return curve_at(grade, temperature_C).flux_density(field_strength)


__all__ = [
    "FAMILIES", "KNEE_LOSS_FRACTION", "REFERENCE_TEMPERATURE_C", "CurveAtTemperature", "GradeDataError", "GradeLots",
    "MagnetGrade", "curve_at", "flux_density", "grade_lots", "intrinsic_coercivity_at", "knee_field_at",
    "model_temperature_range_C", "model_temperature_ranges_C", "polarization", "remanence_at",
    "require_ambient_inside_model", "squareness_field_at",
]
