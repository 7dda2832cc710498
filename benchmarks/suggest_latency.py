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
    workspace = open_catalogue([path], languages=("en",))
    opened = time.perf_counter() - started
    index = workspace.index
    rng = random.Random(11)
    seed_positions = rng.sample(range(index.size), seeds)

    figures: dict[str, float] = {
        "works": float(index.size),
        "triples": float(workspace.catalogue.triple_count),
        "generate_s": generated,
        "open_s": opened,
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
    path.unlink()
    folder.rmdir()
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
    print(f"load_profile_index_s: {figures['open_s']:.2f}")
    for mode in ("blend", "content", "graph", "shared-count"):
        print(
            f"{mode}_top20_ms: median {figures[f'{mode}_median_ms']:.1f}, "
            f"p95 {figures[f'{mode}_p95_ms']:.1f}"
        )
    print(f"sparql_groupby_median_ms: {figures['sparql_groupby_median_ms']:.1f}")
    print(f"peak_memory_mb: {figures['peak_memory_mb']:.0f}")
    print(f"speedup_shared_count_vs_sparql: {figures['speedup_shared_count_vs_sparql']:.1f}")
    print(f"speedup_vs_sparql_groupby: {figures['speedup_vs_sparql_groupby']:.1f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
