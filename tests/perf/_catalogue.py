"""Big benchmark catalogues: our input convention, and the same parts as a native-formula sheet.

Both books hold the same invented Marrowby-style parts (seeded, so every run builds the same
books). The peer is the sheet an engineer would otherwise build by hand: per row, each layer's
polar moment, G·J, their sum, each layer's capacity, the twist capacity, the smallest of them and
the margin, with G and the allowable looked up in the Materials sheet.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np
from openpyxl import Workbook
from openpyxl.utils import get_column_letter

__all__ = [
    "BENCH_MATERIALS",
    "BigCatalogue",
    "make_big_catalogue",
    "peer_reference",
    "write_big_catalogue",
    "write_native_formula_peer",
]

DEFAULT_SEED = 20240301

# (name, G [GPa], allowable shear [MPa]); invented demo values.
BENCH_MATERIALS: tuple[tuple[str, float, float], ...] = (
    ("MPD core steel Q2", 80.0, 110.0),
    ("MPD core steel Q3", 79.3, 95.0),
    ("MPD duplex sleeve", 77.0, 112.0),
    ("MPD bronze sleeve", 41.0, 45.0),
    ("MPD nickel-bronze sleeve", 44.0, 62.0),
    ("MPD stainless sleeve", 76.0, 80.0),
)
_CORES = (0, 1)
_SLEEVES = (2, 3, 4, 5)

MATERIAL_HEADERS = ("Material", "G [GPa]", "Allowable shear [MPa]", "Allowable rule")
PART_HEADERS = ("Part", "Length [mm]", "Torque [N·m]", "Twist limit [deg]")
LAYER_SUFFIXES = ("material", "outer diameter [mm]", "inner diameter [mm]", "Kt")


@dataclass(frozen=True)
class BigCatalogue:
    """The parts of a benchmark catalogue as arrays (mm, N·m, deg; NaN twist limit = none)."""

    part_ids: list[str]
    length: np.ndarray  # (P,) mm
    torque: np.ndarray  # (P,) N·m
    twist_limit: np.ndarray  # (P,) deg, NaN where the part has none
    material: np.ndarray  # (P, L) int index into BENCH_MATERIALS
    outer: np.ndarray  # (P, L) mm
    inner: np.ndarray  # (P, L) mm
    kt: np.ndarray  # (P, L)

    @property
    def parts(self) -> int:
        return len(self.part_ids)

    @property
    def layers(self) -> int:
        return self.outer.shape[1]


def make_big_catalogue(parts: int = 50_000, layers: int = 3, seed: int = DEFAULT_SEED) -> BigCatalogue:
    """Draw a seeded catalogue of sleeved shafts: a steel core and ``layers - 1`` sleeves.

    Torques are set near each part's own capacity so margins fall on both sides of zero.
    """
    rng = np.random.default_rng(seed)
    core_od = np.round(rng.uniform(30.0, 90.0, parts), 1)
    hollow = rng.random(parts) < 0.3
    core_id = np.where(hollow, np.round(core_od * rng.uniform(0.3, 0.6, parts), 1), 0.0)
    walls = np.round(rng.uniform(2.0, 8.0, (parts, max(layers - 1, 0))), 1)
    outer = np.empty((parts, layers))
    inner = np.empty((parts, layers))
    outer[:, 0], inner[:, 0] = core_od, core_id
    for j in range(1, layers):
        inner[:, j] = outer[:, j - 1]
        outer[:, j] = np.round(inner[:, j] + 2.0 * walls[:, j - 1], 1)
    material = np.empty((parts, layers), dtype=np.int64)
    material[:, 0] = rng.choice(_CORES, parts)
    if layers > 1:
        material[:, 1:] = rng.choice(_SLEEVES, (parts, layers - 1))
    kt = np.round(rng.choice([1.0, 1.2, 1.5, 1.8, 2.0], (parts, layers)), 2)
    length = np.round(rng.uniform(300.0, 2000.0, parts), 0)
    twist_limit = np.where(rng.random(parts) < 0.5, np.round(rng.uniform(0.25, 1.5, parts), 2), np.nan)
    # Rough capacity of the core alone (mm, MPa -> N·m), scaled so some parts fail.
    tau = np.array([m[2] for m in BENCH_MATERIALS])[material[:, 0]]
    j_core = np.pi / 32.0 * (core_od**4 - core_id**4)
    torque = np.round(tau * j_core / (core_od / 2.0) / 1000.0 * rng.uniform(0.3, 1.6, parts), 0)
    ids = [f"MPD-B-{i:06d}" for i in range(1, parts + 1)]
    return BigCatalogue(ids, length, torque, twist_limit, material, outer, inner, kt)


def _materials_sheet(wb: Workbook) -> None:
    ws = wb.create_sheet("Materials")
    ws.append(list(MATERIAL_HEADERS))
    for name, g, tau in BENCH_MATERIALS:
        ws.append([name, g, tau, "given"])


def _layer_headers(layers: int) -> list[str]:
    return [f"Layer {n} {s}" for n in range(1, layers + 1) for s in LAYER_SUFFIXES]


def _input_rows(cat: BigCatalogue):
    names = [m[0] for m in BENCH_MATERIALS]
    length, torque, twist = cat.length.tolist(), cat.torque.tolist(), cat.twist_limit.tolist()
    mat, od, idd, kt = cat.material.tolist(), cat.outer.tolist(), cat.inner.tolist(), cat.kt.tolist()
    for i, pid in enumerate(cat.part_ids):
        row: list[object] = [pid, length[i], torque[i], None if twist[i] != twist[i] else twist[i]]
        for j in range(cat.layers):
            row += [names[mat[i][j]], od[i][j], idd[i][j], kt[i][j]]
        yield row


def write_big_catalogue(path: str | Path, parts: int = 50_000, layers: int = 3,
                        seed: int = DEFAULT_SEED) -> Path:
    """Write a catalogue in our input convention: Materials and Parts sheets, numbers in cells.

    Parameters
    ----------
    path : str or Path
        The new workbook.
    parts, layers : int
        Catalogue size.
    seed : int
        Seed of the random draw; the same seed gives the same parts.

    Returns
    -------
    Path
    """
    cat = make_big_catalogue(parts, layers, seed)
    wb = Workbook(write_only=True)
    _materials_sheet(wb)
    ws = wb.create_sheet("Parts")
    ws.append(list(PART_HEADERS) + _layer_headers(layers))
    for row in _input_rows(cat):
        ws.append(row)
    wb.save(path)
    return Path(path)


def _peer_formulas(r: int, layers: int, first_calc_col: int) -> tuple[list[str], list[str]]:
    """Formula cells of row ``r`` and their headers (computed columns in N·m, GPa·mm⁴)."""
    col = get_column_letter
    n_mat = len(BENCH_MATERIALS)
    table = f"Materials!$A$2:$C${n_mat + 1}"
    base = len(PART_HEADERS)  # zero-based index of Layer 1 material
    headers: list[str] = []
    cells: list[str] = []
    nxt = first_calc_col
    gj_cols: list[str] = []
    layer_refs = []
    for j in range(layers):
        m, do, di, kt = (col(base + 4 * j + k + 1) for k in range(4))
        g_c, t_c, j_c, gj_c = (col(nxt + k) for k in range(4))
        nxt += 4
        headers += [f"Layer {j + 1} G [GPa]", f"Layer {j + 1} allowable [MPa]",
                    f"Layer {j + 1} J [mm^4]", f"Layer {j + 1} GJ [GPa·mm^4]"]
        cells += [f"=VLOOKUP({m}{r},{table},2,FALSE)", f"=VLOOKUP({m}{r},{table},3,FALSE)",
                  f"=PI()/32*({do}{r}^4-{di}{r}^4)", f"={g_c}{r}*{j_c}{r}"]
        gj_cols.append(gj_c)
        layer_refs.append((g_c, t_c, do, kt))
    sum_c = col(nxt)
    nxt += 1
    headers.append("Sum GJ [GPa·mm^4]")
    cells.append("=" + "+".join(f"{c}{r}" for c in gj_cols))
    cap_cols = []
    for j, (g_c, t_c, do, kt) in enumerate(layer_refs):
        cap_cols.append(col(nxt))
        nxt += 1
        headers.append(f"Layer {j + 1} capacity [N·m]")
        # tau[MPa] * sum GJ[GPa mm^4] / (G[GPa] * r[mm] * Kt) is N·mm; /1000 gives N·m.
        cells.append(f"={t_c}{r}*{sum_c}{r}/({g_c}{r}*{do}{r}/2*{kt}{r})/1000")
    twist_c = col(nxt)
    nxt += 1
    cap_cols.append(twist_c)
    headers.append("Twist capacity [N·m]")
    # rad * GPa·mm^4 / mm = N·m; no limit -> a huge number so MIN ignores it.
    cells.append(f'=IF(D{r}="",1E+300,RADIANS(D{r})*{sum_c}{r}/B{r})')
    gov_c = col(nxt)
    first, last = cap_cols[0], cap_cols[-1]
    headers += ["Governing capacity [N·m]", "Governs (1..n layer, last = twist)", "Margin",
                "Twist [deg]"]
    cells += [f"=MIN({first}{r}:{last}{r})", f"=MATCH({gov_c}{r},{first}{r}:{last}{r},0)",
              f"={gov_c}{r}/ABS(C{r})-1", f"=DEGREES(C{r}*B{r}/{sum_c}{r})"]
    return cells, headers


def write_native_formula_peer(path: str | Path, parts: int = 50_000, layers: int = 3,
                              seed: int = DEFAULT_SEED) -> Path:
    """Write the same catalogue as a hand-built sheet of native formulas (no cached values).

    Parameters
    ----------
    path : str or Path
        The new workbook.
    parts, layers : int
        Catalogue size.
    seed : int
        Seed of the random draw; the same seed as :func:`write_big_catalogue` gives its parts.

    Returns
    -------
    Path
    """
    cat = make_big_catalogue(parts, layers, seed)
    wb = Workbook(write_only=True)
    _materials_sheet(wb)
    ws = wb.create_sheet("Parts")
    inputs = list(PART_HEADERS) + _layer_headers(layers)
    first_calc = len(inputs) + 1
    _, calc_headers = _peer_formulas(2, layers, first_calc)
    ws.append(inputs + calc_headers)
    for i, row in enumerate(_input_rows(cat)):
        cells, _ = _peer_formulas(i + 2, layers, first_calc)
        ws.append(row + cells)
    wb.save(path)
    return Path(path)


def peer_reference(cat: BigCatalogue) -> dict[str, np.ndarray]:
    """The peer's governing capacity and margin computed with numpy, to check a recalculation."""
    g = np.array([m[1] for m in BENCH_MATERIALS])[cat.material]
    tau = np.array([m[2] for m in BENCH_MATERIALS])[cat.material]
    gj = g * np.pi / 32.0 * (cat.outer**4 - cat.inner**4)
    total = gj.sum(axis=1)
    caps = tau * total[:, None] / (g * cat.outer / 2.0 * cat.kt) / 1000.0
    twist = np.where(np.isnan(cat.twist_limit), np.inf, np.radians(cat.twist_limit) * total / cat.length)
    gov = np.minimum(caps.min(axis=1), twist)
    return {"governing": gov, "margin": gov / np.abs(cat.torque) - 1.0}
