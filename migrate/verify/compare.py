"""Compare two job output folders the way a downstream reader sees them: the part files' bytes."""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path


def part_files(folder: Path) -> list[Path]:
    """Data files of a Hadoop or Spark output folder (`part-*`), in name order; markers and CRCs skipped."""
    return sorted(p for p in folder.iterdir() if p.name.startswith("part-") and not p.name.endswith(".crc"))


def output_bytes(folder: Path) -> bytes:
    return b"".join(p.read_bytes() for p in part_files(folder))


@dataclass(frozen=True)
class Comparison:
    same: bool
    same_lines_any_order: bool
    original_lines: int
    converted_lines: int
    first_difference: str


def compare_outputs(original: Path, converted: Path) -> Comparison:
    a, b = output_bytes(original), output_bytes(converted)
    la, lb = a.split(b"\n"), b.split(b"\n")
    diff = ""
    if a != b:
        for i, (x, y) in enumerate(zip(la, lb), 1):
            if x != y:
                diff = f"line {i}: original {x!r} vs converted {y!r}"
                break
        else:
            diff = f"original has {len(la) - 1} lines, converted {len(lb) - 1}"
    return Comparison(a == b, sorted(la) == sorted(lb), a.count(b"\n"), b.count(b"\n"), diff)
