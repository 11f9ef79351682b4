"""In-mapper combining kept through helper objects of the repository (migrate/lower/counter_books.py):
a book mapping each word to a record made with it, whose count add() steps, is a Map counted with
merge (Map.merge javadoc; HashMap's values() and entrySet() iterate one table, java.util.HashMap).
Checked against Hadoop's local runner over two input files (two map tasks, two books that the
reducer sums)."""
from __future__ import annotations

import pytest

from tests.helpers import HEADER, SUM_WORDS_MAIN, scan_text, verify_one_job

JOB = HEADER + """
public class Main {
  static class Tally {
    final String word;
    int seen = 0;
    Tally(String word) { this.word = word; }
  }

  static class TallyBook {
    private final Map<String, Tally> byWord;
    TallyBook() { byWord = new HashMap<String, Tally>(); }
    void add(String w, int n) {
      Tally t = byWord.get(w);
      if (t == null) {
        t = new Tally(w);
        byWord.put(w, t);
      }
      %(step)s
    }
    Collection<Tally> all() { return byWord.values(); }
    int size() { return byWord.size(); }
  }

  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    private TallyBook book;
    protected void setup(Context context) { book = new TallyBook(); }
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      for (String w : value.toString().split(" ")) {
        int n = w.length();
        book.add(w, n);%(more)s
      }
    }
    protected void cleanup(Context context) throws IOException, InterruptedException {
      Text word = new Text();
      IntWritable count = new IntWritable();
      for (Tally t : book.all()) {
        word.set(t.word);
        count.set(t.seen);
        context.write(word, count);
      }
    }
  }
""" + SUM_WORDS_MAIN + """}
"""
WORDS = {"a.txt": b"pump chain pump\nbell  chain\n", "b.txt": b"pump\nsaddle bell pump\n"}


def _job(step: str = "t.seen++;", more: str = "") -> str:
    return JOB % {"step": step, "more": more}


@pytest.mark.parametrize("step", ["t.seen++;", "t.seen += n;"], ids=["counted", "summed"])
def test_a_helper_book_of_counters_is_in_mapper_combining(tmp_path, step):
    (job,) = scan_text(tmp_path / "scan", {"Main.java": _job(step)}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert any("counts per key: a Map counted with merge" in n for n in job.plan.notes)
    check = verify_one_job(tmp_path / "verify", _job(step), WORDS)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


@pytest.mark.parametrize("change", [
    {"more": "\n        if (book.size() > 100) { return; }"},  # the book read another way
    {"step": "t.seen++;\n      byWord.remove(\"pump\");"},  # add() does more
    {"step": "t.seen = n;"},  # not a count
])
def test_other_books_are_left_as_written(tmp_path, change):
    (job,) = scan_text(tmp_path, {"Main.java": _job(**change)}).jobs
    assert job.status != "converted"
    assert not any("counts per key" in n for n in job.plan.notes)


def test_a_record_with_other_state_is_left_as_written(tmp_path):
    src = _job().replace("int seen = 0;", "int seen = 0;\n    long firstSeenAt = System.nanoTime();")
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    assert job.status != "converted"
    assert not any("counts per key" in n for n in job.plan.notes)
