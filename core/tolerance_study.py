"""The tolerance study: a Monte Carlo run of the batch chain over a design's production spread.

Steps, like the hand study an engineer would run on a spreadsheet of motors:

    1. spreads      the project's tolerances in SI, refused if an end cannot be built  core.tolerances
    2. motors       N motors drawn from them (Latin hypercube, fixed seed)             core.tolerances
    3. figures      the screening figures of every motor                               core.batch
    4. statistics   per key figure: the median and the 0.135 % and 99.865 % points
                    (the ±3σ points of a normal spread), the yield, the worst margin
    5. drivers      which tolerance drives each figure's spread: first-order Sobol
                    indices estimated from the same motors (RBD-FAST, SALib)

A motor whose chain fails is counted with its message, never dropped silently: it does not pass (the
yield counts it as a reject) and the figures' statistics are over the motors that solved. A motor whose
checks only warn passes: a case inside the required margin to the knee has not demagnetized, and that
margin covers the spread the study draws explicitly (core.sizing_requirement, choosing among candidates,
counts it as a miss instead); the worst margin is reported beside the yield.

Drivers: the first-order Sobol index S_i = V(E[Y | X_i]) / V(Y) is the share of the figure's variance
that tolerance i explains on its own (Sobol 1993). It is estimated from the study's own motors, with no
extra runs, by RBD-FAST: the outputs are reordered along each tolerance and their low-frequency power
is that tolerance's share (Tarantola et al. 2006; Plischke 2010, the reordering for any sample;
Tissot and Prieur 2012, the bias correction), as ``SALib.analyze.rbd_fast`` computes it. For the nearly
linear spread of a motor the shares add up to about 1; what they leave is interaction and noise.
"""

from __future__ import annotations

from collections import Counter
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from SALib.analyze import rbd_fast

from .batch import FAIL_CODE, evaluate_many
from .design import Design, design_from_project
from .errors import MagneticCircuitError, ProjectError
from .schema import Project
from .tolerances import Spread, check_spreads, draw, drawn_designs, drawn_parts, spreads_of

#: The figures the study reports: what a datasheet quotes and what decides a design's safety.
KEY_FIGURES = (
    "nominal.no_load_speed_rad_per_s",
    "nominal.no_load_current_A",
    "nominal.ke_V_s_per_rad",
    "nominal.terminal_resistance_ohm",
    "nominal.stall_torque_N_m",
    "nominal.stall_current_A",
    "nominal.rated_speed_rad_per_s",
    "nominal.rated_current_A",
    "worst_demagnetization_margin_A_per_m",
)
LOW_QUANTILE = 0.00135  #: the -3σ point of a normal distribution, Φ(-3) [1]
HIGH_QUANTILE = 0.99865  #: the +3σ point, Φ(3) [1]
#: Motors evaluated between two progress reports (and chances to stop) [1]: large enough that the batch
#: chain's cost per call is shared by many motors, small enough that a cancel is heard within seconds
#: (ferrite demo, 1000 motors, 2026-12-04: 18.5 ms a motor and at most 5.7 s between reports at 250;
#: 18.0 ms and 9.1 s at 500).
CHUNK = 250
HARMONICS = 10  #: RBD-FAST's interference parameter M, SALib's default [1]
BOOTSTRAP_RESAMPLES = 20  #: SALib's bootstrap of each index (its confidence is not reported) [1]
#: Fewest solved motors that are ranked: RBD-FAST's bias correction takes 2M/N, and SALib's bootstrap
#: draws half the motors, so N must be well above 4M (at 100, the correction is 0.4 of 1 - S1) [1]
MIN_MOTORS_RANKED = 10 * HARMONICS


class StudyCancelled(Exception):
    """The caller's progress callback asked the study to stop."""


@dataclass(frozen=True)
class FigureSpread:
    """One figure over the drawn motors, SI."""

    name: str  #: the batch's figure name, e.g. "nominal.ke_V_s_per_rad"
    nominal: float  #: of the design as drawn, no tolerance applied
    typical: float  #: the median of the motors that solved
    low: float  #: the 0.135 % point
    high: float  #: the 99.865 % point
    values: np.ndarray  #: every motor's value (NaN where its chain failed), for histograms


@dataclass(frozen=True)
class Driver:
    """How much of a figure's spread one tolerance explains on its own."""

    tolerance: str  #: the file's key, e.g. "tolerances.remanence_pct"
    label: str  #: e.g. "Br"
    share: float  #: first-order Sobol index, clipped at 0 [1]


@dataclass(frozen=True)
class ToleranceStudy:
    """What the production spread does to a design."""

    samples: int  #: motors drawn [1]
    seed: int  #: seed that draws them again
    spreads: tuple[Spread, ...]  #: the tolerances, SI
    figures: dict[str, FigureSpread]  #: per key figure (:data:`KEY_FIGURES`)
    yield_fraction: float  #: share of the motors that solve and pass every check [1]
    worst_demagnetization_margin_A_per_m: float  #: the least margin to the knee over every motor and case [A/m]
    failed: int  #: motors whose chain failed [1]
    failure_messages: dict[str, int]  #: why, and how many motors each
    failing_checks: dict[str, int]  #: check key → motors that fail it [1]
    nominal_failing_checks: tuple[str, ...]  #: the checks the design as drawn fails already (no tolerance)
    drivers: dict[str, tuple[Driver, ...]]  #: per key figure, the tolerances that spread it, largest first
    parts: dict[str, np.ndarray]  #: what each motor was built from (:func:`core.tolerances.drawn_parts`), SI
    deviations: np.ndarray  #: (samples, spreads): each motor's deviation, a share of each ± (builds it again)
    passes: np.ndarray  #: bool per motor: solved and failed no check
    failure_message: tuple[str, ...]  #: per motor, why its chain failed ("" where it solved)


def _quantiles(values: np.ndarray) -> tuple[float, float, float]:
    solved = values[np.isfinite(values)]
    if solved.size == 0:
        return (float("nan"),) * 3
    low, typical, high = np.quantile(solved, [LOW_QUANTILE, 0.5, HIGH_QUANTILE])
    return float(typical), float(low), float(high)


def _drivers(spreads: tuple[Spread, ...], deviations: np.ndarray, values: np.ndarray,
             seed: int) -> tuple[Driver, ...]:
    """First-order Sobol indices of the figure by RBD-FAST, over the tolerances that spread at all."""
    solved = np.isfinite(values)
    active = [i for i, s in enumerate(spreads) if s.plus_minus > 0.0]
    y = values[solved]
    if not active or y.size < MIN_MOTORS_RANKED or np.ptp(y) <= 1e-12 * max(np.abs(y).max(), 1e-300):
        return ()
    problem = {"num_vars": len(active), "names": [spreads[i].key for i in active],
               "bounds": [[-1.0, 1.0]] * len(active)}
    result = rbd_fast.analyze(problem, deviations[np.ix_(solved, active)], y, M=HARMONICS,
                              num_resamples=BOOTSTRAP_RESAMPLES, seed=seed)
    drivers = [Driver(spreads[i].key, spreads[i].label, max(float(share), 0.0))
               for i, share in zip(active, result["S1"], strict=True)]
    return tuple(sorted(drivers, key=lambda d: -d.share))


def run_study(project: Project, samples: int | None = None, seed: int | None = None,
              progress: Callable[[int, int], bool] | None = None, design: Design | None = None) -> ToleranceStudy:
    """Draw ``samples`` motors from the project's tolerances, evaluate them all and sum up the spread.

    Parameters
    ----------
    project : Project
        A validated project; its ``[tolerances]`` table gives the spreads (and the defaults of
        ``samples`` and ``seed``).
    samples : int, optional
        Motors to draw [1]; the table's ``samples`` by default.
    seed : int, optional
        Seed of the draw; the table's ``seed`` by default.
    progress : callable, optional
        Called as ``progress(done, total)`` after each chunk of motors; return False to stop the study
        (it then raises :class:`StudyCancelled`).
    design : Design, optional
        The project in SI, if the caller has it already.

    Returns
    -------
    ToleranceStudy
        The spread of the key figures, the yield, the worst margin, the failures and the drivers.

    Raises
    ------
    ProjectError
        Naming the tolerance and its limit, when an end of a spread is a part that cannot be made.
    StudyCancelled
        When ``progress`` returned False.

    References
    ----------
    .. [1] I. M. Sobol (1993), sensitivity estimates for nonlinear mathematical models, Mathematical
       Modelling and Computational Experiments 1 (the first-order index).
    .. [2] S. Tarantola, D. Gatelli, T. Mara (2006), random balance designs for the estimation of first
       order global sensitivity indices, Reliability Engineering and System Safety 91; E. Plischke
       (2010), an effective algorithm for computing global sensitivity indices (EASI), ibid. 95 (RBD-FAST
       on any sample, as SALib implements it).
    """
    design = design_from_project(project) if design is None else design
    samples = project.tolerances.samples if samples is None else samples
    seed = project.tolerances.seed if seed is None else seed
    if samples < 1:
        raise ValueError(f"samples must be at least 1, not {samples}")
    spreads = spreads_of(project, design)
    check_spreads(project, design, spreads)
    deviations = draw(spreads, samples, seed)
    nominal = evaluate_many([design])
    chunks = []
    for start in range(0, samples, CHUNK):
        chunks.append(evaluate_many(drawn_designs(design, spreads, deviations[start:start + CHUNK])))
        if progress is not None and progress(min(start + CHUNK, samples), samples) is False:
            raise StudyCancelled(f"stopped after {min(start + CHUNK, samples)} of {samples} motors")
    failed = np.concatenate([c.failed for c in chunks])
    passes = np.concatenate([c.passes_all for c in chunks])
    messages = [m for c in chunks for m in c.failure_messages]
    figures = {}
    drivers = {}
    for name in KEY_FIGURES:
        values = np.concatenate([c.figures.get(name, np.full(c.size, np.nan)) for c in chunks])
        typical, low, high = _quantiles(values)
        nominal_value = float(nominal.figures.get(name, np.array([np.nan]))[0])
        figures[name] = FigureSpread(name, nominal_value, typical, low, high, values)
        drivers[name] = _drivers(spreads, deviations, values, seed)
    margins = figures["worst_demagnetization_margin_A_per_m"].values
    failing = {key: int(sum(int(np.count_nonzero((c.status[key] == FAIL_CODE) & ~c.failed)) for c in chunks))
               for key in chunks[0].status}
    return ToleranceStudy(
        samples=samples, seed=seed, spreads=spreads, figures=figures,
        yield_fraction=float(np.count_nonzero(passes)) / samples,
        worst_demagnetization_margin_A_per_m=float(np.nanmin(margins)) if np.isfinite(margins).any() else float("nan"),
        failed=int(np.count_nonzero(failed)),
        failure_messages=dict(Counter(m for m, f in zip(messages, failed.tolist(), strict=True) if f).most_common()),
        failing_checks={key: count for key, count in failing.items() if count},
        nominal_failing_checks=tuple(key for key, codes in nominal.status.items() if codes[0] == FAIL_CODE),
        drivers=drivers,
        parts=drawn_parts(design, spreads, deviations),
        deviations=deviations,
        passes=passes,
        failure_message=tuple(messages),
    )


#: The figures whose ±3σ motors bound the band of speed-torque curves.
BAND_FIGURES = ("nominal.no_load_speed_rad_per_s", "nominal.rated_speed_rad_per_s", "nominal.stall_torque_N_m")
BAND_POINTS = 40  #: torques the band is given at [1]


@dataclass(frozen=True)
class SpeedBand:
    """The lowest and highest nominal speed-torque curve of the motors at the study's ±3σ points."""

    torque_N_m: np.ndarray  #: from no load to the smallest stall torque among those motors [N·m]
    low_speed_rad_per_s: np.ndarray  #: [rad/s]
    high_speed_rad_per_s: np.ndarray  #: [rad/s]
    motors: tuple[int, ...]  #: which drawn motors (0-based) were evaluated in full


def band_motors(study: ToleranceStudy) -> tuple[int, ...]:
    """The drawn motors nearest the 0.135 % and 99.865 % points of no-load speed, rated speed and stall torque.

    Parameters
    ----------
    study : ToleranceStudy
        A finished study.

    Returns
    -------
    tuple of int
        Distinct motor indices, at most six.
    """
    chosen: list[int] = []
    for name in BAND_FIGURES:
        spread = study.figures[name]
        values = np.where(np.isfinite(spread.values), spread.values, np.inf)
        for point in (spread.low, spread.high):
            if np.isfinite(point) and np.isfinite(values).any():
                index = int(np.argmin(np.abs(values - point)))
                if index not in chosen:
                    chosen.append(index)
    return tuple(chosen)


def speed_band(design: Design, study: ToleranceStudy) -> SpeedBand | None:
    """The envelope of the nominal speed-torque curves of the motors at the ±3σ points, each evaluated in full.

    The batch gives figures, not curves; the curves of the few motors at the ends of the speed and torque
    spreads bound the band the drawn motors' curves fill (between them the curves of a DC motor are
    nearly straight lines, so the motors at the ends of no-load speed, rated speed and stall torque are
    the ones that bound it).

    Parameters
    ----------
    design : Design
        The design as drawn, SI (the study's nominal).
    study : ToleranceStudy
        Its study.

    Returns
    -------
    SpeedBand or None
        None when no band motor solves.
    """
    from .evaluate import evaluate

    indices = band_motors(study)
    if not indices:
        return None
    motors = drawn_designs(design, study.spreads, study.deviations[list(indices)])
    curves = []
    for motor in motors:
        try:
            curves.append(evaluate(motor).nominal.curve)
        except (MagneticCircuitError, ProjectError):
            continue
    if not curves:
        return None
    top = min(float(curve.torque_N_m[-1]) for curve in curves)
    torque = np.linspace(0.0, top, BAND_POINTS)
    speeds = np.array([np.interp(torque, curve.torque_N_m, curve.speed_rad_per_s) for curve in curves])
    return SpeedBand(torque, speeds.min(axis=0), speeds.max(axis=0), indices)


__all__ = ["BAND_FIGURES", "HIGH_QUANTILE", "KEY_FIGURES", "LOW_QUANTILE", "Driver", "FigureSpread", "SpeedBand",
           "StudyCancelled", "ToleranceStudy", "band_motors", "run_study", "speed_band"]
