"""Assemble one job's Plan from its JobSpec: source, map steps, reduce fold, sink, hand work."""
from __future__ import annotations

import re
from dataclasses import dataclass, field, replace

from javalang import tree as T

from migrate.java.driver import JobSpec, PathRef
from migrate.java.hadoop_api import KNOWN_CLASSES, WRITABLE_TYPES
from migrate.java.index import ClassIndex, ClassInfo, node_lines
from migrate.java.source import logical_sloc
from migrate.lift.builtin import IDENTITY_MAPPERS, IDENTITY_REDUCERS, SUM_REDUCERS, library_mapper, library_reducer
from migrate.lift.collections import constant_fields
from migrate.lift.combiners import COMBINER_COUNTERS, combiner_counters, judge
from migrate.lift.counters import counter_named
from migrate.lift.combining import flushes_all_entries
from migrate.lift.config import task_constants
from migrate.lift.limits import explain
from migrate.lift.mapper import MapBodyLifter, class_constants
from migrate.lift.exprs import Opaque, Scope, Unsupported, to_string
from migrate.lift.writables import is_struct, plain_key_order, read_comparator, structs_of
from migrate.lift.reducer import FoldLifter
from migrate.lift.control_break import lift_runs, reads_only
from migrate.lift.partitioning import custom_partition, hash_partition
from migrate.lift.topn import lift_top_n, top_n_findings
from migrate.lift.joins import JoinLifter
from migrate.lift.sidefiles import read_side_files
from migrate.lower.walk import assigned_names
from migrate.plan import (ADVISORY_CATEGORIES, Agg, AggRef, BoolOp, Branch, Col, ConfValue, Count, EachValue, Join, Emit, Explode, Expr, Field, Filter, Finding, Group, HandWork, Identity, ModeCheck, Param, Plan,
                          Project, Runs, SideTable, Sink, Source, Span, Step, StructNew, TaskTopN, TopN, TopPerKey, dump_expr,
                          resolve_fields, rewrite)



@dataclass
class JobResult:
    """A planned job plus what the report needs to know about where it came from."""

    spec: JobSpec
    plan: Plan
    classes: dict[str, str]  # role -> fqcn
    files: dict[str, Span]  # role -> span of the class (for the docstring and the review page)
    sloc_total: int
    notes: list[str] = field(default_factory=list)

    @property
    def status(self) -> str:
        if not self.plan.hand_work:
            return "converted"
        # partial: some steps were lifted and the script stops at a stub; not_converted: nothing was
        return "partial" if self.plan.map_steps or self.plan.branches or self.plan.reduce is not None else "not_converted"


def plan_job(spec: JobSpec, index: ClassIndex, pairs: tuple[str, str] | None = None) -> JobResult:
    """One job's plan. `pairs`: the job reads the (key, value) pairs of the job before it in a chain,
    of these Java types (a SequenceFile between them), instead of its input format's records."""
    hand: list[HandWork] = []
    notes: list[str] = []
    findings: list[Finding] = []
    shapes: list[str] = []
    drv = spec.driver.file.path
    classes = {"driver": spec.driver.fqcn, **spec.classes}
    for i, (_, _, mapper_fq, _) in enumerate(spec.branches, 1):
        classes[f"mapper {i}"] = mapper_fq
    files = {"driver": spec.driver.span}
    for role, fq in classes.items():
        c = index.get(fq)
        if c is not None:
            files[role] = c.span

    def add(category: str, span: Span, reason: str, suggestion: str, profile: str = "P1", sloc: int = 0) -> None:
        line = span.line_start
        lines = index.get(spec.driver.fqcn).file.lines if span.file == spec.driver.file.path else []
        snippet = lines[line - 1].strip() if lines and 0 < line <= len(lines) else ""
        hand.append(HandWork(category, span, reason, suggestion, snippet, profile, sloc))

    def at(*calls: str) -> Span:
        """The driver line of the first of these job calls (or the job's creation)."""
        for c in calls:
            if c in spec.call_lines:
                return Span(drv, spec.call_lines[c], spec.call_lines[c])
        return spec.origin
    # ---- parameters: the same positional arguments as the original driver
    params: list[Param] = []
    input_params = []
    inputs = [*spec.inputs, *(b[0] for b in spec.branches)]
    if spec.inputs and spec.branches:
        add("multiple-inputs", Span(drv, spec.branches[0][3], spec.branches[0][3]), "the driver adds input paths both "
            "with MultipleInputs and with FileInputFormat; which mapper reads the plain paths is not converted",
            "add every input with MultipleInputs.addInputPath and its mapper, then convert again", "P1")
    for i, ref in enumerate(inputs):
        name = "input_path" if len(inputs) == 1 else f"input_path_{i + 1}"
        params.append(_param(name, ref, "input path"))
        input_params.append(name)
    if not inputs:
        add("driver", spec.origin, "the driver sets no input path the converter could read",
            "pass the input folder to build() by hand", "P1")
        params.append(Param("input_path", "input path (not found in the driver)", None, None))
        input_params.append("input_path")
    out_ref = spec.output or PathRef("unknown", text="not set")
    params.append(_param("output_path", out_ref, "output folder"))
    arg_settings = _settings_from_arguments(spec, params)
    _arguments_paths_are_made_from(params)
    params = _argument_layout(params, add, spec.origin)
    mode = _mode_check(spec, params)
    if out_ref.kind == "unknown":
        add("driver", spec.origin, "the driver's output path could not be read", "pass the output folder by hand")
    # ---- formats
    fmt = "text" if pairs is None else "pairs"
    kv_sep = "\t"
    if spec.input_format and pairs is None:
        simple = spec.input_format.rsplit(".", 1)[-1]
        if simple == "KeyValueTextInputFormat":
            fmt = "keyvalue"
            kv_sep = _key_value_separator(spec, add, notes)
        elif simple == "NLineInputFormat":  # N lines per map task: the records are TextInputFormat's
            notes.append("NLineInputFormat only decides how many lines each map task reads; the records (byte "
                         "offset, line) are TextInputFormat's, so the script reads the lines as text")
            if spec.reduces == 0:
                add("output-layout", at("setInputFormatClass", "setInputFormat"), "map-only with NLineInputFormat: "
                    "Hadoop writes one part file per group of N lines and orders those files by the groups' byte "
                    "size (largest first), so lines from different groups come out in another order than here",
                    "sort the output downstream if its order matters; the lines themselves are the same", "P1")
        elif simple != "TextInputFormat":
            add("input-format", at("setInputFormatClass", "setInputFormat"), f"input format {simple} is not converted",
                FORMAT_ADVICE.get(simple, "read it with a Spark data source that matches the record layout"), "P3",
                _sloc_of(index, spec.input_format))
    if spec.output_format and spec.output_format.rsplit(".", 1)[-1] != "TextOutputFormat":
        add("output-format", at("setOutputFormatClass", "setOutputFormat"), f"output format {spec.output_format.rsplit('.', 1)[-1]} is not converted",
            FORMAT_ADVICE.get(spec.output_format.rsplit(".", 1)[-1], "write with the Spark format downstream readers "
                              "expect"), "P3", _sloc_of(index, spec.output_format))
    sep = spec.conf.get("mapreduce.output.textoutputformat.separator", spec.conf.get("mapred.textoutputformat.separator", "\t"))
    compression = _output_compression(spec, add, at)
    # ---- map output types (Hadoop falls back to the job output types)
    map_key_fq = spec.types.get("map_key", spec.types.get("out_key", "org.apache.hadoop.io.LongWritable"))
    map_val_fq = spec.types.get("map_value", spec.types.get("out_value", "org.apache.hadoop.io.Text"))
    structs = structs_of(index)
    map_key_t, map_val_t = _jtype(map_key_fq, structs), _jtype(map_val_fq, structs)
    for what, fq in (("map output key", map_key_fq), ("map output value", map_val_fq),
                     ("output key", spec.types.get("out_key")), ("output value", spec.types.get("out_value"))):
        if index.get(fq) is not None:  # a repository class: its compareTo/toString are part of the job
            files.setdefault(what, index.get(fq).span)
    for what, fq, t in (("map output key", map_key_fq, map_key_t), ("map output value", map_val_fq, map_val_t)):
        if t == "?":
            why = structs.get(fq)
            detail = f": {why.reason}" if isinstance(why, Unsupported) else ""
            add("custom-writable", spec.origin, f"{what} class {fq.rsplit('.', 1)[-1]} is a custom Writable{detail}",
                (why.suggestion if isinstance(why, Unsupported) and why.suggestion else "model its fields as struct columns"),
                "P1", _sloc_of(index, fq))
    # ---- mapper
    mapper_fq = spec.classes.get("mapper")
    steps: list[Step] = []
    skip_first = False
    mcls = index.get(mapper_fq)
    combining: list[str] = []  # Map fields of in-mapper combining, flushed in cleanup()
    branches: list[Branch] = []
    tables: list[SideTable] = []  # side files the mappers load in setup() and look keys up in
    _chain_hand_work(spec, add)
    # what the mapper's input key is: an input format not converted reads keys of its own
    known = pairs is not None or not spec.input_format or spec.input_format.rsplit(".", 1)[-1] in ("TextInputFormat", "NLineInputFormat",
                                                                             "KeyValueTextInputFormat")
    map_fmt = fmt if known else "other"
    if pairs is not None and (spec.chain or spec.branches):
        add("input-format", spec.origin, "a job reading the job before it through a SequenceFile, with chained or "
            "several mappers, is not converted", "apply the mappers to the pairs by hand", "P2")
    elif any(c.role == "map" for c in spec.chain):
        steps, skip_first = _chained_maps(spec, index, map_fmt, hand, notes, add, combining, tables, structs, findings)
        shapes.append(f"{sum(c.role == 'map' for c in spec.chain)} chained mappers")
    elif spec.branches:
        branches = _branches(spec, index, input_params[len(spec.inputs):], kv_sep, hand, notes, add, combining, tables,
                             findings)
        shapes.append(f"{len(branches)} inputs, one mapper each")
    elif mcls is not None and "mapper" in mcls.roles:
        steps, skip_first = _lift_mapper(mcls, map_fmt, hand, notes, index, spec.conf, combining, tables,
                                         in_types=pairs, findings=findings)
    elif mapper_fq in KNOWN_CLASSES or mapper_fq in IDENTITY_MAPPERS:
        lib_steps, why = library_mapper(mapper_fq, map_fmt, spec.conf, pairs)
        if lib_steps is None:
            add("map-logic", spec.origin, why, "read the input with the key you need and select it by hand", "P2")
        else:
            steps = lib_steps
            simple = (mapper_fq or "Mapper").rsplit(".", 1)[-1]
            shapes.append({"TokenCounterMapper": "token count", "TokenCountMapper": "token count",
                           "RegexMapper": "regex match count", "InverseMapper": "swap key and value"}
                          .get(simple, "identity map"))
    else:
        add("missing-source", spec.origin, f"mapper {mapper_fq} is neither in the repository nor a Hadoop library class",
            "add its source to the scanned folder", "P2")
    _check_map_output_types(steps, map_key_t, map_val_t, mcls, add)
    task_order = _check_task_state(spec, steps, branches, map_fmt, add, findings)
    # ---- reduce side
    reduce: Step | None = None
    partition: Expr | None = None  # with several reduce tasks: the task of each key
    key_order = None  # a sort comparator's order of a custom key (None: its compareTo)
    plain_ascending = None  # a sort comparator's order of a Text/int/long key (False: reversed)
    reducer_fq = spec.classes.get("reducer")
    if spec.reduces == 0:
        shapes.append("map only")
        if combining or mcls is not None and mcls.combined_records:
            add("task-state", mcls.span, "in-mapper combining in a map-only job: one partial sum per input split",
                "decide whether per-file sums (groupBy file name) are what readers expect", "P2")
    else:
        rcls = index.get(reducer_fq)
        if rcls is not None and "reducer" in rcls.roles:
            reduce = _lift_reducer(rcls, map_key_t, map_val_t, hand, index, findings, spec.reduces, spec.conf,
                                   sorted_values=bool(_SECONDARY_SORT_ROLES & spec.classes.keys()))
            if isinstance(reduce, Join):
                shapes.append(_join_shape(reduce))
                notes.append("a join writes the combinations of one key's values in the order they reached reduce(), "
                             "which Hadoop does not define: the lines of one key may come in another order here")
        elif reducer_fq in KNOWN_CLASSES or reducer_fq in IDENTITY_REDUCERS:
            reduce = library_reducer(reducer_fq, map_key_t, map_val_t)
            if reduce is None:
                add("reduce-logic", spec.origin, f"reducer {reducer_fq} is not converted", "write the aggregation by hand", "P2")
        else:
            add("missing-source", spec.origin, f"reducer {reducer_fq} is neither in the repository nor a Hadoop library class",
                "add its source to the scanned folder", "P2")
        if map_key_t in ("double", "float") and reduce is not None:
            add("key-semantics", spec.origin, f"{map_key_t} map output keys: Hadoop's DoubleWritable/FloatWritable "
                "compare -0.0 and 0.0 as different keys, Spark groups them together",
                "group by the key's text (F.col('key').cast('string')) and sort by its number", "P1")
        if spec.reduces > 1 and reduce is not None:
            partition, why = _partition_of(spec, index, map_key_t, reduce)
            capped = isinstance(reduce, Group) and reduce.first_keys is not None
            if partition is None and (isinstance(reduce, TopN) or capped):
                findings[:] = [f for f in findings if f.category != "per-task-state"]  # not reproduced after all
                add("per-task-state", at("setNumReduceTasks"), f"the reducer's state is kept per reduce task ({spec.reduces} "
                    f"tasks) and which task gets which key is not known: {why}",
                    "rank per task with Window.partitionBy(<task of the key>), or decide one overall top-N is meant", "P2")
            elif partition is None and _layout_only(spec, index, map_key_t, reduce):
                findings.append(Finding("output-layout", at("setNumReduceTasks"), f"Hadoop wrote {spec.reduces} part "
                                        "files, each sorted by key; the script writes one file sorted by key: the same "
                                        f"lines, each part file's lines in their order ({why})", "if readers open part "
                                        "files by name, repartition by the same rule"))
            elif partition is None:
                add("output-layout", at("setNumReduceTasks"), f"Hadoop split the output over {spec.reduces} part "
                    f"files ({why}); the script writes one file sorted by key",
                    "if readers depend on the part files, repartition by the same rule", "P1")
            else:
                findings.append(Finding("output-layout", at("setNumReduceTasks"), f"Hadoop wrote {spec.reduces} part "
                                        "files, each sorted by key; by default the script writes one file holding the same "
                                        "lines in the same order (the part files one after another); with --task-files "
                                        f"it writes {spec.reduces} files, each holding what one reduce task wrote",
                                        "keep --task-files if readers open part files by name"))
                if isinstance(reduce, TopN):
                    reduce = replace(reduce, partition=partition, partitions=spec.reduces)
        _check_combiner(spec, reduce, index, add, notes, findings, at("setCombinerClass"), map_key_t, map_val_t)
        if combining:
            if judge(reduce, _summing(map_key_t, map_val_t)).sound:
                notes.append(f"in-mapper combining ({', '.join(combining)}, flushed in cleanup()) is a partial sum; the "
                             "reducer sums again, so the script writes every update and lets the reducer sum them")
            else:
                add("task-state", mcls.span, "in-mapper combining feeds a reducer that does not just sum: the output "
                    "would depend on how Hadoop split the input into tasks", "check what the job should compute", "P2")
        for field_name, record in mcls.combined_records if mcls is not None else []:
            partial = _summing_fields(map_key_t, map_val_t, structs, record)
            verdict = judge(reduce, partial) if partial is not None else None
            if verdict is not None and verdict.sound:
                notes.append(f"in-mapper combining into {field_name} (records summed field by field, written in "
                             "cleanup()) is a partial sum; the reducer sums every field again, so the script writes "
                             "a record per update and lets the reducer sum them")
            else:
                why = verdict.why if verdict is not None else "the map output is not that record"
                add("task-state", mcls.span, f"in-mapper combining into {field_name} writes per-task sums of each "
                    f"record field, and the reducer does not just sum them ({why}): the output would depend on how "
                    "Hadoop split the input into tasks", "check what the job should compute", "P2")
        if "partitioner" in spec.classes and partition is None:
            name = spec.classes["partitioner"].rsplit(".", 1)[-1]
            if _one_reduce_task(spec):
                findings.append(Finding("partitioner-not-called", at("setPartitionerClass"), f"custom partitioner {name} "
                                        "is never called: with one reduce task Hadoop's map task sends every key to it "
                                        "without asking the partitioner; the script has no partitioner either",
                                        "delete setPartitionerClass, or set the number of reduce tasks it was written "
                                        "for (then it runs, also when -D mapreduce.job.reduces is given at run time)"))
            else:
                add("partitioner", at("setPartitionerClass"), f"custom partitioner {name} is not converted",
                    "only the split into part files changes; repartition by the same rule if readers depend on it",
                    "P2", _sloc_of(index, spec.classes["partitioner"]))
        key_order, key_group = _secondary_sort(spec, index, structs, map_key_t, reduce, add, at) or (None, None)
        if not is_struct(map_key_t) and _SECONDARY_SORT_ROLES & spec.classes.keys():
            plain_ascending = _plain_key_order(spec, index, map_key_t, reduce, add, at)
            if plain_ascending is False:
                notes.append("the sort comparator puts the keys in reverse order: reduce() meets them, and the "
                             "output holds them, largest first; the script sorts the same way")
        if isinstance(reduce, EachValue) and (reduce.first_value or reduce.before or reduce.after):
            reduce = _reduce_calls(spec, structs, map_key_t, reduce, key_order, key_group, add)
        if isinstance(reduce, Runs):
            reduce = _control_break(spec, structs, map_key_t, reduce, key_order, key_group, steps, partition, add)
        if key_order is not None:
            shapes.append("secondary sort")
            notes.append("the values reach reduce() in the sort comparator's order; the script sorts its output by "
                         "the same fields, in the same directions (values with equal keys: in no defined order)")
        if isinstance(reduce, TopPerKey) and (is_struct(map_key_t) or key_order is not None):
            add("top-n", reduce.origin, "a per-key top-N over a custom key is not converted",
                "Window.partitionBy(the key's fields).orderBy(value) with row_number() <= N", "P2")
        if isinstance(reduce, TopN) and is_struct(map_key_t):
            add("top-n", reduce.fold.emits[0].origin, "the TreeMap keeps the last of tied entries, and which is last "
                "follows the custom key's compareTo order; that tie rule is not reproduced for custom keys",
                "rank with Window.orderBy(...) and decide how ties should be broken", "P2")
    tables = _side_tables(spec, tables, params, add)
    if tables:
        shapes.append("map-side join (" + ", ".join(f"{t.field}: {'HashSet' if t.kind == 'set' else 'HashMap'}"
                                                    for t in tables) + ")")
    for category, line, text in spec.extra:
        add(category, Span(drv, line, line), text if category in WHOLE_REASONS else f"{text} is not converted in "
            "this version", EXTRA_ADVICE.get(category, "rewrite this driver call as DataFrame code by hand"), "P2")
    if spec.reduces != 0 and "reducer" not in spec.classes:
        for c in index:
            if "reducer" in c.roles and c.file.path == spec.driver.file.path and c.fqcn != spec.classes.get("combiner"):
                findings.append(Finding("reducer-not-registered", c.span, f"{c.name} is a reducer in the driver's "
                                        "file, but the driver never calls setReducerClass: Hadoop runs the identity "
                                        "reducer; so does the script", f"register {c.name} if it was meant to run"))
    for line, call, earlier, later in spec.replaced:
        findings.append(Finding("set-twice", Span(drv, line, line), f"`{call}` is called again: Hadoop uses the last "
                                f"class, {later.rsplit('.', 1)[-1]}, not {earlier.rsplit('.', 1)[-1]}; so does the script",
                                "delete the call that does not count, so readers of the driver are not misled"))
    for line, call in spec.unread:
        notes.append(f"{drv}:{line} driver call `{call}` was not read")
    for c in dict.fromkeys(index.get(fq) for fq in classes.values()):  # migrate.lower's rewrites
        notes.extend(f"{c.file.path}:{line} {what}" for line, what in (c.lowered if c is not None else ()))
    if isinstance(reduce, Identity):
        notes.append("the values of one key come out in no defined order, in Hadoop as here")
    if isinstance(reduce, Group) and any(a.fn == "sum" and a.jtype in ("double", "float") for a in reduce.aggs):
        notes.append("a floating-point sum depends on the order of the values, which neither Hadoop nor Spark "
                     "fixes; the last digit can differ between runs of either")
    # ---- shapes and the sink
    shapes.extend(_shapes(steps if mcls is not None else [], reduce))
    steps, reduce = _struct_output_text(steps, reduce, structs, add, spec.origin, spec.reduces == 0)
    sort_terms = ((Col(map_key_t, "key"), False),) if plain_ascending is False and reduce is not None else ()
    if is_struct(map_key_t) and reduce is not None and not isinstance(reduce, TopN):
        try:
            sort_terms = structs[map_key_t].sort_terms(Col(map_key_t, "key"), spec.driver.node, key_order)
            if isinstance(reduce, Runs):  # one row per group: its fields order the output
                sort_terms = sort_terms[:len(reduce.group)]
        except Unsupported as u:
            add("custom-writable", spec.origin, f"the output is sorted by {map_key_t.split('.')[-1]}.compareTo: "
                f"{u.reason}", u.suggestion or "sort by the compared fields by hand", "P1")
    out_key_t, out_val_t = _sink_types(steps, reduce, spec)
    for what, declared_fq, written in (("key", spec.types.get("out_key"), out_key_t),
                                       ("value", spec.types.get("out_value"), out_val_t)):
        declared = _jtype(declared_fq) if declared_fq else None
        text_output = (spec.output_format or "TextOutputFormat").endswith("TextOutputFormat")
        if declared not in (None, "?") and written is not None and declared != written and text_output:
            findings.append(Finding("declared-type", at("setOutputKeyClass" if what == "key" else "setOutputValueClass"),
                                    f"the job declares {declared_fq.rsplit('.', 1)[-1]} output {what}s but writes "
                                    f"{written} ones; TextOutputFormat prints whatever is written, so the output is "
                                    "the written values' text, in the original and in the script",
                                    "declare the class that is written (a binary output format would fail)"))
    sink = Sink("output_path", out_key_t, out_val_t, sorted_by_key=reduce is not None and spec.reduces >= 1,
                overwrite=spec.deletes_output, separator=sep, origin=spec.origin,
                partition=partition if spec.reduces > 1 and not isinstance(reduce, Identity) else None,
                sort_terms=sort_terms, compression=compression)
    splits = tuple(ref.split_commas for ref in spec.inputs) or (False,)
    source = Source(tuple(input_params), fmt, skip_first, splits, _reads_file_name(steps), spec.origin, kv_sep,
                    lists=tuple(ref.kind == "args" for ref in spec.inputs) or (False,),
                    offsets=_reads_offsets(steps, fmt) and not branches,
                    split=split_settings(spec.conf) if task_order else ())
    prints = _counter_prints(spec, index, [*steps, *(s for b in branches for s in b.steps)], reduce, add)
    plan = Plan(spec.name, source, tuple(steps), reduce, sink, tuple(params), tuple(hand), tuple(dict.fromkeys(shapes)),
                tuple(notes), tuple(findings), tuple(branches), tuple(tables), mode=mode, arg_settings=arg_settings,
                prints=prints, usage=(Span(drv, spec.usage[0], spec.usage[0]), *spec.usage[1:]) if spec.usage else None)
    sloc = sum(c.sloc for c in {index.get(fq) for fq in classes.values()} if c is not None)
    return JobResult(spec, plan, classes, files, sloc, notes)


# Driver items whose text is the whole reason (not "… is not converted in this version").
WHOLE_REASONS = {"not-submitted", "io-outside-output", "unread-jobs", "conditional-settings", "job-builder"}
# What to write by hand for the driver features this version does not convert (common practice).
EXTRA_ADVICE = {
    "job-builder": "write each aggregation the descriptors name (LongValueSum, ValueHistogram, ...) as a groupBy "
                   "with the matching F function; the descriptor's generateKeyValPairs() is the map step",
    "conditional-settings": "convert the job once per branch (make the test a fixed value), or give the script an "
                            "option that picks the same settings the test picks",
    "unread-jobs": "convert the other job too (its mapper, reducer and paths), then chain the two in one script: "
                   "the later job reads the earlier one's output",
    "not-submitted": "find out how the job really runs (a scheduler, another class) before converting it; if it never "
                     "runs, there is nothing to convert",
    "io-outside-output": "do the same file operation outside the Spark job (in main() or the scheduler), and only "
                         "after checking that it is still wanted; the script writes only the job's output",
    "side-files": "a side file read in setup(): read it with spark.read and join it with F.broadcast(side) on the "
                  "looked-up key, keeping the Java rule for a miss (skip the record, a default, or pass it through)",
    "chained-maps": "apply the mapper's steps to the reducer's rows (a select after the groupBy); the lines keep "
                    "the reducer's key order, not the order of the key the mapper writes",
    "named-outputs": "write each named output with its own result.where(...).write into <output>/<name>; where the "
                     "names come from the data, write.partitionBy(the name column)",
    "multiple-inputs": "read each input with its format, map it, and unionByName the mapped DataFrames",
    "chained-jobs": "chain the jobs' DataFrames in one script; write an intermediate folder only if something "
                    "else reads it",
    "after-job": "compute the same figure in main() from the result DataFrame (result.count(), result.agg(...)) or "
                 "read the written folder back with spark.read.text; the job's own output is already right",
    "input-output-options": "pass the same option to Spark's reader (pathGlobFilter, recursiveFileLookup) or filter "
                            "the input paths by hand",
}
FORMAT_ADVICE = {
    "SequenceFileInputFormat": "SequenceFiles hold binary Writable records: read them with spark.sparkContext."
                               "sequenceFile(path, keyClass, valueClass) into a DataFrame, or convert the data "
                               "once to Parquet and read that",
    "SequenceFileOutputFormat": "downstream Hadoop readers need SequenceFiles: rdd.saveAsSequenceFile(path) on "
                                "(key, value) pairs; if the readers move to Spark too, write Parquet instead",
    "SequenceFileAsTextInputFormat": "read with spark.sparkContext.sequenceFile and toString() both sides",
}


def _branches(spec: JobSpec, index: ClassIndex, params: list[str], kv_sep: str, hand: list[HandWork],
              notes: list[str], add, combining: list[str], tables: list[SideTable],
              findings: list[Finding] | None = None) -> list[Branch]:
    """MultipleInputs: each input read with its format and mapped by its own mapper."""
    out = []
    drv = spec.driver.file.path
    for (ref, fmt_fq, mapper_fq, line), param in zip(spec.branches, params):
        where = Span(drv, line, line)
        simple = fmt_fq.rsplit(".", 1)[-1]
        fmt = {"TextInputFormat": "text", "KeyValueTextInputFormat": "keyvalue"}.get(simple)
        mcls = index.get(mapper_fq)
        steps: list[Step] = []
        skip_first = False
        if fmt is None:
            add("input-format", where, f"input format {simple} is not converted",
                "read it with a Spark data source that matches the record layout", "P3", _sloc_of(index, fmt_fq))
        elif mcls is None or "mapper" not in mcls.roles:
            add("missing-source", where, f"mapper {mapper_fq} of this input is not in the repository",
                "add its source to the scanned folder", "P2")
        else:
            steps, skip_first = _lift_mapper(mcls, fmt, hand, notes, index, spec.conf, combining, tables,
                                             findings=findings)
        source = Source((param,), fmt or "text", skip_first, (ref.split_commas,), _reads_file_name(steps), where, kv_sep,
                        offsets=_reads_offsets(steps, fmt or "text"))
        out.append(Branch(source, tuple(steps), mapper_fq))
    return out


def _chained_maps(spec: JobSpec, index: ClassIndex, fmt: str, hand: list[HandWork], notes: list[str], add,
                  combining: list[str], tables: list[SideTable], structs: dict,
                  findings: list[Finding] | None = None) -> tuple[list[Step], bool]:
    """ChainMapper: each mapper's steps after the previous one's, its input the previous output."""
    drv = spec.driver.file.path
    steps: list[Step] = []
    skip_first = False
    maps = [c for c in spec.chain if c.role == "map"]
    for i, c in enumerate(maps):
        mcls = index.get(c.cls)
        if mcls is None or "mapper" not in mcls.roles:
            add("missing-source", Span(drv, c.line, c.line), f"chained mapper {c.cls} is not in the repository",
                "add its source to the scanned folder", "P2")
            return [], False
        in_types = None if i == 0 else (_jtype(c.types[0], structs), _jtype(c.types[1], structs))
        if in_types is not None and "?" in in_types:
            add("custom-writable", Span(drv, c.line, c.line), "a chained mapper's input is a custom Writable",
                "model its fields as struct columns", "P1")
            return [], False
        own, skip = _lift_mapper(mcls, fmt, hand, notes, index, spec.conf, combining, tables, in_types, findings)
        if not own:
            return steps, skip_first
        # what the next mapper (or the shuffle) reads must be what this one writes
        _check_map_output_types(own, _jtype(c.types[2], structs), _jtype(c.types[3], structs), mcls, add)
        skip_first = skip_first or (skip and i == 0)
        steps += own
    return steps, skip_first


def _chain_hand_work(spec: JobSpec, add) -> None:
    """What of a ChainMapper / ChainReducer chain is not converted."""
    for c in spec.chain:
        where = Span(spec.driver.file.path, c.line, c.line)
        if c.own_conf:
            add("chained-maps", where, f"{c.cls.rsplit('.', 1)[-1]} gets a Configuration of its own in the chain; "
                "its settings are not read", "pass the settings to the job's configuration, or read them by hand")
        if c.role == "map-after":
            add("chained-maps", where, "a mapper after the chained reducer (ChainReducer.addMapper) is not converted",
                EXTRA_ADVICE["chained-maps"], "P2")


def _side_tables(spec: JobSpec, tables: list[SideTable], params: list[Param], add) -> list[SideTable]:
    """Each side table gets the script parameter of the cache file it reads; cache files no
    mapper reads this way stay hand work."""
    out, read = [], set()
    drv = spec.driver.file.path
    links = {cf.link: i for i, cf in enumerate(spec.cache_files) if cf.link}
    for t in tables:
        i = links.get(t.cache_file) if isinstance(t.cache_file, str) else t.cache_file
        if i is None or i >= len(spec.cache_files):
            add("side-files", t.origin, f"setup() reads cache file {t.cache_file!r}, which is not one the driver "
                "ships (as far as the converter could read)", EXTRA_ADVICE["side-files"], "P2")
            continue
        cf = spec.cache_files[i]
        name = f"{t.name}_file"
        if all(p.name != name for p in params):
            params.append(_param(name, cf.path, f"side file read into {t.field} in setup()"))
        if cf.path.kind == "unknown":
            add("driver", Span(drv, cf.line, cf.line), "the side file's path could not be read",
                f"pass it as {name} by hand")
        read.add(i)
        out.append(replace(t, param=name))
    for i, cf in enumerate(spec.cache_files):
        if i not in read:
            add("side-files", Span(drv, cf.line, cf.line), "the cache file is not read by a setup() the converter "
                "lifted", EXTRA_ADVICE["side-files"], "P2")
    return out


def _join_shape(j: Join) -> str:
    """The join a reducer's writes amount to, in SQL's words."""
    lists = [s.name for s in j.sides if s.many]
    guards = [w.emit.guard for w in j.writes]
    if any(g is not None and isinstance(g, BoolOp) and g.op == "!" for g in guards):
        return "reduce-side join (with an anti join)"
    if len(lists) >= 2 and all(len(w.loops) >= 2 for w in j.writes):
        return "reduce-side join (inner)"
    if any(not s.many and s.default is not None for s in j.sides):
        return "reduce-side join (lookup with a default: left outer)"
    return "reduce-side join"


def _struct_output_text(steps: list[Step], reduce: Step | None, structs: dict, add, where: Span, map_only: bool):
    """TextOutputFormat prints a custom Writable with its toString(): final writes become that text."""
    scope = Scope({}, structs=structs)

    def text(e: Emit) -> Emit:
        k = to_string(e.key, scope) if e.key is not None and is_struct(e.key.jtype) else e.key
        v = to_string(e.value, scope) if e.value is not None and is_struct(e.value.jtype) else e.value
        return replace(e, key=k, value=v) if (k, v) != (e.key, e.value) else e

    try:
        if isinstance(reduce, Group):
            reduce = replace(reduce, emits=tuple(text(e) for e in reduce.emits))
        elif isinstance(reduce, EachValue):
            reduce = replace(reduce, emits=tuple(text(e) for e in reduce.emits),
                             before=tuple(text(e) for e in reduce.before), after=tuple(text(e) for e in reduce.after))
        elif isinstance(reduce, TopN):
            reduce = replace(reduce, writes=tuple(text(e) for e in reduce.writes))
        elif isinstance(reduce, Runs):
            reduce = replace(reduce, writes=tuple(text(e) for e in reduce.writes))
        elif reduce is None and map_only:
            steps = [replace(s, emits=tuple(text(e) for e in s.emits)) if isinstance(s, Project) else s for s in steps]
        elif isinstance(reduce, Identity) and any(is_struct(e.key.jtype) or is_struct(e.value.jtype)
                                                  for s in steps if isinstance(s, Project) for e in s.emits
                                                  if e.key is not None and e.value is not None):
            raise Unsupported(None, "the identity reducer writes a custom Writable")
    except Unsupported as u:
        add("custom-writable", where, f"the output text of a custom Writable: {u.reason}",
            u.suggestion or "format its fields with F.concat by hand", "P1")
    return steps, reduce


_COMPARATOR_CALLS = {"sort_comparator": ("setSortComparatorClass", "setOutputKeyComparatorClass"),
                     "grouping_comparator": ("setGroupingComparatorClass", "setOutputValueGroupingComparator")}


_SECONDARY_SORT_ROLES = {"sort_comparator", "grouping_comparator"}


def _plain_key_order(spec: JobSpec, index: ClassIndex, key_t: str, reduce: Step | None, add, at) -> bool | None:
    """Sort and grouping comparators over a Text/IntWritable/LongWritable key: False when the keys
    reach reduce() in reverse order, True when in their own; None (and hand work) when not read."""
    roles = [r for r in ("sort_comparator", "grouping_comparator") if r in spec.classes]
    orders = []
    for r in roles:
        try:
            orders.append(plain_key_order(spec.classes[r], index.get(spec.classes[r]), key_t))
        except Unsupported as u:
            reason = u.reason
        else:
            continue
        name = spec.classes[r].rsplit(".", 1)[-1]
        add("secondary-sort", at(*_COMPARATOR_CALLS[r]), f"{r.replace('_', ' ')} {name}: {reason}",
            "sort by the key with orderBy(F.col('key').desc()) if a reverse order is meant", "P2",
            _sloc_of(index, spec.classes[r]))
        return None
    ascending = orders[0] if roles and roles[0] == "sort_comparator" else True
    if not ascending and isinstance(reduce, (TopN, TopPerKey, Join)):
        add("secondary-sort", at(*_COMPARATOR_CALLS["sort_comparator"]), "the sort comparator puts the keys in "
            "reverse order; this reducer's output order under it is not reproduced",
            "sort by the key with orderBy(F.col('key').desc())", "P2")
        return None
    return ascending


def _secondary_sort(spec: JobSpec, index: ClassIndex, structs: dict, key_t: str, reduce: Step | None, add, at):
    """Sort and grouping comparators over a custom key (secondary sort): the order of the reduce
    input, or hand work saying why it was not read. Returns the sort order and the grouping
    comparator's fields (the sort's where there is none), or None for compareTo's."""
    roles = [r for r in ("sort_comparator", "grouping_comparator") if r in spec.classes]
    if not roles:
        return None
    hint = "Window.partitionBy(natural key).orderBy(secondary field) expresses a secondary sort"

    def decline(role: str, reason: str) -> None:
        name = spec.classes[role].rsplit(".", 1)[-1]
        add("secondary-sort", at(*_COMPARATOR_CALLS[role]), f"{role.replace('_', ' ')} {name}: {reason}", hint, "P2",
            _sloc_of(index, spec.classes[role]))

    if not is_struct(key_t):  # a standard key: _plain_key_order
        return None
    orders = {}
    for r in roles:
        cls = index.get(spec.classes[r])
        try:
            if cls is None:
                raise Unsupported(None, "its source is not in the repository")
            info, orders[r] = read_comparator(cls, structs, equality_only=r == "grouping_comparator")
            if info.jtype != key_t:
                raise Unsupported(None, f"it compares {info.cls.name}, not the map output key")
        except Unsupported as u:
            decline(r, u.reason)
            return None
    info = structs[key_t]
    sort = orders.get("sort_comparator") or (info.order if not info.no_order else None)
    if sort is None:
        decline(roles[0], info.no_order)
        return None
    group = orders.get("grouping_comparator", sort)
    fields = [n for n, _ in sort]
    if [n for n, _ in group] != fields[:len(group)]:
        decline(roles[-1], "the grouping comparator's fields are not the first fields of the sort order, so "
                           "Hadoop's groups would not be contiguous")
        return None
    spans_keys = len(group) < len(info.fields)  # one reduce() call sees several distinct keys
    if isinstance(reduce, Runs) and not (spans_keys and len(sort) == len(group) + 1 == len(info.fields)):
        decline(roles[-1], "reduce() starts its sums over when a field changes (a control break); that is one run "
                           "per key only where the grouping comparator compares every sort field but the last, and "
                           "the sort compares every field of the key")
        return None
    if spans_keys and reduce is None:
        return None  # the reducer is hand work already
    if spans_keys and not isinstance(reduce, (EachValue, Identity, Runs)):
        decline(roles[-1], f"reduce() folds a group that spans several keys (it compares only "
                           f"{', '.join(n for n, _ in group)}): the key it sees changes as the values are read, and "
                           "which values come first follows the sort order; only reducers that write inside their "
                           "loop over values are converted")
        return None
    return sort, group


def _reduce_calls(spec: JobSpec, structs: dict, key_t: str, reduce: EachValue, key_order, key_group,
                  add) -> EachValue:
    """Which rows make one reduce() call (`group`) and their order in it (`order`), for a reducer
    that writes before or after its loop, or takes the first value before it. The first value is
    the group's first in the sort order only where a grouping comparator gathers several sorted keys
    into one call (a secondary sort); without one it is any of the key's values."""
    k = Col(key_t, "key")
    group, order = None, ()
    if key_order is not None:
        info = structs[key_t]
        order = info.sort_terms(k, spec.origin, key_order)
        group = tuple(info.field_of(k, n) for n, _ in key_group)
    if reduce.first_value and (group is None or len(group) >= len(order)):
        why = "Hadoop gives the values of a key in no defined order (no secondary sort here)" if group is None else \
            "the values of one call share one key (the grouping compares every field the sort does)"
        add("value-order", reduce.origin, f"reduce() takes the first value before its loop over the others; {why}, "
            "so which value is first was not defined and the original output was not deterministic",
            "sort the values (a secondary sort) and take F.first over Window.partitionBy(key).orderBy(...)", "P2")
        return reduce
    return replace(reduce, group=group or (k,), order=order)


def _control_break(spec: JobSpec, structs: dict, key_t: str, reduce: Runs, key_order, key_group, steps: list[Step],
                   partition: Expr | None, add) -> Runs | None:
    """A control break is one run per key where the value's field it tests is the key's last sort
    field in every map output pair, and what is written reads of the key only the fields a whole
    group shares (the key object moves on as the values are read: at a break it is the next
    run's). Fills in the group, the run's field and its order; None (and hand work) otherwise."""
    def decline(why: str, at: Step | Emit | None = None) -> None:
        add("secondary-sort", (at or reduce).origin, f"reduce() starts its sums over when `{reduce.marker}` "
            f"changes (a control break): {why}", "fold each run with groupBy(the full key), then collect the runs "
            "per group with F.sort_array(F.collect_list(...))", "P2")

    if key_order is None:
        return None  # the sort was not read: _secondary_sort said why
    info, k = structs[key_t], Col(key_t, "key")
    shared = {n for n, _ in key_group}
    last, asc = key_order[-1]
    field = info.field_of(k, last)
    if spec.branches or "combiner" in spec.classes:
        decline("with several inputs or a combiner, what reaches the reducer is not the mapper's output")
        return None
    emits = [e for s in steps if isinstance(s, Project) for e in s.emits]
    if reduce.test != field and not emits:
        decline(f"the field it tests ({dump_expr(reduce.test)}) is not the key's {last}, and no map output shows it")
        return None
    for e in emits if reduce.test != field else ():  # the value's field is the key's, pair by pair
        pair = {"key": e.key, "value": e.value}
        tested = resolve_fields(rewrite(reduce.test, lambda x: pair.get(x.name) if isinstance(x, Col) else None))
        if e.key is None or e.value is None or tested != resolve_fields(rewrite(field, lambda x: e.key if x == k else None)):
            decline(f"the field it tests ({dump_expr(reduce.test)}) is not shown to be the key's {last} in the map "
                    f"output written at {e.origin}")
            return None
    if not _one_reduce_task(spec) and (partition is None or not reads_only(partition, shared)):
        decline("with several reduce tasks, the partitioner reads more of the key than the grouping comparator "
                "(or is not read), so one group's keys may go to different reduce tasks")
        return None
    if not reads_only(reduce.fold.keys, shared):
        decline("it returns early on a test of the key beyond the fields a group shares (the group's first key)")
        return None
    for e in (*reduce.fold.emits, *reduce.writes):
        if not (reads_only(e.key if e not in reduce.fold.emits else None, shared) and reads_only(e.value, shared)
                and reads_only(e.guard, shared)):
            decline(f"a write reads the key beyond the fields a group shares ({', '.join(sorted(shared))}); the key "
                    "changes as the values are read", e)
            return None
    order = info.sort_terms(k, spec.origin, key_order)[-1]
    return replace(reduce, group=tuple(info.field_of(k, n) for n, _ in key_group), field=field, order=order)


# Hadoop codec class -> the Spark text writer's `compression` name for the same codec (Spark's
# short names map to these very Hadoop classes)
CODECS = {"org.apache.hadoop.io.compress.GzipCodec": "gzip", "org.apache.hadoop.io.compress.BZip2Codec": "bzip2",
          "org.apache.hadoop.io.compress.DefaultCodec": "deflate"}


def _output_compression(spec: JobSpec, add, at) -> str | None:
    """FileOutputFormat.setCompressOutput / the compress settings (both APIs) -> a Spark codec name."""
    on = spec.conf.get("mapreduce.output.fileoutputformat.compress", spec.conf.get("mapred.output.compress", "false"))
    if on == "false":
        return None
    codec = spec.conf.get("mapreduce.output.fileoutputformat.compress.codec",
                          spec.conf.get("mapred.output.compression.codec", "org.apache.hadoop.io.compress.DefaultCodec"))
    if on != "true" or codec not in CODECS:
        add("input-output-options", at("setCompressOutput", "setOutputCompressorClass"),
            f"compressed output ({on}, codec {codec.rsplit('.', 1)[-1]}) is not converted: the script writes plain text",
            "add .option('compression', ...) with the codec readers expect", "P1")
        return None
    return CODECS[codec]


KV_SEPARATOR_SETTINGS = ("mapreduce.input.keyvaluelinerecordreader.key.value.separator",
                         "key.value.separator.in.input.line")  # new API, old API


def _key_value_separator(spec: JobSpec, add, notes: list[str]) -> str:
    """KeyValueLineRecordReader splits each line at the first byte equal to (byte) separator.charAt(0)."""
    raw = next((spec.conf[k] for k in KV_SEPARATOR_SETTINGS if k in spec.conf), "\t")
    if not raw or raw.startswith("<") or ord(raw[0]) > 127:
        add("input-format", spec.origin, f"key/value separator {raw!r} is computed, empty or not ASCII (Hadoop "
            "splits at the low byte of its first character)", "split each line on that byte by hand", "P1")
        return "\t"
    if len(raw) > 1:
        notes.append(f"the key/value separator setting is {raw!r}; Hadoop uses only its first character, "
                     f"{raw[0]!r}, and so does the script")
    return raw[0]


def _partition_of(spec: JobSpec, index: ClassIndex, key_t: str, reduce: Step) -> tuple[Expr | None, str]:
    """The reduce task of each key (an expression over `key`), or None and why not."""
    if isinstance(reduce, Identity):
        return None, "identity reducer"
    fq = spec.classes.get("partitioner")
    try:
        if fq is None or fq.endswith(".HashPartitioner"):
            return hash_partition(key_t, spec.reduces, spec.driver.node), ""
        cls = index.get(fq)
        if cls is None:
            return None, f"partitioner {fq.rsplit('.', 1)[-1]} is not in the repository"
        return custom_partition(cls, key_t, spec.reduces, structs_of(index), index), ""
    except Unsupported as u:
        return None, u.reason


def _layout_only(spec: JobSpec, index: ClassIndex, key_t: str, reduce: Step) -> bool:
    """With several reduce tasks and the task of a key not reproduced, does only the layout differ?

    It does when Hadoop's default HashPartitioner gives every key one task (the key's own
    hashCode(), which a custom key must override, or equal keys land in different tasks) and each
    reduce() call sees all values of one key (no grouping comparator: its groups could be split
    over tasks). A reducer with state kept across calls is not lifted, so it cannot get here. A
    custom partitioner that was not read is not proved to give a task in 0..N-1 for every key."""
    fq = spec.classes.get("partitioner")
    custom = fq is not None and not fq.endswith(".HashPartitioner")
    if custom or "grouping_comparator" in spec.classes or isinstance(reduce, TopN):
        return False
    if isinstance(reduce, Identity) or not is_struct(key_t):  # every pair is written, wherever it went
        return True
    key_cls = index.get(key_t[len("struct:"):])
    return key_cls is not None and any(not m.parameters for m in key_cls.methods("hashCode"))


def _one_reduce_task(spec: JobSpec) -> bool:
    """Does the driver leave the job with exactly one reduce task (set to 1, or Hadoop's default)?"""
    counted = spec.reduces == 1 and not any(e[0] == "reducer-count" for e in spec.extra)
    return counted and all(spec.conf.get(k, "1") == "1" for k in ("mapreduce.job.reduces", "mapred.reduce.tasks"))


def _reads_file_name(steps: list[Step]) -> bool:
    """Does any step read the input split's file name (the column lift.exprs names for it)?"""
    from migrate.lift.exprs import INPUT_FILE_NAME

    return _reads_column(steps, INPUT_FILE_NAME)


# FileInputFormat's split size is max(minsize, min(maxsize, the file's block size)); the script takes
# the block size as dfs.blocksize (HDFS's default, hdfs-default.xml), the others as the job sets them.
SPLIT_SETTINGS = (("mapreduce.input.fileinputformat.split.minsize", 1, "minsize_setting"),
                  ("mapreduce.input.fileinputformat.split.maxsize", 2**63 - 1, "maxsize_setting"),
                  ("dfs.blocksize", 134217728, "block_size_setting"))


def split_settings(driver_conf: dict[str, str]) -> tuple[ConfValue, ...]:
    """The settings that decide how Hadoop splits an input file into map tasks (script parameters)."""
    out = []
    for name, default, var in SPLIT_SETTINGS:
        given = driver_conf.get(name, "")
        value = int(given) if given.strip().lstrip("-").isdigit() else default
        out.append(ConfValue("long", name, "getLong", max(value, 1), var))
    return tuple(out)


def _check_task_state(spec: JobSpec, steps: list[Step], branches: list[Branch], fmt: str, add,
                      findings: list[Finding]) -> bool:
    """A mapper whose cleanup() writes state kept over its task (a TreeMap top-N) is reproduced per
    map task where the tasks are known: a plain mapper over text files, one task per file (the
    script checks that no file is long enough for Hadoop to split it), feeding a reduce."""
    per_task = [s for s in list(steps) + [t for b in branches for t in b.steps] if isinstance(s, TaskTopN)]
    if not per_task:
        return False
    why = None
    if spec.reduces == 0:
        why = "the job is map-only: each task's entries go straight to a part file of its own"
    elif branches or sum(isinstance(s, Project) for s in steps) > 1:
        why = "the mapper is one of several (MultipleInputs or ChainMapper)"
    elif fmt != "text":
        why = f"the input format reads {fmt} records, not a text file's lines"
    elif (spec.input_format or "").endswith("NLineInputFormat"):
        why = "NLineInputFormat gives each map task N lines, not a file"
    if why is not None:
        add("task-state", per_task[0].origin, f"the TreeMap lives in one map task and cleanup() writes it, and {why}: "
            "the tasks are not reproduced", "Window.partitionBy(input file).orderBy(...) with row_number() <= N", "P2")
        return False
    step = per_task[0]
    findings.append(Finding("per-task-state", step.origin,
                            f"the mapper's TreeMap lives in one map task: the original keeps a top {step.n} per input "
                            "split, which is one per file for files up to 1.1 times the split size; the script does "
                            "the same and stops on a longer file (its split size is the job's settings, with the block "
                            "size taken as dfs.blocksize)",
                            "if one top-N over all the input was meant, keep it in the reducer only"))
    findings.append(Finding("ties-dropped", step.put.origin,
                            "the TreeMap keeps one entry per map key: lines whose map keys tie overwrite each other, "
                            "so each task keeps only its last line of each tie; the script does the same",
                            "if ties should all be kept, rank with F.dense_rank() over a Window instead"))
    return True


def _reads_offsets(steps: list[Step], fmt: str) -> bool:
    """Does the map side read TextInputFormat's key (the line's byte offset)?"""
    from migrate.lift.exprs import BYTE_OFFSET

    return fmt == "text" and _reads_column(steps, BYTE_OFFSET)


def _reads_column(steps: list[Step], name: str) -> bool:
    from migrate.plan import Col as _Col

    def walk(x) -> bool:
        if isinstance(x, _Col) and x.name == name:
            return True
        if isinstance(x, (list, tuple)):
            return any(walk(i) for i in x)
        if hasattr(x, "__dataclass_fields__"):
            return any(walk(getattr(x, f)) for f in x.__dataclass_fields__ if f != "origin")
        return False

    return walk(steps)


def _mode_check(spec: JobSpec, params: list[Param]) -> ModeCheck | None:
    """The argument that picks this branch of the driver: a script parameter (a new one, `mode`,
    unless a path already takes that argument) that the script checks."""
    m = spec.mode
    if m is None:
        return None
    holder = next((p for p in params if p.position == m.index), None)
    if holder is None:
        shown = ", ".join(dict.fromkeys(lit for lit, _ in m.tests))
        picks = f"must be {m.value}" if m.value is not None else f"must be none of {shown}"
        holder = Param("mode", f"args[{m.index}] of the original driver, which picks the job to run ({shown}); this "
                               f"script runs one branch, so it {picks}", m.index, None)
        params.append(holder)
    line = m.line
    return ModeCheck(holder.name, m.value, m.tests, Span(spec.driver.file.path, line, line))


def _param(name: str, ref: PathRef, what: str) -> Param:
    if ref.kind == "arg" and ref.from_end is not None:
        return Param(name, f"{what} ({ref.shown} of the original driver)", None, None, from_end=ref.from_end)
    if ref.kind == "args":
        return Param(name, f"{what}s ({ref.shown} of the original driver, read by a loop)", ref.index, None,
                     many=True, from_end=ref.from_end)
    if ref.kind == "arg":
        return Param(name, f"{what} (args[{ref.index}] of the original driver)", ref.index, None)
    if ref.kind == "literal":
        return Param(name, f"{what} (hard-coded in the original driver)", None, ref.literal)
    if ref.kind == "computed" and ref.parts:
        return Param(name, f"{what} ({ref.text} in the original driver)", None, None, derived=ref.parts)
    return Param(name, f"{what} (the driver computed it: {ref.text})", None, None)


def _counter_prints(spec: JobSpec, index: ClassIndex, steps: list[Step], reduce: Step | None, add) -> tuple:
    """The driver's prints of the job's counters after it ran: the script prints the same lines. A
    counter the job's own code does not update (Hadoop's built-in counters) is not reproduced."""
    counted = {(c.group, c.name) for c in [*steps, *getattr(reduce, "lets", ()), *getattr(reduce, "counts", ())]
               if isinstance(c, Count) and isinstance(c.group, str) and isinstance(c.name, str)}
    out = []
    for line, pieces, newline in spec.prints:
        named = [("str", p[1]) if p[0] == "str" else ("counter", *(counter_named(p[1], spec.driver, index) or ("", "")))
                 for p in pieces]
        missing = [p for p in named if p[0] == "counter" and (p[1], p[2]) not in counted]
        if missing:
            add("after-job", Span(spec.driver.file.path, line, line), "the driver prints a counter the job's own "
                "code does not update (Hadoop's built-in counters, or one named at run time): not reproduced",
                "print it from Spark's own metrics, or drop the line", "P1")
            continue
        out.append((Span(spec.driver.file.path, line, line), tuple(named), newline))
    return tuple(out)


def _settings_from_arguments(spec: JobSpec, params: list[Param]) -> tuple[tuple[str, str], ...]:
    """`conf.set(name, args[i])` in the driver: the script takes args[i] at the same place and hands it
    to the job as that setting (after any `-D`, which GenericOptionsParser applied before the driver ran)."""
    out = []
    taken = {p.name for p in params}
    for name, text in spec.conf.items():
        m = re.fullmatch(r"<args\[(\d+)\]>", text)
        if m is None:
            continue
        i = int(m.group(1))
        held = next((p for p in params if p.position == i and not p.many), None)
        optional = name in spec.optional  # the driver sets it only when args[i] is given
        if held is None:
            slug = re.sub(r"\W+", "_", name).strip("_").lower() or "setting"
            param = slug if slug not in taken and slug not in RESERVED_OPTIONS and slug.isidentifier() \
                else f"setting_{len(out) + 1}"
            taken.add(param)
            held = Param(param, f"job setting {name} (args[{i}] of the original driver"
                         + (", if given)" if optional else ")"), i, None, optional=optional)
            params.append(held)
        out.append((name, held.name))
    return tuple(out)


def _arguments_paths_are_made_from(params: list[Param]) -> None:
    """The arguments a path is made from (`args[0] + "/input"`) are the script's, at the same places."""
    for i in sorted({int(i) for p in params for kind, i in p.derived if kind == "arg"}):
        if not any(q.position == i for q in params):
            params.append(Param(f"arg{i}", f"args[{i}] of the original driver (paths are made from it)", i, None))


# names argparse already uses in every script (dests of the options the template adds)
RESERVED_OPTIONS = {"defines", "time_zone", "task_files", "keep_intermediates", "dry_run", "explain", "help"}


def _argument_layout(params: list[Param], add, where: Span) -> list[Param]:
    """The arguments read by position, a run read by a loop, and those counted from the end must
    follow each other in that order on the command line; where they overlap (a loop from args[1]
    and args[2] read too) the script takes the arguments of the run and after it as options."""
    runs = [p for p in params if p.many]
    run = runs[0] if runs else None
    head = [p.position for p in params if p.position is not None and not p.many]
    tail = [p.from_end for p in params if p.from_end is not None and not p.many]
    optional = [p.position for p in params if p.optional]
    clash = len(runs) > 1 or run is not None and (any(i >= run.position for i in head)
                                                  or any(k > run.from_end for k in tail)) \
        or optional and (run is not None or tail or max(head) not in optional or len(optional) > 1)
    if not clash:
        return params
    add("driver", where, "the driver reads arguments by position, in a loop and counted from the end in an order "
        "the script cannot take them in: the arguments of the loop and after it are options", "pass them by name",
        "P1")
    return [replace(p, position=None, from_end=None, many=False, optional=False)
            if p.many or p.from_end is not None or p.optional else p for p in params]


def _jtype(fq: str, structs: dict | None = None) -> str:
    info = (structs or {}).get(fq)
    if info is not None and not isinstance(info, Unsupported):
        return info.jtype
    if fq in WRITABLE_TYPES:
        t = WRITABLE_TYPES[fq]
        return "null" if t is None else t
    return "?"


def _sloc_of(index: ClassIndex, fq: str | None) -> int:
    c = index.get(fq)
    return c.sloc if c is not None else 0


def _method(cls: ClassInfo, name: str, arity: tuple[int, ...]):
    ms = [m for m in cls.methods(name) if len(m.parameters) in arity]
    return ms[0] if ms else None


def _find_method(cls: ClassInfo, index: ClassIndex, name: str, arity: tuple[int, ...]):
    c: ClassInfo | None = cls
    while c is not None:
        m = _method(c, name, arity)
        if m is not None:
            return c, m
        parent = c.node.extends
        c = index.get(index.resolve(parent.name, c)) if parent is not None else None
    return None, None


def _method_hand_work(owner: ClassInfo, m, category: str, reason: str, suggestion: str, profile: str) -> HandWork:
    a, b = node_lines(m)
    start = m.position.line if m.position else a
    end = max(b, start)
    sloc = logical_sloc(owner.file.lines[start - 1 : end])
    return HandWork(category, Span(owner.file.path, start, end), reason, suggestion,
                    owner.file.lines[start - 1].strip(), profile, sloc)


def _lift_mapper(mcls: ClassInfo, fmt: str, hand: list[HandWork], notes: list[str], index: ClassIndex,
                 driver_conf: dict[str, str], combining_fields: list[str], tables: list[SideTable],
                 in_types: tuple[str, str] | None = None, findings: list[Finding] | None = None):
    """map() as steps; `in_types`: the (key, value) types of a chained mapper's input, which is the
    previous mapper's output (else the input format's record)."""
    owner, m = _find_method(mcls, index, "map", (3, 4))
    if m is None:
        hand.append(HandWork("map-logic", mcls.span, f"{mcls.name} has no map() method the converter could find",
                             "write the map step by hand", mcls.file.lines[mcls.line_start - 1].strip(), "P2", mcls.sloc))
        return [], False
    why = not_an_override(owner, m, "Mapper")
    if why is not None:
        line = m.position.line if m.position else owner.line_start
        hand.append(HandWork("map-not-called", Span(owner.file.path, line, line),
                             f"{owner.name}.map() does not override Mapper.map ({why}): Hadoop runs the identity "
                             "mapper, which passes on each line's byte offset; Spark's text source has no offsets",
                             "fix the signature if the map logic was meant to run; otherwise decide what the job is for",
                             owner.file.lines[line - 1].strip(), "P2", owner.sloc))
        return [], False
    side = read_side_files(owner, index, class_constants(owner, index))
    settings, problems = task_constants(owner, driver_conf, class_constants(owner, index), side.handled)
    hand.extend(_setup_hand_work(owner, problems + side.problems))
    unread = {f: Opaque(f"the side table filled in setup(), whose read was not lifted (line {side.problems[0][0]})")
              for f in side.filled - set(side.tables)} if side.problems else {}
    key_t, val_t = in_types or ({"keyvalue": "String", "other": "unknown"}.get(fmt, "offset"), "String")
    lifter = MapBodyLifter(owner, m, key_t, val_t, owner.api or "mapreduce", index, {**settings, **unread, **side.tables})
    res = lifter.run()
    tables.extend(t for t in res.tables if t not in tables)
    notes.extend(n for n in side.notes if res.tables and n not in notes)
    cleanup = _method(owner, "cleanup", (1,)) or _method(owner, "close", (0,))
    flushed = bool(res.combining) and all(flushes_all_entries(cleanup, f) for f in res.combining)
    if flushed:
        combining_fields.extend(res.combining)
    per_task = bool(res.steps) and isinstance(res.steps[-1], TaskTopN)  # cleanup() writes the task's TreeMap
    hand.extend(_lifecycle(owner, "of the mapper runs once per task; its logic is not converted in this version",
                           "settings become script parameters; per-task state needs a rewrite", "P1",
                           skip=("setup", "configure") + (("cleanup", "close") if flushed or per_task else ())))
    read_only = set(side.filled) | constant_fields(owner)
    for h in res.hand_work:
        sloc = logical_sloc(owner.file.lines[h.origin.line_start - 1 : node_lines(m)[1]])
        hand.append(_named(owner, h, max(sloc, 1), read_only))
    notes.extend(res.notes)
    if findings is not None:
        findings.extend(f for f in res.findings if f not in findings)
    return res.steps, res.skip_first_line


def _setup_hand_work(owner: ClassInfo, problems: list[tuple[int, str]]) -> list[HandWork]:
    """What setup()/configure() does besides reading settings (lift.config): one item per line."""
    return [HandWork("task-lifecycle", Span(owner.file.path, line, line), reason,
                     "settings become script parameters (-D name=value); other per-task work needs a rewrite",
                     owner.file.lines[line - 1].strip() if line else "", "P1", 1) for line, reason in sorted(problems)]


def _named(owner: ClassInfo, h: HandWork, sloc: int, tables: set[str]) -> HandWork:
    """Give a lifting failure the name of the API behind it, when there is one (lift.limits).
    `tables`: fields that never explain it (side tables, constant collections: read, never state)."""
    lim = explain(owner, h.origin.line_start, tables) if h.category in ("map-logic", "reduce-logic") else None
    if lim is None:
        return HandWork(h.category, h.origin, h.reason, h.suggestion, h.snippet, h.profile, sloc)
    # lifting stopped here, so the rest of the method is missing from the script: the item stays
    # blocking even where the API's own category is advisory (a counter the script cannot report)
    category = h.category if lim.category in ADVISORY_CATEGORIES else lim.category
    return HandWork(category, h.origin, f"{lim.reason} ({h.reason})", lim.suggestion, h.snippet, lim.profile, sloc)


def _lifecycle(owner: ClassInfo, what: str, suggestion: str, profile: str, skip=()) -> list[HandWork]:
    """setup()/configure()/cleanup()/close() that do more than call super: hand work."""
    out = []
    for name in ("setup", "configure", "cleanup", "close"):
        if name in skip:
            continue
        lm = _method(owner, name, (0, 1))
        if lm is not None and _does_something(lm):
            out.append(_method_hand_work(owner, lm, "task-lifecycle", f"{name}() {what}", suggestion, profile))
    return out


def _does_something(m) -> bool:
    body = m.body or []
    return any(not (isinstance(s, T.StatementExpression) and isinstance(s.expression, T.SuperMethodInvocation))
               for s in body)


def not_an_override(cls: ClassInfo, m, base: str) -> str | None:
    """Why a new-API map()/reduce() does not override the framework's method (None: it does, or unknown).

    Without @Override, javac accepts a method whose parameter types differ from Mapper.map(KEYIN,
    VALUEIN, Context) / Reducer.reduce(KEYIN, Iterable<VALUEIN>, Context) as an overload, and
    Hadoop silently runs the inherited identity method instead.
    """
    ext = cls.node.extends
    if cls.api != "mapreduce" or ext is None or ext.name.rsplit(".", 1)[-1] != base or len(ext.arguments or []) != 4:
        return None
    k_in, v_in = (getattr(a.type, "name", "") for a in ext.arguments[:2])
    if len(m.parameters) != 3:
        return f"{m.name}() takes {len(m.parameters)} parameters"
    p_key, p_vals, p_ctx = (p.type for p in m.parameters)
    ctx = p_ctx.name.rsplit(".", 1)[-1] if p_ctx.sub_type is None else p_ctx.sub_type.name
    if ctx != "Context":
        return f"its last parameter is of type {p_ctx.name}, not the {base}'s Context"
    if p_key.name != k_in:
        return f"its key parameter is a {p_key.name} where the class declares {k_in}"
    if base == "Mapper":
        return None if p_vals.name == v_in else f"its value parameter is a {p_vals.name} where the class declares {v_in}"
    inner = [getattr(a.type, "name", "") for a in p_vals.arguments or []]
    if p_vals.name != "Iterable" or inner != [v_in]:
        got = p_vals.name + (f"<{', '.join(inner)}>" if inner else "")
        return f"its values parameter is of type {got}, not Iterable<{v_in}>"
    return None


def _lift_reducer(rcls: ClassInfo, key_t: str, val_t: str, hand: list[HandWork], index: ClassIndex,
                  findings: list[Finding], reduces: int, driver_conf: dict[str, str],
                  sorted_values: bool = False) -> Step | None:
    owner, m = _find_method(rcls, index, "reduce", (3, 4))
    if m is None:
        return Identity(rcls.span, "reducer without reduce(): identity")
    why = not_an_override(owner, m, "Reducer")
    if why is not None:
        line = m.position.line if m.position else owner.line_start
        findings.append(Finding("reduce-not-called", Span(owner.file.path, line, line),
                                f"{owner.name}.reduce() does not override Reducer.reduce ({why}): Hadoop never calls "
                                "it and runs the identity reducer, so the original writes every map output pair "
                                "sorted by key; the script does the same",
                                "fix the signature (and add @Override) if the reduce logic was meant to run"))
        return Identity(owner.span, "reduce() is never called: identity")
    a, b = node_lines(m)
    sloc = logical_sloc(owner.file.lines[(m.position.line if m.position else a) - 1 : b])
    settings, problems = task_constants(owner, driver_conf, class_constants(owner, index))
    hand.extend(_setup_hand_work(owner, problems))
    changed = {n for meth in owner.node.methods if meth.name not in ("setup", "configure") for n in assigned_names(meth)}
    settings = {k: v for k, v in settings.items() if k not in changed}  # state kept across keys, not a setting
    try:
        top = lift_top_n(owner, m, key_t, val_t, index, FoldLifter, settings)
    except Unsupported as u:
        line = u.line or a
        hand.append(HandWork("top-n", Span(owner.file.path, line, line), u.reason,
                             u.suggestion or "Window.orderBy(...) with row_number() <= N", owner.file.lines[line - 1].strip(),
                             "P2", sloc))
        return None
    hand.extend(_lifecycle(owner, "of the reducer is not converted in this version",
                           "per-task state (top-N in cleanup, side outputs) needs a rewrite", "P2",
                           skip=("setup", "configure") + (("cleanup",) if top is not None else ())))
    if top is not None:
        findings.extend(top_n_findings(top, top.fold.emits[0].origin, reduces))
        return top
    if sorted_values:  # one call may read several keys in the sort order: a control break?
        try:
            runs, items = lift_runs(owner, m, key_t, val_t, index, settings)
        except Unsupported as u:
            line = u.line or a
            runs, items = None, [HandWork(u.category or "secondary-sort", Span(owner.file.path, line, line), u.reason,
                                          u.suggestion or "fold each run with groupBy(the full key), then collect the "
                                          "runs per group with F.sort_array(F.collect_list(...))",
                                          owner.file.lines[line - 1].strip(), "P2")]
        if runs is not None or items:
            hand.extend(_named(owner, h, sloc, constant_fields(owner)) for h in items)
            return runs
    fold = FoldLifter(owner, m, key_t, val_t, index, sorted_values=sorted_values, settings=settings)
    group, items = fold.run()
    if group is not None:
        findings.extend(f for f in dict.fromkeys(fold.scope.findings) if f not in findings)
    if items:  # not a fold: perhaps a join of tagged values
        try:
            return JoinLifter(owner, m, key_t, val_t, index, settings=settings).lift_join()
        except Unsupported as u:
            if u.category in ("object-reuse", "join"):  # a join, declined for a precise reason
                line = u.line or a
                items = [HandWork(u.category, Span(owner.file.path, line, line), u.reason, u.suggestion,
                                  owner.file.lines[line - 1].strip(), "P2")]
    if items:
        read_only = constant_fields(owner)
        hand.extend(_named(owner, h, sloc, read_only) for h in items)
    if isinstance(group, Group) and group.first_keys is not None:
        findings.append(Finding("per-task-state", group.origin, f"an instance counter lets only the first "
                                f"{group.first_keys} keys write: that is per reduce task ({reduces} here), in key "
                                "order, not a top-N by any value; the script does the same",
                                "if a top-N by a value was meant, rank with Window.orderBy(value) and row_number()"))
    return group


def _check_combiner(spec: JobSpec, reduce: Step | None, index: ClassIndex, add, notes: list[str],
                    findings: list[Finding], where: Span, key_t: str, val_t: str) -> None:
    """A combiner is sound when the reducer gives the same answer on its partial results
    (lift.combiners); then Spark needs nothing for it."""
    comb = spec.classes.get("combiner")
    if comb is None:
        return
    name = comb.rsplit(".", 1)[-1]
    step, unread, what = None, "", ""
    if comb == spec.classes.get("reducer"):
        step, what = reduce, "it is the reducer itself"
    elif comb in SUM_REDUCERS or comb in IDENTITY_REDUCERS:
        step = library_reducer(comb, key_t, val_t)
    else:
        ccls = index.get(comb)
        owner, m = _find_method(ccls, index, "reduce", (3, 4)) if ccls is not None else (None, None)
        if m is None:
            unread = "its source is not in the repository" if ccls is None else "it has no reduce()"
        elif not_an_override(owner, m, "Reducer") is not None:
            step = Identity(owner.span, "reduce() is never called: identity")
        else:
            g, items = FoldLifter(owner, m, key_t, val_t, index).run()
            step, unread = (g, "") if not items else (None, f"{items[0].reason}, line {items[0].origin.line_start}")
    counted = combiner_counters(step)
    if counted:
        findings.append(Finding(COMBINER_COUNTERS, where, f"combiner {name} updates counters too ({', '.join(counted)}): "
                                "Hadoop runs it zero or more times per map task, so the original's values of them "
                                "depended on how the input was split and spilled; the script counts what the reducer "
                                "counts, and mrlift verify does not compare them",
                                "count in the reducer only (a combiner is an optimisation Hadoop may skip)"))
    verdict = judge(reduce, step, unread)
    if verdict.sound:
        notes.append(f"combiner {name} {verdict.why}{f' ({what})' if what else ''}; Spark's groupBy merges partial "
                     "aggregates itself, so there is nothing to convert for it")
        return
    said = f"{what}; {verdict.why}" if what else verdict.why
    add("combiner", where, f"combiner {name} can change the answer ({said}): Hadoop runs a combiner zero or more "
        "times per map task, so the original output depended on how the input was split and spilled; the script "
        "computes the reducer over all the values, as if the combiner never ran",
        "decide whether the true answer (the script's) is wanted or the old numbers must be kept; then drop the "
        "combiner", "P2", _sloc_of(index, comb))


def _summing(key_t: str, val_t: str) -> Group:
    """What in-mapper combining does to the map output: per-task partial sums of the values."""
    where = Span("<in-mapper combining>", 0, 0)
    agg = Agg("sum", "sum", Col(val_t, "value"), val_t, 0, where)
    return Group(where, "partial sums", (agg,), (Emit(where, "", Col(key_t, "key"), AggRef(val_t, "sum")),))


def _summing_fields(key_t: str, val_t: str, structs: dict, record: str) -> Group | None:
    """What in-mapper combining into records does to the map output: per-task sums of each field."""
    info = structs.get(record)
    if info is None or val_t != _jtype(record, structs):
        return None
    where = Span("<in-mapper combining>", 0, 0)
    aggs = tuple(Agg(f"sum_{f}", "sum", Field(t, Col(val_t, "value"), f), t, 0, where) for f, t in info.fields.items())
    made = StructNew(val_t, tuple((f, AggRef(t, f"sum_{f}")) for f, t in info.fields.items()))
    return Group(where, "partial sums", aggs, (Emit(where, "", Col(key_t, "key"), made),))


def _check_map_output_types(steps: list[Step], key_t: str, val_t: str, mcls: ClassInfo | None, add) -> None:
    """Hadoop fails the task when a written key/value class differs from the declared map output class."""
    for p in (s for s in steps if isinstance(s, Project)):
        for e in p.emits:
            for side, declared, what in ((e.key, key_t, "key"), (e.value, val_t, "value")):
                got = side.jtype if side is not None else "null"
                if declared not in ("?", got) and not (got == "null" and declared != "null") and mcls is not None:
                    add("type-mismatch", e.origin, f"the mapper writes a {_label(got)} {what} where the driver "
                        f"declares {_label(declared)}; Hadoop fails such a task (\"Type mismatch in {what} from map\")",
                        "fix the declared class or the written value, then convert again", "P1")
                    return


_FOLD_SHAPES = {"count_if": "conditional count", "count_distinct": "distinct count per key", "any": "any/all per key",
                "all": "any/all per key", "only": "the one value per key"}


def _label(jtype: str) -> str:
    return jtype.removeprefix("struct:").rsplit(".", 1)[-1] if is_struct(jtype) else jtype


def _shapes(steps: list[Step], reduce: Step | None) -> list[str]:
    out = []
    if any(isinstance(s, Explode) for s in steps):
        out.append("token count" if isinstance(reduce, Group) and reduce.aggs else "tokens")
    if any(isinstance(s, Filter) for s in steps):
        out.append("filter")
    proj = [s for s in steps if isinstance(s, Project)]
    if any(isinstance(s, TaskTopN) for s in proj):
        out.append("top-N per map task")
    elif proj and not any(isinstance(s, Explode) for s in steps):
        out.append("parse and emit")
    if isinstance(reduce, Group):
        if reduce.distinct:
            out.append("distinct keys")
        fns = {_FOLD_SHAPES.get(a.fn, a.fn.split("_")[0] + " per key") for a in reduce.aggs}
        if {"sum per key", "count per key"} <= fns and any(e.value is not None and not isinstance(e.value, AggRef)
                                                           for e in reduce.emits):
            out.append("average per key")
        else:
            out.extend(sorted(fns))
        if len(reduce.emits) > 1:
            out.append("several writes per key")
    if isinstance(reduce, EachValue):
        out.append("per-value writes in the reducer")
    if isinstance(reduce, Runs):
        out.append("control break (a fold per run of one key, collected per group)")
    if isinstance(reduce, TopN):
        out.append("top-N" + (" per reduce task" if reduce.partition is not None else ""))
    if isinstance(reduce, TopPerKey):
        out.append("top-N per key")
    if isinstance(reduce, Identity):
        out.append("sort by key")
    return out


def _sink_types(steps: list[Step], reduce: Step | None, spec: JobSpec) -> tuple[str | None, str | None]:
    if isinstance(reduce, Join):
        ems = [w.emit for w in reduce.writes]
    elif isinstance(reduce, (TopN, TopPerKey, Runs)):
        ems = list(reduce.writes)
    else:
        ems = reduce.emits if isinstance(reduce, (Group, EachValue)) else [e for s in steps if isinstance(s, Project)
                                                                       for e in s.emits][:1]
    if ems:
        e = ems[0]
        return (e.key.jtype if e.key is not None else None, e.value.jtype if e.value is not None else None)
    out_k, out_v = _jtype(spec.types.get("out_key", "")), _jtype(spec.types.get("out_value", ""))
    return (None if out_k == "null" else out_k, None if out_v == "null" else out_v)
