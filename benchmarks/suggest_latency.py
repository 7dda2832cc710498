"""Suggestion latency on a synthetic catalogue, side by side with the SPARQL GROUP BY baseline.

    python benchmarks/suggest_latency.py --works 100000

Prints, from one run on one machine: load time, profile and index build time, median and 95th
percentile latency of a top-20 MMR suggestion per mode over 20 seeds, peak memory, and the
median time of the shared-category SPARQL query on the same pyoxigraph store. The ratios are
measured in the same process, so they compare like with like. The last line is
``speedup_vs_sparql_groupby: X`` (SPARQL median / default blended suggestion median).
"""

from __future__ import annotations

import argparse
import random
import resource
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from synthetic import write_synthetic

from curator.core.baseline import run_shared_count_query
from curator.core.progress import Progress
from curator.core.suggest import SuggestSettings
from curator.services.workspace import open_catalogue

ABOUT = "https://schema.org/about"


def peak_memory_mb() -> float:
    """Peak resident memory of this process so far (Linux reports kilobytes)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def percentile(values: list[float], q: float) -> float:
    ordered = sorted(values)
    return ordered[min(len(ordered) - 1, round(q * (len(ordered) - 1)))]


def measure(works: int, seeds: int, sparql_seeds: int, out: Path | None) -> dict[str, float]:
    folder = Path(tempfile.mkdtemp(prefix="curator-bench-"))
    path = folder / f"synthetic-{works}.nt"
    started = time.perf_counter()
    stats = write_synthetic(path, works)
    generated = time.perf_counter() - started

    started = time.perf_counter()
    read_at: list[float] = []

    def note_read(_stage: str, fraction: float) -> None:
        # open_catalogue reports 0.4 once the files are in the store; profile and index follow.
        if fraction >= 0.4 and not read_at:
            read_at.append(time.perf_counter())

    workspace = open_catalogue(
        [path], languages=("en",), cache=False, progress=Progress(callback=note_read)
    )
    opened = time.perf_counter() - started
    loaded = (read_at[0] if read_at else started) - started
    index = workspace.index
    rng = random.Random(11)
    seed_positions = rng.sample(range(index.size), seeds)

    figures: dict[str, float] = {
        "works": float(index.size),
        "triples": float(workspace.catalogue.triple_count),
        "generate_s": generated,
        "open_s": opened,
        "load_s": loaded,
        "index_s": opened - loaded,
    }
    for mode in ("blend", "content", "graph", "shared-count"):
        settings = SuggestSettings(mode=mode, limit=20, shared_property=ABOUT)  # type: ignore[arg-type]
        workspace.suggester.suggest(seed_positions[:1], settings)  # warm caches
        times = []
        for seed in seed_positions:
            t0 = time.perf_counter()
            workspace.suggester.suggest([seed], settings)
            times.append(time.perf_counter() - t0)
        figures[f"{mode}_median_ms"] = statistics.median(times) * 1000
        figures[f"{mode}_p95_ms"] = percentile(times, 0.95) * 1000

    sparql_times = []
    for seed in seed_positions[:sparql_seeds]:
        t0 = time.perf_counter()
        run_shared_count_query(workspace.catalogue, index.works[seed], ABOUT)
        sparql_times.append(time.perf_counter() - t0)
    figures["sparql_groupby_median_ms"] = statistics.median(sparql_times) * 1000
    figures["peak_memory_mb"] = peak_memory_mb()
    figures["speedup_shared_count_vs_sparql"] = (
        figures["sparql_groupby_median_ms"] / figures["shared-count_median_ms"]
    )
    figures["speedup_vs_sparql_groupby"] = (
        figures["sparql_groupby_median_ms"] / figures["blend_median_ms"]
    )
    figures["top_theme_share"] = stats.top_theme_works / max(1, stats.works)
    figures["top_heading_share"] = stats.top_heading_works / max(1, stats.works)

    # The cache of opened catalogues, in a folder of this run. Each open with the cache runs in
    # a fresh process of its own, so that its peak memory is its own: the first (ready, then
    # the copy for next time written in the background), then a reopen; timed inside the
    # process, and as a whole with the interpreter and imports. Then a reopen in this process.
    import gc
    import json
    import shutil
    import subprocess

    from curator.core.cache import CatalogueCache
    from curator.core.memory import return_freed_memory

    del workspace, index
    return_freed_memory(collect=True)  # the children below need the room (7 GB at 1M works)
    cache = CatalogueCache(folder / "cache")
    child = (
        "import json, resource, sys, time; t = time.perf_counter(); "
        "from pathlib import Path; from curator.core.cache import CatalogueCache; "
        "from curator.services.workspace import open_catalogue; i = time.perf_counter(); "
        "w = open_catalogue([Path(sys.argv[1])], languages=('en',), "
        "cache=CatalogueCache(Path(sys.argv[2]))); ready = time.perf_counter(); "
        "w.wait_for_cache(); written = time.perf_counter(); "
        "status = Path('/proc/self/status'); "
        "hwm = [int(x.split()[1]) / 1024 for x in status.read_text().splitlines() "
        "if x.startswith('VmHWM')] if status.exists() else []; "
        "print(json.dumps([w.from_cache, ready - i, ready - t, written - ready, "
        "hwm[0] if hwm else resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024]))"
    )
    runs = []
    for _ in range(2):
        started = time.perf_counter()
        output = subprocess.run(
            [sys.executable, "-c", child, str(path), str(cache.folder)],
            check=True,
            capture_output=True,
            text=True,
            cwd=Path(__file__).resolve().parents[1],
        ).stdout
        runs.append((time.perf_counter() - started, json.loads(output.strip().splitlines()[-1])))
    (_, (hit, opening, _with_imports, written, peak)), (wall, reopen) = runs
    assert not hit and reopen[0]
    figures["open_with_cache_miss_s"] = opening
    figures["cache_write_s"] = written
    figures["peak_memory_with_cache_mb"] = peak
    figures["cached_reopen_fresh_s"] = reopen[1]
    figures["cached_reopen_fresh_with_imports_s"] = reopen[2]
    figures["cached_reopen_fresh_process_s"] = wall
    figures["cached_reopen_fresh_peak_mb"] = reopen[4]
    figures["cache_entry_mb"] = cache.entries()[0].size / 2**20
    started = time.perf_counter()
    again = open_catalogue([path], languages=("en",), cache=cache)
    figures["cached_reopen_s"] = time.perf_counter() - started
    assert again.from_cache
    del again
    gc.collect()
    path.unlink()
    shutil.rmtree(folder, ignore_errors=True)
    return figures


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--works", type=int, default=10_000)
    parser.add_argument("--seeds", type=int, default=20)
    parser.add_argument("--sparql-seeds", type=int, default=10)
    args = parser.parse_args(argv)
    figures = measure(args.works, args.seeds, args.sparql_seeds, None)
    print(f"catalogue: {figures['works']:.0f} works, {figures['triples']:.0f} triples")
    print(f"generate_s: {figures['generate_s']:.2f}")
    print(
        f"load_profile_index_s: {figures['open_s']:.2f} (load {figures['load_s']:.2f}, "
        f"profile and index {figures['index_s']:.2f})"
    )
    for mode in ("blend", "content", "graph", "shared-count"):
        print(
            f"{mode}_top20_ms: median {figures[f'{mode}_median_ms']:.1f}, "
            f"p95 {figures[f'{mode}_p95_ms']:.1f}"
        )
    print(f"sparql_groupby_median_ms: {figures['sparql_groupby_median_ms']:.1f}")
    print(f"peak_memory_mb: {figures['peak_memory_mb']:.0f}")
    print(
        f"open_with_cache_miss_s: {figures['open_with_cache_miss_s']:.2f} "
        f"(then cache_write_s {figures['cache_write_s']:.2f} in the background, entry "
        f"{figures['cache_entry_mb']:.0f} MB; process peak "
        f"{figures['peak_memory_with_cache_mb']:.0f} MB)"
    )
    print(f"cached_reopen_s: {figures['cached_reopen_s']:.2f}")
    print(
        f"cached_reopen_fresh_process_s: {figures['cached_reopen_fresh_s']:.2f} "
        f"({figures['cached_reopen_fresh_with_imports_s']:.2f} with imports, "
        f"{figures['cached_reopen_fresh_process_s']:.2f} the whole process; "
        f"peak {figures['cached_reopen_fresh_peak_mb']:.0f} MB)"
    )
    print(f"speedup_shared_count_vs_sparql: {figures['speedup_shared_count_vs_sparql']:.1f}")
    print(f"speedup_vs_sparql_groupby: {figures['speedup_vs_sparql_groupby']:.1f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
