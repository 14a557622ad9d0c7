"""The material library: built-in magnet grades and steels, plus the user's own.

Built-in data live in ``core/data/*.toml``. A user's own grades and steels are TOML files of the same
form in the user library folder: ``$PMDC_SIZER_LIBRARY`` if set, else the platform's user data folder
(``platformdirs.user_data_dir("pmdc-sizer")/library``). Each file holds ``[[grade]]`` and/or
``[[steel]]`` tables; every entry is validated by the same schema as an inline custom grade in a
project file, and a user entry with a built-in's name replaces it (so a certified curve can stand in for
the typical one).
"""

from __future__ import annotations

import os
import tomllib
from functools import lru_cache
from importlib import resources
from pathlib import Path
from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from .errors import ProjectError
from .keys import format_validation_error
from .magnets import MagnetGrade, knee_width_ratio
from .schema import CustomGrade
from .steel import Steel
from .units import from_si, to_si


class SteelSpec(BaseModel):
    """One ``[[steel]]`` table of a library file, in the file's units, validated (see :class:`Steel`)."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)

    name: str = Field(..., min_length=1)
    kind: Literal["housing", "lamination"]
    field_strength_A_per_m: list[float] = Field(..., min_length=3)
    flux_density_T: list[float] = Field(..., min_length=3)
    density_kg_per_m3: float = Field(..., ge=1000.0, le=10000.0)
    hysteresis_coeff: float = Field(0.0, ge=0.0)
    hysteresis_exponent: float = Field(2.0, ge=1.0, le=3.0)
    eddy_coeff: float = Field(0.0, ge=0.0)
    excess_coeff: float = Field(0.0, ge=0.0)
    recommended_max_flux_density_T: float = Field(1.6, gt=0.0, le=2.5)
    source: str = ""


#: File key of a grade table → field of :class:`MagnetGrade`; the unit is the schema's (core.project).
GRADE_KEYS = {
    "name": "name", "family": "family", "remanence_T": "remanence",
    "coercivity_HcB_kA_per_m": "coercivity_hcb", "coercivity_HcJ_kA_per_m": "coercivity_hcj",
    "energy_product_kJ_per_m3": "energy_product", "recoil_permeability": "recoil_permeability",
    "squareness": "squareness", "remanence_temp_coeff_pct_per_K": "remanence_temp_coeff",
    "coercivity_temp_coeff_pct_per_K": "coercivity_temp_coeff",
    "max_working_temperature_C": "max_working_temperature_C", "density_kg_per_m3": "density",
    "source": "source",
}


def _unit_of(key: str) -> str:
    extra = CustomGrade.model_fields[key].json_schema_extra
    return str(extra.get("unit", "")) if isinstance(extra, dict) else ""


def grade_from_spec(spec: CustomGrade, custom: bool = False) -> MagnetGrade:
    """A magnet grade in SI from a grade table in the file's units.

    Parameters
    ----------
    spec : CustomGrade
        The validated table (kA/m, kJ/m³, %/K, ...; see the project-file schema).
    custom : bool, optional
        True for a user's grade (a project's inline grade or a user library file).

    Returns
    -------
    MagnetGrade
        The grade in SI, its curve model already built.

    Raises
    ------
    ValueError
        Naming the grade, if its squareness cannot be reached with its recoil permeability.
    """
    values: dict[str, Any] = {}
    for key, attribute in GRADE_KEYS.items():
        value = getattr(spec, key)
        values[attribute] = to_si(value, _unit_of(key)) if isinstance(value, float) else value
    grade = MagnetGrade(**values, custom=custom)
    knee_width_ratio(grade)  # builds the curve now, so a grade that cannot have one fails here, by name
    return grade


def grade_table(grade: MagnetGrade) -> dict[str, Any]:
    """A grade as a table in the file's units: the inverse of :func:`grade_from_spec`.

    Parameters
    ----------
    grade : MagnetGrade
        The grade, in SI.

    Returns
    -------
    dict
        File key → value in the file's unit, numbers to 6 significant figures.
    """
    table: dict[str, Any] = {}
    for key, attribute in GRADE_KEYS.items():
        value = getattr(grade, attribute)
        table[key] = float(f"{from_si(value, _unit_of(key)):.6g}") if isinstance(value, float) else value
    return table


def steel_from_spec(spec: SteelSpec) -> Steel:
    """A steel from a validated library table.

    Parameters
    ----------
    spec : SteelSpec
        The table (its units are already SI: A/m, T, kg/m³, W/kg coefficients).

    Returns
    -------
    Steel
        The steel, with its B(H) curve checked.

    Raises
    ------
    ValueError
        Naming the steel, if its B(H) points do not start at 0, increase, and keep a slope of μ0 or more.
    """
    return Steel(
        name=spec.name,
        kind=spec.kind,
        field_strength=tuple(spec.field_strength_A_per_m),
        flux_density=tuple(spec.flux_density_T),
        density=spec.density_kg_per_m3,
        hysteresis_coeff=spec.hysteresis_coeff,
        hysteresis_exponent=spec.hysteresis_exponent,
        eddy_coeff=spec.eddy_coeff,
        excess_coeff=spec.excess_coeff,
        recommended_max_flux_density=spec.recommended_max_flux_density_T,
        source=spec.source,
    )


def user_library_folder() -> Path:
    """The folder of the user's own library files.

    Returns
    -------
    Path
        ``$PMDC_SIZER_LIBRARY`` if set, else ``platformdirs.user_data_dir("pmdc-sizer")/library``; the
        folder need not exist.
    """
    override = os.environ.get("PMDC_SIZER_LIBRARY")
    if override:
        return Path(override)
    import platformdirs

    return Path(platformdirs.user_data_dir("pmdc-sizer", appauthor=False)) / "library"


def _entries(data: dict, source: str):
    unknown = set(data) - {"grade", "steel"}
    if unknown:
        raise ProjectError(
            f"{source}: unknown table {sorted(unknown)[0]!r} (a library file holds [[grade]] and [[steel]])")
    for index, entry in enumerate(data.get("grade", [])):
        try:
            yield "grade", grade_from_spec(CustomGrade.model_validate(entry), custom=source != "built-in")
        except ValidationError as error:
            message = format_validation_error(error)
            raise ProjectError(f"{source}: grade[{index}].{message}") from None
        except ValueError as error:
            raise ProjectError(f"{source}: grade[{index}]: {error}") from None
    for index, entry in enumerate(data.get("steel", [])):
        try:
            yield "steel", steel_from_spec(SteelSpec.model_validate(entry))
        except ValidationError as error:
            raise ProjectError(f"{source}: steel[{index}].{format_validation_error(error)}") from None
        except ValueError as error:
            raise ProjectError(f"{source}: steel[{index}]: {error}") from None


def _read_toml(text: str, source: str) -> dict:
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise ProjectError(f"{source}: not a valid TOML file ({error})") from None


@lru_cache(maxsize=1)
def _builtin() -> tuple[dict[str, MagnetGrade], dict[str, Steel]]:
    grades: dict[str, MagnetGrade] = {}
    steels: dict[str, Steel] = {}
    # the package this module is in: pmdc_sizer.core once installed (never a bare "core")
    data_folder = resources.files(__name__.rpartition(".")[0]) / "data"
    for filename in ("magnets.toml", "steels.toml"):
        data = _read_toml((data_folder / filename).read_text(encoding="utf-8"), "built-in")
        for kind, item in _entries(data, "built-in"):
            (grades if kind == "grade" else steels)[item.name] = item
    return grades, steels


def _user(folder: Path) -> tuple[dict[str, MagnetGrade], dict[str, Steel]]:
    grades: dict[str, MagnetGrade] = {}
    steels: dict[str, Steel] = {}
    if folder.is_dir():
        for path in sorted(folder.glob("*.toml")):
            data = _read_toml(path.read_text(encoding="utf-8"), str(path))
            for kind, item in _entries(data, str(path)):
                (grades if kind == "grade" else steels)[item.name] = item
    return grades, steels


@lru_cache(maxsize=8)
def _library(folder: str) -> tuple[dict[str, MagnetGrade], dict[str, Steel]]:
    grades, steels = dict(_builtin()[0]), dict(_builtin()[1])
    user_grades, user_steels = _user(Path(folder))
    grades.update(user_grades)
    steels.update(user_steels)
    return grades, steels


def magnet_grades() -> dict[str, MagnetGrade]:
    """Every magnet grade of the library.

    Returns
    -------
    dict of str to MagnetGrade
        Grades by name: built-in first, the user's own after (replacing a built-in of the same name).

    Raises
    ------
    ProjectError
        Naming the file and the entry, if a library file cannot be read or an entry is not valid.
    """
    return _library(str(user_library_folder()))[0]


def steels() -> dict[str, Steel]:
    """Every steel of the library, housing and lamination alike.

    Returns
    -------
    dict of str to Steel
        Steels by name: built-in first, the user's own after (replacing a built-in of the same name).

    Raises
    ------
    ProjectError
        Naming the file and the entry, if a library file cannot be read or an entry is not valid.
    """
    return _library(str(user_library_folder()))[1]


def reload() -> None:
    """Forget cached user-library contents (after the user adds a file)."""
    _library.cache_clear()


def magnet_grade(name: str, key: str = "magnets.grade") -> MagnetGrade:
    """One magnet grade of the library, by name.

    Parameters
    ----------
    name : str
        The grade's name, e.g. ``"Y30BH"``.
    key : str, optional
        The project-file key the name came from, for the error message.

    Returns
    -------
    MagnetGrade
        The grade.

    Raises
    ------
    ProjectError
        Naming the key and the value, if the library has no such grade.
    """
    grades = magnet_grades()
    if name not in grades:
        raise ProjectError(f"{key} = {name!r}: not in the magnet library (`pmdc-sizer grades` lists them)", key=key)
    return grades[name]


def steel(name: str, kind: str, key: str) -> Steel:
    """One steel of the library, by name, of the kind the part needs.

    Parameters
    ----------
    name : str
        The steel's name.
    kind : str
        ``"housing"`` or ``"lamination"``.
    key : str
        The project-file key the name came from, for the error message.

    Returns
    -------
    Steel
        The steel.

    Raises
    ------
    ProjectError
        Naming the key, if there is no such steel (listing those of the kind) or it is of the other kind.
    """
    library = steels()
    if name not in library:
        names = ", ".join(sorted(s for s, v in library.items() if v.kind == kind))
        raise ProjectError(f"{key} = {name!r}: not in the steel library ({kind} steels: {names})", key=key)
    item = library[name]
    if item.kind != kind:
        raise ProjectError(f"{key} = {name!r}: is a {item.kind} steel, not a {kind} steel", key=key)
    return item
