#!/usr/bin/env python3
"""Check the generated Hollinmere demo collection (needs pyoxigraph and rdflib).

Loads every Turtle file with both libraries, prints summary counts, theme
frequencies, duplicate-title and coverage checks, and the nearest works (by
shared schema:about themes) of a few showcase seeds.

Usage:  python demo_collection/verify.py [SEED_WORK_SLUG ...]
"""
from __future__ import annotations

import os
import sys
from collections import Counter, defaultdict

import pyoxigraph as ox
import rdflib

HERE = os.path.dirname(os.path.abspath(__file__))
FILES = ["vocab.ttl", "themes.ttl", "places.ttl", "people.ttl", "works.ttl"]
S = "https://schema.org/"
HM = "https://hollinmere.example/vocab#"
SKOS = "http://www.w3.org/2004/02/skos/core#"
RDF_TYPE = "http://www.w3.org/1999/02/22-rdf-syntax-ns#type"
WORK = "https://hollinmere.example/work/"
DEFAULT_SEEDS = [  # the showcase seeds described in README.md
    "the-letter-writer-of-hollinmere",
    "the-mirror-of-gullstane",
    "thessalys-heron",
    "mercy-and-the-lantern-ghost",
    "het-wisselkind-van-coldharrow",
    "el-boticario-de-almendrilla",
]


def short(iri):
    return iri.rsplit("/", 1)[-1].rsplit("#", 1)[-1]


def main(argv):
    store = ox.Store()
    total_rdflib = 0
    for f in FILES:
        path = os.path.join(HERE, f)
        one = ox.Store()
        one.load(path=path, format=ox.RdfFormat.TURTLE)
        store.load(path=path, format=ox.RdfFormat.TURTLE)
        g = rdflib.Graph()
        g.parse(path, format="turtle")
        total_rdflib += len(g)
        print(f"{f:12s} pyoxigraph {len(one):6d} triples   rdflib {len(g):6d} triples")
        assert len(one) == len(g), f"{f}: libraries disagree"
    print(f"{'all':12s} pyoxigraph {len(store):6d} triples   rdflib {total_rdflib:6d} triples\n")

    def q(sparql):
        return list(store.query(sparql))

    prefix = f"PREFIX schema: <{S}> PREFIX hm: <{HM}> PREFIX skos: <{SKOS}> "
    kinds = {short(r["c"].value): int(r["n"].value) for r in q(prefix + """
        SELECT ?c (COUNT(?w) AS ?n) WHERE { ?w a ?c FILTER(STRSTARTS(STR(?c), STR(hm:))) } GROUP BY ?c""")}
    works = [r["w"].value for r in q(prefix + "SELECT DISTINCT ?w WHERE { ?w schema:datePublished ?y }")]
    print("works", len(works), "by kind", kinds)
    n_people = q(prefix + "SELECT (COUNT(?p) AS ?n) WHERE { ?p a schema:Person }")[0]["n"].value
    creators = q(prefix + """SELECT (COUNT(DISTINCT ?p) AS ?n) WHERE {
        ?w schema:author|schema:director|schema:readBy|schema:illustrator ?p }""")[0]["n"].value
    print("people", n_people, "credited creators", creators)

    # per-work facts
    facts = defaultdict(lambda: defaultdict(list))
    for r in q(prefix + "SELECT ?w ?p ?o WHERE { ?w schema:datePublished ?y . ?w ?p ?o }"):
        o = r["o"]
        facts[r["w"].value][r["p"].value].append(o)
    level = {}
    for r in q(prefix + "SELECT ?c WHERE { ?c skos:topConceptOf <https://hollinmere.example/theme/scheme> }"):
        level[r["c"].value] = 1
    for _ in range(2):
        for r in q(prefix + "SELECT ?c ?b WHERE { ?c skos:broader ?b }"):
            if r["b"].value in level:
                level[r["c"].value] = level[r["b"].value] + 1
    print("theme concepts per level", dict(sorted(Counter(level.values()).items())))

    decades, langs, auds, theme_count = Counter(), Counter(), Counter(), Counter()
    problems = []
    titles = defaultdict(list)
    for w, f in facts.items():
        year = int(f[S + "datePublished"][0].value)
        decades[year // 10 * 10] += 1
        langs[f[S + "inLanguage"][0].value] += 1
        auds[short(f[S + "audience"][0].value) if f[S + "audience"] else "(none)"] += 1
        about = [t.value for t in f[S + "about"]]
        if not 2 <= len(about) <= 5:
            problems.append(f"{short(w)} has {len(about)} themes")
        if len(f[S + "genre"]) != 1:
            problems.append(f"{short(w)} has {len(f[S + 'genre'])} genres")
        kind_types = [t.value for t in f[RDF_TYPE] if t.value.startswith(HM)]
        if len(kind_types) != 1:
            problems.append(f"{short(w)} has kinds {kind_types}")
        if not (f[S + "author"] or f[S + "director"] or f[S + "readBy"]):
            problems.append(f"{short(w)} has no creator")
        for t in about:
            theme_count[t] += 1
        for name in f[S + "name"]:
            titles[(name.language, name.value)].append(short(w))
    print("decades", dict(sorted(decades.items())))
    missing = [d for d in range(1850, 2030, 10) if not decades[d]]
    print("decades without works:", missing or "none")
    print("languages", dict(langs.most_common()))
    print("audiences", dict(auds.most_common()))
    no_place = [short(w) for w, f in facts.items() if not f[S + "contentLocation"]]
    print("works without contentLocation:", no_place)
    print("works without audience:", [short(w) for w, f in facts.items() if not f[S + "audience"]])
    dups = {k: v for k, v in titles.items() if len(v) > 1}
    print("duplicate (language, title) pairs:", dups or "none")
    print("structural problems:", problems or "none")

    used_by_level = Counter(level.get(t, 0) for t in theme_count)
    assign_by_level = Counter()
    for t, n in theme_count.items():
        assign_by_level[level.get(t, 0)] += n
    print("distinct themes used per level", dict(sorted(used_by_level.items())),
          "; assignments per level", dict(sorted(assign_by_level.items())))
    thirds = sorted(((n, short(t)) for t, n in theme_count.items() if level.get(t) == 3), reverse=True)
    unused = [short(c) for c, lvl in level.items() if lvl == 3 and c not in theme_count]
    print("third-level theme frequency (most common first):")
    print("   ", ", ".join(f"{t} {n}" for n, t in thirds))
    print("    unused third-level:", unused or "none")
    print(f"    >=40 works: {sum(1 for n, _ in thirds if n >= 40)}; 3-5 works: {sum(1 for n, _ in thirds if 3 <= n <= 5)}; "
          f"<3: {sum(1 for n, _ in thirds if n < 3)}")

    based = q(prefix + "SELECT ?a ?s WHERE { ?a schema:isBasedOn ?s }")
    by_kind = Counter(short(next(t.value for t in facts[r['a'].value][RDF_TYPE] if t.value.startswith(HM))) for r in based)
    print("adaptations (schema:isBasedOn)", len(based), dict(by_kind))
    # adaptation sanity: later year, different creator
    bad = []
    for r in based:
        a, s = facts[r["a"].value], facts[r["s"].value]
        if int(a[S + "datePublished"][0].value) <= int(s[S + "datePublished"][0].value):
            bad.append(short(r["a"].value) + " not later")
        if a[S + "director"] and a[S + "director"][0] in s[S + "author"]:
            bad.append(short(r["a"].value) + " same creator")
    print("adaptation problems:", bad or "none")
    for name, pred in [("influence edges", "hm:influencedBy"), ("collaboration edges", "hm:collaboratedWith"),
                       ("sequel links", "hm:sequelOf"), ("series memberships", "schema:isPartOf")]:
        print(name, q(prefix + f"SELECT (COUNT(*) AS ?n) WHERE {{ ?a {pred} ?b }}")[0]["n"].value)
    bad_infl = q(prefix + """
        SELECT ?a ?b ?x ?y WHERE { ?a hm:influencedBy ?b . ?a schema:birthDate ?x . ?b schema:birthDate ?y }""")
    wrong = [(short(r["a"].value), short(r["b"].value)) for r in bad_infl
             if int(r["x"].value) <= int(r["y"].value)]
    print("influence edges pointing to a younger person:", wrong or "none")
    series = q(prefix + "SELECT ?s (COUNT(?w) AS ?n) WHERE { ?w schema:isPartOf ?s } GROUP BY ?s ORDER BY ?s")
    print("series sizes", {short(r["s"].value): int(r["n"].value) for r in series})
    places = q(prefix + "SELECT (COUNT(?p) AS ?n) WHERE { ?p a schema:Place }")[0]["n"].value
    print("places", places)

    # nearest works by shared themes
    seeds = argv[1:] or DEFAULT_SEEDS
    about = {w: {t.value for t in f[S + "about"]} for w, f in facts.items()}

    def label(w):
        f = facts[w]
        en = next(n.value for n in f[S + "name"] if n.language == "en")
        who = (f[S + "author"] or f[S + "director"] or f[S + "readBy"])[0].value
        kind = short(next(t.value for t in f[RDF_TYPE] if t.value.startswith(HM)))
        return f"{en} [{kind}, {f[S + 'datePublished'][0].value}, {f[S + 'inLanguage'][0].value}, {short(who)}]"

    for seed in seeds:
        w = WORK + seed
        print(f"\nSEED {label(w)}\n    themes: {', '.join(short(t) for t in sorted(about[w]))}")
        ranked = sorted((w2 for w2 in about if w2 != w), key=lambda w2: (-len(about[w] & about[w2]), w2))[:10]
        people, decs = set(), set()
        for w2 in ranked:
            f = facts[w2]
            people.add((f[S + "author"] or f[S + "director"] or f[S + "readBy"])[0].value)
            decs.add(int(f[S + "datePublished"][0].value) // 10 * 10)
            print(f"    {len(about[w] & about[w2])} shared  {label(w2)}")
        print(f"    -> {len(people)} distinct creators, {len(decs)} decades")


if __name__ == "__main__":
    main(sys.argv)
