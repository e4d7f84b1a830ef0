"""Installing the cell functions into a LibreOffice user profile, and taking them out again.

What setup adds to a profile (the folder LibreOffice calls ``UserInstallation``; the files live
in its ``user`` folder), and nothing else:

- ``basic/Standard/TwistshareCells.xba``: the Basic wrappers (Standard is the only library Calc
  searches when it imports a workbook), and one ``<library:element>`` line naming it in
  ``basic/Standard/script.xlb``;
- ``Scripts/python/twistshare_calc.py``: the Python bridge to the engine;
- ``twistshare-calc-host.json``: what setup wrote and which folders it created, for undo.

Setup is idempotent (a file is written only when its content differs) and undo removes exactly
those files, that line and the folders setup created, so the user's own Basic code in Standard
stays as it was.
"""

from __future__ import annotations

import json
import os
import re
import sys
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path

from twistshare.workbook_bridge.ooxml import atomic_file

from ._basic import MARKER, basic_module_xml
from ._bridge import EngineLocation, bridge_source, engine_location
from ._errors import ProfileRefused
from ._names import BASIC_MODULE, BRIDGE_FILE, MANIFEST_FILE, SETUP_COMMAND, UNDO_COMMAND
from ._specs import HostFunction, _function_specs

__all__ = ["SetupReport", "default_profile", "install", "uninstall", "profile_started", "Installed"]

_BASIC_FILE = f"basic/Standard/{BASIC_MODULE}.xba"
_XLB_FILE = "basic/Standard/script.xlb"
_BRIDGE_PATH = f"Scripts/python/{BRIDGE_FILE}"
_ELEMENT = f' <library:element library:name="{BASIC_MODULE}"/>\n'
_ELEMENT_FOUND = re.compile(r'<library:element\s+library:name="' + re.escape(BASIC_MODULE) + r'"\s*/>')
_ELEMENT_LINE = re.compile(r'[ \t]*<library:element\s+library:name="' + re.escape(BASIC_MODULE) + r'"\s*/>[ \t]*\r?\n?')


def default_profile() -> Path:
    """The user's own LibreOffice profile folder, where LibreOffice itself puts it.

    Linux and other Unix: ``$XDG_CONFIG_HOME/libreoffice/4`` (``~/.config/libreoffice/4``);
    macOS: ``~/Library/Application Support/LibreOffice/4``; Windows: ``%APPDATA%\\LibreOffice\\4``.
    """
    return profile_folder_for("win32" if os.name == "nt" else sys.platform, os.environ, Path.home())


def profile_folder_for(platform: str, environ: Mapping[str, str], home: Path) -> Path:
    """`default_profile` for a given platform (``sys.platform``), environment and home folder."""
    if platform == "win32":
        base = environ.get("APPDATA") or str(home / "AppData" / "Roaming")
        return Path(base) / "LibreOffice" / "4"
    if platform == "darwin":
        return home / "Library" / "Application Support" / "LibreOffice" / "4"
    base = environ.get("XDG_CONFIG_HOME") or str(home / ".config")
    return Path(base) / "libreoffice" / "4"


def user_folder(profile: Path) -> Path:
    """The profile's ``user`` folder, where Basic and Python scripts live."""
    return Path(profile) / "user"


def profile_started(profile: Path) -> bool:
    """LibreOffice has created this profile (its Standard library is there)."""
    return (user_folder(profile) / _XLB_FILE).is_file()


@dataclass(frozen=True)
class Installed:
    """The files setup writes into a profile, as text, for these functions and this engine."""

    basic_xml: str
    bridge_py: str

    @classmethod
    def build(cls, specs: Iterable[HostFunction] | None = None,
              engine: EngineLocation | None = None) -> "Installed":
        """What setup installs for these functions and this engine."""
        chosen = tuple(_function_specs() if specs is None else specs)
        return cls(basic_module_xml(chosen), bridge_source(chosen, engine or engine_location()))


@dataclass(frozen=True)
class SetupReport:
    """What setup or undo did to a profile, and how to reverse it.

    Attributes
    ----------
    profile : Path
        The profile folder (``UserInstallation``).
    undo : bool
        This was an undo.
    actions : tuple of str
        One line per change made; empty when there was nothing to change.
    notes : tuple of str
        Things the user should know (LibreOffice running, how the engine is reached).
    """

    profile: Path
    undo: bool
    actions: tuple[str, ...]
    notes: tuple[str, ...] = field(default=())

    @property
    def changed(self) -> bool:
        """Setup or undo changed the profile."""
        return bool(self.actions)

    def __str__(self) -> str:
        where = f" --profile {self.profile}"
        if self.undo:
            head = (f"twistshare: removed the cell functions from the LibreOffice profile {self.profile}"
                    if self.actions else f"twistshare: nothing to remove from the LibreOffice profile {self.profile}")
            tail = [f"To install them again: {SETUP_COMMAND}{where}"]
        else:
            head = (f"twistshare: installed the cell functions into the LibreOffice profile {self.profile}"
                    if self.actions else
                    f"twistshare: the cell functions are already installed in {self.profile}; nothing changed")
            tail = ["Restart LibreOffice to use them; a book's TWS_... formulas are computed when it opens "
                    "(stale values: Data > Calculate > Recalculate Hard)."] if self.actions else []
            tail.append(f"To remove them again: {UNDO_COMMAND}{where}")
        lines = [head] + [f"  - {a}" for a in self.actions] + [f"  note: {n}" for n in self.notes] + tail
        return "\n".join(lines)


def _write_atomic(path: Path, data: bytes) -> None:
    """Write a file through a temporary one beside it; an existing file keeps its permissions."""
    mode = (path.stat().st_mode & 0o7777) if path.exists() else 0o644
    with atomic_file(path, mode) as f:
        f.write(data)


def _read_manifest(user: Path) -> dict:
    try:
        data = json.loads((user / MANIFEST_FILE).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return {}
    return data if isinstance(data, dict) else {}


def _running_note(profile: Path) -> tuple[str, ...]:
    if (Path(profile) / ".lock").exists():
        return ("LibreOffice may be running with this profile (its .lock file is there): close it and "
                "run this again if the functions do not appear after a restart",)
    return ()


def _check_ours(path: Path) -> None:
    """Refuse to overwrite or delete a Basic module of this name that setup did not write."""
    if path.is_file() and MARKER not in path.read_text(encoding="utf-8", errors="replace"):
        raise ProfileRefused(f"{path} exists and was not written by twistshare: rename that Basic module "
                             "(it is yours) and run this again; nothing was changed")


def install(profile: Path, files: Installed) -> SetupReport:
    """Put the functions into a started profile; writes only what differs."""
    user = user_folder(profile)
    _check_ours(user / _BASIC_FILE)
    manifest = _read_manifest(user)
    created: list[str] = list(manifest.get("created_dirs", []))
    actions: list[str] = []
    for rel in ("Scripts", "Scripts/python"):
        folder = user / rel
        if not folder.is_dir():
            folder.mkdir()
            created.append(rel)
            actions.append(f"created the folder {folder}")
    for rel, text in ((_BASIC_FILE, files.basic_xml), (_BRIDGE_PATH, files.bridge_py)):
        path = user / rel
        data = text.encode("utf-8")
        if not path.is_file() or path.read_bytes() != data:
            _write_atomic(path, data)
            actions.append(f"wrote {path}")
    xlb = user / _XLB_FILE
    listing = xlb.read_text(encoding="utf-8")
    if not _ELEMENT_FOUND.search(listing):
        close = listing.rfind("</library:library>")
        if close < 0:
            raise ProfileRefused(f"{xlb} does not look like a LibreOffice Basic library listing; nothing was changed")
        line_start = listing.rfind("\n", 0, close) + 1
        at = line_start if not listing[line_start:close].strip() else close
        listing = listing[:at] + _ELEMENT + listing[at:]
        _write_atomic(xlb, listing.encode("utf-8"))
        actions.append(f"listed the Basic module {BASIC_MODULE} in {xlb}")
    record = {"written_by": "twistshare", "files": [_BASIC_FILE, _BRIDGE_PATH],
              "library_element": BASIC_MODULE, "created_dirs": sorted(set(created), key=created.index)}
    data = (json.dumps(record, indent=1, sort_keys=True) + "\n").encode("utf-8")
    path = user / MANIFEST_FILE
    if not path.is_file() or path.read_bytes() != data:
        _write_atomic(path, data)
        if not actions:
            actions.append(f"wrote {path}")
    return SetupReport(Path(profile), False, tuple(actions), _running_note(profile))


def uninstall(profile: Path) -> SetupReport:
    """Remove exactly what `install` added; the rest of the profile is left as it is."""
    user = user_folder(profile)
    actions: list[str] = []
    if not user.is_dir():
        return SetupReport(Path(profile), True, ())
    _check_ours(user / _BASIC_FILE)
    manifest = _read_manifest(user)
    xlb = user / _XLB_FILE
    if xlb.is_file():
        listing = xlb.read_text(encoding="utf-8")
        if _ELEMENT_FOUND.search(listing):
            # The line exactly as setup put it, so the listing comes back byte for byte.
            listing = (listing.replace(_ELEMENT, "", 1) if _ELEMENT in listing
                       else _ELEMENT_LINE.sub("", listing, count=1))
            _write_atomic(xlb, listing.encode("utf-8"))
            actions.append(f"took the Basic module {BASIC_MODULE} out of {xlb}")
    for rel in (_BASIC_FILE, _BRIDGE_PATH):
        path = user / rel
        if path.is_file():
            path.unlink()
            actions.append(f"removed {path}")
    for rel in sorted(manifest.get("created_dirs", []), key=len, reverse=True):
        folder = user / rel
        try:
            folder.rmdir()  # only when empty: anything the user put there stays
            actions.append(f"removed the folder {folder}")
        except OSError:
            pass
    path = user / MANIFEST_FILE
    if path.is_file():
        path.unlink()
        actions.append(f"removed {path}")
    return SetupReport(Path(profile), True, tuple(actions), _running_note(profile))
