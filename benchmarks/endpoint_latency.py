"""Endpoint mode against a local Oxigraph server, side by side with the SPARQL GROUP BY query.

    python benchmarks/endpoint_latency.py --works 100000

Writes a synthetic catalogue (benchmarks/synthetic.py), loads it into an Oxigraph server's
on-disk store (``oxigraph load``), serves it read-only on 127.0.0.1, and prints, from one run:
the server's load time, the time to open curator on the endpoint (profile by aggregate queries,
feature frequencies), the median and 95th-percentile latency of a top-20 blended suggestion with
MMR in endpoint mode, and the median time of the shared-category GROUP BY query sent to the same
server. The server is the PyPI package ``oxigraph`` (a test extra of curator).
"""

from __future__ import annotations

import argparse
import contextlib
import random
import shutil
import socket
import statistics
import subprocess
import sys
import tempfile
import time
import urllib.parse
import urllib.request
from collections.abc import Iterator
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from synthetic import BASE, write_synthetic

ABOUT = "https://schema.org/about"
#: Seeds whose top 20 is compared with embedded mode's.
AGREEMENT_SEEDS = 8


def oxigraph_binary() -> str:
    """The Oxigraph server program: on PATH, or beside this Python."""
    found = shutil.which("oxigraph") or str(Path(sys.executable).parent / "oxigraph")
    if not Path(found).exists():
        raise SystemExit("the Oxigraph server is not installed: pip install oxigraph")
    return found


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return int(s.getsockname()[1])


@contextlib.contextmanager
def served(data: Path, folder: Path) -> Iterator[tuple[str, float]]:
    """Load ``data`` into a fresh Oxigraph store in ``folder`` and serve it read-only; yields
    the query URL and the load time in seconds."""
    binary = oxigraph_binary()
    location = folder / "db"
    started = time.perf_counter()
    subprocess.run(
        [binary, "load", "--location", str(location), "--file", str(data)],
        check=True,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )
    loaded = time.perf_counter() - started
    port = free_port()
    process = subprocess.Popen(
        [binary, "serve-read-only", "--location", str(location), "--bind", f"127.0.0.1:{port}"],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )
    url = f"http://127.0.0.1:{port}/query"
    try:
        for _ in range(300):
            try:
                ask = urllib.parse.urlencode({"query": "ASK {}"})
                urllib.request.urlopen(f"{url}?{ask}", timeout=2).read()
                break
            except OSError:
                time.sleep(0.1)
        yield url, loaded
    finally:
        process.terminate()
        process.wait(timeout=30)


def groupby_over_http(url: str, work: str, prop: str = ABOUT) -> float:
    """Seconds the shared-category GROUP BY query takes through the SPARQL protocol (POST),
    answer read in full."""
    query = (
        f"SELECT ?rec (COUNT(?cat) AS ?n) WHERE {{ <{work}> <{prop}> ?cat . "
        f"?rec <{prop}> ?cat . FILTER(?rec != <{work}>) }} GROUP BY ?rec ORDER BY DESC(?n)"
    )
    request = urllib.request.Request(
        url,
        data=urllib.parse.urlencode({"query": query}).encode(),
        headers={
            "Accept": "application/sparql-results+json",
            "Content-Type": "application/x-www-form-urlencoded",
        },
        method="POST",
    )
    started = time.perf_counter()
    with urllib.request.urlopen(request, timeout=600) as answer:
        answer.read()
    return time.perf_counter() - started


def percentile(values: list[float], q: float) -> float:
    ordered = sorted(values)
    return ordered[min(len(ordered) - 1, round(q * (len(ordered) - 1)))]


def measure(works: int, seeds: int, sparql_seeds: int) -> dict[str, float]:
    """The endpoint figures of one catalogue size (seconds and milliseconds as named)."""
    from curator.core.suggest import SuggestSettings
    from curator.services.endpoint import open_endpoint
    from curator.services.suggestions import SuggestRequest, suggest
    from curator.services.workspace import open_catalogue

    folder = Path(tempfile.mkdtemp(prefix="curator-endpoint-bench-"))
    try:
        data = folder / f"synthetic-{works}.nt"
        write_synthetic(data, works)
        rng = random.Random(11)
        seed_iris = [f"{BASE}work/{i}" for i in rng.sample(range(works), seeds)]
        figures: dict[str, float] = {"works": float(works)}
        with served(data, folder) as (url, loaded):
            figures["endpoint_load_s"] = loaded
            started = time.perf_counter()
            workspace = open_endpoint(url, languages=("en",))
            figures["endpoint_open_s"] = time.perf_counter() - started
            settings = SuggestSettings(limit=20)
            workspace.suggest(SuggestRequest(seeds=(seed_iris[0],), settings=settings))
            times = []
            for iri in seed_iris:
                t0 = time.perf_counter()
                workspace.suggest(SuggestRequest(seeds=(iri,), settings=settings))
                times.append(time.perf_counter() - t0)
            figures["endpoint_blend_median_ms"] = statistics.median(times) * 1000
            figures["endpoint_blend_p95_ms"] = percentile(times, 0.95) * 1000
            groupby = [groupby_over_http(url, iri) for iri in seed_iris[:sparql_seeds]]
            figures["endpoint_groupby_median_ms"] = statistics.median(groupby) * 1000
            remote_top = [
                [s.iri for s in workspace.suggest(SuggestRequest((iri,), settings)).suggestions]
                for iri in seed_iris[:AGREEMENT_SEEDS]
            ]
        # How close endpoint mode comes to embedded mode on the same file: the share of the
        # embedded top 20 that the endpoint's top 20 holds too.
        del workspace
        embedded = open_catalogue([data], languages=("en",), cache=False)
        shares = []
        for iri, remote in zip(seed_iris, remote_top, strict=False):
            local = suggest(embedded, SuggestRequest((iri,), settings)).suggestions
            shares.append(len({s.iri for s in local} & set(remote)) / max(1, len(local)))
        figures["endpoint_top20_agreement_mean"] = statistics.mean(shares)
        figures["endpoint_top20_agreement_min"] = min(shares)
        return figures
    finally:
        shutil.rmtree(folder, ignore_errors=True)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--works", type=int, default=10_000)
    parser.add_argument("--seeds", type=int, default=20)
    parser.add_argument("--sparql-seeds", type=int, default=10)
    args = parser.parse_args(argv)
    figures = measure(args.works, args.seeds, args.sparql_seeds)
    for key, value in figures.items():
        print(f"{key}: {value:.2f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
