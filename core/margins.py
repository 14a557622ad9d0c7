"""Required margin to the knee, the three states of a demagnetization case, and the fault cases.

**Required margin.** A case whose field stays just above the knee passes on paper and fails in
production: a batch's HcJ spreads by several per cent, and the knee with it. The project sets the least
margin a case must keep, as a share s of HcJ at the case's temperature (default 5 %, common practice,
no source), so that it scales with the grade and follows HcJ's temperature dependence:

    required = s·HcJ(T);   past_knee if H - H_knee ≤ 0,  marginal if 0 < H - H_knee < required,  else safe.

**Fault cases.** A drive fails short, or a battery is connected directly: the current is then no
longer the drive's limit but the supply's own, at stall (V - Vb)/R and on reversal at no-load speed
(V + E)/R. These are computed cold and hot with the same field model as every other case
(:func:`core.demagnetization.demagnetization_case`) and reported in their own group. Whether the magnets
must survive them is the project's choice (``supply.fault_cases``); by default they must when the
application reverses the motor (a reversing drive that fails is the likeliest way to plug it unlimited).

References
----------
.. [1] IEC 60404-8-1 (magnetically hard materials: HcJ given as a minimum, batches above it; from memory);
   the 5 % share is common practice, no source.
.. [2] S. J. Chapman, Electric Machinery Fundamentals, 5th ed., 2012, ch. 9 (stall and plugging
   currents of a DC motor; from memory).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import replace

from .demagnetization import MagnetState, TemperatureCase, demagnetization_case
from .magnets import MagnetGrade, intrinsic_coercivity_at
from .performance import plugging_current, stall_current
from .results import DemagnetizationCase, DemagnetizationResult, FaultsResult

SAFE, MARGINAL, PAST_KNEE = "safe", "marginal", "past_knee"
_ORDER = {SAFE: 0, MARGINAL: 1, PAST_KNEE: 2}


def required_margin(grade: MagnetGrade, temperature_C: float, share: float) -> float:
    """The least margin to the knee a case must keep: ``share`` of HcJ at its temperature.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    temperature_C : float
        The case's magnet temperature [°C].
    share : float
        The project's required margin as a share of HcJ [1].

    Returns
    -------
    float
        [A/m], positive.

    References
    ----------
    .. [1] module docstring (common practice, no source).
    """
    return share * abs(float(intrinsic_coercivity_at(grade, temperature_C)))


def status_of(margin: float, required: float) -> str:
    """The case's state from its margin to the knee and the margin it must keep.

    Parameters
    ----------
    margin : float
        H - H_knee [A/m]; positive is above the knee.
    required : float
        The required margin [A/m].

    Returns
    -------
    str
        "past_knee" (margin ≤ 0), "marginal" (0 < margin < required) or "safe".

    References
    ----------
    .. [1] module docstring.
    """
    if margin <= 0.0:
        return PAST_KNEE
    return MARGINAL if margin < required else SAFE


def judged(case: DemagnetizationCase, grade: MagnetGrade, share: float) -> DemagnetizationCase:
    """``case`` with its required margin and state.

    Parameters
    ----------
    case : DemagnetizationCase
        A case's verdict against the knee.
    grade : MagnetGrade
        The magnet grade, for HcJ at the case's own temperature.
    share : float
        The required margin as a share of that HcJ [1] (``magnets.required_margin_pct_of_HcJ`` / 100).

    Returns
    -------
    DemagnetizationCase
        A copy with ``required_margin_A_per_m`` [A/m] and ``status`` filled in.
    """
    required = required_margin(grade, case.temperature_C, share)
    return replace(case, required_margin_A_per_m=required, status=status_of(case.margin_A_per_m, required))


def worst_status(cases: Sequence[DemagnetizationCase]) -> str:
    """The worst state among ``cases`` ("past_knee" over "marginal" over "safe").

    Parameters
    ----------
    cases : sequence of DemagnetizationCase
        Judged cases.

    Returns
    -------
    str
        The worst status.
    """
    return max((c.status for c in cases), key=_ORDER.__getitem__, default=SAFE)


def with_required_margin(result: DemagnetizationResult, grade: MagnetGrade, share: float) -> DemagnetizationResult:
    """Every case of ``result`` judged against the required margin.

    Parameters
    ----------
    result : DemagnetizationResult
        The cases against the knee.
    grade, share : MagnetGrade, float
        As for :func:`judged`, which judges each case.

    Returns
    -------
    DemagnetizationResult
        A copy whose cases carry their required margin and status, with the group's worst status
        and the largest required margin [A/m].
    """
    cases = tuple(judged(c, grade, share) for c in result.cases)
    return replace(result, cases=cases, required_margin_share=share, status=worst_status(cases),
                   required_margin_A_per_m=max(c.required_margin_A_per_m for c in cases))


def must_survive_faults(setting: str, reversing: bool) -> bool:
    """Whether the project requires the magnets to survive the direct-supply faults.

    Parameters
    ----------
    setting : str
        ``supply.fault_cases``: "must survive", "report" or "must survive if reversing".
    reversing : bool
        The application reverses the motor at speed.

    Returns
    -------
    bool
        True when a failing fault case fails the design.
    """
    return setting == "must survive" or (setting == "must survive if reversing" and reversing)


def direct_supply_faults(grade: MagnetGrade, temperature_cases: Sequence[TemperatureCase],
                         magnet_state: Callable[[str, float], MagnetState], share: float,
                         must_survive: bool) -> FaultsResult:
    """Stall and reversal at no-load speed with the supply applied directly, at each temperature case.

    Parameters
    ----------
    grade : MagnetGrade
        The magnet grade.
    temperature_cases : sequence of TemperatureCase
        The coldest and the hottest case, each with its motor model (resistance, Ke) and no-load speed.
    magnet_state : callable
        ``magnet_state(label, current)``: the magnet's field at that case and armature current [A]
        (the same model as the ordinary cases).
    share : float
        The required margin as a share of HcJ [1].
    must_survive : bool
        From :func:`must_survive_faults`.

    Returns
    -------
    FaultsResult
        The four fault cases (those with a finite current), judged, and the worst of them.

    References
    ----------
    .. [1] Chapman 2012, ch. 9 (stall (V - Vb)/R and plugging (V + E)/R currents; from memory).
    """
    cases = []
    for case in temperature_cases:
        t = case.magnet_temperature_C
        for kind, name, current in (
                ("stall", f"stall, direct supply, {case.label}", float(stall_current(case.model))),
                ("reversal", f"reversal, direct supply, {case.label}",
                 float(plugging_current(case.model, case.no_load_speed)))):
            if not math.isfinite(current):
                continue  # no finite no-load speed to reverse from (a design the checks already refuse)
            verdict = demagnetization_case(name, kind, grade, t, current, magnet_state(case.label, current))
            cases.append(judged(verdict, grade, share))
    worst = min(cases, key=lambda c: c.margin_A_per_m)
    return FaultsResult(must_survive=must_survive, ok=all(c.ok for c in cases), worst_case=worst.name,
                        worst_margin_A_per_m=worst.margin_A_per_m, status=worst_status(cases), cases=tuple(cases))
