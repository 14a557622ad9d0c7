"""The magnets' cases over arrays of designs: the field at the currents each case is judged at, the
margins to the knee of every ordinary and fault case (core.magnet_load_fields and core.demagnetization,
for many designs at once; no formula of its own).
"""

from __future__ import annotations

import numpy as np

from .armature_mmf import distinct_rotor_positions
from .batch_arrays import solve_groups
from .magnets import knee_field_at
from .network_elements import branch_centres

#: A case: (margin to the knee [A/m], current [A], magnet temperature [°C]), arrays over the designs.
Case = tuple[np.ndarray, np.ndarray, np.ndarray]
_LABELS = ("cold", "hot")


def magnet_cases_many(designs, groups, geometry, lots, winding, judged: dict, magnet_temperatures: dict,
                      current_limit: np.ndarray, reversing: np.ndarray) -> tuple[dict[str, Case], dict[str, Case]]:
    """Every demagnetization case under load and every direct-supply fault, cold and hot, for many designs.

    Parameters
    ----------
    designs, groups, geometry, lots
        As :func:`core.batch_arrays.solve_groups`: the designs (SI), their groups, their stacked
        cross-sections [m, rad] and magnet lots.
    winding : tuple of ndarray
        Total conductors and parallel paths of each design [1].
    judged : dict
        ``"cold"``/``"hot"`` → (stall current, reversal current) of each design with no limit [A] (the
        reversal current infinite where there is no finite no-load speed).
    magnet_temperatures : dict
        ``"cold"``/``"hot"`` → each design's magnet temperature in that case [°C].
    current_limit : ndarray
        The drive's limit of each design, NaN for none [A].
    reversing : ndarray of bool
        The application plugs the motor at speed.

    Returns
    -------
    tuple of dict
        The ordinary cases (``stall_cold``, ``reversal_cold``, ``current_limit_cold``, the same hot) and
        the faults (``stall_cold``, ``reversal_cold``, the same hot), each key → :data:`Case`; NaN margins
        and currents where a case does not apply.

    References
    ----------
    .. [1] core.magnet_load_fields (the field at exactly the judged currents, the armature's current in
       its slots at every rotor position the network tells apart, the worst counting);
       core.demagnetization.judged_currents and demagnetization_cases, which it mirrors.
    """
    n = len(designs)
    limited = ~np.isnan(current_limit)
    limit_or_inf = np.where(limited, current_limit, np.inf)
    # per design: (cold, hot) × (stall, reversal, limit); a current that does not exist solved at 0 and masked
    currents = np.stack([np.where(np.isfinite(i), i, 0.0) for label in _LABELS
                         for i in (*judged[label], np.where(limited, current_limit, 0.0))], axis=1)
    temperatures = np.repeat(np.stack([magnet_temperatures[label] for label in _LABELS], axis=1), 3, axis=1)
    g = geometry
    positions = distinct_rotor_positions(branch_centres(g.magnet_arc * g.poles / (2.0 * np.pi), 2.0 * np.pi / g.poles),
                                         g.slots)
    count, turns = currents.shape[1], positions.shape[1]
    slotted = solve_groups(designs, groups, g, lots, turns * count, np.tile(temperatures, turns),
                           np.tile(currents, turns), True, winding,
                           "the magnetic circuit under load (the magnets' cases)", np.repeat(positions, count, axis=1),
                           seed_period=count)  # each position starts from the first position's solution
    worst = slotted["worst_field"].reshape(n, turns, count).min(axis=1)  # (n, count): the worst position

    cases: dict[str, Case] = {}
    faults: dict[str, Case] = {}
    nan = np.full(n, np.nan)
    for index, label in enumerate(_LABELS):
        temperature = magnet_temperatures[label]
        knee = knee_field_at(lots, temperature)
        stall_i, reversal_i = judged[label]
        stall_field, reversal_field, limit_field = (worst[:, 3 * index + which] for which in range(3))
        # the drive holds the current at its limit: the lesser of the two, as min() takes it in evaluate
        drive_stall, drive_reversal = np.minimum(stall_i, limit_or_inf), np.minimum(reversal_i, limit_or_inf)
        drive_stall_field = np.where(stall_i <= limit_or_inf, stall_field, limit_field)
        drive_reversal_field = np.where(reversal_i <= limit_or_inf, reversal_field, limit_field)
        cases[f"stall_{label}"] = (drive_stall_field - knee, drive_stall, temperature)
        cases[f"reversal_{label}"] = (np.where(reversing, drive_reversal_field - knee, nan),
                                      np.where(reversing, drive_reversal, nan), temperature)
        cases[f"current_limit_{label}"] = (np.where(limited, limit_field - knee, nan),
                                           np.where(limited, current_limit, nan), temperature)
        faults[f"stall_{label}"] = (stall_field - knee, stall_i, temperature)
        finite = np.isfinite(reversal_i)
        faults[f"reversal_{label}"] = (np.where(finite, reversal_field - knee, nan),
                                       np.where(finite, reversal_i, nan), temperature)
    return cases, faults


__all__ = ["Case", "magnet_cases_many"]
