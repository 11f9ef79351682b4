"""A generator of legacy repositories of any size, for the scale benchmark and the determinism check.

Not copies of the samples: each job is drawn from several shapes (token counts, sums, maxima and
averages by a field, filters, distinct keys, a reducer that keeps state across keys), written in one
of several authors' habits (both Hadoop APIs, Tool or plain main, nested or one class per file,
brace and indent styles, reused or fresh Writables, StringTokenizer or split), with utility classes
the mappers call and, in between, plain Java that has nothing to do with Hadoop (records, services,
enums, interfaces), as in a monorepo. Everything is drawn from a seeded random generator, so one
seed gives one repository, byte for byte. The scenario (a freight company, Quillmere Freight) and
every name in it are invented.
"""
from __future__ import annotations

import random
from dataclasses import dataclass
from pathlib import Path

TEAMS = ["dispatch", "billing", "yard", "fleet", "customs", "claims", "routing", "dock", "tariff", "crew"]
NOUNS = ["Parcel", "Pallet", "Route", "Depot", "Manifest", "Carrier", "Invoice", "Trailer", "Crate", "Shift",
         "Berth", "Permit", "Waybill", "Lane", "Tariff", "Driver", "Consignee", "Stop", "Seal", "Gate"]
VERBS = ["Count", "Tally", "Sum", "Peak", "Mean", "Filter", "Distinct", "Roll", "Audit", "Digest"]
DELIMS = [(",", '","'), ("\t", '"\\t"'), ("|", '"\\\\|"'), (";", '";"')]


@dataclass
class Style:
    """One author's habits."""

    old_api: bool
    tool: bool
    nested: bool
    allman: bool
    indent: str
    reuse: bool
    tokenizer: bool
    javadoc: bool
    counters: bool  # counts malformed records in a counter


def _style(rng: random.Random) -> Style:
    return Style(old_api=rng.random() < 0.35, tool=rng.random() < 0.5, nested=rng.random() < 0.6,
                 allman=rng.random() < 0.2, indent=rng.choice(["    ", "  ", "\t"]), reuse=rng.random() < 0.6,
                 tokenizer=rng.random() < 0.5, javadoc=rng.random() < 0.4, counters=rng.random() < 0.4)


LICENSE = """/*
 * Copyright (c) Quillmere Freight. All rights reserved.
 *
 * This file is part of the Quillmere Freight data platform and is provided for
 * internal use only. It may not be copied, modified or distributed except as
 * allowed by the platform team's contribution guide.
 *
 * Owner: the {team} team. Questions go to the team's channel, not to the
 * platform on-call. Changes need one review from the owning team.
 */
"""


class _Out:
    """Java text with the author's indent and brace habit (and the company's header on top)."""

    def __init__(self, st: Style, team: str = "platform"):
        self.st, self.lines, self.depth = st, LICENSE.format(team=team).splitlines(), 0

    def line(self, text: str = "") -> None:
        self.lines.append((self.st.indent * self.depth + text) if text else "")

    def open(self, head: str) -> None:
        if self.st.allman:
            self.line(head)
            self.line("{")
        else:
            self.line(head + " {")
        self.depth += 1

    def close(self, tail: str = "") -> None:
        self.depth -= 1
        self.line("}" + tail)

    def doc(self, text: str) -> None:
        if self.st.javadoc:
            self.line("/**")
            self.line(f" * {text}")
            self.line(" */")

    def text(self) -> str:
        return "\n".join(self.lines) + "\n"


# --- the jobs -----------------------------------------------------------------------------------

SHAPES = ["tokens", "sum", "max", "mean", "filter", "distinct", "stateful"]


def _imports(st: Style, shape: str) -> list[str]:
    io = ["org.apache.hadoop.io.IntWritable", "org.apache.hadoop.io.LongWritable", "org.apache.hadoop.io.Text",
          "org.apache.hadoop.io.DoubleWritable", "org.apache.hadoop.io.NullWritable", "org.apache.hadoop.fs.Path",
          "org.apache.hadoop.conf.Configuration", "java.io.IOException"]
    if st.old_api:
        io += ["org.apache.hadoop.mapred.*", "java.util.Iterator"]
    else:
        io += ["org.apache.hadoop.mapreduce.Job", "org.apache.hadoop.mapreduce.Mapper",
               "org.apache.hadoop.mapreduce.Reducer", "org.apache.hadoop.mapreduce.lib.input.FileInputFormat",
               "org.apache.hadoop.mapreduce.lib.output.FileOutputFormat"]
    if st.tool:
        io += ["org.apache.hadoop.conf.Configured", "org.apache.hadoop.util.Tool", "org.apache.hadoop.util.ToolRunner"]
    if st.tokenizer and shape == "tokens":
        io.append("java.util.StringTokenizer")
    if shape == "stateful":
        io.append("java.util.HashMap")
    return sorted(set(io))


@dataclass
class JobDraw:
    shape: str
    field: int
    key_field: int
    delim: str
    delim_lit: str
    threshold: int
    uses_util: str | None  # a utility class the mapper calls
    util_package: str = ""


def _value_type(shape: str) -> tuple[str, str]:
    return {"tokens": ("IntWritable", "int"), "sum": ("LongWritable", "long"), "max": ("IntWritable", "int"),
            "mean": ("DoubleWritable", "double"), "filter": ("Text", "String"), "distinct": ("NullWritable", ""),
            "stateful": ("IntWritable", "int")}[shape]


def _map_body(o: _Out, st: Style, d: JobDraw, vt: str, emit) -> None:
    line_expr = "value.toString()"
    if d.uses_util:
        line_expr = f"{d.uses_util}.clean(value.toString())"
    if d.shape == "tokens":
        if st.tokenizer:
            o.line(f"StringTokenizer itr = new StringTokenizer({line_expr});")
            o.open("while (itr.hasMoreTokens())")
            tok = "itr.nextToken()"
        else:
            o.open(f"for (String w : {line_expr}.split(\"\\\\s+\"))")
            o.open("if (w.isEmpty())")
            o.line("continue;")
            o.close()
            tok = "w"
        if st.reuse:
            o.line(f"word.set({tok});")
            emit("word", "ONE")
        else:
            emit(f"new Text({tok})", "new IntWritable(1)")
        o.close()
        return
    o.line(f"String[] parts = {line_expr}.split({d.delim_lit});")
    need = max(d.field, d.key_field) + 1
    o.open(f"if (parts.length < {need})")
    if st.counters and not st.old_api:
        o.line('context.getCounter("quality", "short records").increment(1);')
    elif st.counters:
        o.line('reporter.incrCounter("quality", "short records", 1);')
    o.line("return;")
    o.close()
    key = f"new Text(parts[{d.key_field}])"
    if d.shape == "sum":
        o.line(f"long amount = Long.parseLong(parts[{d.field}].trim());")
        emit(key, "new LongWritable(amount)")
    elif d.shape in ("max", "stateful"):
        o.line(f"int reading = Integer.parseInt(parts[{d.field}].trim());")
        emit(key, "new IntWritable(reading)")
    elif d.shape == "mean":
        o.line(f"double weight = Double.parseDouble(parts[{d.field}].trim());")
        emit(key, "new DoubleWritable(weight)")
    elif d.shape == "filter":
        o.line(f"int level = Integer.parseInt(parts[{d.field}].trim());")
        o.open(f"if (level >= {d.threshold})")
        emit(key, "value" if not st.old_api else "new Text(value.toString())")
        o.close()
    elif d.shape == "distinct":
        emit(key, "NullWritable.get()")


def _reduce_body(o: _Out, st: Style, d: JobDraw, vt: str, emit, values: str) -> None:
    prim = _value_type(d.shape)[1]
    get = {"int": ".get()", "long": ".get()", "double": ".get()"}.get(prim, "")
    if st.old_api:
        loop, item = "while (values.hasNext())", "values.next()"
    else:
        loop, item = f"for ({vt} v : values)", "v"
    if d.shape in ("tokens", "sum"):
        o.line(f"{prim} total = 0;")
        if st.old_api:
            o.open(loop)
            o.line(f"total += {item}{get};")
        else:
            o.open(loop)
            o.line(f"total += v{get};")
        o.close()
        emit("key", f"new {vt}(total)")
    elif d.shape == "max":
        o.line("int best = Integer.MIN_VALUE;")
        o.open(loop)
        o.line(f"best = Math.max(best, {item}{get});")
        o.close()
        emit("key", "new IntWritable(best)")
    elif d.shape == "mean":
        o.line("double sum = 0;")
        o.line("long n = 0;")
        o.open(loop)
        o.line(f"sum += {item}{get};")
        o.line("n++;")
        o.close()
        emit("key", "new DoubleWritable(sum / n)")
    elif d.shape == "stateful":
        o.line("int total = 0;")
        o.open(loop)
        o.line(f"total += {item}{get};")
        o.close()
        o.line("seen.put(key.toString(), total);")
        o.line("running += total;")
        emit("key", "new IntWritable(running)")


def _open_task_method(o: _Out, st: Style, old_head: str, new_head: str):
    """Open map() or reduce() in the author's API; returns how the method writes a pair."""
    if st.old_api:
        o.open(old_head + " throws IOException")
        return lambda k, v: o.line(f"output.collect({k}, {v});")
    o.line("@Override")
    o.open(new_head + " throws IOException, InterruptedException")
    return lambda k, v: o.line(f"context.write({k}, {v});")


def job_file(pkg: str, cls: str, d: JobDraw, st: Style) -> dict[str, str]:
    """The job's Java files: {relative path: text}."""
    vt, _ = _value_type(d.shape)
    map_only = d.shape == "filter"
    mo_key, mo_val = ("Text", "Text") if d.shape == "filter" else ("Text", vt)
    if d.shape == "tokens":
        mo_key = "Text"
    files: dict[str, str] = {}
    mapper, reducer = f"{cls}Mapper", f"{cls}Reducer"

    def header(o: _Out, imports: list[str]) -> None:
        if d.uses_util:
            imports = sorted(imports + [f"{d.util_package}.{d.uses_util}"])
        o.line(f"package {pkg};")
        o.line()
        for i in imports:
            o.line(f"import {i};")
        o.line()

    def write_mapper(o: _Out, nested: bool) -> None:
        mod = "public static class" if nested else "public class"
        o.doc(f"Reads one record per line and emits ({mo_key}, {mo_val}).")
        if st.old_api:
            o.open(f"{mod} {mapper} extends MapReduceBase implements Mapper<LongWritable, Text, {mo_key}, {mo_val}>")
        else:
            o.open(f"{mod} {mapper} extends Mapper<LongWritable, Text, {mo_key}, {mo_val}>")
        if d.shape == "tokens" and st.reuse:
            o.line("private static final IntWritable ONE = new IntWritable(1);")
            o.line("private final Text word = new Text();")
            o.line()
        emit = _open_task_method(o, st, f"public void map(LongWritable key, Text value, OutputCollector<{mo_key}, "
                                 f"{mo_val}> output, Reporter reporter)",
                                 "protected void map(LongWritable key, Text value, Context context)")
        _map_body(o, st, d, vt, emit)
        o.close()
        o.close()

    def write_reducer(o: _Out, nested: bool) -> None:
        mod = "public static class" if nested else "public class"
        o.doc("Folds the values of one key.")
        if st.old_api:
            o.open(f"{mod} {reducer} extends MapReduceBase implements Reducer<Text, {vt}, Text, {vt}>")
        else:
            o.open(f"{mod} {reducer} extends Reducer<Text, {vt}, Text, {vt}>")
        if d.shape == "stateful":
            o.line("private final HashMap<String, Integer> seen = new HashMap<>();")
            o.line("private int running = 0;")
            o.line()
        emit = _open_task_method(o, st, f"public void reduce(Text key, Iterator<{vt}> values, OutputCollector<Text, "
                                 f"{vt}> output, Reporter reporter)",
                                 f"protected void reduce(Text key, Iterable<{vt}> values, Context context)")
        if d.shape == "distinct":
            emit("key", "NullWritable.get()")
        else:
            _reduce_body(o, st, d, vt, emit, "values")
        o.close()
        o.close()

    def write_driver_body(o: _Out, args: str) -> None:
        red = None if map_only else reducer
        if st.old_api:
            o.line(f"JobConf conf = new JobConf({'getConf()' if st.tool else 'new Configuration()'}, {cls}.class);")
            o.line(f'conf.setJobName("{cls.lower()}");')
            o.line(f"conf.setMapperClass({mapper}.class);")
            if red:
                o.line(f"conf.setReducerClass({red}.class);")
            else:
                o.line("conf.setNumReduceTasks(0);")
            o.line(f"conf.setOutputKeyClass({mo_key}.class);")
            o.line(f"conf.setOutputValueClass({mo_val}.class);")
            o.line(f"FileInputFormat.setInputPaths(conf, new Path({args}[0]));")
            o.line(f"FileOutputFormat.setOutputPath(conf, new Path({args}[1]));")
            o.line("JobClient.runJob(conf);")
            if st.tool:
                o.line("return 0;")
        else:
            o.line(f"Job job = Job.getInstance({'getConf()' if st.tool else 'new Configuration()'}, "
                   f"\"{cls.lower()}\");")
            o.line(f"job.setJarByClass({cls}.class);")
            o.line(f"job.setMapperClass({mapper}.class);")
            if red:
                o.line(f"job.setReducerClass({red}.class);")
            else:
                o.line("job.setNumReduceTasks(0);")
            o.line(f"job.setOutputKeyClass({mo_key}.class);")
            o.line(f"job.setOutputValueClass({mo_val}.class);")
            o.line(f"FileInputFormat.addInputPath(job, new Path({args}[0]));")
            o.line(f"FileOutputFormat.setOutputPath(job, new Path({args}[1]));")
            if st.tool:
                o.line("return job.waitForCompletion(true) ? 0 : 1;")
            else:
                o.line("System.exit(job.waitForCompletion(true) ? 0 : 1);")

    o = _Out(st, pkg.split(".")[2])
    header(o, _imports(st, d.shape))
    o.doc(f"{cls}: a {d.shape} job of the {pkg.split('.')[2]} team.")
    ext = " extends Configured implements Tool" if st.tool else ""
    o.open(f"public class {cls}{ext}")
    if st.nested:
        write_mapper(o, True)
        o.line()
        if not map_only:
            write_reducer(o, True)
            o.line()
    if st.tool:
        o.line("@Override")
        o.open("public int run(String[] args) throws Exception")
        write_driver_body(o, "args")
        o.close()
        o.line()
        o.open("public static void main(String[] args) throws Exception")
        o.line(f"System.exit(ToolRunner.run(new {cls}(), args));")
        o.close()
    else:
        o.open("public static void main(String[] args) throws Exception")
        write_driver_body(o, "args")
        o.close()
    o.close()
    base = pkg.replace(".", "/")
    files[f"{base}/{cls}.java"] = o.text()
    if not st.nested:
        for writer, name in ((write_mapper, mapper), (write_reducer, reducer)):
            if name == reducer and map_only:
                continue
            o = _Out(st, pkg.split(".")[2])
            header(o, _imports(st, d.shape))
            writer(o, False)
            files[f"{base}/{name}.java"] = o.text()
    return files


# --- the code around the jobs --------------------------------------------------------------------

def util_file(pkg: str, name: str, st: Style) -> str:
    o = _Out(st, pkg.split(".")[2])
    o.line(f"package {pkg};")
    o.line()
    o.doc("Text helpers shared by the team's jobs.")
    o.open(f"public final class {name}")
    o.open(f"private {name}()")
    o.close()
    o.line()
    o.open("public static String clean(String raw)")
    o.open("if (raw == null)")
    o.line('return "";')
    o.close()
    o.line("return raw.trim().toLowerCase();")
    o.close()
    o.close()
    return o.text()


def plain_file(pkg: str, name: str, rng: random.Random, st: Style) -> str:
    """Java with no Hadoop in it: a record with accessors, a service with loops, an enum or an interface."""
    o = _Out(st, pkg.split(".")[2])
    o.line(f"package {pkg};")
    o.line()
    kind = rng.choice(["record", "record", "service", "service", "enum", "interface"])
    if kind == "service":
        o.line("import java.util.ArrayList;")
        o.line("import java.util.List;")
        o.line("import java.util.Map;")
        o.line("import java.util.TreeMap;")
        o.line()
    fields = rng.sample(["id", "weight", "origin", "destination", "status", "carrier", "createdAt", "priority",
                         "volume", "notes", "zone", "sealNumber", "gate", "shift", "depot"], rng.randint(3, 8))
    types = {f: rng.choice(["String", "int", "long", "double"]) for f in fields}
    o.doc(f"{name} of the Quillmere Freight {kind} layer.")
    if kind == "enum":
        o.open(f"public enum {name}")
        vals = rng.sample(["OPEN", "HELD", "SHIPPED", "RETURNED", "LOST", "CLOSED", "PENDING", "CLEARED"], 5)
        o.line(", ".join(f"{v}(\"{v.lower()}\")" for v in vals) + ";")
        o.line()
        o.line("private final String label;")
        o.line()
        o.open(f"{name}(String label)")
        o.line("this.label = label;")
        o.close()
        o.line()
        o.open("public String label()")
        o.line("return label;")
        o.close()
        o.close()
        return o.text()
    if kind == "interface":
        o.open(f"public interface {name}")
        for f in fields:
            o.line(f"{types[f]} {f}();")
            o.line()
        o.close()
        return o.text()
    o.open(f"public class {name}")
    if kind == "record":
        for f in fields:
            o.line(f"private {types[f]} {f};")
        o.line()
        for f in fields:
            cap = f[0].upper() + f[1:]
            o.open(f"public {types[f]} get{cap}()")
            o.line(f"return {f};")
            o.close()
            o.line()
            o.open(f"public void set{cap}({types[f]} {f})")
            o.line(f"this.{f} = {f};")
            o.close()
            o.line()
        o.line("@Override")
        o.open("public String toString()")
        o.line(f'return "{name}[" + ' + ' + "," + '.join(fields) + ' + "]";')
        o.close()
    else:
        o.line("private final Map<String, List<String>> byZone = new TreeMap<>();")
        o.line()
        for m in range(rng.randint(3, 14)):
            o.open(f"public int process{m}(List<String> rows)")
            o.line("int accepted = 0;")
            o.open("for (String row : rows)")
            o.open("if (row == null || row.isEmpty())")
            o.line("continue;")
            o.close()
            o.line(f"String zone = row.length() > {m + 2} ? row.substring(0, {m + 2}) : row;")
            o.line("byZone.computeIfAbsent(zone, z -> new ArrayList<>()).add(row);")
            o.line("accepted++;")
            o.close()
            o.line("return accepted;")
            o.close()
            o.line()
    o.close()
    return o.text()


def generate(root: Path, lines: int, seed: int = 7, hadoop_share: float = 0.2) -> dict:
    """Write a repository of about `lines` lines under root; about `hadoop_share` of them in jobs and
    the utilities they call. Returns counts: files, lines, jobs."""
    rng = random.Random(seed)
    total = {"files": 0, "lines": 0, "jobs": 0, "hadoop_lines": 0}
    utils: dict[str, str] = {}  # package -> utility class

    def put(rel: str, text: str, hadoop: bool) -> None:
        p = root / rel
        p.parent.mkdir(parents=True, exist_ok=True)
        p.write_text(text, encoding="utf-8")
        n = text.count("\n")
        total["files"] += 1
        total["lines"] += n
        if hadoop:
            total["hadoop_lines"] += n

    k = 0
    while total["lines"] < lines:
        k += 1
        team = rng.choice(TEAMS)
        pkg = f"org.quillmere.{team}.m{k // 40}"
        st = _style(rng)
        if total["hadoop_lines"] < hadoop_share * max(total["lines"], 1):
            noun, verb = rng.choice(NOUNS), rng.choice(VERBS)
            cls = f"{noun}{verb}{k}"
            delim, lit = rng.choice(DELIMS)
            util = None
            if rng.random() < 0.3:
                util = utils.get(pkg)
                if util is None:
                    util = utils[pkg] = f"{team.capitalize()}Text{k}"
                    put(f"{pkg.replace('.', '/')}/{util}.java", util_file(pkg, util, st), True)
            d = JobDraw(rng.choice(SHAPES), rng.randint(1, 4), 0, delim, lit, rng.randint(2, 9), util, pkg)
            for rel, text in job_file(pkg + ".jobs", cls, d, st).items():
                put(rel, text, True)
            total["jobs"] += 1
        else:
            name = f"{rng.choice(NOUNS)}{rng.choice(['Record', 'Service', 'Kind', 'View', 'Store'])}{k}"
            put(f"{pkg.replace('.', '/')}/{name}.java", plain_file(pkg, name, rng, st), False)
    return total
