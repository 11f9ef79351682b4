"""The review without a browser: hostile Java text stays text, and the pages' numbers are report.json's."""
from __future__ import annotations

import json

from migrate.convert import write_outputs
from migrate.scan import scan_repo

HOSTILE = """package p;
import java.io.IOException;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** </div><script>alert("doc")</script> & <b>bold</b> */
public class Hostile {
    public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
        protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
            // <img src=x onerror=alert(1)> "quoted" 'single'
            String s = v.toString() + "</script><script>alert('string')</script>";
            c.write(new Text(s), new IntWritable(1));
        }
    }
    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "hostile <job> & co");
        job.setMapperClass(M.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        job.waitForCompletion(true);
    }
}
"""


def test_hostile_java_text_is_shown_as_text(tmp_path):
    (tmp_path / "repo" / "p").mkdir(parents=True)
    (tmp_path / "repo" / "p" / "Hostile.java").write_text(HOSTILE)
    write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo <&>")
    index = (tmp_path / "out" / "review.html").read_text()
    page = (tmp_path / "out" / "review" / "hostile.html").read_text()
    assert index.count("<script") == 2  # the index's own: the numbers (JSON) and the behaviour
    assert page.count("<script") == 1  # the job page's own behaviour
    for text in (index, page):
        assert "<img" not in text and "<b>bold" not in text and "</div><script>" not in text
        assert "hostile &lt;job&gt; &amp; co" in text and "mrlift review: repo &lt;&amp;&gt;" in text
        assert "http://" not in text.replace('xmlns="http://www.w3.org/2000/svg"', "") and "https://" not in text
    assert "&lt;/div&gt;&lt;script&gt;alert" in page and "&lt;img src=x onerror=alert(1)&gt;" in page


def test_page_numbers_and_charts_match_the_report(converted_samples):
    out_dir, _ = converted_samples
    report = json.loads((out_dir / "report.json").read_text())
    page = (out_dir / "review.html").read_text()
    s = report["summary"]
    assert f"{s['jobs']} jobs: {s['converted']} converted, {s['partial']} partial" in page
    assert f"<b>{report['effort']['hours']:.1f} h</b>" in page
    assert page.count("<tr data-status=") == len(report["jobs"])  # every job is a row of the index
    from migrate.report.review import EFFORT_BARS, page_name

    top = sorted(report["jobs"], key=lambda j: -round(j["effort_hours"], 1))[:EFFORT_BARS]
    for j in top:  # the jobs of most effort are charted, labelled with the report's hours
        assert f">{round(j['effort_hours'], 1):g} h</text>" in page
    for k, j in enumerate(report["jobs"]):  # each row links to the job's own page, which shows its hours
        assert f'href="{page_name(j, k)}"' in page
        own = (out_dir / page_name(j, k)).read_text()
        assert f"effort {j['effort_hours']:.1f} h" in own and page.count("<section class=\"job\"") == 0
    csv_lines = (out_dir / "effort.csv").read_text().splitlines()
    assert len(csv_lines) == 1 + len(report["jobs"]) + sum(len(j["hand_work"]) for j in report["jobs"]) + 1


def test_line_numbers_hold_when_a_java_file_starts_with_blank_lines(tmp_path):
    import re

    (tmp_path / "repo" / "p").mkdir(parents=True)
    text = "\n\n\n" + HOSTILE  # pygments strips leading newlines unless told not to
    (tmp_path / "repo" / "p" / "Hostile.java").write_text(text)
    write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    page = (tmp_path / "out" / "review" / "hostile.html").read_text()
    java_line = next(i for i, l in enumerate(text.split("\n"), 1) if "public class Hostile" in l)
    row = re.search(rf'<div id="j0-f0-{java_line}"[^>]*><span class="no">{java_line}</span>(.*?)</div>', page)
    assert row and "Hostile" in row.group(1)
    # a script line that names a Java line links to the row that shows that line
    for target in set(re.findall(r'data-java="(j0-f0-\d+)', page)):
        n = int(target.rsplit("-", 1)[1])
        shown = re.search(rf'<div id="{target}"[^>]*><span class="no">{n}</span>(.*?)</div>', page).group(1)
        plain = re.sub(r"<[^>]+>", "", shown).replace("&lt;", "<").replace("&gt;", ">").replace("&amp;", "&")
        plain = plain.replace("&quot;", '"').replace("&#x27;", "'")
        assert plain.strip() == text.split("\n")[n - 1].strip()
