"""One family of errors, so that front ends can tell a curator's bad input from a bug.

Every error the engine raises on purpose derives from :class:`CuratorError`; the command line
turns those into exit code 2 with the message, and the window into a readable dialog.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass


class CuratorError(Exception):
    """Base class of every error curator raises about its input or its settings."""


class Cancelled(CuratorError):
    """Long work was stopped through its cancel token; nothing it had started is kept."""


class CatalogueError(CuratorError):
    """A catalogue could not be read (missing file, unknown format, unreadable bytes)."""


class CatalogueSyntaxError(CatalogueError, SyntaxError):
    """A catalogue file is not valid in its format.

    Carries ``filename`` and 1-based ``lineno``/``offset`` (and the end position when the parser
    gives one) like :class:`SyntaxError`, so that a message can point at the place to fix.
    """

    def __init__(
        self,
        message: str,
        *,
        filename: str,
        lineno: int | None,
        offset: int | None,
        end_lineno: int | None = None,
        end_offset: int | None = None,
    ) -> None:
        position = (filename, lineno, offset, None, end_lineno, end_offset)
        SyntaxError.__init__(self, message, position)
        self.detail = message

    def __str__(self) -> str:
        where = self.filename or "<input>"
        if self.lineno is not None:
            where += f", line {self.lineno}"
            if self.offset is not None:
                where += f", column {self.offset}"
        return f"{where}: {self.detail}"


class ProfileError(CuratorError):
    """A profile file is malformed or names something the catalogue does not have."""


class NoWorksError(ProfileError):
    """The catalogue holds nothing that looks like a work (a book, a film, a recording...)."""


@dataclass(frozen=True)
class Candidate:
    """A work offered as a possible meaning of a title the curator typed."""

    iri: str
    label: str
    detail: str


class SeedError(CuratorError):
    """A seed could not be resolved to exactly one work."""

    def __init__(self, message: str, candidates: Sequence[Candidate] = ()) -> None:
        lines = [message]
        if candidates:
            lines.append("Closest matches:")
            lines.extend(f"  {c.label} ({c.detail}) <{c.iri}>" for c in candidates)
        super().__init__("\n".join(lines))
        self.candidates = tuple(candidates)


class SettingsError(CuratorError):
    """An option given to the engine is out of range or names an unknown thing."""
