"""Input formats: KeyValueTextInputFormat's separator setting and NLineInputFormat.

Hadoop facts (KeyValueLineRecordReader source and KeyValueTextInputFormat javadoc): the line is
split at the first occurrence of the separator, default TAB, set by
`mapreduce.input.keyvaluelinerecordreader.key.value.separator` (old API:
`key.value.separator.in.input.line`); only the separator's first character is used; a line
without it is all key and an empty value. NLineInputFormat (javadoc) gives each map task N
lines, with TextInputFormat's records.
"""
from __future__ import annotations

from tests.helpers import job_source, scan_text

KV = "job.setInputFormatClass(org.apache.hadoop.mapreduce.lib.input.KeyValueTextInputFormat.class);"


def _job(tmp_path, extra_driver, conf_line=""):
    src = job_source("context.write(new Text(key.toString()), new IntWritable(1));", reducer_class=None,
                     extra_driver=extra_driver)
    src = src.replace("protected void map(LongWritable key, Text value", "protected void map(Text key, Text value")
    src = src.replace("extends Mapper<LongWritable, Text,", "extends Mapper<Text, Text,")
    src = src.replace('Job job = Job.getInstance(new Configuration(), "test job");',
                      f'Configuration conf = new Configuration(); {conf_line}\n    Job job = Job.getInstance(conf, "test job");')
    scan = scan_text(tmp_path, {"Main.java": src})
    (job,) = scan.jobs
    return job


def test_default_separator_is_tab(tmp_path):
    job = _job(tmp_path, KV)
    assert job.plan.source.fmt == "keyvalue" and job.plan.source.kv_separator == "\t"


def test_separator_setting_uses_its_first_character(tmp_path):
    job = _job(tmp_path, KV, 'conf.set("mapreduce.input.keyvaluelinerecordreader.key.value.separator", ";;");')
    assert job.plan.source.kv_separator == ";"
    assert any("only its first character" in n for n in job.plan.notes)


def test_old_api_separator_setting_is_read(tmp_path):
    job = _job(tmp_path, KV, 'conf.set("key.value.separator.in.input.line", ",");')
    assert job.plan.source.kv_separator == ","


def test_non_ascii_separator_is_hand_work(tmp_path):
    job = _job(tmp_path, KV, 'conf.set("mapreduce.input.keyvaluelinerecordreader.key.value.separator", "§");')
    assert [h.category for h in job.plan.hand_work] == ["input-format"]


def test_nline_input_format_reads_lines_as_text(tmp_path):
    src = job_source("context.write(value, new IntWritable(1));", reducer_class=None, extra_driver=(
        "job.setInputFormatClass(org.apache.hadoop.mapreduce.lib.input.NLineInputFormat.class);"))
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    assert job.plan.source.fmt == "text" and job.status == "converted"  # a reducer sorts: no layout item
    assert any("NLineInputFormat" in n for n in job.plan.notes)


def test_map_only_nline_input_format_reports_the_file_order(tmp_path):
    # Hadoop's JobSplitWriter sorts splits by size, largest first (from memory; the parity run of
    # RideIdsInBatches shows the order differing from the input's)
    src = job_source("context.write(value, new IntWritable(1));", reducer_class=None, extra_driver=(
        "job.setInputFormatClass(org.apache.hadoop.mapreduce.lib.input.NLineInputFormat.class);"
        " job.setNumReduceTasks(0);"))
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    (item,) = job.plan.hand_work
    assert item.category == "output-layout" and not item.blocking and "largest first" in item.reason


def _sink(tmp_path, extra_driver, conf_line=""):
    src = job_source("context.write(value, new IntWritable(1));", reducer_class=None, extra_driver=extra_driver)
    src = src.replace('Job job = Job.getInstance(new Configuration(), "test job");',
                      f'Configuration conf = new Configuration(); {conf_line}\n    Job job = Job.getInstance(conf, "test job");')
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    return job


def test_gzip_output_compression_is_kept(tmp_path):
    # FileOutputFormat.setCompressOutput/setOutputCompressorClass (Hadoop javadoc)
    job = _sink(tmp_path, "FileOutputFormat.setCompressOutput(job, true); "
                          "FileOutputFormat.setOutputCompressorClass(job, org.apache.hadoop.io.compress.GzipCodec.class);")
    assert job.plan.sink.compression == "gzip" and job.status == "converted"


def test_old_compress_setting_uses_the_default_codec(tmp_path):
    # without a codec class Hadoop uses DefaultCodec (.deflate files), which is Spark's "deflate"
    job = _sink(tmp_path, "", 'conf.setBoolean("mapred.output.compress", true);')
    assert job.plan.sink.compression == "deflate"


def test_a_codec_without_a_spark_twin_is_reported(tmp_path):
    job = _sink(tmp_path, "FileOutputFormat.setCompressOutput(job, true); "
                          "FileOutputFormat.setOutputCompressorClass(job, org.apache.hadoop.io.compress.SnappyCodec.class);")
    assert job.plan.sink.compression is None
    assert [h.category for h in job.plan.hand_work] == ["input-output-options"]
