"""Back and forward through what the browse pane showed, like a reader's trail (no Qt)."""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class BrowseHistory:
    """A trail of IRIs with a position; visiting after going back drops the forward part."""

    items: list[str] = field(default_factory=list)
    position: int = -1

    @property
    def current(self) -> str | None:
        return self.items[self.position] if 0 <= self.position < len(self.items) else None

    @property
    def can_go_back(self) -> bool:
        return self.position > 0

    @property
    def can_go_forward(self) -> bool:
        return self.position < len(self.items) - 1

    def visit(self, iri: str) -> bool:
        """Go to ``iri``; False when it is already the current one (nothing added)."""
        if iri == self.current:
            return False
        del self.items[self.position + 1 :]
        self.items.append(iri)
        self.position = len(self.items) - 1
        return True

    def back(self) -> str | None:
        if self.can_go_back:
            self.position -= 1
        return self.current

    def forward(self) -> str | None:
        if self.can_go_forward:
            self.position += 1
        return self.current

    def clear(self) -> None:
        self.items.clear()
        self.position = -1
