"""The magnetic results of one evaluation: the grade as used, the no-load circuit, the demagnetization cases.

Frozen dataclasses, SI throughout, temperatures in °C; each field's name carries its unit and the comment
beside it its meaning (:mod:`core.results` gathers them into :class:`core.results.Results`).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .magnet_curve_figures import DemagnetizationCurves


@dataclass(frozen=True)
class MagnetResult:
    """The magnet grade as used, with its properties at the nominal ambient."""

    name: str  #: grade name
    family: str  #: material family (decides which temperature is the worst case)
    temperature_C: float  #: the nominal ambient, at which the properties below are given [°C]
    remanence_T: float  #: Br at ``temperature_C`` [T]
    coercivity_HcB_A_per_m: float  #: normal coercivity HcB at ``temperature_C`` (magnitude) [A/m]
    coercivity_HcJ_A_per_m: float  #: intrinsic coercivity HcJ at ``temperature_C`` (magnitude) [A/m]
    knee_field_A_per_m: float  #: field where irreversible loss begins, at ``temperature_C`` (negative) [A/m]
    remanence_20C_T: float  #: Br at 20 °C, as the grade data give it [T]
    coercivity_HcJ_20C_A_per_m: float  #: HcJ at 20 °C, as the grade data give it [A/m]
    max_working_temperature_C: float  #: the supplier's maximum working temperature [°C]
    density_kg_per_m3: float  #: [kg/m³]
    source: str  #: where the grade's numbers come from


@dataclass(frozen=True)
class MagneticsResult:
    """The no-load magnetic circuit at one magnet temperature."""

    temperature_C: float  #: magnet temperature [°C]
    flux_per_pole_Wb: float  #: flux crossing the gap between the two neutral axes of one pole, stack length [Wb]
    #: mean air-gap flux density under the magnet's arc, the same value as ``airgap_flux_density_mean_T``
    #: (kept under its old name for the readers that show it) [T]
    airgap_flux_density_T: float
    magnet_flux_density_T: float  #: operating point's B in the magnet [T]
    magnet_field_A_per_m: float  #: operating point's H in the magnet (negative) [A/m]
    permeance_coefficient: float  #: -B/(μ0·H) at the operating point, iron drops included [1]
    housing_flux_density_T: float  #: peak, in the housing wall at the interpolar axis [T]
    tooth_flux_density_T: float  #: in the teeth under the pole [T]
    core_flux_density_T: float  #: peak, in the armature back iron [T]
    leakage_factor: float  #: magnet flux over useful gap flux [1]
    carter_factor: float  #: Carter's coefficient of the slotted armature [1]
    gap_mmf_A: float  #: MMF drop across the (effective) gap, one crossing [A]
    teeth_mmf_A: float  #: MMF drop along the teeth [A]
    core_mmf_A: float  #: MMF drop along the armature core, half a pole pitch [A]
    housing_mmf_A: float  #: MMF drop along the housing, half a pole pitch [A]
    airgap_flux_density_mean_T: float = 0.0  #: mean air-gap flux density under the magnet's arc [T]
    airgap_flux_density_centre_T: float = 0.0  #: air-gap flux density at the pole centre [T]
    outside_air_flux_Wb: float = 0.0  #: return flux in the air outside the housing at the interpolar axis [Wb]
    worst_magnet_field_A_per_m: float = 0.0  #: most negative field of any magnet segment at no load [A/m]


@dataclass(frozen=True)
class DemagnetizationCase:
    """One demagnetization case: a current at a temperature, or the rotor removed."""

    name: str  #: e.g. "stall, cold"
    kind: str  #: "stall", "reversal", "current limit" or "rotor removed"
    temperature_C: float  #: magnet temperature of the case [°C]
    current_A: float  #: armature current [A] (0 for the rotor removed)
    #: mean field over the magnet's most-demagnetized 5 % of area (core.magnet_field_share) [A/m]
    magnet_field_A_per_m: float
    magnet_flux_density_T: float  #: normal-curve B there [T]
    knee_field_A_per_m: float  #: knee field at the case's temperature (negative) [A/m]
    margin_A_per_m: float  #: magnet field minus knee field; positive is safe [A/m]
    ok: bool  #: the field stays above the knee
    flux_per_pole_Wb: float = 0.0  #: flux per pole under the case's current (0 with the rotor removed) [Wb]
    #: the segment holding the magnet's most demagnetized cell, from the pole centre (positive: towards the
    #: direction of rotation) [rad]
    worst_angle_rad: float = 0.0
    magnet_area_past_knee_fraction: float = 0.0  #: share of the magnet's area whose field is past the knee [1]
    #: centres of the magnet's segments from the pole centre [rad]
    segment_angle_rad: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: the field at mid-thickness in each segment [A/m]
    segment_field_A_per_m: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: each segment's share of the magnet's area, summing to 1 [1]
    segment_area_fraction: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: the normal-curve B at each segment's field, at the case's temperature [T]
    segment_flux_density_T: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: least margin this case must keep to count as safe: the project's share of HcJ at its temperature [A/m]
    required_margin_A_per_m: float = 0.0
    status: str = ""  #: "safe" (margin ≥ required), "marginal" (0 < margin < required) or "past_knee"

    @property
    def mean_field_A_per_m(self) -> float:  # noqa: N802 - named with its unit, as the fields are
        """The magnet's mean field under the case's current, weighted by the segments' areas [A/m]
        (the verdict's worst-area field is ``magnet_field_A_per_m``); NaN without segments."""
        shares = self.segment_area_fraction
        return float(np.dot(shares, self.segment_field_A_per_m)) if shares.size else np.nan

    @property
    def mean_flux_density_T(self) -> float:  # noqa: N802 - named with its unit, as the fields are
        """The magnet's mean flux density under the case's current, weighted by the segments' areas [T];
        NaN without segments."""
        shares = self.segment_area_fraction
        return float(np.dot(shares, self.segment_flux_density_T)) if shares.size else np.nan


@dataclass(frozen=True)
class DemagnetizationResult:
    """Every demagnetization case and the worst of them."""

    ok: bool  #: every case stays above the knee
    worst_case: str  #: name of the case with the least margin
    worst_margin_A_per_m: float  #: its margin [A/m]
    cases: tuple[DemagnetizationCase, ...]  #: in the order they were computed
    required_margin_A_per_m: float = 0.0  #: the most any case requires (the share of HcJ where HcJ is highest) [A/m]
    required_margin_share: float = 0.0  #: the project's required margin, a share of HcJ at each case's temperature [1]
    status: str = ""  #: the worst case's status: "safe", "marginal" or "past_knee"


@dataclass(frozen=True)
class FaultsResult:
    """Stall and reversal with the supply applied directly (a failed drive, no limiter), cold and hot."""

    must_survive: bool  #: the project requires the magnets to survive these (else they are reported and warned)
    ok: bool  #: every fault case stays above the knee
    worst_case: str  #: name of the fault case with the least margin
    worst_margin_A_per_m: float  #: its margin [A/m]
    status: str  #: the worst fault case's status: "safe", "marginal" or "past_knee"
    cases: tuple[DemagnetizationCase, ...]  #: shaped like ``DemagnetizationResult.cases``


@dataclass(frozen=True)
class MagnetChartCase:
    """Plot data of the magnet operating chart for one temperature."""

    name: str  #: "cold", "nominal" or "hot"
    curves: DemagnetizationCurves  #: normal and intrinsic curves at the case's magnet temperature
    operating_field_A_per_m: float  #: no-load operating point's H [A/m]
    operating_flux_density_T: float  #: no-load operating point's B [T]
    permeance_coefficient: float  #: slope of the operating point, iron drops included [1]
