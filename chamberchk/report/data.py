"""Machine-readable outputs: JSON (the contract for systems) and TOML mirroring it."""

from __future__ import annotations

import dataclasses
import json
import math
from typing import Any

import numpy as np

NOTICE = ("Engineering estimates from published gas-kinetic models. They do not qualify a process "
          "or a gas system; site EHS rules, local codes and licensed practice govern.")


def to_plain(obj: Any, drop_none: bool = False) -> Any:
    """Dataclasses, numpy scalars and arrays -> JSON-able Python; NaN/inf -> None."""
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        obj = {f.name: getattr(obj, f.name) for f in dataclasses.fields(obj)}
    if isinstance(obj, dict):
        out = {str(k): to_plain(v, drop_none) for k, v in obj.items()}
        return {k: v for k, v in out.items() if v is not None} if drop_none else out
    if isinstance(obj, (list, tuple)):
        return [to_plain(v, drop_none) for v in obj if not (drop_none and v is None)]
    if isinstance(obj, np.ndarray):
        return to_plain(obj.tolist(), drop_none)
    if isinstance(obj, (bool, np.bool_)):
        return bool(obj)
    if isinstance(obj, (int, np.integer)):
        return int(obj)
    if isinstance(obj, (float, np.floating)):
        value = float(obj)
        return value if math.isfinite(value) else None
    return obj


def document(evaluation) -> dict:
    """One evaluation as the JSON document of DESIGN.md (plus the standing notice)."""
    doc = to_plain(evaluation)
    doc["notice"] = NOTICE
    return doc


def _documents(evaluations) -> dict:
    if isinstance(evaluations, (list, tuple)):
        return {"results": [document(e) for e in evaluations], "notice": NOTICE}
    return document(evaluations)


def to_json(evaluations, **_options) -> bytes:
    text = json.dumps(_documents(evaluations), indent=2, ensure_ascii=False, allow_nan=False)
    return (text + "\n").encode("utf-8")


def to_toml(evaluations, **_options) -> bytes:
    import tomli_w

    doc = to_plain(_documents(evaluations), drop_none=True)
    return tomli_w.dumps(doc).encode("utf-8")
