"""Results for people and scripts outside the workbook: a short table at the terminal, and the
per-part results as CSV or JSON, in the same units and words as the results sheet."""

from __future__ import annotations

import csv
import io
import json
from pathlib import Path

import numpy as np
from twistshare.engine.intake import BookRating, Display, governs_text

from ..ooxml import atomic_file
from ..sheets import criterion_counts, finite_or_none, lowest_margins

__all__ = ["part_records", "terminal_table", "write_records"]


def part_records(result: BookRating, display: Display) -> list[dict[str, object]]:
    """One record a part, keyed by the results sheet's own headers (units in them)."""
    parts, r = result.parts, result.rating
    if parts is None:
        return []
    tu, tf = display.unit("torque")
    rated = np.zeros(parts.count, bool) if result.rated is None else np.asarray(result.rated, bool)
    out = []
    for i, pid in enumerate(parts.ids):
        record: dict[str, object] = {"Part": pid}
        if r is None or not rated[i]:
            record.update({"Status": "not rated", f"Demand torque [{tu}]": None, f"Governing limit [{tu}]": None,
                           "Governs": None, "Margin [%]": None, "Reserve factor (limit / demand)": None})
        else:
            margin = float(r.margin[i]) * 100
            layer = int(r.governing_layer[i])
            material = parts.materials[i][layer] if layer >= 0 else None
            record.update({
                "Status": "FAILS" if margin < 0 else "ok",
                f"Demand torque [{tu}]": finite_or_none(parts.torque[i] / tf),
                f"Governing limit [{tu}]": finite_or_none(r.governing_capacity[i] / tf),
                "Governs": governs_text(int(r.governing_criterion[i]), layer, material),
                "Margin [%]": finite_or_none(margin),
                "Reserve factor (limit / demand)": finite_or_none(r.reserve_factor[i]),
            })
        out.append(record)
    return out


def write_records(records: list[dict[str, object]], path: Path) -> None:
    """CSV (by the file's suffix ``.csv``) or JSON (anything else): the records as they are."""
    if path.suffix.lower() == ".csv":
        text = io.StringIO(newline="")
        writer = csv.DictWriter(text, fieldnames=list(records[0]) if records else ["Part"])
        writer.writeheader()
        writer.writerows(records)
        data = text.getvalue()
    else:
        data = json.dumps(records, indent=1, ensure_ascii=False)
    with atomic_file(path, 0o644) as f:  # like every file the bridge writes: whole or not at all
        f.write(data.encode("utf-8"))


def terminal_table(result: BookRating, display: Display, count: int = 10) -> str:
    """The lowest margins and what governs how many parts, as a few aligned lines."""
    parts, r = result.parts, result.rating
    low = lowest_margins(result, count)
    if not low or parts is None or r is None:
        return ""
    tu, tf = display.unit("torque")
    lines = [f"  lowest margins{'':<8}{'margin [%]':>11}  {f'limit [{tu}]':>14}  {f'demand [{tu}]':>14}  governs"]
    for i in low:
        layer = int(r.governing_layer[i])
        material = parts.materials[i][layer] if layer >= 0 else None
        lines.append(f"  {parts.ids[i]:<22}{r.margin[i] * 100:>11.1f}  {r.governing_capacity[i] / tf:>14.1f}  "
                     f"{parts.torque[i] / tf:>14.1f}  {governs_text(int(r.governing_criterion[i]), layer, material)}")
    counts = ", ".join(f"{words}: {n}" for words, n in criterion_counts(result))
    if counts:
        lines.append(f"  governed by {counts}")
    return "\n".join(lines)
