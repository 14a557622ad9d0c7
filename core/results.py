"""What one evaluation returns: documented, frozen dataclasses, SI throughout, temperatures in °C.

Every figure a view, the datasheet, the comparison or the checks display is here, the input values they
echo included, so no reader has to go back to the project for a number. Each field's name carries its
unit (``flux_per_pole_Wb``); the comment beside it gives the meaning in one line.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from .results_magnetics import (
    DemagnetizationCase,
    DemagnetizationResult,
    FaultsResult,
    MagnetChartCase,
    MagneticsResult,
    MagnetResult,
)
from .results_performance import (
    CaseResult,
    CommutationResult,
    ConstantsResult,
    CurveData,
    EnvelopeResult,
    PointResult,
    WindingResult,
)
from .results_thermal import RatingsResult, ThermalResult, ThermalTransient


@dataclass(frozen=True)
class MassResult:
    """Masses of the active parts and the shaft, and an estimate of the rest of the motor (core.mass)."""

    magnet_kg: float  #: [kg]
    copper_kg: float  #: [kg]
    housing_kg: float  #: [kg]
    lamination_kg: float  #: [kg]
    shaft_kg: float  #: within the housing length [kg]
    total_kg: float  #: sum of the above: the active mass, with the shaft [kg]
    #: the parts outside the magnetic circuit, estimated from the section's proportions (core.mass)
    shaft_extension_kg: float | None = None  #: the shaft beyond the drive end [kg]
    end_caps_kg: float | None = None  #: both end caps [kg]
    brush_gear_kg: float | None = None  #: brush holder, brushes, springs, terminals [kg]
    commutator_kg: float | None = None  #: [kg]
    bearings_kg: float | None = None  #: both bearings [kg]
    other_parts_kg: float | None = None  #: the five above [kg]
    estimated_total_kg: float | None = None  #: the whole motor: total_kg + other_parts_kg [kg]


@dataclass(frozen=True)
class CostResult:
    """Raw-material cost at the project's prices per kilogram."""

    currency: str  #: as the project gives it
    magnet: float  #: [currency]
    copper: float  #: [currency]
    housing: float  #: [currency]
    lamination: float  #: [currency]
    total: float  #: [currency]


@dataclass(frozen=True)
class GeometryResult:
    """The cross-section and lengths as evaluated, derived dimensions included."""

    poles: int  #: number of magnet poles [1]
    slots: int  #: armature slots [1]
    housing_outer_diameter_m: float  #: armature + 2·(gap + magnet + wall) [m]
    housing_inner_diameter_m: float  #: [m]
    housing_wall_m: float  #: [m]
    housing_length_m: float  #: axial [m]
    magnet_inner_diameter_m: float  #: [m]
    magnet_thickness_m: float  #: radial [m]
    magnet_arc_rad: float  #: mechanical arc of one magnet [rad]
    magnet_length_m: float  #: axial [m]
    magnet_embrace: float  #: arc over pole pitch [1]
    overhang_m: float  #: magnet beyond the stack at each end [m]
    airgap_m: float  #: radial clearance [m]
    armature_diameter_m: float  #: [m]
    stack_length_m: float  #: axial [m]
    shaft_diameter_m: float  #: [m]
    slot_pitch_m: float  #: at the armature surface [m]
    core_depth_m: float  #: armature back iron, slot bottom to shaft [m]
    max_outer_diameter_m: float | None = None  #: the envelope limit, if the project sets one [m]
    overall_length_m: float = 0.0  #: the motor body, the housing tube with the end caps inside it [m]
    max_length_m: float | None = None  #: the envelope limit on the overall length, if the project sets one [m]


@dataclass(frozen=True)
class SizingResult:
    """The classic sizing figures of the armature at the rated point, nominal case."""

    electric_loading_A_per_m: float  #: ampere-conductors per metre of armature circumference [A/m]
    magnetic_loading_T: float  #: mean gap flux density over the whole circumference [T]
    rotor_volume_m3: float  #: π/4·D²·L [m³]
    torque_per_rotor_volume_N_m_per_m3: float  #: electromagnetic torque over rotor volume (TRV) [N·m/m³]
    airgap_shear_stress_Pa: float  #: TRV/2 [Pa]


@dataclass(frozen=True)
class QuotedValue:
    """A number a check's message quotes, kept with its unit so that a view can show it in its own units."""

    value: float  #: in SI; a temperature in °C
    unit: str  #: the ``core.units`` unit the message quotes it in, e.g. "mN·m", "°C", "mm"
    digits: int = 3  #: significant figures it is quoted to
    spec: str = ""  #: a format spec used instead of ``digits``, e.g. ".0f" for a temperature to the whole degree
    bare: bool = False  #: the number without its unit (the unit follows later: "8.0 × 10.0 mm")


@dataclass(frozen=True)
class Check:
    """One design check: what was tested, the finding, and what to change."""

    key: str  #: stable identifier, e.g. "demagnetization" or "housing_flux_density"
    title: str  #: a short label for the checks panel
    status: str  #: "pass", "warning" or "fail"
    message: str  #: the reason, in a sentence, with the numbers (in the units of ``quoted``)
    advice: str = ""  #: what to change, when it did not pass
    #: the message with ⟦i⟧ where ``quoted[i]`` stands, for a view that shows the numbers in other units
    template: str = ""
    quoted: tuple[QuotedValue, ...] = ()  #: the numbers of the message that carry a unit a view may change

    @property
    def sentence(self) -> str:
        """Title, finding and advice as one line."""
        return self.sentence_with(self.message)

    def sentence_with(self, message: str) -> str:
        """Title, a message and the advice as one line.

        Parameters
        ----------
        message : str
            This check's message, as a view writes it (its numbers perhaps in other units).

        Returns
        -------
        str
            "Title: message Advice."
        """
        text = f"{self.title}: {message}"
        return f"{text} {self.advice[0].upper() + self.advice[1:]}." if self.advice else text

    def filled(self, texts: tuple[str, ...] | list[str]) -> str:
        """The message with its quoted numbers as a view writes them.

        Parameters
        ----------
        texts : sequence of str
            One text per :attr:`quoted` value, in order, its unit included unless the value is ``bare``.

        Returns
        -------
        str
            :attr:`template` with ``texts[i]`` in place of ⟦i⟧.
        """
        message = self.template
        for index, text in enumerate(texts):
            message = message.replace(f"⟦{index}⟧", text)
        return message


@dataclass(frozen=True)
class Results:
    """Everything one evaluation computes. SI throughout; temperatures in °C."""

    name: str  #: the project's name
    supply_voltage_V: float  #: at the motor terminals [V]
    brush_drop_V: float  #: both brushes [V]
    load_torque_N_m: float  #: rated shaft torque [N·m]
    load_speed_rad_per_s: float  #: required speed at the rated torque [rad/s]
    magnet: MagnetResult  #: the grade as used, at the nominal ambient
    geometry: GeometryResult  #: the cross-section and lengths
    magnetics: MagneticsResult  #: no-load magnetic circuit, nominal case
    winding: WindingResult  #: the winding as built
    constants: ConstantsResult  #: Ke, Kt, resistance, inductance, time constants, inertia
    cold: CaseResult  #: performance at the coldest ambient
    nominal: CaseResult  #: performance at the nominal ambient
    hot: CaseResult  #: performance at the hottest ambient, winding and magnets at the hot state
    demagnetization: DemagnetizationResult  #: every case against the knee
    thermal: ThermalResult  #: the hot case's temperatures
    mass: MassResult  #: masses of the parts
    cost: CostResult  #: raw-material cost
    checks: tuple[Check, ...]  #: pass / warning / fail, with the reasons
    magnet_chart: tuple[MagnetChartCase, ...] = field(repr=False)  #: cold, nominal and hot curves and points
    sizing: SizingResult | None = None  #: loadings at the nominal rated point
    current_limit_A: float | None = None  #: the drive's current limit, if the project sets one [A]
    reversing: bool = False  #: the application reverses (plugs) the motor at speed
    ambient_min_C: float = 20.0  #: coldest ambient [°C]
    ambient_nominal_C: float = 20.0  #: nominal ambient [°C]
    ambient_max_C: float = 20.0  #: hottest ambient [°C]
    #: load.further_points: the torques [N·m] and the speeds required at them [rad/s], in order (the speeds
    #: reached are in each case)
    further_point_torques_N_m: tuple[float, ...] = ()
    further_point_required_speeds_rad_per_s: tuple[float, ...] = ()
    ratings: RatingsResult | None = None  #: continuous rating and permitted stall times
    commutation: CommutationResult | None = None  #: brush current density, surface speed, reactance voltage
    faults: FaultsResult | None = None  #: demagnetization with the supply applied directly, no limiter

    @property
    def cases(self) -> tuple[CaseResult, CaseResult, CaseResult]:
        """Cold, nominal and hot, in that order."""
        return (self.cold, self.nominal, self.hot)

    @property
    def warnings(self) -> list[str]:
        """Sentences for every check that did not pass."""
        return [c.sentence for c in self.checks if c.status != "pass"]


__all__ = [
    "CaseResult", "Check", "CommutationResult", "ConstantsResult", "CostResult", "CurveData", "DemagnetizationCase",
    "DemagnetizationResult", "EnvelopeResult", "FaultsResult", "GeometryResult", "MagnetChartCase", "MagnetResult",
    "MagneticsResult", "MassResult", "PointResult", "QuotedValue", "RatingsResult", "Results", "SizingResult",
    "ThermalResult", "ThermalTransient", "WindingResult",
]
