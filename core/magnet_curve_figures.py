"""What a grade's modelled curve gives beyond itself: its HcB and (BH)max, and its curves as plot data.

:func:`normal_coercivity_at` and :func:`energy_product_of_curve` read the model's HcB and (BH)max off the
normal curve of :mod:`core.magnets` (the grade check compares them with the grade's data,
:mod:`core.magnet_grade_check`); :func:`demagnetization_curves` samples the normal and intrinsic curves
of one temperature for the magnet chart.

References
----------
.. [1] IEC 60404-5: the normal and intrinsic demagnetization curves, B = μ0·H + J, HcB where B = 0 and
   (BH)max the largest -B·H on the normal curve.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from .magnet_grades import MagnetGrade, intrinsic_coercivity_at, remanence_at
from .magnets import flux_density, knee_field_at, polarization
from .solvers import find_root
from .units import MU_0


def normal_coercivity_at(grade: MagnetGrade, temperature_C: float | np.ndarray):
    """The model's normal coercivity HcB at a temperature: where its normal curve crosses B = 0.

    Parameters
    ----------
    grade : MagnetGrade
        The grade; its stored HcB is the data the model is checked against, not used here.
    temperature_C : float or ndarray
        Magnet temperature [°C], one root found per temperature.

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
        The grade, whose stored (BH)max this is checked against (:mod:`magnet_grade_check`).
    temperature_C : float
        The one magnet temperature [°C].
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
        The grade to draw.
    temperature_C : float
        Magnet temperature [°C] of this pair of curves (a chart draws one pair per case).
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


__all__ = ["DemagnetizationCurves", "demagnetization_curves", "energy_product_of_curve", "linear_energy_product",
           "normal_coercivity_at"]
