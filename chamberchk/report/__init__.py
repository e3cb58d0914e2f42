"""Writers: Evaluation -> JSON / TOML / HTML / PDF bytes, and atomic file output."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Callable

FORMATS = ("json", "toml", "html", "pdf")


#: format -> (module, function); modules load lazily (WeasyPrint alone costs ~0.5 s to import)
_RENDERERS = {"json": ("data", "to_json"), "toml": ("data", "to_toml"),
              "html": ("html", "to_html"), "pdf": ("pdf", "to_pdf")}


def renderer(fmt: str) -> Callable[..., bytes]:
    """The function that renders an evaluation (or a list of them) to bytes in ``fmt``."""
    import importlib

    if fmt not in _RENDERERS:
        raise ValueError(f"unknown format {fmt!r}")
    module, name = _RENDERERS[fmt]
    return getattr(importlib.import_module(f".{module}", __name__), name)


def _umask() -> int:
    """The process umask (read by setting and restoring it; there is no getter)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def write_atomic(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` through a temporary file in the same folder and a rename, so a
    reader never sees half a report and a failure leaves no partial file.

    The report gets the permissions of an ordinary new file (0666 less the umask), not the
    owner-only 0600 of a temporary file: reports are made to be shared.
    """
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=path.parent)
    try:
        if hasattr(os, "fchmod"):        # POSIX; Windows files have no such mode bits
            os.fchmod(fd, 0o666 & ~_umask())
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
