"""Seeded synthetic catalogue generator for benchmarks.

Benchmarks need a catalogue that is (a) reproducible, so that timings from
different runs and machines compare like with like, and (b) shaped like a real
public-library catalogue. Real catalogues are not uniform. A few themes,
genres and settings are everywhere and most are rare. Creators come back to
their own pet subjects and genres. A small number of works are adaptations of
other works or belong to a series. Records carry much that is not a theme at
all (descriptions, identifiers, page counts, links out). Uniform random data
makes caches, joins and ranking look far better (or worse) than they really
are. This module writes such a catalogue as N-Triples, using schema.org terms,
a 3-level SKOS theme hierarchy, a SKOS genre list and a 3-level place
hierarchy (``schema:containedInPlace``).

Shape of the output (all IRIs live under https://synthetic.example/), about
26 triples per work (2.57M for 100k works):

* ``works`` works, each ``a schema:Book`` (80 %) or ``a schema:Movie`` (20 %),
  with

  - ``schema:name "Work <i>"@en``, and for 60 % of the works not in English
    (24 % of all) a ``schema:alternateName`` in the work's language;
  - ``schema:author`` (one creator, and a second one for about 10 % of
    works); about 10 % of books also have a ``schema:illustrator``;
  - ``schema:about`` 4-8 distinct third-level themes, and beside them, as
    cataloguers do, a form heading (books: "Fiction" for 85 %, else
    "Nonfiction"; films: "Feature films" for 90 %, else "Documentary films"),
    an audience heading for children's and young adult works, and for half of
    the works the broad top-level heading above their first theme;
  - ``schema:genre`` 1-3 genres out of 40 (Zipf, the first one usually the
    author's home genre);
  - ``schema:contentLocation`` 0-3 places out of 2,000 (Zipf; 88 % of works
    have at least one);
  - ``schema:audience``, one of 3 ``schema:Audience`` nodes (adult 65 %,
    children 20 %, young adult 15 %);
  - ``schema:description`` (an English sentence),
    ``schema:datePublished "<year>"^^xsd:gYear``, ``schema:inLanguage`` (one
    of 6 language codes, as a plain literal), ``schema:publisher`` (a name,
    as libraries record it), ``schema:isbn`` and ``schema:numberOfPages``
    (books) or ``schema:identifier`` and ``schema:duration`` (films),
    ``schema:url`` (the record's page), and ``schema:sameAs`` links to
    one outside authority (half of the works to a second one as well);
  - for about 3 % of works ``schema:isPartOf`` a series of their first author
    (``a schema:BookSeries`` or ``schema:MovieSeries``, with a name) and a
    ``schema:position`` in it; for about 2 % ``schema:isBasedOn`` pointing to
    an earlier work.

* ``max(1, works // 8)`` creators, each ``a schema:Person`` with
  ``schema:name "Creator <i>"`` and ``schema:birthDate``. Every creator has at
  least one work. Each creator gets a signature set of 3-8 leaf themes, drawn
  Zipf-like, and a home genre. About 1 creator in 10 has
  ``<https://synthetic.example/vocab#influencedBy>`` pointing to another
  creator. ``max(1, works // 200)`` illustrators are persons of their own.
* ``max(200, works // 20)`` third-level (leaf) themes, which sit under
  second-level and top-level themes through ``skos:broader``. Every theme is
  ``a skos:Concept`` with a ``skos:prefLabel``. Leaf popularity follows a
  Zipf law with exponent :data:`THEME_ZIPF_EXPONENT`. A work's themes come
  partly from its first author's signature set and partly from the global
  Zipf distribution. With the default seed, at 100k works the most common
  theme is on 22.3 % of the works and the tenth on 4.3 %; at 10k works, with
  ten times fewer themes, the most common one is on 36 %.
* 40 genres and 6 form headings (``a skos:Concept``, ``skos:prefLabel``,
  ``skos:inScheme``). "Fiction" is the most common subject value, on 68 % of
  the works: a seed shares it with most of the catalogue, which is what a
  shared-subject count over a real library catalogue meets.
* 2,000 places in 100 regions in 15 countries (every one ``a schema:Place``
  with ``schema:name``; places and regions have ``schema:containedInPlace``).

The output is a pure function of ``(works, seed)`` for a given CPython
version: only :class:`random.Random` is used. numpy is deliberately not
used, so the file does not change depending on whether numpy is installed.
Triples are streamed to the file as they are generated (no rdflib, no graph
in memory). 100k works take about 3-6 seconds.

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
from collections import Counter
from dataclasses import dataclass
from itertools import accumulate
from pathlib import Path

__all__ = ["SyntheticStats", "main", "theme_shares", "write_synthetic"]

BASE = "https://synthetic.example/"
SCHEMA = "https://schema.org/"
SKOS = "http://www.w3.org/2004/02/skos/core#"
XSD = "http://www.w3.org/2001/XMLSchema#"
RDF_TYPE = "<http://www.w3.org/1999/02/22-rdf-syntax-ns#type>"

#: Zipf exponent for theme popularity. With the signature sets and 4-8 themes a work, this
#: puts the most common theme on 22 % of the works at 100k works (0.9 would put it on 34 %).
THEME_ZIPF_EXPONENT = 0.8
#: Milder skew for how many works a creator gets (beyond their first).
CREATOR_ZIPF_EXPONENT = 0.6
#: Genre, place and publisher popularity.
GENRE_ZIPF_EXPONENT = 1.0
PLACE_ZIPF_EXPONENT = 1.0
PUBLISHER_ZIPF_EXPONENT = 1.1
#: Share of a work's themes that come from its author's signature set.
SIGNATURE_SHARE = 0.6
#: Share of works whose first genre is their author's home genre.
HOME_GENRE_SHARE = 0.7
BOOK_SHARE = 0.8
SECOND_AUTHOR_SHARE = 0.10
ILLUSTRATED_BOOK_SHARE = 0.10
IS_BASED_ON_SHARE = 0.02
SERIES_SHARE = 0.03
#: Share of creators who write series; a series is one author's.
SERIES_AUTHOR_SHARE = 0.08
#: Share of works not in English that also carry a title in their own language.
ALTERNATE_NAME_SHARE = 0.6
#: Share of works linked to a second outside authority (every work is linked to one).
SECOND_SAME_AS_SHARE = 0.50
#: Form headings. Cataloguers give nearly every record a form or genre heading beside its topical
#: ones, and works for young readers an audience heading, all in the same subject field (common
#: practice in library cataloguing). They are what makes a shared-subject count expensive: a
#: seed shares "Fiction" with most of the catalogue.
FICTION_SHARE = 0.85
FEATURE_FILM_SHARE = 0.90
FORM_HEADINGS = (
    "Fiction",
    "Nonfiction",
    "Feature films",
    "Documentary films",
    "Juvenile works",
    "Young adult works",
)
#: Share of works that also carry the broad (top-level) heading above their first theme.
BROAD_HEADING_SHARE = 0.5
INFLUENCE_PER_CREATOR = 0.10
N_GENRES = 40
N_PLACES, N_REGIONS, N_COUNTRIES = 2000, 100, 15
N_PUBLISHERS = 800
AUDIENCES = ("adult", "children", "young-adult")
AUDIENCE_WEIGHTS = (65, 20, 15)
LANGUAGES = ("en", "de", "fr", "es", "it", "nl")
LANGUAGE_WEIGHTS = (60, 12, 10, 8, 5, 5)
#: "Work" in each language, for translated titles.
WORK_WORDS = ("Work", "Werk", "Œuvre", "Obra", "Opera", "Werkstuk")
EDITIONS = ("First edition", "Second edition", "Revised edition", "Paperback edition")
YEAR_MIN, YEAR_MAX, YEAR_MODE = 1900, 2024, 2010

_BUFFER_LINES = 50_000


@dataclass(frozen=True)
class SyntheticStats:
    """What :func:`write_synthetic` wrote.

    ``themes`` counts every ``skos:Concept`` of the theme hierarchy (all three levels).
    ``triples`` is the exact number of lines in the N-Triples file.
    ``top_theme_works`` is how many works have the most common theme.
    """

    works: int
    creators: int
    themes: int
    triples: int
    genres: int = 0
    places: int = 0
    series: int = 0
    top_theme_works: int = 0
    #: works with the most common ``schema:about`` value of any kind (a form heading)
    top_heading_works: int = 0


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
    n_illustrators = max(1, works // 200)

    a = RDF_TYPE
    p_label = f"<{SKOS}prefLabel>"
    p_broader = f"<{SKOS}broader>"
    p_scheme = f"<{SKOS}inScheme>"
    c_concept = f"<{SKOS}Concept>"
    p_name = f"<{SCHEMA}name>"
    p_alt = f"<{SCHEMA}alternateName>"
    p_author = f"<{SCHEMA}author>"
    p_illustrator = f"<{SCHEMA}illustrator>"
    p_about = f"<{SCHEMA}about>"
    p_genre = f"<{SCHEMA}genre>"
    p_location = f"<{SCHEMA}contentLocation>"
    p_contained = f"<{SCHEMA}containedInPlace>"
    p_audience = f"<{SCHEMA}audience>"
    p_audience_type = f"<{SCHEMA}audienceType>"
    p_description = f"<{SCHEMA}description>"
    p_date = f"<{SCHEMA}datePublished>"
    p_birth = f"<{SCHEMA}birthDate>"
    p_nationality = f"<{SCHEMA}nationality>"
    p_edition = f"<{SCHEMA}bookEdition>"
    p_lang = f"<{SCHEMA}inLanguage>"
    p_publisher = f"<{SCHEMA}publisher>"
    p_isbn = f"<{SCHEMA}isbn>"
    p_identifier = f"<{SCHEMA}identifier>"
    p_pages = f"<{SCHEMA}numberOfPages>"
    p_duration = f"<{SCHEMA}duration>"
    p_url = f"<{SCHEMA}url>"
    p_same_as = f"<{SCHEMA}sameAs>"
    p_part_of = f"<{SCHEMA}isPartOf>"
    p_position = f"<{SCHEMA}position>"
    p_based = f"<{SCHEMA}isBasedOn>"
    p_influenced = f"<{BASE}vocab#influencedBy>"
    c_book = f"<{SCHEMA}Book>"
    c_movie = f"<{SCHEMA}Movie>"
    c_person = f"<{SCHEMA}Person>"
    c_place = f"<{SCHEMA}Place>"
    c_audience = f"<{SCHEMA}Audience>"
    c_book_series = f"<{SCHEMA}BookSeries>"
    c_movie_series = f"<{SCHEMA}MovieSeries>"
    gyear = f"^^<{XSD}gYear>"
    xsd_date = f"^^<{XSD}date>"
    xsd_integer = f"^^<{XSD}integer>"
    xsd_duration = f"^^<{XSD}duration>"

    top_iris = [_iri(f"theme/top/{i}") for i in range(n_top)]
    mid_iris = [_iri(f"theme/mid/{i}") for i in range(n_mid)]
    leaf_iris = [_iri(f"theme/leaf/{i}") for i in range(n_leaves)]
    genre_iris = [_iri(f"genre/{i}") for i in range(N_GENRES)]
    place_iris = [_iri(f"place/{i}") for i in range(N_PLACES)]
    region_iris = [_iri(f"region/{i}") for i in range(N_REGIONS)]
    country_iris = [_iri(f"country/{i}") for i in range(N_COUNTRIES)]
    audience_iris = [_iri(f"audience/{name}") for name in AUDIENCES]
    creator_iris = [_iri(f"creator/{i}") for i in range(n_creators)]
    illustrator_iris = [_iri(f"illustrator/{i}") for i in range(n_illustrators)]
    lang_literals = [f'"{code}"' for code in LANGUAGES]
    lang_cum = list(accumulate(LANGUAGE_WEIGHTS))
    lang_total = lang_cum[-1]
    audience_cum = list(accumulate(AUDIENCE_WEIGHTS))
    audience_total = audience_cum[-1]

    # Popularity rank == index (leaf 0 is the most common theme, genre 0 the most common genre).
    leaf_cum = _zipf_cum_weights(n_leaves, THEME_ZIPF_EXPONENT)
    leaf_total = leaf_cum[-1]
    genre_cum = _zipf_cum_weights(N_GENRES, GENRE_ZIPF_EXPONENT)
    genre_total = genre_cum[-1]
    place_cum = _zipf_cum_weights(N_PLACES, PLACE_ZIPF_EXPONENT)
    place_total = place_cum[-1]
    publisher_cum = _zipf_cum_weights(N_PUBLISHERS, PUBLISHER_ZIPF_EXPONENT)
    publisher_total = publisher_cum[-1]

    def zipf_leaf() -> int:
        return bisect.bisect_right(leaf_cum, rand() * leaf_total, 0, n_leaves - 1)

    def zipf_genre() -> int:
        return bisect.bisect_right(genre_cum, rand() * genre_total, 0, N_GENRES - 1)

    def zipf_place() -> int:
        return bisect.bisect_right(place_cum, rand() * place_total, 0, N_PLACES - 1)

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
            buf.append(f'{iri} {p_label} "Theme area {i}"@en .\n')
        mid_perm = list(range(n_mid))
        rng.shuffle(mid_perm)
        for pos, i in enumerate(mid_perm):
            iri = mid_iris[i]
            parent = top_iris[pos % n_top]
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Theme group {i}"@en .\n')
            buf.append(f"{iri} {p_broader} {parent} .\n")
        leaf_perm = list(range(n_leaves))
        rng.shuffle(leaf_perm)
        top_above_leaf = [0] * n_leaves
        top_above_mid = {i: pos % n_top for pos, i in enumerate(mid_perm)}
        for pos, i in enumerate(leaf_perm):
            iri = leaf_iris[i]
            parent = mid_iris[pos % n_mid]
            top_above_leaf[i] = top_above_mid[pos % n_mid]
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Theme {i}"@en .\n')
            buf.append(f"{iri} {p_broader} {parent} .\n")
        n_themes = n_top + n_mid + n_leaves
        triples += 2 * n_top + 3 * (n_mid + n_leaves)
        form_scheme = _iri("form/scheme")
        form_iris = [_iri(f"form/{i}") for i in range(len(FORM_HEADINGS))]
        for name, iri in zip(FORM_HEADINGS, form_iris, strict=True):
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "{name}"@en .\n')
            buf.append(f"{iri} {p_scheme} {form_scheme} .\n")
        triples += 3 * len(FORM_HEADINGS)
        flush()

        # --- genres, places, audiences -------------------------------------
        genre_scheme = _iri("genre/scheme")
        for i, iri in enumerate(genre_iris):
            buf.append(f"{iri} {a} {c_concept} .\n")
            buf.append(f'{iri} {p_label} "Genre {i}"@en .\n')
            buf.append(f"{iri} {p_scheme} {genre_scheme} .\n")
        triples += 3 * N_GENRES
        for i, iri in enumerate(country_iris):
            buf.append(f"{iri} {a} {c_place} .\n")
            buf.append(f'{iri} {p_name} "Country {i}"@en .\n')
        triples += 2 * N_COUNTRIES
        region_perm = list(range(N_REGIONS))
        rng.shuffle(region_perm)
        for pos, i in enumerate(region_perm):
            iri = region_iris[i]
            buf.append(f"{iri} {a} {c_place} .\n")
            buf.append(f'{iri} {p_name} "Region {i}"@en .\n')
            buf.append(f"{iri} {p_contained} {country_iris[pos % N_COUNTRIES]} .\n")
        triples += 3 * N_REGIONS
        place_perm = list(range(N_PLACES))
        rng.shuffle(place_perm)
        for pos, i in enumerate(place_perm):
            iri = place_iris[i]
            buf.append(f"{iri} {a} {c_place} .\n")
            buf.append(f'{iri} {p_name} "Place {i}"@en .\n')
            buf.append(f"{iri} {p_contained} {region_iris[pos % N_REGIONS]} .\n")
        triples += 3 * N_PLACES
        for name, iri in zip(AUDIENCES, audience_iris, strict=True):
            buf.append(f"{iri} {a} {c_audience} .\n")
            buf.append(f'{iri} {p_name} "{name.replace("-", " ")} readers"@en .\n')
            buf.append(f'{iri} {p_audience_type} "{name}" .\n')
        triples += 3 * len(AUDIENCES)
        flush()

        # --- creators ----------------------------------------------------
        signatures: list[tuple[int, ...]] = []
        home_genres: list[int] = []
        series_writers: list[bool] = []
        for i, iri in enumerate(creator_iris):
            size = 3 + randbelow(6)  # 3..8 signature themes
            sig: list[int] = []
            while len(sig) < size:
                t = zipf_leaf()
                if t not in sig:
                    sig.append(t)
            signatures.append(tuple(sig))
            home_genres.append(zipf_genre())
            series_writers.append(rand() < SERIES_AUTHOR_SHARE)
            born = 1850 + randbelow(150)
            buf.append(f"{iri} {a} {c_person} .\n")
            buf.append(f'{iri} {p_name} "Creator {i}" .\n')
            buf.append(f'{iri} {p_birth} "{born}-{1 + randbelow(12):02d}-01"{xsd_date} .\n')
            country = country_iris[randbelow(N_COUNTRIES)]
            buf.append(f"{iri} {p_nationality} {country} .\n")
            buf.append(f"{iri} {p_same_as} <https://authority.example/id/p{i}> .\n")
            triples += 5
            if len(buf) >= _BUFFER_LINES:
                flush()
        n_influence = int(n_creators * INFLUENCE_PER_CREATOR) if n_creators > 1 else 0
        for src in rng.sample(range(n_creators), n_influence):
            dst = randbelow(n_creators - 1)
            if dst >= src:
                dst += 1
            buf.append(f"{creator_iris[src]} {p_influenced} {creator_iris[dst]} .\n")
        triples += n_influence
        for i, iri in enumerate(illustrator_iris):
            buf.append(f"{iri} {a} {c_person} .\n")
            buf.append(f'{iri} {p_name} "Illustrator {i}" .\n')
        triples += 2 * n_illustrators
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
        #: author -> their series, and how many works each series has so far
        series_of: dict[int, str] = {}
        series_size: dict[str, int] = {}
        theme_counts: Counter[int] = Counter()
        heading_counts: Counter[str] = Counter()

        for w in range(works):
            iri = _iri(f"work/{w}")
            if w < n_creators:
                author = first_authors[w]
            else:
                author = productivity_rank[
                    bisect.bisect_right(creator_cum, rand() * creator_total, 0, last_creator)
                ]
            is_book = rand() < BOOK_SHARE
            lang = bisect.bisect_right(lang_cum, rand() * lang_total, 0, len(LANGUAGES) - 1)
            buf.append(f"{iri} {a} {c_book if is_book else c_movie} .\n")
            buf.append(f'{iri} {p_name} "Work {w}"@en .\n')
            buf.append(f"{iri} {p_author} {creator_iris[author]} .\n")
            triples += 3
            if lang and rand() < ALTERNATE_NAME_SHARE:
                buf.append(f'{iri} {p_alt} "{WORK_WORDS[lang]} {w}"@{LANGUAGES[lang]} .\n')
                triples += 1
            if n_creators > 1 and rand() < SECOND_AUTHOR_SHARE:
                co = randbelow(n_creators - 1)
                if co >= author:
                    co += 1
                buf.append(f"{iri} {p_author} {creator_iris[co]} .\n")
                triples += 1
            if is_book and rand() < ILLUSTRATED_BOOK_SHARE:
                illustrator = illustrator_iris[randbelow(n_illustrators)]
                buf.append(f"{iri} {p_illustrator} {illustrator} .\n")
                triples += 1

            n_about = 4 + randbelow(5)  # 4..8
            sig = signatures[author]
            chosen: list[int] = []
            while len(chosen) < n_about:
                t = sig[randbelow(len(sig))] if rand() < SIGNATURE_SHARE else zipf_leaf()
                if t not in chosen:
                    chosen.append(t)
            for t in chosen:
                buf.append(f"{iri} {p_about} {leaf_iris[t]} .\n")
            theme_counts.update(chosen)
            triples += n_about

            genres = [home_genres[author] if rand() < HOME_GENRE_SHARE else zipf_genre()]
            for extra in (0.6, 0.3):
                if rand() < extra:
                    g = zipf_genre()
                    if g not in genres:
                        genres.append(g)
            for g in genres:
                buf.append(f"{iri} {p_genre} {genre_iris[g]} .\n")
            triples += len(genres)

            places: list[int] = []
            for chance in (0.88, 0.45, 0.15):
                if rand() >= chance:
                    break
                place = zipf_place()
                if place not in places:
                    places.append(place)
            for place in places:
                buf.append(f"{iri} {p_location} {place_iris[place]} .\n")
            triples += len(places)

            audience = bisect.bisect_right(
                audience_cum, rand() * audience_total, 0, len(AUDIENCES) - 1
            )
            buf.append(f"{iri} {p_audience} {audience_iris[audience]} .\n")
            if is_book:
                headings = [form_iris[0] if rand() < FICTION_SHARE else form_iris[1]]
            else:
                headings = [form_iris[2] if rand() < FEATURE_FILM_SHARE else form_iris[3]]
            if AUDIENCES[audience] != "adult":
                headings.append(form_iris[4 if AUDIENCES[audience] == "children" else 5])
            if rand() < BROAD_HEADING_SHARE:
                headings.append(top_iris[top_above_leaf[chosen[0]]])
            for heading in headings:
                buf.append(f"{iri} {p_about} {heading} .\n")
            heading_counts.update(headings)
            triples += len(headings)
            kind = "novel" if is_book else "film"
            buf.append(
                f'{iri} {p_description} "A {kind} about theme {chosen[0]} and theme '
                f'{chosen[1]}, written for {AUDIENCES[audience]} readers."@en .\n'
            )
            year = int(rng.triangular(YEAR_MIN, YEAR_MAX + 1, YEAR_MODE))
            if year > YEAR_MAX:
                year = YEAR_MAX
            buf.append(f'{iri} {p_date} "{year}"{gyear} .\n')
            buf.append(f"{iri} {p_lang} {lang_literals[lang]} .\n")
            publisher = bisect.bisect_right(
                publisher_cum, rand() * publisher_total, 0, N_PUBLISHERS - 1
            )
            buf.append(f'{iri} {p_publisher} "Publisher {publisher}" .\n')
            if is_book:
                buf.append(f'{iri} {p_isbn} "978-1-{w // 1000:05d}-{w % 1000:03d}-0" .\n')
                buf.append(f'{iri} {p_pages} "{96 + randbelow(600)}"{xsd_integer} .\n')
                buf.append(f'{iri} {p_edition} "{EDITIONS[randbelow(len(EDITIONS))]}" .\n')
                triples += 1
            else:
                buf.append(f'{iri} {p_identifier} "film-{w}" .\n')
                buf.append(f'{iri} {p_duration} "PT{80 + randbelow(70)}M"{xsd_duration} .\n')
            buf.append(f"{iri} {p_url} {_iri(f'catalogue/record/{w}')} .\n")
            buf.append(f"{iri} {p_same_as} <https://authority.example/id/w{w}> .\n")
            triples += 9
            if rand() < SECOND_SAME_AS_SHARE:
                buf.append(f"{iri} {p_same_as} <https://union-catalogue.example/{w}> .\n")
                triples += 1

            if series_writers[author] and rand() < SERIES_SHARE / SERIES_AUTHOR_SHARE:
                series_iri = series_of.get(author)
                if series_iri is None:
                    number = len(series_of)
                    series_iri = series_of[author] = _iri(f"series/{number}")
                    series_class = c_book_series if is_book else c_movie_series
                    buf.append(f"{series_iri} {a} {series_class} .\n")
                    buf.append(f'{series_iri} {p_name} "Series {number}"@en .\n')
                    triples += 2
                series_size[series_iri] = series_size.get(series_iri, 0) + 1
                buf.append(f"{iri} {p_part_of} {series_iri} .\n")
                buf.append(f'{iri} {p_position} "{series_size[series_iri]}"{xsd_integer} .\n')
                triples += 2

            if w > 0 and rand() < IS_BASED_ON_SHARE:
                buf.append(f"{iri} {p_based} {_iri(f'work/{randbelow(w)}')} .\n")
                triples += 1

            if len(buf) >= _BUFFER_LINES:
                flush()
        flush()

    top_theme = theme_counts.most_common(1)[0][1] if theme_counts else 0
    heading_counts.update({leaf_iris[t]: n for t, n in theme_counts.items()})
    top_heading = heading_counts.most_common(1)[0][1] if heading_counts else 0
    return SyntheticStats(
        works=works,
        creators=n_creators,
        themes=n_themes,
        triples=triples,
        genres=N_GENRES,
        places=N_PLACES + N_REGIONS + N_COUNTRIES,
        series=len(series_of),
        top_theme_works=top_theme,
        top_heading_works=top_heading,
    )


def theme_shares(path: Path, top: int = 10) -> list[tuple[str, float]]:
    """The ``top`` most common ``schema:about`` values of a written file and their share of
    works (for checking the skew; reads the file line by line)."""
    about = f"<{SCHEMA}about>"
    kinds = {f"<{SCHEMA}Book>", f"<{SCHEMA}Movie>"}
    counts: Counter[str] = Counter()
    works = 0
    with Path(path).open(encoding="utf-8") as lines:
        for line in lines:
            _s, p, rest = line.split(" ", 2)
            if p == about:
                counts[rest[:-3]] += 1
            elif p == RDF_TYPE and rest[:-3] in kinds:
                works += 1
    return [(value, n / max(1, works)) for value, n in counts.most_common(top)]


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
        f"({stats.triples / stats.works:.1f} per work; {stats.works} works, "
        f"{stats.creators} creators, {stats.themes} themes, {stats.series} series) "
        f"in {elapsed:.2f} s; most common theme on "
        f"{100 * stats.top_theme_works / stats.works:.1f} % of works"
    )
    return 0


if __name__ == "__main__":
    sys.exit(main())
