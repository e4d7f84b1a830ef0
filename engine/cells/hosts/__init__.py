"""Spreadsheet hosts of the cell functions, each generated from the one `registry()`.

``xlwings_udfs``: Excel through xlwings (set xlwings' UDF Modules to
``twistshare.engine.cells.hosts.xlwings_udfs``). Host particulars — decorators, value shapes,
error codes — live in the host's module, never in the functions.
"""
