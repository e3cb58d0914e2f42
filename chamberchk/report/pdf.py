"""PDF from the same HTML through WeasyPrint, fetching nothing from outside the document."""

from __future__ import annotations

import logging
import os

PAPER_SIZES = ("a4", "letter")


def _fetcher():
    from weasyprint.urls import URLFetcher

    class DocumentOnlyFetcher(URLFetcher):
        """Serves ``data:`` URLs only: the report is self-contained (inline CSS and SVG), so no
        network and no local file can be read through a crafted recipe."""

        def __init__(self):
            super().__init__(allowed_protocols={"data"})

    return DocumentOnlyFetcher()


def to_pdf(evaluation, date: str | None = None, paper: str = "a4", **_options) -> bytes:
    from .html import to_html

    html = to_html(evaluation, date=date).decode("utf-8")
    return html_to_pdf(html, paper)


def html_to_pdf(html: str, paper: str = "a4") -> bytes:
    """Render report HTML to PDF bytes; reproducible (no creation date, fixed font subset time)."""
    # fontTools (used when HarfBuzz subsetting is missing) stamps the clock into subset fonts;
    # a fixed SOURCE_DATE_EPOCH keeps the bytes reproducible (see ECOSYSTEM.md section 1).
    os.environ.setdefault("SOURCE_DATE_EPOCH", "0")
    logging.getLogger("weasyprint").setLevel(logging.ERROR)
    logging.getLogger("fontTools").setLevel(logging.ERROR)
    from weasyprint import CSS, HTML

    if paper not in PAPER_SIZES:
        raise ValueError(f"paper must be one of {PAPER_SIZES}")
    page = CSS(string=f"@page {{ size: {paper}; }}")
    document = HTML(string=html, url_fetcher=_fetcher(), base_url="data:,")
    return document.write_pdf(stylesheets=[page])
