"""Why a sizing search found no design: the requirement the closest designs miss, and by how much.

TEMPORARY COPY written in the sizing core's worktree so that :func:`core.sizing.size` runs end to end;
the CLI helper owns this module (with the evaluated relaxations: a supply or an envelope that would
make the closest design pass) and the merge takes theirs.

References
----------
.. [1] the checks of :mod:`core.checks`, as :mod:`core.batch` codes them.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from .batch import CHECK_KEYS, FAIL_CODE, BatchFigures
from .schema import Project

_CASES = ("cold", "nominal", "hot")


@dataclass(frozen=True)
class Shortfall:
    """One requirement no screened design met: what, in words, and how far the closest design misses."""

    requirement: str  #: check key ("load", "demagnetization", ...) or "fit" / "solution"
    text: str  #: the sentence, with numbers and units
    closest_share: float  #: how far the closest design misses, as a share (0.04 = 4 %); NaN if not measured


def explain(project: Project, batch: BatchFigures, values: Mapping[str, np.ndarray],
            spec: Any) -> tuple[tuple[Shortfall, ...], str]:
    """The requirements no screened design met, closest first, and a paragraph saying so.

    Parameters
    ----------
    project : Project
        The requirement (the design the search started from).
    batch : BatchFigures
        The screened candidates' figures.
    values : mapping of str to ndarray
        Free key to the candidates' values (file units).
    spec : SizingSpec
        The search.

    Returns
    -------
    tuple
        The shortfalls and the paragraph in words.

    References
    ----------
    .. [1] module docstring.
    """
    if batch.size == 0:
        text = ("none of the sampled designs fits together (every candidate broke a fit rule of the file); "
                "widen the ranges")
        return (Shortfall("fit", text, float("nan")),), text[0].upper() + text[1:] + "."
    solved = ~batch.failed
    failing = {key: (batch.status[key] == FAIL_CODE) & solved for key in CHECK_KEYS}
    shortfalls = []
    required = project.load.speed_rpm
    speeds = np.min(np.stack([batch.figures[f"{c}.rated_speed_rad_per_s"] for c in _CASES]), axis=0) * 30 / np.pi
    for key in sorted(CHECK_KEYS, key=lambda k: -int(failing[k].sum())):
        count = int(failing[key].sum())
        if count == 0:
            continue
        share = float("nan")
        missing = failing[key]
        if key == "load" and np.isfinite(speeds[missing]).any():
            best = float(np.nanmax(speeds[missing]))
            share = max(0.0, 1.0 - best / required) if required > 0 else float("nan")
            text = (f"{count} of {int(solved.sum())} solved designs miss the rated load "
                    f"({project.load.torque_mNm:g} mN·m at {required:g} rpm at every temperature); the fastest "
                    f"of them reaches {best:.4g} rpm ({share:.1%} slow)")
        else:
            text = f"{count} of {int(solved.sum())} solved designs fail the {key.replace('_', ' ')} check"
        shortfalls.append(Shortfall(key, text, share))
    if not solved.any():
        shortfalls.append(Shortfall("solution", "no screened design's magnetic circuit could be solved", float("nan")))
    paragraph = "No design passes every check. " + "; ".join(s.text for s in shortfalls) + "."
    return tuple(shortfalls), paragraph


__all__ = ["Shortfall", "explain"]
