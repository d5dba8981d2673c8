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
import signal
import stat
import tempfile
import threading
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


#: what a path that is not a regular file is, by its ``stat`` mode
_KINDS = ((stat.S_ISDIR, "a folder"), (stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"),
          (stat.S_ISFIFO, "a FIFO (named pipe)"), (stat.S_ISSOCK, "a socket"))

#: the ``format`` field of the provenance record a twoel report folder holds (twoel.report.build)
REPORT_PROVENANCE_FORMAT = "twoel-report-provenance"
#: the largest provenance file read to recognise a twoel folder (bytes)
_PROVENANCE_READ_LIMIT = 64 * 2**20


def _kind(mode: int) -> str | None:
    """Name of a non-regular file type (``None`` for a regular file)."""
    for test, name in _KINDS:
        if test(mode):
            return name
    return None if stat.S_ISREG(mode) else "not a regular file"


def _check_folder(target: Path, folder: Path) -> None:
    """Refuse (one line) a missing folder, a 'folder' that is a file, or one that cannot be written."""
    try:
        info = os.stat(folder)
    except FileNotFoundError:
        raise InputError(f"cannot write {str(target)!r}: folder {str(folder)!r} does not exist") from None
    except NotADirectoryError:
        raise InputError(f"cannot write {str(target)!r}: {str(folder)!r} lies under a file, "
                         "not a folder") from None
    except OSError as exc:
        raise InputError(f"cannot write {str(target)!r}: folder {str(folder)!r}: {exc.strerror}") from None
    if not stat.S_ISDIR(info.st_mode):
        raise InputError(f"cannot write {str(target)!r}: {str(folder)!r} is a file, not a folder")


def _existing_mode(target: Path) -> int | None:
    """Permission bits of an existing regular ``target`` (``None`` if absent); refuse anything else."""
    try:
        info = os.stat(target)
    except FileNotFoundError:
        return None
    except NotADirectoryError:
        raise InputError(f"cannot write {str(target)!r}: a part of the path is a file, not a folder") from None
    except OSError as exc:          # e.g. a name longer than the file system allows
        raise InputError(f"cannot write {shown_path(target)}: {exc.strerror or exc}") from None
    except ValueError as exc:       # an embedded NUL byte
        raise InputError(f"cannot write {shown_path(target)}: {exc}") from None
    kind = _kind(info.st_mode)
    if kind is not None:
        raise InputError(f"{str(target)!r} is {kind}, not a regular file; refusing to write there")
    return stat.S_IMODE(info.st_mode)


def atomic_write_bytes(path, data: bytes, *, overwrite: bool = True) -> Path:
    """Write ``data`` to ``path`` atomically (temporary file + :func:`os.replace`).

    Only a regular file is ever replaced, and it keeps its permission bits; a device, FIFO,
    socket or folder at ``path`` is refused before anything is written.  A symbolic link to a
    regular file is followed (the file it names is replaced; the link stays).

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

    Raises
    ------
    InputError
        ``path`` exists and is not a regular file (or ``overwrite`` is false); its folder is
        missing, is a file, or cannot be written.
    """
    target = Path(path)
    real = Path(os.path.realpath(target)) if os.path.islink(target) else target
    folder = real.parent if str(real.parent) else Path(".")
    _check_folder(target, folder)
    mode = _existing_mode(real)
    if not overwrite and (mode is not None or os.path.lexists(target)):
        raise InputError(f"{str(target)!r} exists; refusing to overwrite it")
    try:
        with _UNFINISHED_LOCK:
            fd, tmp_name = tempfile.mkstemp(prefix=f".{real.name}.", suffix=".tmp", dir=folder)
            _UNFINISHED.add(Path(tmp_name))
    except OSError as exc:
        raise InputError(f"cannot write {str(target)!r}: folder {str(folder)!r}: {exc.strerror}") from None
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(tmp_name, _default_mode() if mode is None else mode)
        with _UNFINISHED_LOCK:
            os.replace(tmp_name, real)
            _UNFINISHED.discard(Path(tmp_name))
    except BaseException:
        with contextlib.suppress(FileNotFoundError):
            os.unlink(tmp_name)
        _UNFINISHED.discard(Path(tmp_name))
        raise
    return target


def atomic_write_text(path, text: str, *, encoding: str = "utf-8", overwrite: bool = True) -> Path:
    """Write ``text`` to ``path`` atomically (see :func:`atomic_write_bytes`)."""
    return atomic_write_bytes(path, text.encode(encoding), overwrite=overwrite)


#: the largest input file (configuration, provenance, rows) read by default (bytes)
MAX_INPUT_BYTES = 64 * 2**20


def shown_path(path) -> str:
    """``repr`` of a path for a one-line message (a very long name is cut)."""
    text = os.fspath(path) if not isinstance(path, str) else path
    text = text if isinstance(text, str) else os.fsdecode(text)
    return repr(text if len(text) <= 160 else text[:80] + "..." + text[-40:])


def read_input_bytes(path, what: str = "file", max_bytes: int = MAX_INPUT_BYTES) -> bytes:
    """The bytes of a user-named input file, every failure one :class:`InputError` line.

    Refused before reading: a missing path (``no such {what}``), one that is not a regular
    file (a folder, a FIFO that would block, a device), a name the system cannot take (too
    long, a NUL byte), and a file above ``max_bytes`` (:class:`~twoel.errors.ResourceError`).
    """
    from twoel.errors import ResourceError

    target = Path(path)
    shown = shown_path(path)
    try:
        info = os.stat(target)
    except (FileNotFoundError, NotADirectoryError):
        raise InputError(f"no such {what}: {shown}") from None
    except OSError as exc:
        raise InputError(f"cannot read {what} {shown}: {exc.strerror or exc}") from None
    except ValueError as exc:                     # an embedded NUL byte
        raise InputError(f"cannot read {what} {shown}: {exc}") from None
    kind = _kind(info.st_mode)
    if kind is not None:
        kind = kind if kind.startswith("not ") else f"is {kind}, not a regular file"
        raise InputError(f"{what} {shown} {kind}")
    if info.st_size > max_bytes:
        raise ResourceError(f"{what} {shown}: {info.st_size / 2**20:.1f} MiB exceeds the limit of "
                            f"{max_bytes / 2**20:g} MiB")
    try:
        with target.open("rb") as handle:
            raw = handle.read(max_bytes + 1)
    except OSError as exc:
        raise InputError(f"cannot read {what} {shown}: {exc.strerror or exc}") from None
    if len(raw) > max_bytes:
        raise ResourceError(f"{what} {shown} exceeds the limit of {max_bytes / 2**20:g} MiB")
    return raw


def read_input_text(path, what: str = "file", max_bytes: int = MAX_INPUT_BYTES) -> str:
    """:func:`read_input_bytes` decoded as UTF-8 (a byte-order mark is dropped)."""
    raw = read_input_bytes(path, what, max_bytes)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(f"{what} {shown_path(path)}: not UTF-8 text (byte {exc.start}); "
                         "save it as UTF-8") from None


def _protected(folder: Path) -> str | None:
    """Why ``folder`` (resolved) must never be replaced, or ``None``."""
    cwd = Path.cwd().resolve()
    if folder == Path(folder.anchor):
        return "the root folder"
    with contextlib.suppress(RuntimeError, KeyError):
        home = Path.home().resolve()
        if folder == home or folder in home.parents:
            return "the home folder" if folder == home else "a folder holding the home folder"
    if folder == cwd or folder in cwd.parents:
        return "the current folder" if folder == cwd else "a folder holding the current folder"
    return None


def is_twoel_folder(path) -> bool:
    """Whether ``path`` is a folder twoel wrote: it holds a twoel report ``provenance.json``.

    The record must be a JSON object whose ``format`` is :data:`REPORT_PROVENANCE_FORMAT` (the
    schema of :mod:`twoel.report.build`); an unreadable, oversized or foreign file is not.
    """
    record = Path(path) / "provenance.json"
    try:
        if not record.is_file() or record.stat().st_size > _PROVENANCE_READ_LIMIT:
            return False
        data = json.loads(record.read_bytes().decode("utf-8"))
    except (OSError, ValueError, RecursionError):
        return False
    return isinstance(data, dict) and data.get("format") == REPORT_PROVENANCE_FORMAT


def _check_replaceable(target: Path, overwrite: bool) -> None:
    """Refuse, before anything is touched, a ``target`` folder that may not be replaced."""
    if not os.path.lexists(target):
        return
    if not target.is_dir() or os.path.islink(target):
        raise InputError(f"{str(target)!r} exists and is not a folder")
    if not overwrite:
        raise InputError(f"{str(target)!r} exists; refusing to overwrite it (use --overwrite)")
    reason = _protected(target.resolve())
    if reason is not None:
        raise InputError(f"{str(target)!r} is {reason}; refusing to replace it")
    if not is_twoel_folder(target):
        raise InputError(f"{str(target)!r} is not a folder twoel wrote (no twoel provenance.json); "
                         "refusing to replace it")


def check_replaceable(path, overwrite: bool = False) -> None:
    """Raise :class:`InputError` now if :func:`atomic_directory` would refuse ``path`` (so a
    caller can refuse before the work that fills the folder)."""
    _check_replaceable(Path(path), overwrite)


def _make_parent(target: Path) -> Path:
    parent = target.parent if str(target.parent) else Path(".")
    try:
        parent.mkdir(parents=True, exist_ok=True)
        return Path(tempfile.mkdtemp(prefix=f".{target.name}.building.", dir=parent))
    except (FileExistsError, NotADirectoryError):
        raise InputError(f"cannot create {str(target)!r}: a part of {str(parent)!r} is a file, "
                         "not a folder") from None
    except OSError as exc:
        raise InputError(f"cannot create {str(target)!r} in {str(parent)!r}: {exc.strerror}") from None


#: temporary files and folders being written now (removed by :func:`remove_unfinished`)
_UNFINISHED: set[Path] = set()
#: held while a temporary is made or moved into place, and by :func:`remove_unfinished` for good
_UNFINISHED_LOCK = threading.Lock()


def remove_unfinished(timeout: float = 3.0) -> list[Path]:
    """Delete every temporary file and folder twoel is writing now; for a process about to end.

    Called by the command line when a signal stops a command whose body runs in a worker thread
    (:mod:`twoel.cli.interrupt`).  The lock is taken and never given back, so the worker can
    neither make a new temporary nor move one into place afterwards; the process must end right
    after.  Returns what was removed.
    """
    _UNFINISHED_LOCK.acquire(timeout=timeout)
    removed = []
    for path in sorted(_UNFINISHED):
        if path.is_dir() and not path.is_symlink():
            shutil.rmtree(path, ignore_errors=True)
        else:
            with contextlib.suppress(OSError):
                os.unlink(path)
        removed.append(path)
    _UNFINISHED.clear()
    return removed


#: signals that stop a folder build the way Ctrl-C (SIGINT) does: the temporary folder is removed
CLEANUP_SIGNALS = ("SIGTERM", "SIGHUP")


class BuildStopped(KeyboardInterrupt):
    """A folder build stopped by a signal of :data:`CLEANUP_SIGNALS` (``signum`` says which).

    A :class:`KeyboardInterrupt`, so every caller that cleans up after Ctrl-C cleans up after it.
    """

    def __init__(self, signum: int):
        self.signum = int(signum)
        super().__init__(f"stopped by {signal.Signals(self.signum).name}")


@contextlib.contextmanager
def _signals_stop_the_build():
    """While inside, SIGTERM and SIGHUP raise :class:`BuildStopped`; the old handlers come back after.

    Only signals whose handler is the default (termination) are taken over: an ignored signal
    (e.g. SIGHUP under ``nohup``) or one a caller handles stays as it is.  Outside the main
    thread nothing changes (Python delivers signals to the main thread only).  A second signal
    while the first is being handled (the cleanup is running) is not raised again.
    """
    import threading

    if threading.current_thread() is not threading.main_thread():
        yield
        return
    stopping = []

    def handler(signum, _frame):
        if stopping:
            return
        stopping.append(signum)
        raise BuildStopped(signum)

    previous = {}
    try:
        for name in CLEANUP_SIGNALS:
            number = getattr(signal, name, None)
            if number is not None and signal.getsignal(number) is signal.SIG_DFL:
                previous[number] = signal.signal(number, handler)
        yield
    finally:
        for number, old in previous.items():
            signal.signal(number, old)


@contextlib.contextmanager
def _signals_held():
    """Hold back :data:`CLEANUP_SIGNALS` while inside (delivered on the way out); a no-op where
    :func:`signal.pthread_sigmask` does not exist."""
    numbers = {getattr(signal, name) for name in CLEANUP_SIGNALS if hasattr(signal, name)}
    if not hasattr(signal, "pthread_sigmask") or not numbers:
        yield
        return
    previous = signal.pthread_sigmask(signal.SIG_BLOCK, numbers)
    try:
        yield
    finally:
        signal.pthread_sigmask(signal.SIG_SETMASK, previous)


@contextlib.contextmanager
def atomic_directory(path, *, overwrite: bool = False):
    """Build a folder in a temporary sibling and move it to ``path`` only on success.

    Yields the temporary folder (a :class:`pathlib.Path`) to write into.  On normal exit the
    folder becomes ``path``; an old ``path`` is replaced only when ``overwrite`` is true and it is
    a folder twoel wrote (:func:`is_twoel_folder`), never the root, home or current folder (it is
    moved aside first and deleted after the new folder is in place).  On any exception the
    temporary folder is deleted and ``path`` is left as it was; SIGTERM and SIGHUP during the
    build raise :class:`BuildStopped` (a :class:`KeyboardInterrupt`) so they clean up as Ctrl-C
    does (see :func:`_signals_stop_the_build`; the old handlers are restored on the way out).

    Raises
    ------
    InputError
        If ``path`` exists and ``overwrite`` is false, ``path`` exists but is not a folder, or is a
        folder twoel did not write or must never replace; if its parent cannot be made.
    """
    target = Path(path)
    _check_replaceable(target, overwrite)
    with _signals_stop_the_build():
        with _atomic_directory(target, overwrite) as building:
            yield building


@contextlib.contextmanager
def _atomic_directory(target: Path, overwrite: bool):
    """:func:`atomic_directory` without the signal handlers.

    The temporary folders are made, and the result moved into place, with SIGTERM and SIGHUP
    held back (:func:`_signals_held`): such a signal then arrives when the step is done, never
    between making a folder and knowing its name.
    """
    parent = target.parent if str(target.parent) else Path(".")
    building = None
    try:
        with _signals_held(), _UNFINISHED_LOCK:
            building = _make_parent(target)
            _UNFINISHED.add(building)
            os.chmod(building, _default_mode(directory=True))
        yield building
    except BaseException:
        if building is not None:
            shutil.rmtree(building, ignore_errors=True)
            _UNFINISHED.discard(building)
        raise
    old = None
    try:
        with _signals_held(), _UNFINISHED_LOCK:
            try:
                if os.path.lexists(target):
                    _check_replaceable(target, overwrite)   # may have appeared or changed while building
                    old = Path(tempfile.mkdtemp(prefix=f".{target.name}.old.", dir=parent))
                    os.replace(target, old / target.name)
                os.replace(building, target)
                _UNFINISHED.discard(building)
                if old is not None:
                    _UNFINISHED.add(old)       # the replaced report, deleted just below
            except BaseException:
                shutil.rmtree(building, ignore_errors=True)
                _UNFINISHED.discard(building)
                if old is not None and not target.exists():
                    os.replace(old / target.name, target)
                raise
    finally:
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)
            _UNFINISHED.discard(old)
