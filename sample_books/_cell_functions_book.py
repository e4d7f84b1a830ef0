"""The sample book of cell functions: one shaft's inputs and the formulas that call the functions."""

from __future__ import annotations

from pathlib import Path

from openpyxl.styles import Alignment
from openpyxl.worksheet.worksheet import Worksheet

from ._builder import (
    _HEADER_FILL,
    _HEADER_FONT,
    _TITLE_FONT,
    _new_workbook,
    _print_setup,
    _save_reproducibly,
    _write_read_me,
)
from ._scenario import (  # the scenario's data, written here
    _AB,
    _Q2,
    _SS,
    CELL_FUNCTIONS_FILE,
    Cell,
)

__all__ = ["write_cell_functions_book"]


_CELL_SHEET = "Shaft MPD-S-061"

# Where the blocks sit on the cell-functions sheet; the formulas refer to these ranges.
_LAYER_BLOCK = "B5:F8"
_MATERIAL_BLOCK = "B11:H12"
_TORQUE_PAIR = "B20:C20"  # value from TWS_TORQUE_FROM_POWER beside its unit


def _fill_cell_functions_sheet(ws: Worksheet) -> None:
    """One shaft's inputs, and formulas calling the cell functions (no cached values).

    Functions that return one value per layer are written as array formulas over the
    title cell and one row per layer, so every spreadsheet shows all the values.
    """
    from openpyxl.worksheet.formula import ArrayFormula

    lay, mat, torque = _LAYER_BLOCK, _MATERIAL_BLOCK, _TORQUE_PAIR

    def heading(cell: str, text: str) -> None:
        ws[cell] = text
        ws[cell].font = _HEADER_FONT

    ws["A1"] = "MPD-S-061: pump shaft, bronze underlay + stainless sleeve (invented demo data)"
    ws["A1"].font = _TITLE_FONT
    ws["A2"] = ("Inputs carry their units, in a header or in the cell; the formulas call "
                "twistshare's cell functions.")
    heading("A4", "Layers, innermost first")
    rows: list[tuple[Cell, ...]] = [
        ("Layer", "Material", "Outer diameter [mm]", "Inner diameter [mm]",
         "Allowable shear [MPa]", "Kt"),
        # The core's allowable comes from its rule in the materials block; the sleeves' are
        # typed, worked out with TWS_ALLOWABLE at the foot of the sheet.
        (1, _Q2, 48, 0, None, 1.5),
        (2, _AB, 52, 48, 55.6, None),
        (3, _SS, 58, 52, 51.2, None),
    ]
    for r, row in enumerate(rows, start=5):
        for c, value in enumerate(row, start=1):
            ws.cell(row=r, column=c, value=value)
        ws.cell(row=r, column=1).alignment = Alignment(horizontal="left")
    for cell in ws[5]:
        cell.font, cell.fill = _HEADER_FONT, _HEADER_FILL

    heading("A10", "The works' own materials")
    mat_rows: list[tuple[Cell, ...]] = [
        ("Material", "G [GPa]", "Yield strength [MPa]", "Ultimate strength [MPa]",
         "Allowable rule", "Factor of safety", "Keyway"),
        (_Q2, 80, 650, 850, "distortion energy", 2.0, "no"),
    ]
    for r, row in enumerate(mat_rows, start=11):
        for c, value in enumerate(row, start=2):
            ws.cell(row=r, column=c, value=value)
    for c in range(2, 9):
        ws.cell(row=11, column=c).font = _HEADER_FONT
        ws.cell(row=11, column=c).fill = _HEADER_FILL

    heading("A14", "Duty and limits")
    duty: list[tuple[Cell, Cell, Cell]] = [
        ("Length", "800 mm", None),
        ("Power", "45 kW", None),
        ("Speed", "2950 rpm", None),
        ("Service factor", 1.25, None),
        ("Twist limit", "0.25°", None),
        ("Torque", "=TWS_TORQUE_FROM_POWER(B16,B17,B18)", "N·m"),
    ]
    for r, row in enumerate(duty, start=15):
        for c, value in enumerate(row, start=1):
            ws.cell(row=r, column=c, value=value)

    heading("A22", "Per layer")
    ws["A23"] = "Layer"
    for r, n in zip(range(24, 27), (1, 2, 3)):
        ws.cell(row=r, column=1, value=n).alignment = Alignment(horizontal="left")
    per_layer = {
        "B": f"TWS_SHARE({lay},,{mat})",
        "C": f"TWS_LAYER_CAPACITY({lay},,{mat})",
        "D": f"TWS_STRESS({lay},{torque},,{mat})",
    }
    for col, formula in per_layer.items():
        ref = f"{col}23:{col}26"
        ws[f"{col}23"] = ArrayFormula(ref, f"={formula}")

    heading("A28", "Whole shaft")
    whole: list[tuple[str, str]] = [
        ("Governing limit [N·m]", f"=TWS_GOVERNING_LIMIT({lay},B15,B19,,,{mat})"),
        ("What governs", f"=TWS_GOVERNS({lay},B15,B19,,{mat})"),
        ("Margin [%]", f"=TWS_MARGIN({lay},{torque},B15,B19,,,{mat})"),
        ("Twist angle [°]", f"=TWS_TWIST_ANGLE({lay},{torque},B15,,{mat})"),
        ("Twist per length [°/m]", f"=TWS_TWIST_PER_LENGTH({lay},{torque},,{mat})"),
        ("Stress at r = 24 mm, core side [MPa]", f'=TWS_STRESS_AT({lay},{torque},"24 mm",1,,{mat})'),
        ("Stress at r = 24 mm, underlay side [MPa]",
         f'=TWS_STRESS_AT({lay},{torque},"24 mm",2,,{mat})'),
    ]
    for r, (label, formula) in enumerate(whole, start=29):
        ws.cell(row=r, column=1, value=label)
        ws.cell(row=r, column=2, value=formula)

    heading("A37", "Where the sleeves' allowables come from (library yield strengths)")
    allowables: list[tuple[str, str]] = [
        ("Aluminium bronze sleeve: distortion energy, FS 2.5 [MPa]",
         '=TWS_ALLOWABLE("distortion energy","241 MPa",,2.5,"no")'),
        ("Stainless sleeve: max shear, FS 2 [MPa]", '=TWS_ALLOWABLE("max shear","205 MPa",,2,"no")'),
    ]
    for r, (label, formula) in enumerate(allowables, start=38):
        ws.cell(row=r, column=1, value=label)
        ws.cell(row=r, column=2, value=formula)

    ws.column_dimensions["A"].width = 44
    for col in "BCDEFGH":
        ws.column_dimensions[col].width = 24
    _print_setup(ws, landscape=True, pages_wide=1)


def write_cell_functions_book(path: str | Path) -> Path:
    """Write a small book whose cells call the twistshare worksheet functions.

    openpyxl cannot store cached values for formulas, so the formula cells hold none;
    ``twistshare handout`` computes them where the cache is empty, and Excel with the add-in
    computes them on opening.

    Parameters
    ----------
    path : str or Path
        Where to write the new workbook (overwritten if it exists).

    Returns
    -------
    Path
        The path written.
    """
    wb = _new_workbook()
    _fill_cell_functions_sheet(wb.create_sheet(_CELL_SHEET))
    _write_read_me(wb, "Marrowby Pump & Drive: rating one shaft with cell functions (sample book)", (
        f"The sheet '{_CELL_SHEET}' rates one sleeved pump shaft with twistshare's worksheet "
        "functions: the layer table holds the inputs with their units, the formulas below it "
        "call the functions.",
        "The formula cells were written without cached values: open the book in Excel with the "
        "twistshare add-in to compute them, or run  twistshare handout "
        f"{CELL_FUNCTIONS_FILE} -o handout.xlsx  to get a copy holding the values.",
    ), CELL_FUNCTIONS_FILE)
    return _save_reproducibly(wb, Path(path))
