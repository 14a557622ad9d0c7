"""Permanent-magnet grades and their demagnetization curves at any temperature.

Model
-----
The intrinsic (polarization) curve in the second quadrant is a straight recoil line with a knee that
drops it to zero at H = -HcJ:

    J(H) = Jr(H) - A · (exp((u - HcJ)/h) - exp(-HcJ/h)) / (1 - exp(-HcJ/h)),   u = -H,
    Jr(H) = Br + μ0 (μrec - 1) H,      A = Jr(-HcJ),

so that J(0) = Br, J(-HcJ) = 0 and the slope at small fields is the recoil slope. The knee width ``h``
is fixed once per grade so that J(-Hk) = 0.9 Br at the reference temperature, with Hk = squareness · HcJ
(the 0.9 Br definition of Hk is the industry's, from memory of IEC 60404-5 and MMPA 0100-00); ``h/HcJ``
is then held constant, so the knee keeps its shape as HcJ moves with temperature. The normal curve is
B(H) = μ0 H + J(H).

Temperature: Br(T) = Br20 (1 + α (T - 20 °C)) and HcJ(T) = HcJ20 (1 + β (T - 20 °C)), the reversible
coefficients as suppliers state them (IEC 60404-8-1 gives them per grade family). Hard ferrite has
β > 0, so its knee moves toward the operating region when cold; NdFeB has β < 0 and loses its knee
margin when hot.

The knee reported for the demagnetization checks is the onset of irreversible loss: the field at which
J has fallen 1 % of Br(T) below its recoil line (see ``knee_field_at``); Hk itself is kept for reference.

The curve model (the recoil line with its exponential knee, and the 1 % knee) is this project's own
construction to fit a grade's data sheet values; it is not taken from a publication.

References
----------
.. [1] IEC 60404-5, Magnetic materials, part 5: permanent magnet (magnetically hard) materials, methods
   of measurement of magnetic properties (the quantities Br, HcB, HcJ, (BH)max, μrec).
.. [2] IEC 60404-8-1, Magnetic materials, part 8-1: specifications for individual materials,
   magnetically hard materials (grade families and their reversible temperature coefficients).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property, lru_cache

import numpy as np
from scipy.optimize import brentq

from .errors import MagneticCircuitError
from .solvers import find_root
from .units import MU_0

REFERENCE_TEMPERATURE_C = 20.0

FAMILIES = (
    "sintered NdFeB",
    "bonded NdFeB",
    "SmCo 1:5",
    "SmCo 2:17",
    "hard ferrite, isotropic",
    "hard ferrite, anisotropic",
    "AlNiCo",
)

_MAX_EXPONENT = 50.0  # keeps exp() finite far past the knee, where the curve is never used


@dataclass(frozen=True)
class MagnetGrade:
    """A magnet grade's typical properties at 20 °C, in SI units.

    Equality and hashing ignore ``custom``, so a user's copy of a built-in grade is the same grade.
    """

    name: str  #: the grade designation, e.g. "Y30BH"
    family: str  #: one of :data:`FAMILIES`
    remanence: float  #: Br [T]
    coercivity_hcb: float  #: HcB, normal coercivity [A/m], positive
    coercivity_hcj: float  #: HcJ, intrinsic coercivity [A/m], positive
    energy_product: float  #: (BH)max [J/m³]
    recoil_permeability: float  #: μrec, relative [1]
    squareness: float  #: Hk/HcJ [1]
    remanence_temp_coeff: float  #: α of Br [1/K], reversible
    coercivity_temp_coeff: float  #: β of HcJ [1/K], reversible
    max_working_temperature_C: float  #: supplier's maximum working temperature [°C]
    density: float  #: [kg/m³]
    source: str = ""  #: where the values come from ("from memory" where they are recalled)
    custom: bool = field(default=False, compare=False)  #: a user's grade rather than a built-in one

    @cached_property
    def knee_width_ratio(self) -> float:
        """Knee width over HcJ, h/HcJ [1], fixed so that J(-Hk) = 0.9·Br at 20 °C (raises ValueError if
        the squareness cannot be reached with this recoil permeability)."""
        br, hcj, hk = self.remanence, self.coercivity_hcj, self.squareness * self.coercivity_hcj
        recoil_slope = MU_0 * (self.recoil_permeability - 1.0)
        j_recoil_at_hk = br - recoil_slope * hk
        if j_recoil_at_hk <= 0.9 * br:
            raise ValueError(
                f"magnet grade {self.name!r}: squareness {self.squareness:g} is too low for its recoil "
                f"permeability {self.recoil_permeability:g}; the recoil line alone falls below 0.9·Br "
                "before Hk (raise squareness or lower recoil_permeability)"
            )
        amplitude = br - recoil_slope * hcj

        def miss(ratio: float) -> float:
            return float(_knee_drop(hk, hcj, amplitude, ratio * hcj)) - (j_recoil_at_hk - 0.9 * br)

        return float(brentq(miss, 1e-4, 10.0, xtol=1e-14))


def remanence_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """Remanence at a temperature, Br(T) = Br20·(1 + α·(T - 20 °C)), with the reversible coefficient α.

    Parameters
    ----------
    grade : MagnetGrade
        The grade, with Br at 20 °C and α.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    float or ndarray
        Br [T].

    References
    ----------
    .. [1] IEC 60404-8-1 (the linear reversible temperature coefficient, stated per grade family).
    """
    return grade.remanence * (1.0 + grade.remanence_temp_coeff * (temperature_C - REFERENCE_TEMPERATURE_C))


def intrinsic_coercivity_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """Intrinsic coercivity at a temperature, HcJ(T) = HcJ20·(1 + β·(T - 20 °C)).

    β is positive for hard ferrite (its knee moves in when cold) and negative for NdFeB and SmCo.

    Parameters
    ----------
    grade : MagnetGrade
        The grade, with HcJ at 20 °C and β.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    float or ndarray
        HcJ [A/m], positive.

    References
    ----------
    .. [1] IEC 60404-8-1 (the linear reversible temperature coefficient, stated per grade family).
    """
    return grade.coercivity_hcj * (
        1.0 + grade.coercivity_temp_coeff * (temperature_C - REFERENCE_TEMPERATURE_C)
    )


@lru_cache(maxsize=256)
def model_temperature_range_C(grade: MagnetGrade) -> tuple[float, float]:  # noqa: N802 - unit suffix (°C)
    """Temperatures between which the curve model means something.

    The bound is ours: the linear reversible coefficients keep Br and HcJ above a quarter of their 20 °C
    values, and the recoil line still stands clear of zero at -HcJ (A = Br - μ0·(μrec - 1)·HcJ at
    least 5 % of Br), so the knee exists.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.

    Returns
    -------
    tuple of float
        Lowest and highest temperature [°C], on a 0.5 K grid, of the interval around 20 °C where the
        bound holds.

    References
    ----------
    .. [1] the project's own bound on its curve model (no published source)
    """
    temperatures = np.arange(-273.0, 1000.5, 0.5)
    br = remanence_at(grade, temperatures)
    hcj = intrinsic_coercivity_at(grade, temperatures)
    amplitude = br - MU_0 * (grade.recoil_permeability - 1.0) * hcj
    valid = (br > 0.25 * grade.remanence) & (hcj > 0.25 * grade.coercivity_hcj) & (amplitude > 0.05 * br)
    reference = int(np.searchsorted(temperatures, REFERENCE_TEMPERATURE_C))
    low_index = reference
    while low_index > 0 and valid[low_index - 1]:
        low_index -= 1
    high_index = reference
    while high_index < temperatures.size - 1 and valid[high_index + 1]:
        high_index += 1
    return float(temperatures[low_index]), float(temperatures[high_index])


#: The knee used by the demagnetization checks: where the intrinsic curve has fallen this fraction of
#: Br(T) below its recoil line. An operating point driven there and released comes back about this much
#: weaker. (Our definition; the trade's Hk, where J = 0.9·Br, lies further out, at about 5 % of loss for
#: a square sintered grade, which is too late for a safety check.)
KNEE_LOSS_FRACTION = 0.01


def knee_field_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """The knee: the field at which the intrinsic curve has fallen ``KNEE_LOSS_FRACTION``·Br(T) below
    its recoil line, the onset of irreversible loss.

    With the knee term A'·(exp((u - HcJ)/h) - exp(-HcJ/h)) of the model (A' = A/(1 - exp(-HcJ/h))),
    u_knee = HcJ + h·ln(k·Br/A' + exp(-HcJ/h)), in closed form.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    ndarray
        The knee field H [A/m], negative (a 0-d array for a scalar temperature).

    References
    ----------
    .. [1] the project's own definition on its own curve model (module docstring); no published source
    """
    curve = curve_at(grade, np.asarray(temperature_C, dtype=float))
    _, _, scale, shift = curve._knee_constants
    offset = shift / scale
    knee_depth = curve.coercivity_hcj + curve.width * np.log(KNEE_LOSS_FRACTION * curve.remanence / scale + offset)
    return -knee_depth


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


def _knee_drop(demag_field, hcj, amplitude, width):
    """The knee term of the intrinsic curve at demagnetizing field ``demag_field`` = -H >= 0."""
    exponent = np.minimum((demag_field - hcj) / width, _MAX_EXPONENT)
    offset = np.exp(-hcj / width)
    return amplitude * (np.exp(exponent) - offset) / (1.0 - offset)


@dataclass(frozen=True)
class CurveAtTemperature:
    """The constants of the curve model at one temperature, for repeated lookups.

    Fields are floats for one temperature or arrays for several (they broadcast with the field).
    """

    remanence: float | np.ndarray  #: Br(T) [T]
    coercivity_hcj: float | np.ndarray  #: HcJ(T) [A/m]
    recoil_slope: float  #: μ0·(μrec - 1) [T·m/A]
    amplitude: float | np.ndarray  #: A = Jr(-HcJ) [T]
    width: float | np.ndarray  #: knee width h [A/m]

    @cached_property
    def _knee_constants(self):
        # the knee term rewritten as scale·exp(u/h - HcJ/h) - scale·exp(-HcJ/h), constants hoisted
        offset = np.exp(-self.coercivity_hcj / self.width)
        scale = self.amplitude / (1.0 - offset)
        return 1.0 / self.width, self.coercivity_hcj / self.width, scale, scale * offset

    def polarization(self, field_strength: float | np.ndarray):
        """Intrinsic curve J(H), floored at -Br far beyond -HcJ, where the model is no longer used.

        Parameters
        ----------
        field_strength : float or ndarray
            Field strength H in the magnet [A/m], negative in the second quadrant.

        Returns
        -------
        ndarray
            Polarization J [T].

        References
        ----------
        .. [1] the project's own curve model (module docstring)
        """
        inverse_width, hcj_over_width, scale, shift = self._knee_constants
        exponent = np.minimum(-field_strength * inverse_width - hcj_over_width, _MAX_EXPONENT)
        j = self.remanence + self.recoil_slope * field_strength - (scale * np.exp(exponent) - shift)
        return np.maximum(j, -self.remanence)

    def flux_density(self, field_strength: float | np.ndarray):
        """Normal curve B(H) = μ0·H + J(H).

        Parameters
        ----------
        field_strength : float or ndarray
            Field strength H in the magnet [A/m].

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
            Field strength H in the magnet [A/m].

        Returns
        -------
        float or ndarray
            Flux density B [T].
        """
        return self.remanence + (MU_0 + self.recoil_slope) * field_strength


def curve_at(grade: MagnetGrade, temperature_C: float | np.ndarray) -> CurveAtTemperature:
    """The curve model's constants at a temperature, for repeated lookups of J(H) and B(H).

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    CurveAtTemperature
        Br(T), HcJ(T), the recoil slope, the knee amplitude and width.

    Raises
    ------
    ValueError
        If the grade's squareness cannot be reached (see :attr:`MagnetGrade.knee_width_ratio`).
    """
    br = remanence_at(grade, temperature_C)
    hcj = intrinsic_coercivity_at(grade, temperature_C)
    recoil_slope = MU_0 * (grade.recoil_permeability - 1.0)
    return CurveAtTemperature(br, hcj, recoil_slope, br - recoil_slope * hcj, grade.knee_width_ratio * hcj)


def polarization(grade: MagnetGrade, field_strength: float | np.ndarray,
                 temperature_C: float | np.ndarray):
    """Intrinsic curve J(H) of a grade at a temperature.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    field_strength : float or ndarray
        Field strength H in the magnet [A/m].
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    ndarray
        Polarization J [T].

    References
    ----------
    .. [1] the project's own curve model (module docstring)
    """
    return curve_at(grade, temperature_C).polarization(field_strength)


def flux_density(grade: MagnetGrade, field_strength: float | np.ndarray,
                 temperature_C: float | np.ndarray):
    """Normal curve B(H) = μ0·H + J(H) of a grade at a temperature.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    field_strength : float or ndarray
        Field strength H in the magnet [A/m].
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    ndarray
        Flux density B [T].

    References
    ----------
    .. [1] the project's own curve model (module docstring); B = μ0·H + J as in IEC 60404-5
    """
    return curve_at(grade, temperature_C).flux_density(field_strength)


def normal_coercivity_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """The model's normal coercivity HcB at a temperature: where its normal curve crosses B = 0.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    temperature_C : float or ndarray
        Magnet temperature [°C].

    Returns
    -------
    float or ndarray
        HcB [A/m], positive (a float for a scalar temperature, cached per grade and temperature).
    """
    if np.ndim(temperature_C) == 0:
        return _normal_coercivity_cached(grade, float(temperature_C))
    return _normal_coercivity(grade, np.asarray(temperature_C, dtype=float))


@lru_cache(maxsize=256)
def _normal_coercivity_cached(grade: MagnetGrade, temperature_C: float) -> float:
    return float(_normal_coercivity(grade, np.asarray(temperature_C)))


def _normal_coercivity(grade: MagnetGrade, temperature_C):
    hcj = intrinsic_coercivity_at(grade, temperature_C)
    result = find_root(lambda h: flux_density(grade, h, temperature_C), -hcj, np.zeros_like(hcj))
    return -result.root


def energy_product_of_curve(grade: MagnetGrade, temperature_C: float, samples: int = 4001) -> float:
    """Maximum energy product (BH)max of the model's normal curve, by dense sampling of -B·H.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    temperature_C : float
        Magnet temperature [°C].
    samples : int, optional
        Points from -HcB to 0 [1]; 4001 puts the sampling error well below 1e-6 of the maximum.

    Returns
    -------
    float
        (BH)max [J/m³].
    """
    hcb = float(normal_coercivity_at(grade, temperature_C))
    h = np.linspace(-hcb, 0.0, samples)
    return float(np.max(-h * flux_density(grade, h, temperature_C)))


def linear_energy_product(remanence: float | np.ndarray,
                          recoil_permeability: float | np.ndarray):
    """(BH)max of a straight normal curve, Br²/(4·μ0·μrec).

    Parameters
    ----------
    remanence : float or ndarray
        Br [T].
    recoil_permeability : float or ndarray
        Relative recoil permeability μrec [1].

    Returns
    -------
    float or ndarray
        (BH)max [J/m³], at B = Br/2.

    References
    ----------
    .. [1] P. Campbell, "Permanent Magnet Materials and their Application", Cambridge University
       Press, 1994, ch. 2 (maximum of -B·H on a straight line from Br to HcB = Br/(μ0·μrec); chapter
       from memory).
    """
    return remanence**2 / (4.0 * MU_0 * recoil_permeability)


@dataclass(frozen=True)
class DemagnetizationCurves:
    """Second-quadrant curves of one grade at one temperature, as plot data (SI)."""

    temperature_C: float  #: magnet temperature [°C]
    field_strength: np.ndarray  #: H [A/m]
    flux_density: np.ndarray  #: normal curve B [T]
    polarization: np.ndarray  #: intrinsic curve J [T]
    knee_field: float  #: the knee of :func:`knee_field_at` (onset of irreversible loss), negative [A/m]
    knee_flux_density: float  #: B at the knee [T]
    remanence: float  #: Br [T]
    coercivity_hcj: float  #: HcJ [A/m]


def demagnetization_curves(grade: MagnetGrade, temperature_C: float, samples: int = 300,
                           field_min: float | None = None) -> DemagnetizationCurves:
    """Second-quadrant normal and intrinsic curves of a grade at a temperature, for charts.

    Parameters
    ----------
    grade : MagnetGrade
        The grade.
    temperature_C : float
        Magnet temperature [°C].
    samples : int, optional
        Points on each curve [1].
    field_min : float, optional
        A field that must lie on the curves' range [A/m], negative: the curves then start at 1.05 times
        it when that is further out than -1.1·HcJ (so every operating point drawn lies on a curve).

    Returns
    -------
    DemagnetizationCurves
        H from the start to 0 [A/m], B and J [T], the knee, Br and HcJ at the temperature.
    """
    hcj = float(intrinsic_coercivity_at(grade, temperature_C))
    start = -1.1 * hcj if field_min is None else min(-1.1 * hcj, 1.05 * field_min)
    h = np.linspace(start, 0.0, samples)
    knee = float(knee_field_at(grade, temperature_C))
    return DemagnetizationCurves(
        temperature_C=float(temperature_C),
        field_strength=h,
        flux_density=flux_density(grade, h, temperature_C),
        polarization=polarization(grade, h, temperature_C),
        knee_field=knee,
        knee_flux_density=float(flux_density(grade, knee, temperature_C)),
        remanence=float(remanence_at(grade, temperature_C)),
        coercivity_hcj=hcj,
    )


def require_ambient_inside_model(grade: MagnetGrade, ambient_min_C: float, ambient_max_C: float) -> None:
    """Refuse an ambient range that reaches past where the grade's temperature coefficients hold.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    ambient_min_C, ambient_max_C : float
        The ambient range [°C].

    Raises
    ------
    MagneticCircuitError
        Naming the range and the grade's model range (:func:`model_temperature_range_C`).
    """
    low_C, high_C = model_temperature_range_C(grade)
    if not (low_C < ambient_min_C and ambient_max_C < high_C):
        raise MagneticCircuitError(
            f"the ambient range {ambient_min_C:g} to {ambient_max_C:g} °C is outside the range where "
            f"{grade.name}'s temperature coefficients hold ({low_C:.0f} to {high_C:.0f} °C)")
