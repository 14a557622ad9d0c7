"""The motor's thermal network with two heat capacities: winding and housing, and the magnets between.

Two nodes, each with its own heat capacity (our model, common practice for small DC motors, no source):

* the **winding** (capacity C_w, the copper), heated by the rotor's losses (copper, brush, iron);
* the **housing** (capacity C_h, the housing tube and the magnets on its bore), heated by the rest
  (friction and drag), and by the winding through R_wh; it gives all the heat to ambient through R_ha.

With rises above ambient x = (θ_w, θ_h) the network is the linear system

    C_w·dθ_w/dt = P_w - (θ_w - θ_h)/R_wh
    C_h·dθ_h/dt = P_h + (θ_w - θ_h)/R_wh - θ_h/R_ha

i.e. dx/dt = A·x + b, solved in closed form as x(t) = x_ss + exp(A·t)·(x0 - x_ss), x_ss = -A⁻¹·b, with
exp(A·t) from the eigen-decomposition of the 2×2 matrix A (its eigenvalues are real and negative: A is
similar to a symmetric negative-definite matrix). The magnets take no capacity of their own (their mass
counts in the housing node) and sit on the heat path that crosses the air gap: winding → R_wm (the gap,
the coupling resistance) → magnets → R_mh (magnet and bond line) → housing, so that

    θ_m = θ_h + (θ_w - θ_h)·R_mh/(R_wm + R_mh)

Duty types (IEC 60034-1): S1 is the steady state x_ss; S2 the state after a run of given length from
ambient; S3 the periodic state of a cycle (on for the cycle duration factor, then de-energized at rest),
found in closed form: the state at the end of the on-time that repeats itself cycle after cycle.

References
----------
.. [1] F. P. Incropera, D. P. DeWitt, Fundamentals of Heat and Mass Transfer, lumped-capacitance
   method and thermal circuits (from memory): each node a lumped capacity, heat flow = ΔT/R.
.. [2] the eigen-solution of a linear system of two first-order ODEs with constant coefficients, any
   text on linear ODEs (from memory).
.. [3] IEC 60034-1, duty types S1 (continuous), S2 (short-time) and S3 (intermittent periodic).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from .geometry import Geometry

#: Specific heats [J/(kg·K)], from memory (handbook values at room temperature).
COPPER_SPECIFIC_HEAT = 385.0
STEEL_SPECIFIC_HEAT = 460.0
#: Magnet specific heats by family [J/(kg·K)], from memory (suppliers' brochures).
MAGNET_SPECIFIC_HEAT = {
    "sintered NdFeB": 440.0, "bonded NdFeB": 500.0, "SmCo 1:5": 370.0, "SmCo 2:17": 370.0,
    "hard ferrite, isotropic": 800.0, "hard ferrite, anisotropic": 800.0, "AlNiCo": 450.0,
}
#: Thermal conductivities of the magnets [W/(m·K)], from memory (suppliers' brochures).
MAGNET_CONDUCTIVITY = {
    "sintered NdFeB": 8.0, "bonded NdFeB": 1.5, "SmCo 1:5": 10.0, "SmCo 2:17": 10.0,
    "hard ferrite, isotropic": 4.0, "hard ferrite, anisotropic": 4.0, "AlNiCo": 15.0,
}
#: Heat-transfer coefficient across a running motor's air gap [W/(m²·K)] (common practice, no source:
#: small motors' gaps at a few thousand rpm lie around 30-100).
GAP_HEAT_TRANSFER = 50.0
#: Bond line between magnet and housing: thickness [m] and conductivity [W/(m·K)] of the adhesive
#: (common practice, no source: 0.1 mm of filled epoxy).
BOND_THICKNESS, BOND_CONDUCTIVITY = 1e-4, 0.5
#: R_wh below this is taken as this [K/W]: a zero resistance would merge the nodes (our choice).
SMALLEST_RESISTANCE = 1e-6


@dataclass(frozen=True)
class ThermalNetwork:
    """The two capacities and four resistances of the network (see the module docstring)."""

    winding_capacity: float  #: C_w [J/K]
    housing_capacity: float  #: C_h [J/K]
    winding_to_housing: float  #: R_wh [K/W]
    housing_to_ambient: float  #: R_ha [K/W]
    winding_to_magnet: float  #: R_wm, across the air gap [K/W]
    magnet_to_housing: float  #: R_mh, through magnet and bond line [K/W]


def gap_coupling_resistance(geometry: Geometry, heat_transfer: float = GAP_HEAT_TRANSFER) -> float:
    """Winding-to-magnet resistance across the air gap, R_wm = 1/(h·A), A the magnets' inner faces.

    Parameters
    ----------
    geometry : Geometry
        Cross-section (magnet arc, inner radius, poles) and the stack length [m, rad].
    heat_transfer : float, optional
        Heat-transfer coefficient across the gap [W/(m²·K)].

    Returns
    -------
    float
        R_wm [K/W].

    References
    ----------
    .. [1] Newton's law of cooling over the magnets' faces; h is common practice, no source.
    """
    area = geometry.poles * geometry.magnet_arc * geometry.magnet_inner_radius * geometry.stack_length
    return float(1.0 / (heat_transfer * area))


def magnet_to_housing_resistance(geometry: Geometry, magnet_family: str) -> float:
    """Resistance from the magnets' inner face to the housing: half the magnet, then the bond line.

    Parameters
    ----------
    geometry : Geometry
        Cross-section (magnet thickness, arc, outer radius, length, poles) [m, rad].
    magnet_family : str
        The grade's family (sets the magnet's conductivity).

    Returns
    -------
    float
        R_mh = (lm/2)/(k_m·A) + t_b/(k_b·A) [K/W], A the magnets' outer faces.

    References
    ----------
    .. [1] plane-wall conduction, R = t/(k·A) (Incropera, from memory); the magnet's temperature is
       taken at its mid-thickness, the bond line is common practice, no source.
    """
    area = geometry.poles * geometry.magnet_arc * geometry.housing_inner_radius * geometry.magnet_length
    k_magnet = MAGNET_CONDUCTIVITY[magnet_family]
    return float((0.5 * geometry.magnet_thickness / k_magnet + BOND_THICKNESS / BOND_CONDUCTIVITY) / area)


def capacity(masses_and_specific_heats) -> float:
    """Heat capacity of a node: Σ m·c.

    Parameters
    ----------
    masses_and_specific_heats : iterable of (float, float)
        Pairs of mass [kg] and specific heat [J/(kg·K)].

    Returns
    -------
    float
        C [J/K].

    References
    ----------
    .. [1] lumped-capacitance method (Incropera, from memory).
    """
    return float(sum(m * c for m, c in masses_and_specific_heats))


def system_matrix(network: ThermalNetwork) -> np.ndarray:
    """The matrix A of dx/dt = A·x + b for the rises x = (θ_w, θ_h).

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].

    Returns
    -------
    ndarray
        A, shape (2, 2) [1/s].

    References
    ----------
    .. [1] the module docstring's network (Incropera, thermal circuits, from memory).
    """
    cw, ch = network.winding_capacity, network.housing_capacity
    g_wh = 1.0 / max(network.winding_to_housing, SMALLEST_RESISTANCE)
    g_ha = 1.0 / network.housing_to_ambient
    return np.array([[-g_wh / cw, g_wh / cw], [g_wh / ch, -(g_wh + g_ha) / ch]])


def _source(network: ThermalNetwork, winding_loss: float, housing_loss: float) -> np.ndarray:
    return np.array([winding_loss / network.winding_capacity, housing_loss / network.housing_capacity])


def steady_rise(network: ThermalNetwork, winding_loss: float, housing_loss: float) -> np.ndarray:
    """Steady-state rises of winding and housing above ambient (S1).

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].
    winding_loss, housing_loss : float
        Heat into the winding node (copper, brush, iron) and into the housing node (friction, drag) [W].

    Returns
    -------
    ndarray
        (θ_w, θ_h) [K]: θ_h = (P_w + P_h)·R_ha, θ_w = θ_h + P_w·R_wh.

    References
    ----------
    .. [1] x_ss = -A⁻¹·b of the module docstring.
    """
    housing = (winding_loss + housing_loss) * network.housing_to_ambient
    return np.array([housing + winding_loss * max(network.winding_to_housing, SMALLEST_RESISTANCE), housing])


def rise_at(network: ThermalNetwork, winding_loss: float, housing_loss: float, times, initial=(0.0, 0.0)):
    """Rises of winding and housing at the given times under constant losses.

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].
    winding_loss, housing_loss : float
        Heat into the winding and housing nodes [W].
    times : float or array_like
        Times since the start [s], ≥ 0.
    initial : array_like, optional
        Rises (θ_w, θ_h) at t = 0 [K].

    Returns
    -------
    ndarray
        Shape (len(times), 2): θ_w and θ_h [K].

    References
    ----------
    .. [1] x(t) = x_ss + V·exp(Λ·t)·V⁻¹·(x0 - x_ss), the eigen-solution of the module docstring.
    """
    a = system_matrix(network)
    eigenvalues, vectors = np.linalg.eig(a)
    eigenvalues, vectors = eigenvalues.real, vectors.real  # real: A is similar to a symmetric matrix
    steady = steady_rise(network, winding_loss, housing_loss)
    modes = np.linalg.solve(vectors, np.asarray(initial, dtype=float) - steady)
    t = np.atleast_1d(np.asarray(times, dtype=float))
    return steady + (np.exp(np.outer(t, eigenvalues)) * modes) @ vectors.T


def time_constants(network: ThermalNetwork) -> tuple[float, float]:
    """The network's two time constants, fast (the winding's own) and slow (the motor's) [s].

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].

    Returns
    -------
    tuple of float
        -1/λ for the eigenvalues λ of A, shortest first [s].

    References
    ----------
    .. [1] eigenvalues of the 2×2 system (module docstring).
    """
    eigenvalues = np.linalg.eigvals(system_matrix(network)).real
    fast, slow = sorted(-1.0 / eigenvalues)
    return float(fast), float(slow)


def magnet_rise(network: ThermalNetwork, winding_rise, housing_rise):
    """The magnets' rise, a tap on the path across the gap: θ_h + (θ_w - θ_h)·R_mh/(R_wm + R_mh).

    Parameters
    ----------
    network : ThermalNetwork
        Resistances R_wm and R_mh [K/W].
    winding_rise, housing_rise : float or ndarray
        θ_w and θ_h [K].

    Returns
    -------
    float or ndarray
        θ_m [K].

    References
    ----------
    .. [1] series thermal resistances (Incropera, from memory); module docstring.
    """
    share = network.magnet_to_housing / (network.winding_to_magnet + network.magnet_to_housing)
    return housing_rise + (np.asarray(winding_rise) - housing_rise) * share


def _transition(network: ThermalNetwork, time: float) -> np.ndarray:
    """exp(A·t): the free response's map from the rises at 0 to those at ``time``."""
    return np.column_stack([rise_at(network, 0.0, 0.0, time, initial=unit)[0] for unit in np.eye(2)])


def periodic_rise(network: ThermalNetwork, winding_loss: float, housing_loss: float, on_time: float,
                  off_time: float) -> np.ndarray:
    """S3: rises at the end of the on-time in the periodic regime (losses on, then none at rest).

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].
    winding_loss, housing_loss : float
        Heat into the winding and housing nodes while on [W].
    on_time, off_time : float
        Lengths of the loaded and the de-energized parts of a cycle [s].

    Returns
    -------
    ndarray
        (θ_w, θ_h) at the end of the on-time, the hottest moment of the cycle [K].

    References
    ----------
    .. [1] IEC 60034-1, duty type S3. The periodic state solves x_e = x_ss + E_on·(E_off·x_e - x_ss)
       with E = exp(A·t) of each part (rest at zero losses), the closed form of the module docstring.
    """
    identity = np.eye(2)
    exp_on, exp_off = _transition(network, on_time), _transition(network, off_time)
    steady = steady_rise(network, winding_loss, housing_loss)
    return np.linalg.solve(identity - exp_on @ exp_off, steady - exp_on @ steady)


def time_to_rise(network: ThermalNetwork, winding_loss: float, housing_loss: float, winding_rise: float,
                 initial=(0.0, 0.0)) -> float:
    """Time until the winding's rise reaches ``winding_rise`` under constant losses; inf if never.

    Parameters
    ----------
    network : ThermalNetwork
        Capacities [J/K] and resistances [K/W].
    winding_loss, housing_loss : float
        Heat into the winding and housing nodes [W].
    winding_rise : float
        The winding rise to reach [K].
    initial : array_like, optional
        Rises (θ_w, θ_h) at t = 0 [K].

    Returns
    -------
    float
        t [s]; 0 when the winding starts at or above it, inf when its steady rise stays below it.

    References
    ----------
    .. [1] root of θ_w(t) = target on :func:`rise_at` (bracketed, Brent's method); θ_w rises
       monotonically from any start below the steady state with the housing not above the winding.
    """
    start = np.asarray(initial, dtype=float)
    if start[0] >= winding_rise:
        return 0.0
    if steady_rise(network, winding_loss, housing_loss)[0] <= winding_rise:
        return float("inf")

    def short_of_target(t: float) -> float:
        return float(rise_at(network, winding_loss, housing_loss, t, start)[0, 0] - winding_rise)

    upper = max(time_constants(network)[0], 1e-3)
    while short_of_target(upper) < 0.0:
        upper *= 2.0
    return float(brentq(short_of_target, 0.0, upper, xtol=1e-9, rtol=1e-10))
