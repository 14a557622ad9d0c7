"""The magnetic circuit of one pole pitch as a reluctance network: no load, under load, rotor removed.

A distributed magnetic equivalent circuit (V. Ostović, "Dynamics of Saturated Electric Machines",
Springer, 1989, ch. 2-3), in the mesh (loop-flux) form, which converges far better than the nodal form
once iron saturates (H. W. Derbas, J. M. Williams, A. C. Koenig and S. D. Pekarek, "A comparison of
nodal- and mesh-based magnetic equivalent circuit models", IEEE Trans. Energy Conversion 24 (2009)
388-396). The pole pitch, from one interpolar (brush) axis to the next, is cut into angular segments
(:mod:`.network_elements`): interpolar air, the magnet arc, interpolar air. Radially each segment has
two branches meeting at a node in the middle of the magnet layer:

* the **upper branch**, housing bore to mid-magnet: the outer half of the magnet (a source
  Br·lm/(2·μ0·μrec) behind its own reluctance, on its recoil line) or of the interpolar air column;
* the **lower branch**, mid-magnet to the armature core: the inner half of the magnet or air column, the
  air gap with Carter's coefficient, and the teeth under the segment with the slots' air beside them.

Between neighbouring segments run three chains: the **housing** wall with the air outside it in
parallel, the **magnet-and-gap layer** tangentially at mid-magnet (the path by which flux spreads from a
magnet's edge to the teeth beyond it and leaks to the next magnet), and the **armature core** with the
shaft in parallel; housing and core carry the flux that accumulates along them.

Unknowns are the loop fluxes: Uk of the upper loop k (housing, upper branches k and k+1, layer) and Lk of
the lower loop k (layer, lower branches k and k+1, core); Uk is the housing's flux in segment k, Lk the
core's, Uk - Lk the layer's, Uk - Uk-1 the upper branch's and Lk - Lk-1 the lower branch's. The next pole
is this one with every sign reversed, so the loop before the first is minus the last (anti-periodic).
Ampère's law round each loop, with D the branch drops, H, C and T the drops along housing, core and layer
and Ik the armature current the lower loop k encloses (zero at no load),

    Duk - Duk+1 + Hk(Uk) + Tk·(Uk - Lk) = 0
    Dlk - Dlk+1 + Ck(Lk) - Tk·(Uk - Lk) = -Ik,

is a cyclic block tridiagonal system whose Jacobian is symmetric positive definite for monotone B(H)
curves; the layer is split in two at the armature surface (a loop between the magnets' inner face and
the armature surface, whose flux Gk crosses the gap), so the blocks are 3×3. Newton's method solves it,
with the flux split between the two parallel paths of each housing, core, gap and tooth element as extra
unknowns eliminated locally, and a backtracking line search where a full step would not reduce the
residual. Vectorised over designs, temperatures and currents.

How it is computed (speed, not physics): the batch is solved in chunks of :data:`CHUNK` designs, every
array laid out segments first and designs last, so that each segment's values are one contiguous array
over the chunk; every steel element of the network is looked up in one table operation; the Newton step's
linear systems go to :func:`.cyclic_tridiagonal.solve_symmetric_cyclic_3x3`; designs that have
converged leave the chunk; and an entry may start from another entry's solution (``seeded_by``: the same
pole at another rotor position), which the seeds are solved first to give. Each design's arithmetic is its
own, whatever batch or chunk it is solved in, but for the linear solver, which changes with the chunk's
size (core.cyclic_tridiagonal) and so the last place.

The flux per pole is the flux down the lower branches (they hold the gap) between the two neutral axes,
2·Ln. The rotor-removed case is the same network with the armature replaced by air: the lower branches end
at the magnets' inner faces and the core chain is the air of the bore.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .errors import MagneticCircuitError
from .magnets import GradeLots, MagnetGrade, knee_field_at, remanence_at
from .network_elements import NetworkElements
from .network_newton import MAX_ITERATIONS, TOLERANCE, newton
from .network_stacking import stack_network
from .units import MU_0

#: Designs solved together: a chunk's arrays stay small enough for the processor's caches (and below the
#: size where every temporary array is a fresh mapping from the operating system). A design's answer does
#: not depend on the chunk it is solved in: its Newton steps and line search are its own.
CHUNK = 2048


@dataclass(frozen=True)
class NetworkSolution:
    """The solved network (SI). Leading axes: the batch; last axis of the per-segment arrays: the
    segments from the left interpolar axis to the right one (see :mod:`.network_elements`)."""

    housing_flux: np.ndarray  #: Uk, in the housing and the air outside it, segment k [Wb]
    gap_loop_flux: np.ndarray  #: Gk, of the loop across the gap; 2·Gn is the flux per pole [Wb]
    core_flux: np.ndarray  #: Lk, in the armature core and the shaft (or the bore's air), segment k [Wb]
    upper_flux: np.ndarray  #: through each segment's magnet (or interpolar air) column, housing to inner face [Wb]
    lower_flux: np.ndarray  #: across the gap in each segment [Wb]
    housing_steel_flux: np.ndarray  #: in the housing wall itself [Wb]
    core_steel_flux: np.ndarray  #: in the armature core itself (the bore's air, rotor removed) [Wb]
    tooth_steel_flux: np.ndarray  #: in the teeth of each lower branch (the rest crosses the slots' air) [Wb]
    gap_drop: np.ndarray  #: across the gap (and tooth tips) in each segment [A]
    teeth_drop: np.ndarray  #: down the teeth in each segment [A]
    #: H along the magnetization in each magnet segment at mid-thickness, from its column's flux (NaN off
    #: the magnet) [A/m]
    magnet_field: np.ndarray
    remanence: np.ndarray  #: Br at the temperature, (batch,) [T]
    knee_field: np.ndarray  #: knee field at the temperature (negative), (batch,) [A/m]
    iterations: np.ndarray  #: Newton steps taken, (batch,) [1]

    @property
    def flux_per_pole(self) -> np.ndarray:
        """Flux crossing the gap between the two neutral axes that bound the pole [Wb]: 2·Gn."""
        return 2.0 * self.gap_loop_flux[..., -1]

    @property
    def magnet_flux(self) -> np.ndarray:
        """Flux through the magnet at mid-thickness [Wb]: what enters its columns from the housing (the
        flux that leaves its inner face across the gap and along the layer beside it)."""
        return np.asarray(np.where(np.isnan(self.magnet_field), 0.0, self.upper_flux).sum(axis=-1))


def solve_network(grade: MagnetGrade | GradeLots, temperature_C, elements: NetworkElements, enclosed_current=0.0,
                  what: str = "the magnetic circuit", rows: np.ndarray | None = None,
                  seeded_by: np.ndarray | None = None) -> NetworkSolution:
    """Solve the pole's network by Newton's method (see the module docstring).

    Parameters
    ----------
    grade : MagnetGrade or GradeLots
        The magnet grade (on its recoil line at the temperature: B = Br(T) + μ0·μrec·H), or one magnet
        lot per entry of the batch.
    temperature_C : float or ndarray
        Magnet temperature [°C], broadcasting with the batch.
    elements : NetworkElements
        The network's element values (:func:`.network_elements.network_elements`), batch shape (D,).
    enclosed_current : float or ndarray
        Armature current enclosed by each lower loop [A], broadcasting to (B, segments)
        (:func:`.armature_mmf.enclosed_currents`); 0 at no load.
    what : str
        What is solved, for the error message.
    rows : ndarray of int, optional
        Shape (B,): the row of ``elements`` each entry of the batch solves (several temperatures or
        currents of one cross-section share its row); by default entry i solves row i (B = D).
    seeded_by : ndarray of int, optional
        Shape (B,): the entry whose solution each entry starts from (speed, not physics). Entries with
        ``seeded_by[i] == i`` are solved first, from zero flux; every other entry then starts from its seed's
        solution, which must be such a first entry. The answer is the same solution to the tolerance;
        a neighbouring problem (the same pole at another rotor position) converges in a few steps.

    Returns
    -------
    NetworkSolution
        Fluxes [Wb] and the magnet's field in each half segment [A/m].

    Raises
    ------
    MagneticCircuitError
        When Newton's method does not converge on some design, naming it and the residual left.

    References
    ----------
    .. [1] V. Ostović 1989 (magnetic equivalent circuits of saturated machines); Derbas et al. 2009
       (the loop-flux form); J. E. Dennis and R. B. Schnabel, "Numerical Methods for Unconstrained
       Optimization and Nonlinear Equations", SIAM, 1996, §6.3 (backtracking line search).
    """
    e = elements
    rows = np.arange(e.column_area.shape[0]) if rows is None else np.asarray(rows, dtype=np.intp)
    batch = rows.shape
    shape = (*batch, e.column_area.shape[-1])
    temperature = np.asarray(temperature_C, dtype=float)
    remanence = np.broadcast_to(np.asarray(remanence_at(grade, temperature), dtype=float), batch)
    enclosed = np.broadcast_to(np.asarray(enclosed_current, dtype=float), shape)
    recoil = np.asarray(grade.recoil_permeability, dtype=float)
    scale = np.maximum(remanence * e.magnet_thickness[rows] / (MU_0 * recoil), 1.0)
    designs = batch[0]
    order, first, seat = _seeding(seeded_by, designs)
    back = None if order is None else np.argsort(order)  # from the solving order to the batch's

    def solving(values: np.ndarray) -> np.ndarray:
        return values if order is None else values[order]

    def batch_order(values: np.ndarray) -> np.ndarray:
        return values if back is None else values[..., back]

    stacked, scales = (solving(remanence), solving(enclosed), solving(rows)), solving(scale)
    chunks: list[tuple[np.ndarray, tuple, np.ndarray, np.ndarray]] = []
    for low, high in ((0, first), (first, designs)):
        # the seeds (or every entry, without seeding) from zero; then the rest from their seeds' solutions
        seeds = np.concatenate([state for state, _, _, _ in chunks], axis=-1) if low < high and low else None
        for start in range(low, high, CHUNK):
            part = slice(start, min(start + CHUNK, high))
            initial = None if seeds is None else seeds[..., seat[part.start - first:part.stop - first]]
            chunks.append(newton(stack_network(e, part, *stacked), scales[part], initial))
    norm = batch_order(np.concatenate([norm for _, _, norm, _ in chunks]))
    converged = norm <= TOLERANCE
    if not np.all(converged):
        worst = int(np.argmax(np.where(converged, 0.0, norm).ravel()))
        raise MagneticCircuitError(
            f"{what} did not converge (design {worst} of the batch: residual {float(norm.ravel()[worst]):.2g} of the "
            f"magnet's MMF after {MAX_ITERATIONS} Newton steps); check that the dimensions and the steels' B(H) data "
            "are finite and positive")

    def joined(pick) -> np.ndarray:
        """One (designs, segments) array, in the batch's order, from the chunks' (segments, designs) ones."""
        return np.ascontiguousarray(
            batch_order(np.concatenate([pick(state, parts) for state, parts, _, _ in chunks], axis=-1)).T)

    upper_loop, middle_loop, lower_loop, housing_flux, core_flux = (
        joined(lambda state, _, row=row: state[row]) for row in range(5))
    upper_flux, middle_flux = (joined(lambda _, parts, row=row: parts[0][row]) for row in range(2))
    gap_drop, teeth_drop = (joined(lambda _, parts, row=row: parts[2][row]) for row in (1, 2))
    tooth_row = 5 + len(e.gap_series)
    tooth_flux = (joined(lambda state, _: state[tooth_row]) if e.tooth_series[0].first.steel is not None
                  else np.zeros(shape))

    def magnet_field(flux):
        with np.errstate(invalid="ignore"):
            return np.where(e.magnet_mask > 0.0, (flux / e.column_area[rows] - remanence[..., None])
                            / (MU_0 * recoil[..., None]), np.nan)

    return NetworkSolution(
        housing_flux=upper_loop, gap_loop_flux=middle_loop, core_flux=lower_loop, upper_flux=upper_flux,
        lower_flux=middle_flux,
        housing_steel_flux=housing_flux, core_steel_flux=core_flux, tooth_steel_flux=tooth_flux,
        magnet_field=magnet_field(upper_flux),
        gap_drop=gap_drop, teeth_drop=teeth_drop, remanence=remanence,
        knee_field=np.broadcast_to(np.asarray(knee_field_at(grade, temperature), dtype=float), batch),
        iterations=batch_order(np.concatenate([iterations for _, _, _, iterations in chunks])),
    )


def seeds_within(blocks: int, size: int, period: int) -> np.ndarray:
    """For ``blocks`` consecutive blocks of ``size`` entries: each entry's seed, the entry of its block
    whose place is its own modulo ``period`` (see :func:`solve_network`).

    Parameters
    ----------
    blocks, size, period : int
        Blocks, entries per block, and the period the entries repeat with inside a block [1].

    Returns
    -------
    ndarray of int
        Shape (blocks·size,).
    """
    entry = np.arange(blocks * size)
    return entry - entry % size + (entry % size) % period


def _seeding(seeded_by, designs: int) -> tuple[np.ndarray | None, int, np.ndarray]:
    """The order entries are solved in (seeds first; None: as given), how many seeds, and each later
    entry's seed's place among them."""
    if seeded_by is None:
        return None, designs, np.empty(0, dtype=np.intp)
    seeded_by = np.asarray(seeded_by, dtype=np.intp)
    is_seed = seeded_by == np.arange(designs)
    if not np.all(is_seed[seeded_by]):
        raise ValueError("every entry's seed must be an entry solved first (seeded_by[seed] == seed)")
    seeds, rest = np.flatnonzero(is_seed), np.flatnonzero(~is_seed)
    place = np.empty(designs, dtype=np.intp)
    place[seeds] = np.arange(seeds.size)
    return np.concatenate([seeds, rest]), seeds.size, place[seeded_by[rest]]


__all__ = ["CHUNK", "MAX_ITERATIONS", "TOLERANCE", "NetworkSolution", "seeds_within", "solve_network"]
