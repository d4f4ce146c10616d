"""run_section: the same files as the command line's `section`, and the output-folder rules."""

import shutil
import subprocess

import pytest

import lodestone
from conftest import RECORDS

PROJECT_FILES = ["steps.csv", "sampling.csv", "timescale.csv", "settings.toml"]


@pytest.fixture()
def project(tmp_path):
    """A copy of the invented demo project (records/demo)."""
    folder = tmp_path / "demo"
    folder.mkdir()
    for name in PROJECT_FILES:
        shutil.copy(RECORDS / "demo" / name, folder / name)
    return folder


def files(folder):
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def test_run_section_writes_what_the_command_line_writes(cli, project, tmp_path):
    out = lodestone.run_section(project, tmp_path / "from-python")
    assert out == tmp_path / "from-python"
    done = subprocess.run([str(cli.binary), "section", str(project), "--out", str(tmp_path / "from-cli"), "--quiet"],
                          capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    ours, theirs = files(out), files(tmp_path / "from-cli")
    assert "report.html" in ours and "figures/column.svg" in ours
    assert ours.keys() == theirs.keys()
    for name in ours:
        assert ours[name] == theirs[name], name


def test_run_section_output_rules(project, tmp_path):
    out = lodestone.run_section(project)
    assert out == project.parent / "demo-report" and (out / "report.html").is_file()
    with pytest.raises(lodestone.LodestoneError, match="not empty"):
        lodestone.run_section(project, out)
    keep = out / "notes.txt"
    keep.write_text("mine")
    assert lodestone.run_section(project, out, force=True) == out
    assert keep.read_text() == "mine"
    with pytest.raises(lodestone.LodestoneError, match="input"):
        lodestone.run_section(project, project, force=True)
    (project / "steps.csv").unlink()
    with pytest.raises(lodestone.LodestoneError, match="steps.csv"):
        lodestone.run_section(project, tmp_path / "never")
    assert not (tmp_path / "never").exists()
