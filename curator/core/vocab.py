"""IRIs of the open vocabularies curator knows by name, declared once.

A :class:`Namespace` refuses a term it was not told about, so a misspelt term fails at import
rather than silently matching nothing.
"""

from __future__ import annotations

from typing import NewType

IRI = NewType("IRI", str)


class Namespace:
    """A fixed set of terms under one base IRI; ``NS.term`` gives the full IRI."""

    def __init__(self, base: str, terms: str) -> None:
        self._base = base
        self._terms = frozenset(terms.split())

    def __getattr__(self, name: str) -> IRI:
        if name.startswith("_"):
            raise AttributeError(name)
        if name not in self._terms:
            raise AttributeError(f"{self._base} has no term {name!r} known to curator")
        return IRI(self._base + name)

    def __getitem__(self, name: str) -> IRI:
        return self.__getattr__(name)

    @property
    def base(self) -> str:
        return self._base

    def rebased(self, base: str) -> Namespace:
        """The same terms under another base (schema.org is published under http and https)."""
        return Namespace(base, " ".join(sorted(self._terms)))


RDF = Namespace("http://www.w3.org/1999/02/22-rdf-syntax-ns#", "type Property")
RDFS = Namespace(
    "http://www.w3.org/2000/01/rdf-schema#", "label subClassOf subPropertyOf Class comment"
)
OWL = Namespace("http://www.w3.org/2002/07/owl#", "Class ObjectProperty sameAs Thing")
SKOS = Namespace(
    "http://www.w3.org/2004/02/skos/core#",
    "Concept ConceptScheme prefLabel altLabel broader narrower inScheme topConceptOf related "
    "hasTopConcept",
)
SCHEMA = Namespace(
    "https://schema.org/",
    "name alternateName headline author creator director illustrator readBy actor contributor "
    "about genre keywords contentLocation locationCreated spatialCoverage datePublished "
    "dateCreated copyrightYear inLanguage audience typicalAgeRange isBasedOn sequel isPartOf "
    "hasPart workExample exampleOfWork translationOfWork description CreativeWork Book Movie "
    "Audiobook Person Organization Place Audience ItemList ListItem position item "
    "CreativeWorkSeries BookSeries MovieSeries Collection containedInPlace sameAs url "
    "identifier numberOfItems itemListElement itemListOrder",
)
SCHEMA_HTTP = SCHEMA.rebased("http://schema.org/")
DCTERMS = Namespace(
    "http://purl.org/dc/terms/",
    "title creator contributor subject date issued created language audience spatial temporal "
    "isVersionOf hasVersion relation isPartOf hasPart references source type "
    "BibliographicResource description",
)
DC = Namespace(
    "http://purl.org/dc/elements/1.1/", "title creator contributor subject date language type"
)
DCMITYPE = Namespace(
    "http://purl.org/dc/dcmitype/", "Text MovingImage Sound Image StillImage InteractiveResource"
)
FOAF = Namespace("http://xmlns.com/foaf/0.1/", "Person Agent Organization name")
BF = Namespace(
    "http://id.loc.gov/ontologies/bibframe/",
    "Work Instance Item Text MovingImage Audio NotatedMusic Cartography StillImage title "
    "mainTitle Title subject genreForm contribution agent role language instanceOf hasInstance "
    "provisionActivity date originDate relatedTo translationOf intendedAudience Person "
    "Organization Agent Contribution",
)
XSD = Namespace("http://www.w3.org/2001/XMLSchema#", "gYear date dateTime integer string")
