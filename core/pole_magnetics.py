"""What the chain reads off the pole's reluctance network: flux per pole, flux densities, the magnet's field.

One call solves a design at several temperatures and armature currents at once (a batch), with the rotor
in or pulled out (core.reluctance_network, core.network_elements), and reduces each solution to the
figures an engineer reads: the flux per pole, the mean air-gap flux density under the magnet and its value
at the pole centre, the flux densities in the teeth under the pole, in the housing and in the armature
core at the interpolar axis, the magnet's mean operating point, and the field in every magnet segment with
the worst of them and the share of the magnet past the knee. The table of these states over each case's
armature currents, which the curves and the demagnetization cases read, is :mod:`core.pole_load_table`.

Definitions (the same as the field solution's, core.field.postprocess, so the two compare like for like):

* flux per pole: the flux crossing the gap between the two neutral axes that bound the pole;
* leakage factor: the magnet's flux at mid-thickness over the flux per pole;
* magnet field of a segment: at mid-thickness, the mean of the field at the magnet's outer face (from the
  flux entering the column from the housing) and at its inner face (from the flux leaving it across the
  gap), on the recoil line;
* across the thickness, each magnet segment is cut into :data:`RADIAL_CELLS` cells: the column's flux runs
  linearly from its inner-face value to its outer-face value and crosses an area growing with the radius,
  so B(r) = Φ(r)/(Δθ·r·Lm) (the 1/r of a radially magnetized arc); each cell's H is on the recoil line;
* worst magnet field: the area mean over the most-demagnetized share of the magnet's cells
  (core.magnet_field_share, the same rule as the field solution's ``worst_share_magnet_field_A_per_m``);
  the share past the knee is the cells' area past it.

Axial ends. The network is per pole over the stack with the magnet's useful overhang and one gap of end
fringing (core.network_elements); the field solution is 2-D and multiplies by the lumped circuit's end
factor for its stack figure.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .armature_mmf import enclosed_currents, slot_enclosed_currents
from .magnet_field_share import worst_share_field
from .magnets import GradeLots
from .network_elements import Element, NetworkElements, ParallelPair, TipPath, magnet_segment_mask, network_elements
from .reluctance_network import NetworkSolution, solve_network
from .units import MU_0


@dataclass(frozen=True)
class PoleState:
    """The pole's magnetic state for each entry of a batch (SI arrays of the batch's shape, (B,))."""

    temperature_C: np.ndarray  #: magnet temperature [°C]
    current: np.ndarray  #: armature current [A]
    flux_per_pole: np.ndarray  #: crossing the gap between the neutral axes [Wb]
    magnet_flux: np.ndarray  #: through the magnet at mid-thickness [Wb]
    magnet_flux_density: np.ndarray  #: mean B in the magnet [T]
    magnet_field: np.ndarray  #: mean H in the magnet (negative) [A/m]
    permeance_coefficient: np.ndarray  #: -Bm/(μ0·Hm) of the mean operating point [1]
    airgap_flux_density_mean: np.ndarray  #: mean over the magnet's arc at the gap [T]
    airgap_flux_density_centre: np.ndarray  #: at the pole centre [T]
    tooth_flux_density: np.ndarray  #: in the steel of the teeth at the pole centre [T]
    housing_flux_density: np.ndarray  #: in the housing wall at the interpolar axis [T]
    core_flux_density: np.ndarray  #: in the armature core at the interpolar axis [T]
    outside_flux: np.ndarray  #: in the air outside the housing at the interpolar axis [Wb]
    leakage_factor: np.ndarray  #: magnet flux over flux per pole [1]
    carter_factor: np.ndarray  #: kc [1]
    gap_mmf: np.ndarray  #: across the gap at the pole centre [A]
    teeth_mmf: np.ndarray  #: along the teeth at the pole centre [A]
    core_mmf: np.ndarray  #: along the core, pole centre to interpolar axis [A]
    housing_mmf: np.ndarray  #: along the housing, pole centre to interpolar axis [A]
    segment_angle: np.ndarray  #: (B, m) centre of each magnet segment from the pole centre [rad]
    segment_share: np.ndarray  #: (B, m) each magnet segment's share of the magnet's area [1]
    segment_field: np.ndarray  #: (B, m) H at mid-thickness in each magnet segment [A/m]
    cell_angle: np.ndarray  #: (B, m·RADIAL_CELLS) of each magnet cell, its segment's centre [rad]
    cell_share: np.ndarray  #: (B, m·RADIAL_CELLS) each cell's share of the magnet's area [1]
    cell_field: np.ndarray  #: (B, m·RADIAL_CELLS) H in each cell, the 1/r profile (module docstring) [A/m]
    worst_field: np.ndarray  #: mean over the most-demagnetized WORST_AREA_SHARE of the cells [A/m]
    worst_angle: np.ndarray  #: of the most negative cell, from the pole centre [rad]
    knee_field: np.ndarray  #: at the temperature (negative) [A/m]
    past_knee_fraction: np.ndarray  #: share of the magnet's area whose field is past the knee [1]


#: Cells across the magnet's thickness in each segment, for the radial profile of its field [1].
RADIAL_CELLS = 8


def _radial_cells(solution: NetworkSolution, e: NetworkElements, magnet: np.ndarray):
    """Field [A/m], area share [1] and angle [rad] of every magnet cell, (B, m·RADIAL_CELLS) each.

    Each magnet segment is one element of the network, a column carrying one flux from the housing to
    its inner face (its drop in Ampère's law is that flux's, over the whole height); at the inner face
    part of it turns along the layer beside the gap (fringing to the teeth beyond, leakage to the next
    magnet) and the rest crosses the gap. So the field in the column is its own flux's: the flux over
    the area Δθ·r·Lm at each radius, falling as 1/r (the column's area is at mid-thickness rm). The gap's
    flux is not the inner face's: reading the inner cells from it would count the layer's flux as lost
    inside the magnet, which the network's own magnet element does not (measured against the field
    solution in docs/network-calibration.md).
    """
    area = e.column_area[..., magnet]
    permeability = e.column_permeability[..., magnet]
    column_b = solution.upper_flux[..., magnet] / area
    depth = (np.arange(RADIAL_CELLS) + 0.5) / RADIAL_CELLS  # from the inner face, share of lm
    thickness = e.magnet_thickness[:, None]
    mid = e.magnet_inner_radius[:, None] + 0.5 * thickness
    radius_ratio = ((e.magnet_inner_radius[:, None] + depth * thickness) / mid)[:, None, :]  # (B, 1, cells) r/rm
    b = column_b[..., None] / radius_ratio
    field = (b - solution.remanence[:, None, None]) / permeability[..., None]
    share = area[..., None] * radius_ratio
    share = share / share.sum(axis=(-2, -1), keepdims=True)
    angle = np.broadcast_to(e.centre_angle[..., magnet][..., None], field.shape)
    cells = field.shape[0], -1
    return field.reshape(cells), share.reshape(cells), angle.reshape(cells)


def _reduce(solution: NetworkSolution, e: NetworkElements, temperature, current) -> PoleState:
    magnet = magnet_segment_mask() > 0.0
    centre = e.column_area.shape[-1] // 2
    columns = e.column_area[..., magnet]
    area = columns.sum(axis=-1)
    field = solution.magnet_field[..., magnet]  # the column's own flux at mid-thickness (see _radial_cells)
    share = columns / area[..., None]
    mean_field = (field * share).sum(axis=-1)
    magnet_b = solution.magnet_flux / area
    cell_field, cell_share, cell_angle = _radial_cells(solution, e, magnet)
    worst = np.argmin(cell_field, axis=-1)
    rows = np.arange(field.shape[0])
    knee = solution.knee_field
    gap_flux = solution.lower_flux
    housing = e.housing.first.drop(solution.housing_steel_flux)[0]
    core = e.core.first.drop(solution.core_steel_flux)[0]
    right = slice(centre, None)
    with np.errstate(divide="ignore", invalid="ignore"):
        permeance = np.where(mean_field < 0.0, -magnet_b / (MU_0 * mean_field), np.inf)
    return PoleState(
        temperature_C=np.broadcast_to(np.asarray(temperature, dtype=float), area.shape),
        current=np.broadcast_to(np.asarray(current, dtype=float), area.shape),
        flux_per_pole=solution.flux_per_pole, magnet_flux=solution.magnet_flux,
        magnet_flux_density=magnet_b, magnet_field=mean_field, permeance_coefficient=permeance,
        airgap_flux_density_mean=gap_flux[..., magnet].sum(axis=-1) / e.gap_area[..., magnet].sum(axis=-1),
        airgap_flux_density_centre=gap_flux[..., centre] / e.gap_area[..., centre],
        tooth_flux_density=solution.tooth_steel_flux[..., centre] / e.tooth_series[0].first.area[..., centre],
        housing_flux_density=solution.housing_steel_flux[..., -1] / e.housing.first.area[..., -1],
        core_flux_density=solution.core_steel_flux[..., -1] / e.core.first.area[..., -1],
        outside_flux=solution.housing_flux[..., -1] - solution.housing_steel_flux[..., -1],
        leakage_factor=solution.magnet_flux / solution.flux_per_pole,
        carter_factor=e.carter_factor,
        gap_mmf=solution.gap_drop[..., centre], teeth_mmf=solution.teeth_drop[..., centre],
        core_mmf=core[..., right].sum(axis=-1), housing_mmf=housing[..., right].sum(axis=-1),
        segment_angle=e.centre_angle[..., magnet], segment_share=share, segment_field=field,
        cell_angle=cell_angle, cell_share=cell_share, cell_field=cell_field,
        worst_field=worst_share_field(cell_field, cell_share), worst_angle=cell_angle[rows, worst],
        knee_field=knee, past_knee_fraction=(cell_share * (cell_field < knee[..., None])).sum(axis=-1),
    )


def design_network(design, rotor_present: bool = True) -> NetworkElements:
    """The network of a design's cross-section.

    Parameters
    ----------
    design : Design
        The design (SI).
    rotor_present : bool
        False: the armature pulled out.

    Returns
    -------
    NetworkElements
        Batch of one.
    """
    return network_elements(design.geometry, design.magnet.recoil_permeability, design.housing_steel,
                            design.lamination_steel, design.shaft_magnetic, rotor_present)


def pole_states(design, temperatures_C, currents=0.0, rotor_present: bool = True,
                what: str = "the magnetic circuit", rotor_position=None, seeded_by=None) -> PoleState:
    """Solve a design's network at each (temperature, current) pair at once.

    Parameters
    ----------
    design : Design
        The design (SI): geometry, grade, steels, winding, shaft.
    temperatures_C : float or ndarray
        Magnet temperatures [°C], shape (B,) or broadcasting with ``currents``.
    currents : float or ndarray
        Armature currents [A], brushes on neutral (0: no load).
    rotor_present : bool
        False: the armature pulled out (no current then).
    what : str
        For the error message.
    rotor_position : float or ndarray, optional
        None: the armature's current as a smeared sheet, its mean over the rotor's turning; an angle [rad],
        for all entries or per entry (B,): the current in its slots with the rotor there (what the flux
        per pole under load, averaged over such positions, and the magnet's field at one moment take;
        core.armature_mmf, core.pole_load_table).
    seeded_by : ndarray of int, optional
        Shape (B,): the entry each entry's Newton solve starts from (speed only;
        :func:`core.reluctance_network.solve_network`).

    Returns
    -------
    PoleState
        Arrays of shape (B,).

    Raises
    ------
    MagneticCircuitError
        When the network does not converge.

    References
    ----------
    .. [1] core.reluctance_network (Ostović 1989; Derbas et al. 2009); core.armature_mmf (the armature's
       current sheet).
    """
    from .winding import parallel_paths, total_conductors

    temperature, current = np.broadcast_arrays(np.atleast_1d(np.asarray(temperatures_C, dtype=float)),
                                               np.atleast_1d(np.asarray(currents, dtype=float)))
    single = design_network(design, rotor_present)
    rows = np.zeros(temperature.shape[0], dtype=np.intp)  # every entry solves the one cross-section
    enclosed: float | np.ndarray = 0.0
    if rotor_present and np.any(current != 0.0):
        g, w = design.geometry, design.winding
        enclosed = _enclosed(single, current, (int(g.poles), int(g.slots), w.commutator_segments,
                                               int(total_conductors(w.commutator_segments, w.turns_per_coil)),
                                               int(parallel_paths(w.kind, g.poles, w.multiplicity))),
                             rows, rotor_position)
    solution = solve_network(design.magnet, temperature, single, enclosed, what, rows, seeded_by)
    return _reduce(solution, _entries(single, rows), temperature, current)


def pole_states_many(geometry, grade, housing_steel, lamination_steel, shaft_magnetic, temperatures_C, currents=0.0,
                     rotor_present: bool = True, winding=None, what: str = "the magnetic circuit",
                     rows: np.ndarray | None = None, lots: GradeLots | None = None,
                     rotor_position=None, seeded_by=None) -> PoleState:
    """Solve the networks of many cross-sections of one grade family and pair of steels at once.

    Parameters
    ----------
    geometry : Geometry
        The cross-sections, fields arrays of shape (D,) [m, rad].
    grade : MagnetGrade
        The magnet grade of every entry (its recoil permeability that of every lot).
    housing_steel, lamination_steel : Steel
        The steels of every entry.
    shaft_magnetic : bool or ndarray
        A steel shaft, per entry or for all.
    temperatures_C, currents : float or ndarray
        Magnet temperature [°C] and armature current [A] of each entry, shape (B,).
    rotor_present : bool
        False: the armature pulled out (no current then).
    winding : tuple, optional
        (poles, slots, commutator_segments, conductors, paths) when there is current: the first three
        ints shared by the entries, the last two ints or arrays (B,) [1].
    what : str
        For the error message.
    rows : ndarray of int, optional
        Shape (B,): the cross-section each entry solves; by default entry i solves cross-section i (B = D).
    lots : GradeLots, optional
        Br, HcJ and the knee of each entry's magnet lot (B,), lots of ``grade``'s family; by default
        every entry is of ``grade``.
    rotor_position : float or ndarray, optional
        As :func:`pole_states`: None for the smeared current sheet, an angle [rad] (for all entries or per
        entry) for the current in its slots with the rotor there.
    seeded_by : ndarray of int, optional
        As :func:`pole_states`: the entry each entry's solve starts from (speed only).

    Returns
    -------
    PoleState
        Arrays of shape (B,): entry i is what :func:`pole_states` gives for its design at its temperature
        and current.

    Raises
    ------
    MagneticCircuitError
        When the network does not converge for some entry.
    """
    elements = network_elements(geometry, grade.recoil_permeability, housing_steel, lamination_steel, shaft_magnetic,
                                rotor_present)
    rows = np.arange(elements.column_area.shape[0]) if rows is None else np.asarray(rows, dtype=np.intp)
    batch = rows.shape[0]
    temperature = np.broadcast_to(np.asarray(temperatures_C, dtype=float), (batch,))
    current = np.broadcast_to(np.asarray(currents, dtype=float), (batch,))
    enclosed: float | np.ndarray = 0.0
    if rotor_present and np.any(current != 0.0):
        enclosed = _enclosed(elements, current, winding, rows, rotor_position)
    solution = solve_network(grade if lots is None else lots, temperature, elements, enclosed, what, rows,
                             seeded_by)
    return _reduce(solution, _entries(elements, rows), temperature, current)


def _enclosed(elements: NetworkElements, current: np.ndarray, winding, rows: np.ndarray,
              rotor_position) -> np.ndarray:
    """The current each lower loop encloses [A]: the smeared sheet (None) or the slots at a rotor position."""
    poles, slots, segments, conductors, paths = winding
    if rotor_position is None:
        return enclosed_currents(elements, current, poles, slots, segments, conductors, paths, rows)
    return slot_enclosed_currents(elements, current, poles, slots, segments, conductors, paths, rotor_position, rows)


def _entries(elements: NetworkElements, rows: np.ndarray) -> NetworkElements:
    """The network of each entry, row ``rows[i]`` of ``elements`` (views, not copies, of a one-design
    network)."""
    import dataclasses

    single = elements.column_area.shape[0] == 1

    def take(value):
        if isinstance(value, np.ndarray) and value.ndim >= 1 and value.shape[0] == elements.column_area.shape[0] \
                and value is not elements.magnet_mask:
            return np.broadcast_to(value, (rows.size, *value.shape[1:])) if single else value[rows]
        if isinstance(value, (NetworkElements, ParallelPair, Element, TipPath)):
            return type(value)(**{f.name: take(getattr(value, f.name)) for f in dataclasses.fields(value)})
        if isinstance(value, tuple):
            return tuple(take(v) for v in value)
        return value

    taken: NetworkElements = take(elements)
    return taken


def effective_gap(design) -> float:
    """The gap with Carter's coefficient on the magnetic gap, g + (kc - 1)·(g + lm/μrec) [m] (what the
    inductance estimate takes).

    Parameters
    ----------
    design : Design
        The design (SI).

    Returns
    -------
    float
        [m].

    References
    ----------
    .. [1] Carter 1900 (core.magnetic_circuit.carter_coefficient).
    """
    from .magnetic_circuit import pole_circuit

    return float(pole_circuit(design.geometry, design.magnet.recoil_permeability).effective_gap)


#: A cross-section long enough that the axial end terms vanish [m] (the 2-D basis).
_LONG = 1000.0


def two_dimensional_states(design, temperatures_C, currents=0.0, rotor_present: bool = True,
                           rotor_position=None) -> PoleState:
    """The network on the 2-D basis of the field solution: the same cross-section, infinitely long.

    Solved at a length of 1 km, where the magnet's overhang and the gap's end fringing vanish; the fluxes
    (flux per pole, magnet flux, flux outside the housing) are then per metre [Wb/m], the rest unchanged.

    Parameters
    ----------
    design : Design
        The design (SI).
    temperatures_C, currents : float or ndarray
        As :func:`pole_states`.
    rotor_present : bool
        False: the armature pulled out.
    rotor_position : float, optional
        As :func:`pole_states`.

    Returns
    -------
    PoleState
        With fluxes per metre of stack.
    """
    import dataclasses

    long = dataclasses.replace(design, geometry=dataclasses.replace(
        design.geometry, stack_length=_LONG, magnet_length=_LONG, housing_length=_LONG))
    state = pole_states(long, temperatures_C, currents, rotor_present, rotor_position=rotor_position)
    return dataclasses.replace(state, flux_per_pole=state.flux_per_pole / _LONG, magnet_flux=state.magnet_flux / _LONG,
                               outside_flux=state.outside_flux / _LONG)
