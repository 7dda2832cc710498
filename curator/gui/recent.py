"""Recently opened or saved lists (existing files only) and endpoints, remembered in QSettings,
newest first."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QSettings

KEY = "recent/lists"
KEEP = 8


def _as_list(value: object) -> list[str]:
    # QSettings gives a str for a one-item list and None for none, depending on the backend.
    if value is None:
        return []
    if isinstance(value, str):
        return [value]
    return [str(v) for v in value] if isinstance(value, list | tuple) else []


def recent_lists() -> list[Path]:
    return [Path(p) for p in _as_list(QSettings().value(KEY)) if Path(p).exists()]


def remember(path: Path) -> None:
    path = Path(path).resolve()
    paths = [str(path), *(str(p) for p in recent_lists() if p.resolve() != path)]
    QSettings().setValue(KEY, paths[:KEEP])


def forget_all() -> None:
    QSettings().remove(KEY)


ENDPOINTS_KEY = "recent/endpoints"


def recent_endpoints() -> list[str]:
    """Endpoint URLs opened before, newest first (kept even when one is down for now)."""
    return _as_list(QSettings().value(ENDPOINTS_KEY))


def remember_endpoint(url: str) -> None:
    urls = [url, *(u for u in recent_endpoints() if u != url)]
    QSettings().setValue(ENDPOINTS_KEY, urls[:KEEP])
