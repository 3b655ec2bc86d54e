"""The optional ``Parameters`` sheet: project title block, design code, unit system and the
project defaults (f'c, fy, fyt, cover, aggregate, exposure, density, precast, layer spacing).

Layout: one parameter a row, the name in the first non-blank cell, the value in the next and,
optionally, the unit in the one after (``f'c | 30 | MPa``). The unit may instead sit in the
name's brackets (``f'c (MPa) | 30``) or in the value (``f'c | 4000 psi``); a bare number
takes the declared unit system's unit; with none of these it is an error, never a guess.
A row's own value always wins over a default here.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..model import Problem
from . import values as cv
from .cells import Cell, Grid
from .columns import _BRACKET, norm  # the same bracket rule as the schedule headers
from .units import UNIT_SYSTEMS, UnitError, normalise_system, split_value_unit, unit_factor

PARAMETERS_SHEET_NAMES = frozenset(norm(n) for n in ("Parameters", "Parameter", "Project parameters", "Defaults",
                                                    "Project defaults", "Project"))


@dataclass(frozen=True)
class Param:
    key: str
    label: str  # the name the template writes
    kind: str  # text | code | system | length | stress | exposure | density | bool
    aliases: tuple[str, ...]
    example: object  # the value the template fills in
    unit: str = ""
    help: str = ""


PARAMS: tuple[Param, ...] = (
    Param("project", "Project", "text", ("project", "project name", "job", "job name", "building"),
          "(project name)", help="Project name, printed on the results."),
    Param("project_no", "Project no.", "text", ("project no", "project number", "job no", "job number",
                                               "project #", "job #"), "(number)"),
    Param("level", "Level", "text", ("level", "floor", "storey", "story"), "(level)"),
    Param("revision", "Revision", "text", ("revision", "rev", "issue"), "A"),
    Param("prepared_by", "Prepared by", "text", ("prepared by", "designed by", "drawn by", "by", "author"),
          "(initials)"),
    Param("checked_by", "Checked by", "text", ("checked by", "checker", "reviewed by"), "(initials)"),
    Param("date", "Date", "text", ("date", "issue date"), "(date)"),
    Param("code", "Design code", "code", ("design code", "code", "standard", "design standard"), "CSA A23.3-19",
          help="The design standard (CSA A23.3-19)."),
    Param("units", "Unit system", "system", ("unit system", "units", "system of units", "unit"), "SI",
          help="SI or US customary: the units of any schedule column whose header has no unit."),
    Param("fc", "f'c", "stress", ("f'c", "fc", "fc'", "concrete strength"), 30, "MPa",
          "Specified concrete strength for rows that leave f'c blank."),
    Param("fy", "fy", "stress", ("fy", "fy bars", "yield strength"), 400, "MPa",
          "Yield strength of the longitudinal bars for rows that leave fy blank."),
    Param("fyt", "fyt", "stress", ("fyt", "fy stirrups", "fyv", "stirrup fy"), 400, "MPa",
          "Yield strength of the stirrups for rows that leave fyt blank."),
    Param("cover", "Cover", "length", ("cover", "clear cover", "cover to stirrups"), 40, "mm",
          "Clear cover to the stirrups, top and bottom."),
    Param("cover_top", "Cover top", "length", ("cover top", "top cover"), None, "mm",
          "Clear cover to the stirrups at the top face, where it differs from Cover."),
    Param("cover_bottom", "Cover bottom", "length", ("cover bottom", "bottom cover"), None, "mm",
          "Clear cover to the stirrups at the bottom face, where it differs from Cover."),
    Param("agg", "Max aggregate", "length", ("max aggregate", "maximum aggregate", "agg", "aggregate",
                                            "max aggregate size", "maximum aggregate size"), 20, "mm",
          "Maximum aggregate size (bar spacing, shear crack spacing)."),
    Param("exposure", "Exposure", "exposure", ("exposure",), "exterior",
          help="interior or exterior; without it beamsched takes exterior (the stricter crack-control limit)."),
    Param("density", "Concrete density", "density", ("concrete density", "density", "concrete type"), "normal",
          help="normal, semi-low-density or low-density: λ = 1.0, 0.85, 0.75 (cl. 8.6.5)."),
    Param("precast", "Precast (certified plant)", "bool", ("precast certified plant", "precast",
                                                           "precast certified", "certified precast"), "no",
          help="yes only for elements made in a plant certified to CSA A23.4 (φc = 0.70)."),
    Param("epoxy", "Epoxy-coated bars", "bool", ("epoxy-coated bars", "epoxy coated bars", "epoxy", "epoxy bars"),
          "no", help="yes where the bars are epoxy-coated (crack control, cl. 10.6.1)."),
    Param("layer_clear", "Clear distance between layers", "length",
          ("clear distance between layers", "layer clear distance", "clear between layers", "layer spacing",
           "clear spacing between layers", "layer clear"), None, "mm",
          "Clear distance between bar layers; blank: the clear-spacing rule for bars (1.4 db, 1.4 agg, 30 mm)."),
)

_BY_ALIAS: dict[str, Param] = {}
for _p in PARAMS:
    for _a in (_p.label, *_p.aliases):
        _BY_ALIAS.setdefault(norm(_a), _p)

EXPOSURES = {"interior": "interior", "int": "interior", "inside": "interior", "exterior": "exterior",
             "ext": "exterior", "outside": "exterior", "exposed": "exterior"}
DENSITIES = {  # cl. 8.6.5: lambda by concrete density
    "normal": ("normal", 1.0), "normal density": ("normal", 1.0), "normal weight": ("normal", 1.0),
    "normal-density": ("normal", 1.0), "nd": ("normal", 1.0),
    "semi low density": ("semi-low-density", 0.85), "semi-low-density": ("semi-low-density", 0.85),
    "semi lightweight": ("semi-low-density", 0.85), "semi-lightweight": ("semi-low-density", 0.85),
    "sand lightweight": ("semi-low-density", 0.85), "structural semi-low-density": ("semi-low-density", 0.85),
    "low density": ("low-density", 0.75), "low-density": ("low-density", 0.75), "lightweight": ("low-density", 0.75),
    "all lightweight": ("low-density", 0.75), "structural low-density": ("low-density", 0.75),
}
DENSITY_LAMBDA = {"normal": 1.0, "semi-low-density": 0.85, "low-density": 0.75}


def density_key(text: str) -> str:
    return " ".join(text.lower().replace("_", " ").split())


@dataclass
class Defaults:
    """What the Parameters sheet says, in engine units, with words for the results."""

    project: dict[str, str] = field(default_factory=dict)
    code: str | None = None
    system: str | None = None  # 'SI' | 'US customary' | None
    values: dict[str, object] = field(default_factory=dict)  # key -> engine value
    words: dict[str, str] = field(default_factory=dict)  # key -> "30 MPa" as written
    problems: list[Problem] = field(default_factory=list)
    sheet: str | None = None


def _pairs(grid: Grid) -> list[tuple[int, Cell, Cell, Cell]]:
    out = []
    for number, cells in grid.rows:
        filled = [i for i, c in enumerate(cells) if not c.blank]
        if not filled:
            continue
        i = filled[0]
        name = cells[i]
        value = cells[i + 1] if i + 1 < len(cells) else Cell(None)
        unit = cells[i + 2] if i + 2 < len(cells) else Cell(None)
        out.append((number, name, value, unit))
    return out


def read_parameters(grid: Grid | None) -> Defaults:
    d = Defaults()
    if grid is None:
        return d
    d.sheet = grid.name
    pending: list[tuple[int, Param, str, Cell, Cell]] = []

    def problem(number: int, label: str, value: object, what: str) -> None:
        d.problems.append(Problem(f"{grid.name} row {number}, '{label}' = {value!r}: {what}",
                                  f"{grid.name}: {label}", value, None))  # row: schedule rows only

    for number, name_cell, value_cell, unit_cell in _pairs(grid):
        label = str(name_cell.value).strip()
        p = _BY_ALIAS.get(norm(label))
        name_unit = None
        if p is None:
            m = _BRACKET.match(label)
            if m and norm(m.group(1)) in _BY_ALIAS:
                p, name_unit = _BY_ALIAS[norm(m.group(1))], m.group(2).strip()
        if p is None:
            if norm(label) in ("name", "parameter", "parameters", "item", "setting"):
                continue  # the sheet's own header row
            d.problems.append(Problem(f"{grid.name} row {number}: '{label}' is not a parameter beamsched reads "
                                      "(ignored)", f"{grid.name}: {label}", value_cell.value, None, "warning"))
            continue
        if value_cell.blank:
            continue
        try:
            if p.kind == "text":
                text = cv.text(value_cell) or ""
                if isinstance(p.example, str) and p.example.startswith("(") and text == p.example:
                    continue  # the template's own placeholder, never filled in: not a project name
                d.project[p.key] = text
            elif p.kind == "code":
                d.code = cv.text(value_cell)
            elif p.kind == "system":
                s = cv.text(value_cell) or ""
                system = normalise_system(s)
                if system is None:
                    problem(number, label, s, "unit system not understood; expected SI or US customary")
                else:
                    d.system = system
            elif p.kind == "exposure":
                v = cv.choice(value_cell, EXPOSURES, "interior or exterior")
                d.values[p.key], d.words[p.key] = v, str(v)
            elif p.kind == "density":
                s = cv.text(value_cell) or ""
                if density_key(s) not in DENSITIES:
                    problem(number, label, s, "expected normal, semi-low-density or low-density (cl. 8.6.5)")
                else:
                    kind, lam = DENSITIES[density_key(s)]
                    d.values["density"], d.words["density"] = kind, f"{kind} (λ = {lam:.2f}, cl. 8.6.5)"
            elif p.kind == "bool":
                v = cv.yes_no(value_cell)
                d.values[p.key], d.words[p.key] = v, "yes" if v else "no"
            else:
                unit_text = cv.text(unit_cell) if not unit_cell.blank else None
                pending.append((number, p, name_unit or unit_text or "", value_cell, name_cell))
        except cv.CellError as exc:
            problem(number, label, value_cell.value, f"{exc.what}; expected {exc.expected}")
    # Dimensioned values last, once the unit system is known.
    for number, p, unit_text, value_cell, name_cell in pending:
        label = str(name_cell.value).strip()
        dim = p.kind
        raw = value_cell.value
        try:
            pair = split_value_unit(raw) if isinstance(raw, str) and not unit_text else None
            if pair is not None:
                x, unit_text = pair
            else:
                x = cv.number(value_cell, f"a number ({p.unit} or as the Unit column says)")
            if x is None:
                continue
            assumed = ""
            if not unit_text:
                if d.system is None:
                    problem(number, label, raw, f"no unit: put it in the Unit column (e.g. {p.unit}) or declare "
                                                "the Unit system")
                    continue
                unit_text = UNIT_SYSTEMS[d.system][dim]
                assumed = f" (unit from the {d.system} unit system)"
            factor = unit_factor(unit_text, dim)  # type: ignore[arg-type]
        except cv.CellError as exc:
            problem(number, label, raw, f"{exc.what}; expected {exc.expected}")
            continue
        except UnitError as exc:
            problem(number, label, raw, str(exc))
            continue
        d.values[p.key] = x * factor
        engine = "MPa" if dim == "stress" else "mm"
        shown = f"{x:g} {unit_text}"
        if unit_text.replace(" ", "") not in (engine,):
            shown += f" = {x * factor:.4g} {engine}"
        d.words[p.key] = shown + assumed
    return d
