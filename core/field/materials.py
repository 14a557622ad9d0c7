"""Materials of the field solution: the steels' reluctivity ν(B²) for Newton's method, and the magnet.

Steel. Newton's method on the energy of the field needs the reluctivity ν = H/B as a function of B² and
its derivative dν/d(B²) (the Jacobian's extra term, see :mod:`.solve`). Both come from one table, uniform
in B², linear in between, so the derivative is exactly that of the function the residual uses (a
consistent Jacobian, which is what keeps Newton quadratic). The table is built from the steel's own
monotone H(B) (core.steel); beyond its last point the curve goes on with the slope of free space.

Laminations. The 2-D section stands for one metre of stack, of which the fraction kf (stacking factor) is
steel and the rest insulation and air, side by side in the flux's direction. The same H drives both, so
the section's mean flux density is B = kf·B_steel(H) + (1 - kf)·μ0·H (the standard treatment of a
laminated core in a 2-D field solution, e.g. S. J. Salon, "Finite Element Analysis of Electrical
Machines", Kluwer, 1995, ch. 3, from memory); the steel itself carries (B - (1 - kf)·μ0·H)/kf.

Magnet. On its straight recoil line at the case's temperature, B = Br(T)·m + μ0·μrec·H (core.magnets
gives Br(T) and the knee). The field it then carries is its demand, which the demagnetization check
compares with the knee, as core.demagnetization does for the fast model.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..magnets import MagnetGrade, knee_field_at, remanence_at
from ..steel import Steel
from ..units import MU_0

AIR_RELUCTIVITY = 1.0 / MU_0  #: [m/H]
_TABLE_POINTS = 4096


@dataclass(frozen=True)
class Reluctivity:
    """ν(B²) of a soft-magnetic material: a table uniform in B², straight lines between its nodes."""

    square_step: float  #: ΔB² between nodes [T²]
    values: np.ndarray  #: ν at B² = k·ΔB² [m/H]
    last_flux_density: float  #: B at the table's end [T]
    last_field: float  #: H there [A/m]

    def at(self, flux_density_squared: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """ν [m/H] and dν/d(B²) [m/(H·T²)] at B² [T²].

        Parameters
        ----------
        flux_density_squared : numpy.ndarray
            B² [T²].

        Returns
        -------
        tuple of numpy.ndarray
            The reluctivity and its derivative with respect to B².
        """
        s = np.asarray(flux_density_squared, dtype=float)
        position = s / self.square_step
        cell = np.minimum(position.astype(np.intp), self.values.size - 2)
        slope = (self.values[cell + 1] - self.values[cell]) / self.square_step
        nu = self.values[cell] + (s - cell * self.square_step) * slope
        beyond = s > self.last_flux_density**2
        if np.any(beyond):
            b = np.sqrt(s[beyond])
            nu_beyond = (self.last_field + (b - self.last_flux_density) / MU_0) / b
            nu = nu.copy()
            nu[beyond] = nu_beyond
            slope = slope.copy()
            slope[beyond] = (AIR_RELUCTIVITY - nu_beyond) / (2.0 * s[beyond])
        return nu, slope


def steel_reluctivity(steel: Steel, stacking_factor: float = 1.0) -> Reluctivity:
    """The section's ν(B²) for a solid steel (``stacking_factor`` 1) or a laminated stack.

    Parameters
    ----------
    steel : Steel
        The steel and its B(H) data.
    stacking_factor : float
        Steel fraction of the stack, kf [1]; the section's B = kf·B_steel(H) + (1 - kf)·μ0·H.

    Returns
    -------
    Reluctivity
        The table.

    References
    ----------
    .. [1] S. J. Salon, "Finite Element Analysis of Electrical Machines", Kluwer, 1995, ch. 3
       (laminated iron in a 2-D solution; from memory).
    """
    kf = float(stacking_factor)
    if not 0.0 < kf <= 1.0:
        raise ValueError(f"stacking factor {kf!r} must lie in (0, 1]")
    steel_b = np.linspace(0.0, steel.saturation_flux_density, _TABLE_POINTS)
    field = steel.field_for(steel_b)
    section_b = kf * steel_b + (1.0 - kf) * MU_0 * field
    last_b = float(section_b[-1])
    nodes_b = np.sqrt(np.linspace(0.0, last_b**2, _TABLE_POINTS))
    nodes_h = np.interp(nodes_b, section_b, field)
    values = np.empty(_TABLE_POINTS)
    values[1:] = nodes_h[1:] / nodes_b[1:]
    values[0] = values[1]  # the initial slope of the curve
    return Reluctivity(square_step=last_b**2 / (_TABLE_POINTS - 1), values=values,
                       last_flux_density=last_b, last_field=float(field[-1]))


def sheet_flux_density(section_flux_density, section_field, stacking_factor: float):
    """The flux density in the steel sheets [T] of a laminated section carrying ``section_flux_density``.

    Parameters
    ----------
    section_flux_density : array_like
        The section's mean |B| [T].
    section_field : array_like
        |H| there [A/m].
    stacking_factor : float
        Steel fraction of the stack, kf [1].

    Returns
    -------
    numpy.ndarray
        (B - (1 - kf)·μ0·H)/kf [T].
    """
    kf = float(stacking_factor)
    return (np.asarray(section_flux_density) - (1.0 - kf) * MU_0 * np.asarray(section_field)) / kf


@dataclass(frozen=True)
class MagnetAtTemperature:
    """The magnet's straight recoil line and its knee at one temperature (SI)."""

    remanence: float  #: Br(T) [T]
    recoil_permeability: float  #: μrec [1]
    knee_field: float  #: where irreversible loss begins (negative) [A/m], core.magnets.knee_field_at
    temperature_C: float  #: [°C]

    @property
    def reluctivity(self) -> float:
        """1/(μ0·μrec) [m/H]."""
        return 1.0 / (MU_0 * self.recoil_permeability)


def magnet_at(grade: MagnetGrade, temperature_C: float) -> MagnetAtTemperature:
    """The recoil line and knee of ``grade`` at ``temperature_C``.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade: Br and its coefficient α, μrec, and the knee of :func:`core.magnets.knee_field_at`.
    temperature_C : float
        Magnet temperature [°C].

    Returns
    -------
    MagnetAtTemperature
        Br(T), μrec and the knee field.
    """
    return MagnetAtTemperature(
        remanence=float(remanence_at(grade, temperature_C)),
        recoil_permeability=float(grade.recoil_permeability),
        knee_field=float(knee_field_at(grade, temperature_C)),
        temperature_C=float(temperature_C),
    )
