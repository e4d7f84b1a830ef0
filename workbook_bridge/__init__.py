"""twistshare's workbook bridge: everything that touches a workbook, in the direction of flow.

``reading`` opens a saved book (package checks, python-calamine) → the intake
(`twistshare.engine.intake`) reads its tables → ``sheets`` builds what is written back (results,
summary, warnings, materials, charts, comments) → ``commands`` runs ``twistshare rate|check|
handout|demo|functions`` → ``hosts`` serves a book open in a spreadsheet application;
``ooxml`` below them all adds parts to the user's package and never re-saves it.
"""

__version__ = "0.1.0"

__all__ = ["__version__"]
