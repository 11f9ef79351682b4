"""Compile legacy Java against the Hadoop client jars that ship in the pyspark wheel and run it locally."""
from __future__ import annotations

import re
import shutil
import subprocess
import tempfile
from dataclasses import dataclass
from pathlib import Path


class HadoopUnavailable(Exception):
    """No JDK or no Hadoop client jars on this machine."""


def spark_jars() -> Path:
    """The pyspark wheel's jars folder (it holds hadoop-client-api and hadoop-client-runtime)."""
    try:
        import pyspark
    except ImportError as exc:
        raise HadoopUnavailable("pyspark is not installed (pip install 'mrlift[spark]')") from exc
    jars = Path(pyspark.__file__).parent / "jars"
    if not list(jars.glob("hadoop-client-api-*.jar")):
        raise HadoopUnavailable(f"no hadoop-client-api jar in {jars}")
    return jars


def compile_classpath() -> str:
    jars = spark_jars()
    return ":".join(str(p) for p in sorted(jars.glob("hadoop-client-*.jar")))


def run_classpath(classes: Path) -> str:
    return f"{classes}:{spark_jars()}/*"


@dataclass(frozen=True)
class CompileResult:
    ok: bool
    classes: Path
    log: str


def compile_sources(sources: list[Path], classes: Path, classpath: str | None = None,
                    sourcepath: Path | None = None, timeout: float = 600) -> CompileResult:
    """javac the files (UTF-8, warnings off); with `sourcepath`, the classes they use are compiled too."""
    if shutil.which("javac") is None:
        raise HadoopUnavailable("javac is not on PATH (Java 17+ is needed to run the original jobs)")
    classes.mkdir(parents=True, exist_ok=True)
    cmd = ["javac", "-nowarn", "-encoding", "UTF-8", "-cp", classpath or compile_classpath(), "-d", str(classes)]
    if sourcepath is not None:
        cmd += ["-sourcepath", str(sourcepath)]
    try:
        p = subprocess.run(cmd + [str(s) for s in sources], capture_output=True, text=True, timeout=timeout)
    except subprocess.TimeoutExpired:
        return CompileResult(False, classes, f"javac ran longer than {timeout:g} s")
    return CompileResult(p.returncode == 0, classes, p.stdout + p.stderr)


@dataclass(frozen=True)
class RunResult:
    returncode: int
    log: str


TIMED_OUT = -9


def run_job(classes: Path, driver: str, args: list[str], cwd: Path, timeout: float = 600,
            classpath: str | None = None) -> RunResult:
    """`java -cp classes:<jars>/* Driver args…` in local mode (mapreduce.framework.name=local is the default).
    A run past `timeout` seconds is stopped: returncode TIMED_OUT."""
    logging = Path(__file__).with_name("log4j2-hadoop.properties")  # so the job log shows its counters
    cp = f"{classes}:{classpath}" if classpath else run_classpath(classes)
    cmd = ["java", "-Xmx1g", "-Duser.timezone=UTC", "-Duser.language=en", "-Duser.country=US",
           f"-Dlog4j2.configurationFile={logging}", "-cp", cp, driver, *args]
    try:
        p = subprocess.run(cmd, capture_output=True, text=True, cwd=cwd, timeout=timeout)
    except subprocess.TimeoutExpired as exc:
        out = (exc.stdout or b"").decode("utf-8", "replace") if isinstance(exc.stdout, bytes) else (exc.stdout or "")
        return RunResult(TIMED_OUT, out + f"\nstopped: the job ran longer than {timeout:g} s")
    return RunResult(p.returncode, p.stdout + p.stderr)


_JAVAC_ERROR = re.compile(r"^(?P<file>.+?\.java):(?P<line>\d+): error: (?P<message>.*)$")


def javac_errors(sources: list[Path], classpath: str, timeout: float = 600) -> dict[Path, list[tuple[int, str]]]:
    """Compile the files together (classes to a throw-away folder) and return javac's errors per file:
    (line, message). javac reports on every file it could read, so one broken file does not hide
    another's errors; a file that compiles has no entry."""
    if shutil.which("javac") is None:
        raise HadoopUnavailable("javac is not on PATH (a JDK 17+ is needed for --compile-check)")
    with tempfile.TemporaryDirectory(prefix="mrlift-javac-") as out:
        # FLOW: go on to attribution and flow analysis even after errors, so every file is checked, and
        # stop there without errors too (no class files: a third of javac's time); the JIT's first tier
        # and the serial collector suit one short compile (measured: 2.5 s of CPU instead of 8 on 40k
        # lines, 230 MB instead of 425)
        cmd = ["javac", "-nowarn", "-encoding", "UTF-8", "-Xmaxerrs", "100000", "-proc:none",
               "-XDshould-stop.ifError=FLOW", "-XDshould-stop.ifNoError=FLOW", "-J-XX:TieredStopAtLevel=1",
               "-J-XX:+UseSerialGC", "-cp", classpath,
               "-d", out, *map(str, sources)]
        try:
            p = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)
        except subprocess.TimeoutExpired:
            raise HadoopUnavailable(f"javac ran longer than {timeout:g} s") from None
    found: dict[Path, list[tuple[int, str]]] = {}
    for line in (p.stdout + p.stderr).splitlines():
        m = _JAVAC_ERROR.match(line)
        if m:
            found.setdefault(Path(m["file"]).resolve(), []).append((int(m["line"]), m["message"]))
    if p.returncode != 0 and not found:
        raise HadoopUnavailable(f"javac failed without naming a file: {(p.stdout + p.stderr).strip()[:500]}")
    return found
