"""The content-addressed cache: what a run worked out, by the hash of everything it depended on.

Three kinds of entry, each under a key made from mrlift's version and code, the run's settings and the
sha256 of the files it read: the survey facts of a file (by its bytes), javac's answer (by every
parsed file), and a shard's finished jobs (by the shard's files and javac's answer for them). A
changed file changes only the keys of what read it, so a re-run redoes only the shards that use it.
A run whose inputs and settings are all unchanged, into an output folder exactly as mrlift left it,
does nothing but check the hashes (see `run_key` and convert_repository).

Entries are pickles: the cache folder (`<output>/.mrlift-cache` or --cache DIR) must be writable by
you alone, like any build cache; a folder others may write to is refused.
"""
from __future__ import annotations

import functools
import hashlib
import os
import pickle
import stat
import zlib
from pathlib import Path

from migrate import __version__
from migrate.convert import write_atomically

FORMAT = 2  # bump when what an entry holds changes


class CacheFolderError(Exception):
    """The cache folder cannot be used safely."""


@functools.lru_cache(maxsize=1)
def code_digest() -> str:
    """sha256 of mrlift's own code and templates: a changed rule changes every key, release or not."""
    here = Path(__file__).resolve().parent
    h = hashlib.sha256()
    for p in sorted([*here.rglob("*.py"), *here.rglob("*.properties"), *(here.parent / "templates").glob("*.j2")]):
        h.update(p.relative_to(here.parent).as_posix().encode() + b"\0" + p.read_bytes())
    return h.hexdigest()


def key_of(*parts) -> str:
    """A key for these parts (strings, bytes, numbers, tuples of them), with mrlift's version and code in it."""
    h = hashlib.sha256(f"mrlift {__version__} {code_digest()} cache {FORMAT}".encode())
    for p in parts:
        data = p if isinstance(p, bytes) else repr(p).encode("utf-8", "surrogateescape")
        h.update(len(data).to_bytes(8, "big") + data)
    return h.hexdigest()


class Cache:
    """A folder of entries by kind and key; `None` folder: a cache that keeps nothing."""

    def __init__(self, folder: Path | None):
        self.folder = folder
        if folder is None:
            return
        folder.mkdir(parents=True, exist_ok=True, mode=0o700)
        st = folder.stat()
        if st.st_mode & (stat.S_IWGRP | stat.S_IWOTH) or (hasattr(os, "getuid") and st.st_uid != os.getuid()):
            raise CacheFolderError(f"{folder}: others may write to this cache folder (its entries are loaded as "
                                   "Python objects); use a folder only you can write to")

    def _path(self, kind: str, key: str) -> Path:
        return self.folder / kind / key[:2] / key

    def get(self, kind: str, key: str):
        if self.folder is None:
            return None
        try:
            return pickle.loads(zlib.decompress(self._path(kind, key).read_bytes()))
        except (OSError, zlib.error, pickle.UnpicklingError, EOFError, AttributeError, ImportError, ValueError):
            return None  # missing, cut short or from another version: worked out again

    def put(self, kind: str, key: str, value) -> None:
        if self.folder is None:
            return
        try:
            write_atomically(self._path(kind, key), zlib.compress(pickle.dumps(value, protocol=5), 1))
        except OSError:
            pass  # a full disk costs the next run time, not this run its output
