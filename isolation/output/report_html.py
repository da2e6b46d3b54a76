"""The HTML report, made only when no PDF engine can run (:func:`_render_html`).

The front matter (title fields and the scope box) as a markdown cell, then the
executed workbook without its code, through nbconvert's HTML exporter. Used by
:func:`isolation.output.report.render`.
"""

from __future__ import annotations

import re
from pathlib import Path

from isolation.files import write_bytes_atomic

__all__: list[str] = []


_SCOPE_HTML = (
    "**Scope and cautions.** This report is a **feasibility study** made at concept stage to "
    "judge whether seismic base isolation suits the building and site described. It is **not "
    "a construction design** and must not be used for construction, procurement or permit "
    "submission. Its numbers come from simplified models, invented or preliminary input and "
    "the assumptions stated inside. Every number must be verified against the building code "
    "in force at the site and by a **licensed structural engineer** before any decision relies on it."
)


def _nbformat():
    # Imported when a report is made, not when a workbook imports title_block: nbformat's
    # schema validation imports take about a second, in every kernel that imports this module.
    import nbformat

    return nbformat


def _render_html(nb, target: Path, fields: dict[str, str]) -> Path:
    from nbconvert import HTMLExporter

    labels = {
        "project": "Project", "client": "Client", "date": "Date", "revision": "Revision",
        "prepared_by": "Prepared by", "checked_by": "Checked by",
    }
    rows = "\n".join(
        f"| {label} | {_md_cell(fields.get(key, ''))} |" for key, label in labels.items()
    )
    front = _nbformat().v4.new_markdown_cell(
        f"# {_md_cell(fields['title'])}\n\n| | |\n|---|---|\n{rows}\n\n> {_SCOPE_HTML}\n"
    )
    nb.cells.insert(0, front)
    _caption_figures_as_text(nb)
    exporter = HTMLExporter(
        template_name="lab",
        exclude_input=True,
        exclude_input_prompt=True,
        exclude_output_prompt=True,
        embed_images=True,
    )
    body, _ = exporter.from_notebook_node(nb, resources={"metadata": {"name": fields["title"]}})
    html = target / "report.html"
    write_bytes_atomic(html, body.encode("utf-8"))
    return html


def _md_cell(text: str) -> str:
    return re.sub(r"([|\\*_`])", r"\\\1", str(text))


def _caption_figures_as_text(nb) -> None:
    """For HTML: put each figure's caption, numbered, under the figure."""
    number = 0
    for cell in nb.cells:
        if cell.cell_type != "code":
            continue
        outputs = []
        for output in cell.get("outputs", []):
            outputs.append(output)
            caption = output.get("metadata", {}).get("image/png", {}).get("caption")
            if caption and "image/png" in output.get("data", {}):
                number += 1
                outputs.append(_nbformat().v4.new_output(
                    "display_data", data={"text/markdown": f"*Figure {number}: {_md_cell(caption)}*"}
                ))
        cell.outputs = outputs
