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
linear systems go to :func:`.cyclic_tridiagonal.solve_symmetric_cyclic_3x3`; and designs that have
converged leave the chunk. Each design's arithmetic is its own, whatever batch or chunk it is solved in.

The flux per pole is the flux down the lower branches (they hold the gap) between the two neutral axes,
2·Ln. The rotor-removed case is the same network with the armature replaced by air: the lower branches end
at the magnets' inner faces and the core chain is the air of the bore.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from .cyclic_tridiagonal import solve_symmetric_cyclic_3x3
from .errors import MagneticCircuitError
from .magnets import GradeLots, MagnetGrade, knee_field_at, remanence_at
from .network_elements import NetworkElements, TipPath
from .units import MU_0

#: Newton stops when every loop's residual is below this fraction of the magnet's MMF [1].
TOLERANCE = 1e-8
#: Newton steps allowed [1].
MAX_ITERATIONS = 60
_BACKTRACKS = 8
#: Designs solved together: a chunk's arrays stay small enough for the processor's caches (and below the
#: size where every temporary array is a fresh mapping from the operating system). A design's answer does
#: not depend on the chunk it is solved in: its Newton steps and line search are its own.
CHUNK = 2048
#: A chunk at least this large sheds its converged designs as it goes (below, the copying costs more).
_COMPACT_FROM = 256


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
    #: H along the magnetization at each magnet segment's outer face, from the flux entering its column
    #: (NaN off the magnet) [A/m]
    magnet_field_outer: np.ndarray
    magnet_field_inner: np.ndarray  #: the same at its inner face, from the flux leaving it across the gap [A/m]
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
        return np.asarray(np.where(np.isnan(self.magnet_field_outer), 0.0, self.upper_flux).sum(axis=-1))


@dataclass(frozen=True)
class _Stacked:
    """A chunk of the network as stacked arrays, segments first and designs last, so that each segment's
    values are contiguous over the chunk's designs.

    Every path of every parallel pair (the *sides*: the pairs' first paths, then their second ones) drops
    ``linear``·flux plus, for each steel term of the path, weight·H(scale·flux) (:func:`_path_terms`). The
    pairs run housing, core, the gap's, the teeth's; each carries the flux of the upper loop, the lower
    loop, the middle branch and the lower branch.
    """

    gap_pairs: int
    tooth_pairs: int
    column_area: np.ndarray  #: (segments, designs) [m²]
    column_height: np.ndarray  #: lm/(μ0·μrec) in the magnet, lm/μ0 in the air [m²/H]
    column_slope: np.ndarray  #: the column's reluctance [A/Wb]
    source: np.ndarray  #: Br where the branch holds magnet, else 0 [T]
    tangential: np.ndarray  #: along the magnets' inner face [A/Wb]
    surface: np.ndarray  #: along the armature surface [A/Wb]
    enclosed: np.ndarray  #: the armature current each lower loop encloses [A]
    linear: np.ndarray  #: (sides, segments, designs) [A/Wb]
    term_side: tuple[int, ...]  #: the side of each steel term
    term_position: np.ndarray  #: (terms, segments, designs): cells of the steel's table per weber
    term_weight: np.ndarray  #: (terms, segments, designs): the path length it multiplies H by [m]
    term_slope: np.ndarray  #: weight × cells per weber [m/Wb]
    term_last: np.ndarray  #: (terms, 1, 1) the last cell of its steel's table
    term_offset: np.ndarray  #: (terms, 1, 1) where its steel's table starts in ``nodes`` and ``rises``
    offset_from: int  #: the first term whose steel's table does not start at 0 (terms sorted by steel)
    nodes: np.ndarray  #: H at the nodes of every steel's table, one after the other [A/m]
    rises: np.ndarray  #: the rise of H over each cell [A/m]


#: The fields of :class:`_Stacked` with an axis over the designs (the last).
_PER_DESIGN = ("column_area", "column_height", "column_slope", "source", "tangential", "surface", "enclosed",
               "linear", "term_position", "term_weight", "term_slope")


def _path_terms(path, part) -> tuple[np.ndarray, list]:
    """A path's linear reluctance [A/Wb] and its steel terms (steel, weight [m], B per flux [1/m²]), for
    the designs ``part`` picks out of each array."""
    if isinstance(path, TipPath):
        # the gap over the overhangs, and Simpson's rule on the tip: (wo/6)·(4·H(Broot/2) + H(Broot))
        overhang, root_area = part(path.overhang), part(path.root_area)
        return part(path.gap_reluctance), [(path.steel, 4.0 / 6.0 * overhang, 0.5 / root_area),
                                           (path.steel, overhang / 6.0, 1.0 / root_area)]
    if path.steel is None:
        return part(path.path) / (MU_0 * part(path.area)), []
    return np.zeros(np.shape(part(path.area))), [(path.steel, part(path.path), 1.0 / part(path.area))]


def _stack(e: NetworkElements, designs: slice, remanence, enclosed, rows: np.ndarray) -> _Stacked:
    """The chunk ``designs`` of the network, stacked (see :class:`_Stacked`); entry i of the batch takes
    its elements from row ``rows[i]`` of ``e``."""
    segments = e.column_area.shape[-1]
    count = len(range(*designs.indices(rows.shape[0])))
    picks = rows[designs]

    def part(value) -> np.ndarray:
        array = np.asarray(value, dtype=float)
        picked: np.ndarray = array[picks] if array.ndim == 2 else array
        return picked

    def per_segment(value) -> np.ndarray:
        return np.ascontiguousarray(np.broadcast_to(value, (count, segments)).T)

    pairs = (e.housing, e.core, *e.gap_series, *e.tooth_series)
    sides = [pair.first for pair in pairs] + [pair.second for pair in pairs]
    linear, terms = [], []
    for index, side in enumerate(sides):
        reluctance, side_terms = _path_terms(side, part)
        linear.append(per_segment(reluctance))
        terms += [(index, *term) for term in side_terms]
    steels: list = []
    for _, steel, _, _ in terms:
        if not any(steel is known for known in steels):
            steels.append(steel)
    which = [next(i for i, known in enumerate(steels) if known is steel) for _, steel, _, _ in terms]
    terms = [term for _, term in sorted(zip(which, terms, strict=True), key=lambda pair: pair[0])]
    which = sorted(which)  # the first steel's terms first: only the others' cells need an offset
    tables = [steel._cells for steel in steels]
    starts = np.cumsum([0] + [nodes.size for _, nodes, _ in tables])
    position = np.array([per_segment(scale) * tables[i][0] for (_, _, _, scale), i in zip(terms, which, strict=True)])
    weight = np.array([per_segment(w) for _, _, w, _ in terms])
    column_height = per_segment(part(e.column_height) / part(e.column_permeability))
    column_area = per_segment(part(e.column_area))
    empty = np.zeros((0, segments, count))
    return _Stacked(
        gap_pairs=len(e.gap_series), tooth_pairs=len(e.tooth_series),
        column_area=column_area, column_height=column_height, column_slope=column_height / column_area,
        source=e.magnet_mask[:, None] * remanence[designs][None, :],
        tangential=per_segment(part(e.tangential_reluctance)), surface=per_segment(part(e.surface_reluctance)),
        enclosed=per_segment(enclosed[designs]), linear=np.array(linear),
        term_side=tuple(side for side, *_ in terms),
        term_position=position if terms else empty, term_weight=weight if terms else empty,
        term_slope=weight * position if terms else empty,
        term_last=np.array([tables[i][1].size - 1.0 for i in which]).reshape(-1, 1, 1),
        term_offset=starts[which].reshape(-1, 1, 1).astype(np.intp),
        offset_from=which.index(1) if 1 in which else len(which),
        nodes=np.concatenate([nodes for _, nodes, _ in tables] or [np.zeros(1)]),
        rises=np.concatenate([rises for _, _, rises in tables] or [np.zeros(1)]),
    )


def _subset(s: _Stacked, keep: np.ndarray) -> _Stacked:
    """The designs ``keep`` of a stacked chunk."""
    return dataclasses.replace(s, **{name: getattr(s, name)[..., keep] for name in _PER_DESIGN})


def _next(values):
    """Each segment's successor along the second axis, the first segment of the next pole being minus
    this pole's first: values[k] - next[k] (``_less_next``) and values[k] - previous[k] (``_less_previous``)
    are what Ampère's law and the branch fluxes need."""
    result = np.empty_like(values)
    result[:, :-1] = values[:, 1:]
    np.negative(values[:, :1], out=result[:, -1:])
    return result


def _less_next(values):
    """values[k] - values[k+1], with values[n] ≡ -values[0]; segments on the second axis."""
    result = np.empty_like(values)
    np.subtract(values[:, :-1], values[:, 1:], out=result[:, :-1])
    np.add(values[:, -1:], values[:, :1], out=result[:, -1:])
    return result


def _less_previous(values):
    """values[k] - values[k-1], with values[-1] ≡ -values[n-1]; segments on the second axis."""
    result = np.empty_like(values)
    np.subtract(values[:, 1:], values[:, :-1], out=result[:, 1:])
    np.add(values[:, :1], values[:, -1:], out=result[:, :1])
    return result


def _pair_totals(s: _Stacked, loops, branches):
    """The flux each parallel pair carries: housing the upper loop's, core the lower loop's, the gap's
    pairs the middle branch's, the teeth's the lower branch's."""
    totals = np.empty((2 + s.gap_pairs + s.tooth_pairs, *loops.shape[1:]))
    totals[0], totals[1] = loops[0], loops[2]
    totals[2:2 + s.gap_pairs] = branches[1]
    totals[2 + s.gap_pairs:] = branches[2]
    return totals


def _residual(s: _Stacked, state):
    """Ampère's law round every loop [A], and what the Newton step needs.

    ``state`` (unknowns, segments, designs) holds the loop fluxes of the upper, middle and lower loops,
    then the first path's flux of each parallel pair (housing, core, gap, teeth), then room for the second
    path's (written here): the sides of :class:`_Stacked`.
    """
    pairs = s.linear.shape[0] // 2
    loops, sides = state[:3], state[3:]
    branches = _less_previous(loops)
    gaps = slice(2, 2 + s.gap_pairs)
    teeth = slice(2 + s.gap_pairs, pairs)
    seconds = sides[pairs:]
    np.subtract(loops[0], sides[0], out=seconds[0])
    np.subtract(loops[2], sides[1], out=seconds[1])
    np.subtract(branches[1], sides[gaps], out=seconds[gaps])
    np.subtract(branches[2], sides[teeth], out=seconds[teeth])
    drops = s.linear * sides
    slopes = s.linear.copy()
    if s.term_side:
        # every steel term at once, from one table: the cell, then H within it and its slope
        flux = np.take(sides, s.term_side, axis=0)
        position = np.abs(flux)
        position *= s.term_position
        cell = np.fmin(position, s.term_last).astype(np.intp)  # fmin drops a NaN: H stays NaN, the cast valid
        position -= cell
        cell[s.offset_from:] += s.term_offset[s.offset_from:]
        rise = np.take(s.rises, cell)
        field = np.take(s.nodes, cell)
        position *= rise
        field += position  # H at the node plus the rise across the cell (in place: the sum of the same two)
        np.copysign(field, flux, out=field)
        field *= s.term_weight
        rise *= s.term_slope
        for term, side in enumerate(s.term_side):
            drops[side] += field[term]
            slopes[side] += rise[term]
    first_drop, first_slope, second_slope = drops[:pairs], slopes[:pairs], slopes[pairs:]
    inverse_total = first_slope + second_slope
    np.maximum(inverse_total, 1e-300, out=inverse_total)
    np.divide(1.0, inverse_total, out=inverse_total)
    split_residual = first_drop - drops[pairs:]
    follow = second_slope * inverse_total  # the split's update from the step of the pair's flux
    offset = split_residual * inverse_total  # and from its residual
    # the pair's slope with the split eliminated, and the split residual's share in the drop
    split = (first_slope * follow, first_slope * offset, follow, offset)
    drop = np.empty((3, *loops.shape[1:]))
    np.multiply(branches[0] / s.column_area - s.source, s.column_height, out=drop[0])
    first_drop[gaps].sum(axis=0, out=drop[1])
    first_drop[teeth].sum(axis=0, out=drop[2])
    residuals = _less_next(drop)
    inner_face = s.tangential * (loops[0] - loops[1])
    surface = s.surface * (loops[1] - loops[2])
    residuals[0] += first_drop[0]
    residuals[0] += inner_face
    residuals[1] -= inner_face
    residuals[1] += surface
    residuals[2] -= surface
    residuals[2] += first_drop[1]
    residuals[2] += s.enclosed
    worst = np.maximum(np.abs(residuals).max(axis=(0, 1)), np.abs(split_residual).max(axis=(0, 1)))
    parts = (branches, split, drop)
    return residuals, parts, worst


def _step(s: _Stacked, residuals, parts):
    """The Newton step of every unknown, the parallel splits eliminated locally."""
    _, (split_slope, share, follow, offset), _ = parts
    gaps = slice(2, 2 + s.gap_pairs)
    teeth = slice(2 + s.gap_pairs, None)
    slope = np.empty_like(residuals)  # of the branches of each level
    slope[0] = s.column_slope
    split_slope[gaps].sum(axis=0, out=slope[1])
    split_slope[teeth].sum(axis=0, out=slope[2])
    diagonal = np.empty((6, *residuals.shape[1:]))
    diagonal[:3] = slope
    diagonal[:3, :-1] += slope[:, 1:]
    diagonal[:3, -1] += slope[:, 0]
    diagonal[0] += split_slope[0] + s.tangential
    diagonal[1] += s.tangential + s.surface
    diagonal[2] += s.surface + split_slope[1]
    np.negative(s.tangential, out=diagonal[3])
    np.negative(s.surface, out=diagonal[4])
    diagonal[5] = 0.0
    # the splits' residuals in branch k's drop enter loop k with + and loop k-1 with -
    corrections = np.empty_like(residuals)
    corrections[0] = 0.0
    share[gaps].sum(axis=0, out=corrections[1])
    share[teeth].sum(axis=0, out=corrections[2])
    rhs = np.negative(residuals)
    rhs[0] += share[0]
    rhs[2] += share[1]
    rhs += corrections
    rhs -= _next(corrections)
    loop_step = solve_symmetric_cyclic_3x3(diagonal, np.negative(slope), rhs)
    steps = np.empty((3 + split_slope.shape[0], *residuals.shape[1:]))
    steps[:3] = loop_step
    np.multiply(follow, _pair_totals(s, loop_step, _less_previous(loop_step)), out=steps[3:])
    steps[3:] -= offset
    return steps


def _newton(s: _Stacked, scale):
    """Newton's method with a backtracking line search on one chunk: the state (loop fluxes and the
    pairs' paths' fluxes), the branch fluxes and drops of the last residual evaluation, the residual norm
    and the steps taken by each design.

    Designs that have converged leave the batch once a quarter of it has (their answers are their own:
    a design's steps do not depend on the others').
    """
    designs = scale.shape[0]
    unknowns = 3 + s.linear.shape[0]
    state = np.zeros((unknowns, s.column_area.shape[0], designs))
    iterations = np.zeros(designs, dtype=int)
    residuals, parts, worst = _residual(s, state)
    norm = worst / scale
    # what the designs that left the batch had: state, branch fluxes, drops (index: where in the chunk)
    out_state, out_branches, out_drop = np.empty_like(state), np.empty_like(residuals), np.empty_like(residuals)
    out_norm, out_iterations = np.empty(designs), np.empty(designs, dtype=int)
    index = np.arange(designs)

    def leave(which):
        places = index[which]
        out_state[..., places] = state[..., which]
        out_branches[..., places] = parts[0][..., which]
        out_drop[..., places] = parts[2][..., which]
        out_norm[places], out_iterations[places] = norm[which], iterations[which]

    for _ in range(MAX_ITERATIONS):
        active = norm > TOLERANCE
        if not active.any():
            break
        if active.size >= _COMPACT_FROM and active.sum() <= 0.75 * active.size:
            leave(~active)
            s, scale, state, residuals, index = (_subset(s, active), scale[active], state[..., active],
                                                 residuals[..., active], index[active])
            parts = tuple(tuple(part[..., active] for part in group) if isinstance(group, tuple)
                          else group[..., active] for group in parts)
            norm, iterations, active = norm[active], iterations[active], active[active]
        iterations += active
        steps = _step(s, residuals, parts)
        damping = np.where(active, 1.0, 0.0)
        trial = _trial(state, steps, damping)
        trial_residuals, trial_parts, worst = _residual(s, trial)
        trial_norm = worst / scale
        for _ in range(_BACKTRACKS):
            # a full step where it lowers the residual, else halved, up to _BACKTRACKS times
            worse = active & (trial_norm >= norm) & (damping > 1e-3)
            if not worse.any():
                break
            damping = np.where(worse, 0.5 * damping, damping)
            trial = _trial(state, steps, damping)
            trial_residuals, trial_parts, worst = _residual(s, trial)
            trial_norm = worst / scale
        state, residuals, parts, norm = trial, trial_residuals, trial_parts, trial_norm
    leave(np.ones(index.size, dtype=bool))
    return out_state, (out_branches, None, out_drop), out_norm, out_iterations


def _trial(state, steps, damping):
    """The state after a damped step (with room for the pairs' second paths, as :func:`_residual` wants)."""
    trial = np.empty_like(state)
    changed = trial[:steps.shape[0]]
    np.multiply(damping, steps, out=changed)
    changed += state[:steps.shape[0]]
    return trial


def solve_network(grade: MagnetGrade | GradeLots, temperature_C, elements: NetworkElements, enclosed_current=0.0,
                  what: str = "the magnetic circuit", rows: np.ndarray | None = None) -> NetworkSolution:
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
    chunks = []
    for start in range(0, designs, CHUNK):
        part = slice(start, min(start + CHUNK, designs))
        chunks.append(_newton(_stack(e, part, remanence, enclosed, rows), scale[part]))
    norm = np.concatenate([norm for _, _, norm, _ in chunks])
    converged = norm <= TOLERANCE
    if not np.all(converged):
        worst = int(np.argmax(np.where(converged, 0.0, norm).ravel()))
        raise MagneticCircuitError(
            f"{what} did not converge (design {worst} of the batch: residual {float(norm.ravel()[worst]):.2g} of the "
            f"magnet's MMF after {MAX_ITERATIONS} Newton steps); check that the dimensions and the steels' B(H) data "
            "are finite and positive")

    def joined(pick) -> np.ndarray:
        """One (designs, segments) array from the chunks' (segments, designs) ones."""
        return np.ascontiguousarray(np.concatenate([pick(state, parts) for state, parts, _, _ in chunks], axis=-1).T)

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
        magnet_field_outer=magnet_field(upper_flux), magnet_field_inner=magnet_field(middle_flux),
        gap_drop=gap_drop, teeth_drop=teeth_drop, remanence=remanence,
        knee_field=np.broadcast_to(np.asarray(knee_field_at(grade, temperature), dtype=float), batch),
        iterations=np.concatenate([iterations for _, _, _, iterations in chunks]),
    )
