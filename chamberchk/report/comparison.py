"""Writers for a :class:`chamberchk.compare.Comparison`: JSON, TOML, HTML and PDF."""

from __future__ import annotations

import json

from .data import NOTICE, to_plain


def comparison_document(comparison) -> dict:
    doc = to_plain(comparison)
    doc["notice"] = NOTICE
    return doc


def to_json(comparison, **_options) -> bytes:
    text = json.dumps(comparison_document(comparison), indent=2, ensure_ascii=False,
                      allow_nan=False)
    return (text + "\n").encode("utf-8")


def to_toml(comparison, **_options) -> bytes:
    import tomli_w

    return tomli_w.dumps(to_plain(comparison_document(comparison), drop_none=True)).encode()


def to_html(comparison, date: str | None = None, **_options) -> bytes:
    from .html import environment

    from .charts import window_comparison

    doc = comparison_document(comparison)
    template = environment().get_template("compare.html.j2")
    charts = [c for c in (window_comparison(doc),) if c is not None]
    return template.render(doc=doc, notice=NOTICE, date=date, charts=charts).encode("utf-8")


def to_pdf(comparison, date: str | None = None, paper: str = "a4", **_options) -> bytes:
    from .pdf import html_to_pdf

    return html_to_pdf(to_html(comparison, date=date).decode("utf-8"), paper)


RENDERERS = {"json": to_json, "toml": to_toml, "html": to_html, "pdf": to_pdf}
