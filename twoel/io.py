"""File output that never leaves a partial file behind.

Every file twoel writes goes through :func:`atomic_write_bytes` / :func:`atomic_write_text`: the
content is written to a temporary file in the *same* directory, flushed and synced, then moved
over the target with :func:`os.replace` (atomic on POSIX and Windows for one file system).  If
anything fails on the way, the temporary file is removed and the target is untouched.

Folders of output (a report) are built with :func:`atomic_directory`: everything goes into a
hidden temporary folder beside the target, which is renamed into place only when the whole
build succeeded.  An existing target is refused unless ``overwrite=True``.

:func:`dumps_json` is the one JSON encoder of twoel's output (command line, report provenance):
standard JSON with ``null`` for infinite or undefined numbers, NumPy scalars and arrays as plain numbers and lists.

These helpers are self-contained (no other twoel module is needed except :mod:`twoel.errors`).
"""

from __future__ import annotations

import contextlib
import json
import math
import os
import shutil
import tempfile
from pathlib import Path

from twoel.errors import InputError


def _json_default(value):
    if hasattr(value, "tolist"):  # NumPy arrays and scalars (a scalar's tolist() is a Python number)
        return value.tolist()
    if hasattr(value, "item"):
        return value.item()
    if hasattr(value, "to_dict"):
        return value.to_dict()
    raise TypeError(f"not JSON serializable: {type(value).__name__}")


def _finite_json(value):
    """Plain data of ``value`` with every infinite or undefined number replaced by ``None``.

    NumPy scalars and arrays and objects with ``to_dict()`` are converted first, so a
    non-finite number inside them becomes ``null`` as well (standard JSON, RFC 8259, has no
    literal for infinity or NaN).
    """
    if isinstance(value, (str, bool, int)) or value is None:
        return value
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, dict):
        return {k: _finite_json(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_finite_json(v) for v in value]
    if hasattr(value, "to_dict") and callable(value.to_dict):
        return _finite_json(value.to_dict())
    if hasattr(value, "tolist") or hasattr(value, "item"):
        converted = _json_default(value)
        if converted is not value:
            return _finite_json(converted)
    return value


def dumps_json(obj) -> str:
    """Standard JSON text of ``obj`` (indent 2, UTF-8 characters kept).

    Infinite and undefined numbers (``inf``, ``nan``, e.g. the condition number of a singular
    overlap matrix) are written as ``null``: the text never holds ``Infinity``/``NaN`` literals
    nor ``"inf"``/``"nan"`` strings in their place.

    Parameters
    ----------
    obj : object
        Plain data; NumPy scalars/arrays and objects with ``to_dict()`` are converted.

    Returns
    -------
    str
        The JSON text, without a final newline.
    """
    return json.dumps(_finite_json(obj), indent=2, ensure_ascii=False, allow_nan=False,
                      default=_json_default)


def _default_mode(directory: bool = False) -> int:
    """Permissions a plain ``open``/``mkdir`` would give (0666/0777 less the umask)."""
    mask = os.umask(0)
    os.umask(mask)
    return (0o777 if directory else 0o666) & ~mask


def atomic_write_bytes(path, data: bytes, *, overwrite: bool = True) -> Path:
    """Write ``data`` to ``path`` atomically (temporary file + :func:`os.replace`).

    Parameters
    ----------
    path : str or os.PathLike
        Target file; its folder must exist.
    data : bytes
        The whole content.
    overwrite : bool
        If false and ``path`` exists, raise :class:`~twoel.errors.InputError` instead.

    Returns
    -------
    pathlib.Path
        The target path.
    """
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"cannot write {str(target)!r}: folder {str(folder)!r} does not exist")
    if not overwrite and target.exists():
        raise InputError(f"{str(target)!r} exists; refusing to overwrite it")
    fd, tmp_name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(tmp_name, target.stat().st_mode & 0o7777 if target.exists() else _default_mode())
        os.replace(tmp_name, target)
    except BaseException:
        with contextlib.suppress(FileNotFoundError):
            os.unlink(tmp_name)
        raise
    return target


def atomic_write_text(path, text: str, *, encoding: str = "utf-8", overwrite: bool = True) -> Path:
    """Write ``text`` to ``path`` atomically (see :func:`atomic_write_bytes`)."""
    return atomic_write_bytes(path, text.encode(encoding), overwrite=overwrite)


@contextlib.contextmanager
def atomic_directory(path, *, overwrite: bool = False):
    """Build a folder in a temporary sibling and move it to ``path`` only on success.

    Yields the temporary folder (a :class:`pathlib.Path`) to write into.  On normal exit the
    folder becomes ``path``; an old ``path`` is replaced only when ``overwrite`` is true (it is
    moved aside first and deleted after the new folder is in place).  On any exception the
    temporary folder is deleted and ``path`` is left as it was.

    Raises
    ------
    InputError
        If ``path`` exists and ``overwrite`` is false, or ``path`` exists but is not a folder.
    """
    target = Path(path)
    if target.exists() and not target.is_dir():
        raise InputError(f"{str(target)!r} exists and is not a folder")
    if target.exists() and not overwrite:
        raise InputError(f"{str(target)!r} exists; refusing to overwrite it (use --overwrite)")
    parent = target.parent if str(target.parent) else Path(".")
    parent.mkdir(parents=True, exist_ok=True)
    building = Path(tempfile.mkdtemp(prefix=f".{target.name}.building.", dir=parent))
    os.chmod(building, _default_mode(directory=True))
    try:
        yield building
    except BaseException:
        shutil.rmtree(building, ignore_errors=True)
        raise
    old = None
    try:
        if target.exists():
            if not overwrite:  # appeared while building
                raise InputError(f"{str(target)!r} appeared while building; refusing to overwrite it")
            old = Path(tempfile.mkdtemp(prefix=f".{target.name}.old.", dir=parent))
            os.replace(target, old / target.name)
        os.replace(building, target)
    except BaseException:
        shutil.rmtree(building, ignore_errors=True)
        if old is not None and not target.exists():
            os.replace(old / target.name, target)
        raise
    finally:
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)
