"""The material library: built-in magnet grades and steels, plus the user's own.

Built-in data live in ``core/data/*.toml``. A user's own grades and steels are TOML files of the same
form in the user library folder: ``$PMDC_SIZER_LIBRARY`` if set, else the platform's user data folder
(``platformdirs.user_data_dir("pmdc-sizer")/library``). Each file holds ``[[grade]]`` and/or
``[[steel]]`` tables; every entry is validated by the same schema as an inline custom grade in a
project file, and a user entry with a built-in's name replaces it (so a certified curve can stand in for
the typical one); its source note then says so, so every view that shows the grade's source says it.

A user file is used whole or not at all: one that cannot be read (not UTF-8, a folder, a broken link,
unreadable, too large, nested too deeply) or holds an entry that is not valid is skipped and listed,
once, with its reason by :func:`problems`; the built-in data and the other files stay in use.
"""

from __future__ import annotations

import dataclasses
import os
from dataclasses import dataclass, field
from functools import lru_cache
from importlib import resources
from pathlib import Path
from typing import Annotated, Any, Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from . import text_files
from .errors import ProjectError
from .keys import format_validation_error, shown_value
from .magnet_grade_check import require_faithful_curve, require_modelled_family
from .magnets import MagnetGrade
from .schema import CustomGrade
from .steel import Steel
from .units import from_si, to_si


class SteelSpec(BaseModel):
    """One ``[[steel]]`` table of a library file, in the file's units, validated (see :class:`Steel`)."""

    # NaN passes every "increasing" and "slope" test of the B(H) points (comparisons with NaN are false)
    # and would reach the interpolator: a library number must be finite.
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True, allow_inf_nan=False)

    name: str = Field(..., min_length=1, max_length=60)
    kind: Literal["housing", "lamination"]
    # Bounded so that no arithmetic on the points can overflow (1e308 - -1e308 is inf): 100 MA/m and 5 T
    # are far past any steel's saturation curve (our bounds).
    field_strength_A_per_m: list[Annotated[float, Field(ge=0.0, le=1.0e8)]] = Field(..., min_length=3, max_length=400)
    flux_density_T: list[Annotated[float, Field(ge=0.0, le=5.0)]] = Field(..., min_length=3, max_length=400)
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
    "price_per_kg": "price_per_kg", "price_currency": "price_currency", "source": "source",
}
_NOT_CONVERTED = ("", "/kg")  #: prices are per kilogram of their own currency


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
        The grade in SI, its curve model already built and checked against its data.

    Raises
    ------
    ValueError
        If HcB exceeds HcJ. A :class:`core.magnet_grades.GradeDataError` (a ValueError whose ``key`` is
        the table key to change), naming the grade, for a refused family (AlNiCo), a squareness its
        recoil permeability cannot reach, or a curve that misses the stored HcB or (BH)max by more than
        2 % (:func:`core.magnet_grade_check.require_faithful_curve`).
    """
    require_modelled_family(spec.name, spec.family)
    if spec.coercivity_HcB_kA_per_m > spec.coercivity_HcJ_kA_per_m:
        # the same rule the fit rules apply to a project's inline grade (core.fit_rules.check_fit)
        raise ValueError(f"coercivity_HcB_kA_per_m = {spec.coercivity_HcB_kA_per_m:g} exceeds "
                         f"coercivity_HcJ_kA_per_m ({spec.coercivity_HcJ_kA_per_m:g}); HcB ≤ HcJ always")
    values: dict[str, Any] = {}
    for key, attribute in GRADE_KEYS.items():
        value = getattr(spec, key)
        convert = isinstance(value, float) and _unit_of(key) not in _NOT_CONVERTED
        values[attribute] = to_si(value, _unit_of(key)) if convert else value
    grade = MagnetGrade(**values, custom=custom)
    require_faithful_curve(grade)  # builds the curve now, so a grade that cannot have one fails here, by name
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
        if value is None:
            continue  # a grade without a price: TOML has no null
        if isinstance(value, float) and _unit_of(key) not in _NOT_CONVERTED:
            value = from_si(value, _unit_of(key))
        table[key] = float(f"{value:.6g}") if isinstance(value, float) else value
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


MAX_LIBRARY_FILE_BYTES = 1024 * 1024  #: a library file of a few hundred grades is well under this


@dataclass(frozen=True)
class LibraryProblem:
    """A user-library file that was skipped, and why (one line for the user)."""

    path: Path  #: the file
    reason: str  #: what is wrong with it, naming the entry and key where one is at fault

    def __str__(self) -> str:
        return f"{self.path}: {self.reason}"


@dataclass(frozen=True)
class Library:
    """The grades and steels in use, with what the user library added, replaced and could not load."""

    grades: dict[str, MagnetGrade]  #: by name, built-in and user
    steels: dict[str, Steel]  #: by name, built-in and user
    problems: tuple[LibraryProblem, ...] = ()  #: user files skipped, each once, in file-name order
    replaced: dict[str, Path] = field(default_factory=dict)  #: built-in grade or steel name → user file


def _tables(data: dict, kind: str, source: str) -> list[dict]:
    tables = data.get(kind, [])
    if not isinstance(tables, list) or not all(isinstance(entry, dict) for entry in tables):
        raise ProjectError(f"{source}: {kind} must be written as [[{kind}]] tables, not {shown_value(tables)}")
    return tables


def _entries(data: dict, source: str):
    unknown = set(data) - {"grade", "steel"}
    if unknown:
        raise ProjectError(f"{source}: unknown table {shown_value(sorted(unknown)[0])} (a library file holds "
                           "[[grade]] and [[steel]])")
    for index, entry in enumerate(_tables(data, "grade", source)):
        try:
            yield "grade", grade_from_spec(CustomGrade.model_validate(entry), custom=source != "built-in")
        except ValidationError as error:
            message = format_validation_error(error)
            raise ProjectError(f"{source}: grade[{index}].{message}") from None
        except ValueError as error:
            raise ProjectError(f"{source}: grade[{index}]: {error}") from None
    for index, entry in enumerate(_tables(data, "steel", source)):
        try:
            yield "steel", steel_from_spec(SteelSpec.model_validate(entry))
        except ValidationError as error:
            raise ProjectError(f"{source}: steel[{index}].{format_validation_error(error)}") from None
        except ValueError as error:
            raise ProjectError(f"{source}: steel[{index}]: {error}") from None


@lru_cache(maxsize=1)
def _builtin() -> tuple[dict[str, MagnetGrade], dict[str, Steel]]:
    grades: dict[str, MagnetGrade] = {}
    steels: dict[str, Steel] = {}
    # the package this module is in: pmdc_sizer.core once installed (never a bare "core")
    data_folder = resources.files(__name__.rpartition(".")[0]) / "data"
    for filename in ("magnets.toml", "steels.toml"):
        data = text_files.parse_toml((data_folder / filename).read_text(encoding="utf-8"), "built-in", "library file")
        for kind, item in _entries(data, "built-in"):
            (grades if kind == "grade" else steels)[item.name] = item
    return grades, steels


def _user_file(path: Path) -> list[tuple[str, Any]]:
    """Every entry of one user-library file, all or none (ProjectError naming the file and the entry)."""
    text = text_files.read_text(path, kind="library file", max_bytes=MAX_LIBRARY_FILE_BYTES)
    data = text_files.parse_toml(text, str(path), "library file")
    try:
        return list(_entries(data, str(path)))
    except RecursionError:
        raise ProjectError(f"{path}: not a library file (nested too deeply)") from None


def _announced(item: Any, path: Path, kind: str) -> Any:
    """A user entry that replaces a built-in one, with its source note saying so (every view shows it)."""
    note = f"user library file {path.name}, replacing the built-in {kind} of this name"
    return dataclasses.replace(item, source=f"{note}; {item.source}" if item.source else note)


@lru_cache(maxsize=8)
def _library(folder: str) -> Library:
    builtin_grades, builtin_steels = _builtin()
    grades, steels = dict(builtin_grades), dict(builtin_steels)
    problems: list[LibraryProblem] = []
    replaced: dict[str, Path] = {}
    user_folder = Path(folder)
    try:
        paths = sorted(user_folder.glob("*.toml")) if user_folder.is_dir() else []
    except OSError as error:
        paths = []
        problems.append(LibraryProblem(user_folder, f"cannot be read ({error.strerror or error})"))
    for path in paths:
        try:
            entries = _user_file(path)
        except ProjectError as error:
            problems.append(LibraryProblem(path, str(error).removeprefix(f"{path}: ")))
            continue
        for kind, item in entries:
            builtin = builtin_grades if kind == "grade" else builtin_steels
            if item.name in builtin:
                replaced[item.name] = path
                item = _announced(item, path, kind)
            (grades if kind == "grade" else steels)[item.name] = item
    return Library(grades, steels, tuple(problems), replaced)


def current() -> Library:
    """The library in use: built-in data and the user folder's files, read once and cached.

    Returns
    -------
    Library
        Grades and steels by name, the user files that were skipped with their reasons, and the
        built-in names a user file replaces.
    """
    return _library(str(user_library_folder()))


def problems() -> tuple[LibraryProblem, ...]:
    """The user-library files that could not be loaded, each once with its reason (the rest are in use).

    Returns
    -------
    tuple of LibraryProblem
        In file-name order; empty when every file loaded.
    """
    return current().problems


def magnet_grades() -> dict[str, MagnetGrade]:
    """Every magnet grade of the library.

    Returns
    -------
    dict of str to MagnetGrade
        Grades by name: built-in first, the user's own after (replacing a built-in of the same name,
        whose source note then says so). A user file that cannot be read or holds an entry that is not
        valid is skipped whole and listed by :func:`problems`; it never stops the built-in grades.
    """
    return current().grades


def steels() -> dict[str, Steel]:
    """Every steel of the library, housing and lamination alike.

    Returns
    -------
    dict of str to Steel
        Steels by name: built-in first, the user's own after (replacing a built-in of the same name).
        A user file that cannot be used is skipped and listed by :func:`problems`.
    """
    return current().steels


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
