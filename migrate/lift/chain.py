"""Chain the jobs one driver runs in sequence, where each job reads the folder the one before wrote.

Recognises: a driver that submits jobs one after another (`waitForCompletion`, `JobClient.runJob`)
where job k's only input path is job k-1's output path (the same `args[i]` or the same literal).
Produces: one JobResult whose plan is the last job's, with the earlier jobs as `Plan.upstream`
stages; the last job (and each middle one) reads the lines the job before would have written, as
a DataFrame: the intermediate folders are written only when the script is asked to keep them.
Caveats: other shapes (a job reading two earlier outputs, an intermediate path computed at run
time, an input that needs its file name or byte offsets, compressed intermediates) keep one
script per job, with the chained-jobs item saying so.
"""
from __future__ import annotations

from dataclasses import replace

from migrate.java.driver import PathRef
from migrate.lift.job import JobResult
from migrate.plan import Group, Param, Span, Stage, TopN, TopPerKey

CHAINED = "chained-jobs"


def chain_jobs(results: list[JobResult], replan=None) -> list[JobResult]:
    """The results with each chain of one driver's jobs folded into one pipeline result. `replan(spec,
    pairs)` plans a job again as reading the (key, value) pairs of the job before it."""
    out: list[JobResult] = []
    i = 0
    while i < len(results):
        group = [results[i]]
        while i + len(group) < len(results) and _same_driver(results[i + len(group)], group[0]):
            group.append(results[i + len(group)])
        i += len(group)
        if len(group) == 1:
            out.extend(group)
            continue
        if replan is not None:
            group = _through_sequence_files(group, replan)
        why = why_not_chained(group)
        out.extend([_pipeline(group)] if why is None else _kept_apart(group, why))
    return out


def _simple(fq: str | None) -> str:
    return (fq or "").rsplit(".", 1)[-1]


def _through_sequence_files(group: list[JobResult], replan) -> list[JobResult]:
    """Job k writes a SequenceFile that job k+1 reads: the pairs pass on as they are (typed columns),
    so job k+1 is planned again as reading them, and job k's output format needs nothing."""
    group = list(group)
    for k in range(1, len(group)):
        prev, job = group[k - 1], group[k]
        sink = prev.plan.sink
        if not (_simple(prev.spec.output_format) == "SequenceFileOutputFormat"
                and _simple(job.spec.input_format) == "SequenceFileInputFormat" and len(job.spec.inputs) == 1
                and _same_path(job.spec.inputs[0], prev.spec.output)
                and sink.key_type in PAIR_TYPES and sink.value_type in PAIR_TYPES):
            continue
        try:
            group[k] = replan(job.spec, (sink.key_type, sink.value_type))
        except (ValueError, KeyError, AttributeError, TypeError, RecursionError):
            continue  # planned as it was: its SequenceFile input stays hand work
        hand = tuple(h for h in prev.plan.hand_work if not (h.category == "output-format" and "SequenceFile" in h.reason))
        note = (f"job {k} wrote a SequenceFile that job {k + 1} read: the (key, value) pairs pass on as they are; "
                "with --keep-intermediates the folder holds them as text lines, not a SequenceFile")
        group[k - 1] = replace(prev, plan=replace(prev.plan, hand_work=hand, notes=prev.plan.notes + (note,)))
    return group


# value types a SequenceFile of Writables holds that a typed column carries as they are
PAIR_TYPES = {"String", "int", "long", "double", "float", "boolean"}


def _kept_apart(group: list[JobResult], why: str) -> list[JobResult]:
    """Jobs of one driver that stay one script each: their chained-jobs item says why."""
    out = []
    for job in group:
        hand = tuple(replace(h, reason=f"the driver runs {len(group)} jobs in sequence; each is converted on its own "
                                       f"because {why}") if h.category == CHAINED else h for h in job.plan.hand_work)
        out.append(replace(job, plan=replace(job.plan, hand_work=hand)))
    return out


def _same_driver(a: JobResult, b: JobResult) -> bool:
    return a.spec.driver.fqcn == b.spec.driver.fqcn and a.spec.method == b.spec.method


def _same_path(a: PathRef | None, b: PathRef | None) -> bool:
    """The same folder: the same argument, literal, or path computed the same way (or held in one local)."""
    return a is not None and b is not None and a.kind in ("arg", "literal", "computed") and \
        (a.kind, a.index, a.literal, a.from_end, a.text) == (b.kind, b.index, b.literal, b.from_end, b.text)


def why_not_chained(group: list[JobResult]) -> str | None:
    """None when every job reads exactly the previous job's output; else the reason."""
    for k in range(1, len(group)):
        prev, job = group[k - 1], group[k]
        src = job.plan.source
        if job.plan.branches or len(job.spec.inputs) != 1 or not _same_path(job.spec.inputs[0], prev.spec.output):
            return f"job {k + 1} does not read exactly the folder job {k} writes"
        if src.file_name or src.skip_first_line or src.offsets:
            return f"job {k + 1} reads its input's file names or byte offsets, which only files have"
        if src.split and prev.spec.reduces != 1:  # one map task per part file the job before wrote
            return f"job {k + 1}'s mapper keeps state per map task (one per file), and job {k} writes one file " \
                   f"per {'reduce' if prev.spec.reduces else 'map'} task"
        if src.split and not isinstance(prev.plan.reduce, (Group, TopN, TopPerKey)):
            return f"job {k + 1}'s mapper keeps state over the lines in file order, and job {k} writes the lines " \
                   "of one key in an order Hadoop does not define"
        if prev.plan.sink.compression:
            return f"job {k} compresses the folder job {k + 1} reads"
        later = [g for g in group[k + 1:] if any(_same_path(p, prev.spec.output) for p in g.spec.inputs)]
        if later:
            return f"job {k}'s output is read by more than the next job"
    return None


def _pipeline(group: list[JobResult]) -> JobResult:
    """One result for a chain that why_not_chained() accepted."""
    last = group[-1]
    params: list[Param] = []
    names: set[str] = set()
    stages: list[Stage] = []
    hand, notes, shapes, findings = [], [], [], []
    classes, files = {}, {}
    for k, job in enumerate(group, 1):
        p = job.plan
        hand += [h for h in p.hand_work if h.category != CHAINED]
        notes += [n for n in p.notes if n not in notes]
        findings += list(p.findings)
        shapes += [f"job {k}: {s}" for s in p.shapes]
        for role, fq in job.classes.items():
            classes[role if role == "driver" else f"job {k} {role}"] = fq
        for role, span in job.files.items():
            files[role if role == "driver" else f"job {k} {role}"] = span
        for param in p.params:
            if k > 1 and param.name in p.source.params:  # the previous job's lines, not a path
                continue
            if param.name == p.sink.param and k < len(group):
                continue  # the intermediate folder: a Stage's output below
            if param.name in names and param.position is not None and \
                    any(q.position == param.position for q in params):
                continue  # the same driver argument read by two jobs (a side file, say)
            name = param.name if param.name not in names else f"{param.name}_{k}"
            names.add(name)
            params.append(replace(param, name=name))
    for k, job in enumerate(group[:-1], 1):
        out_param = next(q for q in job.plan.params if q.name == job.plan.sink.param)
        folder = replace(out_param, name=f"job_{k}_output",
                         help=out_param.help.replace("output folder", f"output folder of job {k}", 1)
                         + f"; job {k + 1} gets the lines directly: written only with --keep-intermediates")
        if job.spec.output.kind == "computed":  # made at run time: asked for only to keep it
            folder = replace(folder, default="", help=folder.help + ", then to this folder")
        params.append(folder)
        line = next((job.spec.call_lines[c] for c in ("waitForCompletion", "submit", "runJob") if c in job.spec.call_lines),
                    job.spec.origin.line_start)
        plan = _reads_previous(job.plan, k) if k > 1 else job.plan
        stages.append(Stage(replace(plan, hand_work=tuple(h for h in plan.hand_work if h.category != CHAINED)),
                            folder, Span(job.spec.driver.file.path, line, line)))
    final = _reads_previous(last.plan, len(group))
    # an argument a folder is made from (`argN`, job.py) that another job reads by name: that name
    held = {q.position for q in params if q.position is not None and not q.many and not _made_from(q)}
    params = [q for q in params if not (_made_from(q) and q.position in held)]
    plan = replace(final, params=tuple(sorted(params, key=lambda q: (not q.positional, q.position or 0))),
                   hand_work=tuple(hand), notes=tuple(notes), findings=tuple(findings), shapes=tuple(
                       [f"{len(group)} chained jobs"] + shapes), upstream=tuple(stages))
    spec = replace(last.spec, name=" → ".join(j.spec.name for j in group))
    return JobResult(spec, plan, classes, files, sum(j.sloc_total for j in group), notes)


def _made_from(p: Param) -> bool:
    """A parameter job.py adds only because a path is made from that argument."""
    return p.name == f"arg{p.position}" and p.help.endswith("(paths are made from it)")


def _reads_previous(plan, k: int):
    """Job k reads the lines job k-1 produced (a DataFrame), not a folder."""
    return replace(plan, source=replace(plan.source, params=(), split_commas=(), upstream=k - 2))
