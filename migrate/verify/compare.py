"""Compare two job output folders the way a downstream reader sees them: the part files' bytes.

Where the original job itself gives the lines of one key in no defined order (a reducer that
writes values as it meets them), `within_key_any_order` compares what is defined: the sequence
of keys, and each key's lines as a multiset.
"""
from __future__ import annotations

import re
from collections import Counter
from dataclasses import dataclass
from itertools import groupby, zip_longest
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


# ----------------------------------------------------------------------------- verdicts for `mrlift verify`

MODES = {
    "bytes": "the same bytes in the same order (the original fixed the order: sorted keys, or input order)",
    "within-key": "the same keys in the same order, each key's lines in any order (the original's reducer wrote "
                  "values in arrival order, which Hadoop does not define)",
    "lines": "the same lines in any order (the original's file order is not reproduced)",
    "keys": "the same keys in the same order, however many lines each has (the original's values depended on how "
            "the input was split)",
    "part-files": "the same lines, and each of the original's part files in its own order among them (the "
                  "original split its lines over reduce tasks by a rule the script does not reproduce)",
}
_NUMBER = re.compile(rb"-?(?:\d+\.\d*|\.\d+|\d+)(?:[eE][-+]?\d+)?|NaN|-?Infinity")


@dataclass(frozen=True)
class Verdict:
    """What a comparison of two output folders found."""

    agrees: bool
    mode: str
    original_lines: int
    converted_lines: int
    missing: int  # lines of the original the converted output lacks (as a multiset)
    extra: int  # lines the converted output has that the original lacks
    differences: tuple[tuple[int, str, str], ...]  # (line number, original, converted), the first few
    tolerance_used: bool = False  # only numbers that differ within the tolerance made the lines differ


def _lines(data: bytes) -> list[bytes]:
    lines = data.split(b"\n")
    return lines[:-1] if lines and lines[-1] == b"" else lines


def _close(a: bytes, b: bytes, tolerance: float) -> bool:
    """The lines are the same but for numbers within `tolerance` (relative to the larger, or absolute near 0)."""
    na, nb = _NUMBER.findall(a), _NUMBER.findall(b)
    if len(na) != len(nb) or _NUMBER.sub(b"#", a) != _NUMBER.sub(b"#", b):
        return False
    for x, y in zip(na, nb):
        if x == y:
            continue
        try:
            fx, fy = float(x), float(y)
        except ValueError:
            return False
        if abs(fx - fy) > tolerance * max(1.0, abs(fx), abs(fy)):
            return False
    return True


def compare_folders(original: Path, converted: Path, mode: str = "bytes", tolerance: float | None = None,
                    separator: bytes = b"\t", show: int = 5) -> Verdict:
    """Compare two output folders under one of MODES; a tolerance (off by default) lets floating
    numbers whose last digits depend on summation order count as equal, and says it was needed."""
    if mode not in MODES:
        raise ValueError(f"unknown comparison mode {mode!r}; one of {', '.join(MODES)}")
    a, b = _lines(output_bytes(original)), _lines(output_bytes(converted))
    ca, cb = Counter(a), Counter(b)
    missing, extra = sum((ca - cb).values()), sum((cb - ca).values())
    diffs: list[tuple[int, str, str]] = []
    used = False

    def same(x: bytes, y: bytes) -> bool:
        nonlocal used
        if x == y:
            return True
        if tolerance is not None and _close(x, y, tolerance):
            used = True
            return True
        return False

    def text(x: bytes | None) -> str:
        return "(no line)" if x is None else x.decode("utf-8", "replace")

    def compare(xs: list, ys: list, first_line: int, test) -> None:
        for i, (x, y) in enumerate(zip_longest(xs, ys), first_line):
            if x is None or y is None or not test(x, y):
                diffs.append((i, text(x), text(y)))

    def key(line: bytes) -> bytes:
        return line.split(separator, 1)[0]

    if mode == "bytes":
        compare(a, b, 1, same)
    elif mode == "part-files":
        compare(sorted(a), sorted(b), 1, same)
        if not diffs:
            diffs.extend(_out_of_order(original, b, same))
    elif mode == "keys":  # how many lines a key has can depend on the combiner too (an identity reducer)
        compare([k for k, _ in groupby(map(key, a))], [k for k, _ in groupby(map(key, b))], 1, bytes.__eq__)
    else:  # each group's lines as a multiset: sorted, then line by line
        def groups(lines: list[bytes]) -> list[list[bytes]]:
            return [sorted(g) for _, g in groupby(lines, key=key)] if mode == "within-key" else [sorted(lines)]

        line = 1
        for ga, gb in zip_longest(groups(a), groups(b), fillvalue=[]):
            compare(ga, gb, line, same)
            line += len(ga)
    return Verdict(not diffs, mode, len(a), len(b), missing, extra, tuple(diffs[:show]), used and not diffs)


def _out_of_order(original: Path, converted: list[bytes], same) -> list[tuple[int, str, str]]:
    """Where an original part file's lines do not come in their order in the converted lines: each
    part file must be a subsequence of them (taken greedily, which finds one whenever there is one)."""
    out = []
    for p in part_files(original):
        at = 0
        for n, line in enumerate(_lines(part_bytes(p)), 1):
            while at < len(converted) and not same(line, converted[at]):
                at += 1
            if at == len(converted):
                out.append((n, f"{p.name} line {n}: {line.decode('utf-8', 'replace')}", "(not after the earlier lines)"))
                break
            at += 1
    return out


def parse_counters(log: str) -> dict[tuple[str, str], int]:
    """Counters from a Hadoop job log or a script's report: a TAB-indented group line, then
    TAB TAB name=value lines (the layout Hadoop's job client prints). Chained jobs print a block
    each; a counter in several blocks is their sum, as the script's one report adds them."""
    out, group = {}, None
    for line in log.splitlines():
        if line.startswith("\t\t") and group is not None and "=" in line:
            name, _, value = line.strip("\t").rpartition("=")
            if value.strip().lstrip("-").isdigit():
                out[(group, name)] = out.get((group, name), 0) + int(value)
        elif line.startswith("\t") and not line.startswith("\t\t"):
            group = line.strip()
    return out


def counter_differences(declared: list[dict], original: dict[tuple[str, str], int],
                        converted: dict[tuple[str, str], int]) -> list[str]:
    """The job's own counters that differ between the two runs, as `group:name original -> converted`.

    The job's own counters are the groups the job names (its report's `counters`) and every group
    the script printed; Hadoop's framework groups are neither. A counter no record reached is
    absent from Hadoop's log and 0 in the script's report: both count as 0. A counter the report
    marks `combiner_too` is not compared."""
    groups = {c["group"] for c in declared if c.get("group") is not None} | {g for g, _ in converted}
    # a counter the combiner updates too has no defined value in the original (the report says so)
    skip = {(c["group"], c["name"]) for c in declared if c.get("combiner_too")}
    keys = ({k for k in original if k[0] in groups} | set(converted)) - skip
    return [f"{g}:{n} {original.get((g, n), 0)} -> {converted.get((g, n), 0)}" for g, n in sorted(keys)
            if original.get((g, n), 0) != converted.get((g, n), 0)]
