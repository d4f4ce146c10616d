"""The example script runs from start to end and draws its figure with the package's column_figure."""

import subprocess
import sys

from conftest import ROOT


def test_demo_section_example_runs(tmp_path):
    out = tmp_path / "demo-out"
    done = subprocess.run([sys.executable, str(ROOT / "python" / "examples" / "demo_section.py"), str(out)],
                          cwd=ROOT, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    figure = tmp_path / "demo-out-column.svg"
    assert figure.read_text().lstrip().startswith("<svg")
    assert "Sallowmere Gulch" in figure.read_text()
    assert (out / "report.html").is_file()
    for words in ("paleopole", "caution:", "Laplace U", "synthetic chrons"):
        assert words in done.stdout, words
