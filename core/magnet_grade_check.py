"""A grade's data checked against its own curve: the model must reproduce what the grade says.

The curve model (:mod:`magnets`) meets Br and HcJ exactly and passes through Hk, and through HcB where
HcB lies on the knee; HcB elsewhere and (BH)max then follow from the curve. A grade whose stored HcB or
(BH)max the curve misses by more than ``FIT_TOLERANCE`` has values no one curve with its Br, HcJ,
recoil permeability and squareness can have (typical values taken from different tables, or a typing
error); it is refused by name, with the key to change, rather than drawn and computed wrongly.

References
----------
.. [1] IEC 60404-5, Magnetic materials, part 5: permanent magnet (magnetically hard) materials, methods
   of measurement of magnetic properties (HcB and (BH)max as read from the normal curve).
"""

from __future__ import annotations

from .magnet_curve_figures import energy_product_of_curve, normal_coercivity_at
from .magnet_grades import REFERENCE_TEMPERATURE_C, GradeDataError, MagnetGrade, require_modelled_family
from .units import MU_0

#: How far the curve may miss the grade's stored HcB and (BH)max at 20 °C before the grade is refused
#: (our bound: the trade's grade classes span about ±5 %, so 2 % keeps the curve inside the class).
FIT_TOLERANCE = 0.02


def require_faithful_curve(grade: MagnetGrade) -> None:
    """Refuse a grade whose curve at 20 °C misses its stored HcB or (BH)max by more than ``FIT_TOLERANCE``.

    Br and HcJ the model meets exactly; HcB and (BH)max follow from the fitted curve, and a grade whose
    values no curve with its Br, HcJ, μrec and squareness can have is refused rather than drawn wrongly.

    Parameters
    ----------
    grade : MagnetGrade
        The grade, built-in or a user's.

    Raises
    ------
    GradeDataError
        Naming the grade, the two values that disagree and the key to change (``key`` holds the key);
        also for a family the tool refuses (:data:`core.magnet_grades.REFUSED_FAMILIES`).

    References
    ----------
    .. [1] IEC 60404-5 (HcB, (BH)max as read from the normal curve); P. Campbell, "Permanent Magnet
       Materials and their Application", Cambridge University Press, 1994, ch. 2 ((BH)max = Br²/(4·μ0·μrec)
       on a straight normal curve; from memory).
    """
    require_modelled_family(grade.name, grade.family)
    hcb = float(normal_coercivity_at(grade, REFERENCE_TEMPERATURE_C))
    straight_hcb = grade.remanence / (MU_0 * grade.recoil_permeability)
    if abs(hcb / grade.coercivity_hcb - 1.0) > FIT_TOLERANCE:
        raise GradeDataError(
            f"magnet grade {grade.name!r}: its curve through Br {grade.remanence:g} T, HcJ "
            f"{grade.coercivity_hcj / 1e3:g} kA/m, recoil permeability {grade.recoil_permeability:g} and squareness "
            f"{grade.squareness:g} crosses B = 0 at {hcb / 1e3:.4g} kA/m, not at the stored HcB "
            f"{grade.coercivity_hcb / 1e3:.4g} kA/m (more than {FIT_TOLERANCE:.0%} apart; a straight recoil line "
            f"from Br would give {straight_hcb / 1e3:.4g} kA/m): check coercivity_HcB_kA_per_m, or "
            "recoil_permeability and squareness", key="coercivity_HcB_kA_per_m")
    energy = energy_product_of_curve(grade, REFERENCE_TEMPERATURE_C)
    if abs(energy / grade.energy_product - 1.0) > FIT_TOLERANCE:
        raise GradeDataError(
            f"magnet grade {grade.name!r}: its curve (through Br, HcB and HcJ) has (BH)max {energy / 1e3:.4g} kJ/m³, "
            f"not the stored {grade.energy_product / 1e3:.4g} kJ/m³ (more than {FIT_TOLERANCE:.0%} apart; a "
            f"straight line from Br to HcB gives Br·HcB/4 = {grade.remanence * grade.coercivity_hcb / 4e3:.4g} "
            "kJ/m³): check energy_product_kJ_per_m3", key="energy_product_kJ_per_m3")


__all__ = ["FIT_TOLERANCE", "require_faithful_curve", "require_modelled_family"]
