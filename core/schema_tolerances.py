"""The ``[tolerances]`` table of the project-file schema: the production spread, each a ± with its distribution.

Read by the tolerance study (:mod:`core.tolerances`, :mod:`core.tolerance_study`); :class:`core.schema.Project`
holds it as its last table.
"""

from __future__ import annotations

from typing import Any, Literal

from .schema_fields import Section, choice, quantity

Distribution = Literal["normal", "uniform"]


def spread(description: str, default: str = "normal") -> Any:
    """The distribution of one tolerance: "normal" (the ± is 3σ) or "uniform" (flat across the ±).

    Parameters
    ----------
    description : str
        What the tolerance spreads, for the key's help text, e.g. "the air gap".
    default : str
        The distribution when the file gives none.

    Returns
    -------
    Any
        A pydantic field that accepts "normal" or "uniform".
    """
    return choice(default, f"How {description} spreads within its ±: normal (the ± is 3σ; parts outside it are "
                           "rejected at inspection) or uniform (any value across the ± equally likely).")


class Tolerances(Section):
    """``[tolerances]``: the production spread of the design, each a ± with its distribution.

    The defaults are typical of small motors built in series; each says where it comes from. A tolerance
    the file sets is checked when the file is read; a default when the study runs (it may not suit a
    design: a ±0.2 V spread on a 0 V brush drop).
    """

    remanence_pct: float = quantity(
        2.0, "%", 0.0, 20.0,
        "± of Br about the grade's typical value (2 %: suppliers' grade bands run about ±1.5 % for sintered NdFeB "
        "and ±2.5 % for hard ferrite, from memory).")
    remanence_distribution: Distribution = spread("Br")
    coercivity_pct: float = quantity(
        5.0, "%", 0.0, 30.0,
        "± of HcJ about the grade's typical value (5 %: batch-to-batch spread of HcJ; common practice, no source).")
    coercivity_distribution: Distribution = spread("HcJ")
    magnet_thickness_mm: float = quantity(
        0.05, "mm", 0.0, 5.0,
        "± of each magnet's radial thickness (0.05 mm: ground arcs; as-pressed ferrite arcs run ±0.1 mm; common "
        "practice, no source).")
    magnet_thickness_distribution: Distribution = spread("the magnet thickness")
    airgap_mm: float = quantity(
        0.04, "mm", 0.0, 2.0,
        "± of the radial air gap, the stack-up of armature grinding, magnet face and bearing play (0.04 mm; common "
        "practice, no source).")
    airgap_distribution: Distribution = spread("the air gap")
    wire_diameter_mm: float | None = quantity(
        None, "mm", 0.0, 0.5,
        "± of the bare wire diameter; leave out for IEC 60317-0-1's tolerance on the nominal conductor diameter "
        "(±0.003 mm up to 0.224 mm, rising to 1 % of the diameter above 0.63 mm; from memory of its table).")
    wire_diameter_distribution: Distribution = spread("the wire diameter")
    copper_resistivity_pct: float = quantity(
        1.0, "%", 0.0, 10.0,
        "± of the copper's resistivity about IEC 60028's annealed copper (1 %: commercial winding copper runs 100 "
        "to 102 % IACS; from memory).")
    copper_resistivity_distribution: Distribution = spread("the copper's resistivity", "uniform")
    brush_drop_V: float = quantity(
        0.2, "V", 0.0, 5.0,
        "± of the total brush drop, with the brushes' film and wear (0.2 V; common practice, no source).")
    brush_drop_distribution: Distribution = spread("the brush drop", "uniform")
    friction_torque_pct: float = quantity(
        30.0, "%", 0.0, 100.0,
        "± of the friction torque, with bearing preload and brush spring force (30 %; common practice, no source).")
    friction_torque_distribution: Distribution = spread("the friction torque", "uniform")
    supply_voltage_pct: float = quantity(
        0.0, "%", 0.0, 50.0,
        "± of the supply voltage (0: a datasheet quotes its figures at the rated voltage; set the supply's band, a "
        "battery's or a regulated supply's, to see the spread and yield in the application).")
    supply_voltage_distribution: Distribution = spread("the supply voltage", "uniform")
    samples: int = quantity(10000, "", 100, 1000000,
                            "Motors drawn in the tolerance study (a Latin hypercube over the spreads).")
    seed: int = quantity(1, "", 0, 2**31 - 1,
                         "Seed of the study's random numbers; the same seed draws the same motors.")


__all__ = ["Distribution", "Tolerances", "spread"]
