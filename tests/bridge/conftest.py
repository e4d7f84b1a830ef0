"""Fixtures for the bridge tests.

ooxml_*: a corpus of real-world-shaped input books for the package writer — built with openpyxl
(several sheets, shared strings, a table, comments, hidden/very-hidden/protected sheets, dates,
a native chart) and completed by hand with the parts openpyxl cannot make (an image, a pivot
table, an external link, a calculation chain, inline strings, a VBA project). Demo data follows
the invented Marrowby Pump & Drive scenario.
"""

from __future__ import annotations

import datetime as dt
import hashlib
import struct
import warnings
import xml.etree.ElementTree as ET
import zipfile
import zlib
from pathlib import Path
from types import SimpleNamespace

import pytest

MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PKG_REL = "http://schemas.openxmlformats.org/package/2006/relationships"
RT = REL + "/"


def _png_1x1() -> bytes:
    def chunk(kind: bytes, data: bytes) -> bytes:
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data))
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", struct.pack(">IIBBBBB", 1, 1, 8, 2, 0, 0, 0))
            + chunk(b"IDAT", zlib.compress(b"\x00\x2e\x5e\x7e")) + chunk(b"IEND", b""))


def rezip(src: Path, dst: Path, replace: dict | None = None, add: dict | None = None) -> Path:
    """Copy a zip, replacing some members' bytes (None drops one) and appending others."""
    replace, add = replace or {}, add or {}
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            if info.filename in replace:
                if replace[info.filename] is not None:
                    zout.writestr(info, replace[info.filename])
            else:
                zout.writestr(info, zin.read(info.filename))
        for name, data in add.items():
            zout.writestr(name, data)
    return dst


def _insert_before(text: str, markers: tuple[str, ...], piece: str) -> str:
    for marker in markers:
        at = text.find(marker)
        if at >= 0:
            return text[:at] + piece + text[at:]
    raise AssertionError(f"none of {markers} found")


def _sheet_parts(zf: zipfile.ZipFile) -> dict[str, str]:
    """Sheet name -> member name, read from the workbook part and its relationships."""
    wb = ET.fromstring(zf.read("xl/workbook.xml"))
    rels = ET.fromstring(zf.read("xl/_rels/workbook.xml.rels"))
    target = {r.get("Id"): r.get("Target") for r in rels}
    out = {}
    for sheet in wb.iter(f"{{{MAIN}}}sheet"):
        t = target[sheet.get(f"{{{REL}}}id")]
        out[sheet.get("name")] = t.lstrip("/") if t.startswith("/") else "xl/" + t
    return out


def build_plain(path: Path) -> Path:
    """An openpyxl-made catalogue: shared strings, a table, comments, dates, hidden sheets, a chart."""
    import openpyxl
    from openpyxl.chart import BarChart, Reference
    from openpyxl.comments import Comment
    from openpyxl.worksheet.table import Table

    wb = openpyxl.Workbook()
    parts = wb.active
    parts.title = "Parts"
    parts.append(["Part", "Length [mm]", "Torque [N·m]", "Layer 1 material", "Checked on"])
    parts.append(["MPD-S-014", 420, 310, "steel 1045", dt.date(2024, 3, 5)])
    parts.append(["MPD-S-022", 515, 450, "steel 4140", dt.datetime(2024, 3, 6, 14, 30)])
    parts.append(["MPD-T-203", 1800, 95, "aluminium 6061", dt.date(2024, 4, 1)])
    parts.append(["MPD-T-207", 2100, 120, "aluminium 6061", None])
    parts["C6"] = "=SUM(C2:C5)"
    parts["B2"].comment = Comment("length from drawing rev C", "M. Okafor")
    parts["D4"].comment = Comment("tube alloy per supplier cert", "M. Okafor")
    parts.add_table(Table(displayName="PartsTable", ref="A1:E5"))
    mats = wb.create_sheet("Materials")
    mats.append(["Material", "G [GPa]", "Allowable shear [MPa]"])
    mats.append(["steel 1045", 80, 150])
    mats.append(["aluminium 6061", 26, 60])
    hidden = wb.create_sheet("Old rates")
    hidden.append(["kept for audit", 1.5])
    hidden.sheet_state = "hidden"
    secret = wb.create_sheet("Lookup")
    secret.append(["internal", 7])
    secret.sheet_state = "veryHidden"
    locked = wb.create_sheet("Locked")
    locked.append(["do not edit", 3.25])
    locked.protection.sheet = True
    chart_sheet = wb.create_sheet("Chart data")
    chart_sheet.append(["Part", "Torque [N·m]"])
    for row in (("MPD-S-014", 310), ("MPD-T-203", 95)):
        chart_sheet.append(row)
    chart = BarChart()
    chart.title = "Torque by part"
    chart.add_data(Reference(chart_sheet, min_col=2, min_row=1, max_row=3), titles_from_data=True)
    chart.set_categories(Reference(chart_sheet, min_col=1, min_row=2, max_row=3))
    chart_sheet.add_chart(chart, "D2")
    pictures = wb.create_sheet("Pictures")
    pictures.append(["sleeve photo below"])
    src = wb.create_sheet("Pivot source")
    src.append(["Part", "Torque"])
    src.append(["MPD-S-014", 100])
    src.append(["MPD-T-203", 300])
    wb.create_sheet("Pivot")
    wb.save(path)
    return path


_PIVOT_CACHE = f"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<pivotCacheDefinition xmlns="{MAIN}" xmlns:r="{REL}" r:id="rId1" refreshOnLoad="1" recordCount="2"><cacheSource type="worksheet"><worksheetSource ref="A1:B3" sheet="Pivot source"/></cacheSource><cacheFields count="2"><cacheField name="Part" numFmtId="0"><sharedItems count="2"><s v="MPD-S-014"/><s v="MPD-T-203"/></sharedItems></cacheField><cacheField name="Torque" numFmtId="0"><sharedItems containsSemiMixedTypes="0" containsString="0" containsNumber="1" containsInteger="1" minValue="100" maxValue="300"/></cacheField></cacheFields></pivotCacheDefinition>"""
_PIVOT_RECORDS = f"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<pivotCacheRecords xmlns="{MAIN}" count="2"><r><x v="0"/><n v="100"/></r><r><x v="1"/><n v="300"/></r></pivotCacheRecords>"""
_PIVOT_TABLE = f"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<pivotTableDefinition xmlns="{MAIN}" name="TorquePivot" cacheId="7" dataCaption="Values" updatedVersion="6" minRefreshableVersion="3" createdVersion="6" indent="0" outline="1" outlineData="1"><location ref="A3:B6" firstHeaderRow="1" firstDataRow="1" firstDataCol="1"/><pivotFields count="2"><pivotField axis="axisRow" showAll="0"><items count="3"><item x="0"/><item x="1"/><item t="default"/></items></pivotField><pivotField dataField="1" showAll="0"/></pivotFields><rowFields count="1"><field x="0"/></rowFields><rowItems count="3"><i><x/></i><i><x v="1"/></i><i t="grand"><x/></i></rowItems><colItems count="1"><i/></colItems><dataFields count="1"><dataField name="Sum of Torque" fld="1" baseField="0" baseItem="0"/></dataFields></pivotTableDefinition>"""
_EXTERNAL_LINK = f"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<externalLink xmlns="{MAIN}" xmlns:r="{REL}"><externalBook r:id="rId1"><sheetNames><sheetName val="Prices"/></sheetNames><sheetDataSet><sheetData sheetId="0"><row r="1"><cell r="A1"><v>42</v></cell></row></sheetData></sheetDataSet></externalBook></externalLink>"""
_IMAGE_DRAWING = f"""<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<xdr:wsDr xmlns:xdr="http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing" xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main"><xdr:oneCellAnchor><xdr:from><xdr:col>1</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>2</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:from><xdr:ext cx="952500" cy="952500"/><xdr:pic><xdr:nvPicPr><xdr:cNvPr id="2" name="Sleeve photo"/><xdr:cNvPicPr><a:picLocks noChangeAspect="1"/></xdr:cNvPicPr></xdr:nvPicPr><xdr:blipFill><a:blip xmlns:r="{REL}" r:embed="rId1"/><a:stretch><a:fillRect/></a:stretch></xdr:blipFill><xdr:spPr><a:xfrm><a:off x="0" y="0"/><a:ext cx="952500" cy="952500"/></a:xfrm><a:prstGeom prst="rect"><a:avLst/></a:prstGeom></xdr:spPr></xdr:pic><xdr:clientData/></xdr:oneCellAnchor></xdr:wsDr>"""


def _rels(*entries: tuple[str, str, str, bool]) -> str:
    body = "".join(f'<Relationship Id="{i}" Type="{t}" Target="{g}"' + (' TargetMode="External"' if ext else "") + "/>"
                   for i, t, g, ext in entries)
    return f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="{PKG_REL}">{body}</Relationships>'


def build_rich(path: Path, macro: bool = False) -> Path:
    """``build_plain`` plus an image, a pivot table, an external link, a calc chain, inline strings
    and (``macro``) a VBA project with the macro-enabled content type."""
    plain = build_plain(path.with_name(path.stem + "-plain.xlsx"))
    with zipfile.ZipFile(plain) as zf:
        names = set(zf.namelist())
        sheets = _sheet_parts(zf)
        wb = zf.read("xl/workbook.xml").decode()
        wb_rels = zf.read("xl/_rels/workbook.xml.rels").decode()
        ct = zf.read("[Content_Types].xml").decode()
        pictures = zf.read(sheets["Pictures"]).decode()
        zf.read(sheets["Pivot"])  # the pivot sheet must be there
        parts_xml = zf.read(sheets["Parts"]).decode()
    replace, add = {}, {}
    # Image on "Pictures".
    pic_name = sheets["Pictures"].rsplit("/", 1)[1]
    add["xl/media/image1.png"] = _png_1x1()
    add["xl/drawings/drawing90.xml"] = _IMAGE_DRAWING
    add["xl/drawings/_rels/drawing90.xml.rels"] = _rels(("rId1", RT + "image", "../media/image1.png", False))
    add[f"xl/worksheets/_rels/{pic_name}.rels"] = _rels(("rId1", RT + "drawing", "../drawings/drawing90.xml", False))
    replace[sheets["Pictures"]] = _insert_before(pictures, ("</worksheet>",), '<drawing xmlns:r="%s" r:id="rId1"/>' % REL)
    # Pivot table on "Pivot".
    piv_name = sheets["Pivot"].rsplit("/", 1)[1]
    add["xl/pivotCache/pivotCacheDefinition1.xml"] = _PIVOT_CACHE
    add["xl/pivotCache/pivotCacheRecords1.xml"] = _PIVOT_RECORDS
    add["xl/pivotCache/_rels/pivotCacheDefinition1.xml.rels"] = _rels(
        ("rId1", RT + "pivotCacheRecords", "pivotCacheRecords1.xml", False))
    add["xl/pivotTables/pivotTable1.xml"] = _PIVOT_TABLE
    add["xl/pivotTables/_rels/pivotTable1.xml.rels"] = _rels(
        ("rId1", RT + "pivotCacheDefinition", "../pivotCache/pivotCacheDefinition1.xml", False))
    add[f"xl/worksheets/_rels/{piv_name}.rels"] = _rels(("rId1", RT + "pivotTable", "../pivotTables/pivotTable1.xml", False))
    # External link and the calculation chain.
    add["xl/externalLinks/externalLink1.xml"] = _EXTERNAL_LINK
    add["xl/externalLinks/_rels/externalLink1.xml.rels"] = _rels(
        ("rId1", RT + "externalLinkPath", "file:///C:/marrowby/supplier-prices.xlsx", True))
    add["xl/calcChain.xml"] = (f'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
                               f'<calcChain xmlns="{MAIN}"><c r="C6" i="1"/></calcChain>')
    wb_rels = _insert_before(wb_rels, ("</Relationships>",),
                             f'<Relationship Id="rId901" Type="{RT}pivotCacheDefinition" Target="pivotCache/pivotCacheDefinition1.xml"/>'
                             f'<Relationship Id="rId902" Type="{RT}externalLink" Target="externalLinks/externalLink1.xml"/>'
                             f'<Relationship Id="rId903" Type="{RT}calcChain" Target="calcChain.xml"/>')
    r_prefix = "r:" if 'xmlns:r="' in wb[:wb.index(">", wb.index("<workbook"))] else ""
    ns = "" if r_prefix else f' xmlns:r="{REL}"'
    wb = _insert_before(wb, ("<definedNames", "<calcPr", "</workbook>"),
                        f'<externalReferences><externalReference{ns} r:id="rId902"/></externalReferences>')
    wb = _insert_before(wb, ("</workbook>",), f'<pivotCaches><pivotCache{ns} cacheId="7" r:id="rId901"/></pivotCaches>')
    overrides = {
        "/xl/pivotCache/pivotCacheDefinition1.xml": "application/vnd.openxmlformats-officedocument.spreadsheetml.pivotCacheDefinition+xml",
        "/xl/pivotCache/pivotCacheRecords1.xml": "application/vnd.openxmlformats-officedocument.spreadsheetml.pivotCacheRecords+xml",
        "/xl/pivotTables/pivotTable1.xml": "application/vnd.openxmlformats-officedocument.spreadsheetml.pivotTable+xml",
        "/xl/externalLinks/externalLink1.xml": "application/vnd.openxmlformats-officedocument.spreadsheetml.externalLink+xml",
        "/xl/drawings/drawing90.xml": "application/vnd.openxmlformats-officedocument.drawing+xml",
        "/xl/calcChain.xml": "application/vnd.openxmlformats-officedocument.spreadsheetml.calcChain+xml",
    }
    extra = "".join(f'<Override PartName="{p}" ContentType="{c}"/>' for p, c in overrides.items())
    if 'Extension="png"' not in ct:
        extra = '<Default Extension="png" ContentType="image/png"/>' + extra
    # An inline-string cell next to the shared strings (other writers use them).
    parts_xml = _insert_before(parts_xml, ("</row>",), '<c r="F1" t="inlineStr"><is><t>Note (inline)</t></is></c>')
    replace[sheets["Parts"]] = parts_xml
    if macro:
        add["xl/vbaProject.bin"] = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + bytes(range(256)) * 8
        wb_rels = _insert_before(wb_rels, ("</Relationships>",),
                                 '<Relationship Id="rId904" Type="http://schemas.microsoft.com/office/2006/relationships/vbaProject" Target="vbaProject.bin"/>')
        extra = '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/>' + extra
        ct = ct.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                        "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    replace["[Content_Types].xml"] = _insert_before(ct, ("</Types>",), extra)
    replace["xl/workbook.xml"] = wb
    replace["xl/_rels/workbook.xml.rels"] = wb_rels
    assert not set(add) & names
    return rezip(plain, path, replace, add)


def members(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as zf:
        return {n: zf.read(n) for n in zf.namelist()}


def sha256(path: Path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def load_clean(path: Path, **kwargs):
    """Load with openpyxl and return (workbook, warning messages)."""
    import openpyxl
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        book = openpyxl.load_workbook(path, **kwargs)
    return book, [str(w.message) for w in caught]


def element_multiset(data: bytes) -> list[tuple]:
    """Every element of an XML document as (tag, sorted attributes, stripped text).

    ``count`` attributes are left out: they state how many children a list has, and the
    writer updates them when it appends.
    """
    root = ET.fromstring(data)
    return sorted((el.tag, tuple(sorted((k, v) for k, v in el.attrib.items() if k != "count")),
                   (el.text or "").strip()) for el in root.iter())


@pytest.fixture
def ooxml_kit():
    """Builders and checkers for the package-writer tests."""
    return SimpleNamespace(build_plain=build_plain, build_rich=build_rich, rezip=rezip, members=members,
                           sha256=sha256, load_clean=load_clean, element_multiset=element_multiset,
                           sheet_parts=_sheet_parts, png=_png_1x1, MAIN=MAIN, REL=REL)


@pytest.fixture
def ooxml_plain_book(tmp_path):
    """An openpyxl-made catalogue book (see ``build_plain``)."""
    return build_plain(tmp_path / "catalogue.xlsx")


@pytest.fixture
def ooxml_rich_book(tmp_path):
    """The catalogue with an image, a pivot table, an external link, a calc chain, inline strings."""
    return build_rich(tmp_path / "rich.xlsx")


@pytest.fixture
def ooxml_macro_book(tmp_path):
    """The rich catalogue as a macro-enabled .xlsm with a VBA project part."""
    return build_rich(tmp_path / "rich.xlsm", macro=True)
