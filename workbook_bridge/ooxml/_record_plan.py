"""Writing the ownership record into the package the writer is planning (see ``_record``)."""

from __future__ import annotations

import hashlib
import os
from typing import Any, Callable, Iterable, Mapping

from ._naming import free_part
from ._opc import new_rels, next_rel_id, relative_target, rels_path_of
from ._ownership import sheet_change, undo_sheet_change
from ._record import (
    CT_CUSTOM_XML_PROPS,
    CT_XML,
    RT_CUSTOM_XML,
    RT_CUSTOM_XML_PROPS,
    OwnershipRecord,
    StoredPart,
    item_props_xml,
    record_xml,
    sha256,
)

__all__ = ["RecordPlan"]


def _payload_sha(payload: Any) -> str:
    """SHA-256 of an added member: bytes, or (head, streamed body file, tail) as the writer adds sheets."""
    if isinstance(payload, bytes):
        return sha256(payload)
    head, body, tail = payload
    digest = hashlib.sha256(head)
    body.seek(0)
    for chunk in iter(lambda: body.read(1 << 20), b""):
        digest.update(chunk)
    body.seek(0, os.SEEK_END)
    digest.update(tail)
    return digest.hexdigest()


class RecordPlan:
    """The record's three parts, reserved while the writer plans, and the record made at the end.

    Parameters
    ----------
    used_lower : set of str
        Member names taken (lower case); the record's names are reserved in it.
    workbook_part : str
        The workbook part (the record is related from it).
    workbook_rel_ids : set of str
        Relationship ids the workbook part uses; the record's is reserved in it.
    xml_default : bool
        The package gives ``.xml`` members a default content type (else the item gets an override).
    """

    def __init__(self, used_lower: set[str], workbook_part: str, workbook_rel_ids: set[str],
                 xml_default: bool) -> None:
        self.item = free_part("customXml/item{}.xml", used_lower)
        self.props = free_part("customXml/itemProps{}.xml", used_lower)
        self.rels = rels_path_of(self.item)
        used_lower.add(self.rels.lower())
        self.rel_id = next_rel_id(workbook_rel_ids)
        workbook_rel_ids.add(self.rel_id)
        self._workbook_part = workbook_part
        self._xml_default = xml_default

    def workbook_rel(self) -> tuple[str, str, str]:
        """The workbook's relationship to the record item."""
        return self.rel_id, RT_CUSTOM_XML, relative_target(self._workbook_part, self.item)

    def overrides(self) -> list[tuple[str, str]]:
        """Content types of the record's parts."""
        out = [(self.props, CT_CUSTOM_XML_PROPS)]
        if not self._xml_default:
            out.append((self.item, CT_XML))
        return out

    def fixed_parts(self) -> list[tuple[str, bytes]]:
        """The item's properties part and its relationships part."""
        rels = new_rels([("rId1", RT_CUSTOM_XML_PROPS, relative_target(self.item, self.props))])
        return [(self.props, item_props_xml()), (self.rels, rels.encode("utf-8"))]

    def record_part(self, *, added: Iterable[tuple[str, Any]], changed: Mapping[str, bytes],
                    read_before: Callable[[str], bytes],
                    worksheets: Mapping[str, tuple[str, str, str, list[str]]],
                    sheets: Iterable[str], comments: Iterable[tuple[str, int]],
                    notes: Iterable[tuple[str, str, str]] = ()) -> tuple[str, bytes]:
        """The record item: every member added and changed, as the plan has them.

        ``worksheets`` maps each changed input worksheet to (name, text before, text after,
        cells filled); every other changed member is stored as it was before.
        """
        own = (self.item, self.props, self.rels)
        changes = [sheet_change(part, name, before, after, marks)
                   for part, (name, before, after, marks) in worksheets.items()]
        # An edit of a user's worksheet that the record cannot undo exactly (a kind of edit added to
        # the writer and not yet to `_ownership`) is named, and such a copy is not re-rated.
        unrecoverable = tuple(change.name for change, (_, before, after, _) in zip(changes, worksheets.values())
                              if undo_sheet_change(after, change).text != before)
        record = OwnershipRecord(
            own_parts=own,
            sheets=tuple(sheets),
            added=tuple((name, _payload_sha(payload)) for name, payload in added if name not in own),
            stored=tuple(StoredPart(name, read_before(name), sha256(data))
                         for name, data in changed.items() if name not in worksheets),
            worksheets=tuple(changes),
            comments=tuple((name, n) for name, n in comments if n),
            unrecoverable=unrecoverable,
            notes=tuple(notes),
        )
        return self.item, record_xml(record)
