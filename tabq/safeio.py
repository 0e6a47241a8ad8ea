"""safeio: reading and writing the files tabq is handed or keeps, safely.

Every such file is opened without following a symbolic link (a link in a model folder could
point tabq's writes anywhere) and without blocking (a FIFO would hang an open), then checked to
be a regular file (/dev/zero or a FIFO would never end) and read to a size limit, so no file can
hang tabq or fill its memory. Writes go to a temporary file renamed into place, created with
the mode an ordinary new file gets (0666 less the umask). Text that came from such a file is
made safe to print with `printable`.
"""

from __future__ import annotations

import contextlib
import errno
import os
import secrets
import stat
from pathlib import Path

from .errors import TabqError

_NOFOLLOW = getattr(os, "O_NOFOLLOW", 0)
_NONBLOCK = getattr(os, "O_NONBLOCK", 0)
_CLOEXEC = getattr(os, "O_CLOEXEC", 0)


def reason(err: OSError) -> str:
    """What an OSError says happened, as words in a sentence: "no space left on device"."""
    text = err.strerror or err.__class__.__name__
    return text[:1].lower() + text[1:]


def open_regular(path: Path, flags: int, error: type[TabqError], what: str,
                 follow: bool = False) -> int:
    """A descriptor of `path`, opened with `flags` without blocking; `error` (naming `what`)
    when it is a FIFO, a device or a folder. A link is refused with `error` too, unless
    `follow` (a file the person named, not one inside a model folder). OSError otherwise."""
    nofollow = 0 if follow else _NOFOLLOW
    try:
        fd = os.open(path, flags | nofollow | _NONBLOCK | _CLOEXEC, 0o666)
    except OSError as err:
        if err.errno == errno.ELOOP and not follow:
            raise error(f"{path}: the {what} is a symbolic link; tabq opens no link in a "
                        "model folder, so that what it writes stays in the folder") from None
        raise
    try:
        if not stat.S_ISREG(os.fstat(fd).st_mode):
            raise error(f"{path}: the {what} is not a regular file (a FIFO, device or "
                        "folder); it was not read")
        os.set_blocking(fd, True)
    except BaseException:
        os.close(fd)
        raise
    return fd


def read_bounded(path: Path, limit: int, error: type[TabqError], what: str,
                 follow: bool = False) -> bytes:
    """The bytes of a regular file of at most `limit` bytes; `error` otherwise. Reads at most
    limit + 1 bytes, whatever the file claims its size is. FileNotFoundError when missing."""
    try:
        fd = open_regular(Path(path), os.O_RDONLY, error, what, follow)
        with os.fdopen(fd, "rb") as f:
            data = f.read(limit + 1)
    except FileNotFoundError:
        raise
    except OSError as err:
        raise error(f"{path}: cannot read the {what}: {reason(err)}") from None
    if len(data) > limit:
        raise error(f"{path}: too large for a {what} (at most {limit:,} bytes); it was not read")
    return data


def atomic_write(path: Path, text: str) -> None:
    """Write `text` to `path` whole or not at all: a temporary file beside it, fsynced, then
    renamed over it. OSError (no space, read-only) propagates; the temporary file is removed."""
    path = Path(path)
    fd, tmp = _new_temporary(path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, path)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise


def _new_temporary(folder: Path) -> tuple[int, Path]:
    """A new file `.tmp-…` in `folder`. tempfile.mkstemp would make it 0600 whatever the umask,
    so a weights file would be private while the log beside it is not; the kernel applies the
    umask to 0666 here, as for any new file."""
    while True:
        tmp = folder / f".tmp-{secrets.token_hex(6)}"
        try:
            return os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL | _NOFOLLOW | _CLOEXEC,
                           0o666), tmp
        except FileExistsError:
            continue


def printable(text: str) -> str:
    """`text` with every character a terminal would act on rather than show (escape, carriage
    return, NUL, newline, bidirectional overrides …) written as its Python escape: a word
    imported from someone's lexicon file cannot rewrite or hide what is on the screen."""
    if text.isprintable():
        return text
    return "".join(c if c.isprintable() else c.encode("unicode_escape").decode("ascii")
                   for c in text)
