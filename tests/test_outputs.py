"""Outputs never escape their folder or overwrite an input; writes are atomic."""
import os

import pytest

from geomjoint.errors import InputError
from geomjoint.outputs import new_output_folder, safe_name, write_atomic


@pytest.mark.parametrize("name", ["../../etc/passwd", "a/b\\c", "nul\x00byte", "x" * 300, "..", ""])
def test_safe_name_stays_in_folder(tmp_path, name):
    cleaned = safe_name(name)
    assert "/" not in cleaned and "\\" not in cleaned and "\x00" not in cleaned
    assert ".." not in cleaned and cleaned
    assert len(cleaned) <= 80
    target = (tmp_path / cleaned).resolve()
    assert target.parent == tmp_path.resolve()


def test_new_output_folder_is_new(tmp_path):
    a = new_output_folder(tmp_path, "job")
    b = new_output_folder(tmp_path, "job")
    assert a != b and a.is_dir() and b.is_dir()


def test_write_atomic_refuses_input(tmp_path):
    model = tmp_path / "model.step"
    model.write_bytes(b"ISO-10303-21;")
    with pytest.raises(InputError):
        write_atomic(model, "x", protect=[model])
    assert model.read_bytes() == b"ISO-10303-21;"


def test_write_atomic_leaves_no_partial_file(tmp_path, monkeypatch):
    target = tmp_path / "results.json"

    def crash(*args, **kwargs):
        raise OSError("disk full")

    monkeypatch.setattr(os, "replace", crash)
    with pytest.raises(OSError):
        write_atomic(target, "{}")
    assert not target.exists()
    assert list(tmp_path.iterdir()) == []
