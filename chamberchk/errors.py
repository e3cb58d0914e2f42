"""Input errors that carry the file, the field path and what was expected.

The loader collects every problem of a file before it gives up, so an engineer fixes a recipe in
one pass. Each problem prints as ``file: field.path: message``.
"""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class Problem:
    """One thing wrong with an input file."""

    path: str
    message: str

    def format(self, source: str) -> str:
        where = f"{source}: {self.path}: " if self.path else f"{source}: "
        return where + self.message


class InputError(Exception):
    """Bad user input: a file, a field path and what was expected. Exit code 2, no traceback."""

    def __init__(self, source: str, problems: list[Problem]):
        self.source = source
        self.problems = list(problems)
        super().__init__("\n".join(p.format(source) for p in self.problems))


@dataclass
class Collector:
    """Accumulates problems while a document is walked; see ``ECOSYSTEM.md`` section 3."""

    source: str
    problems: list[Problem] = field(default_factory=list)

    def add(self, path: str, message: str) -> None:
        self.problems.append(Problem(path, message))

    def raise_if_any(self) -> None:
        if self.problems:
            raise InputError(self.source, self.problems)
