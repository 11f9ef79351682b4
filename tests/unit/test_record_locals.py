"""A local record of accumulators updated through its own methods (`flow.addDocked(n, 1)`,
`all.add(v)` in a combiner and a reducer) is one local per field for the rules: the job converts
and matches Hadoop. The form comes from public jobs in benchmarks/realworld (a Writable of sums and
counts, added to by methods, in mapper, combiner and reducer)."""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.helpers import scan_text, verify_one_job

CASE = Path(__file__).parents[1] / "golden" / "cases" / "combining" / "record_methods"
MAIN = (CASE / "Main.java").read_text(encoding="utf-8")
RECORD = (CASE / "DockFlow.java").read_text(encoding="utf-8")


def test_records_added_to_by_methods_match_hadoop(tmp_path):
    data = {"a.csv": b"quay,in,3\nquay,out,2\nmill,out,1\nquay,in,4\nferry,in,1\n",
            "b.csv": b"mill,out,5\nmill,in,2\nquay,out,1\nbell,out,7\nbell,lost,9\n"}
    check = verify_one_job(tmp_path, MAIN, data, more={"DockFlow.java": RECORD})
    assert check.verdict == "agrees", check.detail


def _lowered(tmp_path, main: str, record: str = RECORD) -> dict[str, list]:
    scan = scan_text(tmp_path, {"Main.java": main, "DockFlow.java": record})
    return {c.name: [why for _, why in c.lowered] for c in scan.index if c.name in ("M", "C", "R")}


@pytest.mark.parametrize("change, where", [
    # the record handed to another method: it may keep or change it
    (("for (DockFlow v : vs) all.add(v);\n      c.write(k, all);",
      "for (DockFlow v : vs) all.add(v);\n      java.util.Objects.requireNonNull(all);\n      c.write(k, all);"), "C"),
    # an updater's value used in an expression (javac refuses a void there; never rewritten)
    (("flow.addDocked(Long.parseLong(f[2]), 1);", "flow.addDocked(Long.parseLong(f[2]), 1); flow = null;"), "M"),
    # a method that is neither a getter nor an updater of fields
    (("all.getUndocked()", "all.toString()"), "R"),
    # a field of the record set directly (the classes share a package)
    (("flow.addDocked(Long.parseLong(f[2]), 1);", "flow.addDocked(Long.parseLong(f[2]), 1); flow.docked = 2;"), "M"),
])
def test_other_uses_of_the_record_leave_it_as_written(tmp_path, change, where):
    old, new = change
    assert old in MAIN
    lowered = _lowered(tmp_path, MAIN.replace(old, new))
    assert not any("local per field" in why for why in lowered[where])


@pytest.mark.parametrize("old, new, kept", [
    # a field that is not a number: no class method is read as an update
    ("  private int undockings;", "  private int undockings;\n  private String note = \"\";", {"M", "C", "R"}),
    # an updater that does more than assign fields: where it is called, the record stays
    ("this.dockings += times; }", "this.dockings += times; System.out.println(bikes); }", {"M"}),
    # two overloads of one arity: which one runs is javac's choice by type, not read here
    ("  public long getDocked() { return docked; }",
     "  public long getDocked() { return docked; }\n  public void addDocked(DockFlow o, long bikes) { docked += bikes; }\n"
     "  public void addDocked(long bikes, long times) { docked += bikes; }", {"M"}),
])
def test_records_whose_methods_do_more_are_left_as_written(tmp_path, old, new, kept):
    assert old in RECORD
    lowered = _lowered(tmp_path, MAIN, RECORD.replace(old, new))
    assert {c for c, why in lowered.items() if not any("local per field" in w for w in why)} == kept
