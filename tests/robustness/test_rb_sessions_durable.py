"""Nothing lost: a save that fails half-way, a process killed after autosave, damaged and
future session files, and an old-version file."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
from pathlib import Path

import pytest

import curator.core.files as files
from curator.core.session import SESSION_VERSION, ListEntry, Session, SessionError
from curator.services import sessions

REPO = Path(__file__).resolve().parents[2]


def sample_session(title: str = "Coastal reading") -> Session:
    session = Session(title=title, seeds=["https://e/w1"], dismissed=["https://e/w9"])
    session.insert_entry(0, ListEntry("https://e/w2", "Harbour Lights", "Shares tides.", "Ask"))
    session.insert_entry(1, ListEntry("https://e/w3", "Orchard Year", "", "noté ✓"))
    return session


def test_failed_fsync_keeps_the_old_file_and_no_temp_file(tmp_path, monkeypatch):
    path = tmp_path / "list.curator.json"
    sample_session("Old").save(path)
    before = path.read_bytes()
    written = []

    def failing_fsync(fd):
        written.append(os.fstat(fd).st_size)  # the data is in the temp file by now
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(files.os, "fsync", failing_fsync)
    with pytest.raises(OSError):
        sample_session("New and longer title").save(path)
    monkeypatch.undo()
    assert written and written[0] > 0  # the fault hit after the data was written
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [path.name]


CHILD = """
import os, signal
from curator.core.session import ListEntry, Session
from curator.services.sessions import write_recovery
session = Session(title="Killed mid-work", seeds=["https://e/w1"], dismissed=["https://e/w9"])
session.insert_entry(0, ListEntry("https://e/w2", "Harbour Lights", "Shares tides.", "Ask"))
session.insert_entry(1, ListEntry("https://e/w3", "Orchard Year", "", "noté ✓"))
write_recovery(session)
os.kill(os.getpid(), signal.SIGKILL)
print("not reached")
"""


def test_recovery_survives_sigkill(tmp_path, monkeypatch):
    env = {**os.environ, "CURATOR_STATE_DIR": str(tmp_path), "PYTHONPATH": str(REPO)}
    done = subprocess.run(
        [sys.executable, "-c", CHILD], env=env, capture_output=True, text=True, timeout=60
    )
    assert done.returncode == -signal.SIGKILL, done.stderr
    assert "not reached" not in done.stdout
    monkeypatch.setenv("CURATOR_STATE_DIR", str(tmp_path))
    recovered = sessions.read_recovery()
    assert recovered is not None
    expected = Session(title="Killed mid-work", seeds=["https://e/w1"], dismissed=["https://e/w9"])
    expected.insert_entry(0, ListEntry("https://e/w2", "Harbour Lights", "Shares tides.", "Ask"))
    expected.insert_entry(1, ListEntry("https://e/w3", "Orchard Year", "", "noté ✓"))
    assert recovered.same_content(expected)
    assert not recovered.same_content(Session(title="Killed mid-work"))


def test_truncated_session_is_refused_and_untouched(tmp_path):
    path = tmp_path / "cut.curator.json"
    sample_session().save(path)
    data = path.read_bytes()[:-40]
    path.write_bytes(data)
    with pytest.raises(SessionError) as info:
        Session.load(path)
    assert str(path) in str(info.value) and "not valid JSON" in str(info.value)
    assert path.read_bytes() == data


def test_future_version_is_refused_and_untouched(tmp_path):
    path = tmp_path / "future.curator.json"
    content = sample_session().to_json()
    content["version"] = 99
    data = json.dumps(content).encode()
    path.write_bytes(data)
    with pytest.raises(SessionError, match="newer curator") as info:
        Session.load(path)
    assert "99" in str(info.value)
    assert path.read_bytes() == data


def test_version_one_file_loads_and_saves_as_current(tmp_path):
    path = tmp_path / "old.curator.json"
    old = {
        "format": "curator-session",
        "version": 1,
        "title": "Old list",
        "created": "2024-01-01T00:00:00+00:00",
        "saved": "2024-01-02T00:00:00+00:00",
        "catalogue": [],
        "seeds": ["https://e/w1"],
        "entries": [{"iri": "https://e/w2", "label": "Two", "rationale": "r", "note": "n"}],
        "dismissed": [],
        "settings": {
            "lam": 0.5,
            "mode": "blend",
            "kinds": [],
            "year_from": None,
            "year_to": None,
            "languages": [],
        },
    }
    data = json.dumps(old).encode()
    path.write_bytes(data)
    session = Session.load(path)
    assert path.read_bytes() == data  # reading never rewrites
    assert session.title == "Old list" and session.settings.lam == 0.5
    assert session.entries == [ListEntry("https://e/w2", "Two", "r", "n")]
    assert session.settings.fill_gaps is False and session.settings.targets == ""
    out = tmp_path / "new.curator.json"
    session.save(out)
    saved = json.loads(out.read_text(encoding="utf-8"))
    assert saved["version"] == SESSION_VERSION == 2
    assert saved["settings"]["fill_gaps"] is False
