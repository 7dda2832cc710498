"""`curator audit` and `curator export` end to end (in process)."""

from __future__ import annotations

import json

import pyoxigraph as ox

from curator.cli.main import main
from curator.core.session import ListEntry, Session

MIRROR = "https://hollinmere.example/work/the-mirror-of-gullstane"
HERON = "https://hollinmere.example/work/thessalys-heron"


def _session(tmp_path):
    session = Session(title="Islands and winters", seeds=[MIRROR])
    session.insert_entry(0, ListEntry(HERON, "Thessaly's Heron", "", "Read aloud in week one"))
    session.insert_entry(1, ListEntry(MIRROR, "The Mirror of Gullstane", "Our anchor."))
    path = tmp_path / "list.curator.json"
    session.save(path)
    return path


def test_audit_json_of_a_session(tmp_path, capsys):
    path = _session(tmp_path)
    assert main(["audit", str(path), "--json", "--language", "en"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["entries"] == 2
    kinds = next(f for f in data["facets"] if f["facet"] == "kind")
    assert sum(v["share"] for v in kinds["values"]) == 1.0


def test_export_every_format(tmp_path, capsys):
    path = _session(tmp_path)
    for fmt in ("html", "md", "csv", "jsonld", "ttl"):
        out = tmp_path / f"list.{fmt}"
        assert main(["export", str(path), "--to", fmt, "-o", str(out), "--language", "en"]) == 0
        assert out.stat().st_size > 0
    store = ox.Store()
    store.load(path=tmp_path / "list.ttl", format=ox.RdfFormat.TURTLE)
    position = ox.NamedNode("https://schema.org/position")
    positions = sorted(int(q.object.value) for q in store.quads_for_pattern(None, position, None))
    assert positions == [1, 2]
    html = (tmp_path / "list.html").read_text()
    assert "Read aloud in week one" in html and "Our anchor." in html
    # the empty rationale was filled from what the entry shares with the rest of the list
    assert "Shares" in html


def test_outside_list_problems_are_reported(tmp_path, capsys):
    listing = tmp_path / "shelf.txt"
    listing.write_text("The Mirror of Gullstane\nNo Such Book At All\n", encoding="utf-8")
    out = tmp_path / "shelf.md"
    assert main(["export", str(listing), "--to", "md", "-o", str(out), "--language", "en"]) == 0
    err = capsys.readouterr().err
    assert "line 2: unmatched" in err


def test_bad_input_exits_2(tmp_path, capsys):
    missing_folder = tmp_path / "nowhere" / "x.html"
    path = _session(tmp_path)
    assert main(["export", str(path), "--to", "html", "-o", str(missing_folder)]) == 2
    assert "no such folder" in capsys.readouterr().err
    bad_targets = tmp_path / "t.toml"
    bad_targets.write_text("[[require]]\nfacet = \"mood\"\n", encoding="utf-8")
    assert main(["audit", str(path), "--targets", str(bad_targets)]) == 2
    err = capsys.readouterr().err
    assert "facet" in err and "Traceback" not in err
    broken = tmp_path / "broken.curator.json"
    broken.write_text('{"format": "curator-session", "version": 99}', encoding="utf-8")
    assert main(["audit", str(broken)]) == 2
    assert "newer curator" in capsys.readouterr().err
    assert broken.read_text() == '{"format": "curator-session", "version": 99}'
