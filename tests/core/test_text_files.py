"""The one reader of user-named text files: each refusal names the file and the kind of file expected."""

from __future__ import annotations

import os

import pytest

from pmdc_sizer.core import text_files
from pmdc_sizer.core.errors import ProjectError


def _read(path, kind="library file", max_bytes=1024):
    return text_files.read_text(path, kind=kind, max_bytes=max_bytes)


def test_text_comes_back_without_its_byte_order_mark(tmp_path):
    path = tmp_path / "a.toml"
    path.write_bytes("\ufeffname = \"ä\"\n".encode())
    assert _read(path) == 'name = "ä"\n'


@pytest.mark.parametrize(("make", "fragment"), [
    (lambda p: p.mkdir(), "is a folder, not a library file"),
    (lambda p: p.symlink_to(p.parent / "nowhere"), "is a link to a file that does not exist"),
    (lambda p: os.mkfifo(p), "is a device or a pipe, not a library file"),
    (lambda p: p.write_bytes(b"x" * 1025), "is larger than any library file (more than 1 kB)"),
    (lambda p: p.write_bytes(b"a = 1\x00"), "this is a binary file, not a library file"),
    (lambda p: p.write_bytes(b"a = '\xff'"), "not UTF-8 text (byte 6 cannot be read"),
    (lambda _p: None, "cannot read the file (No such file or directory)"),
], ids=["folder", "dangling link", "fifo", "too large", "binary", "not utf-8", "missing"])
def test_each_refusal_names_the_file_and_the_kind(tmp_path, make, fragment):
    path = tmp_path / "bad.toml"
    make(path)
    with pytest.raises(ProjectError) as caught:
        _read(path)
    assert str(caught.value).startswith(f"{path}: ") and fragment in str(caught.value)


def test_a_file_of_exactly_the_limit_is_read(tmp_path):
    path = tmp_path / "full.toml"
    path.write_bytes(b"#" * 1024)
    assert len(_read(path)) == 1024


@pytest.mark.parametrize(("text", "fragment"), [
    ("a = [", "not a valid TOML file"),
    ("a = " + "[" * 2000 + "]" * 2000, "not a project file (its tables or arrays are nested too deeply)"),
    ("a = " + "1" * 5000, "not a project file (it holds a number of more than 4300 digits)"),
])
def test_parse_refusals_name_the_source_and_the_kind(text, fragment):
    with pytest.raises(ProjectError, match=r"^motor\.toml: ") as caught:
        text_files.parse_toml(text, "motor.toml", "project file")
    assert fragment in str(caught.value)


def test_parse_accepts_a_byte_order_mark():
    assert text_files.parse_toml("\ufeffa = 1\n", "motor.toml", "project file") == {"a": 1}
