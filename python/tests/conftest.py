"""Shared helpers: the repository's records, and the command-line binary run for its JSON."""

import json
import os
import pathlib
import subprocess

import pandas as pd
import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]
RECORDS = ROOT / "records"


def record(name: str) -> pathlib.Path:
    """A file of records/ (the invented demonstration data)."""
    return RECORDS / name


def read_table(name: str) -> pd.DataFrame:
    """A records/ table as a DataFrame (comment lines skipped)."""
    return pd.read_csv(record(name), comment="#")


def _binary() -> pathlib.Path:
    """The lodestone binary: $LODESTONE_BIN, else target/debug/lodestone (built if missing)."""
    given = os.environ.get("LODESTONE_BIN")
    if given:
        return pathlib.Path(given)
    path = ROOT / "target" / "debug" / "lodestone"
    if not path.exists():
        subprocess.run(["cargo", "build", "--quiet", "--bin", "lodestone"], cwd=ROOT, check=True)
    return path


@pytest.fixture(scope="session")
def cli():
    """Run the command line with --format json and return the parsed document."""
    binary = _binary()

    def run(*args):
        done = subprocess.run(
            [str(binary), *map(str, args), "--format", "json", "--quiet"],
            cwd=ROOT,
            capture_output=True,
            text=True,
        )
        assert done.returncode == 0, done.stderr
        return json.loads(done.stdout)

    run.binary = binary
    return run
