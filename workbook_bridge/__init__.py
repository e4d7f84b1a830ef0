"""twistshare's workbook bridge: everything that touches a workbook.

Tables in, results, warnings and comments out, through a writer that adds parts to the user's
package and never re-saves it; the ``twistshare`` command line; the live xlwings backend.
"""

__version__ = "0.1.0"

__all__ = ["__version__"]
