"""JSON output: deterministic, strict (no NaN), written atomically.

Floats are rounded to 7 significant figures so that the same input gives byte-identical JSON
across runs, and non-finite numbers become ``null`` (strict JSON). Writing goes to a
temporary file in the target folder that is then renamed over the target, so an interrupted
run never leaves a half-written file; an existing file is only replaced with ``force``.
"""

from __future__ import annotations

import json
import math
import os
import sys
from pathlib import Path
from typing import Any

from uvcheck.errors import OutputExistsError, UvcheckError

SIG_DIGITS = 7


def clean(obj: Any) -> Any:
    """Make an object strict-JSON-able and deterministic (rounded floats, no NaN/inf)."""
    if isinstance(obj, bool) or obj is None or isinstance(obj, str):
        return obj
    if isinstance(obj, int):
        return obj
    if isinstance(obj, float):
        if not math.isfinite(obj):
            return None
        return float(f"{obj:.{SIG_DIGITS}g}")
    if hasattr(obj, "item") and not isinstance(obj, (list, tuple, dict)):
        try:
            return clean(obj.item())  # numpy scalar
        except (TypeError, ValueError):
            pass
    if isinstance(obj, dict):
        return {str(k): clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [clean(v) for v in obj]
    if hasattr(obj, "tolist"):
        return clean(obj.tolist())
    if hasattr(obj, "to_dict"):
        return clean(obj.to_dict())
    return str(obj)


def dumps(obj: Any) -> str:
    return json.dumps(clean(obj), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def write_text_atomic(path: Path, text: str | bytes, force: bool = False) -> Path:
    """Write ``text`` to ``path`` through a temporary file and a rename.

    Raises OutputExistsError if ``path`` exists and ``force`` is False.
    """
    path = Path(path)
    if path.is_dir():
        raise UvcheckError("the output path is a folder", str(path), "give a file name")
    if path.exists() and not force:
        raise OutputExistsError("the output file exists", str(path),
                                "give --force to replace it, or choose another name")
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.exists():
        raise UvcheckError("the output folder does not exist", str(folder), "create it first")
    data = text.encode("utf-8") if isinstance(text, str) else text
    # The temporary file is created like any new file (mode 0o666 less the umask), not with
    # mkstemp's 0o600, so colleagues can read the result as they could any other file.
    for _ in range(100):
        # os.urandom is what secrets.token_hex draws from (secrets costs ms to import where
        # numpy.random, which imports it too, is not loaded)
        tmp = str(folder / f".{path.name}.{os.urandom(4).hex()}.part")
        try:
            fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0),
                         0o666)
            break
        except FileExistsError:
            continue
    else:  # pragma: no cover - 100 collisions of 32 random bits
        raise UvcheckError("cannot create a temporary file", str(folder))
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
    return path


def write_json(target: str, obj: Any, force: bool = False) -> None:
    """Write JSON to a path, or to stdout for ``-``."""
    text = dumps(obj)
    if target == "-":
        sys.stdout.write(text)
        sys.stdout.flush()
        return
    write_text_atomic(Path(target), text, force=force)
