"""What the engine and the line commands import, checked in a fresh interpreter each time:
the engine is a plain library and never imports textual; `ladle point` and the command table
import neither textual nor scipy (they must start fast)."""

from __future__ import annotations

import json
import subprocess
import sys
import textwrap


def _modules_after(code: str) -> dict:
    """Run `code` in a fresh interpreter; it leaves its result in `out` (a dict); returned with
    the loaded top-level packages under "loaded"."""
    script = textwrap.dedent(code) + textwrap.dedent("""
        import json as _json, sys as _sys
        out["loaded"] = sorted({m.split(".")[0] for m in _sys.modules})
        _sys.stderr.flush()
        print(_json.dumps(out))
    """)
    run = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, timeout=120)
    assert run.returncode == 0, run.stderr
    return json.loads(run.stdout.strip().splitlines()[-1])


def test_no_engine_module_imports_textual():
    out = _modules_after("""
        import importlib, pkgutil
        import ladle.engine
        out = {"modules": []}
        for info in pkgutil.walk_packages(ladle.engine.__path__, "ladle.engine."):
            importlib.import_module(info.name)
            out["modules"].append(info.name.removeprefix("ladle.engine."))
    """)
    assert {"diagrams.diagram", "minimize.equilibrium", "files.loader", "diagrams.melt", "models.phases",
            "minimize.section"} <= set(out["modules"])
    assert "textual" not in out["loaded"]
    assert "ladle" in out["loaded"]


def test_command_table_imports_neither_textual_nor_scipy():
    out = _modules_after("""
        from ladle.tui.cli import build_parser
        parser, modules = build_parser()
        out = {"commands": sorted(modules)}
    """)
    assert {"point", "systems", "melt", "diagram"} <= set(out["commands"])
    assert "textual" not in out["loaded"]
    assert "scipy" not in out["loaded"]


def test_ladle_point_imports_neither_textual_nor_scipy():
    out = _modules_after("""
        import contextlib, io, json
        from ladle.tui.cli import main
        buf = io.StringIO()
        with contextlib.redirect_stdout(buf):
            rc = main(["point", "pb-sn", "--temp", "250C", "--comp", "Sn=30wt%", "--json"])
        out = {"rc": rc, "answer": json.loads(buf.getvalue())}
    """)
    assert out["rc"] == 0
    assert out["answer"]["system"] == "pb-sn"          # it did compute an answer
    assert out["answer"]["phases"]
    assert "textual" not in out["loaded"]
    assert "scipy" not in out["loaded"]
