"""The schedule columns beamsched reads: label, aliases, dimension, kind and help text.

Labels are matched case-, space- and punctuation-insensitively (``Span no.``, ``SPAN NO``,
``span_no`` are one label); the unit sits in brackets at the end of the header, e.g.
``Mf- (kN·m)`` or ``Mf- [kip-ft]``. The pair forms (``Top bars L`` / ``Top bars R``) accept the
suffixes L, R, left, right, (L), (R), at left, at right.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass
from typing import Literal

Kind = Literal["text", "int", "number", "bars", "stirrups", "choice", "bool"]


@dataclass(frozen=True)
class Column:
    key: str  # the reader's own name for the column
    label: str  # the label the template writes (without its unit)
    kind: Kind
    dimension: str | None = None  # length | span | stress | force | moment
    unit: str | None = None  # the unit the template writes
    aliases: tuple[str, ...] = ()
    help: str = ""
    choices: tuple[str, ...] = ()  # drop-down values the template offers

    def header(self) -> str:
        return f"{self.label} ({self.unit})" if self.unit else self.label


def norm(text: object) -> str:
    """Header text as compared: NFKC, lower case, dashes and primes unified, no spaces, dots,
    underscores or colons."""
    s = unicodedata.normalize("NFKC", str(text)).lower()
    s = s.translate(str.maketrans({"\u2212": "-", "\u2013": "-", "\u2014": "-", "\u2032": "'", "\u2019": "'",
                                   "\u2018": "'", "`": "'", "\u00b4": "'"}))
    return re.sub(r"[\s._:]+", "", s)


def _lr(bases: tuple[str, ...], side: str) -> tuple[str, ...]:
    word = "left" if side == "L" else "right"
    suffixes = (side, word, f"({side})", f"({word})", f"at {word}", f"{word} end", f"at {word} support")
    out = [f"{b} {s}" for b in bases for s in suffixes]
    out += [f"{word} {b}" for b in bases]
    return tuple(out)


_TOP = ("top bars", "top", "top steel", "top bar", "top reinforcement", "top rebar", "top bars at support",
        "top bars at supports", "support top bars", "top (support)", "top reinf")
_BOT = ("bottom bars", "bottom", "bot bars", "bot", "btm bars", "btm", "bottom steel", "bottom bar",
        "bottom reinforcement", "bottom bars at midspan", "bottom (midspan)", "bottom rebar", "bot reinf")
_MNEG = ("mf-", "mf neg", "mf negative", "mf(-)", "-mf", "mf hogging", "mf hog", "mf- support", "mf-ve")
_MPOS_SUP = ("mf+", "mf pos", "mf positive", "mf(+)", "+mf", "mf+ support")
_VF = ("vf", "vf max", "shear", "vf critical", "vf (critical)", "factored shear")

COLUMNS: tuple[Column, ...] = (
    Column("mark", "Mark", "text", aliases=("mark", "beam mark", "beam", "beam no", "beam id", "member",
                                            "member mark", "beam ref"),
           help="Beam mark as on the drawings. Rows sharing a mark with different Span no. are the spans "
                "of one continuous beam."),
    Column("span_no", "Span no.", "int", aliases=("span no", "span number", "span nr", "span #", "span no.", "span nr.",
                                                  "spanno", "span id"),
           help="Span number within the beam (1, 2, 3 ... from left to right). Leave blank for a single span."),
    Column("qty", "Qty", "int", aliases=("qty", "quantity", "no off", "number off", "count", "nos", "no of beams"),
           help="How many identical beams this row stands for (default 1)."),
    Column("type", "Type", "choice", aliases=("type", "section", "shape", "section type", "beam type"),
           choices=("Rect", "T", "L"),
           help="Rect, T (flange both sides) or L (flange one side, e.g. a spandrel)."),
    Column("bw", "bw", "number", "length", "mm", aliases=("bw", "b", "width", "web width", "b web"),
           help="Web width bw."),
    Column("h", "h", "number", "length", "mm", aliases=("h", "depth", "overall depth", "total depth", "height"),
           help="Overall depth h, slab included."),
    Column("hf", "hf", "number", "length", "mm", aliases=("hf", "flange thickness", "slab thickness", "slab",
                                                         "flange depth"),
           help="Flange (slab) thickness, for T and L sections."),
    Column("bf", "bf", "number", "length", "mm", aliases=("bf", "flange width", "beff", "b flange"),
           help="Flange width as built. Leave blank to have the effective width computed (cl. 10.3)."),
    Column("clear_to_next_web", "Clear to next web", "number", "length", "mm",
           aliases=("clear to next web", "clear distance to next web", "clear web spacing", "web clear spacing",
                    "clear to next beam", "sw"),
           help="Clear distance from the face of this web to the face of the next web (limits bf, cl. 10.3)."),
    Column("span", "Span", "number", "span", "m", aliases=("span", "span c/c", "c/c span", "span (c/c)",
                                                          "centre-to-centre span", "center-to-center span",
                                                          "span length", "l", "length"),
           help="Centre-to-centre span."),
    Column("clear_span", "Clear span", "number", "span", "m", aliases=("clear span", "ln", "clear length",
                                                                      "span clear", "l clear"),
           help="Clear span ln, face to face of supports. Blank: the c/c span stands in (noted)."),
    Column("support", "Support", "choice", aliases=("support", "supports", "support condition",
                                                    "support conditions", "end conditions", "ends", "span type"),
           choices=("simple", "one end continuous", "both ends continuous", "cantilever"),
           help="Shorthand for both ends: simple, one end continuous, both ends continuous, cantilever. "
                "Left end / Right end, where given, win."),
    Column("left_end", "Left end", "choice", aliases=("left end", "end l", "left support", "end left",
                                                      "support l", "support left", "l end"),
           choices=("simple", "continuous", "free"),
           help="Left end: simple, continuous (or fixed) or free (the tip of a cantilever)."),
    Column("right_end", "Right end", "choice", aliases=("right end", "end r", "right support", "end right",
                                                        "support r", "support right", "r end"),
           choices=("simple", "continuous", "free"),
           help="Right end: simple, continuous (or fixed) or free (the tip of a cantilever)."),
    Column("cover", "Cover", "number", "length", "mm", aliases=("cover", "clear cover", "cover to stirrups"),
           help="Clear cover to the stirrups, top and bottom."),
    Column("cover_top", "Cover top", "number", "length", "mm", aliases=("cover top", "top cover", "clear cover top"),
           help="Clear cover to the stirrups at the top face (wins over Cover)."),
    Column("cover_bottom", "Cover bottom", "number", "length", "mm",
           aliases=("cover bottom", "bottom cover", "cover bot", "bot cover", "cover btm", "btm cover",
                    "clear cover bottom"),
           help="Clear cover to the stirrups at the bottom face (wins over Cover)."),
    Column("bottom_bars", "Bottom bars", "bars", aliases=_BOT,
           help="Bottom bars at midspan, e.g. 4-25M; mixed sizes 2-25M + 2-20M; layers 4-25M / 2-25M "
                "(first layer nearest the face)."),
    Column("top_bars", "Top bars", "bars", aliases=_TOP,
           help="Top bars at both supports (use Top bars L / Top bars R where the ends differ)."),
    Column("top_bars_l", "Top bars L", "bars", aliases=_lr(_TOP, "L"), help="Top bars at the left support."),
    Column("top_bars_r", "Top bars R", "bars", aliases=_lr(_TOP, "R"), help="Top bars at the right support."),
    Column("top_bars_mid", "Top bars at midspan", "bars",
           aliases=("top bars at midspan", "top bars midspan", "top bars mid", "top mid", "top (midspan)",
                    "top midspan", "top at midspan", "compression bars"),
           help="Top bars through midspan (compression steel under Mf+), optional."),
    Column("bottom_bars_support", "Bottom bars at support", "bars",
           aliases=("bottom bars at support", "bottom bars at supports", "bottom at support", "bot bars at support",
                    "bottom bars support", "btm at support", "bottom (support)", "bottom at supports"),
           help="Bottom bars at the supports: tension under Mf+ L / Mf+ R, compression under Mf-."),
    Column("stirrups", "Stirrups", "stirrups", aliases=("stirrups", "stirrup", "ties", "links",
                                                        "shear reinforcement", "stirrups spacing"),
           help="Closed stirrups: 10M@200 (two legs, spacing in mm), 4L-10M@200 or 10M@200 (4 legs)."),
    Column("skin_bars", "Skin bars", "bars", aliases=("skin bars", "skin reinforcement", "side bars", "skin steel",
                                                      "face bars", "skin"),
           help="Skin reinforcement on each side face, e.g. 3-10M (cl. 10.6.2, for h > 750 mm)."),
    Column("d", "d", "number", "length", "mm", aliases=("d", "d bottom", "d bot", "d (bottom)", "d+",
                                                        "effective depth"),
           help="Optional: depth of the bottom bars' centroid below the top face. Blank: computed from cover, "
                "stirrup and bar sizes."),
    Column("d_top", "d top", "number", "length", "mm", aliases=("d top", "d (top)", "d-", "d top bars"),
           help="Optional: depth of the top bars' centroid above the bottom face."),
    Column("fc", "f'c", "number", "stress", "MPa", aliases=("f'c", "fc", "fc'", "f'c concrete", "concrete strength",
                                                           "concrete"),
           help="Specified concrete strength f'c (20 to 80 MPa, cl. 8.6.1.1). Blank: the Parameters value."),
    Column("fy", "fy", "number", "stress", "MPa", aliases=("fy", "fy bars", "steel yield", "yield strength",
                                                          "fy longitudinal"),
           help="Yield strength of the longitudinal bars (at most 500 MPa, cl. 8.5.1). Blank: the Parameters value."),
    Column("fyt", "fyt", "number", "stress", "MPa", aliases=("fyt", "fyv", "fys", "fy stirrups", "fy stirrup",
                                                            "stirrup fy", "fy ties"),
           help="Yield strength of the stirrups. Blank: the Parameters value, else fy."),
    Column("agg", "Agg", "number", "length", "mm", aliases=("agg", "aggregate", "max aggregate", "maximum aggregate",
                                                           "ag", "max agg", "aggregate size", "max aggregate size"),
           help="Maximum aggregate size. Blank: the Parameters value, else 20 mm (flagged as assumed)."),
    Column("exposure", "Exposure", "choice", aliases=("exposure", "exposure condition"),
           choices=("interior", "exterior"),
           help="interior or exterior (crack control, cl. 10.6.1). Blank: the Parameters value, else exterior."),
    Column("density", "Density", "choice", aliases=("density", "concrete density", "concrete type"),
           choices=("normal", "semi-low-density", "low-density"),
           help="Concrete density: normal (λ = 1.0), semi-low-density (0.85), low-density (0.75), cl. 8.6.5."),
    Column("precast", "Precast", "bool", aliases=("precast", "precast certified", "plant precast"),
           choices=("yes", "no"),
           help="yes for an element precast in a plant certified to CSA A23.4 (φc = 0.70)."),
    Column("epoxy", "Epoxy", "bool", aliases=("epoxy", "epoxy coated", "epoxy-coated", "epoxy bars"),
           choices=("yes", "no"), help="yes for epoxy-coated bars."),
    Column("mf_pos", "Mf+", "number", "moment", "kN·m",
           aliases=("mf+", "mf pos", "mf positive", "mf(+)", "+mf", "mf+ mid", "mf+ midspan", "mf sagging", "mf sag",
                    "mf+ve"),
           help="Factored sagging moment at midspan (zero or more)."),
    Column("mf_neg", "Mf-", "number", "moment", "kN·m", aliases=_MNEG,
           help="Factored hogging moment at both supports, as a magnitude (either sign reads as hogging)."),
    Column("mf_neg_l", "Mf- L", "number", "moment", "kN·m", aliases=_lr(_MNEG, "L"),
           help="Factored hogging moment at the left support (magnitude)."),
    Column("mf_neg_r", "Mf- R", "number", "moment", "kN·m", aliases=_lr(_MNEG, "R"),
           help="Factored hogging moment at the right support (magnitude)."),
    Column("mf_pos_l", "Mf+ L", "number", "moment", "kN·m", aliases=_lr(_MPOS_SUP, "L"),
           help="Factored sagging moment at the left support (load reversal, back-span); resisted by "
                "Bottom bars at support."),
    Column("mf_pos_r", "Mf+ R", "number", "moment", "kN·m", aliases=_lr(_MPOS_SUP, "R"),
           help="Factored sagging moment at the right support; resisted by Bottom bars at support."),
    Column("vf", "Vf", "number", "force", "kN", aliases=_VF,
           help="Factored shear at the critical section, at dv from the face of the support (both ends, as a magnitude)."),
    Column("vf_l", "Vf L", "number", "force", "kN", aliases=_lr(_VF, "L"),
           help="Factored shear at the critical section near the left support: at dv from the face of the support."),
    Column("vf_r", "Vf R", "number", "force", "kN", aliases=_lr(_VF, "R"),
           help="Factored shear at the critical section near the right support: at dv from the face of the support."),
    Column("tf", "Tf", "number", "moment", "kN·m", aliases=("tf", "torsion", "tf torsion", "factored torsion"),
           help="Factored torsion (magnitude)."),
    Column("pf", "Pf", "number", "force", "kN", aliases=("pf", "axial", "pf axial", "factored axial load", "nf"),
           help="Factored axial load, compression positive."),
    Column("ms_pos", "Ms+", "number", "moment", "kN·m", aliases=("ms+", "ms pos", "service moment +", "ms sagging",
                                                                "m service+", "ms+ mid"),
           help="Optional service sagging moment at midspan, for crack control (cl. 10.6.1)."),
    Column("ms_neg", "Ms-", "number", "moment", "kN·m", aliases=("ms-", "ms neg", "service moment -", "ms hogging",
                                                                "m service-", "ms- support"),
           help="Optional service hogging moment at the supports (magnitude), for crack control."),
    Column("sfrs", "SFRS", "bool", aliases=("sfrs", "seismic", "part of sfrs", "sfrs member", "in sfrs"),
           choices=("yes", "no"), help="yes if the beam is part of the seismic force-resisting system."),
    Column("notes", "Notes", "text", aliases=("notes", "note", "remarks", "comments", "comment"),
           help="Free text; copied to the results."),
)

BY_KEY: dict[str, Column] = {c.key: c for c in COLUMNS}

_ALIAS: dict[str, str] = {}
for _c in COLUMNS:
    for _a in (_c.label, *_c.aliases):
        _ALIAS.setdefault(norm(_a), _c.key)

MARK_ALIASES = frozenset(norm(a) for a in BY_KEY["mark"].aliases)

_BRACKET = re.compile(r"^(.*?)\s*[\(\[]([^\(\)\[\]]*)[\)\]]\s*$", re.DOTALL)
_TRAILING_UNIT = re.compile(r"^(.*?)[\s,]+(\S+)\s*$", re.DOTALL)


def match_header(label: object) -> tuple[Column | None, str | None]:
    """(the column a header names, the unit text in its brackets) — (None, None) if unknown.

    The whole label is tried first, so that ``Top bars (L)`` is a label, not a unit; then the
    last bracketed group is taken as the unit.
    """
    text = str(label).strip()
    if not text:
        return None, None
    key = _ALIAS.get(norm(text))
    if key:
        return BY_KEY[key], None
    m = _BRACKET.match(text)
    if m:
        key = _ALIAS.get(norm(m.group(1)))
        if key:
            return BY_KEY[key], m.group(2).strip()
    # 'Mf+ kN·m', 'Span, m': a unit written without brackets, taken only if it is a spelling of
    # a unit beamsched knows and the rest names a dimensioned column
    m = _TRAILING_UNIT.match(text)
    if m:
        from .units import is_known_spelling

        key = _ALIAS.get(norm(m.group(1)))
        if key and BY_KEY[key].dimension and is_known_spelling(m.group(2)):
            return BY_KEY[key], m.group(2).strip()
    return None, None


_SUB = frozenset(norm(x) for x in ("L", "R", "left", "right", "(L)", "(R)", "mid", "midspan", "at midspan",
                                   "support", "at support", "supports", "top", "bottom", "+", "-"))


def join_subheader(header: list, sub: list) -> list | None:
    """A header written on two rows — a heading over its L / R (or mid / support) sub-columns,
    often merged across them — as one row of labels: ``Mf- (kN·m)`` over ``L`` and ``R`` reads
    as ``Mf- L (kN·m)`` and ``Mf- R (kN·m)``. None when ``sub`` is not such a row (it is data)."""
    from .cells import Cell

    texts = [c.value if isinstance(c.value, str) else None for c in sub]
    filled = [i for i, c in enumerate(sub) if not c.blank]
    if not filled or any(texts[i] is None or norm(texts[i]) not in _SUB for i in filled):
        return None
    out = list(header) + [Cell(None)] * max(0, len(sub) - len(header))
    above = None
    for i in range(len(out)):
        top = out[i].value if not out[i].blank else None
        if top is not None:
            above = str(top).strip()
        part = texts[i].strip() if i < len(texts) and texts[i] else None
        if part is None:
            continue
        base = str(top).strip() if top is not None else above
        if base is None or is_mark(base):
            return None  # nothing above it, or under the Mark: a data row (a beam marked 'L'), not sub-labels
        m = _BRACKET.match(base)
        label = f"{m.group(1)} {part} ({m.group(2)})" if m else f"{base} {part}"
        out[i] = Cell(label)
    return out


def is_mark(label: object) -> bool:
    col, _ = match_header(label) if label is not None else (None, None)
    return col is not None and col.key == "mark"


FIELDS = {  # column key -> the BeamInput field(s) it fills
    "mark": "mark", "span_no": "span_no", "qty": "qty", "type": "shape", "bw": "bw", "h": "h", "hf": "hf", "bf": "bf",
    "clear_to_next_web": "clear_to_next_web", "span": "span", "clear_span": "clear_span",
    "support": "left_end, right_end", "left_end": "left_end", "right_end": "right_end",
    "cover": "cover_top, cover_bottom", "cover_top": "cover_top", "cover_bottom": "cover_bottom",
    "bottom_bars": "bottom_bars", "top_bars": "top_bars_left, top_bars_right", "top_bars_l": "top_bars_left",
    "top_bars_r": "top_bars_right", "top_bars_mid": "top_bars_mid", "bottom_bars_support": "bottom_bars_support",
    "stirrups": "stirrups", "skin_bars": "skin_bars", "d": "d_bottom", "d_top": "d_top", "fc": "fc", "fy": "fy",
    "fyt": "fyt", "agg": "agg", "exposure": "exposure", "density": "density, lam", "precast": "precast",
    "epoxy": "epoxy", "mf_pos": "Mf_pos", "mf_neg": "Mf_neg_left, Mf_neg_right", "mf_neg_l": "Mf_neg_left",
    "mf_neg_r": "Mf_neg_right", "mf_pos_l": "Mf_pos_left", "mf_pos_r": "Mf_pos_right", "vf": "Vf_left, Vf_right",
    "vf_l": "Vf_left", "vf_r": "Vf_right", "tf": "Tf", "pf": "Pf", "ms_pos": "Ms_pos", "ms_neg": "Ms_neg",
    "sfrs": "sfrs", "notes": "notes",
}
UNITS_ACCEPTED = {
    "length": "mm, m, cm, in, ft", "span": "m, mm, ft, in",
    "stress": "MPa, N/mm², kPa, psi, ksi", "force": "kN, N, kip, lbf",
    "moment": "kN·m (kNm, kN-m, kN.m), N·mm, kip-ft (kip·ft, k-ft, ft-kip), kip·in (kip-in, in-kip), lb-ft",
}


def markdown_table() -> str:
    """The column table for the README: label, unit, what it fills, aliases, units understood."""
    lines = ["| column (template header) | fills | also read as | units understood |", "|---|---|---|---|"]
    for c in COLUMNS:
        aliases = sorted({a for a in c.aliases if norm(a) != norm(c.label)}, key=lambda a: (len(a), a))
        shown = ", ".join(f"`{a}`" for a in aliases[:8]) + (" …" if len(aliases) > 8 else "")
        units = UNITS_ACCEPTED[c.dimension] if c.dimension else ("mm (spacing) or none" if c.kind == "stirrups"
                                                                  else "none")
        choices = f" ({' / '.join(c.choices)})" if c.choices else ""
        lines.append(f"| `{c.header()}`{choices} | {FIELDS[c.key]} | {shown} | {units} |")
    return "\n".join(lines)
