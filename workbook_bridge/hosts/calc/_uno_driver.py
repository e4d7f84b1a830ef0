"""Read computed cell values from a workbook opened in a running headless LibreOffice.

Run as a script by LibreOffice's Python (the one with the ``uno`` module), never imported by
twistshare: it uses only ``uno`` and the standard library. The request comes as one JSON object
on standard input::

    {"pipe": "NAME", "book": "/path/book.xlsx", "cells": {"Sheet": [[row, col], ...]},
     "connect_seconds": 60, "terminate": true}

(rows and columns from 0). It connects to the office listening on that pipe, opens the book
hidden, read-only, with the book's own macros never run and links never updated, reads the
values (interpreting whatever is not computed yet), closes the book, asks the office to end
(unless ``terminate`` is false: the caller then ends it, which is quicker), and writes one JSON
object to standard output::

    {"sheets": {"Sheet": {"values": [[row, col, value], ...], "errors": [[row, col, code], ...]}},
     "missing_sheets": [...], "seconds": {"connect": s, "load": s, "read": s}}

A failure is written as ``{"error": "..."}`` with exit code 1.
"""

import json
import sys
import time

NEVER_EXECUTE = 0  # com.sun.star.document.MacroExecMode.NEVER_EXECUTE: the book's macros never run
NO_UPDATE = 0  # com.sun.star.document.UpdateDocMode.NO_UPDATE: links are not refreshed
_WHOLE_BOX = 50000  # read a sheet's cells in one call when their bounding box is this small


def _props(**values):
    from com.sun.star.beans import PropertyValue

    out = []
    for name, value in values.items():
        p = PropertyValue()
        p.Name, p.Value = name, value
        out.append(p)
    return tuple(out)


def _connect(pipe, seconds):
    import uno
    from com.sun.star.connection import NoConnectException

    local = uno.getComponentContext()
    resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
    deadline = time.monotonic() + seconds
    while True:
        try:
            return resolver.resolve(f"uno:pipe,name={pipe};urp;StarOffice.ComponentContext")
        except NoConnectException:
            if time.monotonic() > deadline:
                raise RuntimeError(f"LibreOffice did not accept a connection within {seconds:g} s") from None
            time.sleep(0.02)


def _read_block(sheet, rows, c0, c1):
    """Values of the rectangle rows[0]..rows[-1] x c0..c1 as a list of row tuples."""
    return sheet.getCellRangeByPosition(c0, rows[0], c1, rows[-1]).getDataArray()


def _read_sheet(sheet, cells):
    values, errors = [], []
    if not cells:
        return {"values": values, "errors": errors}
    rows = sorted({r for r, _ in cells})
    c0 = min(c for _, c in cells)
    c1 = max(c for _, c in cells)
    wanted_by_row = {}
    for r, c in cells:
        wanted_by_row.setdefault(r, set()).add(c)
    if (rows[-1] - rows[0] + 1) * (c1 - c0 + 1) <= max(_WHOLE_BOX, 4 * len(cells)):
        data = _read_block(sheet, [rows[0], rows[-1]], c0, c1)
        grid = {r: data[r - rows[0]] for r in rows}
        first_col = {r: c0 for r in rows}
    else:
        grid, first_col = {}, {}
        for r in rows:
            cols = wanted_by_row[r]
            grid[r] = _read_block(sheet, [r, r], min(cols), max(cols))[0]
            first_col[r] = min(cols)
    for r in rows:
        line = grid[r]
        for c in sorted(wanted_by_row[r]):
            value = line[c - first_col[r]]
            if value is None:  # an error result
                errors.append([r, c, int(sheet.getCellByPosition(c, r).getError())])
            else:
                values.append([r, c, value])
    return {"values": values, "errors": errors}


def run(request: dict) -> dict:
    """Open the book in the running LibreOffice, recalculate it, and read the cells asked for."""
    import uno

    timings = {}
    t0 = time.monotonic()
    ctx = _connect(request["pipe"], float(request.get("connect_seconds", 60)))
    timings["connect"] = time.monotonic() - t0
    desktop = ctx.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", ctx)
    try:
        t1 = time.monotonic()
        doc = desktop.loadComponentFromURL(
            uno.systemPathToFileUrl(request["book"]), "_blank", 0,
            _props(Hidden=True, ReadOnly=True, MacroExecutionMode=NEVER_EXECUTE, UpdateDocMode=NO_UPDATE))
        if doc is None:
            raise RuntimeError("LibreOffice could not open the workbook")
        timings["load"] = time.monotonic() - t1
        try:
            t2 = time.monotonic()
            if request.get("calculate_all"):
                doc.calculateAll()
            sheets, missing = {}, []
            for name, cells in request.get("cells", {}).items():
                if not doc.Sheets.hasByName(name):
                    missing.append(name)
                    continue
                sheets[name] = _read_sheet(doc.Sheets.getByName(name), [tuple(rc) for rc in cells])
            timings["read"] = time.monotonic() - t2
        finally:
            doc.close(True)
    finally:
        if request.get("terminate", True):
            try:
                desktop.terminate()
            except Exception:  # the office is ending anyway; the caller makes sure it has
                pass
    return {"sheets": sheets, "missing_sheets": missing, "seconds": timings}


def main() -> None:
    """Read the request on standard input and write the answer on standard output, as JSON."""
    try:
        result = run(json.loads(sys.stdin.read()))
    except BaseException as error:
        sys.stdout.write(json.dumps({"error": f"{type(error).__name__}: {error}"}))
        return 1
    sys.stdout.write(json.dumps(result))
    return 0


if __name__ == "__main__":
    sys.exit(main())
