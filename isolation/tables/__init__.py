"""Results as tables that reach every output: notebook, HTML and the PDF report.

nbconvert's LaTeX exporter drops HTML output, so a :class:`Table` offers
``_repr_markdown_`` (notebook, HTML report) and ``_repr_latex_`` (PDF report: a
numbered, captioned booktabs table, shrunk to the text width when wide, split
over pages when long). :mod:`isolation.tables.results` turns a study's results
into such tables.

Numbers are formatted for reading (:func:`format_number`); the JSON results
keep full precision.

Modules: :mod:`~isolation.tables.table` (the table object, number formatting,
generic builders), :mod:`~isolation.tables.results` (tables of a study's results).
"""

from isolation.tables.results import (alternatives_table, bounds_table, code_quantities_table,
                                      comparison_table, display_quantity, history_table, inputs_table,
                                      suite_table, verdict_table)
from isolation.tables.table import Table, checks_table, escape_latex, format_number, key_value_table

__all__ = [
    "Table",
    "format_number",
    "escape_latex",
    "key_value_table",
    "checks_table",
    "inputs_table",
    "alternatives_table",
    "bounds_table",
    "code_quantities_table",
    "suite_table",
    "history_table",
    "verdict_table",
    "comparison_table",
    "display_quantity",
]
