"""Every sample book, written into one folder."""

from __future__ import annotations

from pathlib import Path

from ._builder import write_catalogue, write_catalogue_long
from ._cell_functions_book import write_cell_functions_book
from ._scenario import CATALOGUE_FILE, CATALOGUE_LONG_FILE, CELL_FUNCTIONS_FILE

__all__ = ["write_all"]


def write_all(directory: str | Path) -> list[Path]:
    """Write every sample book into a directory.

    Parameters
    ----------
    directory : str or Path
        Folder to write into (created if missing).

    Returns
    -------
    list of Path
        The books written, catalogue first.
    """
    directory = Path(directory)
    directory.mkdir(parents=True, exist_ok=True)
    return [
        write_catalogue(directory / CATALOGUE_FILE),
        write_catalogue_long(directory / CATALOGUE_LONG_FILE),
        write_cell_functions_book(directory / CELL_FUNCTIONS_FILE),
    ]
