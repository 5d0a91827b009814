"""Files written by the explorer never replace an existing file."""

from ladle.engine.files.atomic_files import write_new_file
from ladle.tui.explorer.exports import safe_stem


def test_existing_files_are_kept_and_names_numbered(tmp_path):
    (tmp_path / "ladle-point.json").write_text("the user's own file")
    first = write_new_file(tmp_path, "ladle-point", ".json", "{}\n")
    second = write_new_file(tmp_path, "ladle-point", ".json", "[]\n")
    assert (tmp_path / "ladle-point.json").read_text() == "the user's own file"
    assert first.name == "ladle-point-2.json" and first.read_text() == "{}\n"
    assert second.name == "ladle-point-3.json" and second.read_text() == "[]\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == [
        "ladle-point-2.json", "ladle-point-3.json", "ladle-point.json"]   # no temporary left


def test_safe_stem_keeps_names_portable():
    assert safe_stem("ladle-point-pb-sn-183°C-61.9wt") == "ladle-point-pb-sn-183_C-61.9wt"
    assert safe_stem("../..") == "ladle"
