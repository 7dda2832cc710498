"""Writing a publication as HTML, Markdown, CSV, JSON-LD or Turtle, ready to hand out.

Everything that comes from the data or from the curator is escaped for its format: a title
``<script>`` prints as text in HTML, Markdown keeps its punctuation literal, and a CSV cell that
a spreadsheet would run as a formula (starting with ``=``, ``+``, ``-``, ``@``, tab or carriage
return; the OWASP guidance on CSV injection) is prefixed with an apostrophe. The linked-data
exports describe the list as a schema.org ``ItemList`` of ``ListItem``s with ``position`` and
``description``, so a catalogue can take it back. A work known only as a blank node (``_:id``)
or by something that is not an IRI is written as a blank node, with its title, rather than
refused.
"""

from __future__ import annotations

import csv
import html
import io
import json
import re
import uuid
from collections.abc import Callable
from pathlib import Path
from typing import Literal

import pyoxigraph as ox

from curator.core.files import write_bytes_atomically
from curator.core.publication import Publication, PublishedEntry
from curator.core.vocab import RDF, SCHEMA, XSD

ExportFormat = Literal["html", "md", "csv", "jsonld", "ttl"]
EXPORT_FORMATS: tuple[str, ...] = ("html", "md", "csv", "jsonld", "ttl", "pdf")

_INTEGER = ox.NamedNode(XSD.integer)
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def list_iri(publication: Publication) -> str:
    """A stable IRI for the list when it has none of its own (a name-based UUID URN)."""
    return "urn:uuid:" + str(uuid.uuid5(uuid.NAMESPACE_URL, "curator-list:" + publication.title))


def _creators_year(entry: PublishedEntry) -> str:
    parts = [", ".join(entry.creators)] if entry.creators else []
    if entry.year is not None:
        parts.append(str(entry.year))
    if entry.kind:
        parts.append(entry.kind)
    return " · ".join(parts)


# ----- HTML --------------------------------------------------------------------------------

_CSS = """
body { font-family: Georgia, 'Times New Roman', serif; max-width: 46em; margin: 2em auto;
       padding: 0 1em; line-height: 1.45; color: #222; }
h1 { font-size: 1.9em; margin-bottom: 0.2em; }
.intro { font-style: italic; margin-top: 0; }
ol.entries { padding-left: 1.6em; }
ol.entries li { margin-bottom: 0.9em; break-inside: avoid; }
.title { font-weight: bold; }
.meta { color: #555; font-size: 0.92em; }
.why { margin: 0.15em 0; }
.note { margin: 0.15em 0; font-size: 0.95em; }
.flag { color: #8a3b12; font-size: 0.9em; }
section.balance { margin-top: 2em; border-top: 1px solid #bbb; }
table { border-collapse: collapse; font-size: 0.9em; }
td, th { padding: 0.15em 0.6em; text-align: left; vertical-align: top; }
.met { color: #2d6a2d; } .unmet { color: #8a3b12; }
figure svg { max-width: 100%; height: auto; }
@media print { body { margin: 0; max-width: none; } a { color: inherit; text-decoration: none; }
               section.balance { break-before: page; } }
"""


def to_html(publication: Publication, *, chart_svg: str | None = None) -> str:
    """A standalone, printable page: title, introduction, entries, then the balance summary."""
    e = html.escape
    out = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        f"<title>{e(publication.title)}</title>",
        f"<style>{_CSS}</style></head><body>",
        f"<h1>{e(publication.title)}</h1>",
        f'<p class="intro">{e(publication.introduction)}</p>',
        '<ol class="entries">',
    ]
    for entry in publication.entries:
        out.append("<li>")
        out.append(f'<span class="title">{e(entry.title)}</span>')
        meta = _creators_year(entry)
        if meta:
            out.append(f' <span class="meta">— {e(meta)}</span>')
        if entry.rationale:
            out.append(f'<p class="why">{e(entry.rationale)}</p>')
        if entry.note:
            out.append(f'<p class="note"><em>Note:</em> {e(entry.note)}</p>')
        if entry.audience_flag:
            out.append(f'<p class="flag">Check suitability: {e(entry.audience_flag)}.</p>')
        out.append("</li>")
    out.append("</ol>")
    out.extend(_html_balance(publication, chart_svg))
    out.append("</body></html>")
    return "\n".join(out) + "\n"


def _html_balance(publication: Publication, chart_svg: str | None) -> list[str]:
    e = html.escape
    audit = publication.audit
    if audit is None:
        return []
    out = ['<section class="balance">', "<h2>Balance</h2>", "<table>"]
    out.append("<tr><th>Facet</th><th>Largest share</th><th>Values</th><th>Evenness</th></tr>")
    for facet in audit.facets:
        largest = facet.largest
        if largest is None:
            continue
        evenness = f"{facet.diversity.pielou:.2f}" if facet.diversity.pielou is not None else "—"
        out.append(
            f"<tr><td>{e(facet.name)}</td><td>{e(largest.label)} ({largest.share:.0%})</td>"
            f"<td>{facet.diversity.values}</td><td>{evenness}</td></tr>"
        )
    out.append("</table>")
    if audit.intra_list_diversity is not None:
        out.append(
            f"<p>Variety between entries: {audit.intra_list_diversity:.2f} "
            "(0 = all alike, 1 = nothing shared).</p>"
        )
    if publication.targets:
        out.append("<h3>Targets</h3><ul>")
        for t in publication.targets:
            state = "met" if t.met else "unmet"
            gap = f" — {e(t.gap)}" if t.gap else ""
            out.append(f'<li class="{state}">{e(t.description)}: {state}{gap}</li>')
        out.append("</ul>")
    if publication.warnings:
        out.append("<h3>Worth a look</h3><ul>")
        out.extend(f"<li>{e(w)}</li>" for w in publication.warnings)
        out.append("</ul>")
    if publication.suitability_note:
        out.append(f"<p><em>{e(publication.suitability_note)}</em></p>")
    if chart_svg:
        # matplotlib draws text as paths, so the SVG carries no text from the data.
        out.append(f'<figure aria-label="Balance charts">{chart_svg}</figure>')
    out.append("</section>")
    return out


# ----- Markdown ----------------------------------------------------------------------------

_MD_SPECIAL = re.compile(r"([\\`*_{}\[\]()#+\-.!|>~])")


def _md(text: str) -> str:
    """Markdown-escaped text, with ``<`` and ``&`` as entities so no HTML slips through."""
    text = text.replace("&", "&amp;").replace("<", "&lt;")
    return _MD_SPECIAL.sub(r"\\\1", " ".join(text.split()))


def to_markdown(publication: Publication) -> str:
    out = [f"# {_md(publication.title)}", "", f"*{_md(publication.introduction)}*", ""]
    for entry in publication.entries:
        meta = _creators_year(entry)
        line = f"{entry.position}\\. **{_md(entry.title)}**"
        if meta:
            line += f" — {_md(meta)}"
        out.append(line)
        if entry.rationale:
            out.append(f"   {_md(entry.rationale)}")
        if entry.note:
            out.append(f"   *Note:* {_md(entry.note)}")
        if entry.audience_flag:
            out.append(f"   *Check suitability:* {_md(entry.audience_flag)}")
        out.append("")
    if publication.audit is not None:
        out += ["## Balance", ""]
        for facet in publication.audit.facets:
            if facet.largest is not None:
                out.append(
                    f"- {_md(facet.name)}: {facet.diversity.values} values, largest "
                    f"{_md(facet.largest.label)} ({facet.largest.share:.0%})"
                )
        for t in publication.targets:
            gap = f" — {_md(t.gap)}" if t.gap else ""
            out.append(f"- Target {_md(t.description)}: {'met' if t.met else 'not met'}{gap}")
        out += [f"- {_md(w)}" for w in publication.warnings]
        if publication.suitability_note:
            out += ["", f"*{_md(publication.suitability_note)}*"]
    return "\n".join(out).rstrip() + "\n"


# ----- CSV ---------------------------------------------------------------------------------


def neutralise_cell(value: str) -> str:
    """A cell a spreadsheet will show as text rather than run as a formula."""
    return "'" + value if value.startswith(_FORMULA_START) else value


def to_csv(publication: Publication) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\r\n")
    writer.writerow(["position", "title", "creators", "year", "kind", "rationale", "note", "iri"])
    for entry in publication.entries:
        writer.writerow(
            [
                str(entry.position),
                neutralise_cell(entry.title),
                neutralise_cell("; ".join(entry.creators)),
                "" if entry.year is None else neutralise_cell(str(entry.year)),
                neutralise_cell(entry.kind),
                neutralise_cell(entry.rationale),
                neutralise_cell(entry.note),
                neutralise_cell(entry.iri),
            ]
        )
    return buffer.getvalue()


# ----- linked data ---------------------------------------------------------------------------


def _description(entry: PublishedEntry) -> str:
    return entry.rationale + (f" Note: {entry.note}" if entry.note else "")


def _work_node(iri: str) -> ox.NamedNode | ox.BlankNode:
    """The node of a listed work: its IRI, or a blank node when it has no usable IRI (a work
    that is a blank node in the catalogue, or an entry whose IRI is malformed)."""
    if iri.startswith("_:"):
        try:
            return ox.BlankNode(iri[2:])
        except ValueError:
            return ox.BlankNode()
    try:
        return ox.NamedNode(iri)
    except ValueError:
        return ox.BlankNode()


def _jsonld_id(iri: str) -> dict[str, str]:
    """``{"@id": iri}`` when the IRI (or blank node label) reads back as the same node."""
    node = _work_node(iri)
    if isinstance(node, ox.NamedNode):
        return {"@id": node.value}
    return {"@id": "_:" + node.value} if iri.startswith("_:") and iri[2:] == node.value else {}


def item_list_triples(publication: Publication, iri: str | None = None) -> list[ox.Triple]:
    """The list as schema.org ItemList / ListItem triples."""
    node = ox.NamedNode(iri or list_iri(publication))

    def p(name: str) -> ox.NamedNode:
        return ox.NamedNode(SCHEMA[name])

    triples = [
        ox.Triple(node, ox.NamedNode(RDF.type), p("ItemList")),
        ox.Triple(node, p("name"), ox.Literal(publication.title)),
        ox.Triple(
            node,
            p("numberOfItems"),
            ox.Literal(
                str(len(publication.entries)),
                datatype=_INTEGER,
            ),
        ),
    ]
    for entry in publication.entries:
        item = ox.NamedNode(f"{node.value}#item-{entry.position}")
        work = _work_node(entry.iri)
        triples += [
            ox.Triple(node, p("itemListElement"), item),
            ox.Triple(item, ox.NamedNode(RDF.type), p("ListItem")),
            ox.Triple(
                item,
                p("position"),
                ox.Literal(
                    str(entry.position),
                    datatype=_INTEGER,
                ),
            ),
            ox.Triple(item, p("item"), work),
            ox.Triple(work, p("name"), ox.Literal(entry.title)),
        ]
        if _description(entry):
            triples.append(ox.Triple(item, p("description"), ox.Literal(_description(entry))))
    return triples


def to_turtle(publication: Publication, iri: str | None = None) -> str:
    data = ox.serialize(
        item_list_triples(publication, iri),
        format=ox.RdfFormat.TURTLE,
        prefixes={"schema": SCHEMA.base},
    )
    return data.decode("utf-8") if isinstance(data, bytes) else str(data)


def to_jsonld(publication: Publication, iri: str | None = None) -> str:
    """JSON-LD with an inline context, so reading it back needs no network."""
    node = iri or list_iri(publication)
    document = {
        "@context": {"@vocab": SCHEMA.base},
        "@id": node,
        "@type": "ItemList",
        "name": publication.title,
        "numberOfItems": len(publication.entries),
        "itemListElement": [
            {
                "@id": f"{node}#item-{entry.position}",
                "@type": "ListItem",
                "position": entry.position,
                **({"description": _description(entry)} if _description(entry) else {}),
                "item": {**_jsonld_id(entry.iri), "name": entry.title},
            }
            for entry in publication.entries
        ],
    }
    return json.dumps(document, ensure_ascii=False, indent=2) + "\n"


WRITERS: dict[str, Callable[[Publication], str]] = {
    "md": to_markdown,
    "csv": to_csv,
    "jsonld": to_jsonld,
    "ttl": to_turtle,
}


def write_export(
    publication: Publication, fmt: str, path: Path, *, chart_svg: str | None = None
) -> None:
    """Write one format to ``path`` atomically (never a half-written file). PDF is written by
    :mod:`curator.publish.pdf`, which needs Qt."""
    if fmt == "html":
        text = to_html(publication, chart_svg=chart_svg)
    elif fmt in WRITERS:
        text = WRITERS[fmt](publication)
    else:
        raise ValueError(f"unknown export format {fmt!r}")
    write_bytes_atomically(Path(path), text.encode("utf-8"))
