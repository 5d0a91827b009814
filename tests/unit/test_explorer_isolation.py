"""The engine is a plain library: importing it, or running a line-mode command, never loads
textual; the explorer package itself loads textual only when it runs."""

import subprocess
import sys

import pytest

PROBE = "import sys; {imports}; print(sorted(m for m in sys.modules if m.split('.')[0] in " \
        "('textual', 'textual_plotext', 'textual_serve')))"


@pytest.mark.parametrize("imports", [
    "import ladle.engine, ladle.engine.diagrams.diagram, ladle.engine.diagrams.melt, ladle.engine.units",
    "import ladle.tui.cli",
    "import ladle.tui.explorer, ladle.tui.explorer.exploration, "
    "ladle.tui.explorer.diagram_drawing, ladle.tui.explorer.status_lines",
])
def test_no_textual_on_these_paths(imports):
    out = subprocess.run([sys.executable, "-c", PROBE.format(imports=imports)],
                         capture_output=True, text=True, check=True).stdout
    assert out.strip() == "[]"


def test_the_probe_sees_textual_when_it_is_imported():
    out = subprocess.run([sys.executable, "-c", PROBE.format(imports="import textual.app")],
                         capture_output=True, text=True, check=True).stdout
    assert "textual.app" in out
