"""The command line opens the window lazily: ``curator`` and ``curator open PATH``."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pytest

import curator.gui
from curator.cli.main import main


def test_no_arguments_opens_the_window_on_the_demo(monkeypatch: pytest.MonkeyPatch) -> None:
    calls: list[Any] = []
    monkeypatch.setattr(curator.gui, "run", lambda paths: calls.append(paths) or 0)
    assert main([]) == 0
    assert calls == [None]


def test_open_passes_the_paths(monkeypatch: pytest.MonkeyPatch, tmp_path: Path) -> None:
    calls: list[Any] = []
    monkeypatch.setattr(curator.gui, "run", lambda paths: calls.append(paths) or 0)
    (tmp_path / "a.ttl").write_text("", encoding="utf-8")
    assert main(["open", str(tmp_path / "a.ttl"), str(tmp_path)]) == 0
    assert calls == [[str(tmp_path / "a.ttl"), str(tmp_path)]]


def test_open_a_missing_path_is_bad_input(
    monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    monkeypatch.setattr(curator.gui, "run", lambda paths: 0)
    assert main(["open", "/no/such/catalogue.ttl"]) == 2
    assert "no such file" in capsys.readouterr().err
