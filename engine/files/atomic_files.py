"""Writing files so that a reader never sees half of one and nothing is overwritten by accident.

Every file ladle writes (fitted systems, the check-count cache, the explorer's remembered state
and exports, heat-list results) goes through here: the text is written to a temporary file in
the destination folder (`.NAME.PID.XXXXXXXX.tmp`), flushed to disk, then renamed into place
(replacing) or linked into place (never replacing). Only regular files are replaced: a device,
a FIFO, a folder or a symbolic link at the destination is refused. A SIGTERM or SIGHUP during a
write removes the temporary file before the process ends, and the next write into the same
folder removes temporary files that a process no longer running left behind.
"""

from __future__ import annotations

import errno
import os
import re
import signal
import stat
import tempfile
import threading
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from .regular_files import NotARegularFile, not_regular  # NotARegularFile: what the writes here raise

_MAX_NUMBERED = 1000
_CLEANUP_SIGNALS = tuple(getattr(signal, name) for name in ("SIGTERM", "SIGHUP") if hasattr(signal, name))
_TEMPORARY = re.compile(r"^\.(?P<name>.+)\.(?P<pid>\d+)\.[A-Za-z0-9_]{8}\.tmp$")
#: Temporary files of writes in progress in this process (removed on SIGTERM/SIGHUP).
_LIVE: set[str] = set()
#: The handlers that were in place before a write installed its own (signal number -> handler).
_PREVIOUS_HANDLERS: dict[int, object] = {}


def refuse_unless_regular(path: Path | str) -> None:
    """Raise NotARegularFile unless `path` is a regular file or does not exist yet."""
    try:
        mode = os.lstat(path).st_mode
    except FileNotFoundError:
        return
    if not stat.S_ISREG(mode):
        raise not_regular(path, mode, "writes")


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _remove_live_temporaries(signum: int, frame: object) -> None:
    """Signal handler: act as before the write; where that ends the process (the default
    action), remove this process's temporary files first. A handler of the program's own runs
    instead, and the write goes on (a heat list's handler records the stop and saves its state
    after the block: removing the temporary file under the write made that save fail); if the
    handler raises, the write's own clean-up removes the file."""
    previous = _PREVIOUS_HANDLERS.get(signum, signal.SIG_DFL)
    signal.signal(signum, previous)
    if callable(previous):
        previous(signum, frame)
    elif previous == signal.SIG_DFL:
        for tmp in list(_LIVE):
            try:
                os.unlink(tmp)
            except OSError:
                pass
        _LIVE.clear()
        os.kill(os.getpid(), signum)



@contextmanager
def _cleanup_on_signals() -> Iterator[None]:
    """Remove temporary files on SIGTERM/SIGHUP while the block runs (main thread only: other
    threads cannot set handlers, and the process's handlers are left as they are)."""
    if threading.current_thread() is not threading.main_thread() or _PREVIOUS_HANDLERS:
        yield
        return
    for sig in _CLEANUP_SIGNALS:
        # recorded before the handler goes in: a signal arriving right after it must find it
        # (else it acted as the default, and a heat list's run stopped by SIGTERM just as it
        # saved its state was killed instead of stopping after the block)
        _PREVIOUS_HANDLERS[sig] = signal.getsignal(sig)
        signal.signal(sig, _remove_live_temporaries)
    try:
        yield
    finally:
        for sig, previous in _PREVIOUS_HANDLERS.items():
            if signal.getsignal(sig) is _remove_live_temporaries:
                signal.signal(sig, previous)
        _PREVIOUS_HANDLERS.clear()


def _running(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


def remove_stale_temporaries(folder: Path, name: str) -> list[Path]:
    """Remove `folder`'s temporary files for `name` whose writing process is no longer running
    (left by a crash or a kill); returns those removed."""
    removed = []
    try:
        candidates = list(folder.glob(f".{_glob_escape(name)}.*.tmp"))
    except OSError:
        return removed
    for path in candidates:
        match = _TEMPORARY.match(path.name)
        if not match or match["name"] != name or _running(int(match["pid"])):
            continue
        try:
            if stat.S_ISREG(os.lstat(path).st_mode):
                os.unlink(path)
                removed.append(path)
        except OSError:
            pass
    return removed


def _glob_escape(text: str) -> str:
    """`text` with glob's special characters matched literally."""
    return re.sub(r"([*?\[])", r"[\1]", text)


@contextmanager
def _temporary_copy(folder: Path, name: str, text: str) -> Iterator[str]:
    """A temporary file holding `text` in `folder`, with a plain new file's permissions;
    removed afterwards unless it was renamed away (also on SIGTERM or SIGHUP)."""
    remove_stale_temporaries(folder, name)
    with _cleanup_on_signals():
        try:
            fd, tmp = tempfile.mkstemp(prefix=f".{name}.{os.getpid()}.", suffix=".tmp", dir=folder)
        except OSError as error:   # named after the file asked for, not the temporary one
            raise OSError(error.errno, f"cannot write in this folder ({error.strerror})", str(folder / name)) from None
        _LIVE.add(tmp)
        try:
            try:
                with os.fdopen(fd, "w", encoding="utf-8", newline="") as handle:
                    handle.write(text)
                    handle.flush()
                    os.fsync(handle.fileno())
                os.chmod(tmp, 0o666 & ~_umask())
            except OSError as error:
                raise OSError(error.errno, error.strerror, str(folder / name)) from None
            yield tmp
        finally:
            _LIVE.discard(tmp)
            try:
                os.unlink(tmp)
            except FileNotFoundError:
                pass


def write_atomic(path: Path | str, text: str) -> None:
    """Create or replace `path` with `text` (UTF-8, newlines as given) in one rename. Raises
    NotARegularFile (an OSError) when `path` exists and is not a regular file."""
    path = Path(path)
    refuse_unless_regular(path)
    with _temporary_copy(path.parent, path.name, text) as tmp:
        refuse_unless_regular(path)
        os.replace(tmp, path)


#: errno values of a file system that cannot make hard links (FAT, some network shares).
_NO_HARD_LINKS = {errno.EPERM, errno.ENOTSUP, errno.EOPNOTSUPP, errno.EMLINK, errno.EXDEV, errno.ENOSYS}


def _claim(tmp: str, path: Path) -> None:
    """Put the temporary file at `path` unless `path` exists (FileExistsError): a hard link where
    the file system has them, else an exclusively created placeholder replaced by the temporary
    file (a reader may see it empty for a moment, never half written)."""
    try:
        os.link(tmp, path)
        return
    except OSError as error:
        if isinstance(error, FileExistsError) or error.errno not in _NO_HARD_LINKS:
            raise
    os.close(os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600))
    try:
        os.replace(tmp, path)
    except OSError:
        os.unlink(path)
        raise


def write_new_files(folder: Path, stem: str, texts: dict[str, str]) -> list[Path]:
    """Write each text of `texts` (suffix -> text) to folder/stem+suffix, all with one number:
    stem, else stem-2, stem-3, ... the first for which no name is taken (an existing file is
    never replaced). Returns the paths written, in the order of `texts`."""
    with _temporary_copies(folder, stem, list(texts.values())) as temporaries:
        for number in range(1, _MAX_NUMBERED + 1):
            name = stem if number == 1 else f"{stem}-{number}"
            if any(os.path.lexists(folder / f"{name}{suffix}") for suffix in texts):
                continue
            written: list[Path] = []
            try:
                for suffix, tmp in zip(texts, temporaries):
                    path = folder / f"{name}{suffix}"
                    _claim(tmp, path)
                    written.append(path)
            except FileExistsError:
                for path in written:
                    path.unlink()
                continue
            return written
    raise FileExistsError(errno.EEXIST, f"{_MAX_NUMBERED} files of this name exist already",
                          str(folder / (stem + next(iter(texts)))))


@contextmanager
def _temporary_copies(folder: Path, stem: str, texts: list[str]) -> Iterator[list[str]]:
    if len(texts) == 1:
        with _temporary_copy(folder, stem, texts[0]) as tmp:
            yield [tmp]
        return
    with _temporary_copy(folder, stem, texts[0]) as first, \
            _temporary_copies(folder, stem, texts[1:]) as rest:
        yield [first, *rest]


def write_new_file(folder: Path, stem: str, suffix: str, text: str) -> Path:
    """Write `text` to folder/stem+suffix, or stem-2+suffix, stem-3+suffix, ... where that name
    is taken: an existing file is never replaced. Returns the path written."""
    return write_new_files(folder, stem, {suffix: text})[0]


def check_writable(path: Path | str) -> None:
    """Raise an OSError naming `path` unless a file could be written there now: its folder takes
    a new file (tried with a temporary file, removed at once) and `path` is a regular file or new."""
    path = Path(path)
    refuse_unless_regular(path)
    with _temporary_copy(path.parent, path.name, ""):
        pass


def keep_elsewhere(stem: str, suffix: str, text: str) -> Path:
    """Write `text` as a new file in the system's temporary folder (a result that could not be
    written where asked, kept so that the work is not lost); returns its path."""
    return write_new_file(Path(tempfile.gettempdir()), stem, suffix, text)
