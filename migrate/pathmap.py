"""Map the old storage locations hard-coded in drivers to new ones (`mrlift convert --path-map`).

The map is a TOML file with one table:

    [paths]
    "hdfs://namenode:8020/warehouse/" = "s3a://new-lake/warehouse/"
    "/data/legacy/" = "/mnt/lake/"

Each key is a prefix of an old path; the longest matching prefix wins. Scripts get the mapped
path as the default of the option that stands for the hard-coded path, and the report lists
what was mapped and which hdfs:// paths no rule covers.
"""
from __future__ import annotations

import tomllib
from dataclasses import dataclass, replace
from pathlib import Path


class PathMapError(ValueError):
    """A path map file that cannot be used; the message names the file (and line, when TOML says)."""


@dataclass(frozen=True)
class PathMap:
    rules: tuple[tuple[str, str], ...]  # (old prefix, new prefix), longest prefix first

    def apply(self, path: str) -> str | None:
        for old, new in self.rules:
            if path.startswith(old):
                return new + path[len(old):]
        return None


def load_path_map(file: Path) -> PathMap:
    try:
        data = tomllib.loads(file.read_text(encoding="utf-8"))
    except OSError as exc:
        raise PathMapError(f"{file}: cannot read the path map: {exc.strerror or exc}") from exc
    except UnicodeDecodeError as exc:
        raise PathMapError(f"{file}: the path map is not UTF-8 text") from exc
    except tomllib.TOMLDecodeError as exc:  # its message says "(at line N, column M)"
        raise PathMapError(f"{file}: not a valid TOML path map: {exc}") from exc
    paths = data.get("paths")
    if not isinstance(paths, dict) or not paths:
        raise PathMapError(f"{file}: the path map needs a [paths] table of \"old prefix\" = \"new prefix\" lines")
    bad = [k for k, v in paths.items() if not isinstance(v, str) or not k]
    if bad:
        raise PathMapError(f"{file}: [paths] entry {bad[0]!r} must map a non-empty prefix to a string")
    return PathMap(tuple(sorted(paths.items(), key=lambda kv: -len(kv[0]))))


def map_job_paths(job, pm: PathMap):
    """The job with its hard-coded path defaults mapped; notes say what changed and what did not."""
    params, notes = [], []
    for p in job.plan.params:
        if p.default is None or p.positional:
            params.append(p)
            continue
        new = pm.apply(p.default)
        if new is not None:
            params.append(replace(p, default=new, help=f"{p.help}; was {p.default}"))
            notes.append(f"path map: {p.name} {p.default} -> {new}")
        else:
            params.append(p)
            if "://" in p.default:
                notes.append(f"path map: no rule covers {p.name} {p.default}")
    if not notes:
        return job
    plan = replace(job.plan, params=tuple(params), notes=job.plan.notes + tuple(notes))
    return replace(job, plan=plan, notes=list(job.notes) + notes)
