"""The knee of a grade's intrinsic curve: its shape, and its fit to the grade's data at 20 °C.

Shape
-----
Below its recoil line the intrinsic curve loses the fraction F(x) of the amplitude A = Jr(-HcJ), with
x = -H/HcJ the demagnetizing field in units of HcJ, F(0) = 0 and F(1) = 1 (so that J(-HcJ) = 0):

    F(x) = (L(x) - L(0)) / (L(1) - L(0)),   L(x) = 1 / (1 + exp(-(x - c)/w)),

a logistic step of centre c and width w, both in units of HcJ and held constant with temperature, so
the knee keeps its shape as HcJ moves. Two parameters, because the data pin two points of the knee:
Hk (J = 0.9·Br at -Hk, Hk = squareness·HcJ) and, wherever the stored HcB lies on the knee, HcB itself
(J = μ0·HcB at -HcB). With the centre far beyond HcJ (c = 1 + 30·w) the step is, to 1e-13, the pure
exponential exp((x - 1)/w) that a one-parameter knee would be; the fit uses it when only Hk pins the knee.
F rises with x for every c and w, so J is monotone whatever the fit.

Which points pin the knee: if the stored HcB lies more than ``KNEE_LOSS_FRACTION``·Br below the recoil
line (the knee has begun before B reaches zero), the knee is fitted through Hk and HcB; otherwise HcB
lies on the recoil line, Br/(μ0·μrec) sets it and the knee through Hk alone. Where the two-point fit has
no solution (a rounded knee a single step cannot follow), the exponential through Hk is kept and the
grade's check (:func:`core.magnets.require_faithful_curve`) decides whether HcB is still close enough.

The recoil permeability is the stored μrec, never a value fitted to HcB: the magnetic circuit, the
demagnetization checks and the field solution all use ``grade.recoil_permeability``, and one grade must
have one recoil line. A grade whose stored μrec and HcB disagree is therefore refused, not bent.

References
----------
.. [1] IEC 60404-5 (Br, HcB, HcJ, (BH)max, μrec and their measurement); the 0.9·Br definition of Hk,
   from memory of IEC 60404-5 and MMPA 0100-00.
.. [2] the logistic-step knee is this project's own construction to pass through the data sheet's
   points; it is not taken from a publication.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from scipy.optimize import brentq
from scipy.special import expit, logit

from .magnet_grades import GradeDataError, MagnetGrade
from .solvers import find_root
from .units import MU_0

#: The knee used by the demagnetization checks: where the intrinsic curve has fallen this fraction of
#: Br(T) below its recoil line. An operating point driven there and released comes back about this much
#: weaker. (Our definition; the trade's Hk, where J = 0.9·Br, lies further out, at about 5 % of loss for
#: a square sintered grade, which is too late for a safety check.)
KNEE_LOSS_FRACTION = 0.01

#: Centre of the exponential-limit step beyond HcJ, in knee widths: L then differs from a pure
#: exponential by exp(-30) ≈ 1e-13 of itself over the whole second quadrant.
EXPONENTIAL_LIMIT_WIDTHS = 30.0

#: A knee through Hk and HcB that has lost 90 % of its amplitude by this x = -H/HcJ is refused: the data
#: then describe a curve whose polarization is gone long before HcJ (our bound, no published source).
COLLAPSE_CHECK_RATIO = 0.8

_WIDTH_SCAN = np.geomspace(1e-4, 3.0, 60)  #: knee widths tried by the two-point fit [units of HcJ]


@dataclass(frozen=True)
class KneeShape:
    """The knee's centre and width in units of HcJ, and which data fixed them."""

    centre_ratio: float  #: c, the logistic step's centre over HcJ [1]
    width_ratio: float  #: w, its width over HcJ [1]
    through_hcb: bool  #: True when the knee was fitted through HcB as well as Hk


def knee_fraction(demagnetizing_ratio, centre_ratio, width_ratio):
    """F(x): the fraction of the knee amplitude lost at x = -H/HcJ (0 at x = 0, 1 at x = 1).

    Parameters
    ----------
    demagnetizing_ratio : float or ndarray
        x = -H/HcJ [1].
    centre_ratio, width_ratio : float or ndarray
        The step's centre c and width w over HcJ [1].

    Returns
    -------
    ndarray
        F [1], rising with x.

    References
    ----------
    .. [1] the project's own knee shape (module docstring)
    """
    at_zero = expit(-centre_ratio / width_ratio)
    at_hcj = expit((1.0 - centre_ratio) / width_ratio)
    return (expit((demagnetizing_ratio - centre_ratio) / width_ratio) - at_zero) / (at_hcj - at_zero)


def knee_fraction_inverse(fraction, centre_ratio, width_ratio):
    """The x = -H/HcJ at which :func:`knee_fraction` equals ``fraction``, in closed form.

    Parameters
    ----------
    fraction : float or ndarray
        F [1], between 0 and 1.
    centre_ratio, width_ratio : float or ndarray
        The step's centre c and width w over HcJ [1].

    Returns
    -------
    ndarray
        x [1].
    """
    at_zero = expit(-centre_ratio / width_ratio)
    at_hcj = expit((1.0 - centre_ratio) / width_ratio)
    return centre_ratio + width_ratio * logit(at_zero + fraction * (at_hcj - at_zero))


def _exponential_centre(width_ratio):
    return 1.0 + EXPONENTIAL_LIMIT_WIDTHS * width_ratio


@lru_cache(maxsize=256)
def knee_shape(grade: MagnetGrade) -> KneeShape:
    """The knee fitted to the grade's data at 20 °C: through Hk, and through HcB where HcB is on the knee.

    Parameters
    ----------
    grade : MagnetGrade
        The grade (Br, HcB, HcJ, squareness, recoil permeability).

    Returns
    -------
    KneeShape
        Centre and width over HcJ, held constant with temperature.

    Raises
    ------
    GradeDataError
        Naming the grade and ``squareness``, when the recoil line alone falls below 0.9·Br before Hk (so no
        knee can put Hk where the data say), or when the knee through Hk and HcB would collapse J long
        before HcJ (``COLLAPSE_CHECK_RATIO``).

    References
    ----------
    .. [1] the project's own fit (module docstring)
    """
    return _fitted(_FitData.of(grade), None)


#: Up to this many grades :func:`knee_shapes` fits one by one through :func:`knee_shape`'s cache; more (the
#: drawn magnet lots of a tolerance study, each new) share one width scan [1].
_FEW_GRADES = 8


def knee_shapes(grades) -> list[KneeShape]:
    """:func:`knee_shape` of many grades (magnet lots, say), the width scan of all of them at once.

    Parameters
    ----------
    grades : sequence of MagnetGrade
        The grades.

    Returns
    -------
    list of KneeShape
        One per grade, what :func:`knee_shape` gives for it.

    Raises
    ------
    GradeDataError
        As :func:`knee_shape`, for the first grade that has no knee.
    """
    if len(grades) <= _FEW_GRADES:  # a few (the grades of a comparison, say): from knee_shape's cache
        return [knee_shape(grade) for grade in grades]
    data = [_FitData.of(grade) for grade in grades]
    scanned = [d for d in data if d.through_hcb]
    misses = _scan_misses(*(np.array([getattr(d, name) for d in scanned])[:, None] for name in
                            ("squareness", "hk_fraction", "hcb_ratio", "hcb_fraction"))) if scanned else None
    rows = iter(range(len(scanned)))
    return [_fitted(d, misses[next(rows)] if d.through_hcb and misses is not None else None) for d in data]


@dataclass(frozen=True)
class _FitData:
    """What the fit reads of a grade, in units of its HcJ and its knee's amplitude."""

    grade: MagnetGrade
    hk_fraction: float  #: the knee's share of the amplitude lost at Hk [1]
    hcb_ratio: float  #: HcB/HcJ [1]
    hcb_fraction: float  #: the share lost at HcB [1]
    through_hcb: bool  #: HcB lies on the knee (the two-point fit applies)

    @property
    def squareness(self) -> float:
        return self.grade.squareness

    @classmethod
    def of(cls, grade: MagnetGrade) -> _FitData:
        br, hcj, hcb, squareness = grade.remanence, grade.coercivity_hcj, grade.coercivity_hcb, grade.squareness
        recoil_slope = MU_0 * (grade.recoil_permeability - 1.0)
        amplitude = br - recoil_slope * hcj
        hk_fraction = (br - recoil_slope * squareness * hcj - 0.9 * br) / amplitude
        if not 0.0 < hk_fraction < 1.0:
            highest = 0.1 * br / (recoil_slope * hcj) if recoil_slope > 0.0 else 1.0
            raise GradeDataError(
                f"magnet grade {grade.name!r}: squareness {squareness:g} is too high for its recoil permeability "
                f"{grade.recoil_permeability:g}: the recoil line alone falls below 0.9·Br at "
                f"{highest:.3g}·HcJ, before Hk (lower squareness or recoil_permeability)", key="squareness")
        hcb_drop = br - recoil_slope * hcb - MU_0 * hcb
        on_knee = not (hcb_drop <= KNEE_LOSS_FRACTION * br or hcb_drop >= amplitude)
        return cls(grade, hk_fraction, hcb / hcj, hcb_drop / amplitude, on_knee)


def _fitted(d: _FitData, misses: np.ndarray | None) -> KneeShape:
    """The fit of :func:`knee_shape`; ``misses``: the width scan's, if already computed."""
    squareness, hk_fraction = d.squareness, d.hk_fraction

    def exponential_miss(log_width: float) -> float:
        width = float(np.exp(log_width))
        return float(knee_fraction(squareness, _exponential_centre(width), width)) - hk_fraction

    exponential_width = float(np.exp(brentq(exponential_miss, np.log(1e-6), np.log(1e3), xtol=1e-14)))
    exponential = KneeShape(_exponential_centre(exponential_width), exponential_width, through_hcb=False)
    if not d.through_hcb:
        return exponential
    shape = _through_hk_and_hcb(squareness, hk_fraction, d.hcb_ratio, d.hcb_fraction, misses)
    if shape is None:
        return exponential
    if float(knee_fraction(COLLAPSE_CHECK_RATIO, shape.centre_ratio, shape.width_ratio)) > 0.9:
        raise GradeDataError(
            f"magnet grade {d.grade.name!r}: squareness {squareness:g} puts Hk so close to the recoil line that the "
            f"knee through HcB {d.grade.coercivity_hcb / 1e3:.4g} kA/m would collapse J before "
            f"{COLLAPSE_CHECK_RATIO:g}·HcJ, not at HcJ; a rounded curve through these Br, HcB and HcJ has a lower "
            "squareness (lower squareness)", key="squareness")
    return shape


def _centre_through_hk(squareness: float, hk_fraction: float, width: float) -> float | None:
    def miss(centre: float) -> float:
        return float(knee_fraction(squareness, centre, width)) - hk_fraction

    low, high = 0.0, float(_exponential_centre(width))
    if miss(low) * miss(high) > 0.0:
        return None
    return float(brentq(miss, low, high, xtol=1e-15))


def _scan_misses(squareness, hk_fraction, hcb_ratio, hcb_fraction) -> np.ndarray:
    """The miss at HcB of the step through Hk at every width of :data:`_WIDTH_SCAN` at once (NaN where no
    centre reaches Hk): only where it changes sign matters, to bracket the width. Arrays of shape (L, 1)
    give the scans of L grades, (L, widths)."""
    widths = _WIDTH_SCAN
    result = find_root(lambda centre: knee_fraction(squareness, centre, widths) - hk_fraction,
                       np.zeros_like(widths), _exponential_centre(widths), xtol=1e-15, rtol=1e-15, max_iterations=100)
    centres = np.where(result.bracketed, result.root, np.nan)
    return np.asarray(knee_fraction(hcb_ratio, centres, widths) - hcb_fraction, dtype=float)


def _through_hk_and_hcb(squareness: float, hk_fraction: float, hcb_ratio: float, hcb_fraction: float,
                        scanned: np.ndarray | None = None) -> KneeShape | None:
    """The step through both points, or None when no centre in [0, exponential limit] gets there
    (``scanned``: the misses over the width scan, if already computed)."""

    def miss(width: float) -> float:
        centre = _centre_through_hk(squareness, hk_fraction, width)
        return np.nan if centre is None else float(knee_fraction(hcb_ratio, centre, width)) - hcb_fraction

    misses = (_scan_misses(squareness, hk_fraction, hcb_ratio, hcb_fraction) if scanned is None
              else scanned).tolist()
    for index in range(len(misses) - 1):
        first, second = misses[index], misses[index + 1]
        if np.isfinite(first) and np.isfinite(second) and first * second <= 0.0:
            try:
                width = float(brentq(miss, _WIDTH_SCAN[index], _WIDTH_SCAN[index + 1], xtol=1e-15))
            except ValueError:  # a width inside the bracket had no centre: try the next bracket
                continue
            centre = _centre_through_hk(squareness, hk_fraction, width)
            if centre is not None:
                return KneeShape(centre, width, through_hcb=True)
    return None


__all__ = ["COLLAPSE_CHECK_RATIO", "EXPONENTIAL_LIMIT_WIDTHS", "KNEE_LOSS_FRACTION", "KneeShape", "knee_fraction",
           "knee_fraction_inverse", "knee_shape", "knee_shapes"]
