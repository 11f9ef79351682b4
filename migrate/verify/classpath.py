"""Find the Hadoop client jars to compile and run the original jobs with, and the repository's own jars.

Order of preference: `--classpath` given by the user, `$HADOOP_HOME` (share/hadoop/*/ and their
lib/ folders, the layout of a Hadoop 2/3 binary install), the output of `hadoop classpath` when a
Hadoop install is on PATH, and last the hadoop-client jars the pyspark wheel ships.
"""
from __future__ import annotations

import os
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

from migrate.verify.hadoop import HadoopUnavailable, spark_jars


@dataclass(frozen=True)
class HadoopClasspath:
    entries: tuple[str, ...]
    origin: str  # where it came from, for the report

    def __str__(self) -> str:
        return os.pathsep.join(self.entries)


def find_classpath(user: str | None = None, env: dict | None = None) -> HadoopClasspath:
    env = os.environ if env is None else env
    if user:
        return HadoopClasspath(tuple(user.split(os.pathsep)), "--classpath")
    home = env.get("HADOOP_HOME")
    if home and (Path(home) / "share" / "hadoop").is_dir():
        share = Path(home) / "share" / "hadoop"
        dirs = sorted(d for d in share.iterdir() if d.is_dir())
        entries = [f"{d}/*" for d in dirs] + [f"{d}/lib/*" for d in dirs if (d / "lib").is_dir()]
        return HadoopClasspath(tuple(entries), f"HADOOP_HOME ({home})")
    if shutil.which("hadoop", path=env.get("PATH")):
        try:
            out = subprocess.run(["hadoop", "classpath"], capture_output=True, text=True, timeout=60)
            if out.returncode == 0 and out.stdout.strip():
                return HadoopClasspath(tuple(out.stdout.strip().split(os.pathsep)), "`hadoop classpath`")
        except (OSError, subprocess.TimeoutExpired):
            pass
    try:
        jars = spark_jars()
    except HadoopUnavailable:
        raise HadoopUnavailable("no Hadoop classpath: pass --classpath, set HADOOP_HOME, or install pyspark "
                                "(its wheel ships the Hadoop client jars)") from None
    return HadoopClasspath((f"{jars}/*",), f"the pyspark wheel ({jars})")


def repository_jars(source_root: Path) -> tuple[str, ...]:
    """Jars the legacy repository keeps beside its code (`lib/*.jar`), which its jobs may need."""
    lib = source_root / "lib"
    return tuple(str(p) for p in sorted(lib.glob("*.jar"))) if lib.is_dir() else ()
