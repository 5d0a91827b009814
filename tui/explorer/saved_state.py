"""Where the explorer left off: system, cursor and units, kept between runs.

Kept as JSON in the user's XDG state folder ($XDG_STATE_HOME/ladle/explorer.json, by default
~/.local/state/ladle/explorer.json), written atomically (a temporary file in the same folder,
then renamed over the old one), so a crash never leaves half a file.
"""

from __future__ import annotations

import json
import math
import os
from dataclasses import asdict, dataclass
from pathlib import Path

from ladle.engine.files.atomic_files import write_atomic
from ladle.engine.units import TEMPERATURE_UNITS

from .scales import COMPOSITION_UNITS


@dataclass(frozen=True)
class SavedState:
    """The explorer's remembered place. Temperature in K, composition as mole fraction of B."""

    system: str
    temperature_K: float
    x_B: float
    temperature_unit: str = "C"
    composition_unit: str = "wt"


def state_path(environ: dict[str, str] | None = None) -> Path:
    """The state file, following the XDG base directory rules."""
    env = os.environ if environ is None else environ
    base = env.get("XDG_STATE_HOME", "").strip()
    if not base or not os.path.isabs(base):
        base = os.path.join(os.path.expanduser("~"), ".local", "state")
    return Path(base) / "ladle" / "explorer.json"


#: A state file is a few hundred bytes; anything much larger is not one of ours.
LARGEST_STATE_BYTES = 65536


def load_state(path: Path) -> SavedState | None:
    """The saved state, or None when there is none or it cannot be read as one."""
    return read_state(path)[0]


def read_state(path: Path) -> tuple[SavedState | None, str | None]:
    """(the saved state or None, why a file that exists was not used or None).

    A damaged or foreign file (not JSON, deeply nested, huge numbers, wrong fields, too large)
    is ignored (and replaced on the next save): the explorer then opens as on a first run.
    """
    try:
        with path.open("rb") as handle:
            raw = handle.read(LARGEST_STATE_BYTES + 1)
    except FileNotFoundError:
        return None, None
    except OSError as error:
        return None, f"cannot read it ({error.strerror or error})"
    if len(raw) > LARGEST_STATE_BYTES:
        return None, f"larger than {LARGEST_STATE_BYTES} bytes"
    try:
        data = json.loads(raw.decode("utf-8"))
        state = SavedState(
            system=str(data["system"]),
            temperature_K=float(data["temperature_K"]),
            x_B=float(data["x_B"]),
            temperature_unit=str(data.get("temperature_unit", "C")),
            composition_unit=str(data.get("composition_unit", "wt")),
        )
    except (ValueError, KeyError, TypeError, AttributeError, RecursionError, OverflowError, IndexError):
        return None, "not a state file of this version"
    if not (math.isfinite(state.temperature_K) and state.temperature_K > 0
            and math.isfinite(state.x_B) and 0.0 <= state.x_B <= 1.0
            and state.temperature_unit in TEMPERATURE_UNITS
            and state.composition_unit in COMPOSITION_UNITS):
        return None, "values out of range"
    return state, None


def save_state(path: Path, state: SavedState) -> None:
    """Write the state atomically; raises OSError when the folder cannot be written."""
    path.parent.mkdir(parents=True, exist_ok=True)
    write_atomic(path, json.dumps(asdict(state), indent=1) + "\n")
