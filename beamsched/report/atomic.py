"""Write an output whole or not at all.

Each writer writes to a temporary file in the target folder and moves it into place with
``os.replace`` (atomic on one file system). If anything goes wrong, the temporary file is
removed and any earlier output at the target is left as it was. An output that would land on
one of the inputs is refused before anything is written.
"""

from __future__ import annotations

import contextlib
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
        os.replace(tmp, target)
    except BaseException:
        with contextlib.suppress(OSError):
            tmp.unlink()
        raise


def write_text(target: str | os.PathLike, text: str, protected: tuple | list = (), newline: str | None = None) -> Path:
    """Write a text file atomically (UTF-8)."""
    with atomic_path(target, protected) as tmp, open(tmp, "w", encoding="utf-8", newline=newline) as fh:
        fh.write(text)
    return Path(target)
