"""The words an engineer types that are not numbers: headers, rule names, yes/no, material names.

Each table lives here once; the cell functions and the workbook reader both read through it,
so ``mises`` or ``with keyway`` means the same in a cell and in a table.
"""

from __future__ import annotations

import re
from collections.abc import Iterable, Mapping
from functools import lru_cache
from types import MappingProxyType

from twistshare.engine.core import AllowableRule, EndSupport, LoadPath, OuterLayers, SizedDimension, normalise_name
from twistshare.engine.units import ERROR_VALUES, error_value_text

__all__ = [
    "header_key",
    "material_key",
    "rule_from_text",
    "RULE_WORDS",
    "RULE_FORMULAS",
    "RULE_CHOICES",
    "flag_from_value",
    "load_path_from_text",
    "LOAD_PATH_WORDS",
    "LOAD_PATH_CHOICES",
    "YES_WORDS",
    "NO_WORDS",
    "quoted",
    "QUOTE_MAX",
    "where_text",
    "error_value_text",
    "ERROR_VALUES",
    "size_request_from_text",
    "size_text",
    "SIZE_CHOICES",
    "outer_layers_from_text",
    "OUTER_LAYERS_WORDS",
    "OUTER_LAYERS_CHOICES",
    "SUPPORT_WORDS",
    "SUPPORT_CHOICES",
    "support_from_text",
]

_HEADER_RUNS = re.compile(r"[\s_\-]+")


def header_key(label: object) -> str:
    """A header label made comparable: case-folded, apostrophes dropped, ``_``, ``-`` and runs
    of white space made one space (``"Young's_modulus"`` -> ``"youngs modulus"``)."""
    return _text_key(str(label))


@lru_cache(maxsize=4096)
def _text_key(text: str) -> str:
    # Cached: a recalculating sheet and a table's column of rule words repeat a few texts.
    text = text.replace("’", "'").replace("'", "")
    return _HEADER_RUNS.sub(" ", text).strip().casefold()


def material_key(name: str) -> str:
    """The key material names are matched by (the core's rule: case-folded, spaces folded)."""
    return normalise_name(name)


# Rule names as tables and cells write them, plus the published methods' own names.
_RULE_NAMES: Mapping[str, AllowableRule] = MappingProxyType(
    {
        "given": AllowableRule.GIVEN,
        "direct": AllowableRule.GIVEN,
        "max shear": AllowableRule.MAX_SHEAR,
        "maximum shear": AllowableRule.MAX_SHEAR,
        "max shear stress": AllowableRule.MAX_SHEAR,
        "maximum shear stress": AllowableRule.MAX_SHEAR,
        "tresca": AllowableRule.MAX_SHEAR,
        "distortion energy": AllowableRule.DISTORTION_ENERGY,
        "von mises": AllowableRule.DISTORTION_ENERGY,
        "mises": AllowableRule.DISTORTION_ENERGY,
        "shafting code": AllowableRule.SHAFTING_CODE,
        "transmission shafting code": AllowableRule.SHAFTING_CODE,
        "code": AllowableRule.SHAFTING_CODE,
    }
)

#: The one short name of each rule, as outputs and messages write it.
RULE_WORDS: Mapping[AllowableRule, str] = MappingProxyType(
    {
        AllowableRule.GIVEN: "given",
        AllowableRule.MAX_SHEAR: "max shear",
        AllowableRule.DISTORTION_ENERGY: "distortion energy",
        AllowableRule.SHAFTING_CODE: "shafting code",
    }
)

#: The rule with its method and formula, for the sheets that explain what was used.
RULE_FORMULAS: Mapping[AllowableRule, str] = MappingProxyType(
    {
        AllowableRule.GIVEN: "given",
        AllowableRule.MAX_SHEAR: "max shear (Tresca) 0.5·Sy/FS",
        AllowableRule.DISTORTION_ENERGY: "distortion energy (von Mises) Sy/(√3·FS)",
        AllowableRule.SHAFTING_CODE: "shafting code min(0.30·Sy, 0.18·Su)",
    }
)

RULE_CHOICES = "given, max shear, distortion energy, shafting code"


def rule_from_text(text: object) -> AllowableRule | None:
    """The allowable rule a cell names (case, spaces, ``-`` and ``_`` do not matter), or None."""
    if not isinstance(text, str):
        return None
    return _RULE_NAMES.get(header_key(text))


#: Each load path as the results write it (the first of its spellings below).
LOAD_PATH_WORDS: Mapping[LoadPath, str] = MappingProxyType({
    LoadPath.THROUGH_CORE: "through the core",
    LoadPath.THROUGH_OUTER_LAYER: "through the outer layer",
    LoadPath.THROUGH_EVERY_LAYER: "every layer",
})
_LOAD_PATH_NAMES: Mapping[str, LoadPath] = MappingProxyType({
    header_key(word): path for word, path in (
        ("through the core", LoadPath.THROUGH_CORE), ("through core", LoadPath.THROUGH_CORE),
        ("core", LoadPath.THROUGH_CORE), ("core driven", LoadPath.THROUGH_CORE),
        ("through the outer layer", LoadPath.THROUGH_OUTER_LAYER),
        ("through outer layer", LoadPath.THROUGH_OUTER_LAYER),
        ("outer layer", LoadPath.THROUGH_OUTER_LAYER), ("outer", LoadPath.THROUGH_OUTER_LAYER),
        ("sleeve driven", LoadPath.THROUGH_OUTER_LAYER),
        ("every layer", LoadPath.THROUGH_EVERY_LAYER), ("all layers", LoadPath.THROUGH_EVERY_LAYER),
        ("through every layer", LoadPath.THROUGH_EVERY_LAYER),
        ("each layer", LoadPath.THROUGH_EVERY_LAYER),
    )
})
LOAD_PATH_CHOICES = "through the core (the default), through the outer layer, every layer"


def load_path_from_text(text: object) -> LoadPath | None:
    """The load path a cell names (case, spaces, ``-`` and ``_`` do not matter), or None."""
    if not isinstance(text, str):
        return None
    return _LOAD_PATH_NAMES.get(header_key(text))


YES_WORDS = frozenset({"yes", "y", "true", "1", "x", "keyway", "with keyway"})
NO_WORDS = frozenset({"no", "n", "false", "0", "none", "-", "without keyway"})


def flag_from_value(raw: object) -> bool | None:
    """A yes/no cell: True, False, or None when it is neither (TRUE/FALSE, yes/no, y/n, 1/0)."""
    if isinstance(raw, bool):
        return raw
    if isinstance(raw, (int, float)):
        return bool(raw) if raw in (0, 1) else None
    if isinstance(raw, str):
        word = " ".join(raw.split()).casefold()
        if word in YES_WORDS:
            return True
        if word in NO_WORDS:
            return False
    return None


QUOTE_MAX = 60  # characters of a cell's text quoted in a message


def quoted(text: str) -> str:
    """A cell's text for a message: stripped, quoted, cut short when it is a pasted paragraph."""
    text = text.strip()
    if len(text) > QUOTE_MAX:
        return repr(text[:QUOTE_MAX]) + f" (… {len(text)} characters)"
    return repr(text)


def where_text(part: str | None, layer: int | None = None) -> str:
    """How a message names a part and layer: ``part MPD-S-014, layer 2``.

    A part without an id of its own (a cell function's one-part block) is named by its layer
    alone; a part named by its row (``row 5``, a block row without a Part column) by that row.
    """
    if not part:
        return f"layer {layer}" if layer else "the part"
    who = part if part.startswith("row ") else f"part {part}"
    return f"{who}, layer {layer}" if layer else who


def may_hold_error_values(texts: Iterable[str | None]) -> bool:
    """Whether any of these stripped texts could be a spreadsheet error value (``#...``, ``ERR:...``).

    One pass at C speed over a long column. True only sends the caller to the exact check of
    each cell (`error_value_text`), so a false alarm costs time, never a wrong answer.
    """
    joined = "\n" + "\n".join(filter(None, texts))
    # Upper-casing a long column costs more than the search: only a text with a colon can
    # hold an ``Err:`` value in any case.
    return "\n#" in joined or (":" in joined and "\nERR:" in joined.upper())


# --- Sizing: which dimension a Size cell names, and what the layers outside it do -------------

_OUTER_WORDS = ("outer diameter", "outer dia", "outer dia.", "outer d", "od", "outside diameter",
                "diameter")
_WALL_WORDS = ("wall", "wall thickness", "thickness")
_BORE_WORDS = ("bore", "inner diameter", "inner dia", "id", "inside diameter")
_WHO = r"(?:(?:layer|l)\s*(?P<n>\d{1,2})|(?P<core>core)|(?P<sleeve>sleeve|outer layer|outermost layer))"
_SIZE_PATTERN = re.compile(rf"^(?:{_WHO}\s*[:.]?\s+)?(?P<what>.+?)$")

SIZE_CHOICES = ("'layer 2 outer diameter', 'layer 2 wall', 'core bore' (or 'outer diameter' / "
                "'wall' for the outermost layer, 'core outer diameter')")


def size_request_from_text(text: object) -> tuple[SizedDimension, int] | None:
    """The dimension a Size cell names and its layer slot (0-based; -1 = the outermost layer).

    ``"layer 2 outer diameter"`` -> (OUTER_DIAMETER, 1); ``"L3 wall"`` -> (WALL, 2);
    ``"core bore"``, ``"bore"``, ``"layer 1 inner diameter"`` -> (BORE, 0); ``"outer diameter"``,
    ``"sleeve wall"`` -> the outermost layer (-1); ``"core outer diameter"`` -> slot 0. Case,
    spaces, ``-`` and ``_`` do not matter. None for anything else (a bore of any layer but the
    core, a layer 0).
    """
    if not isinstance(text, str):
        return None
    m = _SIZE_PATTERN.match(header_key(text))
    if m is None:
        return None
    what = m.group("what").strip()
    if m.group("n") is not None:
        slot = int(m.group("n")) - 1
        if slot < 0:
            return None
    elif m.group("core"):
        slot = 0
    else:
        slot = -1
    if what in _BORE_WORDS:
        # only the innermost layer has a bore to open up; elsewhere it is an interface
        return (SizedDimension.BORE, 0) if slot == 0 or (slot == -1 and not m.group("sleeve")) else None
    if what in _OUTER_WORDS:
        return SizedDimension.OUTER_DIAMETER, slot
    if what in _WALL_WORDS:
        return SizedDimension.WALL, slot
    return None


def size_text(dimension: SizedDimension, slot: int) -> str:
    """How outputs name a sized dimension: ``layer 2 outer diameter``, ``core bore``."""
    dimension = SizedDimension(dimension)
    if dimension == SizedDimension.BORE:
        return "core bore"
    what = "outer diameter" if dimension == SizedDimension.OUTER_DIAMETER else "wall"
    return f"layer {slot + 1} {what}" if slot >= 0 else f"outermost layer {what}"


_OUTER_LAYER_NAMES: Mapping[str, OuterLayers] = MappingProxyType({
    "move": OuterLayers.MOVE, "moves": OuterLayers.MOVE, "moving": OuterLayers.MOVE,
    "move with it": OuterLayers.MOVE, "follow": OuterLayers.MOVE,
    "fixed": OuterLayers.FIXED, "fix": OuterLayers.FIXED, "stay": OuterLayers.FIXED,
    "stays": OuterLayers.FIXED, "keep": OuterLayers.FIXED, "kept": OuterLayers.FIXED,
})

#: The one word of each choice, as outputs write it.
OUTER_LAYERS_WORDS: Mapping[OuterLayers, str] = MappingProxyType({
    OuterLayers.MOVE: "move", OuterLayers.FIXED: "fixed"})

OUTER_LAYERS_CHOICES = "'move' (the layers outside keep their walls and move out) or 'fixed'"


def outer_layers_from_text(text: object) -> OuterLayers | None:
    """What the layers outside a sized diameter do: ``move`` or ``fixed`` (None: neither)."""
    if not isinstance(text, str):
        return None
    return _OUTER_LAYER_NAMES.get(header_key(text))
# How a shaft's ends are held in bending, for the whirl check. Blank: simply supported, the
# usual reading of a shaft in two bearings (common practice). Our own words; the end conditions
# themselves are the textbook beam cases.
SUPPORT_WORDS: Mapping[str, EndSupport] = MappingProxyType({
    "simply supported": EndSupport.PINNED_PINNED, "simple": EndSupport.PINNED_PINNED,
    "pinned": EndSupport.PINNED_PINNED, "pinned pinned": EndSupport.PINNED_PINNED,
    "two bearings": EndSupport.PINNED_PINNED,
    "clamped": EndSupport.FIXED_FIXED, "fixed": EndSupport.FIXED_FIXED,
    "fixed fixed": EndSupport.FIXED_FIXED, "clamped both ends": EndSupport.FIXED_FIXED,
    "overhung": EndSupport.FIXED_FREE, "cantilever": EndSupport.FIXED_FREE,
    "fixed free": EndSupport.FIXED_FREE, "clamped free": EndSupport.FIXED_FREE,
    "fixed pinned": EndSupport.FIXED_PINNED, "clamped pinned": EndSupport.FIXED_PINNED,
    "propped": EndSupport.FIXED_PINNED,
})
SUPPORT_CHOICES = "simply supported (blank), clamped, overhung, clamped-pinned"


def support_from_text(text: object) -> EndSupport | None:
    """The end condition a support word names (``"overhung"``), or None."""
    return SUPPORT_WORDS.get(header_key(str(text)).replace("/", " ").replace("–", " ").strip())
