"""Regenerate the committed sample books in this folder from the invented Marrowby scenario.

Run from anywhere: ``python sample_books/make_sample_books.py``. The books are written
reproducibly (fixed timestamps), so a rerun with the same openpyxl gives the same bytes.
"""

from __future__ import annotations

from pathlib import Path

from twistshare.sample_books import write_all


def main() -> None:
    for path in write_all(Path(__file__).resolve().parent):
        print(f"wrote {path}")


if __name__ == "__main__":
    main()
