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

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .geometry import Geometry
from .shared_docs import parameter_table, shared_parameters

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
    """The two capacities and four resistances of the network (see the module docstring); floats for one
    motor, arrays of one shape for many."""

    winding_capacity: float | np.ndarray  #: C_w [J/K]
    housing_capacity: float | np.ndarray  #: C_h [J/K]
    winding_to_housing: float | np.ndarray  #: R_wh [K/W]
    housing_to_ambient: float | np.ndarray  #: R_ha [K/W]
    winding_to_magnet: float | np.ndarray  #: R_wm, across the air gap [K/W]
    magnet_to_housing: float | np.ndarray  #: R_mh, through magnet and bond line [K/W]


#: The network argument of the functions below, described once (:mod:`core.shared_docs`).
NETWORK_PARAMETERS = parameter_table("""
network : ThermalNetwork
    Capacities [J/K] and resistances [K/W] (floats, or arrays for many motors).
""")


def gap_coupling_resistance(geometry: Geometry, heat_transfer: float = GAP_HEAT_TRANSFER):
    """Winding-to-magnet resistance across the air gap, R_wm = 1/(h·A), A the magnets' inner faces.

    Parameters
    ----------
    geometry : Geometry
        Cross-section (magnet arc, inner radius, poles) and the stack length [m, rad].
    heat_transfer : float, optional
        Heat-transfer coefficient across the gap [W/(m²·K)].

    Returns
    -------
    float or ndarray
        R_wm [K/W] (an array for a geometry of arrays).

    References
    ----------
    .. [1] Newton's law of cooling over the magnets' faces; h is common practice, no source.
    """
    area = geometry.poles * geometry.magnet_arc * geometry.magnet_inner_radius * geometry.stack_length
    return 1.0 / (heat_transfer * area)


def magnet_to_housing_resistance(geometry: Geometry, magnet_family: str | Sequence[str]):
    """Resistance from the magnets' inner face to the housing: half the magnet, then the bond line.

    Parameters
    ----------
    geometry : Geometry
        Cross-section (magnet thickness, arc, outer radius, length, poles) [m, rad].
    magnet_family : str or sequence of str
        The grade's family (sets the magnet's conductivity), or one per design of a geometry of arrays.

    Returns
    -------
    float or ndarray
        R_mh = (lm/2)/(k_m·A) + t_b/(k_b·A) [K/W], A the magnets' outer faces.

    References
    ----------
    .. [1] plane-wall conduction, R = t/(k·A) (Incropera, from memory); the magnet's temperature is
       taken at its mid-thickness, the bond line is common practice, no source.
    """
    area = geometry.poles * geometry.magnet_arc * geometry.housing_inner_radius * geometry.magnet_length
    k_magnet = (MAGNET_CONDUCTIVITY[magnet_family] if isinstance(magnet_family, str)
                else np.array([MAGNET_CONDUCTIVITY[family] for family in magnet_family]))
    return ((0.5 * geometry.magnet_thickness / k_magnet + BOND_THICKNESS / BOND_CONDUCTIVITY) / area)


def capacity(masses_and_specific_heats):
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
    return sum(m * c for m, c in masses_and_specific_heats)


@shared_parameters(NETWORK_PARAMETERS)
def system_matrix(network: ThermalNetwork) -> np.ndarray:
    """The matrix A of dx/dt = A·x + b for the rises x = (θ_w, θ_h).

    Returns
    -------
    ndarray
        A, shape (2, 2) [1/s] (with array fields, (2, 2, ...) elementwise).

    References
    ----------
    .. [1] the module docstring's network (Incropera, thermal circuits, from memory).
    """
    return np.array(_matrix_entries(network))


def _matrix_entries(network: ThermalNetwork):
    cw, ch = network.winding_capacity, network.housing_capacity
    g_wh = 1.0 / np.maximum(network.winding_to_housing, SMALLEST_RESISTANCE)
    g_ha = 1.0 / network.housing_to_ambient
    return [[-g_wh / cw, g_wh / cw], [g_wh / ch, -(g_wh + g_ha) / ch]]


def _eigenvalues(network: ThermalNetwork):
    """The two eigenvalues of A, fast (most negative) first, in closed form for a 2×2 matrix."""
    (a, b), (c, d) = _matrix_entries(network)
    # ((a - d)/2)² + b·c > 0 (b, c > 0): real, distinct eigenvalues, without the cancellation of tr² - 4·det
    root = np.sqrt((0.5 * (a - d)) ** 2 + b * c)
    middle = 0.5 * (a + d)
    return middle - root, middle + root


def _free_response(network: ThermalNetwork, time, winding, housing):
    """exp(A·t)·(θ_w, θ_h): the rises a time after (θ_w, θ_h) with no losses, elementwise.

    exp(A·t) = (e^{λ1·t}·(A - λ2·I) - e^{λ2·t}·(A - λ1·I))/(λ1 - λ2) for the distinct eigenvalues λ1, λ2
    (Sylvester's formula for a 2×2 matrix).
    """
    (a, b), (c, d) = _matrix_entries(network)
    fast, slow = _eigenvalues(network)
    e_fast, e_slow = np.exp(fast * time), np.exp(slow * time)
    span = fast - slow
    aw, ah = a * winding + b * housing, c * winding + d * housing
    return ((e_fast * (aw - slow * winding) - e_slow * (aw - fast * winding)) / span,
            (e_fast * (ah - slow * housing) - e_slow * (ah - fast * housing)) / span)


@shared_parameters(NETWORK_PARAMETERS)
def steady_rise(network: ThermalNetwork, winding_loss, housing_loss) -> np.ndarray:
    """Steady-state rises of winding and housing above ambient (S1).

    Parameters
    ----------
    winding_loss, housing_loss : float or ndarray
        Heat into the winding node (copper, brush, iron) and into the housing node (friction, drag) [W].

    Returns
    -------
    ndarray
        (θ_w, θ_h) [K], first axis of length 2: θ_h = (P_w + P_h)·R_ha, θ_w = θ_h + P_w·R_wh.

    References
    ----------
    .. [1] x_ss = -A⁻¹·b of the module docstring.
    """
    housing = (winding_loss + housing_loss) * network.housing_to_ambient
    return np.array([housing + winding_loss * np.maximum(network.winding_to_housing, SMALLEST_RESISTANCE), housing])


@shared_parameters(NETWORK_PARAMETERS)
def rise_after(network: ThermalNetwork, winding_loss, housing_loss, time, initial_winding=0.0,
               initial_housing=0.0) -> np.ndarray:
    """Rises of winding and housing a time after a start, under constant losses, elementwise.

    Parameters
    ----------
    winding_loss, housing_loss : float or ndarray
        Heat into the winding and housing nodes [W].
    time : float or ndarray
        Time since the start [s], ≥ 0.
    initial_winding, initial_housing : float or ndarray
        Rises θ_w and θ_h at the start [K].

    Returns
    -------
    ndarray
        (θ_w, θ_h) [K], first axis of length 2, the rest the broadcast shape of the inputs.

    References
    ----------
    .. [1] x(t) = x_ss + exp(A·t)·(x0 - x_ss), the closed form of the module docstring.
    """
    steady_w, steady_h = steady_rise(network, winding_loss, housing_loss)
    free_w, free_h = _free_response(network, time, initial_winding - steady_w, initial_housing - steady_h)
    return np.array([steady_w + free_w, steady_h + free_h])


@shared_parameters(NETWORK_PARAMETERS)
def rise_at(network: ThermalNetwork, winding_loss: float, housing_loss: float, times, initial=(0.0, 0.0)):
    """Rises of winding and housing at the given times under constant losses.

    Parameters
    ----------
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
    .. [1] x(t) = x_ss + exp(A·t)·(x0 - x_ss) (:func:`rise_after`).
    """
    t = np.atleast_1d(np.asarray(times, dtype=float))
    start = np.asarray(initial, dtype=float)
    return rise_after(network, winding_loss, housing_loss, t, start[0], start[1]).T


@shared_parameters(NETWORK_PARAMETERS)
def time_constants(network: ThermalNetwork):
    """The network's two time constants, fast (the winding's own) and slow (the motor's) [s].

    Returns
    -------
    tuple of float or ndarray
        -1/λ for the eigenvalues λ of A, shortest first [s].

    References
    ----------
    .. [1] eigenvalues of the 2×2 system (module docstring).
    """
    fast, slow = _eigenvalues(network)
    if np.ndim(fast):
        return -1.0 / fast, -1.0 / slow
    return float(-1.0 / fast), float(-1.0 / slow)


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


@shared_parameters(NETWORK_PARAMETERS)
def periodic_rise(network: ThermalNetwork, winding_loss, housing_loss, on_time, off_time) -> np.ndarray:
    """S3: rises at the end of the on-time in the periodic regime (losses on, then none at rest).

    Parameters
    ----------
    winding_loss, housing_loss : float or ndarray
        Heat into the winding and housing nodes while on [W].
    on_time, off_time : float or ndarray
        Lengths of the loaded and the de-energized parts of a cycle [s].

    Returns
    -------
    ndarray
        (θ_w, θ_h) at the end of the on-time, the hottest moment of the cycle [K], first axis of length 2.

    References
    ----------
    .. [1] IEC 60034-1, duty type S3. The periodic state solves x_e = x_ss + E_on·(E_off·x_e - x_ss)
       with E = exp(A·t) of each part (rest at zero losses), the closed form of the module docstring;
       the 2×2 system by Cramer's rule.
    """
    steady_w, steady_h = steady_rise(network, winding_loss, housing_loss)

    def cycle(w, h):  # E_on·E_off·x, the free response over a whole cycle
        return _free_response(network, on_time, *_free_response(network, off_time, w, h))

    # (I - E_on·E_off)·x = x_ss - E_on·x_ss, the matrix's columns from the unit vectors
    m11, m21 = cycle(1.0, 0.0)
    m12, m22 = cycle(0.0, 1.0)
    m11, m21, m12, m22 = 1.0 - m11, -m21, -m12, 1.0 - m22
    on_w, on_h = _free_response(network, on_time, steady_w, steady_h)
    rhs_w, rhs_h = steady_w - on_w, steady_h - on_h
    det = m11 * m22 - m12 * m21
    return np.array([(rhs_w * m22 - m12 * rhs_h) / det, (m11 * rhs_h - m21 * rhs_w) / det])


@shared_parameters(NETWORK_PARAMETERS)
def time_to_rise(network: ThermalNetwork, winding_loss, housing_loss, winding_rise, initial=(0.0, 0.0)):
    """Time until the winding's rise reaches ``winding_rise`` under constant losses; inf if never.

    Parameters
    ----------
    winding_loss, housing_loss : float or ndarray
        Heat into the winding and housing nodes [W].
    winding_rise : float or ndarray
        The winding rise to reach [K].
    initial : array_like, optional
        Rises (θ_w, θ_h) at t = 0 [K], first axis of length 2.

    Returns
    -------
    float or ndarray
        t [s]; 0 when the winding starts at or above it, inf when its steady rise stays below it (a float
        when every input is a float).

    References
    ----------
    .. [1] root of θ_w(t) = target on :func:`rise_after` (bracketed, Chandrupatla's method,
       core.solvers); θ_w rises monotonically from any start below the steady state with the housing not
       above the winding.
    """
    from .solvers import find_root

    start_w, start_h = (np.asarray(value, dtype=float) for value in initial)
    steady_w = steady_rise(network, winding_loss, housing_loss)[0]
    target = np.asarray(winding_rise, dtype=float)
    shape = np.broadcast_shapes(np.shape(steady_w), start_w.shape, target.shape,
                                np.shape(network.winding_capacity))
    already, never = np.broadcast_to(start_w >= target, shape), np.broadcast_to(steady_w <= target, shape)

    def short_of_target(t):
        return rise_after(network, winding_loss, housing_loss, t, start_w, start_h)[0] - target

    upper = np.broadcast_to(np.maximum(time_constants(network)[0], 1e-3), shape).copy()
    searching = ~already & ~never
    for _ in range(200):
        short = searching & (np.broadcast_to(short_of_target(upper), shape) < 0.0)
        if not short.any():
            break
        upper = np.where(short, 2.0 * upper, upper)
    with np.errstate(invalid="ignore", over="ignore"):
        root = find_root(lambda t: np.broadcast_to(short_of_target(t), shape), np.zeros(shape), upper,
                         xtol=1e-12, rtol=1e-13, max_iterations=100).root
    time = np.where(already, 0.0, np.where(never, np.inf, root))
    return float(time) if time.ndim == 0 else time
