"""The survey parses what Hadoop code can reach and nothing else; its shards hold what each job needs.

Java's name lookup (same package, single-type import, on-demand import, fully qualified name) is
from the Java Language Specification, chapter 6.4 and 7.5; the rest is this project's rule.
"""
from __future__ import annotations

from pathlib import Path

from migrate.survey import plan_survey, survey_file
from tests.helpers import job_source

MAPPER_BASE = """package lib;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.Mapper;
public class BaseMapper extends Mapper<LongWritable, Text, Text, IntWritable> {}
"""


def _survey(root: Path, files: dict[str, str]):
    for name, text in files.items():
        (root / name).parent.mkdir(parents=True, exist_ok=True)
        (root / name).write_text(text, encoding="utf-8")
    paths = sorted(root.rglob("*.java"))
    return plan_survey([survey_file(p, root, 1 << 20) for p in paths])


def test_only_hadoop_code_and_what_it_reaches_is_parsed(tmp_path):
    s = _survey(tmp_path, {
        "app/Job.java": "package app;\nimport org.apache.hadoop.mapreduce.Job;\nimport util.Clean;\n"
                        "class Job1 { String f(String s) { return Clean.it(s) + Same.X; } }",
        "util/Clean.java": "package util;\npublic class Clean { static String it(String s) { return Deep.d(s); } }",
        "util/Deep.java": "package util;\nclass Deep { static String d(String s) { return s; } }",
        "app/Same.java": "package app;\nclass Same { static final String X = \"x\"; }",  # same package: no import
        "other/Same.java": "package other;\nclass Same {}",  # the same simple name elsewhere: not reached
        "web/Page.java": "package web;\n// uses the class Clean in a comment only\nclass Page {}",
        "web/Fq.java": "package web;\nclass Fq { Object o = new util.Clean(); }",  # reaches Clean; nothing reaches it
    })
    assert s.parse == ["app/Job.java", "app/Same.java", "util/Clean.java", "util/Deep.java"]


def test_a_subclass_without_hadoop_in_it_is_parsed_and_shares_its_parent_s_shard(tmp_path):
    s = _survey(tmp_path, {
        "lib/BaseMapper.java": MAPPER_BASE,
        "app/Words.java": "package app;\nimport lib.BaseMapper;\npublic class Words extends BaseMapper {}",
        "app/Plain.java": "package app;\npublic class Plain {}",
    })
    assert s.parse == ["app/Words.java", "lib/BaseMapper.java"]
    # the subclass is reached from its parent too (a rule may ask whether a class is subclassed)
    assert ["app/Words.java", "lib/BaseMapper.java"] in s.shards


def test_words_in_comments_and_strings_declare_nothing(tmp_path):
    s = _survey(tmp_path, {
        "a/Job.java": "package a;\nimport org.apache.hadoop.io.Text;\nclass Job { Object o = that; }",
        "a/Doc.java": "package a;\n/** This class that reads */\nclass Doc { String s = \"class that\"; }",
    })
    f = next(f for f in s.facts if f.path == "a/Doc.java")
    assert f.declared == ("Doc",) and s.parse == ["a/Job.java"]


def test_each_driver_is_a_shard_with_its_classes_and_a_second_definition_is_not_parsed(tmp_path):
    s = _survey(tmp_path, {
        "one/Main.java": "package one;\n" + job_source("context.write(value, new IntWritable(1));",
                                                       reducer_class=None).replace("public class Main", "public class Main"),
        "two/Main.java": "package two;\nimport org.apache.hadoop.io.Text;\nclass Main {}",
        "copy/one/Main.java": "package one;\nimport org.apache.hadoop.io.Text;\nclass Main {}",
    })
    assert s.duplicates == {"one/Main.java": "copy/one/Main.java"}  # path order: copy/ comes first
    assert "one/Main.java" not in s.parse
    assert s.shards == [["copy/one/Main.java"], ["two/Main.java"]]
