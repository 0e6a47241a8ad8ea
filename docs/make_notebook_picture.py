"""Write docs/notebook.svg: how a result shows itself in a notebook, pictured.

The picture is the real `Result._repr_html_()` of a question on the demo table, asked with the
untaught model, placed in an SVG <foreignObject>, so the viewer's browser renders the very HTML
a notebook shows. Run from the repository root: python docs/make_notebook_picture.py
"""

from __future__ import annotations

from pathlib import Path
from xml.etree import ElementTree

import tabq
from tabq.model import Model

ROOT = Path(__file__).resolve().parent.parent
QUESTION = "total price for each site"
WIDTH, HEIGHT = 760, 330


def picture() -> str:
    result = tabq.open(ROOT / "sample_tables" / "repair_jobs.csv",
                       model=Model.prior()).ask(QUESTION)
    html = result._repr_html_()
    ElementTree.fromstring(html)            # the display is well-formed XHTML: SVG can hold it
    cell = f"<div xmlns='http://www.w3.org/1999/xhtml' style='font:14px sans-serif;" \
           f"color:#1f2933;padding:14px 18px'>{html}</div>"
    return (f"<svg xmlns='http://www.w3.org/2000/svg' width='{WIDTH}' height='{HEIGHT}' "
            f"viewBox='0 0 {WIDTH} {HEIGHT}'>"
            f"<rect width='100%' height='100%' rx='6' fill='#ffffff' stroke='#d0d7de'/>"
            f"<foreignObject x='0' y='0' width='{WIDTH}' height='{HEIGHT}'>{cell}"
            f"</foreignObject></svg>\n")


if __name__ == "__main__":
    (ROOT / "docs" / "notebook.svg").write_text(picture(), encoding="utf-8")
