"""Permanent-magnet grades: their typical data at 20 °C and how Br and HcJ move with temperature.

Temperature: Br(T) = Br20 (1 + α (T - 20 °C)) and HcJ(T) = HcJ20 (1 + β (T - 20 °C)), the reversible
coefficients as suppliers state them (IEC 60404-8-1 gives them per grade family). Hard ferrite has
β > 0, so its knee moves toward the operating region when cold; NdFeB has β < 0 and loses its knee
margin when hot. The demagnetization curves built from these are in :mod:`magnets`.

References
----------
.. [1] IEC 60404-5, Magnetic materials, part 5: permanent magnet (magnetically hard) materials, methods
   of measurement of magnetic properties (the quantities Br, HcB, HcJ, (BH)max, μrec).
.. [2] IEC 60404-8-1, Magnetic materials, part 8-1: specifications for individual materials,
   magnetically hard materials (grade families and their reversible temperature coefficients).
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from functools import lru_cache

import numpy as np

from .errors import MagneticCircuitError
from .units import MU_0

REFERENCE_TEMPERATURE_C = 20.0

#: The grade families this tool models.
FAMILIES = (
    "sintered NdFeB",
    "bonded NdFeB",
    "SmCo 1:5",
    "SmCo 2:17",
    "hard ferrite, isotropic",
    "hard ferrite, anisotropic",
)

#: Families the project file may name but the tool refuses for radial-arc brushed DC motors, and why.
REFUSED_FAMILIES = {
    "AlNiCo": (
        "AlNiCo is refused for radial-arc brushed DC motors: its HcJ (about 50-130 kA/m) is no larger than "
        "the field the armature reaction puts on the magnet tips at stall or reversal, so it demagnetizes in "
        "service unless it is magnetized in the assembled motor and stabilized below its working point, and "
        "its recoil lines then start from that working point, not from Br, which this tool's curve model does "
        "not follow "
        "(P. Campbell, Permanent Magnet Materials and their Application, Cambridge University Press, "
        "1994, on AlNiCo's low coercivity and recoil from the working point, from memory); choose a hard "
        "ferrite or a rare-earth grade"),
}


class GradeDataError(ValueError):
    """A grade whose data no curve of the model can follow; the message names the grade and the key.

    Parameters
    ----------
    message : str
        One line for the user: the grade, the values that disagree and what to change.
    key : str
        The grade-table key to change (``"squareness"``, ``"coercivity_HcB_kA_per_m"``, ...).
    """

    def __init__(self, message: str, key: str) -> None:
        super().__init__(message)
        self.key = key


def require_modelled_family(name: str, family: str) -> None:
    """Refuse a grade of a family in :data:`REFUSED_FAMILIES`, saying why.

    Parameters
    ----------
    name : str
        The grade's name, for the message.
    family : str
        The grade's family.

    Raises
    ------
    GradeDataError
        With key ``"family"``, for a refused family.

    References
    ----------
    .. [1] P. Campbell, "Permanent Magnet Materials and their Application", Cambridge University Press,
       1994 (AlNiCo's low coercivity and its recoil from the working point; from memory).
    """
    if family in REFUSED_FAMILIES:
        raise GradeDataError(f"magnet grade {name!r}: family = {family!r}: {REFUSED_FAMILIES[family]}",
                             key="family")


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
    price_per_kg: float | None = None  #: typical price of the finished magnet [price_currency/kg], from memory
    price_currency: str = "EUR"  #: currency of ``price_per_kg``
    custom: bool = field(default=False, compare=False)  #: a user's grade rather than a built-in one


@dataclass(frozen=True)
class GradeLots:
    """Many magnet lots at once, what the curve model reads of each: one array per grade value, one entry
    per lot (a grade family whose lots differ in Br and HcJ, or any grades: nothing here is shared).

    The temperature functions (:func:`remanence_at`, :func:`intrinsic_coercivity_at`, and
    :func:`core.magnets.knee_field_at` and :func:`core.magnets.curve_at`) take it in place of a grade and
    give one value per lot; :func:`core.magnets.grade_lots` makes it from grades.
    """

    remanence: np.ndarray  #: Br at 20 °C [T]
    coercivity_hcj: np.ndarray  #: HcJ at 20 °C [A/m]
    remanence_temp_coeff: np.ndarray  #: α [1/K]
    coercivity_temp_coeff: np.ndarray  #: β [1/K]
    recoil_permeability: np.ndarray  #: μrec [1]
    centre_ratio: np.ndarray  #: each lot's knee centre over HcJ (:func:`core.magnet_knee.knee_shape`) [1]
    width_ratio: np.ndarray  #: its width over HcJ [1]

    def at(self, rows) -> GradeLots:
        """The lots ``rows`` picks (an index array, repeats allowed).

        Parameters
        ----------
        rows : ndarray of int
            Which lots, in order.

        Returns
        -------
        GradeLots
            Arrays of ``len(rows)``.
        """
        return GradeLots(**{f.name: getattr(self, f.name)[rows] for f in fields(self)})


def remanence_at(grade: MagnetGrade | GradeLots, temperature_C: float | np.ndarray):
    """Remanence at a temperature, Br(T) = Br20·(1 + α·(T - 20 °C)), with the reversible coefficient α.

    Parameters
    ----------
    grade : MagnetGrade or GradeLots
        The grade, with Br at 20 °C and α (or many lots, broadcasting with ``temperature_C``).
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
    return _reversible(grade.remanence, grade.remanence_temp_coeff, temperature_C)


def intrinsic_coercivity_at(grade: MagnetGrade | GradeLots, temperature_C: float | np.ndarray):
    """Intrinsic coercivity at a temperature, HcJ(T) = HcJ20·(1 + β·(T - 20 °C)).

    β is positive for hard ferrite (its knee moves in when cold) and negative for NdFeB and SmCo.

    Parameters
    ----------
    grade : MagnetGrade or GradeLots
        Its HcJ at 20 °C and β (or many lots, broadcasting with ``temperature_C``).
    temperature_C : float or ndarray
        Magnet temperature [°C] (cold is the worst case for ferrite, hot for NdFeB).

    Returns
    -------
    float or ndarray
        HcJ [A/m], positive.

    References
    ----------
    .. [1] IEC 60404-8-1: the same linear reversible law as Br's (:func:`remanence_at`), with β.
    """
    return _reversible(grade.coercivity_hcj, grade.coercivity_temp_coeff, temperature_C)


def _reversible(value_at_reference: float | np.ndarray, coefficient: float | np.ndarray,
                temperature_C: float | np.ndarray):
    # value·(1 + coefficient·(T - 20 °C)): the linear reversible law of IEC 60404-8-1, for Br and for HcJ
    return value_at_reference * (1.0 + coefficient * (temperature_C - REFERENCE_TEMPERATURE_C))


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
    def one(value: float) -> np.ndarray:
        return np.array([value], dtype=float)

    low, high = model_temperature_ranges_C(GradeLots(
        one(grade.remanence), one(grade.coercivity_hcj), one(grade.remanence_temp_coeff),
        one(grade.coercivity_temp_coeff), one(grade.recoil_permeability), centre_ratio=one(np.nan),
        width_ratio=one(np.nan)))  # the range does not read the knee
    return float(low[0]), float(high[0])


def model_temperature_ranges_C(lots: GradeLots) -> tuple[np.ndarray, np.ndarray]:  # noqa: N802 - unit suffix
    """:func:`model_temperature_range_C` of many lots at once (their knees are not read).

    Parameters
    ----------
    lots : GradeLots
        The lots, (L,).

    Returns
    -------
    tuple of ndarray
        Lowest and highest temperature of each [°C], (L,).

    References
    ----------
    .. [1] the project's own bound on its curve model (no published source)
    """
    temperatures = np.arange(-273.0, 1000.5, 0.5)
    column = {name: np.asarray(getattr(lots, name), dtype=float)[:, None] for name in (
        "remanence", "coercivity_hcj", "remanence_temp_coeff", "coercivity_temp_coeff", "recoil_permeability")}
    br = _reversible(column["remanence"], column["remanence_temp_coeff"], temperatures)
    hcj = _reversible(column["coercivity_hcj"], column["coercivity_temp_coeff"], temperatures)
    amplitude = br - MU_0 * (column["recoil_permeability"] - 1.0) * hcj
    valid = (br > 0.25 * column["remanence"]) & (hcj > 0.25 * column["coercivity_hcj"]) & (amplitude > 0.05 * br)
    reference = int(np.searchsorted(temperatures, REFERENCE_TEMPERATURE_C))
    # from 20 °C outwards while the bound holds: down to just above the last failure below 20 °C, up to
    # just below the first failure above it (the ends of the grid where there is none)
    below, above = ~valid[:, :reference], ~valid[:, reference + 1:]
    last_failure = np.where(below.any(axis=1), reference - 1 - np.argmax(below[:, ::-1], axis=1), -1)
    first_failure = np.where(above.any(axis=1), reference + 1 + np.argmax(above, axis=1), temperatures.size)
    return temperatures[last_failure + 1], temperatures[first_failure - 1]


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


def magnet_price_per_kg(project_price: float | None, currency: str, grade: MagnetGrade) -> float:
    """The magnet material's price: the project's where it gives one, else the grade's library price.

    The project's price wins because it is the user's quotation; the library's is a typical figure from
    memory (rare-earth prices move by a factor of two within a year). A comparison that gives design B
    another grade drops A's project price (:func:`core.difference.with_grade`), so B is priced as its own
    grade.

    Parameters
    ----------
    project_price : float or None
        ``prices.magnet_per_kg`` of the project [currency/kg], None when the project leaves it out.
    currency : str
        The project's currency (``prices.currency``).
    grade : MagnetGrade
        The grade, with its typical ``price_per_kg`` in ``price_currency`` (None for a grade without one).

    Returns
    -------
    float
        The price [currency/kg].

    Raises
    ------
    ValueError
        Naming ``prices.magnet_per_kg`` when the project gives no price and the grade has none, or has
        one in another currency (no exchange rate is assumed).

    References
    ----------
    .. [1] the grades' prices are typical bulk prices, from memory (core/data/magnets.toml).
    """
    if project_price is not None:
        return project_price
    if grade.price_per_kg is None:
        raise ValueError(f"prices.magnet_per_kg is not given and grade {grade.name!r} has no price of its own: "
                         "give the magnet material's price per kg")
    if grade.price_currency != currency:
        raise ValueError(f"prices.magnet_per_kg is not given and grade {grade.name!r} is priced in "
                         f"{grade.price_currency}, the project in {currency}: give the magnet material's price "
                         f"per kg in {currency}")
    return grade.price_per_kg
