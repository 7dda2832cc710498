"""``curator cache info`` and ``curator cache clear``: what the cache of opened catalogues holds,
and emptying it (it refills itself the next time a catalogue is opened)."""

from __future__ import annotations

import argparse
import sys
import time
from typing import Any

from curator.core.cache import CatalogueCache


def add_parsers(commands: Any) -> None:
    c = commands.add_parser(
        "cache", help="show or clear the saved copies of opened catalogues (for quick reopening)"
    )
    actions = c.add_subparsers(dest="cache_action", metavar="{info,clear}", required=True)
    actions.add_parser("info", help="the cache folder, its entries, their sizes and last use")
    actions.add_parser("clear", help="remove every entry no open window is using")


def run(args: argparse.Namespace) -> int:
    cache = CatalogueCache()
    lines = info_lines(cache) if args.cache_action == "info" else clear_lines(cache)
    sys.stdout.write("\n".join(lines) + "\n")
    return 0


def info_lines(cache: CatalogueCache) -> list[str]:
    entries = cache.entries()
    lines = [f"Cache folder: {cache.folder}"]
    if not entries:
        lines.append("No saved catalogues.")
    for entry in entries:
        lines.append(
            f"  {entry.key[:12]}  {size_text(entry.size):>9}  last used {when(entry.last_used)}"
        )
        lines.append(f"      {entry.description or '(no description)'}")
    surveys = cache.endpoint_files()
    if surveys:
        size = sum(f.stat().st_size for f in surveys)
        lines.append(
            f"  {len(surveys)} endpoint file{'s' if len(surveys) != 1 else ''} (detected profiles "
            f"and theme frequencies, renewed after a day): {size_text(size)}"
        )
    total = sum(e.size for e in entries)
    lines.append(
        f"Total: {len(entries)} of at most {cache.max_entries} entries, {size_text(total)} "
        f"of at most {size_text(cache.max_bytes)}; the least recently used go first."
    )
    return lines


def clear_lines(cache: CatalogueCache) -> list[str]:
    count = len(cache.entries())
    surveys = len(cache.endpoint_files())
    freed, kept = cache.clear()
    removed = count - len(kept)
    lines = [f"Removed {removed} saved catalogue{'s' if removed != 1 else ''} from "
             f"{cache.folder}"
             + (f" and {surveys} endpoint file{'s' if surveys != 1 else ''}" if surveys else "")
             + f", freeing {size_text(freed)}."]
    if kept:
        lines.append(
            f"Kept {len(kept)} in use by an open window ({size_text(sum(e.size for e in kept))}); "
            "close it and clear again to remove them."
        )
    return lines


def size_text(size: int) -> str:
    value = float(size)
    for unit in ("bytes", "KB", "MB", "GB"):
        if value < 1024 or unit == "GB":
            return f"{value:.0f} {unit}" if unit == "bytes" else f"{value:.1f} {unit}"
        value /= 1024
    return f"{value:.1f} GB"


def when(timestamp: float) -> str:
    return time.strftime("%Y-%m-%d %H:%M", time.localtime(timestamp))
