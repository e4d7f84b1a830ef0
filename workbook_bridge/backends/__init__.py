"""Two ways to reach a workbook behind one small interface.

``headless``: the file on disk, read with python-calamine, comments written into a copy by the
package writer. ``live``: the workbook open in Excel, through xlwings (Windows; not testable
without Excel, so it is kept as thin as possible). The validation code is the same for both.
"""

from ._interface import BookSource, CommentSink, validate_and_comment

__all__ = ["BookSource", "CommentSink", "validate_and_comment"]
