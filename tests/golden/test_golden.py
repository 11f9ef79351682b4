"""Golden cases: Java in, expected plan dump and generated script out.

Each folder under tests/golden/cases/<idiom>/<case>/ holds the Java sources of one job and
`expected.plan.txt` + `expected.py`. Regenerate deliberately with
    python -m pytest tests/golden --regen-golden
"""
from __future__ import annotations

import ast
import difflib
from pathlib import Path

import pytest

from migrate.convert import header_for
from migrate.gen.pyspark import format_code, render_script
from migrate.plan import dump_plan
from migrate.scan import scan_repo, script_name

CASES = sorted(p for p in (Path(__file__).parent / "cases").glob("*/*") if p.is_dir())
REGEN = "python -m pytest tests/golden --regen-golden"


def _render(case: Path) -> tuple[str, str, object]:
    scan = scan_repo(case)
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    name = script_name(job, set())
    return dump_plan(job.plan), render_script(job.plan, header_for(job, name), list(job.plan.hand_work)), job


def _check(path: Path, actual: str, regen: bool) -> None:
    if regen:
        path.write_text(actual, encoding="utf-8")
        return
    if not path.exists():
        pytest.fail(f"{path} is missing; create it deliberately with: {REGEN}")
    expected = path.read_text(encoding="utf-8")
    if expected != actual:
        diff = "".join(difflib.unified_diff(expected.splitlines(True), actual.splitlines(True), str(path), "actual"))
        pytest.fail(f"{path.name} differs (if the change is deliberate: {REGEN}):\n{diff}")


@pytest.mark.parametrize("case", CASES, ids=[f"{c.parent.name}/{c.name}" for c in CASES])
def test_golden_case(case, request):
    regen = request.config.getoption("--regen-golden")
    plan, script, job = _render(case)
    _check(case / "expected.plan.txt", plan, regen)
    _check(case / "expected.py", script, regen)


@pytest.mark.parametrize("case", CASES, ids=[f"{c.parent.name}/{c.name}" for c in CASES])
def test_generated_script_is_valid_formatted_and_honest(case):
    _, script, job = _render(case)
    ast.parse(script)
    assert format_code(script) == script, "black is not a no-op on the generated script"
    stubs = script.count("raise NotImplementedError(")
    blocking = [h for h in job.plan.hand_work if h.blocking]
    assert stubs == (1 if blocking else 0)  # one stub lists every blocking item
    for h in blocking:
        assert f"{h.origin.file.rsplit('/', 1)[-1]}:{h.origin.line_start}" in script
    assert "verified on real data" in script.replace("\n", " ").replace("  ", " ") or "Verify this script on real data" in script


def test_same_repository_gives_byte_identical_output():
    case = CASES[0]
    assert _render(case)[:2] == _render(case)[:2]
