"""What a sizing search minimises or maximises, read off the screening figures, and the trade-off front.

Each :class:`Objective` reads one figure of :mod:`core.batch` (or one derived here from them, named
alike: the worst-temperature rated efficiency, the hot rated copper loss, the housing's outer diameter
and the overall length). :func:`non_dominated` marks the designs no other design beats on every
objective at once (Pareto optimality).

References
----------
.. [1] K. Deb, *Multi-Objective Optimization using Evolutionary Algorithms*, Wiley 2001, ch. 2
   (dominance and the non-dominated set).
.. [2] pymoo's NonDominatedSorting (J. Blank, K. Deb, "pymoo: Multi-objective optimization in Python",
   IEEE Access 8 (2020) 89497-89509).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
from pymoo.util.nds.non_dominated_sorting import NonDominatedSorting

_CASES = ("cold", "nominal", "hot")


@dataclass(frozen=True)
class Objective:
    """One figure a search may minimise or maximise."""

    name: str  #: "mass", "cost", "efficiency", "diameter", "length", "margin", "copper_loss"
    label: str  #: as the tables and plots title it
    figure: str  #: the figure it reads (core.batch names, or a derived one of :func:`derived_figures`)
    unit: str  #: SI unit of the figure
    maximise: bool  #: True for efficiency and margin


OBJECTIVES: dict[str, Objective] = {o.name: o for o in (
    Objective("mass", "Active mass", "mass.active_kg", "kg", False),
    Objective("cost", "Material cost", "cost.total", "", False),
    Objective("efficiency", "Rated efficiency (worst temperature)", "worst.rated_efficiency", "1", True),
    Objective("diameter", "Housing outer diameter", "envelope.outer_diameter_m", "m", False),
    Objective("length", "Overall length", "envelope.overall_length_m", "m", False),
    Objective("margin", "Least demagnetization margin", "worst_demagnetization_margin_A_per_m", "A/m", True),
    Objective("copper_loss", "Copper loss at rated load (hot)", "hot.rated_copper_loss_W", "W", False),
)}


def derived_figures(figures: Mapping[str, np.ndarray], outer_diameter: np.ndarray,
                    overall_length: np.ndarray) -> dict[str, np.ndarray]:
    """The figures the objectives read that :mod:`core.batch` does not name.

    Parameters
    ----------
    figures : mapping of str to ndarray
        Screening figures (:func:`core.batch.evaluate_many` or :func:`core.batch.screening_figures`).
    outer_diameter : ndarray
        The housing's outer diameter [m].
    overall_length : ndarray
        The overall length of the motor body [m] (:func:`core.fit_rules.overall_length`).

    Returns
    -------
    dict of str to ndarray
        ``worst.rated_efficiency`` [1] (the least over the cold, nominal and hot cases),
        ``hot.rated_copper_loss_W`` [W] (I²·R at the hot rated point), ``envelope.outer_diameter_m`` [m],
        ``envelope.overall_length_m`` [m].

    References
    ----------
    .. [1] copper loss P = I²·R (Joule's law).
    """
    efficiency = np.min(np.stack([np.asarray(figures[f"{c}.rated_efficiency"], dtype=float) for c in _CASES]),
                        axis=0)
    hot_current = np.asarray(figures["hot.rated_current_A"], dtype=float)
    return {
        "worst.rated_efficiency": efficiency,
        "hot.rated_copper_loss_W": hot_current**2 * np.asarray(figures["hot.terminal_resistance_ohm"], dtype=float),
        "envelope.outer_diameter_m": np.asarray(outer_diameter, dtype=float),
        "envelope.overall_length_m": np.asarray(overall_length, dtype=float),
    }


def objective_matrix(names: tuple[str, ...], figures: Mapping[str, np.ndarray]) -> np.ndarray:
    """The chosen objectives as columns to minimise (maximised ones negated).

    Parameters
    ----------
    names : tuple of str
        Objective names (keys of :data:`OBJECTIVES`).
    figures : mapping of str to ndarray
        Figures with the derived ones (:func:`derived_figures`).

    Returns
    -------
    ndarray
        Shape (n, len(names)), in the objectives' SI units, each column to be minimised.

    References
    ----------
    .. [1] module docstring.
    """
    columns = []
    for name in names:
        objective = OBJECTIVES[name]
        values = np.asarray(figures[objective.figure], dtype=float)
        columns.append(-values if objective.maximise else values)
    return np.stack(columns, axis=1)


def non_dominated(values: np.ndarray) -> np.ndarray:
    """Which rows no other row dominates (no worse in every column and better in one), all minimised.

    Parameters
    ----------
    values : ndarray
        Shape (n, k): n designs, k objectives to minimise, finite.

    Returns
    -------
    ndarray of bool
        Shape (n,): True on the non-dominated set (equal rows are all kept).

    References
    ----------
    .. [1] module docstring (pymoo's efficient non-dominated sort).
    """
    values = np.asarray(values, dtype=float)
    mask = np.zeros(values.shape[0], dtype=bool)
    if values.shape[0] == 0:
        return mask
    front = NonDominatedSorting(method="efficient_non_dominated_sort").do(values, only_non_dominated_front=True)
    mask[np.asarray(front, dtype=int)] = True
    return mask


def validate_objectives(names: tuple[str, ...]) -> None:
    """Raise ValueError naming an unknown objective and the known ones.

    Parameters
    ----------
    names : tuple of str
        The objectives asked for.

    Raises
    ------
    ValueError
        For an empty tuple, an unknown name or a repeat.

    References
    ----------
    .. [1] :data:`OBJECTIVES`.
    """
    if not names:
        raise ValueError(f"objective: choose at least one of {', '.join(OBJECTIVES)}")
    for name in names:
        if name not in OBJECTIVES:
            raise ValueError(f"objective: unknown {name!r} (choose from {', '.join(OBJECTIVES)})")
    if len(set(names)) != len(names):
        raise ValueError("objective: each objective once")


__all__ = ["OBJECTIVES", "Objective", "derived_figures", "non_dominated", "objective_matrix", "validate_objectives"]
