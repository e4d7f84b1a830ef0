"""Live hosts: a workbook open in a spreadsheet application, behind one small interface.

``xlwings_book``: the workbook open in Excel, through xlwings (Windows; not testable without
Excel, so it is kept as thin as possible). The validation is the intake's, as for a saved book.
"""

from ._interface import BookSource, CommentSink, validate_and_comment

__all__ = ["BookSource", "CommentSink", "validate_and_comment"]
