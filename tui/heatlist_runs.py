"""Running a heat list at any size: blocks of rows computed by this process, by local worker
processes or by a Dask cluster, and written in input order.

Memory stays bounded: only a window of blocks is in flight (a few per worker), and what is kept
per heat is 16 bytes for the duplicate-identifier check (up to DUPLICATE_CHECK_LIMIT heats).
With `-o`, the rows go to a partial file beside the output (`.NAME.ladle-partial`) that is
renamed into place at the end, so the output appears whole or not at all; a state file beside
it (`.NAME.ladle-state.json`) records how far the run got (every CHECKPOINT_S seconds, and at
once when a signal stops the run or a worker is lost), so that a run stopped by Ctrl-C, SIGTERM,
a dropped SSH session (SIGHUP) or a killed worker continues with `--resume`, computing only the
blocks not yet written.
"""

from __future__ import annotations

import fcntl
import json
import os
import signal
import sys
import time
from collections import deque
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ladle.engine.files.atomic_files import write_atomic
from ladle.engine.files.regular_files import open_regular

from .errors import CommandError
from .heat_results import LISTED, BlockJob, BlockResult, compute_block, identifiers
from .heatlist import Block, FileScan, blocks
from .quote import quoted_path

#: Bytes of the heat list per block (about 16,000 rows of a short list); a block is the unit
#: of work sent to a worker and of progress saved for --resume.
BLOCK_BYTES = 1 << 18
#: Bytes per block for alloys of three or more elements (a few heats: each costs seconds).
ALLOY_BLOCK_BYTES = 256
#: Blocks in flight per worker (enough to keep every worker busy while this process writes).
WINDOW_PER_WORKER = 2
#: Heats whose identifiers are checked for repeats (16 bytes each, up to 40 while they are
#: sorted at the end: 60 MB at most).
DUPLICATE_CHECK_LIMIT = 1_500_000
#: Seconds to wait for a Dask scheduler to answer.
CLUSTER_TIMEOUT_S = 3.0
#: Seconds between two saves of the state file (a stop by a signal saves it at once; these
#: are for a machine that goes down).
CHECKPOINT_S = 2.0
#: Seconds between two updates of the progress line.
PROGRESS_S = 0.5
#: Seconds between a worker process's checks that the main process is still there.
PARENT_CHECK_S = 0.5
_STATE_VERSION = 1


class Interrupted(Exception):
    """The run was stopped by a signal (its number) after its last complete block."""


class _Stop:
    """Ctrl-C, SIGTERM and SIGHUP stop the run after the block being written (so that the
    state saved for --resume is exact); a second signal stops it at once."""

    def __init__(self) -> None:
        self.signal: int | None = None
        self.previous: dict = {}

    def __enter__(self) -> "_Stop":
        import threading

        if threading.current_thread() is threading.main_thread():     # only there can signals be caught
            for sig in (signal.SIGINT, signal.SIGTERM, signal.SIGHUP):
                self.previous[sig] = signal.signal(sig, self._handle)
        return self

    def __exit__(self, *_exc) -> None:
        for sig, handler in self.previous.items():
            signal.signal(sig, handler)

    def _handle(self, signum, _frame) -> None:
        if self.signal is not None:
            raise Interrupted(signum)
        self.signal = signum

    def check(self) -> None:
        if self.signal is not None:
            raise Interrupted(self.signal)


@dataclass
class Totals:
    """What the blocks written so far held: heats, rows not computed (count and the first
    LISTED as (line, reason)), heats without an identifier (count, first lines); at the end,
    the heats whose identifier repeats an earlier one (count, first (line, earlier line)) and
    whether that check stopped at DUPLICATE_CHECK_LIMIT."""

    heats: int = 0
    problems: int = 0
    listed: list = field(default_factory=list)
    blank_ids: int = 0
    blank_listed: list = field(default_factory=list)
    duplicates: int = 0
    duplicate_listed: list = field(default_factory=list)
    duplicate_check_full: bool = False

    def add(self, result: BlockResult) -> None:
        self.heats += result.heats
        self.problems += result.problems
        self.listed += result.listed[:LISTED - len(self.listed)]
        self.blank_ids += result.blank_ids
        self.blank_listed += result.blank_listed[:LISTED - len(self.blank_listed)]


class DuplicateCheck:
    """The identifier hashes of the heats written, with their lines, checked for repeats once at
    the end (one stable sort: 16 bytes a heat, three times that while sorting)."""

    def __init__(self) -> None:
        self.hashes: list[np.ndarray] = []
        self.lines: list[np.ndarray] = []
        self.size = 0
        self.full = False

    def add(self, hashes: np.ndarray, lines: np.ndarray) -> None:
        """Record a block's identifiers (in row order), up to DUPLICATE_CHECK_LIMIT heats."""
        if self.full:
            return
        self.hashes.append(hashes)
        self.lines.append(lines)
        self.size += hashes.size
        if self.size > DUPLICATE_CHECK_LIMIT:
            self.full, self.hashes, self.lines = True, [], []

    def report(self, totals: Totals) -> None:
        """Count and list in `totals` the heats whose identifier repeats an earlier one's."""
        totals.duplicate_check_full = self.full
        if self.full or not self.size:
            return
        hashes = np.concatenate(self.hashes)
        self.hashes = []
        order = np.argsort(hashes, kind="stable")       # equal hashes keep the file's order
        h = hashes[order]
        del hashes
        lines = np.concatenate(self.lines)
        self.lines = []
        n = lines[order]
        del lines, order
        first = np.concatenate([[True], h[1:] != h[:-1]])
        earliest = n[np.maximum.accumulate(np.where(first, np.arange(h.size), 0))]
        pairs = sorted(zip(n[~first].tolist(), earliest[~first].tolist()))
        totals.duplicates, totals.duplicate_listed = len(pairs), pairs[:LISTED]


class Progress:
    """One line on stderr, only when stderr is a terminal (and the rows do not go to the same
    screen): heats done, heats per second and the time left (from the share of lines done)."""

    def __init__(self, total_lines: int, done_lines: int, rows_on_screen: bool = False) -> None:
        self.enabled = sys.stderr.isatty() and not rows_on_screen
        self.total, self.start_lines, self.started = max(total_lines, 1), done_lines, time.monotonic()
        self.shown_at = 0.0

    def show(self, heats: int, lines: int) -> None:
        now = time.monotonic()
        if not self.enabled or now - self.shown_at < PROGRESS_S:
            return
        self.shown_at = now
        elapsed = max(now - self.started, 1e-9)
        speed = (lines - self.start_lines) / elapsed
        left = f", about {_duration((self.total - lines) / speed)} left" if speed > 0 and lines < self.total else ""
        self._write(f"\rladle batch: {heats:,} heats, {heats / elapsed if heats else 0:,.0f} heats/s{left}\x1b[K")

    def close(self) -> None:
        if self.enabled:
            self._write("\r\x1b[K")

    def _write(self, text: str) -> None:
        try:
            sys.stderr.write(text)
            sys.stderr.flush()
        except OSError:              # the terminal went away (a dropped session)
            self.enabled = False


def _duration(seconds: float) -> str:
    seconds = int(round(seconds))
    if seconds < 60:
        return f"{seconds} s"
    if seconds < 3600:
        return f"{seconds // 60} min {seconds % 60:02d} s"
    return f"{seconds // 3600} h {seconds // 60 % 60:02d} min"


# --- where the blocks are computed ----------------------------------------------------------------
class _Done:
    """A result computed at once, with the interface of a future."""

    def __init__(self, value: BlockResult) -> None:
        self.value = value

    def result(self) -> BlockResult:
        return self.value


_WORKER_JOB: BlockJob | None = None


def _start_worker(job: BlockJob, parent: int) -> None:
    """In a local worker process: keep the job, leave signals to the main process (it stops the
    workers itself), and end when that process (pid `parent`) is gone: killed outright, it cannot
    stop its workers, and these, deaf to signals, would wait for blocks forever and keep its
    output pipes open."""
    import threading

    global _WORKER_JOB
    _WORKER_JOB = job
    for sig in (signal.SIGINT, signal.SIGTERM, signal.SIGHUP):
        signal.signal(sig, signal.SIG_IGN)
    threading.Thread(target=_end_with, args=(parent,), daemon=True).start()


def _end_with(parent: int) -> None:
    """Exit this worker process once its parent process is no longer `parent` (it has ended)."""
    while os.getppid() == parent:
        time.sleep(PARENT_CHECK_S)
    os._exit(1)


def _compute_in_worker(first_line: int, data: bytes) -> BlockResult:
    return compute_block(_WORKER_JOB, first_line, data)


class Workers:
    """Computes blocks in this process (one worker), in local worker processes or on a Dask
    cluster; `submit` returns something whose `result()` is the BlockResult."""

    def __init__(self, job: BlockJob, workers: int, cluster: str | None, data_bytes: int) -> None:
        """`workers` processes at most, and no more than there are blocks in `data_bytes`."""
        self.job, self.pool, self.client = job, None, None
        workers = min(workers, -(-data_bytes // _block_bytes(job)))
        if cluster is not None:
            self.client = _connect(cluster)
            # twice the local window: a block's round trip over the network is longer
            self.window = max(4, 2 * WINDOW_PER_WORKER * sum(self.client.nthreads().values()))
        elif workers > 1:
            import multiprocessing
            from concurrent.futures import ProcessPoolExecutor

            context = multiprocessing.get_context("fork" if "fork" in multiprocessing.get_all_start_methods() else None)
            self.pool = ProcessPoolExecutor(workers, mp_context=context, initializer=_start_worker,
                                            initargs=(job, os.getpid()))
            self.window = WINDOW_PER_WORKER * workers
        else:
            self.window = 1

    def submit(self, first_line: int, data: bytes):
        if self.client is not None:
            # a lost worker's block is recomputed by the scheduler; `retries` also covers errors
            return self.client.submit(compute_block, self.job, first_line, data, pure=False, retries=2)
        if self.pool is not None:
            from concurrent.futures.process import BrokenProcessPool

            try:
                return self.pool.submit(_compute_in_worker, first_line, data)
            except BrokenProcessPool:
                raise _lost_worker() from None
        return _Done(compute_block(self.job, first_line, data))

    def result(self, future) -> BlockResult:
        """The block's result; one line of CommandError where the workers themselves failed (a
        worker process killed, or a cluster that lost the block's workers too often)."""
        from concurrent.futures.process import BrokenProcessPool

        try:
            return future.result()
        except BrokenProcessPool:
            raise _lost_worker() from None
        except Exception as e:
            if self.client is None or type(e).__name__ != "KilledWorker":
                raise
            raise CommandError(f"the cluster lost the workers of a block too often ({str(e)[:120]}); "
                               f"with -o, the same command with --resume continues") from None

    def close(self) -> None:
        if self.pool is not None:
            self.pool.shutdown(wait=True, cancel_futures=True)
        if self.client is not None:
            self.client.close()


def _lost_worker() -> CommandError:
    return CommandError("a worker process ended unexpectedly (killed, or out of memory); with -o, the same "
                        "command with --resume continues")


def _connect(address: str):
    """A Dask client of the scheduler at `address`; one line of CommandError when the `cluster`
    extra is missing or no scheduler answers within CLUSTER_TIMEOUT_S."""
    import logging

    try:
        from distributed import Client
    except ImportError:
        raise CommandError("--cluster needs Dask: pip install 'ladle[cluster]'") from None
    logging.getLogger("distributed").setLevel(logging.CRITICAL)
    try:
        return Client(address, timeout=CLUSTER_TIMEOUT_S, set_as_default=False)
    except (OSError, TimeoutError, ValueError) as e:
        detail = str(e).splitlines()[0] if str(e) else type(e).__name__
        raise CommandError(f"--cluster {address}: no Dask scheduler answered within {CLUSTER_TIMEOUT_S:g} s "
                           f"({detail[:120]})") from None


def _block_bytes(job: BlockJob) -> int:
    return BLOCK_BYTES if job.table is not None else ALLOY_BLOCK_BYTES


def in_order(workers: Workers, items: Iterator[Block]) -> Iterator[tuple[int, int, BlockResult]]:
    """(offset after, line after, result) of each block in input order, with at most the
    workers' window in flight."""
    pending: deque = deque()
    for block in items:
        pending.append((block.end, block.next_line, workers.submit(block.first_line, block.data)))
        if len(pending) >= workers.window:
            end, after, future = pending.popleft()
            yield end, after, workers.result(future)
    while pending:
        end, after, future = pending.popleft()
        yield end, after, workers.result(future)


# --- the run --------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Plan:
    """One run: the heat list and its scan, the job, the output (None: standard output), and
    how to compute (worker processes or a cluster address) and whether to resume; `options`
    names everything that changes the output (a resumed run must match)."""

    source: Path
    scan: FileScan
    job: BlockJob
    output: Path | None
    force: bool
    resume: bool
    workers: int
    cluster: str | None
    options: dict


def partial_path(output: Path) -> Path:
    return output.with_name(f".{output.name}.ladle-partial")


def state_path(output: Path) -> Path:
    return output.with_name(f".{output.name}.ladle-state.json")


def run(plan: Plan, note: Callable[[str], None]) -> Totals:
    """Compute every heat and write the output; `note` prints a line on stderr. Raises
    Interrupted (after saving the state) when a signal stops the run."""
    with _Stop() as stop:
        if plan.output is None:
            return _run_to_stdout(plan, stop)
        return _run_to_file(plan, stop, note)


def _run_to_stdout(plan: Plan, stop: _Stop) -> Totals:
    from ladle.engine.files.plain_text import without_controls

    terminal = sys.stdout.isatty()
    binary = None if terminal else getattr(sys.stdout, "buffer", None)
    layout = plan.job.layout

    def write(text: bytes) -> None:
        if binary is not None:          # the bytes in the heat list's own encoding
            binary.write(text)
            return
        text = text.decode(layout.encoding, errors="replace")
        # nothing from the file reaches a terminal as a control character
        sys.stdout.write(without_controls(text, keep_newlines=True) if terminal else text)

    sys.stdout.flush()
    write(plan.job.header_text())
    totals, duplicates = Totals(), DuplicateCheck()
    progress = Progress(plan.scan.lines, layout.data_line, rows_on_screen=terminal)
    workers = Workers(plan.job, plan.workers, plan.cluster, plan.scan.size - layout.data_offset)
    try:
        for _offset, line, result in in_order(workers, blocks(plan.source, layout.data_offset, layout.data_line,
                                                              plan.scan.size, _block_bytes(plan.job))):
            write(result.text)
            _count(totals, duplicates, result)
            progress.show(totals.heats, line)
            stop.check()
    finally:
        progress.close()
        workers.close()
    duplicates.report(totals)
    return totals


def _count(totals: Totals, duplicates: DuplicateCheck, result: BlockResult) -> None:
    totals.add(result)
    duplicates.add(result.id_hashes, result.id_lines)


def _run_to_file(plan: Plan, stop: _Stop, note: Callable[[str], None]) -> Totals:
    output, layout = plan.output, plan.job.layout
    partial, state_file = partial_path(output), state_path(output)
    fd = _open_partial(partial, output, plan.resume)
    try:
        with os.fdopen(fd, "r+b") as out:
            if plan.resume:
                totals, duplicates, offset, line = _resumed(plan, out, state_file, note)
            else:
                if state_file.exists():
                    note(f"an interrupted run's partial results for {quoted_path(output)} were discarded "
                         f"(--resume would have continued it)")
                    state_file.unlink()
                out.truncate(0)
                out.write(plan.job.header_text())
                totals, duplicates, offset, line = Totals(), DuplicateCheck(), layout.data_offset, layout.data_line
            progress = Progress(plan.scan.lines, line)
            saved_at = time.monotonic()
            workers = Workers(plan.job, plan.workers, plan.cluster, plan.scan.size - offset)
            try:
                for after, after_line, result in in_order(workers, blocks(plan.source, offset, line, plan.scan.size,
                                                                          _block_bytes(plan.job))):
                    out.write(result.text)
                    _count(totals, duplicates, result)
                    offset, line = after, after_line
                    if stop.signal is not None or time.monotonic() - saved_at >= CHECKPOINT_S:
                        _save_state(plan, out, state_file, totals, offset, line)
                        saved_at = time.monotonic()
                    progress.show(totals.heats, line)
                    stop.check()
            except CommandError:                    # a worker lost: what is written can be resumed
                _save_state(plan, out, state_file, totals, offset, line)
                raise
            finally:
                progress.close()
                workers.close()
            out.flush()
            os.fsync(out.fileno())
            _put_in_place(partial, output, plan.force)
    except OSError as e:
        raise CommandError(f"{quoted_path(e.filename or partial)}: cannot write: {e.strerror or e}") from None
    try:
        state_file.unlink()
    except FileNotFoundError:
        pass
    duplicates.report(totals)
    return totals


def _open_partial(partial: Path, output: Path, resume: bool) -> int:
    """The partial file, opened for writing and locked (one run per output at a time); a link,
    FIFO or device in its place is refused (writing through a link would overwrite its target)."""
    from ladle.engine.files.atomic_files import refuse_unless_regular

    try:
        refuse_unless_regular(partial)
        fd = os.open(partial, os.O_RDWR | os.O_NOFOLLOW | (0 if resume else os.O_CREAT), 0o666)
    except FileNotFoundError:
        if not resume:
            raise CommandError(f"{quoted_path(output)}: cannot write: no folder {quoted_path(output.parent)}") from None
        raise CommandError(f"--resume: no interrupted run writing {quoted_path(output)} to continue; "
                           f"run without --resume") from None
    except OSError as e:
        raise CommandError(f"{quoted_path(partial)}: cannot write: {e.strerror}") from None
    try:
        fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    except OSError:
        os.close(fd)
        raise CommandError(f"{quoted_path(partial)}: another ladle batch is writing this output now") from None
    return fd


def _save_state(plan: Plan, out, state_file: Path, totals: Totals, offset: int, line: int) -> None:
    """Record that the input up to `offset` (line `line`) is written, with the totals so far."""
    out.flush()
    os.fsync(out.fileno())
    state = {"version": _STATE_VERSION, "input": str(plan.source.resolve()), "size": plan.scan.size,
             "sha256": plan.scan.sha256, "options": plan.options, "input_offset": offset, "line": line,
             "output_bytes": out.tell(), "totals": totals.__dict__}
    write_atomic(state_file, json.dumps(state))


def _resumed(plan: Plan, out, state_file: Path, note: Callable[[str], None]):
    """(totals, duplicate check, input offset, line) where the interrupted run stopped; the
    partial file cut back to what the state records."""
    try:
        with open_regular(state_file) as f:
            text = f.read()
    except OSError:
        raise CommandError(f"--resume: no readable state of an interrupted run beside {quoted_path(plan.output)}; "
                           f"run without --resume") from None
    try:
        state = json.loads(text.decode("utf-8"))
    except (ValueError, RecursionError):            # not JSON, or nested deeper than the parser goes
        raise CommandError(f"--resume: {quoted_path(state_file)} is damaged (not the JSON a run writes); "
                           f"run without --resume") from None
    try:
        totals, offset, line, written = _checked_state(state, plan)
    except (KeyError, TypeError):
        raise CommandError(f"--resume: {quoted_path(state_file)} is damaged (not the fields a run writes); "
                           f"run without --resume") from None
    except ValueError as e:
        raise CommandError(f"--resume: {quoted_path(state_file)} is damaged ({e}); run without --resume") from None
    if state.get("sha256") != plan.scan.sha256 or state.get("size") != plan.scan.size:
        raise CommandError(f"--resume: {quoted_path(plan.source)} changed since the interrupted run; "
                           f"run without --resume to start over")
    if state.get("options") != plan.options or state.get("version") != _STATE_VERSION:
        raise CommandError("--resume: the interrupted run had other options (system, unit, superheat, "
                           "Scheil, encoding); repeat them, or run without --resume")
    out.seek(0, os.SEEK_END)
    if out.tell() < written:
        raise CommandError(f"--resume: {quoted_path(partial_path(plan.output))} is shorter than its state says; "
                           f"run without --resume")
    out.truncate(written)
    out.seek(written)
    duplicates = DuplicateCheck()                # the identifiers already written, read again
    layout = plan.job.layout
    for block in blocks(plan.source, layout.data_offset, layout.data_line, offset, _block_bytes(plan.job)):
        duplicates.add(*identifiers(plan.job, block.first_line, block.data))
    note(f"resuming at line {line}: {totals.heats:,} heats were written before")
    return totals, duplicates, offset, line


def _whole_number(value: object, low: int, high: int | None, what: str) -> int:
    """`value` where it is an integer (not a bool) from `low` to `high` (None: no limit), else
    ValueError naming `what`."""
    if type(value) is not int or value < low or (high is not None and value > high):
        raise ValueError(f"{what} {value!r}, expected a whole number from {low}" + (f" to {high}" if high is not None else " up"))
    return value


def _checked_state(state: object, plan: Plan) -> tuple[Totals, int, int, int]:
    """(totals, input offset, line, output bytes) of a state file's contents, each checked to be
    what an interrupted run of this heat list writes: whole numbers inside the file, the offset
    at the end of a row, no more heats than lines read. ValueError naming the value otherwise
    (KeyError or TypeError where the fields are not those a run writes)."""
    layout, size = plan.job.layout, plan.scan.size
    offset = _whole_number(state["input_offset"], layout.data_offset, size, "input_offset")
    line = _whole_number(state["line"], layout.data_line, layout.data_line + plan.scan.lines, "line")
    written = _whole_number(state["output_bytes"], len(plan.job.header_text()), None, "output_bytes")
    if offset > layout.data_offset:
        with open_regular(plan.source) as f:
            f.seek(offset - 1)
            around = f.read(2)
        if around[:1] not in (b"\n", b"\r") or around == b"\r\n":
            raise ValueError(f"input_offset {offset} is not at the end of a row")
    counts = state["totals"]
    if set(counts) != set(Totals.__dataclass_fields__):
        raise ValueError("totals: not the fields a run writes")
    read = line - layout.data_line
    heats = _whole_number(counts["heats"], 0, read, "totals.heats")
    for name in ("problems", "blank_ids", "duplicates"):
        _whole_number(counts[name], 0, heats, f"totals.{name}")
    pairs = {"listed": (int, str), "duplicate_listed": (int, int)}
    for name, kinds in pairs.items():
        if not isinstance(counts[name], list) or not all(
                isinstance(p, list) and len(p) == 2 and all(type(v) is k for v, k in zip(p, kinds)) for p in counts[name]):
            raise ValueError(f"totals.{name}: expected pairs (line, {kinds[1].__name__})")
    if not isinstance(counts["blank_listed"], list) or not all(type(n) is int for n in counts["blank_listed"]):
        raise ValueError("totals.blank_listed: expected line numbers")
    if type(counts["duplicate_check_full"]) is not bool:
        raise ValueError("totals.duplicate_check_full: expected true or false")
    totals = Totals(**counts)
    totals.listed = [tuple(p) for p in totals.listed]
    totals.duplicate_listed = [tuple(p) for p in totals.duplicate_listed]
    return totals, offset, line, written


def _put_in_place(partial: Path, output: Path, force: bool) -> None:
    """Rename the finished partial file to `output` (replacing it only with `force`)."""
    from ladle.engine.files.atomic_files import _claim, refuse_unless_regular

    refuse_unless_regular(output)
    if force:
        os.replace(partial, output)
        return
    try:
        _claim(str(partial), output)
    except FileExistsError:
        raise CommandError(f"{quoted_path(output)}: exists already (created while this run went on); the results "
                           f"stay in {quoted_path(partial)}") from None
    try:
        os.unlink(partial)
    except FileNotFoundError:          # moved, not linked
        pass
