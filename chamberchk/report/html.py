"""HTML report from the Jinja2 templates in ``report_templates/`` (autoescaped, strict)."""

from __future__ import annotations

from functools import lru_cache

from . import fmt
from .data import NOTICE, document


@lru_cache(maxsize=1)
def environment():
    import jinja2

    env = jinja2.Environment(
        loader=jinja2.PackageLoader("chamberchk", "report_templates"),
        autoescape=True, undefined=jinja2.StrictUndefined, trim_blocks=True,
        lstrip_blocks=True, keep_trailing_newline=True)
    env.filters.update(fmt.FILTERS)
    return env


def context(evaluation, date: str | None = None) -> dict:
    """Everything the template shows, as plain data; charts are pre-rendered SVG strings."""
    from .charts import charts_for

    doc = document(evaluation)
    counts = {s: sum(1 for f in doc["flags"] if f["severity"] == s)
              for s in ("critical", "warning", "info")}
    feature_ids = list(dict.fromkeys(f["id"] for s in doc["steps"] for f in s["features"]))
    names = {f["id"]: f["name"] for s in doc["steps"] for f in s["features"]}
    grid = [{"step": s["name"], "cells": {f["id"]: f for f in s["features"]}}
            for s in doc["steps"]]
    rank = {"critical": 0, "warning": 1, "info": 2}
    attention = sorted((f for f in doc["flags"] if f["severity"] != "info"),
                       key=lambda f: rank[f["severity"]])   # stable: recipe order within
    return {"doc": doc, "counts": counts, "attention": attention, "feature_ids": feature_ids, "feature_names": names,
            "grid": grid, "notice": NOTICE, "date": date, "charts": charts_for(doc)}


def to_html(evaluation, date: str | None = None, **_options) -> bytes:
    if isinstance(evaluation, (list, tuple)):
        raise ValueError("HTML reports are written one per recipe")
    html = environment().get_template("report.html.j2").render(**context(evaluation, date))
    return html.encode("utf-8")
