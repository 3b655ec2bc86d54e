"""Write an output whole or not at all.

Each writer writes to a temporary file in the target folder and moves it into place with
``os.replace`` (atomic on one file system). If anything goes wrong, the temporary file is
removed and any earlier output at the target is left as it was. An output that would land on
one of the inputs is refused before anything is written, and so is a target that is a folder
or a read-only file. The temporary file is flushed to the disk (``fsync``) before it is moved,
so that a power cut just after the move cannot leave an empty file in place of the old one.
"""

from __future__ import annotations

import contextlib
import errno
import os
import tempfile
from collections.abc import Iterator
from pathlib import Path


class OutputError(Exception):
    """An output could not be written (or was refused); the message is one line."""


def same_file(a: str | os.PathLike, b: str | os.PathLike) -> bool:
    """True when two paths name the same file (also through links or a different spelling)."""
    pa, pb = Path(a), Path(b)
    try:
        if pa.exists() and pb.exists():
            return os.path.samefile(pa, pb)
    except OSError:
        pass
    return os.path.normcase(pa.resolve()) == os.path.normcase(pb.resolve())


def refuse_inputs(target: str | os.PathLike, protected: tuple[str | os.PathLike, ...] | list) -> None:
    for p in protected:
        if p and same_file(target, p):
            raise OutputError(f"refusing to write {target}: it is the input file {p}, which beamsched never "
                              "overwrites; choose another output name")


def refuse_unwritable(target: str | os.PathLike) -> None:
    """A folder, or a file marked read-only (no write permission for anyone: the read-only
    attribute), is never replaced: ``os.replace`` would do it silently on a POSIX system."""
    target = Path(target)
    if target.is_dir():
        raise OutputError(f"cannot write {target}: it is a folder")
    if target.exists() and not target.is_symlink() and not (target.stat().st_mode & 0o222):
        raise OutputError(f"refusing to replace {target}: the file is read-only; make it writable, or choose "
                          "another output name")


def _flush_to_disk(path: Path) -> None:
    fd = os.open(path, os.O_RDWR | getattr(os, "O_BINARY", 0))
    try:
        os.fsync(fd)
    except OSError as exc:  # a file system without fsync (some network shares) is not an error
        if exc.errno not in (errno.EINVAL, errno.ENOTSUP, errno.EBADF):
            raise
    finally:
        os.close(fd)


def _flush_folder(folder: Path) -> None:
    """Make the rename itself durable (POSIX; Windows cannot open a folder)."""
    if os.name != "posix":
        return
    with contextlib.suppress(OSError):
        fd = os.open(folder, os.O_RDONLY)
        try:
            os.fsync(fd)
        finally:
            os.close(fd)


@contextlib.contextmanager
def atomic_path(target: str | os.PathLike, protected: tuple | list = ()) -> Iterator[Path]:
    """Yield a temporary path beside ``target``; on success move it onto ``target``.

    ``protected`` lists input files the target must not be. On any exception the temporary
    file is deleted and the exception propagates; an existing ``target`` is untouched.
    """
    target = Path(target)
    refuse_inputs(target, protected)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(f"cannot write {target}: the folder {folder} does not exist")
    refuse_unwritable(target)
    try:
        fd, tmp_name = tempfile.mkstemp(prefix=f".{target.stem}.", suffix=f".partial{target.suffix}", dir=folder)
    except OSError as exc:
        raise OutputError(f"cannot write in {folder}: {exc.strerror or exc}") from exc
    os.close(fd)
    tmp = Path(tmp_name)
    try:
        yield tmp
        # mkstemp makes the file private (0600); give it the permissions a normal new file gets.
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        _flush_to_disk(tmp)
        os.replace(tmp, target)
        _flush_folder(folder)
    except BaseException:
        with contextlib.suppress(OSError):
            tmp.unlink()
        raise


def write_text(target: str | os.PathLike, text: str, protected: tuple | list = (), newline: str | None = None) -> Path:
    """Write a text file atomically (UTF-8)."""
    with atomic_path(target, protected) as tmp, open(tmp, "w", encoding="utf-8", newline=newline) as fh:
        fh.write(text)
    return Path(target)
