"""Writers: Evaluation -> JSON / TOML / HTML / PDF bytes, and atomic file output."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Callable

FORMATS = ("json", "toml", "html", "pdf")


def renderer(fmt: str) -> Callable[..., bytes]:
    """The function that renders an evaluation (or a list of them) to bytes in ``fmt``."""
    if fmt == "json":
        from .data import to_json
        return to_json
    if fmt == "toml":
        from .data import to_toml
        return to_toml
    if fmt == "html":
        from .html import to_html
        return to_html
    if fmt == "pdf":
        from .pdf import to_pdf
        return to_pdf
    raise ValueError(f"unknown format {fmt!r}")


def write_atomic(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder and a rename, so a
    reader never sees half a report and a failure leaves no partial file."""
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
