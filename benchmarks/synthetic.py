"""Seeded synthetic catalogue generator for benchmarks.

Benchmarks need a catalogue that is (a) reproducible, so that timings from
different runs and machines compare like with like, and (b) realistically
skewed. Real catalogues are not uniform. A few themes are everywhere and most
are rare. Creators come back to their own pet subjects. A small number of
works are adaptations of other works. Uniform random data makes caches, joins
and ranking look far better (or worse) than they really are. This module
writes such a catalogue as N-Triples, using schema.org terms plus a 3-level
SKOS theme hierarchy.

Shape of the output (all IRIs live under https://synthetic.example/):

* ``works`` works, each ``a schema:Book`` (80 %) or ``a schema:Movie`` (20 %),
  with ``schema:name "Work <i>"``, ``schema:author`` (one creator, and a
  second one for about 10 % of works), ``schema:about`` 3-6 distinct
  third-level themes, ``schema:datePublished "<year>"^^xsd:gYear``,
  ``schema:inLanguage`` (one of 6 language codes, as a plain literal), and
  for about 2 % of works ``schema:isBasedOn`` pointing to an earlier work.
* ``max(1, works // 8)`` creators, each ``a schema:Person`` with
  ``schema:name "Creator <i>"``. Every creator has at least one work. Each
  creator gets a signature set of 3-8 leaf themes, drawn Zipf-like. About
  1 creator in 10 has ``<https://synthetic.example/vocab#influencedBy>``
  pointing to another creator.
* ``max(200, works // 20)`` third-level (leaf) themes, which sit under
  second-level and top-level themes through ``skos:broader``. Every theme is
  ``a skos:Concept`` with a ``skos:prefLabel``. Leaf popularity follows a
  Zipf law with exponent 1.1. A work's themes come partly from its first
  author's signature set and partly from the global Zipf distribution.

The output is a pure function of ``(works, seed)`` for a given CPython
version: only :class:`random.Random` is used. numpy is deliberately not
used, so the file does not change depending on whether numpy is installed.
Triples are streamed to the file as they are generated (no rdflib, no graph
in memory). 100k works take a few seconds.

Usage::

    python benchmarks/synthetic.py --works 100000 --out /tmp/synthetic.nt [--seed 7]

or, from Python::

    from benchmarks.synthetic import write_synthetic
    stats = write_synthetic(Path("/tmp/synthetic.nt"), works=2000)
"""

from __future__ import annotations

import argparse
import bisect
import random
import sys
import time
from dataclasses import dataclass
from itertools import accumulate
from pathlib import Path

__all__ = ["SyntheticStats", "main", "write_synthetic"]

BASE = "https://synthetic.example/"
SCHEMA = "https://schema.org/"
SKOS = "http://www.w3.org/2004/02/skos/core#"
XSD = "http://www.w3.org/2001/XMLSchema#"
RDF_TYPE = "<http://www.w3.org/1999/02/22-rdf-syntax-ns#type>"

#: Zipf exponent for theme popularity.
THEME_ZIPF_EXPONENT = 0.9
#: Milder skew for how many works a creator gets (beyond their first).
CREATOR_ZIPF_EXPONENT = 0.6
#: Share of a work's themes that come from its author's signature set.
SIGNATURE_SHARE = 0.6
BOOK_SHARE = 0.8
SECOND_AUTHOR_SHARE = 0.10
IS_BASED_ON_SHARE = 0.02
INFLUENCE_PER_CREATOR = 0.10
LANGUAGES = ("en", "de", "fr", "es", "it", "nl")
LANGUAGE_WEIGHTS = (60, 12, 10, 8, 5, 5)
YEAR_MIN, YEAR_MAX, YEAR_MODE = 1900, 2024, 2010

_BUFFER_LINES = 50_000


@dataclass(frozen=True)
class SyntheticStats:
    """What :func:`write_synthetic` wrote.

    ``themes`` counts every ``skos:Concept`` (all three levels).
    ``triples`` is the exact number of lines in the N-Triples file.
    """

    works: int
    creators: int
    themes: int
    triples: int


def _iri(path: str) -> str:
    return f"<{BASE}{path}>"


def _zipf_cum_weights(n: int, exponent: float) -> list[float]:
    return list(accumulate(1.0 / (rank**exponent) for rank in range(1, n + 1)))


def _level_sizes(leaves: int) -> tuple[int, int]:
    """Number of (top, mid) themes for a given number of leaf themes."""
    mid = max(20, leaves // 8)
    top = max(6, mid // 25)
    return top, mid


def write_synthetic(path: Path, works: int, seed: int = 7) -> SyntheticStats:
    """Write a synthetic catalogue of ``works`` works to ``path`` as N-Triples.

    The output depends only on ``works`` and ``seed``. Returns the counts
    of what was written.
    """
    if works < 1:
        raise ValueError(f"works must be >= 1, got {works}")
    path = Path(path)
    rng = random.Random(seed)
    rand = rng.random
    randbelow = rng.randrange

    n_leaves = max(200, works // 20)
    n_top, n_mid = _level_sizes(n_leaves)
    n_creators = max(1, works // 8)

    a = RDF_TYPE
    p_label = f"<{SKOS}prefLabel>"
    p_broader = f"<{SKOS}broader>"
    c_concept = f"<{SKOS}Concept>"
    p_name = f"<{SCHEMA}name>"
    p_author = f"<{SCHEMA}author>"
    p_about = f"<{SCHEMA}about>"
    p_date = f"<{SCHEMA}datePublished>"
    p_lang = f"<{SCHEMA}inLanguage>"
    p_based = f"<{SCHEMA}isBasedOn>"
    p_influenced = f"<{BASE}vocab#influencedBy>"
    c_book = f"<{SCHEMA}Book>"
    c_movie = f"<{SCHEMA}Movie>"
    c_person = f"<{SCHEMA}Person>"
    gyear = f"^^<{XSD}gYear>"

    top_iris = [_iri(f"theme/top/{i}") for i in range(n_top)]
    mid_iris = [_iri(f"theme/mid/{i}") for i in range(n_mid)]
    leaf_iris = [_iri(f"theme/leaf/{i}") for i in range(n_leaves)]
    creator_iris = [_iri(f"creator/{i}") for i in range(n_creators)]
    lang_literals = [f'"{code}"' for code in LANGUAGES]
    lang_cum = list(accumulate(LANGUAGE_WEIGHTS))
    lang_total = lang_cum[-1]

    # Leaf popularity rank == leaf index (leaf 0 is the most common theme).
    leaf_cum = _zipf_cum_weights(n_leaves, THEME_ZIPF_EXPONENT)
    leaf_total = leaf_cum[-1]

    def zipf_leaf() -> int:
        return bisect.bisect_right(leaf_cum, rand() * leaf_total, 0, n_leaves - 1)

    triples = 0
    buf: list[str] = []
    with path.open("w", encoding="utf-8", newline="\n") as out:

        def flush() -> None:
            out.write("".join(buf))
            buf.clear()

        # --- theme hierarchy ---------------------------------------------
        # Parents are shuffled so that popular leaves are spread over the tree,
        # and every parent gets at least one child.
        for i, iri in enumerate(top_iris):
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Theme area {i}" .\n')
        mid_perm = list(range(n_mid))
        rng.shuffle(mid_perm)
        for pos, i in enumerate(mid_perm):
            iri = mid_iris[i]
            parent = top_iris[pos % n_top]
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Theme group {i}" .\n')
            buf.append(f"{iri} {p_broader} {parent} .\n")
        leaf_perm = list(range(n_leaves))
        rng.shuffle(leaf_perm)
        for pos, i in enumerate(leaf_perm):
            iri = leaf_iris[i]
            parent = mid_iris[pos % n_mid]
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Theme {i}" .\n')
            buf.append(f"{iri} {p_broader} {parent} .\n")
        n_themes = n_top + n_mid + n_leaves
        triples += 2 * n_top + 3 * (n_mid + n_leaves)
        flush()

        # --- creators ----------------------------------------------------
        signatures: list[tuple[int, ...]] = []
        for i, iri in enumerate(creator_iris):
            size = 3 + randbelow(6)  # 3..8 signature themes
            sig: list[int] = []
            while len(sig) < size:
                t = zipf_leaf()
                if t not in sig:
                    sig.append(t)
            signatures.append(tuple(sig))
            buf.append(f"{iri} {a} {c_person} .\n")
            buf.append(f'{iri} {p_name} "Creator {i}" .\n')
            triples += 2
            if len(buf) >= _BUFFER_LINES:
                flush()
        n_influence = int(n_creators * INFLUENCE_PER_CREATOR) if n_creators > 1 else 0
        for src in rng.sample(range(n_creators), n_influence):
            dst = randbelow(n_creators - 1)
            if dst >= src:
                dst += 1
            buf.append(f"{creator_iris[src]} {p_influenced} {creator_iris[dst]} .\n")
        triples += n_influence
        flush()

        # --- works -------------------------------------------------------
        # The first n_creators works get every creator once (in shuffled
        # order). Later works pick their first author with a mild Zipf skew,
        # so creator productivity has a long tail.
        first_authors = list(range(n_creators))
        rng.shuffle(first_authors)
        productivity_rank = list(range(n_creators))
        rng.shuffle(productivity_rank)
        creator_cum = _zipf_cum_weights(n_creators, CREATOR_ZIPF_EXPONENT)
        creator_total = creator_cum[-1]
        last_creator = n_creators - 1

        for w in range(works):
            iri = _iri(f"work/{w}")
            if w < n_creators:
                author = first_authors[w]
            else:
                author = productivity_rank[
                    bisect.bisect_right(creator_cum, rand() * creator_total, 0, last_creator)
                ]
            buf.append(f"{iri} {a} {c_book if rand() < BOOK_SHARE else c_movie} .\n")
            buf.append(f'{iri} {p_name} "Work {w}" .\n')
            buf.append(f"{iri} {p_author} {creator_iris[author]} .\n")
            triples += 3
            if n_creators > 1 and rand() < SECOND_AUTHOR_SHARE:
                co = randbelow(n_creators - 1)
                if co >= author:
                    co += 1
                buf.append(f"{iri} {p_author} {creator_iris[co]} .\n")
                triples += 1

            n_about = 3 + randbelow(4)  # 3..6
            sig = signatures[author]
            chosen: list[int] = []
            while len(chosen) < n_about:
                t = sig[randbelow(len(sig))] if rand() < SIGNATURE_SHARE else zipf_leaf()
                if t not in chosen:
                    chosen.append(t)
            for t in chosen:
                buf.append(f"{iri} {p_about} {leaf_iris[t]} .\n")
            triples += n_about

            year = int(rng.triangular(YEAR_MIN, YEAR_MAX + 1, YEAR_MODE))
            if year > YEAR_MAX:
                year = YEAR_MAX
            buf.append(f'{iri} {p_date} "{year}"{gyear} .\n')
            lang = bisect.bisect_right(lang_cum, rand() * lang_total, 0, len(LANGUAGES) - 1)
            buf.append(f"{iri} {p_lang} {lang_literals[lang]} .\n")
            triples += 2

            if w > 0 and rand() < IS_BASED_ON_SHARE:
                buf.append(f"{iri} {p_based} {_iri(f'work/{randbelow(w)}')} .\n")
                triples += 1

            if len(buf) >= _BUFFER_LINES:
                flush()
        flush()

    return SyntheticStats(works=works, creators=n_creators, themes=n_themes, triples=triples)


def _positive_int(text: str) -> int:
    value = int(text)
    if value < 1:
        raise argparse.ArgumentTypeError(f"must be >= 1, got {value}")
    return value


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(
        description="Write a seeded, realistically skewed synthetic catalogue as N-Triples."
    )
    parser.add_argument("--works", type=_positive_int, required=True, help="number of works")
    parser.add_argument("--out", type=Path, required=True, help="output .nt path")
    parser.add_argument("--seed", type=int, default=7, help="random seed (default: 7)")
    args = parser.parse_args(argv)

    start = time.perf_counter()
    stats = write_synthetic(args.out, args.works, seed=args.seed)
    elapsed = time.perf_counter() - start
    print(
        f"wrote {args.out}: {stats.triples} triples "
        f"({stats.works} works, {stats.creators} creators, {stats.themes} themes) "
        f"in {elapsed:.2f} s"
    )
    return 0


if __name__ == "__main__":
    sys.exit(main())
