"""Results as tables that reach every output: notebook, HTML and the PDF report.

nbconvert's LaTeX exporter drops HTML output, so a :class:`Table` offers
``_repr_markdown_`` (notebook, HTML report) and ``_repr_latex_`` (PDF report: a
numbered, captioned booktabs table, shrunk to the text width when wide, split
over pages when long). :mod:`isolation.output.tables.results` turns a study's results
into such tables.

Numbers are formatted for reading (:func:`format_number`); the JSON results
keep full precision.

Symbols written plainly (``D_TM``, ``T_fb``, ``beta_M``) are typeset as
subscripts in one place, :mod:`~isolation.output.tables.symbols`: tables do it
themselves; workbook text goes through :func:`markdown_text`.

Modules: :mod:`~isolation.output.tables.table` (the table object, number formatting,
generic builders), :mod:`~isolation.output.tables.results` (tables of a study's results),
:mod:`~isolation.output.tables.loss` (the owner's page "What isolation buys"),
:mod:`~isolation.output.tables.summary` (the owner's summary table and sentences),
:mod:`~isolation.output.tables.symbols` (symbols as subscripts),
:mod:`~isolation.output.tables.yielding` (comparison with the code-designed yielding fixed base),
:mod:`~isolation.output.tables.plan` (plan model: storey shear against storey strength).
"""

from isolation.output.tables.clauses import clause_table
from isolation.output.tables.loss import loss_table, loss_text
from isolation.output.tables.plan import plan_storey_table
from isolation.output.tables.results import (
                                      alternatives_table,
                                      bidirectional_table,
                                      bounds_table,
                                      code_quantities_table,
                                      comparison_table,
                                      display_quantity,
                                      history_table,
                                      inputs_table,
                                      pairs_table,
                                      suite_table,
                                      verdict_table,
)
from isolation.output.tables.summary import code_symbols, preferred_alternative, summary_table, summary_text
from isolation.output.tables.symbols import latex_text, markdown_text
from isolation.output.tables.table import (
                                      TYPST_MIME,
                                      Table,
                                      checks_table,
                                      escape_latex,
                                      format_number,
                                      in_study_units,
                                      key_value_table,
)
from isolation.output.tables.yielding import (
                                      damage_table,
                                      fixed_base_design_table,
                                      fixed_base_label,
                                      yielding_response_table,
)

__all__ = [
    "clause_table",
    "bidirectional_table",
    "plan_storey_table",
    "pairs_table",
    "Table",
    "TYPST_MIME",
    "format_number",
    "escape_latex",
    "key_value_table",
    "checks_table",
    "in_study_units",
    "inputs_table",
    "alternatives_table",
    "bounds_table",
    "code_quantities_table",
    "suite_table",
    "history_table",
    "verdict_table",
    "comparison_table",
    "display_quantity",
    "summary_table",
    "summary_text",
    "loss_table",
    "loss_text",
    "preferred_alternative",
    "code_symbols",
    "latex_text",
    "markdown_text",
    "fixed_base_design_table",
    "yielding_response_table",
    "damage_table",
    "fixed_base_label",
]
