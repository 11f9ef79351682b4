"""Raw comparators over a key's serialised bytes, read back to an order of its fields.

Facts relied on: WritableComparator.compareBytes compares unsigned bytes, first difference first
(WritableComparator source); DataOutput.writeInt/writeLong write big-endian two's complement
(DataOutput javadoc), so `f - Integer.MIN_VALUE` flips the sign bit and its unsigned order is f's
signed order; WritableComparator.define registers the comparator WritableComparator.get returns,
the job's default sort and grouping comparator (WritableComparator javadoc). The parity test runs
the job on Hadoop's local runner, with negative numbers, where a plain encoding would sort wrong.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.helpers import scan_text, verify_one_job

# the golden case's job: a pair key with a registered byte comparator and a byte grouping comparator
JOB = (Path(__file__).resolve().parent.parent / "golden" / "cases" / "secondary_sort" / "raw_pair_key"
       / "DockReadings.java").read_text(encoding="utf-8")
# dock, minute, bikes: negative docks and minutes, where a plain writeInt would sort them last
READINGS = b"3 10 4\n3 -5 2\n-2 7 9\n3 0 1\n-2 -1 6\n12 5 0\n-2 7 3\nbad line\n0 2147483647 5\n0 -2147483648 8\n"


def _job(tmp_path, edit=lambda s: s):
    scan = scan_text(tmp_path, {"DockReadings.java": edit(JOB)})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job


def test_a_registered_byte_comparator_and_a_byte_grouping_comparator_are_read(tmp_path):
    from migrate.plan import dump_expr

    job = _job(tmp_path)
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [("key.dock", True), ("key.minute", True)]
    assert [dump_expr(e) for e in job.plan.reduce.group] == ["key.dock"]


@pytest.mark.parametrize("edit, why", [
    (lambda s: s.replace("out.writeInt(dock - Integer.MIN_VALUE);", "out.writeInt(dock);"),
     "puts negative numbers after positive ones"),
    (lambda s: s.replace("Integer.SIZE / 8, b2, s2, Integer.SIZE / 8", "6, b2, s2, 6"), "end inside a field"),
    (lambda s: s.replace("return compareBytes(b1, s1, l1, b2, s2, l2);", "return compareBytes(b1, s1, 4, b2, s2, 4);"),
     "ignores `minute`"),
    (lambda s: s.replace("out.writeInt(minute - Integer.MIN_VALUE);", "out.writeInt(minute - Integer.MIN_VALUE);\n"
                                                                      "      out.writeUTF(\"v1\");"),
     "writes something other than a field"),
])
def test_byte_orders_that_are_not_field_orders_are_declined(tmp_path, edit, why):
    job = _job(tmp_path, edit)
    assert job.status != "converted"
    assert any(why in h.reason for h in job.plan.hand_work), [(h.category, h.reason) for h in job.plan.hand_work]


@pytest.mark.parity
def test_byte_comparators_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, JOB, {"readings.txt": READINGS}, driver="DockReadings")
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"
