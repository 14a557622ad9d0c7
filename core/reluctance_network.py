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

is a cyclic block tridiagonal system (2×2 blocks) whose Jacobian is symmetric positive definite for
monotone B(H) curves. Newton's method solves it, with the flux split between the two parallel paths of
each housing, core and tooth element as extra unknowns eliminated locally, and a backtracking line search
where a full step would not reduce the residual. Vectorised over designs, temperatures and currents.

The flux per pole is the flux down the lower branches (they hold the gap) between the two neutral axes,
2·Ln. The rotor-removed case is the same network with the armature replaced by air: the lower branches end
at the magnets' inner faces and the core chain is the air of the bore.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .cyclic_tridiagonal import dense_cyclic_block_tridiagonal, solve_cyclic_block_tridiagonal
from .errors import MagneticCircuitError
from .magnets import MagnetGrade, knee_field_at, remanence_at
from .network_elements import NetworkElements
from .units import MU_0

#: Newton stops when every loop's residual is below this fraction of the magnet's MMF [1].
TOLERANCE = 1e-8
#: Newton steps allowed [1].
MAX_ITERATIONS = 60
_BACKTRACKS = 8
#: Up to this many systems at once, one dense LAPACK solve beats the block recursion's many small steps.
_DENSE_BATCH = 64


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


def _split(pair, total_flux, first_flux):
    """A parallel pair: its drop [A] (along the first path), the drop's slope with the split eliminated
    [A/Wb], the split's residual [A], that residual's share in the drop [A], and the coefficients that
    update the split from the step of the pair's total flux."""
    first_drop, first_slope = pair.first.drop(first_flux)
    second_drop, second_slope = pair.second.drop(total_flux - first_flux)
    total = np.maximum(first_slope + second_slope, 1e-300)
    residual = first_drop - second_drop
    return (first_drop, first_slope * second_slope / total, residual, first_slope * residual / total,
            second_slope / total, residual / total)


def _next(values):
    """Each segment's successor, the first segment of the next pole being minus this pole's first."""
    return np.concatenate([values[..., 1:], -values[..., :1]], axis=-1)


def _previous(values):
    return np.concatenate([-values[..., -1:], values[..., :-1]], axis=-1)


def _series(pairs, flux, splits):
    """A chain of parallel pairs in series: each pair's split, their summed drop [A] and slope [A/Wb]."""
    parts = [_split(pair, flux, first) for pair, first in zip(pairs, splits, strict=True)]
    return parts, sum(part[0] for part in parts), sum(part[1] for part in parts)


def _residual(e: NetworkElements, remanence, enclosed, state):
    """Ampère's law round every loop [A], and what the Newton step needs.

    ``state`` holds the loop fluxes of the upper, middle and lower loops, then the first path's flux of
    the housing's and the core's pairs and of each pair across the gap and down the teeth.
    """
    upper_loop, middle_loop, lower_loop, housing_flux, core_flux, *splits = state
    gap_splits, tooth_splits = splits[:len(e.gap_series)], splits[len(e.gap_series):]
    upper_flux, middle_flux = upper_loop - _previous(upper_loop), middle_loop - _previous(middle_loop)
    lower_flux = lower_loop - _previous(lower_loop)
    height = e.column_height / e.column_permeability
    column_slope = height / e.column_area
    upper_drop = (upper_flux / e.column_area - remanence[..., None] * e.magnet_mask) * height
    gap, middle_drop, middle_slope = _series(e.gap_series, middle_flux, gap_splits)
    teeth, lower_drop, lower_slope = _series(e.tooth_series, lower_flux, tooth_splits)
    housing = _split(e.housing, upper_loop, housing_flux)
    core = _split(e.core, lower_loop, core_flux)
    inner_face = e.tangential_reluctance * (upper_loop - middle_loop)
    surface = e.surface_reluctance * (middle_loop - lower_loop)
    residuals = (upper_drop - _next(upper_drop) + housing[0] + inner_face,
                 middle_drop - _next(middle_drop) - inner_face + surface,
                 lower_drop - _next(lower_drop) - surface + core[0] + enclosed)
    parts = ((upper_flux, middle_flux, lower_flux), (column_slope, middle_slope, lower_slope), housing, core, gap,
             teeth, (middle_drop, lower_drop))
    return residuals, parts


def _norm(residuals, parts, scale):
    worst = np.abs(residuals[0]).max(axis=-1)
    for residual in residuals[1:]:
        worst = np.maximum(worst, np.abs(residual).max(axis=-1))
    housing, core, gap, teeth = parts[2:6]
    for pair in (housing, core, *gap, *teeth):
        worst = np.maximum(worst, np.abs(pair[2]).max(axis=-1))
    return worst / scale


def _step(e: NetworkElements, residuals, parts):
    """The Newton step of every unknown, the parallel splits eliminated locally."""
    _, slopes, housing, core, gap, teeth, _ = parts
    shape = residuals[0].shape
    slopes = [np.broadcast_to(slope, shape) for slope in slopes]
    block_lower, block_upper, block = (np.zeros((*shape, 3, 3)) for _ in range(3))
    for level, slope in enumerate(slopes):
        block_lower[..., level, level] = -slope
        block_upper[..., level, level] = -_roll(slope)
        block[..., level, level] = slope + _roll(slope)
    inner_face = np.broadcast_to(e.tangential_reluctance, shape)
    surface = np.broadcast_to(e.surface_reluctance, shape)
    block[..., 0, 0] += housing[1] + inner_face
    block[..., 1, 1] += inner_face + surface
    block[..., 2, 2] += surface + core[1]
    block[..., 0, 1] = block[..., 1, 0] = -inner_face
    block[..., 1, 2] = block[..., 2, 1] = -surface
    # the splits' residuals in branch k's drop enter loop k with + and loop k-1 with -
    gap_correction = sum(pair[3] for pair in gap)
    tooth_correction = sum(pair[3] for pair in teeth)
    rhs = np.stack([-residuals[0] + housing[3],
                    -residuals[1] + gap_correction - _next(gap_correction),
                    -residuals[2] + core[3] + tooth_correction - _next(tooth_correction)], axis=-1)
    solver = dense_cyclic_block_tridiagonal if rhs[..., 0, 0].size <= _DENSE_BATCH else solve_cyclic_block_tridiagonal
    step = solver(block_lower, block, block_upper, rhs)
    upper_step, middle_step, lower_step = step[..., 0], step[..., 1], step[..., 2]
    middle_branch, lower_branch = middle_step - _previous(middle_step), lower_step - _previous(lower_step)
    return (upper_step, middle_step, lower_step, housing[4] * upper_step - housing[5],
            core[4] * lower_step - core[5], *(pair[4] * middle_branch - pair[5] for pair in gap),
            *(pair[4] * lower_branch - pair[5] for pair in teeth))


def _roll(values):
    """Each segment's successor's (positive) slope; the sign of the next pole cancels in a slope."""
    return np.concatenate([values[..., 1:], values[..., :1]], axis=-1)


def _trial(e, remanence, enclosed, scale, state, steps, damping):
    trial = tuple(value + damping[..., None] * change for value, change in zip(state, steps, strict=True))
    residuals, parts = _residual(e, remanence, enclosed, trial)
    return trial, residuals, parts, _norm(residuals, parts, scale)


def solve_network(grade: MagnetGrade, temperature_C, elements: NetworkElements, enclosed_current=0.0,
                  what: str = "the magnetic circuit") -> NetworkSolution:
    """Solve the pole's network by Newton's method (see the module docstring).

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade (on its recoil line at the temperature: B = Br(T) + μ0·μrec·H).
    temperature_C : float or ndarray
        Magnet temperature [°C], broadcasting with the batch of ``elements``.
    elements : NetworkElements
        The network's element values (:func:`.network_elements.network_elements`), batch shape (B,).
    enclosed_current : float or ndarray
        Armature current enclosed by each lower loop [A], broadcasting to (B, segments)
        (:func:`.armature_mmf.enclosed_currents`); 0 at no load.
    what : str
        What is solved, for the error message.

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
    shape = e.column_area.shape
    batch = shape[:-1]
    temperature = np.asarray(temperature_C, dtype=float)
    remanence = np.broadcast_to(np.asarray(remanence_at(grade, temperature), dtype=float), batch)
    enclosed = np.broadcast_to(np.asarray(enclosed_current, dtype=float), shape)
    scale = np.maximum(remanence * e.magnet_thickness / (MU_0 * grade.recoil_permeability), 1.0)
    state: tuple[np.ndarray, ...] = tuple(np.zeros(shape) for _ in range(5 + len(e.gap_series) + len(e.tooth_series)))
    iterations = np.zeros(batch, dtype=int)
    residuals, parts = _residual(e, remanence, enclosed, state)
    norm = _norm(residuals, parts, scale)
    for _ in range(MAX_ITERATIONS):
        active = norm > TOLERANCE
        if not active.any():
            break
        iterations += active
        steps = _step(e, residuals, parts)
        damping = np.where(active, 1.0, 0.0)
        trial, trial_residuals, trial_parts, trial_norm = _trial(e, remanence, enclosed, scale, state, steps, damping)
        for _ in range(_BACKTRACKS):
            # a full step where it lowers the residual, else halved, up to _BACKTRACKS times
            worse = active & (trial_norm >= norm) & (damping > 1e-3)
            if not worse.any():
                break
            damping = np.where(worse, 0.5 * damping, damping)
            trial, trial_residuals, trial_parts, trial_norm = _trial(e, remanence, enclosed, scale, state, steps,
                                                                     damping)
        state, residuals, parts, norm = trial, trial_residuals, trial_parts, trial_norm
    converged = norm <= TOLERANCE
    if not np.all(converged):
        worst = int(np.argmax(np.where(converged, 0.0, norm).ravel()))
        raise MagneticCircuitError(
            f"{what} did not converge (design {worst} of the batch: residual {float(norm.ravel()[worst]):.2g} of the "
            f"magnet's MMF after {MAX_ITERATIONS} Newton steps); check that the dimensions and the steels' B(H) data "
            "are finite and positive")
    upper_loop, middle_loop, lower_loop, housing_flux, core_flux, *splits = state
    upper_flux, middle_flux, _ = parts[0]
    gap_drop, teeth_drop = parts[6]
    tooth_flux = splits[len(e.gap_series)] if e.tooth_series[0].first.steel is not None else np.zeros(shape)

    def magnet_field(flux):
        with np.errstate(invalid="ignore"):
            return np.where(e.magnet_mask > 0.0, (flux / e.column_area - remanence[..., None])
                            / (MU_0 * grade.recoil_permeability), np.nan)

    return NetworkSolution(
        housing_flux=upper_loop, gap_loop_flux=middle_loop, core_flux=lower_loop, upper_flux=upper_flux,
        lower_flux=middle_flux,
        housing_steel_flux=housing_flux, core_steel_flux=core_flux, tooth_steel_flux=tooth_flux,
        magnet_field_outer=magnet_field(upper_flux), magnet_field_inner=magnet_field(middle_flux),
        gap_drop=np.asarray(gap_drop), teeth_drop=np.asarray(teeth_drop), remanence=remanence,
        knee_field=np.broadcast_to(np.asarray(knee_field_at(grade, temperature), dtype=float), batch),
        iterations=iterations,
    )
