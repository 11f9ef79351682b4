"""Compare two job output folders the way a downstream reader sees them: the part files' bytes.

Where the original job itself gives the lines of one key in no defined order (a reducer that
writes values as it meets them), `within_key_any_order` compares what is defined: the sequence
of keys, and each key's lines as a multiset.
"""
from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from itertools import groupby
from pathlib import Path


def part_files(folder: Path) -> list[Path]:
    """Data files of a Hadoop or Spark output folder (`part-*`), in name order; markers and CRCs skipped."""
    return sorted(p for p in folder.iterdir() if p.name.startswith("part-") and not p.name.endswith(".crc"))


def part_bytes(p: Path) -> bytes:
    """A part file's content, decompressed by its codec's extension (.gz, .deflate, .bz2)."""
    import bz2
    import gzip
    import zlib

    data = p.read_bytes()
    if p.suffix == ".gz":
        return gzip.decompress(data)
    if p.suffix == ".deflate":
        return zlib.decompress(data)
    if p.suffix == ".bz2":
        return bz2.decompress(data)
    return data


def output_bytes(folder: Path) -> bytes:
    return b"".join(part_bytes(p) for p in part_files(folder))


@dataclass(frozen=True)
class Comparison:
    same: bool
    same_lines_any_order: bool
    original_lines: int
    converted_lines: int
    first_difference: str


def _by_key(lines: list[bytes], separator: bytes) -> list[tuple[bytes, Counter]]:
    return [(k, Counter(group)) for k, group in groupby(lines, key=lambda line: line.split(separator, 1)[0])]


def compare_outputs(original: Path, converted: Path, *, within_key_any_order: bool = False,
                    separator: bytes = b"\t") -> Comparison:
    return compare_bytes(output_bytes(original), output_bytes(converted), within_key_any_order=within_key_any_order,
                         separator=separator)


def compare_bytes(a: bytes, b: bytes, *, within_key_any_order: bool = False, separator: bytes = b"\t") -> Comparison:
    la, lb = a.split(b"\n"), b.split(b"\n")
    diff = ""
    if within_key_any_order:
        ka, kb = _by_key(la, separator), _by_key(lb, separator)
        same = ka == kb
        if not same:
            for (x, cx), (y, cy) in zip(ka, kb):
                if (x, cx) != (y, cy):
                    diff = f"key {x!r}: original {sorted(cx.elements())!r} vs converted {sorted(cy.elements())!r}"
                    break
            else:
                diff = f"original has {len(ka)} key groups, converted {len(kb)}"
        return Comparison(same, sorted(la) == sorted(lb), a.count(b"\n"), b.count(b"\n"), diff)
    if a != b:
        for i, (x, y) in enumerate(zip(la, lb), 1):
            if x != y:
                diff = f"line {i}: original {x!r} vs converted {y!r}"
                break
        else:
            diff = f"original has {len(la) - 1} lines, converted {len(lb) - 1}"
    return Comparison(a == b, sorted(la) == sorted(lb), a.count(b"\n"), b.count(b"\n"), diff)
