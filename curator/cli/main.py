"""``curator``: suggest and profile from the command line; exceptions become exit codes."""

from __future__ import annotations

import argparse
import json
import sys
import textwrap
import time
from collections.abc import Sequence
from pathlib import Path

from curator.cli import cache_commands, publish_commands
from curator.core.errors import CuratorError
from curator.core.suggest import DEFAULT_LAMBDA, MODES, SuggestionResult, SuggestSettings
from curator.services.endpoint import EndpointWorkspace, open_endpoint, profile_view
from curator.services.profiles import profile_lines, profile_to_json
from curator.services.suggestions import SuggestRequest, result_to_json, suggest
from curator.services.workspace import Workspace, open_catalogue

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_BAD_INPUT = 2
WIDTH = 100


class _Parser(argparse.ArgumentParser):
    """argparse, but usage errors say what to do in one paragraph and exit 2."""

    def error(self, message: str) -> None:  # type: ignore[override]
        self.print_usage(sys.stderr)
        sys.stderr.write(f"curator: {message}\n")
        raise SystemExit(EXIT_BAD_INPUT)


def _catalogue_options(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "--catalogue",
        "-c",
        action="append",
        type=Path,
        metavar="PATH",
        help="an RDF file or folder (repeatable); default: the bundled demo collection",
    )
    parser.add_argument(
        "--endpoint",
        metavar="URL",
        help="a SPARQL 1.1 endpoint's query URL to use as the catalogue instead of files "
        "(suggest and profile)",
    )
    parser.add_argument(
        "--timeout",
        type=float,
        default=30.0,
        metavar="SECONDS",
        help="longest wait for one answer of the endpoint (default 30)",
    )
    parser.add_argument("--format", dest="format_name", help="RDF syntax of the files")
    parser.add_argument("--profile", type=Path, help="a saved profile (TOML) to use as it is")
    parser.add_argument(
        "--language",
        action="append",
        dest="languages",
        metavar="CODE",
        help="label language, most wanted first (repeatable); default from the environment",
    )


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="curator",
        description="Build themed reading and viewing lists from a linked-data catalogue.",
    )
    parser.add_argument("--debug", action="store_true", help="show tracebacks of internal errors")
    commands = parser.add_subparsers(dest="command", parser_class=_Parser)

    s = commands.add_parser("suggest", help="suggest works that fit the seeds")
    _catalogue_options(s)
    s.add_argument(
        "--seed",
        action="append",
        required=True,
        metavar="IRI_OR_TITLE",
        help="a work to start from, by IRI or title (repeatable)",
    )
    s.add_argument("--type", action="append", dest="kinds", metavar="CLASS",
                   help="only works of this kind (IRI or name; repeatable)")
    s.add_argument("--limit", type=int, default=10, help="how many suggestions (default 10)")
    s.add_argument("--lambda", type=float, dest="lam", default=DEFAULT_LAMBDA,
                   help=f"1 = most relevant only, lower = more varied (default {DEFAULT_LAMBDA})")
    s.add_argument("--mode", choices=MODES, default="blend", help="how relevance is measured")
    s.add_argument("--property", dest="shared_property", metavar="IRI",
                   help="the property whose values shared-count mode counts")
    s.add_argument("--year-from", type=int, help="only works from this year on")
    s.add_argument("--year-to", type=int, help="only works up to this year")
    s.add_argument("--in-language", action="append", dest="filter_languages", metavar="LANG",
                   help="only works in this language (code or name; repeatable)")
    s.add_argument("--on-list", action="append", default=[], metavar="IRI_OR_TITLE",
                   help="a work already on the list (never suggested; counts as redundancy)")
    s.add_argument("--dismiss", action="append", default=[], metavar="IRI_OR_TITLE",
                   help="a work ruled out (never suggested; pushes down what resembles it)")
    s.add_argument("--with-versions", action="store_true",
                   help="also suggest other versions of the seeds and list entries (readings, "
                   "editions of the same title by the same creator)")
    s.add_argument("--json", action="store_true", help="print JSON instead of a table")

    p = commands.add_parser("profile", help="show how the catalogue is read")
    _catalogue_options(p)
    p.add_argument("--json", action="store_true", help="print JSON instead of text")
    p.add_argument("--save", type=Path, metavar="FILE", help="write the profile as TOML")

    publish_commands.add_parsers(commands, _catalogue_options)
    cache_commands.add_parsers(commands)
    o = commands.add_parser(
        "open", help="open the window on catalogue files or folders, or on an endpoint"
    )
    o.add_argument("paths", nargs="*", metavar="PATH", help="an RDF file or folder")
    o.add_argument("--endpoint", metavar="URL", help="a SPARQL 1.1 endpoint's query URL instead")
    o.add_argument(
        "--timeout", type=float, default=30.0, metavar="SECONDS",
        help="longest wait for one answer of the endpoint (default 30)",
    )
    return parser


def _open(args: argparse.Namespace) -> Workspace | EndpointWorkspace:
    """The catalogue named on the command line: files (or the demo), or an endpoint."""
    if getattr(args, "endpoint", None):
        if args.catalogue:
            raise CuratorError(
                "Give either --catalogue files or --endpoint URL, not both: the endpoint is the "
                "whole catalogue."
            )
        if args.timeout <= 0:
            raise CuratorError("--timeout must be a positive number of seconds.")
        return open_endpoint(
            args.endpoint,
            languages=args.languages,
            profile_path=args.profile,
            timeout=args.timeout,
            use_disk_cache=True,
        )
    return _open_files(args)


def _open_files(args: argparse.Namespace) -> Workspace:
    if getattr(args, "endpoint", None):
        raise CuratorError(
            f"curator {args.command} reads catalogue files; --endpoint works with suggest and "
            "profile."
        )
    workspace = open_catalogue(
        args.catalogue or None,
        profile_path=args.profile,
        languages=args.languages,
        format_name=args.format_name,
    )
    _OPENED.append(workspace)
    return workspace


#: Workspaces this command opened, whose copy for next time may still be being written.
_OPENED: list[Workspace] = []


def _finish_cache_copies() -> None:
    """Say why the command has not ended yet when the copy of a newly opened catalogue is still
    being written (the next open of the same files then takes a second), and wait for it."""
    pending = [w for w in _OPENED if w.saver is not None and w.saver.running]
    # A small catalogue's copy is done in a moment: only a longer wait is worth a word.
    deadline = time.monotonic() + 0.5
    for workspace in pending:
        workspace.wait_for_cache(max(0.0, deadline - time.monotonic()))
    pending = [w for w in pending if w.saver is not None and w.saver.running]
    if pending:
        sys.stderr.write(
            "curator: keeping a copy of the catalogue so that it opens quickly next time "
            "(Ctrl+C skips it)...\n"
        )
        sys.stderr.flush()
    try:
        for workspace in pending:
            workspace.wait_for_cache()
    except KeyboardInterrupt:
        for workspace in pending:
            if workspace.saver is not None:
                workspace.saver.stop()
    _OPENED.clear()


def _run_suggest(args: argparse.Namespace) -> int:
    settings = SuggestSettings(
        mode=args.mode,
        lam=args.lam,
        limit=args.limit,
        kinds=tuple(args.kinds or ()),
        year_from=args.year_from,
        year_to=args.year_to,
        languages=tuple(args.filter_languages or ()),
        shared_property=args.shared_property,
        other_versions=args.with_versions,
    ).checked()
    workspace = _open(args)
    result = suggest(
        workspace,
        SuggestRequest(
            seeds=tuple(args.seed),
            settings=settings,
            list_items=tuple(args.on_list),
            dismissed=tuple(args.dismiss),
        ),
    )
    if args.json:
        json.dump(result_to_json(workspace.index, result), sys.stdout, ensure_ascii=False, indent=2)
        sys.stdout.write("\n")
    else:
        sys.stdout.write("\n".join(suggestion_table(workspace, result)) + "\n")
    return EXIT_OK


def suggestion_table(
    workspace: Workspace | EndpointWorkspace, result: SuggestionResult
) -> list[str]:
    """The suggestions as a table no wider than 100 columns, each with its rationale below."""
    index = workspace.index
    finder = workspace.finder
    assert index is not None and finder is not None  # an endpoint's, after its suggestion

    def seed_line(record: object) -> str:
        position = index.position[record.iri]  # type: ignore[attr-defined]
        line = f"  {record.label} ({finder.describe(position)})"  # type: ignore[attr-defined]
        return line if len(line) <= WIDTH else line[: WIDTH - 1] + "…"

    lines = ["Seeds:", *(seed_line(r) for r in result.seeds), ""]
    counting = result.settings.mode == "shared-count"
    score_name = "shared" if counting else "fit"
    header = f"{'#':>2}  {'Title':<36} {'Creator':<22} {'Year':>4}  {'Kind':<16} {score_name:>6}"
    lines.append(header)
    lines.append("-" * WIDTH)
    for number, s in enumerate(result.suggestions, start=1):
        record = s.record
        creator = ", ".join(index.label(c) for c in record.creators[:1]) or "—"
        kind = index.label(record.kinds[0]) if record.kinds else "—"
        year = str(record.year) if record.year is not None else "—"
        score = f"{s.score:.0f}" if counting else f"{s.relevance:.2f}"
        lines.append(
            f"{number:>2}  {_fit(record.label, 36)} {_fit(creator, 22)} {year:>4}  "
            f"{_fit(kind, 16)} {score:>6}"
        )
        lines += textwrap.wrap(s.rationale, WIDTH, initial_indent="    ", subsequent_indent="    ")
    for note in result.notes:
        lines += textwrap.wrap(f"Note: {note}", WIDTH, subsequent_indent="      ")
    return lines


def _fit(text: str, width: int) -> str:
    return (text if len(text) <= width else text[: width - 1] + "…").ljust(width)


def _run_profile(args: argparse.Namespace) -> int:
    opened = _open(args)
    workspace = profile_view(opened) if isinstance(opened, EndpointWorkspace) else opened
    if args.save:
        workspace.profile.save(args.save)
    if args.json:
        json.dump(profile_to_json(workspace), sys.stdout, ensure_ascii=False, indent=2)
        sys.stdout.write("\n")
    else:
        sys.stdout.write("\n".join(profile_lines(workspace, WIDTH)) + "\n")
        if args.save:
            sys.stdout.write(f"\nProfile saved to {args.save}\n")
    return EXIT_OK


def _run_window(
    paths: list[str] | None, endpoint: str | None = None, timeout: float = 30.0
) -> int:
    """The window, imported only here so that the command line works without Qt installed."""
    try:
        from curator.gui import run
    except ImportError as exc:
        sys.stderr.write(
            f"curator: the window needs PySide6 ({exc}); install it with "
            "pip install 'curator[gui]', or use curator suggest.\n"
        )
        return EXIT_BAD_INPUT
    if endpoint is not None:
        return run(None, endpoint=endpoint, timeout=timeout)
    return run(paths)


def _run_open(args: argparse.Namespace) -> int:
    if args.endpoint:
        if args.paths:
            raise CuratorError("Give either catalogue paths or --endpoint URL, not both.")
        return _run_window(None, args.endpoint, args.timeout)
    if not args.paths:
        raise CuratorError("curator open needs a catalogue file or folder, or --endpoint URL.")
    missing = [p for p in args.paths if not Path(p).exists()]
    if missing:
        raise CuratorError(f"{missing[0]}: no such file or folder.")
    return _run_window(list(args.paths))


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    args = parser.parse_args(argv)
    if args.command is None:
        return _run_window(None)
    handlers = {
        "suggest": _run_suggest,
        "profile": _run_profile,
        "open": _run_open,
        "audit": lambda a: publish_commands.run_audit(_open_files(a), a),
        "export": lambda a: publish_commands.run_export(_open_files(a), a),
        "cache": cache_commands.run,
    }
    try:
        status = handlers[args.command](args)
        _finish_cache_copies()
        return status
    except CuratorError as exc:
        sys.stderr.write(f"curator: {exc}\n")
        return EXIT_BAD_INPUT
    except OSError as exc:
        # A file to write that cannot be (no space, no permission, a folder in the way):
        # the curator's to fix, not a bug.
        where = f"{exc.filename}: " if exc.filename else ""
        sys.stderr.write(f"curator: {where}cannot be written or read ({exc.strerror or exc}).\n")
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        sys.stderr.write("curator: interrupted\n")
        return 130
    except Exception as exc:
        if args.debug:
            raise
        sys.stderr.write(
            f"curator: internal error ({type(exc).__name__}: {exc}). "
            "Run again with --debug for details.\n"
        )
        return EXIT_INTERNAL
