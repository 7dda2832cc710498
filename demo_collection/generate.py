#!/usr/bin/env python3
"""Generate the Hollinmere demo collection: an invented RDF catalogue (Turtle).

Everything here is made up: the town of Hollinmere, its districts and
neighbouring regions, every person, title, series and description.  The
vocabulary is hand-picked; the only randomness is ``random.Random(20261201)``
and every loop runs over lists or insertion-ordered dicts, so two runs write
byte-identical files.  Standard library only.

Usage:  python demo_collection/generate.py [OUTPUT_DIR]   (default: this folder)
"""
from __future__ import annotations

import os
import random
import re
import sys
import unicodedata
from collections import Counter, defaultdict
from typing import ClassVar

SEED = 20261201
LAST_YEAR = 2025
LANGS = ["en", "fr", "de", "es", "it", "nl"]

# --------------------------------------------------------------------------
# Theme scheme: 6 top concepts > 21 second-level > 63 third-level.
# Third level: (slug, en label, fr label or None, popularity,
#               verb phrase, noun phrase, adult_only)
# The verb phrase follows a protagonist's name; the noun phrase follows "amid".
# --------------------------------------------------------------------------
THEMES = [
    ("society-and-power", "Society and Power", "Société et pouvoir", [
        ("class-and-labour", "Class and Labour", "Classes et travail", [
            ("mill-strikes", "Mill strikes", "Grèves d'usine", 1.5,
             "organises a strike at the flax mill", "a bitter strike at the flax mill", False),
            ("servants-and-masters", "Servants and masters", "Domestiques et maîtres", 4,
             "enters service in a house full of locked rooms",
             "the quiet war between a household and its servants", False),
            ("debt-and-poverty", "Debt and poverty", None, 2.5,
             "tries to pay off a debt that keeps growing", "a winter of debt and empty cupboards", False),
        ]),
        ("politics-and-protest", "Politics and Protest", "Politique et contestation", [
            ("rival-candidates", "Rival candidates", None, 0.8,
             "stands against a powerful rival for the town council", "an election fought street by street", False),
            ("censorship", "Censorship", "Censure", 0.4,
             "smuggles forbidden pamphlets past the censors", "a newspaper fighting the censor's pencil", False),
            ("civic-uprising", "Civic uprising", "Soulèvement civique", 1.5,
             "is swept up in a night of barricades", "a town rising against its governors", False),
        ]),
        ("law-and-justice", "Law and Justice", "Loi et justice", [
            ("wrongful-accusation", "Wrongful accusation", "Fausse accusation", 6,
             "is accused of a crime nobody saw", "a verdict that everyone knows is wrong", False),
            ("trials-and-testimony", "Trials and testimony", None, 2.5,
             "must testify at a trial that divides the town", "a trial that divides the town", True),
            ("smugglers", "Smugglers", "Contrebandiers", 4,
             "falls in with smugglers working the night tides", "smugglers working the night tides", False),
        ]),
        ("money-and-trade", "Money and Trade", None, [
            ("inheritance-disputes", "Inheritance disputes", "Querelles d'héritage", 6,
             "contests a will that leaves everything to a stranger",
             "a will that leaves everything to a stranger", False),
            ("market-days", "Market days", None, 0.8,
             "runs a stall through one turbulent market season", "the noise and bargaining of market day", False),
            ("shipping-fortunes", "Shipping fortunes", None, 1.5,
             "gambles the family fortune on a single cargo", "a fortune riding on a single cargo", False),
        ]),
    ]),
    ("nature-and-landscape", "Nature and Landscape", "Nature et paysage", [
        ("water-and-coast", "Water and Coast", "Eau et littoral", [
            ("floods", "Floods", "Inondations", 2.5,
             "waits out the year the river broke its banks", "the year the river broke its banks", False),
            ("lighthouses", "Lighthouses", "Phares", 4,
             "keeps a failing lighthouse burning through a season of wrecks",
             "a lighthouse that must not go dark", False),
            ("fishing-life", "Fishing life", None, 2.5,
             "joins the herring boats for one hard season", "the hard rhythm of the herring boats", False),
        ]),
        ("forest-and-wild", "Forest and Wild", None, [
            ("old-woods", "Old woods", "Vieilles forêts", 6,
             "gets lost in a wood older than the town", "a wood older than the town", False),
            ("foraging", "Foraging", None, 0.4,
             "learns which mushrooms heal and which kill", "the secret knowledge of foragers", False),
            ("wolves", "Wolves", "Loups", 1.5,
             "tracks the wolf that has returned to the hills", "a wolf returned to the hills", False),
        ]),
        ("weather-and-seasons", "Weather and Seasons", "Climat et saisons", [
            ("long-winters", "Long winters", "Longs hivers", 4,
             "survives a winter that will not end", "a winter that will not end", False),
            ("harvest", "Harvest", "Moisson", 1.5,
             "brings in a harvest against the coming storms", "a harvest racing the storms", False),
            ("drought", "Drought", None, 0.4,
             "searches for water in the summer the wells ran dry", "the summer the wells ran dry", False),
        ]),
        ("animals", "Animals", "Animaux", [
            ("horses", "Horses", "Chevaux", 2.5,
             "trains a half-wild horse nobody else can ride", "a half-wild horse nobody else can ride", False),
            ("birds", "Birds and birdwatching", None, 0.8,
             "counts the migrating cranes from a marsh hide", "the great autumn migration of cranes", False),
            ("loyal-dogs", "Loyal dogs", "Chiens fidèles", 4,
             "follows a stray dog across three parishes", "a stray dog that will not leave", False),
        ]),
    ]),
    ("inner-life", "Inner Life", "Vie intérieure", [
        ("grief-and-memory", "Grief and Memory", "Deuil et mémoire", [
            ("mourning", "Mourning", "Deuil", 10,
             "clears out the house of a drowned brother", "a family learning to mourn", False),
            ("lost-childhood", "Lost childhood", None, 4,
             "returns to the streets of a vanished childhood", "the streets of a vanished childhood", False),
            ("forgetting", "Memory and forgetting", "Mémoire et oubli", 2.5,
             "wakes with no memory of the previous year", "a year nobody can remember", False),
        ]),
        ("love-and-desire", "Love and Desire", "Amour et désir", [
            ("first-love", "First love", "Premier amour", 10,
             "falls in love for the first time during the summer fair", "a first love at the summer fair", False),
            ("forbidden-love", "Forbidden love", None, 4,
             "hides a love affair from two feuding families", "a love two families forbid", True),
            ("marriage-of-convenience", "Marriage of convenience", "Mariage de convenance", 1.5,
             "agrees to a marriage arranged to save a failing business",
             "a marriage arranged to save a business", True),
        ]),
        ("identity-and-self", "Identity and Self", None, [
            ("double-lives", "Double lives", "Doubles vies", 4,
             "lives two lives under two names", "a life lived under two names", False),
            ("coming-of-age", "Coming of age", "Passage à l'âge adulte", 10,
             "leaves home for the first time", "the last summer before growing up", False),
            ("exile-and-return", "Exile and return", None, 2.5,
             "comes back after twenty years in exile", "a homecoming after twenty years away", False),
        ]),
    ]),
    ("family-and-community", "Family and Community", "Famille et communauté", [
        ("family-ties", "Family Ties", "Liens familiaux", [
            ("sibling-rivalry", "Sibling rivalry", "Rivalité fraternelle", 4,
             "competes with a twin for their father's boatyard",
             "two siblings competing for a father's boatyard", False),
            ("absent-parents", "Absent parents", None, 6,
             "searches for a mother who left without a word", "a parent who left without a word", False),
            ("grandparents", "Grandparents", "Grands-parents", 2.5,
             "spends a long summer with a difficult grandmother",
             "a long summer with a difficult grandmother", False),
        ]),
        ("neighbours-and-community", "Neighbours and Community", None, [
            ("village-gossip", "Village gossip", "Commérages de village", 6,
             "becomes the subject of every rumour in the village", "rumours passed from doorstep to doorstep", False),
            ("festivals", "Festivals", "Fêtes", 1.5,
             "prepares the lantern procession for the midsummer festival",
             "the preparations for the midsummer festival", False),
            ("newcomers", "Newcomers and outsiders", None, 4,
             "arrives as a stranger in a closed community", "a stranger arriving in a closed community", False),
        ]),
        ("friendship", "Friendship", "Amitié", [
            ("unlikely-friendship", "Unlikely friendship", "Amitié improbable", 6,
             "befriends the recluse everyone else avoids", "an unlikely friendship with a recluse", False),
            ("betrayal", "Betrayal", "Trahison", 4,
             "discovers that their closest friend has been informing on them",
             "a friendship broken by betrayal", False),
            ("school-friendships", "School friendships", None, 2.5,
             "forms a secret society with three classmates", "a secret society of classmates", False),
        ]),
    ]),
    ("uncanny-and-imagined", "The Uncanny and the Imagined", "L'étrange et l'imaginaire", [
        ("ghosts-and-hauntings", "Ghosts and Hauntings", "Fantômes et hantises", [
            ("haunted-houses", "Haunted houses", "Maisons hantées", 10,
             "inherits a house where the clocks run backwards", "a house where the clocks run backwards", False),
            ("restless-dead", "Restless dead", None, 4,
             "hears the drowned sailors calling from the estuary", "the drowned calling from the estuary", False),
            ("seances", "Séances", "Séances", 1.5,
             "exposes a medium whose séances seem too real", "séances that seem too real", False),
        ]),
        ("magic-and-folklore", "Magic and Folklore", "Magie et folklore", [
            ("witchcraft", "Witchcraft", "Sorcellerie", 4,
             "is taught the old charms by a hedge witch", "the old charms of a hedge witch", False),
            ("fairy-bargains", "Fairy bargains", None, 2.5,
             "strikes a bargain with the folk under the hill", "a bargain with the folk under the hill", False),
            ("cursed-objects", "Cursed objects", "Objets maudits", 2.5,
             "cannot get rid of a cursed silver bell", "a cursed silver bell", False),
        ]),
        ("other-worlds", "Other Worlds", "Autres mondes", [
            ("time-slips", "Time slips", "Failles temporelles", 2.5,
             "steps through a door into the town a century earlier", "a door into the town a century earlier", False),
            ("hidden-kingdoms", "Hidden kingdoms", None, 1.5,
             "finds a kingdom hidden beneath the reservoir", "a kingdom hidden beneath the reservoir", False),
            ("dreams-and-visions", "Dreams and visions", "Rêves et visions", 2.5,
             "dreams each night of a city nobody has mapped", "dreams of a city nobody has mapped", False),
        ]),
        ("machines-and-futures", "Machines and Futures", None, [
            ("automata", "Automata", "Automates", 0.8,
             "repairs a clockwork servant that begins to think", "a clockwork servant that begins to think", False),
            ("flying-machines", "Flying machines", None, 0.4,
             "builds a flying machine in a barn", "a flying machine built in a barn", False),
            ("drowned-futures", "Drowned futures", None, 1.5,
             "grows up in a future where the sea has taken the lowlands",
             "a future in which the sea has taken the lowlands", False),
        ]),
    ]),
    ("craft-and-knowledge", "Craft and Knowledge", "Savoirs et métiers", [
        ("art-and-making", "Art and Making", "Art et création", [
            ("music", "Music", "Musique", 4,
             "joins a travelling brass band", "the music of a travelling brass band", False),
            ("painting", "Painting", "Peinture", 2.5,
             "paints the same harbour every day for a year", "a painter's obsession with one harbour", False),
            ("theatre-troupes", "Theatre troupes", "Troupes de théâtre", 1.5,
             "tours the river towns with a failing theatre troupe",
             "a failing theatre troupe touring the river towns", False),
        ]),
        ("science-and-discovery", "Science and Discovery", None, [
            ("astronomy", "Astronomy", "Astronomie", 0.8,
             "charts a comet from a rooftop observatory", "a comet charted from a rooftop observatory", False),
            ("medicine", "Medicine", None, 2.5,
             "fights a fever sweeping the workhouse", "a fever sweeping the workhouse", False),
            ("maps-and-exploration", "Maps and exploration", "Cartes et exploration", 2.5,
             "sets out to map the unmapped marshes", "an expedition into the unmapped marshes", False),
        ]),
        ("books-and-learning", "Books and Learning", "Livres et savoir", [
            ("libraries", "Libraries", "Bibliothèques", 2.5,
             "guards a library the council wants to close", "a library the council wants to close", False),
            ("schools-and-teachers", "Schools and teachers", None, 4,
             "takes charge of a one-room school at the edge of the parish",
             "a one-room school at the edge of the parish", False),
            ("secret-codes", "Secret codes", "Codes secrets", 1.5,
             "cracks a code hidden in the parish registers", "a code hidden in the parish registers", False),
        ]),
    ]),
]

GENRES = [
    ("mystery", "Mystery", "Mystère"),
    ("fable", "Fable", "Fable"),
    ("satire", "Satire", "Satire"),
    ("romance", "Romance", "Romance"),
    ("adventure", "Adventure", "Aventure"),
    ("ghost-story", "Ghost story", "Histoire de fantômes"),
    ("historical-drama", "Historical drama", "Drame historique"),
    ("comedy", "Comedy", "Comédie"),
    ("fantasy", "Fantasy", "Fantasy"),
    ("speculative-fiction", "Speculative fiction", "Anticipation"),
    ("family-saga", "Family saga", "Saga familiale"),
    ("thriller", "Thriller", "Thriller"),
]
TOP_GENRES = {
    "society-and-power": ["satire", "historical-drama", "thriller", "mystery"],
    "nature-and-landscape": ["adventure", "fable", "historical-drama"],
    "inner-life": ["romance", "family-saga", "comedy"],
    "family-and-community": ["family-saga", "comedy", "romance"],
    "uncanny-and-imagined": ["ghost-story", "fantasy", "speculative-fiction", "fable"],
    "craft-and-knowledge": ["mystery", "speculative-fiction", "adventure", "comedy"],
}

# --------------------------------------------------------------------------
# Places: (slug, name, parent slug or None, description).  Regions first.
# --------------------------------------------------------------------------
REGIONS = [
    ("region-hollin-vale", "Hollin Vale", "en", "The river valley around the town of Hollinmere."),
    ("region-skerrow-isles", "Skerrow Isles", "en", "A windy chain of islands off the Hollin estuary."),
    ("region-fenmarch", "Fenmarch", "en", "Flat fen country of dykes, reed beds and scattered villages."),
    ("region-vellemont", "Vellemont", "fr", "A French-speaking hill country of lakes and abbeys."),
    ("region-wendelmoor", "Wendelmoor", "de", "A German-speaking upland of moors and spa towns."),
    ("region-costa-ambrina", "Costa Ambrina", "es", "A Spanish-speaking coast of almond groves and fishing ports."),
    ("region-valle-orsina", "Valle Orsina", "it", "An Italian-speaking valley of hill towns and chestnut woods."),
    ("region-grijsdijk", "Grijsdijk", "nl", "Dutch-speaking polder land behind a long grey dyke."),
]
PLACES = [
    ("hollinmere", "Hollinmere", "region-hollin-vale", "A market town on the River Hollin, with a public library and a film circle."),
    ("tallowgate", "Tallowgate", "hollinmere", "The old quarter of tanners and chandlers in Hollinmere."),
    ("ferrow-quay", "Ferrow Quay", "hollinmere", "The river harbour district of Hollinmere."),
    ("brindlecross", "Brindlecross", "hollinmere", "A hillside district of Hollinmere with terraced streets."),
    ("sallowmarket", "Sallowmarket", "hollinmere", "The market square and guild halls of Hollinmere."),
    ("wrenfold", "Wrenfold", "region-hollin-vale", "A village of orchards upstream from Hollinmere."),
    ("cindlebeck", "Cindlebeck", "region-hollin-vale", "A mill village on a fast stream."),
    ("river-hollin", "River Hollin", "region-hollin-vale", "The slow tidal river that gives the vale its name."),
    ("gullstane", "Gullstane", "region-skerrow-isles", "The largest of the Skerrow Isles, crowned by a lighthouse."),
    ("tarnholm", "Tarnholm", "region-skerrow-isles", "A small island with a freshwater tarn and one farm."),
    ("merrowby", "Merrowby", "region-skerrow-isles", "A herring port on the sheltered side of the isles."),
    ("thistlewick", "Thistlewick", "region-fenmarch", "A fen village built on a low island of clay."),
    ("coldharrow", "Coldharrow", "region-fenmarch", "A drained estate with a great pumping house."),
    ("larkspire", "Larkspire", "region-fenmarch", "A cathedral town at the edge of the fens."),
    ("aubrelac", "Aubrelac", "region-vellemont", "A lakeside town with a silk mill."),
    ("corvannes", "Corvannes", "region-vellemont", "A walled hill town with a ruined abbey."),
    ("sainte-ysolde-des-brumes", "Sainte-Ysolde-des-Brumes", "region-vellemont", "A misty pilgrimage village."),
    ("mirlenau", "Mirlenau", "region-wendelmoor", "A spa town with a clock tower and a small observatory."),
    ("quellsteig", "Quellsteig", "region-wendelmoor", "A mining village on the edge of the moor."),
    ("almendrilla", "Almendrilla", "region-costa-ambrina", "A port town among almond groves."),
    ("santa-luzmira", "Santa Luzmira", "region-costa-ambrina", "A whitewashed village on a headland."),
    ("montebrumo", "Montebrumo", "region-valle-orsina", "A hill town of towers above the chestnut woods."),
    ("borgo-sterlino", "Borgo Sterlino", "region-valle-orsina", "A river village known for its puppet theatre."),
    ("kreukelhaven", "Kreukelhaven", "region-grijsdijk", "A harbour town behind the grey dyke."),
    ("zwaluwdam", "Zwaluwdam", "region-grijsdijk", "A polder village with a windmill and a ferry."),
]

# --------------------------------------------------------------------------
# Invented personal names.
# --------------------------------------------------------------------------
GIVEN = {
    "en": ["Orrin", "Tamsin", "Wendell", "Ottoline", "Jessamy", "Corwen", "Fennick", "Briar", "Hollis",
           "Perrin", "Lettice", "Ambrose", "Sorrel", "Idony", "Caspar", "Rowena", "Elfrida", "Tobin",
           "Maudie", "Linnet", "Evander", "Clemency", "Bartle", "Ysolde", "Hester", "Leofric", "Morwenna",
           "Oriel", "Thessaly", "Jory", "Nell", "Ivo", "Piers", "Tamar", "Lowri", "Emrys", "Saffron",
           "Jubal", "Osric", "Wilmot", "Delia", "Aurelian", "Barnaby", "Constance", "Silas", "Posy",
           "Verity", "Kenelm", "Mercy", "Ruan", "Gideon", "Wren", "Araminta", "Lorcan", "Isadora",
           "Tansy", "Peregrine", "Honor", "Ludo", "Marigold"],
    "fr": ["Ombeline", "Théodric", "Maëlle", "Aurélien", "Solange", "Bastien", "Clémentine", "Gaspard",
           "Isaure", "Lucien", "Eulalie", "Félicien", "Apolline", "Anselme"],
    "de": ["Ilsabet", "Konrad", "Wendeline", "Friedemar", "Hedda", "Lorenz", "Mechtild", "Ansgar",
           "Theda", "Gunnolf"],
    "es": ["Marisol", "Eladio", "Ximena", "Teodoro", "Araceli", "Benigno", "Paloma", "Ulises",
           "Rosalba", "Fermín"],
    "it": ["Ottavina", "Remigio", "Sveva", "Corrado", "Ilaria", "Amedeo", "Liberata", "Nevio",
           "Gemma", "Tancredi"],
    "nl": ["Maartje", "Joost", "Lieke", "Wouter", "Femke", "Sjoerd", "Griet", "Taco", "Wietske"],
}
SURNAMES = {
    "en": ["Merriwick", "Thistlecombe", "Varlowe", "Pennerick", "Hobbleth", "Scarrowby", "Dunmorrow",
           "Wrensford", "Greyhallow", "Sallowby", "Kestrelle", "Blackmoss", "Rookhaven", "Larkworthy",
           "Stennibridge", "Fairwhistle", "Brindlecombe", "Yarrowby", "Pimberton", "Dapplewood",
           "Mirrowfield", "Gorsebrook", "Fennaway", "Strellick", "Ambercott", "Copperwhite", "Orlebank",
           "Cindrell", "Marrowcliff", "Spindlow", "Wimbrell", "Tarrowgate", "Moskell", "Pettigrane",
           "Quillon", "Bellcastle", "Throssel", "Dellacott", "Ferrimond", "Ibbotsen", "Noakesby",
           "Orwick", "Prenderby", "Quiltwell", "Tamberlin", "Wraxley", "Hollerick", "Ashmantle",
           "Crallow", "Duskworth", "Elverby", "Fothersill", "Gammerton", "Haverleigh", "Inglethwaite",
           "Jessamond", "Kimberwell", "Lintrop", "Maddersley", "Nettlebow", "Oddlemere", "Ploverdale",
           "Quennock", "Ravensmoor", "Shillingtree", "Tuppercombe", "Underwhistle", "Vexley",
           "Wickerstaff", "Yelverdon", "Brackwhistle", "Cobbledew", "Dimmerock", "Emberthwaite"],
    "fr": ["Aubrevalle", "Montcressin", "Lavergnolle", "Delorbe", "Quessandre", "Fauvelier",
           "Castanoir", "Morlevant", "Esquenard", "Pellerinque", "Sorbecourt", "Valmorigne",
           "Brisseloup", "Ferandelle"],
    "de": ["Wendelbrach", "Quarzmann", "Hollerbeck", "Eschwandt", "Tannreuter", "Morgenbrecht",
           "Falkenstrupp", "Grauholzer", "Lindenspöck", "Ottershain"],
    "es": ["Valdeloro", "Esquivador", "Montaraz", "Quiñoveda", "Sotorrubio", "Peñalbrava",
           "Cardolosa", "Luzmarín", "Arrequilla", "Borrascal"],
    "it": ["Castelnebbi", "Rovigatto", "Sterlacchi", "Montebrumi", "Orsolani", "Fenarotti",
           "Lucchetrina", "Borgastri", "Vellacchio", "Tramontelli"],
    "nl": ["Kreukelaar", "Zwaluwberg", "van Meerkreuk", "Dijkstervolt", "Ooievaart", "Tulpenhoef",
           "Wierickx", "Stroomberg", "Grijsveld"],
}

# --------------------------------------------------------------------------
# Title vocabulary.  Nouns per top concept: en (without "The"), then the other
# languages with their article; poss = may follow a possessive ("Ysolde's Ledger").
# --------------------------------------------------------------------------
def _n(en, fr, de, es, it, nl, poss=False):
    return {"en": en, "fr": fr, "de": de, "es": es, "it": it, "nl": nl, "poss": poss}


NOUNS = {
    "society-and-power": [
        _n("Verdict", "le verdict", "das Urteil", "el veredicto", "il verdetto", "het vonnis", True),
        _n("Barricade", "la barricade", "die Barrikade", "la barricada", "la barricata", "de barricade", True),
        _n("Magistrate", "le magistrat", "der Richter", "el magistrado", "il magistrato", "de magistraat"),
        _n("Weaver", "la tisserande", "die Weberin", "la tejedora", "la tessitrice", "de weefster"),
        _n("Ledger", "le registre", "das Kassenbuch", "el libro de cuentas", "il registro", "het kasboek", True),
        _n("Pamphlet", "le pamphlet", "das Flugblatt", "el panfleto", "il volantino", "het pamflet", True),
        _n("Strongbox", "le coffre-fort", "die Geldkassette", "la caja fuerte", "la cassaforte", "de geldkist", True),
        _n("Smuggler", "le contrebandier", "der Schmuggler", "el contrabandista", "il contrabbandiere", "de smokkelaar"),
    ],
    "nature-and-landscape": [
        _n("Lighthouse", "le phare", "der Leuchtturm", "el faro", "il faro", "de vuurtoren", True),
        _n("Ferryman", "le passeur", "der Fährmann", "el barquero", "il traghettatore", "de veerman"),
        _n("Wolf", "le loup", "der Wolf", "el lobo", "il lupo", "de wolf", True),
        _n("Heron", "le héron", "der Reiher", "la garza", "l'airone", "de reiger", True),
        _n("Orchard", "le verger", "der Obstgarten", "el huerto", "il frutteto", "de boomgaard", True),
        _n("Flood", "la crue", "die Flut", "la riada", "la piena", "de vloed"),
        _n("Marsh", "le marais", "das Moor", "la marisma", "la palude", "het moeras"),
        _n("Storm", "l'orage", "der Sturm", "la tormenta", "la tempesta", "de storm"),
    ],
    "inner-life": [
        _n("Letter", "la lettre", "der Brief", "la carta", "la lettera", "de brief", True),
        _n("Mirror", "le miroir", "der Spiegel", "el espejo", "lo specchio", "de spiegel", True),
        _n("Stranger", "l'étranger", "der Fremde", "el forastero", "lo straniero", "de vreemdeling"),
        _n("Promise", "la promesse", "das Versprechen", "la promesa", "la promessa", "de belofte", True),
        _n("Sleepwalker", "la somnambule", "die Schlafwandlerin", "la sonámbula", "la sonnambula", "de slaapwandelaar"),
        _n("Photograph", "la photographie", "die Fotografie", "la fotografía", "la fotografia", "de foto", True),
        _n("Silence", "le silence", "das Schweigen", "el silencio", "il silenzio", "de stilte", True),
        _n("Exile", "l'exilé", "der Verbannte", "el exiliado", "l'esule", "de balling"),
    ],
    "family-and-community": [
        _n("Orphan", "l'orpheline", "das Waisenkind", "la huérfana", "l'orfana", "het weesmeisje"),
        _n("Lodger", "le locataire", "der Untermieter", "el inquilino", "l'inquilino", "de kostganger"),
        _n("Younger Sister", "la sœur cadette", "die jüngere Schwester", "la hermana menor", "la sorella minore", "de jongste zus"),
        _n("Grandmother", "la grand-mère", "die Großmutter", "la abuela", "la nonna", "de grootmoeder"),
        _n("Wedding", "la noce", "die Hochzeit", "la boda", "le nozze", "de bruiloft", True),
        _n("Neighbour", "la voisine", "die Nachbarin", "la vecina", "la vicina", "de buurvrouw"),
        _n("Foundling", "l'enfant trouvé", "das Findelkind", "el expósito", "il trovatello", "de vondeling"),
        _n("Locket", "le médaillon", "das Medaillon", "el relicario", "il medaglione", "het medaillon", True),
    ],
    "uncanny-and-imagined": [
        _n("Silver Bell", "la cloche d'argent", "die Silberglocke", "la campana de plata", "la campana d'argento", "de zilveren klok", True),
        _n("Witch", "la sorcière", "die Hexe", "la bruja", "la strega", "de heks"),
        _n("Ghost", "le fantôme", "das Gespenst", "el fantasma", "il fantasma", "het spook", True),
        _n("Clockwork Boy", "le garçon mécanique", "der Uhrwerkjunge", "el niño de cuerda", "il ragazzo meccanico", "de opwindjongen"),
        _n("Hollow Hill", "la colline creuse", "der hohle Hügel", "la colina hueca", "la collina cava", "de holle heuvel"),
        _n("Seventh Key", "la septième clé", "der siebte Schlüssel", "la séptima llave", "la settima chiave", "de zevende sleutel", True),
        _n("Night Visitor", "le visiteur nocturne", "der nächtliche Besucher", "el visitante nocturno", "il visitatore notturno", "de nachtelijke bezoeker"),
        _n("Changeling", "le changelin", "der Wechselbalg", "el niño cambiado", "il bambino scambiato", "het wisselkind"),
    ],
    "craft-and-knowledge": [
        _n("Clockmaker", "l'horloger", "der Uhrmacher", "el relojero", "l'orologiaio", "de klokkenmaker"),
        _n("Cartographer", "la cartographe", "die Kartografin", "la cartógrafa", "la cartografa", "de kaartenmaakster"),
        _n("Bookbinder", "le relieur", "der Buchbinder", "el encuadernador", "il rilegatore", "de boekbinder"),
        _n("Fiddler", "le violoneux", "der Geiger", "el violinista", "il violinista", "de vioolspeler"),
        _n("Stargazer", "l'astronome", "die Sternguckerin", "la astrónoma", "l'astronoma", "de sterrenkijker"),
        _n("Apothecary", "l'apothicaire", "der Apotheker", "el boticario", "lo speziale", "de apotheker"),
        _n("Puppeteer", "le marionnettiste", "der Puppenspieler", "el titiritero", "il burattinaio", "de poppenspeler"),
        _n("Telescope", "le télescope", "das Fernrohr", "el telescopio", "il cannocchiale", "de telescoop", True),
    ],
}
# Extra English-only nouns (poss flag second).
EN_EXTRA = {
    "society-and-power": [("Alderman's Widow", False), ("Tollkeeper", False), ("Mill Girls", False), ("Informer", False)],
    "nature-and-landscape": [("Eel Catcher", False), ("Falconer", False), ("Shepherdess", False), ("Salt Meadow", True)],
    "inner-life": [("Forgetful Bride", False), ("Letter Writer", False), ("Quiet Daughter", False), ("Borrowed Name", True)],
    "family-and-community": [("Second Son", False), ("Seven Cousins", False), ("Midsummer Guests", False), ("Lost Recipe", True)],
    "uncanny-and-imagined": [("Lantern Ghost", False), ("Weather Witch", False), ("Glass Door", True), ("Sleeping Hill", False)],
    "craft-and-knowledge": [("Bell-Founder", False), ("Organ Builder", False), ("Printer's Apprentice", False), ("Almanac", True)],
}
TIME_PHRASES = [  # {P} = place name
    {"en": "Winter in {P}", "fr": "Hiver à {P}", "de": "Winter in {P}", "es": "Invierno en {P}",
     "it": "Inverno a {P}", "nl": "Winter in {P}"},
    {"en": "A Summer in {P}", "fr": "Un été à {P}", "de": "Ein Sommer in {P}", "es": "Un verano en {P}",
     "it": "Un'estate a {P}", "nl": "Een zomer in {P}"},
    {"en": "The Last Days of {P}", "fr": "Les derniers jours de {P}", "de": "Die letzten Tage von {P}",
     "es": "Los últimos días de {P}", "it": "Gli ultimi giorni di {P}", "nl": "De laatste dagen van {P}"},
    {"en": "Midnight at {P}", "fr": "Minuit à {P}", "de": "Mitternacht in {P}", "es": "Medianoche en {P}",
     "it": "Mezzanotte a {P}", "nl": "Middernacht in {P}"},
    {"en": "Return to {P}", "fr": "Retour à {P}", "de": "Rückkehr nach {P}", "es": "Regreso a {P}",
     "it": "Ritorno a {P}", "nl": "Terugkeer naar {P}"},
    {"en": "The Road to {P}", "fr": "La route de {P}", "de": "Der Weg nach {P}", "es": "El camino a {P}",
     "it": "La strada per {P}", "nl": "De weg naar {P}"},
    {"en": "Letters from {P}", "fr": "Lettres de {P}", "de": "Briefe aus {P}", "es": "Cartas desde {P}",
     "it": "Lettere da {P}", "nl": "Brieven uit {P}"},
]
COLLECTION_OTHER = {"en": "{N} of {P} and Other Stories", "fr": "{N} de {P} et autres nouvelles",
                    "de": "{N} von {P} und andere Erzählungen", "es": "{N} de {P} y otros cuentos",
                    "it": "{N} di {P} e altri racconti", "nl": "{N} van {P} en andere verhalen"}
COLLECTION_TALES = {"en": "Tales from {P}", "fr": "Contes de {P}", "de": "Geschichten aus {P}",
                    "es": "Cuentos de {P}", "it": "Racconti di {P}", "nl": "Verhalen uit {P}"}
COLLECTION_NUMBER = {"en": "{X} Tales of {P}", "fr": "{X} contes de {P}", "de": "{X} Geschichten aus {P}",
                     "es": "{X} cuentos de {P}", "it": "{X} racconti di {P}", "nl": "{X} verhalen uit {P}"}
NUMBERS = [
    {"en": "Seven", "fr": "Sept", "de": "Sieben", "es": "Siete", "it": "Sette", "nl": "Zeven"},
    {"en": "Nine", "fr": "Neuf", "de": "Neun", "es": "Nueve", "it": "Nove", "nl": "Negen"},
    {"en": "Twelve", "fr": "Douze", "de": "Zwölf", "es": "Doce", "it": "Dodici", "nl": "Twaalf"},
    {"en": "Thirteen", "fr": "Treize", "de": "Dreizehn", "es": "Trece", "it": "Tredici", "nl": "Dertien"},
]
OF = {"en": "of", "fr": "de", "de": "von", "es": "de", "it": "di", "nl": "van"}
AND = {"en": "and", "fr": "et", "de": "und", "es": "y", "it": "e", "nl": "en"}
AUDIO_SUFFIX = {
    "en": [" (unabridged)", " (abridged)"],
    "fr": [" (version intégrale)", " (version abrégée)"],
    "de": [" (ungekürzte Lesung)", " (gekürzte Lesung)"],
    "es": [" (versión íntegra)", " (versión abreviada)"],
    "it": [" (versione integrale)", " (versione ridotta)"],
    "nl": [" (onverkort)", " (verkort)"],
}
SERIES_NAMES = {  # (local, english); {P} place, {N} protagonist
    "en-children": ("The {N} Stories", "The {N} Stories"),
    "en-mystery": ("The {P} Mysteries", "The {P} Mysteries"),
    "en-saga": ("The {P} Sequence", "The {P} Sequence"),
    "en-teen": ("The {N} Chronicles", "The {N} Chronicles"),
    "fr": ("Chroniques de {P}", "The {P} Chronicles"),
    "de": ("Die {N}-Bücher", "The {N} Books"),
    "es": ("La saga de {P}", "The {P} Saga"),
    "it": ("Il ciclo di {P}", "The {P} Cycle"),
    "nl": ("De {P}-reeks", "The {P} Series"),
    "en-graphic": ("The {P} Files", "The {P} Files"),
    "en-film": ("The {N} Films", "The {N} Films"),
}
ORDINALS = ["First", "Second", "Third", "Fourth", "Fifth"]
GN_STYLES = ["ink-wash", "bold two-colour", "crowded pencil-grey", "bright watercolour",
             "stark black-and-white", "woodcut-like"]
KIND_WORD = {"novel": "novel", "collection": "story collection", "graphic": "graphic novel",
             "film": "film", "audiobook": "audiobook"}
KIND_CLASS = {"novel": "hm:Novel", "collection": "hm:StoryCollection", "graphic": "hm:GraphicNovel",
              "film": "hm:Film", "audiobook": "hm:Audiobook"}

# --------------------------------------------------------------------------
# Derived lookups
# --------------------------------------------------------------------------
TOP_OF = {}       # any concept slug -> top slug
PARENT = {}       # concept slug -> parent slug
LEVEL = {}        # concept slug -> 1/2/3
THIRD = {}        # slug -> dict(pop, vp, np, adult)
SECONDS_OF_TOP = defaultdict(list)
THIRDS_OF_TOP = defaultdict(list)
for top, _en, _fr, seconds in THEMES:
    LEVEL[top] = 1
    TOP_OF[top] = top
    for sec, _e2, _f2, thirds in seconds:
        LEVEL[sec] = 2
        TOP_OF[sec] = top
        PARENT[sec] = top
        SECONDS_OF_TOP[top].append(sec)
        for slug, _e3, _f3, pop, vp, np, adult in thirds:
            LEVEL[slug] = 3
            TOP_OF[slug] = top
            PARENT[slug] = sec
            THIRD[slug] = {"pop": pop, "vp": vp, "np": np, "adult": adult}
            THIRDS_OF_TOP[top].append(slug)
TOPS = [t[0] for t in THEMES]
ALL_THIRDS = list(THIRD)
ALL_SECONDS = [s for s in LEVEL if LEVEL[s] == 2]

REGION_LANG = {slug: lang for slug, _n2, lang, _d in REGIONS}
PLACE_NAME = {slug: name for slug, name, _l, _d in REGIONS}
PLACE_NAME.update({slug: name for slug, name, _p, _d in PLACES})
PLACE_PARENT = {slug: parent for slug, _n2, parent, _d in PLACES}


def region_of(place):
    while place in PLACE_PARENT:
        place = PLACE_PARENT[place]
    return place


LEAVES_OF_REGION = defaultdict(list)
for _slug, _nm, _par, _d in PLACES:
    LEAVES_OF_REGION[region_of(_slug)].append(_slug)
REGIONS_OF_LANG = defaultdict(list)
for _slug, _nm, _lang, _d in REGIONS:
    REGIONS_OF_LANG[_lang].append(_slug)


def title_place(place):
    """Name used inside titles (the river is not a good title name)."""
    return "Hollinmere" if place in (None, "river-hollin") else PLACE_NAME[place]


# --------------------------------------------------------------------------
# Helpers
# --------------------------------------------------------------------------
def slugify(text):
    text = text.replace("'s ", "s ").replace("\u2019s ", "s ")
    text = text.replace("ß", "ss").replace("œ", "oe").replace("Œ", "oe").replace("æ", "ae")
    text = unicodedata.normalize("NFKD", text)
    text = "".join(c for c in text if not unicodedata.combining(c))
    text = re.sub(r"[^a-zA-Z0-9]+", "-", text.lower()).strip("-")
    return text


def cap(s):
    return s[:1].upper() + s[1:]


def fr_elide(s):
    return re.sub(r"\b(de|De) ([AEIOUYÀÂÉÈÊÎÔÛaeiouyàâéèêîôû])", lambda m: m.group(1)[0] + "'" + m.group(2), s)


def lit(text, lang=None):
    esc = (text.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n")
           .replace("\r", "\\r").replace("\t", "\\t"))
    return f'"{esc}"@{lang}' if lang else f'"{esc}"'


def weighted_sample(rng, items, weights, k):
    items, weights, out = list(items), list(weights), []
    for _ in range(min(k, len(items))):
        i = rng.choices(range(len(items)), weights=weights)[0]
        out.append(items.pop(i))
        weights.pop(i)
    return out


# --------------------------------------------------------------------------
# The generator
# --------------------------------------------------------------------------
class Generator:
    def __init__(self):
        self.rng = random.Random(SEED)
        self.people = []          # list of dicts
        self.by_slug = {}
        self.works = []
        self.work_by_slug = {}
        self.series = []          # dicts: slug, names {lang: name}
        self.titles_taken = set()  # (lang, title) -- membership only, never iterated
        self.slugs_taken = set()

    # ---------------- people ----------------
    ROLE_PLAN: ClassVar[list[tuple[str, str, int]]] = [
        ("writer", "en", 36), ("writer", "fr", 5), ("writer", "de", 5), ("writer", "es", 4),
        ("writer", "it", 4), ("writer", "nl", 4),
        ("graphic", "en", 8), ("graphic", "fr", 2), ("graphic", "nl", 1), ("graphic", "it", 1),
        ("graphic", "es", 1),
        ("illustrator", "en", 5), ("illustrator", "fr", 2), ("illustrator", "nl", 1),
        ("director", "en", 14), ("director", "fr", 3), ("director", "de", 2), ("director", "es", 2),
        ("director", "it", 2), ("director", "nl", 1),
        ("narrator", "en", 9), ("narrator", "fr", 1), ("narrator", "de", 1), ("narrator", "es", 1),
        ("narrator", "it", 1),
    ]
    START_DECADES: ClassVar[dict[str, tuple[list[int], list[float]]]] = {
        "writer": ([1850, 1860, 1870, 1880, 1890, 1900, 1910, 1920, 1930, 1940, 1950, 1960, 1970, 1980,
                    1990, 2000],
                   [1, 1, 1, 1, 1, 1.1, 1.1, 1.1, 1.2, 1.2, 1.4, 1.4, 1.5, 1.5, 1.5, 1.5]),
        "graphic": ([1940, 1950, 1960, 1970, 1980, 1990, 2000], [0.5, 0.5, 0.8, 1, 1.5, 1.5, 1.5]),
        "director": ([1910, 1920, 1930, 1940, 1950, 1960, 1970, 1980, 1990, 2000],
                     [1, 1, 1.2, 1.2, 1.5, 1.5, 1.5, 1.5, 1.5, 1.5]),
        "narrator": ([1950, 1960, 1970, 1980, 1990, 2000], [0.8, 0.8, 1, 1.3, 1.5, 1.5]),
    }

    def make_people(self):
        rng = self.rng
        surnames = {lang: list(v) for lang, v in SURNAMES.items()}
        for lang in LANGS:
            rng.shuffle(surnames[lang])
        used_given = defaultdict(int)
        # writers: guarantee that every early decade has somebody starting in it
        forced_writer_starts = [d for d in range(1850, 2010, 10) for _ in range(3 if d < 1870 else 2)]
        rng.shuffle(forced_writer_starts)
        for role, lang, count in self.ROLE_PLAN:
            for _ in range(count):
                sur = surnames[lang].pop()
                given_pool = [g for g in GIVEN[lang] if used_given[g] == min(used_given[x] for x in GIVEN[lang])]
                given = rng.choice(given_pool)
                used_given[given] += 1
                name = f"{given} {sur}"
                p = {"slug": slugify(name), "name": name, "role": role, "lang": lang,
                     "influences": [], "collabs": [], "works": []}
                # signature
                top = rng.choice(TOPS)
                second_top = rng.choice([t for t in TOPS if t != top]) if rng.random() < 0.4 else None
                p["top"], p["second_top"] = top, second_top
                p["audience"] = rng.choices(["children", "teen", "adult"], [22, 22, 56])[0]
                if role == "narrator":
                    p["audience"] = rng.choices(["children", "teen", "adult"], [25, 15, 60])[0]
                nfav = rng.choice([2, 3, 3, 4])
                pool = [t for t in THIRDS_OF_TOP[top] if not (p["audience"] == "children" and THIRD[t]["adult"])]
                favs = weighted_sample(rng, pool, [THIRD[t]["pop"] for t in pool],
                                       nfav - (1 if second_top else 0))
                if second_top:
                    pool2 = [t for t in THIRDS_OF_TOP[second_top]
                             if not (p["audience"] == "children" and THIRD[t]["adult"])]
                    favs += weighted_sample(rng, pool2, [THIRD[t]["pop"] for t in pool2], 1)
                p["favs"] = favs
                gpool = TOP_GENRES[top]
                p["genres"] = rng.sample(gpool, rng.choice([1, 2]))
                # active period
                if role == "illustrator":
                    p["start"] = None  # fixed later from the works they illustrate
                else:
                    if role == "writer" and forced_writer_starts:
                        start = forced_writer_starts.pop()
                    else:
                        decs, wts = self.START_DECADES[role]
                        start = rng.choices(decs, wts)[0]
                    ndec = rng.choice([2, 3, 3, 4])
                    p["start"] = start + rng.randint(0, 5)
                    p["end"] = min(start + 10 * ndec - 1, LAST_YEAR)
                    p["birth"] = p["start"] - rng.randint(22, 38)
                # home place
                regions = REGIONS_OF_LANG[lang]
                region = rng.choices(regions, [5, 2, 2])[0] if lang == "en" else regions[0]
                leaves = LEAVES_OF_REGION[region]
                weights = [3 if s in ("hollinmere", "tallowgate", "ferrow-quay", "brindlecross", "sallowmarket")
                           else 1 for s in leaves]
                leaves_w = [(s, w) for s, w in zip(leaves, weights, strict=False) if s != "river-hollin"]
                p["home"] = rng.choices([s for s, _ in leaves_w], [w for _, w in leaves_w])[0]
                # kinds
                if role == "writer":
                    p["kindpref"] = rng.choices(["novelist", "mixed", "storyteller"], [55, 30, 15])[0]
                self.people.append(p)
                self.by_slug[p["slug"]] = p
        assert len(self.by_slug) == len(self.people), "duplicate person slug"

    def role(self, role, lang=None):
        return [p for p in self.people if p["role"] == role and (lang is None or p["lang"] == lang)]

    # ---------------- themes, places, titles ----------------
    def draw_themes(self, favs, audience, core=None):
        rng = self.rng
        k = rng.choices([2, 3, 4, 5], [30, 36, 24, 10])[0]
        extras = rng.choice([1, 1, 2]) if k > 2 else rng.choice([0, 1])
        if core:
            chosen = list(core)
        else:
            nsig = max(1, min(len(favs), k - extras))
            chosen = rng.sample(favs, nsig)
        while len(chosen) < k:
            pool = THIRDS_OF_TOP[TOP_OF[rng.choice(chosen)]] if rng.random() < 0.5 else ALL_THIRDS
            pool = [t for t in pool if t not in chosen and not (audience == "children" and THIRD[t]["adult"])]
            chosen.append(rng.choices(pool, [THIRD[t]["pop"] for t in pool])[0])
        if rng.random() < 0.17:
            anchor = chosen[0]
            if rng.random() < 0.5:
                sec = PARENT[anchor]
            else:
                sec = rng.choice(SECONDS_OF_TOP[TOP_OF[anchor]])
            if sec not in chosen:
                if len(chosen) >= 5 or (len(chosen) > 2 and rng.random() < 0.5):
                    chosen[-1] = sec
                else:
                    chosen.append(sec)
        return chosen

    def pick_place(self, person, lang):
        rng = self.rng
        r = rng.random()
        home_region = region_of(person["home"])
        if r < 0.4:
            return person["home"]
        if r < 0.85:
            return rng.choice(LEAVES_OF_REGION[home_region])
        if lang == "en" or rng.random() < 0.5:
            region = rng.choice(REGIONS_OF_LANG["en"])
        else:
            region = rng.choice([r2 for r2, _n2, _l, _d in REGIONS])
        return rng.choice(LEAVES_OF_REGION[region])

    def pick_genre(self, person, themes):
        rng = self.rng
        if rng.random() < 0.8:
            return rng.choice(person["genres"])
        return rng.choice(TOP_GENRES[TOP_OF[themes[0]]])

    def noun_phrase(self, noun, lang, start=False):
        """Noun with its article, capitalised if it starts the title."""
        if lang == "en":
            return ("The " if start else "the ") + noun["en"]
        s = noun[lang]
        return cap(s) if start else s

    def _title_once(self, lang, kind, top, place, protag, audience):
        rng = self.rng
        nouns = list(NOUNS[top])
        if lang == "en":
            nouns += [{"en": e, "poss": poss} for e, poss in EN_EXTRA[top]]
        P = title_place(place)
        if kind == "collection" and rng.random() < 0.8:
            r = rng.random()
            if r < 0.5:
                noun = rng.choice(NOUNS[top])
                tpl = COLLECTION_OTHER
                loc = tpl[lang].format(N=self.noun_phrase(noun, lang, True), P=P)
                en = tpl["en"].format(N=self.noun_phrase(noun, "en", True), P=P)
            elif r < 0.75:
                loc, en = COLLECTION_TALES[lang].format(P=P), COLLECTION_TALES["en"].format(P=P)
            else:
                num = rng.choice(NUMBERS)
                loc = COLLECTION_NUMBER[lang].format(X=num[lang], P=P)
                en = COLLECTION_NUMBER["en"].format(X=num["en"], P=P)
        else:
            noun = rng.choice(nouns if lang == "en" else NOUNS[top])
            pats = ["of_place", "name_and", "poss", "time"]
            weights = [4, 3 if audience == "children" else 2, 2 if noun["poss"] else 0, 2]
            pat = rng.choices(pats, weights)[0]
            if pat == "of_place":
                loc = f"{self.noun_phrase(noun, lang, True)} {OF[lang]} {P}"
                en = f"{self.noun_phrase(noun, 'en', True)} of {P}"
            elif pat == "name_and":
                loc = f"{protag} {AND[lang]} {self.noun_phrase(noun, lang)}"
                en = f"{protag} and {self.noun_phrase(noun, 'en')}"
            elif pat == "poss":
                poss = f"{protag}'" if protag.endswith("s") else f"{protag}'s"
                en = f"{poss} {noun['en']}"
                loc = en if lang == "en" else f"{self.noun_phrase(noun, lang, True)} {OF[lang]} {protag}"
            else:
                tp = rng.choice(TIME_PHRASES)
                loc, en = tp[lang].format(P=P), tp["en"].format(P=P)
        if lang == "fr":
            loc = fr_elide(loc)
        return loc, en

    def make_title(self, lang, kind, top, place, protag, audience):
        for _ in range(200):
            loc, en = self._title_once(lang, kind, top, place, protag, audience)
            slug = slugify(loc)
            if (lang, loc) in self.titles_taken or ("en", en) in self.titles_taken or slug in self.slugs_taken:
                continue
            return loc, en
        raise RuntimeError("could not find a free title")

    def register(self, w):
        self.titles_taken.add((w["lang"], w["title"]))
        self.titles_taken.add(("en", w["title_en"]))
        w["slug"] = slugify(w["title"])
        assert w["slug"] not in self.slugs_taken
        self.slugs_taken.add(w["slug"])
        self.works.append(w)
        self.work_by_slug[w["slug"]] = w
        return w

    def protagonist(self, lang):
        return self.rng.choice(GIVEN[lang])

    def audience_for(self, person):
        rng = self.rng
        if rng.random() < 0.82:
            return person["audience"]
        return rng.choice(["children", "teen", "adult"])

    # ---------------- books ----------------
    def new_book(self, p, kind, year, *, place=None, protag=None, audience=None, core=None,
                 genre=None, series=None, sequel_of=None, illustrator=None):
        lang = p["lang"]
        audience = audience or self.audience_for(p)
        themes = self.draw_themes(p["favs"], audience, core)
        place = place or self.pick_place(p, lang)
        protag = protag or self.protagonist(lang)
        genre = genre or self.pick_genre(p, themes)
        title, title_en = self.make_title(lang, kind, TOP_OF[themes[0]], place, protag, audience)
        w = {"kind": kind, "title": title, "title_en": title_en, "lang": lang, "year": year,
             "author": p["slug"], "illustrator": illustrator, "director": None, "reader": None,
             "themes": themes, "genre": genre, "place": place, "audience": audience, "protag": protag,
             "based_on": None, "sequel_of": sequel_of, "series": series, "series_pos": None}
        return self.register(w)

    def spread_years(self, p, n):
        rng = self.rng
        return sorted(rng.randint(p["start"], p["end"]) for _ in range(n))

    def make_series_record(self, key, lang, place, protag):
        loc_tpl, en_tpl = SERIES_NAMES[key]
        P = title_place(place)
        loc, en = loc_tpl.format(P=P, N=protag), en_tpl.format(P=P, N=protag)
        s = {"slug": slugify(en), "name_en": en, "name_local": loc if lang != "en" else None, "lang": lang}
        assert all(x["slug"] != s["slug"] for x in self.series)
        self.series.append(s)
        return s

    def run_series(self, p, key, kind, first_year, length, genre=None):
        """Create a series of `length` works by person p; returns the works."""
        rng = self.rng
        lang = p["lang"]
        place = self.pick_place(p, lang)
        if place == "river-hollin":
            place = "hollinmere"
        protag = self.protagonist(lang)
        audience = p["audience"]
        core = rng.sample(p["favs"], min(2, len(p["favs"])))
        genre = genre or rng.choice(p["genres"])
        s = self.make_series_record(key, lang, place, protag)
        illustrator = None
        if kind == "graphic" and p.get("partners"):
            illustrator = p["partners"][0]
        year, prev, out = first_year, None, []
        for i in range(length):
            if kind == "film":
                w = self.new_film(p, year, place=place, protag=protag, audience=audience, core=core,
                                  genre=genre, series=s["slug"], sequel_of=prev)
            else:
                w = self.new_book(p, kind, year, place=place, protag=protag, audience=audience, core=core,
                                  genre=genre, series=s["slug"], sequel_of=prev, illustrator=illustrator)
            w["series_pos"] = i
            w["series_name"] = s["name_en"]
            prev = w["slug"]
            out.append(w)
            year = min(year + rng.randint(1, 4), LAST_YEAR)
        return out

    def make_books(self):
        rng = self.rng
        # pick the series creators up front
        series_plan = {}

        def pick(role, lang, cond=lambda p: True):
            cands = [p for p in self.role(role, lang) if p["slug"] not in series_plan and cond(p)]
            return rng.choice(cands)

        series_plan[pick("writer", "en", lambda p: p["audience"] == "children")["slug"]] = ("en-children", "novel", 5)
        series_plan[pick("writer", "en", lambda p: p["audience"] == "adult")["slug"]] = ("en-mystery", "novel", 4)
        series_plan[pick("writer", "en", lambda p: p["start"] < 1920)["slug"]] = ("en-saga", "novel", 3)
        series_plan[pick("writer", "en", lambda p: p["audience"] == "teen")["slug"]] = ("en-teen", "novel", 3)
        series_plan[pick("writer", "fr")["slug"]] = ("fr", "novel", 3)
        series_plan[pick("writer", "de")["slug"]] = ("de", "novel", 3)
        series_plan[pick("writer", "es")["slug"]] = ("es", "novel", 2)
        series_plan[pick("writer", "it")["slug"]] = ("it", "novel", 2)
        self.series_plan = series_plan

        # illustrators team up with graphic-novel creators
        graphic = self.role("graphic")
        teamers = [g for g in graphic if rng.random() < 0.55]
        for ill in self.role("illustrator"):
            same = [g for g in teamers if g["lang"] == ill["lang"]] or teamers
            g = min(same, key=lambda g: (len(g.get("partners", [])), rng.random()))
            g.setdefault("partners", []).append(ill["slug"])
        gn_series = [rng.choice([g for g in graphic if g["lang"] == "en" and g.get("partners")]
                                or [g for g in graphic if g["lang"] == "en"]),
                     rng.choice([g for g in graphic if g["lang"] == "nl"])]
        series_plan[gn_series[0]["slug"]] = ("en-graphic", "graphic", 4)
        series_plan[gn_series[1]["slug"]] = ("nl", "graphic", 3)

        standalone_sequels = 0
        for p in self.role("writer") + graphic:
            n = rng.choice([2, 3, 3, 3, 4, 4, 5, 6]) if p["role"] == "writer" else rng.choice([2, 3, 3, 4])
            plan = series_plan.get(p["slug"])
            years = self.spread_years(p, n)
            if plan:
                key, kind, length = plan
                self.run_series(p, key, kind, years[0], length)
                years = years[1:]
            prev = None
            for y in years:
                if p["role"] == "graphic":
                    kind = "graphic"
                else:
                    kind = {"novelist": ["novel"] * 9 + ["collection"],
                            "mixed": ["novel"] * 3 + ["collection"] * 2,
                            "storyteller": ["novel"] + ["collection"] * 3}[p["kindpref"]]
                    kind = rng.choice(kind)
                ill = None
                if kind == "graphic" and p.get("partners") and rng.random() < 0.85:
                    p["drawn"] = p.get("drawn", 0) + 1
                    ill = p["partners"][p["drawn"] % len(p["partners"])]
                if (prev and prev["kind"] == "novel" and kind == "novel" and not plan
                        and standalone_sequels < 6 and rng.random() < 0.25):
                    w = self.new_book(p, kind, max(y, prev["year"] + 1), place=prev["place"],
                                      protag=prev["protag"], audience=prev["audience"],
                                      core=prev["themes"][:2], genre=prev["genre"], sequel_of=prev["slug"])
                    standalone_sequels += 1
                else:
                    w = self.new_book(p, kind, y, illustrator=ill)
                prev = w
        # illustrators' active period follows their books
        for ill in self.role("illustrator"):
            ys = [w["year"] for w in self.works if w["illustrator"] == ill["slug"]]
            if not ys:  # partner drew nothing yet: give them one book of a partner
                g = next(g for g in graphic if ill["slug"] in g.get("partners", []))
                gw = [w for w in self.works if w["author"] == g["slug"] and w["illustrator"] is None]
                gw = gw or [w for w in self.works if w["author"] == g["slug"]]
                gw[-1]["illustrator"] = ill["slug"]
                ys = [gw[0]["year"]]
            ill["start"], ill["end"] = min(ys), max(ys)
            ill["birth"] = ill["start"] - self.rng.randint(22, 34)
            g = next(g for g in graphic if ill["slug"] in g.get("partners", []))
            ill["favs"] = list(g["favs"])

    # ---------------- rare-theme top-up ----------------
    def top_up_rare(self, minimum=3):
        rng = self.rng
        counts = Counter(t for w in self.works for t in w["themes"])
        for t in ALL_THIRDS:
            while counts[t] < minimum:
                cands = [w for w in self.works if t not in w["themes"] and len(w["themes"]) < 5
                         and w["kind"] in ("novel", "collection", "graphic")
                         and TOP_OF[t] in [TOP_OF[x] for x in w["themes"]]
                         and not (w["audience"] == "children" and THIRD[t]["adult"])]
                w = rng.choice(cands)
                w["themes"].append(t)
                counts[t] += 1

    # ---------------- films ----------------
    def new_film(self, d, year, *, place=None, protag=None, audience=None, core=None, genre=None,
                 series=None, sequel_of=None, source=None):
        rng = self.rng
        lang = d["lang"]
        if source:
            themes = list(source["themes"])
            if len(themes) >= 3 and rng.random() < 0.4:
                themes.pop(rng.randrange(1, len(themes)))
            extra = [t for t in d["favs"] if t not in themes]
            if extra and len(themes) < 5 and rng.random() < 0.4:
                themes.append(rng.choice(extra))
            place = source["place"] if rng.random() < 0.85 else self.pick_place(d, lang)
            protag = source["protag"]
            audience = source["audience"] if rng.random() < 0.8 else self.audience_for(d)
            genre = source["genre"] if rng.random() < 0.75 else self.pick_genre(d, themes)
        else:
            audience = audience or self.audience_for(d)
            themes = self.draw_themes(d["favs"], audience, core)
            place = place or self.pick_place(d, lang)
            protag = protag or self.protagonist(lang)
            genre = genre or self.pick_genre(d, themes)
        title, title_en = self.make_title(lang, "film", TOP_OF[themes[0]], place, protag, audience)
        w = {"kind": "film", "title": title, "title_en": title_en, "lang": lang, "year": year,
             "author": None, "illustrator": None, "director": d["slug"], "reader": None,
             "themes": themes, "genre": genre, "place": place, "audience": audience, "protag": protag,
             "based_on": source["slug"] if source else None, "sequel_of": sequel_of, "series": series,
             "series_pos": None}
        return self.register(w)

    def make_films(self):
        rng = self.rng
        adapted = Counter()
        directors = self.role("director")
        film_series_director = rng.choice([d for d in directors if d["lang"] == "en"])
        for d in directors:
            n = rng.choice([2, 3, 3, 4, 4, 5])
            years = self.spread_years(d, n)
            if d is film_series_director:
                self.run_series(d, "en-film", "film", years[0], 3)
                years = years[1:]
            for y in years:
                source = None
                if rng.random() < 0.6:
                    best, best_score = None, 2.0
                    for b in self.works:
                        if b["kind"] not in ("novel", "collection", "graphic") or b["year"] > y - 2:
                            continue
                        if adapted[b["slug"]] >= 2:
                            continue
                        score = (3 * len(set(b["themes"]) & set(d["favs"])) + 1.5 * (b["lang"] == d["lang"])
                                 + 1.0 * (b["audience"] == d["audience"]) - 1.0 * adapted[b["slug"]]
                                 - 1.5 * (b["kind"] == "collection") + 2 * rng.random())
                        if score > best_score:
                            best, best_score = b, score
                    source = best
                if source:
                    adapted[source["slug"]] += 1
                self.new_film(d, y, source=source)

    # ---------------- audiobooks ----------------
    def make_audiobooks(self):
        rng = self.rng
        recorded = Counter()
        for nar in self.role("narrator"):
            n = rng.choice([2, 3, 3, 4])
            for y in self.spread_years(nar, n):
                best, best_score = None, -1
                for b in self.works:
                    if b["kind"] not in ("novel", "collection") or b["lang"] != nar["lang"]:
                        continue
                    if b["year"] >= nar["end"] or recorded[b["slug"]] >= 2:
                        continue
                    score = (2 * len(set(b["themes"]) & set(nar["favs"])) + 1.0 * (b["audience"] == nar["audience"])
                             - 3 * recorded[b["slug"]] + 2.5 * rng.random() + (1.5 if b["year"] < y else 0))
                    if score > best_score:
                        best, best_score = b, score
                if best is None:
                    continue
                year = y if y > best["year"] else min(best["year"] + rng.randint(1, 8), LAST_YEAR)
                suffix = AUDIO_SUFFIX[best["lang"]][recorded[best["slug"]]]
                en_suffix = AUDIO_SUFFIX["en"][recorded[best["slug"]]]
                recorded[best["slug"]] += 1
                w = {"kind": "audiobook", "title": best["title"] + suffix, "title_en": best["title_en"] + en_suffix,
                     "lang": best["lang"], "year": year, "author": best["author"], "illustrator": None,
                     "director": None, "reader": nar["slug"], "themes": list(best["themes"]),
                     "genre": best["genre"], "place": best["place"], "audience": best["audience"],
                     "protag": best["protag"], "based_on": best["slug"], "sequel_of": None, "series": None,
                     "series_pos": None}
                assert (w["lang"], w["title"]) not in self.titles_taken
                self.register(w)

    # ---------------- influence & collaboration ----------------
    def make_links(self):
        rng = self.rng
        creators = [p for p in self.people if p["role"] in ("writer", "graphic", "director", "illustrator")]
        for p in creators:
            if rng.random() > 0.72:
                continue
            cands = []
            for q in creators:
                if q is p or q["birth"] > p["birth"] - 8 or q["start"] > p["start"] - 10:
                    continue
                if p["slug"] in q.get("partners", []) or q["slug"] in p.get("partners", []):
                    continue  # a working partner is a collaborator, not an influence
                shared3 = len(set(p["favs"]) & set(q["favs"]))
                shared2 = len({PARENT[t] for t in p["favs"]} & {PARENT[t] for t in q["favs"]})
                if shared3 == 0 and shared2 == 0:
                    continue
                score = 3 * shared3 + shared2 + 0.8 * (p["lang"] == q["lang"]) + 1.5 * rng.random()
                cands.append((score, q["slug"]))
            cands.sort(reverse=True)
            k = rng.choice([1, 1, 2])
            p["influences"] = [slug for _s, slug in cands[:k]]
        pairs = []

        def collab(a, b):
            key = tuple(sorted((a, b)))
            if a != b and key not in pairs:
                pairs.append(key)
                self.by_slug[a]["collabs"].append(b)

        for g in self.role("graphic"):
            for ill in g.get("partners", []):
                collab(g["slug"], ill)
        for w in self.works:
            src = self.work_by_slug.get(w["based_on"]) if w["based_on"] else None
            if not src or not src["author"]:
                continue
            author = self.by_slug[src["author"]]
            alive = author["birth"] + 82 > w["year"]
            if w["kind"] == "film" and alive and rng.random() < 0.6:
                collab(w["director"], author["slug"])
            if w["kind"] == "audiobook" and alive and rng.random() < 0.35:
                collab(w["reader"], author["slug"])
        self.collab_pairs = pairs

    # ---------------- gaps & descriptions ----------------
    def make_gaps(self):
        rng = self.rng
        referenced = {w["based_on"] for w in self.works if w["based_on"]}
        plain = [w for w in self.works if w["kind"] == "novel" and not w["series"] and not w["sequel_of"]
                 and w["slug"] not in referenced]
        picks = rng.sample(plain, 6)
        for w in picks[:3]:
            w["place"] = None
        for w in picks[3:]:
            w["audience"] = None
        self.gap_works = [w["slug"] for w in picks]

    def describe(self, w):
        """One invented sentence, built from the work's themes, place and protagonist."""
        rng = self.rng
        thirds = [t for t in w["themes"] if LEVEL[t] == 3]
        # later books of a series (and sequels) lead with a different theme
        shift = w["series_pos"] or (1 if w["sequel_of"] else 0)
        if len(thirds) > 1 and shift:
            k = shift % len(thirds)
            thirds = thirds[k:] + thirds[:k]
        vp = THIRD[thirds[0]]["vp"]
        np = THIRD[thirds[1]]["np"] if len(thirds) > 1 else None
        place = PLACE_NAME[w["place"]] if w["place"] else None
        if w["place"] == "river-hollin":
            place = "the villages along the River Hollin"
        ch = w["protag"]

        def story():
            if place and np:
                return rng.choice([f"in {place}, {ch} {vp}, amid {np}",
                                   f"set in {place}, the story of how {ch} {vp}, against a background of {np}",
                                   f"{ch} {vp} in {place}, in a tale that also takes in {np}"])
            if place:
                return f"in {place}, {ch} {vp}"
            if np:
                return f"{ch} {vp}, amid {np}"
            return f"{ch} {vp}"

        kind = w["kind"]
        if kind == "collection":
            nps = [THIRD[t]["np"] for t in thirds]
            where = f"set in {place}" if place else "sharing one cast of characters"
            if len(nps) >= 2:
                s = f"linked stories {where}, ranging from {nps[0]} to {nps[1]}"
            else:
                s = f"linked stories {where}, all circling {nps[0]}"
        elif kind == "graphic":
            s = f"told in {rng.choice(GN_STYLES)} panels: {story()}"
        elif kind == "film" and w["based_on"]:
            src = self.work_by_slug[w["based_on"]]
            a = self.by_slug[src["author"]]["name"]
            where = f"in {place}, " if place else ""
            s = (f"screen adaptation of {a}'s {KIND_WORD[src['kind']]} \u201c{src['title']}\u201d: "
                 f"{where}{ch} {vp}")
        elif kind == "film":
            where = f"set in {place}, " if place else ""
            s = f"a film {where}in which {ch} {vp}" + (f", amid {np}" if np else "")
        elif kind == "audiobook":
            src = self.work_by_slug[w["based_on"]]
            nar = self.by_slug[w["reader"]]["name"]
            a = self.by_slug[src["author"]]["name"]
            s = f"{nar} reads {a}'s {src['year']} {KIND_WORD[src['kind']]}, in which {ch} {vp}"
        else:
            s = story()
        if w["series"] and w["series_pos"] is not None:
            what = "film" if kind == "film" else "book"
            joiner = ", " if s.startswith("told in") else ": "
            s = f"{ORDINALS[w['series_pos']].lower()} {what} of {w['series_name']}{joiner}{s}"
        elif w["sequel_of"]:
            prev = self.work_by_slug[w["sequel_of"]]
            joiner = ", " if s.startswith("told in") else ": "
            s = f"sequel to \u201c{prev['title']}\u201d{joiner}{s}"
        return cap(s) + "."

    # ---------------- run ----------------
    def run(self):
        self.make_people()
        self.make_books()
        self.top_up_rare()
        self.make_films()
        self.make_audiobooks()
        self.make_links()
        self.make_gaps()
        for w in self.works:
            w["desc"] = self.describe(w)
        self.works.sort(key=lambda w: (w["year"], w["slug"]))


# --------------------------------------------------------------------------
# Turtle output
# --------------------------------------------------------------------------
PREFIXES = """@prefix schema: <https://schema.org/> .
@prefix skos: <http://www.w3.org/2004/02/skos/core#> .
@prefix rdfs: <http://www.w3.org/2000/01/rdf-schema#> .
@prefix xsd: <http://www.w3.org/2001/XMLSchema#> .
@prefix hm: <https://hollinmere.example/vocab#> .
@prefix work: <https://hollinmere.example/work/> .
@prefix person: <https://hollinmere.example/person/> .
@prefix theme: <https://hollinmere.example/theme/> .
@prefix genre: <https://hollinmere.example/genre/> .
@prefix place: <https://hollinmere.example/place/> .
@prefix series: <https://hollinmere.example/series/> .
@prefix audience: <https://hollinmere.example/audience/> .
"""
HEADER = "# Hollinmere demo collection -- invented data, written by demo_collection/generate.py. Do not edit by hand.\n"


def block(subject, pairs):
    """pairs: list of (predicate, [objects]); returns a Turtle statement."""
    body = [f"    {pred} {' , '.join(objs)}" for pred, objs in pairs if objs]
    return subject + "\n" + " ;\n".join(body) + " .\n"


def write_vocab():
    out = [HEADER, "@prefix rdf: <http://www.w3.org/1999/02/22-rdf-syntax-ns#> .\n", PREFIXES, "\n"]
    classes = [
        ("hm:Novel", "schema:Book", "Novel", "Roman", "A long work of prose fiction."),
        ("hm:StoryCollection", "schema:Book", "Story collection", "Recueil de nouvelles",
         "A book of short stories, usually by one author."),
        ("hm:GraphicNovel", "schema:Book", "Graphic novel", "Roman graphique", "A book-length story told in comics form."),
        ("hm:Film", "schema:Movie", "Film", "Film", "A feature film held by the film circle."),
        ("hm:Audiobook", "schema:Audiobook", "Audiobook", "Livre audio", "A recorded reading of a book."),
    ]
    for cls, sup, en, fr, comment in classes:
        out.append(block(cls, [("a", ["rdfs:Class"]), ("rdfs:subClassOf", [sup]),
                               ("rdfs:label", [lit(en, "en"), lit(fr, "fr")]), ("rdfs:comment", [lit(comment, "en")])]))
        out.append("\n")
    props = [
        ("hm:sequelOf", "sequel of", "suite de", "schema:CreativeWork", "schema:CreativeWork",
         "The subject continues the story of the object."),
        ("hm:influencedBy", "influenced by", "influencé par", "schema:Person", "schema:Person",
         "The subject acknowledged the object, an earlier creator, as an influence."),
        ("hm:collaboratedWith", "collaborated with", "a collaboré avec", "schema:Person", "schema:Person",
         "The two people worked together (a symmetric relation; stated once per pair)."),
    ]
    for prop, en, fr, dom, rng_, comment in props:
        out.append(block(prop, [("a", ["rdf:Property"]), ("rdfs:label", [lit(en, "en"), lit(fr, "fr")]),
                                ("rdfs:domain", [dom]), ("rdfs:range", [rng_]),
                                ("rdfs:comment", [lit(comment, "en")])]))
        out.append("\n")
    for slug, en, fr, age in [("children", "Children", "Enfants", 0), ("teen", "Teenagers", "Adolescents", 12),
                              ("adult", "Adults", "Adultes", 18)]:
        out.append(block(f"audience:{slug}", [("a", ["schema:Audience"]),
                                              ("rdfs:label", [lit(en, "en"), lit(fr, "fr")]),
                                              ("schema:suggestedMinAge", [str(age)])]))
        out.append("\n")
    return "".join(out)


def write_themes():
    out = [HEADER, PREFIXES, "\n"]
    out.append(block("theme:scheme", [("a", ["skos:ConceptScheme"]),
                                      ("skos:prefLabel", [lit("Hollinmere themes", "en"), lit("Thèmes de Hollinmere", "fr")]),
                                      ("skos:hasTopConcept", [f"theme:{t}" for t in TOPS])]))
    out.append("\n")

    def concept(slug, en, fr, parent):
        labels = [lit(en, "en")] + ([lit(fr, "fr")] if fr else [])
        pairs = [("a", ["skos:Concept"]), ("skos:prefLabel", labels), ("skos:inScheme", ["theme:scheme"])]
        pairs.append(("skos:topConceptOf", ["theme:scheme"]) if parent is None else ("skos:broader", [f"theme:{parent}"]))
        return block(f"theme:{slug}", pairs)

    for top, en, fr, seconds in THEMES:
        out.append(concept(top, en, fr, None))
        for sec, en2, fr2, thirds in seconds:
            out.append(concept(sec, en2, fr2, top))
            for slug, en3, fr3, *_rest in thirds:
                out.append(concept(slug, en3, fr3, sec))
        out.append("\n")
    out.append(block("genre:scheme", [("a", ["skos:ConceptScheme"]),
                                      ("skos:prefLabel", [lit("Hollinmere genres", "en"), lit("Genres de Hollinmere", "fr")]),
                                      ("skos:hasTopConcept", [f"genre:{g}" for g, _e, _f in GENRES])]))
    for g, en, fr in GENRES:
        out.append(block(f"genre:{g}", [("a", ["skos:Concept"]), ("skos:prefLabel", [lit(en, "en"), lit(fr, "fr")]),
                                        ("skos:inScheme", ["genre:scheme"]), ("skos:topConceptOf", ["genre:scheme"])]))
    return "".join(out)


def write_places():
    out = [HEADER, PREFIXES, "\n"]
    for slug, name, _lang, desc in REGIONS:
        out.append(block(f"place:{slug}", [("a", ["schema:Place"]), ("schema:name", [lit(name, "en")]),
                                           ("schema:description", [lit(desc, "en")])]))
    out.append("\n")
    for slug, name, parent, desc in PLACES:
        out.append(block(f"place:{slug}", [("a", ["schema:Place"]), ("schema:name", [lit(name, "en")]),
                                           ("schema:containedInPlace", [f"place:{parent}"]),
                                           ("schema:description", [lit(desc, "en")])]))
    return "".join(out)


def write_people(gen):
    out = [HEADER, PREFIXES, "\n"]
    for p in sorted(gen.people, key=lambda p: p["slug"]):
        out.append(block(f"person:{p['slug']}", [
            ("a", ["schema:Person"]),
            ("schema:name", [lit(p["name"])]),
            ("schema:birthDate", [f'"{p["birth"]}"^^xsd:gYear']),
            ("schema:homeLocation", [f"place:{p['home']}"]),
            ("hm:influencedBy", [f"person:{s}" for s in p["influences"]]),
            ("hm:collaboratedWith", [f"person:{s}" for s in p["collabs"]]),
        ]))
    return "".join(out)


def write_works(gen):
    out = [HEADER, PREFIXES, "\n"]
    for s in gen.series:
        names = [lit(s["name_en"], "en")] + ([lit(s["name_local"], s["lang"])] if s["name_local"] else [])
        out.append(block(f"series:{s['slug']}", [("a", ["schema:CreativeWorkSeries"]), ("schema:name", names)]))
    out.append("\n")
    for w in gen.works:
        names = [lit(w["title"], w["lang"])]
        if w["lang"] != "en":
            names.append(lit(w["title_en"], "en"))
        pairs = [("a", [KIND_CLASS[w["kind"]]]), ("schema:name", names)]
        if w["author"]:
            pairs.append(("schema:author", [f"person:{w['author']}"]))
        if w["illustrator"]:
            pairs.append(("schema:illustrator", [f"person:{w['illustrator']}"]))
        if w["director"]:
            pairs.append(("schema:director", [f"person:{w['director']}"]))
        if w["reader"]:
            pairs.append(("schema:readBy", [f"person:{w['reader']}"]))
        pairs += [
            ("schema:about", [f"theme:{t}" for t in w["themes"]]),
            ("schema:genre", [f"genre:{w['genre']}"]),
            ("schema:contentLocation", [f"place:{w['place']}"] if w["place"] else []),
            ("schema:datePublished", [f'"{w["year"]}"^^xsd:gYear']),
            ("schema:inLanguage", [lit(w["lang"])]),
            ("schema:audience", [f"audience:{w['audience']}"] if w["audience"] else []),
            ("schema:isBasedOn", [f"work:{w['based_on']}"] if w["based_on"] else []),
            ("hm:sequelOf", [f"work:{w['sequel_of']}"] if w["sequel_of"] else []),
            ("schema:isPartOf", [f"series:{w['series']}"] if w["series"] else []),
            ("schema:description", [lit(w["desc"], "en")]),
        ]
        out.append(block(f"work:{w['slug']}", pairs))
    return "".join(out)


def main(argv):
    outdir = argv[1] if len(argv) > 1 else os.path.dirname(os.path.abspath(__file__))
    gen = Generator()
    gen.run()
    files = {
        "vocab.ttl": write_vocab(),
        "themes.ttl": write_themes(),
        "places.ttl": write_places(),
        "people.ttl": write_people(gen),
        "works.ttl": write_works(gen),
    }
    for name, text in files.items():
        with open(os.path.join(outdir, name), "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
    kinds = Counter(w["kind"] for w in gen.works)
    print(f"wrote {', '.join(files)} to {outdir}")
    print(f"works: {len(gen.works)} {dict(kinds)}; people: {len(gen.people)}; series: {len(gen.series)}")
    return gen


if __name__ == "__main__":
    main(sys.argv)
