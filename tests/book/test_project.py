"""Project files: validation, round trips, atomic and conflict-safe saving."""

import os
import shutil
from pathlib import Path

import pytest

from ledger.book import Background, Project
from ledger.errors import ProjectChangedError, ProjectError

PROJECTS = sorted(Path(__file__).resolve().parents[2].joinpath("projects").glob("*.toml"))
BROKEN = Path(__file__).resolve().parent.parent / "fixtures" / "broken"


@pytest.mark.parametrize("path", PROJECTS, ids=lambda p: p.name)
def test_example_projects_load_and_round_trip_byte_identical(path, tmp_path):
    copy = tmp_path / path.name
    shutil.copy(path, copy)
    project = Project.load(copy)
    assert project.entries
    before = copy.read_bytes()
    project.save()
    assert copy.read_bytes() == before


def test_unknown_fields_survive_a_save(tmp_path):
    text = PROJECTS[0].read_text().replace(
        'title = ', 'future_field = "kept"\ntitle = ', 1)
    text = text.replace('[[entries]]\nid = "e0001"', '[[entries]]\nid = "e0001"\nrating = 5', 1)
    path = tmp_path / "p.toml"
    path.write_text(text)
    project = Project.load(path)
    project.save()
    again = Project.load(path)
    assert again.extra["future_field"] == "kept"
    assert again.entry("e0001").extra["rating"] == 5
    project.save()
    assert Project.load(path).to_text() == again.to_text()


@pytest.mark.parametrize("name", sorted(p.name for p in BROKEN.iterdir()))
def test_broken_files_are_rejected_with_one_line(name):
    path = BROKEN / name
    before = path.read_bytes() if path.is_file() else None
    with pytest.raises(ProjectError) as info:
        Project.load(path)
    assert "\n" not in str(info.value)
    if before is not None:
        assert path.read_bytes() == before


def test_missing_file_and_directory(tmp_path):
    with pytest.raises(ProjectError, match="no such file"):
        Project.load(tmp_path / "absent.toml")
    with pytest.raises(ProjectError, match="directory"):
        Project.load(tmp_path)


def _project_file(tmp_path) -> Path:
    path = tmp_path / "p.toml"
    shutil.copy(PROJECTS[0], path)
    return path


def test_interrupted_replace_leaves_old_file(tmp_path, monkeypatch):
    path = _project_file(tmp_path)
    before = path.read_bytes()
    project = Project.load(path)
    project.title = "changed"

    def failing_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(os, "replace", failing_replace)
    with pytest.raises(ProjectError, match="previous file is unchanged"):
        project.save()
    monkeypatch.undo()
    assert path.read_bytes() == before
    assert [p.name for p in tmp_path.iterdir() if p.name.endswith(".tmp")] == []


def test_interrupted_write_leaves_old_file(tmp_path, monkeypatch):
    path = _project_file(tmp_path)
    before = path.read_bytes()
    project = Project.load(path)
    project.title = "changed"

    def failing_fsync(fd):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(os, "fsync", failing_fsync)
    with pytest.raises(ProjectError):
        project.save()
    monkeypatch.undo()
    assert path.read_bytes() == before


def test_save_keeps_one_backup(tmp_path):
    path = _project_file(tmp_path)
    before = path.read_bytes()
    project = Project.load(path)
    project.title = "changed"
    project.save()
    assert (tmp_path / "p.toml.bak").read_bytes() == before
    assert Project.load(path).title == "changed"


def test_file_changed_on_disk_is_not_overwritten(tmp_path):
    path = _project_file(tmp_path)
    project = Project.load(path)
    project.title = "mine"
    edited = path.read_text().replace("Halvorsen", "Someone else", 1)
    path.write_text(edited)
    with pytest.raises(ProjectChangedError):
        project.save()
    assert path.read_text() == edited
    project.save(force=True)
    assert Project.load(path).title == "mine"


def test_add_entry_keeps_others_identical(tmp_path):
    path = _project_file(tmp_path)
    project = Project.load(path)
    before = [e.to_dict() for e in project.entries]
    entry = project.add_entry(background=project.backgrounds[0].id, genus=1, operator="D^8R^4",
                              structure="sigma2^2", coefficient="C(2,1,1)")
    project.save()
    after = Project.load(path)
    assert [e.to_dict() for e in after.entries[:-1]] == before
    assert after.entries[-1].id == entry.id


def test_new_project_refuses_to_replace_an_existing_file(tmp_path):
    path = _project_file(tmp_path)
    before = path.read_bytes()
    fresh = Project.new("other")
    fresh.add_background(Background("b", "B", "IIB", 10, "none"))
    with pytest.raises(ProjectChangedError):
        fresh.save(path)
    assert path.read_bytes() == before
