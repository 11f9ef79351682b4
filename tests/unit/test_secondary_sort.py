"""Secondary sort: sort and grouping comparators over a custom key.

Hadoop facts (Job.setSortComparatorClass / setGroupingComparatorClass javadoc, MapReduce
tutorial "Secondary Sort"): map output is sorted with the sort comparator; one reduce() call
gets the consecutive keys the grouping comparator calls equal, and the key object moves to each
value's own key as the values are read.
"""
from __future__ import annotations

from pathlib import Path

from tests.helpers import scan_text

CASE = Path(__file__).resolve().parent.parent / "golden" / "cases" / "secondary_sort" / "departure_board"


def _job(tmp_path, edit=lambda s: s):
    files = {p.name: p.read_text(encoding="utf-8") for p in CASE.glob("*.java")}
    files["DepartureBoard.java"] = edit(files["DepartureBoard.java"])
    scan = scan_text(tmp_path, files)
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job


def test_writes_inside_the_loop_follow_the_sort_comparator(tmp_path):
    from migrate.plan import dump_expr

    job = _job(tmp_path)
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    # station ascending (Text: byte order), start time descending (String.compareTo: UTF-16 order)
    assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [
        ("key.station", True), ("utf16_order(key.startedAt)", False)]
    assert dump_expr(job.plan.sink.partition) == "partition_of(text_hash(key.station), 2)"
    assert "secondary sort" in job.plan.shapes


def test_a_fold_over_a_group_of_several_keys_is_declined(tmp_path):
    job = _job(tmp_path, lambda s: s.replace(
        """            for (Text ride : rides) {
                // the key moves with the values: here it is this ride's own station and time
                context.write(new Text(key.getStation() + " " + key.getStartedAt()), ride);
            }""", """            int n = 0;
            for (Text ride : rides) {
                n++;
            }
            context.write(new Text(key.getStation()), new Text("" + n));"""))
    items = [h for h in job.plan.hand_work if h.category == "secondary-sort"]
    assert items and "spans several keys" in items[0].reason and items[0].blocking


def test_grouping_on_a_field_that_does_not_lead_the_sort_is_declined(tmp_path):
    job = _job(tmp_path, lambda s: s.replace(
        "return ((StationClock) a).getStation().compareTo(((StationClock) b).getStation());",
        "return ((StationClock) a).getStartedAt().compareTo(((StationClock) b).getStartedAt());"))
    items = [h for h in job.plan.hand_work if h.category == "secondary-sort"]
    assert items and "would not be contiguous" in items[0].reason


def test_a_raw_byte_comparator_is_declined(tmp_path):
    job = _job(tmp_path, lambda s: s.replace(
        "public int compare(WritableComparable a, WritableComparable b) {\n            StationClock x",
        "public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) {\n            return 0;\n        }\n"
        "        public int unused(WritableComparable a, WritableComparable b) {\n            StationClock x"))
    items = [h for h in job.plan.hand_work if h.category == "secondary-sort"]
    assert items and "is not `return compareBytes(b1, s1, n, b2, s2, n);`" in items[0].reason


def test_a_comparator_over_serialised_bytes_is_read_by_its_raw_form(tmp_path):
    """Hadoop's shuffle calls RawComparator.compare(byte[], ...), not compare(a, b) (WritableComparator
    javadoc: the raw form is the optimised one). Here the raw form compares the whole key, so one
    reduce() call gets one key, whatever the object form says."""
    from tests.unit.test_reduce_forms import LATEST_THEN_REST, _board

    files = _board(LATEST_THEN_REST, lambda s: s.replace(
        "        public SameStation() {",
        "        @Override\n"
        "        public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) {\n"
        "            return compareBytes(b1, s1, l1, b2, s2, l2);\n"
        "        }\n\n"
        "        public SameStation() {"))
    (job,) = scan_text(tmp_path, files).jobs
    (item,) = [h for h in job.plan.hand_work if h.category == "value-order"]
    assert "the values of one call share one key" in item.reason
