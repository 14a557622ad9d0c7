"""Soft-magnetic steels: B(H) curves and core-loss coefficients.

The data points of a B(H) curve are joined by a shape-preserving monotone cubic (PCHIP: F. N. Fritsch
and R. E. Carlson, SIAM J. Numer. Anal. 17 (1980) 238-246, as implemented in scipy), sampled once on a
dense grid so that each lookup is a cheap linear interpolation that is still monotone. Beyond the last
data point the curve continues with the slope of free space, dB/dH = μ0, which is what fully saturated
iron does. Curves are odd: H(-B) = -H(B).

Losses per unit mass follow the loss-separation law

    p = kh · f · B^α  +  kc · (f·B)²  +  ke · (f·B)^1.5        [W/kg]

(hysteresis after C. P. Steinmetz, Trans. AIEE 9 (1892) 3-64; the classical eddy and excess terms after
G. Bertotti, IEEE Trans. Magn. 24 (1988) 621-630), with the coefficients fitted to a grade's catalogue
loss figures.

References
----------
.. [1] F. N. Fritsch and R. E. Carlson, "Monotone piecewise cubic interpolation", SIAM J. Numer. Anal.
   17 (1980) 238-246.
.. [2] C. P. Steinmetz, "On the law of hysteresis", Trans. AIEE 9 (1892) 3-64.
.. [3] G. Bertotti, "General properties of power losses in soft ferromagnetic materials", IEEE Trans.
   Magn. 24 (1988) 621-630.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np
from scipy.interpolate import PchipInterpolator

from .shared_docs import parameter_table, shared_parameters
from .units import MU_0

_DENSE_POINTS = 2048

#: The argument of the B(H) lookups, described once (:mod:`core.shared_docs`).
STEEL_PARAMETERS = parameter_table("""
flux_density : float or ndarray
    Flux density B [T], of either sign; NaN gives NaN.
""")


@dataclass(frozen=True)
class Steel:
    """A soft-magnetic steel: its B(H) data points and loss coefficients, in SI.

    The data are validated on construction: paired points from (0, 0), both increasing, the slope never
    below μ0 (a ``ValueError`` names the steel otherwise).
    """

    name: str  #: the library name, e.g. a grade designation
    kind: str  #: "housing" (solid low-carbon steel) or "lamination" (non-oriented electrical steel)
    field_strength: tuple[float, ...]  #: H data [A/m], increasing, starting at 0
    flux_density: tuple[float, ...]  #: B data [T], increasing, starting at 0
    density: float  #: [kg/m³]
    hysteresis_coeff: float = 0.0  #: kh [W/kg at 1 Hz, 1 T]
    hysteresis_exponent: float = 2.0  #: α [1]
    eddy_coeff: float = 0.0  #: kc [W/kg per (Hz·T)²]
    excess_coeff: float = 0.0  #: ke [W/kg per (Hz·T)^1.5]
    recommended_max_flux_density: float = 1.6  #: above this the steel is working hard [T]
    source: str = ""  #: where the data come from

    def __post_init__(self) -> None:
        h, b = np.asarray(self.field_strength), np.asarray(self.flux_density)
        if h.shape != b.shape or h.size < 3:
            raise ValueError(f"steel {self.name!r}: B and H need the same number of points, at least 3")
        if h[0] != 0.0 or b[0] != 0.0:
            raise ValueError(f"steel {self.name!r}: the B(H) curve must start at H = 0, B = 0")
        if np.any(np.diff(h) <= 0) or np.any(np.diff(b) <= 0):
            raise ValueError(f"steel {self.name!r}: B and H must both increase point to point")
        if np.any(np.diff(b) / np.diff(h) < MU_0 * (1 - 1e-9)):
            raise ValueError(f"steel {self.name!r}: the B(H) slope falls below μ0 (not physical)")

    @cached_property
    def _dense_table(self) -> tuple[np.ndarray, np.ndarray]:
        b = np.asarray(self.flux_density)
        h = np.asarray(self.field_strength)
        spline = PchipInterpolator(b, h)  # H as a function of B: the circuit asks H for a given flux
        dense_b = np.linspace(0.0, b[-1], _DENSE_POINTS)
        return dense_b, spline(dense_b)

    @cached_property
    def _cells(self) -> tuple[float, np.ndarray, np.ndarray]:
        """The dense table as cells of a uniform grid in B, for an O(1) lookup: (1/ΔB, H at each node, the
        rise of H over each cell). The grid is uniform, so a cell's index is a multiplication, not a
        search; the last cell, from the last data point on, rises with the slope of free space (ΔB/μ0)."""
        dense_b, dense_h = self._dense_table
        step = dense_b[1] - dense_b[0]
        rises = np.append(np.diff(dense_h), step / MU_0)
        return 1.0 / step, dense_h, rises

    @shared_parameters(STEEL_PARAMETERS)
    def field_and_slope(self, flux_density: float | np.ndarray):
        """H(B) [A/m] and dH/dB [A/(m·T)] from the same cell of the table, so that a Newton solve's
        Jacobian is the exact derivative of its residual.

        Returns
        -------
        tuple of ndarray
            H, of the sign of B, and its slope (1/μ0 beyond the data), as :meth:`field_for`.

        References
        ----------
        .. [1] Fritsch and Carlson 1980 (PCHIP through the data, sampled on a dense uniform grid in B).
        """
        inverse_step, nodes, rises = self._cells
        position = np.abs(flux_density) * inverse_step  # in cells from B = 0
        # fmin drops a NaN, so the cast below stays valid (H stays NaN); beyond the data the last cell
        cell = np.fmin(position, nodes.size - 1).astype(np.intp)
        rise = rises[cell]
        field = np.copysign(nodes[cell] + (position - cell) * rise, flux_density)
        return field, rise * inverse_step

    @property
    def saturation_flux_density(self) -> float:
        """The last B data point [T]; beyond it the curve has the slope of free space."""
        return self.flux_density[-1]

    @shared_parameters(STEEL_PARAMETERS)
    def field_for(self, flux_density: float | np.ndarray):
        """Field strength that magnetizes the steel to a flux density: H(B), odd and monotone.

        Returns
        -------
        float or ndarray
            Field strength H [A/m], of the sign of B; beyond the last data point the curve continues
            with the slope of free space, dB/dH = μ0.

        References
        ----------
        .. [1] Fritsch and Carlson 1980 (PCHIP through the data, sampled on a dense uniform grid in B).
        """
        return self.field_and_slope(flux_density)[0]

    def flux_density_for(self, field_strength: float | np.ndarray):
        """Flux density at a field strength: B(H), the inverse of :meth:`field_for`.

        Parameters
        ----------
        field_strength : float or ndarray
            Field strength H [A/m], of either sign.

        Returns
        -------
        float or ndarray
            Flux density B [T], of the sign of H; μ0 slope beyond the data.
        """
        dense_b, dense_h = self._dense_table
        h = np.abs(field_strength)
        b = np.interp(h, dense_h, dense_b)
        beyond = h - dense_h[-1]
        b = np.where(beyond > 0.0, dense_b[-1] + MU_0 * beyond, b)
        return np.copysign(b, field_strength)

    def specific_loss(self, frequency: float | np.ndarray, peak_flux_density: float | np.ndarray):
        """Core loss per unit mass, p = kh·f·B^α + kc·(f·B)² + ke·(f·B)^1.5.

        Parameters
        ----------
        frequency : float or ndarray
            Magnetic (remagnetization) frequency f [Hz].
        peak_flux_density : float or ndarray
            Peak flux density B of the cycle [T]; the sign is ignored.

        Returns
        -------
        float or ndarray
            Specific core loss [W/kg].

        References
        ----------
        .. [1] Steinmetz 1892 (hysteresis term kh·f·B^α).
        .. [2] Bertotti 1988 (classical eddy-current term in (f·B)², excess term in (f·B)^1.5).
        """
        f = np.asarray(frequency, dtype=float)
        b = np.abs(peak_flux_density)
        return (
            self.hysteresis_coeff * f * b**self.hysteresis_exponent
            + self.eddy_coeff * (f * b) ** 2
            + self.excess_coeff * (f * b) ** 1.5
        )
