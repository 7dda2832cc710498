"""Run the latency benchmark at several catalogue sizes and write benchmarks/RESULTS.md.

    python benchmarks/run_all.py          # 10k and 100k works, embedded and endpoint mode
    python benchmarks/run_all.py --big    # and 1M works (needs several GB and a long while)

Each size runs in a process of its own (``suggest_latency.measure``), so that its peak memory
is its own; with ``--repeat N`` it runs N times and every figure is the median of the runs
(timings on a shared machine vary from one process to the next, the SPARQL baseline's most).
The table is written to RESULTS.md next to this file and printed; the last line printed is
``speedup_vs_sparql_groupby: X`` for the 100k-work catalogue.
"""

from __future__ import annotations

import argparse
import datetime
import json
import os
import platform
import statistics
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
MODES = ("blend", "content", "graph", "shared-count")
_DRIVER = (
    "import json, sys; sys.path.insert(0, {here!r}); "
    "from suggest_latency import measure; "
    "print('FIGURES ' + json.dumps(measure({works}, {seeds}, {sparql_seeds}, None)))"
)
_ENDPOINT_DRIVER = (
    "import json, sys; sys.path.insert(0, {here!r}); "
    "from endpoint_latency import measure; "
    "print('FIGURES ' + json.dumps(measure({works}, {seeds}, {sparql_seeds})))"
)


def run_size(
    works: int, seeds: int, sparql_seeds: int, driver: str = _DRIVER
) -> dict[str, float]:
    """The figures of one catalogue size, measured in a fresh process."""
    code = driver.format(here=str(HERE), works=works, seeds=seeds, sparql_seeds=sparql_seeds)
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=False
    )
    if done.returncode != 0:
        sys.stderr.write(done.stdout + done.stderr)
        raise SystemExit(f"the benchmark at {works} works failed (exit {done.returncode})")
    line = next(x for x in done.stdout.splitlines() if x.startswith("FIGURES "))
    return json.loads(line[len("FIGURES ") :])


def _figure(f: dict[str, float], key: str, form: str = "{:.1f}") -> str:
    return form.format(f[key]) if key in f else "n/a"


def table(results: list[dict[str, float]]) -> list[str]:
    """The embedded-mode results as Markdown lines."""
    head = ["works", "triples", "top theme / heading", "load s", "profile + index s"]
    head += ["cached reopen s"]
    head += [f"{m} median / p95 ms" for m in MODES]
    head += ["SPARQL median ms", "blend vs SPARQL", "shared-count vs SPARQL"]
    head += ["peak MiB", "peak MiB, first open with cache"]
    lines = ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
    for f in results:
        cells = [
            f"{f['works']:,.0f}",
            f"{f['triples']:,.0f}",
            f"{100 * f.get('top_theme_share', 0.0):.0f} % / "
            f"{100 * f.get('top_heading_share', 0.0):.0f} %",
            _figure(f, "load_s"),
            _figure(f, "index_s"),
            _figure(f, "cached_reopen_fresh_s", "{:.2f}"),
        ]
        cells += [f"{f[f'{m}_median_ms']:.1f} / {f[f'{m}_p95_ms']:.1f}" for m in MODES]
        cells += [
            f"{f['sparql_groupby_median_ms']:.1f}",
            f"{f['speedup_vs_sparql_groupby']:.1f}x",
            f"{f['speedup_shared_count_vs_sparql']:.1f}x",
            f"{f['peak_memory_mb']:.0f}",
            _figure(f, "peak_memory_with_cache_mb", "{:.0f}"),
        ]
        lines.append("| " + " | ".join(cells) + " |")
    return lines


def endpoint_table(results: list[dict[str, float]]) -> list[str]:
    """The endpoint-mode results as Markdown lines."""
    head = [
        "works",
        "server load s",
        "open on endpoint s",
        "blend median / p95 ms",
        "SPARQL over HTTP median ms",
        "top 20 shared with embedded mode, mean / least",
    ]
    lines = ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
    for f in results:
        cells = [
            f"{f['works']:,.0f}",
            _figure(f, "endpoint_load_s"),
            _figure(f, "endpoint_open_s"),
            f"{_figure(f, 'endpoint_blend_median_ms')} / {_figure(f, 'endpoint_blend_p95_ms')}",
            _figure(f, "endpoint_groupby_median_ms"),
            f"{_figure(f, 'endpoint_top20_agreement_mean', '{:.0%}')} / "
            f"{_figure(f, 'endpoint_top20_agreement_min', '{:.0%}')}",
        ]
        lines.append("| " + " | ".join(cells) + " |")
    return lines


def _median_runs(runs: list[dict[str, float]]) -> dict[str, float]:
    return {key: statistics.median(r[key] for r in runs) for key in runs[0]}


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--big", action="store_true", help="also run 1M works")
    parser.add_argument("--seeds", type=int, default=20, help="seed works per mode")
    parser.add_argument(
        "--sparql-seeds", type=int, default=20, help="seed works for the SPARQL baseline"
    )
    parser.add_argument("--repeat", type=int, default=1, help="runs per size (medians kept)")
    parser.add_argument(
        "--no-endpoint", action="store_true", help="skip endpoint mode (no Oxigraph server)"
    )
    parser.add_argument("--out", type=Path, default=HERE / "RESULTS.md")
    args = parser.parse_args(argv)
    sizes = [10_000, 100_000] + ([1_000_000] if args.big else [])
    results = []
    for works in sizes:
        runs = []
        # 1M works runs once: one run takes a good quarter of an hour.
        for run in range(max(1, args.repeat) if works < 1_000_000 else 1):
            print(f"running {works:,} works ({run + 1}) ...", file=sys.stderr, flush=True)
            runs.append(run_size(works, args.seeds, args.sparql_seeds))
        results.append(_median_runs(runs))
    remote: list[dict[str, float]] = []
    if not args.no_endpoint:
        for works in sizes[:2]:
            print(f"running {works:,} works against a local server ...", file=sys.stderr)
            remote.append(run_size(works, args.seeds, args.sparql_seeds, _ENDPOINT_DRIVER))
    today = datetime.datetime.now(datetime.UTC).date().isoformat()
    cpus = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    machine = (
        f"nproc {cpus}, Python {platform.python_version()} "
        f"({platform.python_implementation()}), {platform.system()} {platform.machine()}"
    )
    lines = [
        "# Benchmark results",
        "",
        f"`python benchmarks/run_all.py{' --big' if args.big else ''}"
        f"{f' --repeat {args.repeat}' if args.repeat > 1 else ''}` on {today}; {machine}.",
        "",
        "Synthetic catalogues of benchmarks/synthetic.py (seed 7), opened with `open_catalogue`;",
        f"latencies are top-20 suggestions with MMR over {args.seeds}",
        "seed works; *SPARQL* is the shared-category GROUP BY query on the same store over",
        f"{args.sparql_seeds} of them; *peak* is the process's peak resident memory."
        + (
            f" Each figure is the median of {args.repeat} runs"
            + (" (1M works: one run)." if args.big else ".")
            if args.repeat > 1
            else ""
        ),
        "",
        *table(results),
        "",
        "*load* and *profile + index* are a first open without the cache (files into the",
        "store, then profile and index); *cached reopen* opens the same unchanged file again, in a",
        "fresh process, from curator's cache (on-disk store and pickled index; timed from the call",
        "to ready, imports not counted). *peak MiB, first open with cache* is a fresh process that",
        "opens with the cache and writes the entry for next time. *top theme / heading*: the",
        "share of works with the most common topical",
        "theme, and with the most common subject value of any kind (the \"Fiction\" form",
        "heading).",
        "",
    ]
    if remote:
        lines += [
            "## Endpoint mode",
            "",
            "The same catalogue loaded into a local Oxigraph server (`oxigraph load`, served",
            "read-only on 127.0.0.1); curator opened with `--endpoint` (profile by aggregate",
            "queries), top-20 blended suggestions with MMR whose candidates the server finds;",
            "*SPARQL over HTTP* is the GROUP BY query sent to the same server.",
            "",
            *endpoint_table(remote),
            "",
        ]
    args.out.write_text("\n".join(lines), encoding="utf-8")
    print("\n".join(lines))
    hundred = next(f for f in results if int(f["works"]) == 100_000)
    print(f"speedup_vs_sparql_groupby: {hundred['speedup_vs_sparql_groupby']:.1f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
