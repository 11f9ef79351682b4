"""What else a legacy repository runs on the cluster besides Java MapReduce: Hive scripts, Pig
scripts, Hadoop streaming invocations and Oozie workflows. They are listed (file, size, what runs
them), not converted; the effort estimate counts them with the profile stated in PROFILES.
"""
from __future__ import annotations

import os
import re
from dataclasses import dataclass
from pathlib import Path

from migrate.java.source import SKIPPED_FOLDERS, shown_path

MAX_BYTES = 2 * 1024 * 1024  # a larger file is data, not a script
# Statements that only HiveQL has among the SQL dialects a repository's .sql files hold (common practice).
_HIVE_SQL = re.compile(r"(?i)\b(?:row\s+format|stored\s+as|create\s+external\s+table|insert\s+overwrite|"
                       r"partitioned\s+by|msck\s+repair|set\s+hive\.|lateral\s+view)\b")
_STREAMING = re.compile(r"hadoop-streaming[\w.-]*\.jar|org\.apache\.hadoop\.streaming\.")
_FLAG = r"-{flag}\s+(?:'([^']+)'|\"([^\"]+)\"|(\S+))"


@dataclass(frozen=True)
class OtherSource:
    """A job source in another engine's language: what it is and what runs it."""

    kind: str  # "hive" | "pig" | "streaming" | "workflow"
    path: str  # relative to the scanned folder
    lines: int
    sloc: int  # non-blank lines that are not comments
    detail: str  # what the file holds, for the report


# what runs each kind, and how much of it must be redone: this project's choice (see README)
RUNS_WITH = {"hive": "Hive", "pig": "Pig", "streaming": "Hadoop streaming", "workflow": "Oozie"}
PROFILES = {"hive": "P1", "pig": "P2", "streaming": "P2", "workflow": "P1"}
SUGGESTIONS = {
    "hive": "run the statements with spark.sql on a session with Hive support (most HiveQL runs as it is); "
            "check UDFs, SerDes and INSERT OVERWRITE targets by hand",
    "pig": "rewrite each relation as a DataFrame step (LOAD -> spark.read, FILTER -> where, GROUP/FOREACH -> "
           "groupBy().agg, JOIN -> join)",
    "streaming": "run the mapper and reducer scripts with RDD.pipe, or rewrite them as DataFrame steps",
    "workflow": "re-create the order of the actions in the scheduler that starts the converted scripts",
}


def other_sources(root: Path) -> list[OtherSource]:
    """Every Hive, Pig, streaming and Oozie workflow file under `root`, in a stable order."""
    if not root.is_dir():
        return []
    out = []
    for dirpath, dirnames, filenames in os.walk(root):
        dirnames[:] = sorted(d for d in dirnames if d not in SKIPPED_FOLDERS)
        for name in sorted(filenames):
            p = Path(dirpath) / name
            if p.is_symlink() or not p.is_file() or p.stat().st_size > MAX_BYTES or name.endswith(".java"):
                continue
            found = _classify(p, name)
            if found is not None:
                kind, text, detail = found
                lines = text.replace("\r\n", "\n").split("\n")
                out.append(OtherSource(kind, shown_path(p, root), len(lines), _sloc(lines, kind), detail))
    return out


def _classify(p: Path, name: str) -> tuple[str, str, str] | None:
    suffix = p.suffix.lower()
    if suffix not in (".hql", ".q", ".sql", ".pig", ".xml", ".sh", ".bash", ".py", ".txt", ".cmd", ""):
        return None
    try:
        text = p.read_bytes().decode("utf-8", "replace")
    except OSError:
        return None
    if suffix in (".hql", ".q") or suffix == ".sql" and _HIVE_SQL.search(text):
        return "hive", text, f"a Hive script of {_statements(text)} statements"
    if suffix == ".pig":
        return "pig", text, f"a Pig script of {_statements(text)} statements"
    if suffix == ".xml" and "<workflow-app" in text:
        actions = len(re.findall(r"<action\b", text))
        return "workflow", text, f"an Oozie workflow of {actions} actions"
    if suffix != ".xml" and _STREAMING.search(text):
        scripts = {flag: _flag(text, flag) for flag in ("mapper", "reducer")}
        shown = ", ".join(f"{flag} {value}" for flag, value in scripts.items() if value) or "no -mapper/-reducer found"
        return "streaming", text, f"a Hadoop streaming job ({shown})"
    return None


def _flag(text: str, flag: str) -> str:
    m = re.search(_FLAG.format(flag=flag), text)
    return next((g for g in m.groups() if g), "") if m else ""


def _statements(text: str) -> int:
    """Statements ended by `;` outside comments (a rough count: strings holding `;` count too)."""
    code = re.sub(r"/\*.*?\*/", "", text, flags=re.S)
    code = re.sub(r"(?m)--.*$", "", code)
    return sum(1 for part in code.split(";") if part.strip())


def _sloc(lines: list[str], kind: str) -> int:
    comment = {"hive": ("--",), "pig": ("--", "/*", "*"), "streaming": ("#",), "workflow": ("<!--",)}[kind]
    return sum(1 for line in lines if line.strip() and not line.strip().startswith(comment))
