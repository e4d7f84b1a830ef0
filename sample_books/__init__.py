"""The sample books of the invented Marrowby Pump & Drive scenario (``twistshare demo``).

Written as new workbooks, reproducibly (fixed timestamps), from `_scenario`'s invented data.
Every number is invented demo data: none describes a real part or material.
"""

from ._books import write_all
from ._builder import write_catalogue, write_catalogue_long
from ._cell_functions_book import write_cell_functions_book
from ._scenario import (
    CATALOGUE_FILE,
    CATALOGUE_LONG_FILE,
    CAUTIONS,
    CELL_FUNCTIONS_FILE,
    PlantedProblem,
    planted_problems,
    sample_part_ids,
)

__all__ = [
    "CATALOGUE_FILE", "CATALOGUE_LONG_FILE", "CELL_FUNCTIONS_FILE", "CAUTIONS", "PlantedProblem",
    "planted_problems", "sample_part_ids", "write_catalogue", "write_catalogue_long",
    "write_cell_functions_book", "write_all",
]
