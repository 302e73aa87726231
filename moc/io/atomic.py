"""Atomic, non-destructive file writing.

Every file `moc` writes goes through `atomic_write`: the content is written to
a temporary file in the same directory and renamed over the target only when
complete, so a failure never leaves a partial file and never damages what the
user had.  An existing file is kept unless `force` is true.
"""

import contextlib
import os
import tempfile
from pathlib import Path

from moc.errors import FileExistsRefusal


def check_writable(paths, force=False):
    """Raise FileExistsRefusal naming the first existing path, unless force."""
    if force:
        return
    for p in paths:
        if Path(p).exists():
            raise FileExistsRefusal(
                f"{p} already exists; pass --force to overwrite it (nothing was written)."
            )


@contextlib.contextmanager
def atomic_path(path, force=True):
    """Yield a temporary path beside `path`; rename it to `path` on success.

    Use for writers that want a filename (meshio, ezdxf, matplotlib).  The
    temporary file keeps the target's suffix so format detection works.
    """
    path = Path(path)
    check_writable([path], force)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.stem}.", suffix=path.suffix,
                               dir=path.parent)
    os.close(fd)
    tmp = Path(tmp)
    # mkstemp creates the file owner-only (0600); give it the usual mode from the umask
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o666 & ~umask)
    try:
        yield tmp
        os.replace(tmp, path)
    except BaseException:
        with contextlib.suppress(FileNotFoundError):
            tmp.unlink()
        raise


def atomic_write(path, data, force=True):
    """Write str or bytes to `path` atomically."""
    with atomic_path(path, force=force) as tmp:
        mode = "wb" if isinstance(data, (bytes, bytearray)) else "w"
        kw = {} if mode == "wb" else {"encoding": "utf-8", "newline": ""}
        with open(tmp, mode, **kw) as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
