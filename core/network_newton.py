"""Newton's method on the stacked reluctance network: Ampère's law round every loop, the step, the line search.

The residual and the Newton step of the loop-flux form (:mod:`core.reluctance_network` gives the
equations), the flux split between the two paths of each parallel pair eliminated locally, the linear
systems solved by :func:`core.cyclic_tridiagonal.solve_symmetric_cyclic_3x3`, and a backtracking line
search; converged designs leave the chunk. A design's steps are its own, whatever chunk it is in (to the last
place: the linear solver changes with the chunk's size).
"""

from __future__ import annotations

import numpy as np

from .cyclic_tridiagonal import solve_symmetric_cyclic_3x3
from .network_stacking import StackedNetwork, designs_of

#: Newton stops when every loop's residual is below this fraction of the magnet's MMF [1].
TOLERANCE = 1e-8
#: Newton steps allowed [1].
MAX_ITERATIONS = 60
_BACKTRACKS = 8
#: A chunk at least this large sheds its converged designs as it goes (below, the copying costs more).
_COMPACT_FROM = 256
#: A line-search step back re-evaluates the whole chunk when more than this share of it steps back; else
#: only the designs that do (gathering and scattering them costs about what evaluating the rest would).
_RETRY_ALL_SHARE = 0.5


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


def _pair_totals(s: StackedNetwork, loops, branches):
    """The flux each parallel pair carries: housing the upper loop's, core the lower loop's, the gap's
    pairs the middle branch's, the teeth's the lower branch's."""
    totals = np.empty((2 + s.gap_pairs + s.tooth_pairs, *loops.shape[1:]))
    totals[0], totals[1] = loops[0], loops[2]
    totals[2:2 + s.gap_pairs] = branches[1]
    totals[2 + s.gap_pairs:] = branches[2]
    return totals


def _residual(s: StackedNetwork, state):
    """Ampère's law round every loop [A], and what the Newton step needs.

    ``state`` (unknowns, segments, designs) holds the loop fluxes of the upper, middle and lower loops,
    then the first path's flux of each parallel pair (housing, core, gap, teeth), then room for the second
    path's (written here): the sides of :class:`StackedNetwork`.
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


def _step(s: StackedNetwork, residuals, parts):
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


def newton(s: StackedNetwork, scale, initial=None):
    """Newton's method with a backtracking line search on one chunk: the state (loop fluxes and the
    pairs' paths' fluxes), the branch fluxes and drops of the last residual evaluation, the residual norm
    and the steps taken by each design.

    Designs that have converged leave the batch once a quarter of it has (their answers are their own:
    a design's steps do not depend on the others').

    Parameters
    ----------
    s : StackedNetwork
        One chunk of the network (:func:`core.network_stacking.stack_network`).
    scale : ndarray
        Each design's magnet MMF, Br·lm/(μ0·μrec), at least 1 [A]: the residual is measured against it.
    initial : ndarray, optional
        A state to start from, shape (unknowns, segments, designs) as returned: the solution of a
        neighbouring problem (the same design with its current elsewhere in the slots) takes a few steps
        where zero flux takes ten to twenty. None: zero flux everywhere.

    Returns
    -------
    state : ndarray
        (unknowns, segments, designs): loop fluxes, then the pairs' paths' fluxes [Wb].
    parts : tuple
        (branch fluxes [Wb], None, branch drops [A]) of the last residual evaluation.
    norm : ndarray
        Each design's residual left, a share of ``scale`` [1]; converged where at most :data:`TOLERANCE`.
    iterations : ndarray of int
        Newton steps each design took [1].

    References
    ----------
    .. [1] J. E. Dennis and R. B. Schnabel, "Numerical Methods for Unconstrained Optimization and
       Nonlinear Equations", SIAM, 1996, §6.3 (backtracking line search).
    """
    designs = scale.shape[0]
    unknowns = 3 + s.linear.shape[0]
    shape = (unknowns, s.column_area.shape[0], designs)
    state = np.zeros(shape) if initial is None else np.array(np.broadcast_to(initial, shape), dtype=float)
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
            s, scale, state, residuals, index = (designs_of(s, active), scale[active], state[..., active],
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
            if worse.sum() > _RETRY_ALL_SHARE * worse.size:
                trial = _trial(state, steps, damping)
                trial_residuals, trial_parts, worst = _residual(s, trial)
                trial_norm = worst / scale
            else:  # only the designs that step back are evaluated again; the rest keep their trial
                _retry(s, state, steps, damping, worse, scale, (trial, trial_residuals, trial_parts, trial_norm))
        state, residuals, parts, norm = trial, trial_residuals, trial_parts, trial_norm
    leave(np.ones(index.size, dtype=bool))
    return out_state, (out_branches, None, out_drop), out_norm, out_iterations


def _retry(s: StackedNetwork, state, steps, damping, worse, scale, trials) -> None:
    """The line search's step back for the designs ``worse`` alone, written into ``trials`` in place.

    ``trials`` is (trial state, residuals, parts, norm) of the whole chunk, as :func:`newton` holds them;
    each design's residual is its own column, so evaluating a few columns gives them exactly what the
    whole chunk would.
    """
    trial, trial_residuals, (branches, split, drop), trial_norm = trials
    sub_trial = _trial(state[..., worse], steps[..., worse], damping[worse])
    residuals, (sub_branches, sub_split, sub_drop), worst = _residual(designs_of(s, worse), sub_trial)
    trial[..., worse] = sub_trial
    trial_residuals[..., worse] = residuals
    branches[..., worse] = sub_branches
    for whole, part in zip(split, sub_split, strict=True):
        whole[..., worse] = part
    drop[..., worse] = sub_drop
    trial_norm[worse] = worst / scale[worse]


def _trial(state, steps, damping):
    """The state after a damped step (with room for the pairs' second paths, as :func:`_residual` wants)."""
    trial = np.empty_like(state)
    changed = trial[:steps.shape[0]]
    np.multiply(damping, steps, out=changed)
    changed += state[:steps.shape[0]]
    return trial
