"""A control break in a secondary sort's reducer (lift.control_break): a station's rides come to one
reduce() call day by day, and the loop starts its sums over at each new day, flushing the day
before into a list it writes once. Converted where it is one fold per key (each run is one key of
the group) and checked against Hadoop's local runner; each way it can stop being that is declined
with its reason. The form comes from a public job in benchmarks/realworld (a reducer folding each
year of a station's readings)."""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.helpers import scan_text, verify_one_job

CASE = Path(__file__).parents[1] / "golden" / "cases" / "secondary_sort" / "control_break"
DIGEST = (CASE / "StationDayDigest.java").read_text(encoding="utf-8")
MORE = {name: (CASE / name).read_text(encoding="utf-8") for name in ("StationDay.java", "DayRide.java")}
DRIVER = "StationDayDigest"

# the mapper reads the day as a plain number, so the data can hold negative days and day 0 anywhere
PLAIN_DAYS = """            String[] f = value.toString().split(",");
            int day = Integer.parseInt(f[1]);
            context.write(new StationDay(f[0], day), new DayRide(day, Integer.parseInt(f[2])));"""
DATA = {"a.csv": b"quay,3,10\nquay,-5,7\nmill,0,4\nquay,0,9\nquay,3,20\nbell,0,1\n",
        "b.csv": b"mill,2,6\nquay,-5,1\nmill,0,8\nferry,7,5\nquay,12,3\nbell,0,2\nmill,2,5\n"}


PARTITIONERS = "    public static class SameStation"
BY_STATION = """    public static class ByStation extends Partitioner<StationDay, DayRide> {
        @Override
        public int getPartition(StationDay key, DayRide value, int n) {
            return (key.getStation().hashCode() & Integer.MAX_VALUE) % n;
        }
    }

"""
BY_DAY = BY_STATION.replace("ByStation", "ByDay").replace("key.getStation().hashCode()", "key.getDay()")


def _partitioners(source: str, *classes: str) -> str:
    source = source.replace("import org.apache.hadoop.mapreduce.Reducer;",
                            "import org.apache.hadoop.mapreduce.Partitioner;\nimport org.apache.hadoop.mapreduce.Reducer;")
    return source.replace(PARTITIONERS, "".join(classes) + PARTITIONERS, 1)


def _plain(source: str) -> str:
    start = source.index("            String[] f = value.toString().split(\",\");")
    end = source.index("        }\n    }\n\n    public static class SameStation")
    return source[:start] + PLAIN_DAYS + "\n" + source[end:]


@pytest.mark.parametrize("old, new", [
    ("", ""),  # as written: day 0 is the marker's first value, never listed
    ("if (day != 0) {", "if (day > 0) {"),  # negative days are not listed either (the test fails for 0 too)
    ("ride.getDay() != day", "key.getDay() != day"),  # the key moves with the values: the same day
    ("job.setReducerClass(DigestReducer.class);",  # two reduce tasks, a station's days all in one
     "job.setReducerClass(DigestReducer.class);\n        job.setNumReduceTasks(2);"
     "\n        job.setPartitionerClass(ByStation.class);"),
])
def test_control_break_matches_hadoop(tmp_path, old, new):
    """Hadoop's local runner and the script over days that come first, in the middle and alone."""
    source = _partitioners(_plain(DIGEST), BY_STATION).replace(old, new)
    if old == "ride.getDay() != day":
        source = source.replace("day = ride.getDay();", "day = key.getDay();")
    check = verify_one_job(tmp_path, source, DATA, driver=DRIVER, more=MORE)
    assert check.verdict == "agrees", check.detail


def test_days_sorted_down_are_listed_down(tmp_path):
    """A sort comparator putting a station's latest day first: the runs come, and are listed, latest first."""
    latest_first = """    public static class LatestDayFirst extends WritableComparator {
        public LatestDayFirst() {
            super(StationDay.class, true);
        }

        @Override
        public int compare(WritableComparable a, WritableComparable b) {
            StationDay x = (StationDay) a;
            StationDay y = (StationDay) b;
            int c = x.getStation().compareTo(y.getStation());
            return c != 0 ? c : Integer.compare(y.getDay(), x.getDay());
        }
    }

    public static class SameStation"""
    source = _plain(DIGEST).replace("    public static class SameStation", latest_first, 1).replace(
        "job.setGroupingComparatorClass(SameStation.class);",
        "job.setSortComparatorClass(LatestDayFirst.class);\n        job.setGroupingComparatorClass(SameStation.class);")
    check = verify_one_job(tmp_path, source, DATA, driver=DRIVER, more=MORE)
    assert check.verdict == "agrees", check.detail


def _reasons(tmp_path, source: str) -> list[str]:
    (job,) = scan_text(tmp_path, {f"{DRIVER}.java": source, **MORE}).jobs
    assert job.status != "converted"
    return [h.reason for h in job.plan.hand_work]


@pytest.mark.parametrize("old, new, why", [
    ("                    count = 0;\n", "", "`count` is not started over"),
    ("                    seconds = 0;\n", "                    seconds = 1;\n", "not started over with the value"),
    ("            if (day != 0) {\n                long mean", "            if (day != 0) {\n                long mean = 0;"
     "\n                days.add(\"last\");\n                long mean2", "not the same as the one inside it"),
    ("if (day != 0) {", "if (day >= 0) {", "does not fail for the marker's first value"),
    ('days.add(day + ":" + count', 'days.add(ride.getSeconds() + ":" + count', "reads the loop's value"),
    ("int day = 0;", "Integer day = 0;", "not an int or long"),
    ("context.write(new Text(key.getStation())", "context.write(new Text(key.getStation() + \"/\" + key.getDay())",
     "reads the key beyond the fields a group shares"),
    ("new DayRide(day, Integer", "new DayRide(day + 1, Integer", "is not shown to be the key's day"),
    ("job.setReducerClass(DigestReducer.class);",  # Hadoop's HashPartitioner: StationDay.hashCode() reads the day
     "job.setReducerClass(DigestReducer.class);\n        job.setNumReduceTasks(2);",
     "the partitioner reads more of the key"),
    ("job.setReducerClass(DigestReducer.class);",
     "job.setReducerClass(DigestReducer.class);\n        job.setNumReduceTasks(2);"
     "\n        job.setPartitionerClass(ByDay.class);", "the partitioner reads more of the key"),
    ("job.setReducerClass(DigestReducer.class);",
     "job.setReducerClass(DigestReducer.class);\n        job.setCombinerClass(DigestReducer.class);",
     "a combiner"),
])
def test_what_is_not_one_fold_per_key_is_declined_with_its_reason(tmp_path, old, new, why):
    source = _partitioners(_plain(DIGEST) if "DayRide(day" not in old else DIGEST, BY_DAY)
    assert old in source
    reasons = _reasons(tmp_path, source.replace(old, new))
    assert any(why in r for r in reasons), reasons


def test_a_marker_read_while_folding_is_declined(tmp_path):
    source = _plain(DIGEST).replace("                count++;\n", "                count += day > 20 ? 2 : 1;\n")
    assert any("reads `day`" in r for r in _reasons(tmp_path, source))
